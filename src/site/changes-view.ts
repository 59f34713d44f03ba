import path from "node:path";
import type { AuditReport, ObjectAudit } from "../audit/types.js";
import type { CombinedValues } from "../combine/types.js";
import type { Issue, Result } from "../problem.js";
import { compareReleases } from "../releases/compare-releases.js";
import type { ReleaseComparison, ReleaseValue } from "../releases/types.js";
import { formatWithSigma, formatZ, withUnit } from "./display.js";
import { plainName } from "./plain-name.js";
import { statusView, type StatusView } from "./status.js";
import { objectPath } from "./table.js";
import { unitSymbol } from "./unit-display.js";

/** An earlier audit to compare with: where it was read from, and what reading it gave. */
export interface PreviousAudit {
  readonly path: string;
  readonly audit: Result<AuditReport>;
}

export interface ObjectRefView {
  readonly id: string;
  readonly name: string;
  /** Site path of the object's page in this release; absent for an object that is gone. */
  readonly page?: string;
}

export interface MeasurementChangeView extends ObjectRefView {
  readonly key: string;
  readonly anchor: string;
}

export interface ResultChangeView extends ObjectRefView {
  readonly result: string;
  readonly label: string;
}

export interface MovedView extends ResultChangeView {
  readonly anchor: string;
  readonly before: string;
  readonly after: string;
  /** Shift in units of the two combined σ in quadrature, signed: "+2.31", "−0.40". */
  readonly shift: string;
  readonly absShift: number;
}

export interface StatusChangeView extends MeasurementChangeView {
  readonly before: StatusView;
  readonly after: StatusView;
}

export interface ChangesView {
  /** The file name of the previous audit (never the full path: the site is public). */
  readonly source: string;
  /** False when the previous audit could not be read; `problems` then says why and every list is empty. */
  readonly ok: boolean;
  readonly problems: readonly Issue[];
  readonly previousVersion: string;
  readonly previousObjects: number;
  readonly added: readonly ObjectRefView[];
  readonly removed: readonly ObjectRefView[];
  readonly measurementsAdded: readonly MeasurementChangeView[];
  readonly measurementsRemoved: readonly MeasurementChangeView[];
  /** Largest |shift| first. */
  readonly moved: readonly MovedView[];
  readonly resultsAdded: readonly ResultChangeView[];
  readonly resultsRemoved: readonly ResultChangeView[];
  readonly statusChanges: readonly StatusChangeView[];
  readonly notes: readonly string[];
  /** Number of changes listed. */
  readonly total: number;
  /** One line for the home page: "1 object added, 1 removed, 2 values moved, 1 status changed" or "no changes". */
  readonly headline: string;
}

const plural = (n: number, one: string, many: string): string => `${n} ${n === 1 ? one : many}`;

/** A message with the full path of the previous audit replaced by its file name. */
function withoutFullPath(text: string, full: string, name: string): string {
  return full ? text.split(full).join(name) : text;
}

function valueText(v: ReleaseValue): string {
  return withUnit(formatWithSigma(v.value, v.sigma_plus, v.sigma_minus), unitSymbol(v.display_unit));
}

function signedShift(x: number): string {
  const text = formatZ(x);
  return x > 0 && !text.startsWith("+") ? `+${text}` : text;
}

function empty(source: string, problems: readonly Issue[]): ChangesView {
  return {
    source,
    ok: false,
    problems,
    previousVersion: "",
    previousObjects: 0,
    added: [],
    removed: [],
    measurementsAdded: [],
    measurementsRemoved: [],
    moved: [],
    resultsAdded: [],
    resultsRemoved: [],
    statusChanges: [],
    notes: [],
    total: 0,
    headline: "",
  };
}

function headlineOf(c: ReleaseComparison): string {
  const parts: string[] = [];
  if (c.added.length) parts.push(`${plural(c.added.length, "object", "objects")} added`);
  if (c.removed.length) parts.push(`${plural(c.removed.length, "object", "objects")} removed`);
  const measurements = c.measurements_added.length + c.measurements_removed.length;
  if (measurements) parts.push(`${plural(measurements, "measurement", "measurements")} added or removed`);
  if (c.moved.length) parts.push(`${plural(c.moved.length, "reference value", "reference values")} moved`);
  const results = c.results_added.length + c.results_removed.length;
  if (results) parts.push(`${plural(results, "reference value", "reference values")} appeared or disappeared`);
  if (c.status_changes.length) parts.push(`${plural(c.status_changes.length, "status", "statuses")} changed`);
  return parts.length ? parts.join(", ") : "no changes";
}

/** The changes page of a release: the current audit against the previous one, or why it could not be compared. */
export function changesView(current: AuditReport, previous: PreviousAudit): ChangesView {
  const source = path.basename(previous.path);
  if (!previous.audit.ok) {
    const problems = previous.audit.issues.map((i) => ({ ...i, message: withoutFullPath(i.message, previous.path, source) }));
    return empty(source, problems);
  }
  const before = previous.audit.value;
  const index: Record<string, CombinedValues> = {};
  for (const o of current.objects) if (o.combined) index[o.id] = o.combined;
  // the previous audit's combinations are recomputed from its measurements, the same way for both
  const comparison = compareReleases(before, current, undefined, current.objects.every((o) => o.combined) ? index : undefined);

  const now = new Map<string, ObjectAudit>(current.objects.map((o) => [o.id, o] as const));
  const then = new Map<string, ObjectAudit>(before.objects.map((o) => [o.id, o] as const));
  const ref = (id: string): ObjectRefView => {
    const o = now.get(id);
    if (o) return { id, name: o.name, page: objectPath(id) };
    return { id, name: then.get(id)?.name ?? id };
  };
  const measurement = (id: string, key: string): MeasurementChangeView => ({ ...ref(id), key, anchor: `measurement-${key}` });
  const result = (id: string, r: string): ResultChangeView => ({ ...ref(id), result: r, label: plainName(r) });

  const moved: MovedView[] = comparison.moved
    .map((m) => ({
      ...result(m.id, m.result),
      anchor: `reference-${m.result}`,
      before: valueText(m.before),
      after: valueText(m.after),
      shift: signedShift(m.shift_sigma),
      absShift: Math.abs(m.shift_sigma),
    }))
    .sort((a, b) => (b.absShift === a.absShift ? 0 : Number.isNaN(a.absShift) ? 1 : Number.isNaN(b.absShift) ? -1 : b.absShift - a.absShift));

  const out = {
    source,
    ok: true,
    problems: [],
    previousVersion: before.tool.version,
    previousObjects: before.objects.length,
    added: comparison.added.map(ref),
    removed: comparison.removed.map(ref),
    measurementsAdded: comparison.measurements_added.map((m) => measurement(m.id, m.key)),
    measurementsRemoved: comparison.measurements_removed.map((m) => measurement(m.id, m.key)),
    moved,
    resultsAdded: comparison.results_added.map((r) => result(r.id, r.result)),
    resultsRemoved: comparison.results_removed.map((r) => result(r.id, r.result)),
    statusChanges: comparison.status_changes.map((s) => ({ ...measurement(s.id, s.key), before: statusView(s.before), after: statusView(s.after) })),
    notes: comparison.notes,
  };
  const total =
    out.added.length +
    out.removed.length +
    out.measurementsAdded.length +
    out.measurementsRemoved.length +
    out.moved.length +
    out.resultsAdded.length +
    out.resultsRemoved.length +
    out.statusChanges.length;
  return { ...out, total, headline: headlineOf(comparison) };
}
