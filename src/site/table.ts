import type { AuditReport, ObjectAudit, Status } from "../audit/types.js";
import { isSlug } from "../records/slug.js";
import { headlineOf, type Headline } from "./headline.js";
import { displayScale } from "./unit-display.js";

/**
 * One row of the reference table, with full-precision numbers. The page, the
 * CSV and the JSON downloads are all made from these rows. Numbers that are
 * not finite (z = ±∞ when a difference meets a zero uncertainty) are null.
 */
export interface TableRow {
  readonly object_id: string;
  readonly object_name: string;
  /** Site-relative path of the object's page, without the base path. */
  readonly page: string;
  readonly status: Status;
  readonly measurement_count: number;
  readonly measurement: string;
  readonly method: string;
  readonly result: string;
  readonly unit: string;
  readonly recomputed: number;
  readonly recomputed_sigma: number;
  readonly recomputed_si: number;
  readonly recomputed_sigma_si: number;
  readonly si_unit: string;
  readonly published_text: string;
  readonly published: number | null;
  readonly published_si: number | null;
  readonly z: number | null;
  readonly reference: string;
  readonly doi: string;
  readonly url: string;
  /** The combined reference value of the row's result, in `unit` and in SI; null when none could be formed. */
  readonly combined: number | null;
  /** Mean of its two sides (after any scaling by the Birge ratio). */
  readonly combined_sigma: number | null;
  readonly combined_si: number | null;
  readonly combined_sigma_si: number | null;
  /** Measurements combined (0 when none). */
  readonly combined_count: number;
  /** null for fewer than two measurements combined. */
  readonly birge_ratio: number | null;
}

/** The column order of the CSV download (our own plain names). */
export const TABLE_COLUMNS: ReadonlyArray<keyof TableRow> = [
  "object_id",
  "object_name",
  "status",
  "result",
  "recomputed",
  "recomputed_sigma",
  "unit",
  "published_text",
  "published",
  "z",
  "recomputed_si",
  "recomputed_sigma_si",
  "published_si",
  "si_unit",
  "measurement",
  "method",
  "measurement_count",
  "reference",
  "doi",
  "url",
  "page",
  "combined",
  "combined_sigma",
  "combined_si",
  "combined_sigma_si",
  "combined_count",
  "birge_ratio",
];

/** The site path of an object's page. Ids are slugs (the record loader enforces it); anything else is a programmer mistake. */
export function objectPath(id: string): string {
  if (!isSlug(id)) throw new Error(`object id ${JSON.stringify(id)} is not a slug (lower-case letters, digits and hyphens)`);
  return `objects/${id}/`;
}

function finiteOrNull(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

type CombinedColumns = Pick<TableRow, "combined" | "combined_sigma" | "combined_si" | "combined_sigma_si" | "combined_count" | "birge_ratio">;

function combinedColumns(obj: ObjectAudit, result: string, scale: number): CombinedColumns {
  const c = obj.combined?.[result];
  const e = c?.estimate;
  if (!c || !e) {
    return { combined: null, combined_sigma: null, combined_si: null, combined_sigma_si: null, combined_count: c?.count ?? 0, birge_ratio: null };
  }
  return {
    combined: finiteOrNull(e.value_si / scale),
    combined_sigma: finiteOrNull(e.sigma_si / scale),
    combined_si: finiteOrNull(e.value_si),
    combined_sigma_si: finiteOrNull(e.sigma_si),
    combined_count: c.count,
    birge_ratio: c.birge_ratio === null ? null : finiteOrNull(c.birge_ratio),
  };
}

export function tableRow(obj: ObjectAudit): TableRow | undefined {
  const h = headlineOf(obj);
  return h ? tableRowFor(obj, h) : undefined;
}

/** The row of an object from its headline (headlineOf), for callers that need the headline too. */
export function tableRowFor(obj: ObjectAudit, h: Headline): TableRow {
  const { measurement: m, result: r, comparison: c } = h;
  const scale = displayScale(r);
  return {
    object_id: obj.id,
    object_name: obj.name,
    page: objectPath(obj.id),
    status: obj.status,
    measurement_count: obj.measurements.length,
    measurement: m.key,
    method: m.method,
    result: r.name,
    unit: r.display_unit,
    recomputed: r.value,
    recomputed_sigma: r.sigma,
    recomputed_si: r.value_si,
    recomputed_sigma_si: r.sigma_si,
    si_unit: r.unit_si,
    published_text: c ? c.published_text : "",
    published: c ? finiteOrNull(c.published_si / scale) : null,
    published_si: c ? finiteOrNull(c.published_si) : null,
    z: c ? finiteOrNull(c.z) : null,
    reference: m.reference.cite,
    doi: m.reference.doi ?? "",
    url: m.reference.url ?? "",
    ...combinedColumns(obj, r.name, scale),
  };
}

/** One row per object that has at least one result, in report order. */
export function tableRows(report: AuditReport): TableRow[] {
  const rows: TableRow[] = [];
  for (const obj of report.objects) {
    const row = tableRow(obj);
    if (row) rows.push(row);
  }
  return rows;
}
