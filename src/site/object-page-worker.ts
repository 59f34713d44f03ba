import { parentPort, workerData } from "node:worker_threads";
import { createPageRenderer, type PageInput, type PageSite } from "./page-render.js";
import { renderAndWrite, type WrittenPage } from "./page-writer.js";
import { adoptRendering, learnedRendering, type Rendering } from "./render-store.js";

/**
 * A page worker: its own Nunjucks environment renders the object pages it is
 * sent and writes them itself; it answers each batch with what it wrote.
 */

export interface PageWorkerData {
  readonly includesDir: string;
  readonly outDir: string;
  readonly site: PageSite;
  /** The equation shapes and compiled templates the main thread knows, so that none is made again here. */
  readonly rendering?: Rendering;
}

export type PageWorkerRequest = { readonly kind: "pages"; readonly batch: number; readonly pages: readonly PageInput[] } | { readonly kind: "end" };

export type PageWorkerReply =
  | {
      readonly kind: "written";
      readonly batch: number;
      readonly pages: readonly WrittenPage[];
      /** Equation shapes and templates learned here since the last batch, for the main thread to know. */
      readonly learned: Rendering;
    }
  | { readonly kind: "failed"; readonly batch: number; readonly message: string };

const port = parentPort;
if (port) {
  const data = workerData as PageWorkerData;
  if (data.rendering) adoptRendering(data.rendering);
  const render = createPageRenderer(data.includesDir, data.site);
  port.on("message", (msg: PageWorkerRequest) => {
    if (msg.kind === "end") {
      port.close();
      return;
    }
    try {
      const pages = msg.pages.map((p) => renderAndWrite(render, p, data.outDir));
      port.postMessage({ kind: "written", batch: msg.batch, pages, learned: learnedRendering() } satisfies PageWorkerReply);
    } catch (e) {
      const error = e as Error;
      port.postMessage({ kind: "failed", batch: msg.batch, message: `${error.message}\n${error.stack ?? ""}` } satisfies PageWorkerReply);
    }
  });
}
