import type { AuditReport, ObjectAudit, Status } from "../audit/types.js";
import { STATUSES } from "../audit/types.js";
import { formatByKind, formatWithSigma, formatZ, withUnit } from "./display.js";
import { headlineCombined, headlineOf, type Headline } from "./headline.js";
import { combinedValueText } from "./combined-view.js";
import type { MethodLookup } from "./object-view.js";
import { plainName } from "./object-view.js";
import { statusView, type StatusView } from "./status.js";
import { tableRowFor, type TableRow } from "./table.js";
import { displayScale, unitSymbol } from "./unit-display.js";

/** One row of the table on the home page: the download row plus its printed forms and sort keys. */
export interface HomeRow {
  readonly row: TableRow;
  readonly status: StatusView;
  readonly aliases: string;
  readonly resultLabel: string;
  /** The combined reference value where it stands for the object (see headlineCombined), else the headline measurement's. */
  readonly recomputed: string;
  /** "combined over 3", "from orbit-2019" when the value is a combined one; "" when it is the headline measurement's. */
  readonly recomputedNote: string;
  readonly published: string;
  readonly z: string;
  readonly methodTitle: string;
  readonly measurementAnchor: string;
  /** Sort keys for the table script, as attribute text: SI value, |z| ("" when there is none). */
  readonly sortMass: string;
  readonly sortZ: string;
}

export interface StatusCount {
  readonly status: StatusView;
  readonly objects: number;
  readonly measurements: number;
}

export function homeRow(obj: ObjectAudit, lookup: MethodLookup): HomeRow | undefined {
  const h = headlineOf(obj);
  return h ? homeRowFor(obj, h, tableRowFor(obj, h), lookup) : undefined;
}

/** The home-table row from the object's headline and download row (headlineOf, tableRowFor), made once for both. */
export function homeRowFor(obj: ObjectAudit, h: Headline, row: TableRow, lookup: MethodLookup): HomeRow {
  const unit = unitSymbol(row.unit);
  const r = h.result;
  const scale = displayScale(r);
  const c = h.comparison;
  const combined = headlineCombined(obj, h);
  const note = !combined ? "" : combined.count > 1 ? `combined over ${combined.count}` : `from ${combined.inputs[0].key}`;
  return {
    row,
    status: statusView(obj.status),
    aliases: obj.aliases.join(", "),
    resultLabel: plainName(row.result),
    recomputed: combined ? combinedValueText(combined) : withUnit(formatWithSigma(r.value, r.sigma_plus_si / scale, r.sigma_minus_si / scale), unit),
    recomputedNote: note,
    published: c
      ? withUnit(formatByKind(c.published_kind, c.published_si / scale, c.published_plus_si / scale, c.published_minus_si / scale), unit)
      : "",
    z: c ? formatZ(c.z) : "",
    methodTitle: lookup(row.method)?.title ?? row.method,
    measurementAnchor: `measurement-${row.measurement}`,
    sortMass: String(combined ? combined.estimate!.value_si : row.recomputed_si),
    sortZ: c && !Number.isNaN(c.z) ? String(Math.abs(c.z)) : "",
  };
}

export function homeRows(report: AuditReport, lookup: MethodLookup): HomeRow[] {
  const out: HomeRow[] = [];
  for (const obj of report.objects) {
    const row = homeRow(obj, lookup);
    if (row) out.push(row);
  }
  return out;
}

/** Objects (by their worst status) and measurements in each status, most serious first. */
export function statusCounts(report: AuditReport): StatusCount[] {
  const objects = Object.fromEntries(STATUSES.map((s) => [s, 0])) as Record<Status, number>;
  for (const o of report.objects) objects[o.status]++;
  return [...STATUSES]
    .sort((a, b) => statusView(b).rank - statusView(a).rank)
    .map((s) => ({ status: statusView(s), objects: objects[s], measurements: report.summary.status_counts[s] ?? 0 }));
}
