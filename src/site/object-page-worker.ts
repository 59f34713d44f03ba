import { parentPort, workerData } from "node:worker_threads";
import { importTemplates, takeLearnedTemplates, type KeptTemplate } from "./compiled-templates.js";
import { importShapes, takeLearnedShapes, type KeptShape } from "./katex.js";
import { createPageRenderer, type PageInput, type PageSite } from "./page-render.js";
import { renderAndWrite, type WrittenPage } from "./page-writer.js";

/**
 * A page worker: its own Nunjucks environment renders the object pages it is
 * sent and writes them itself; it answers each batch with what it wrote.
 */

export interface PageWorkerData {
  readonly includesDir: string;
  readonly outDir: string;
  readonly site: PageSite;
  /** The equation shapes the main thread knows (see katex.ts), so that none is typeset again here. */
  readonly equations?: readonly KeptShape[];
  /** The compiled templates the main thread knows (see compiled-templates.ts). */
  readonly templates?: readonly KeptTemplate[];
}

export type PageWorkerRequest = { readonly kind: "pages"; readonly batch: number; readonly pages: readonly PageInput[] } | { readonly kind: "end" };

export type PageWorkerReply =
  | {
      readonly kind: "written";
      readonly batch: number;
      readonly pages: readonly WrittenPage[];
      /** Equation shapes learned here since the last batch, for the main thread to know. */
      readonly shapes: readonly KeptShape[];
      /** Templates compiled here since the last batch, likewise. */
      readonly templates: readonly KeptTemplate[];
    }
  | { readonly kind: "failed"; readonly batch: number; readonly message: string };

const port = parentPort;
if (port) {
  const data = workerData as PageWorkerData;
  if (data.equations) importShapes(data.equations);
  if (data.templates) importTemplates(data.templates);
  const render = createPageRenderer(data.includesDir, data.site);
  port.on("message", (msg: PageWorkerRequest) => {
    if (msg.kind === "end") {
      port.close();
      return;
    }
    try {
      const pages = msg.pages.map((p) => renderAndWrite(render, p, data.outDir));
      port.postMessage({ kind: "written", batch: msg.batch, pages, shapes: takeLearnedShapes(), templates: takeLearnedTemplates() } satisfies PageWorkerReply);
    } catch (e) {
      const error = e as Error;
      port.postMessage({ kind: "failed", batch: msg.batch, message: `${error.message}\n${error.stack ?? ""}` } satisfies PageWorkerReply);
    }
  });
}
