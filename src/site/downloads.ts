import type { AuditReport } from "../audit/types.js";
import { bibtexChunks } from "./bibtex.js";
import { csvChunks } from "./csv.js";
import { TABLE_COLUMNS } from "./table.js";
import type { CombinedValues } from "../combine/types.js";
import { combineObject } from "../combine/combine-object.js";
import { referenceTableChunks } from "../export/votable.js";
import { fragmentsOf } from "./fragments.js";
import { jsonStreamedText } from "./json-stream.js";
import { auditJsonText } from "../cache/lazy-audit.js";
import type { ObjectAudit } from "../audit/types.js";

/**
 * Each object's text in downloads/audit.json is followed by spaces up to a
 * multiple of this many bytes, so that an edit seldom changes where the
 * objects after it lie and a rebuild can patch the file in place (about 1 %
 * more bytes at 13 KB per object; see json-stream.ts).
 */
export const AUDIT_JSON_PAD = 256;

/** Where the full audit JSON goes in the site. */
export const AUDIT_JSON_PATH = "downloads/audit.json";

/** The keys of downloads/audit.json whose arrays are written element by element. */
export const AUDIT_JSON_STREAMED: ReadonlySet<string> = new Set(["objects"]);

/** How each element of those arrays is written, streamed or whole. */
export const AUDIT_JSON_ELEMENTS = {
  padTo: AUDIT_JSON_PAD,
  textOf: (item: unknown) => auditJsonText(item as ObjectAudit),
} as const;

/** The report's combined values keyed by object id (combined afresh for an object that carries none). */
export function combinedIndex(report: AuditReport): Record<string, CombinedValues> {
  const out: Record<string, CombinedValues> = {};
  for (const o of report.objects) out[o.id] = o.combined ?? combineObject(o);
  return out;
}

function present<T>(list: ReadonlyArray<T | null>): T[] {
  return list.filter((x): x is T => x !== null);
}

/** The downloadable files, their site paths and how each is made from the report. */
export interface Download {
  readonly key: string;
  readonly path: string;
  readonly title: string;
  readonly format: string;
  readonly render: (report: AuditReport) => string;
  /** The same text in pieces, when the file is written through a buffer rather than as one string (see writeDownloads). */
  readonly chunks?: (report: AuditReport) => Iterable<string>;
}

/** A download made of pieces: its text is their concatenation. */
function inPieces(d: Omit<Download, "render" | "chunks"> & { readonly chunks: (report: AuditReport) => Iterable<string> }): Download {
  return { ...d, render: (report) => [...d.chunks(report)].join("") };
}

function* tableJsonChunks(report: AuditReport): Generator<string> {
  const rows = present(report.objects.map((o) => fragmentsOf(o).json));
  const empty = JSON.stringify({ tool: report.tool, settings: report.settings, columns: TABLE_COLUMNS, rows: [] }, null, 1);
  if (rows.length === 0) {
    yield empty + "\n";
    return;
  }
  const tail = '"rows": []\n}';
  yield empty.slice(0, -tail.length) + '"rows": [\n';
  for (let i = 0; i < rows.length; i++) yield i === 0 ? rows[i] : ",\n" + rows[i];
  yield "\n ]\n}\n";
}

export const DOWNLOADS: readonly Download[] = [
  inPieces({
    key: "table_csv",
    path: "downloads/reference-table.csv",
    title: "Reference table",
    format: "CSV (RFC 4180)",
    // toCsv(TABLE_COLUMNS, tableRows(report)), line by line
    chunks: (report) => csvChunks(TABLE_COLUMNS, present(report.objects.map((o) => fragmentsOf(o).csv))),
  }),
  inPieces({
    key: "table_json",
    path: "downloads/reference-table.json",
    title: "Reference table",
    format: "JSON",
    // JSON.stringify({ tool, settings, columns, rows: tableRows(report) }, null, 1), row by row
    chunks: tableJsonChunks,
  }),
  inPieces({
    key: "table_votable",
    path: "downloads/reference-table.vot",
    title: "Reference values combined per object and result",
    format: "VOTable 1.4",
    chunks: (report) => referenceTableChunks(report, report.objects.map((o) => fragmentsOf(o).votable)),
  }),
  {
    key: "audit_json",
    path: AUDIT_JSON_PATH,
    title: "Full audit (every input, result, comparison and record problem)",
    format: "JSON",
    render: (report) => jsonStreamedText(report as unknown as Record<string, unknown>, AUDIT_JSON_STREAMED, AUDIT_JSON_ELEMENTS),
  },
  inPieces({
    key: "references_bib",
    path: "downloads/references.bib",
    title: "References of every measurement",
    format: "BibTeX",
    // bibtexFile(report), object by object
    chunks: (report) => bibtexChunks(report.tool.version, report.objects.map((o) => fragmentsOf(o).bib)),
  }),
];
