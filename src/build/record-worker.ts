import path from "node:path";
import { parentPort, threadId, workerData } from "node:worker_threads";
import { objectJsonText } from "../report/json-report.js";
import type { RunOptions } from "../audit/audit-records.js";
import { adoptRendering, learnedRendering, type Rendering } from "../site/render-store.js";
import { createPageRenderer, type PageRenderer, type PageSite } from "../site/page-render.js";
import {
  attachFragments,
  attachHomeRows,
  auditEntries,
  packEntry,
  readAndParse,
  SpillFile,
  writeEntryPages,
  type FileToAudit,
  type FileToRead,
  type PageWritten,
  type RecordEntry,
  type WireEntry,
} from "./record-work.js";

/**
 * A build worker: parses and audits the record files it is sent, or reads and
 * keys them first when it is sent only their names (Monte Carlo
 * included, on this thread) and, when asked, renders and writes each
 * object's page at once; it answers each batch with the entries and pages.
 */

export interface RecordWorkerData {
  readonly options: RunOptions;
  /** For a site: where its templates and pages are, what the pages read of it, and its key (pageSiteKey). */
  readonly pages?: { readonly includesDir: string; readonly outDir: string; readonly site: PageSite; readonly siteKey: string };
  /** For a site: the equation shapes and compiled templates the main thread knows, so that none is made again here. */
  readonly rendering?: Rendering;
  /** For a site: the folder where each worker writes the bytes of its audits (see WireEntry). */
  readonly spillDir?: string;
  /** Make each object's text in the JSON report here (see RecordEntry.json). */
  readonly objectJson?: boolean;
  /** Send of each audit only its summary (PipelineOptions.summariesOnly). */
  readonly summariesOnly?: boolean;
}

export type RecordWorkerRequest =
  | { readonly kind: "files"; readonly batch: number; readonly files: ReadonlyArray<FileToAudit | FileToRead> }
  | { readonly kind: "end" };

export type RecordWorkerReply =
  | {
      readonly kind: "done";
      readonly batch: number;
      readonly entries: ReadonlyArray<RecordEntry | WireEntry>;
      readonly pages: readonly PageWritten[];
      /** Equation shapes and templates learned here since the last batch, for the main thread to know and keep. */
      readonly learned: Rendering;
    }
  | { readonly kind: "failed"; readonly batch: number; readonly message: string };

const port = parentPort;
if (port) {
  const data = workerData as RecordWorkerData;
  let render: PageRenderer | undefined;
  let spill: SpillFile | undefined;
  if (data.rendering) adoptRendering(data.rendering);
  port.on("message", (msg: RecordWorkerRequest) => {
    if (msg.kind === "end") {
      spill?.close();
      port.close();
      return;
    }
    try {
      const entries = readAndParse(msg.files);
      auditEntries(entries, data.options);
      if (data.objectJson) for (const e of entries) if (e.audit?.object) e.json = objectJsonText(e.audit.object);
      let pages: PageWritten[] = [];
      if (data.pages) {
        render ??= createPageRenderer(data.pages.includesDir, data.pages.site);
        pages = writeEntryPages(entries, render, data.pages.outDir);
        attachFragments(entries);
        attachHomeRows(entries, () => render!, data.pages.siteKey);
      }
      // for a site, the main thread needs only each audit's summary, fragments and the place of its bytes
      if (data.spillDir) spill ??= new SpillFile(path.join(data.spillDir, `audits-${threadId}.bin`));
      const wire = spill ? entries.map((e) => packEntry(e, spill!, !data.summariesOnly)) : entries;
      port.postMessage({ kind: "done", batch: msg.batch, entries: wire, pages, learned: learnedRendering() } satisfies RecordWorkerReply);
    } catch (e) {
      const error = e as Error;
      port.postMessage({ kind: "failed", batch: msg.batch, message: `${error.message}\n${error.stack ?? ""}` } satisfies RecordWorkerReply);
    }
  });
}
