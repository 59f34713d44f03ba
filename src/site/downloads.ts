import type { AuditReport } from "../audit/types.js";
import { bibtexFile } from "./bibtex.js";
import { toCsv } from "./csv.js";
import { TABLE_COLUMNS, tableRows } from "./table.js";
import type { CombinedValues } from "../combine/types.js";
import { combineObject } from "../combine/combine-object.js";
import { referenceTableVOTable } from "../export/votable.js";

/** The report's combined values keyed by object id (combined afresh for an object that carries none). */
export function combinedIndex(report: AuditReport): Record<string, CombinedValues> {
  const out: Record<string, CombinedValues> = {};
  for (const o of report.objects) out[o.id] = o.combined ?? combineObject(o);
  return out;
}

/** The downloadable files, their site paths and how each is made from the report. */
export interface Download {
  readonly key: string;
  readonly path: string;
  readonly title: string;
  readonly format: string;
  readonly render: (report: AuditReport) => string;
}

export const DOWNLOADS: readonly Download[] = [
  {
    key: "table_csv",
    path: "downloads/reference-table.csv",
    title: "Reference table",
    format: "CSV (RFC 4180)",
    render: (report) => toCsv(TABLE_COLUMNS, tableRows(report)),
  },
  {
    key: "table_json",
    path: "downloads/reference-table.json",
    title: "Reference table",
    format: "JSON",
    render: (report) =>
      JSON.stringify({ tool: report.tool, settings: report.settings, columns: TABLE_COLUMNS, rows: tableRows(report) }, null, 1) + "\n",
  },
  {
    key: "table_votable",
    path: "downloads/reference-table.vot",
    title: "Reference values combined per object and result",
    format: "VOTable 1.4",
    render: (report) => referenceTableVOTable(report, combinedIndex(report)),
  },
  {
    key: "audit_json",
    path: "downloads/audit.json",
    title: "Full audit (every input, result, comparison and record problem)",
    format: "JSON",
    render: (report) => JSON.stringify(report) + "\n",
  },
  {
    key: "references_bib",
    path: "downloads/references.bib",
    title: "References of every measurement",
    format: "BibTeX",
    render: (report) => bibtexFile(report),
  },
];
