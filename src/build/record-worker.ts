import path from "node:path";
import { parentPort, threadId, workerData } from "node:worker_threads";
import { objectJsonText } from "../report/json-report.js";
import type { RunOptions } from "../audit/audit-records.js";
import { importTemplates, takeLearnedTemplates, type KeptTemplate } from "../site/compiled-templates.js";
import { importShapes, takeLearnedShapes, type KeptShape } from "../site/katex.js";
import { createPageRenderer, type PageRenderer, type PageSite } from "../site/page-render.js";
import {
  attachFragments,
  attachHomeRows,
  auditEntries,
  packEntry,
  parseFiles,
  SpillFile,
  writeEntryPages,
  type FileToAudit,
  type PageWritten,
  type RecordEntry,
  type WireEntry,
} from "./record-work.js";

/**
 * A build worker: parses and audits the record files it is sent (Monte Carlo
 * included, on this thread) and, when asked, renders and writes each
 * object's page at once; it answers each batch with the entries and pages.
 */

export interface RecordWorkerData {
  readonly options: RunOptions;
  /** For a site: where its templates and pages are, what the pages read of it, and its key (pageSiteKey). */
  readonly pages?: { readonly includesDir: string; readonly outDir: string; readonly site: PageSite; readonly siteKey: string };
  /** For a site: the equation shapes the main thread knows (see katex.ts), so that none is typeset again here. */
  readonly equations?: readonly KeptShape[];
  /** For a site: the compiled templates the main thread knows (see compiled-templates.ts). */
  readonly templates?: readonly KeptTemplate[];
  /** For a site: the folder where each worker writes the bytes of its audits (see WireEntry). */
  readonly spillDir?: string;
  /** Make each object's text in the JSON report here (see RecordEntry.json). */
  readonly objectJson?: boolean;
}

export type RecordWorkerRequest = { readonly kind: "files"; readonly batch: number; readonly files: readonly FileToAudit[] } | { readonly kind: "end" };

export type RecordWorkerReply =
  | {
      readonly kind: "done";
      readonly batch: number;
      readonly entries: ReadonlyArray<RecordEntry | WireEntry>;
      readonly pages: readonly PageWritten[];
      /** Equation shapes learned here since the last batch, for the main thread to know and keep. */
      readonly shapes: readonly KeptShape[];
      /** Templates compiled here since the last batch, likewise. */
      readonly templates: readonly KeptTemplate[];
    }
  | { readonly kind: "failed"; readonly batch: number; readonly message: string };

const port = parentPort;
if (port) {
  const data = workerData as RecordWorkerData;
  let render: PageRenderer | undefined;
  let spill: SpillFile | undefined;
  if (data.equations) importShapes(data.equations);
  if (data.templates) importTemplates(data.templates);
  port.on("message", (msg: RecordWorkerRequest) => {
    if (msg.kind === "end") {
      spill?.close();
      port.close();
      return;
    }
    try {
      const entries = parseFiles(msg.files);
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
      const wire = spill ? entries.map((e) => packEntry(e, spill!)) : entries;
      port.postMessage({ kind: "done", batch: msg.batch, entries: wire, pages, shapes: takeLearnedShapes(), templates: takeLearnedTemplates() } satisfies RecordWorkerReply);
    } catch (e) {
      const error = e as Error;
      port.postMessage({ kind: "failed", batch: msg.batch, message: `${error.message}\n${error.stack ?? ""}` } satisfies RecordWorkerReply);
    }
  });
}
