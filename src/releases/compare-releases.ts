import type { AuditReport, ObjectAudit } from "../audit/types.js";
import { combineReport } from "../combine/combine-object.js";
import type { Combined, CombinedValues } from "../combine/types.js";
import type { MeasurementRef, MovedValue, ReleaseComparison, ReleaseValue, ResultRef, StatusChange } from "./types.js";

type CombinedIndex = Readonly<Record<string, CombinedValues>>;

const compareText = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

function releaseValue(c: Combined): ReleaseValue | undefined {
  const e = c.estimate;
  if (!e) return undefined;
  return {
    value_si: e.value_si,
    sigma_si: e.sigma_si,
    value: e.value,
    sigma_plus: e.sigma_plus,
    sigma_minus: e.sigma_minus,
    display_unit: e.display_unit,
    count: c.count,
  };
}

function byId(objects: readonly ObjectAudit[]): Map<string, ObjectAudit> {
  return new Map(objects.map((o) => [o.id, o] as const));
}

function settingsNotes(previous: AuditReport, current: AuditReport): string[] {
  const notes: string[] = [];
  if (previous.tool.version !== current.tool.version) {
    notes.push(`The tool version changed from ${previous.tool.version} to ${current.tool.version}.`);
  }
  if (previous.settings.constants !== current.settings.constants) {
    notes.push(`The constants changed from ${previous.settings.constants} to ${current.settings.constants}: values may move with them.`);
  }
  const a = previous.settings.thresholds;
  const b = current.settings.thresholds;
  if (a.tension !== b.tension || a.discrepant !== b.discrepant) {
    notes.push(
      `The thresholds changed from |z| > ${a.tension} / > ${a.discrepant} to |z| > ${b.tension} / > ${b.discrepant}: statuses may change without any value moving.`,
    );
  }
  return notes;
}

/**
 * What changed between two audits: objects and measurements added or
 * removed, combined values that moved (and by how many σ), and measurement
 * statuses that changed. Combined values are computed from the reports when
 * not given. Deterministic: every list is sorted.
 */
export function compareReleases(
  previous: AuditReport,
  current: AuditReport,
  combinedPrev?: CombinedIndex,
  combinedCurr?: CombinedIndex,
): ReleaseComparison {
  const before = byId(previous.objects);
  const after = byId(current.objects);
  const cPrev = combinedPrev ?? combineReport(previous.objects);
  const cCurr = combinedCurr ?? combineReport(current.objects);

  const added = [...after.keys()].filter((id) => !before.has(id)).sort(compareText);
  const removed = [...before.keys()].filter((id) => !after.has(id)).sort(compareText);
  const common = [...after.keys()].filter((id) => before.has(id)).sort(compareText);

  const measurementsAdded: MeasurementRef[] = [];
  const measurementsRemoved: MeasurementRef[] = [];
  const statusChanges: StatusChange[] = [];
  const moved: MovedValue[] = [];
  const resultsAdded: ResultRef[] = [];
  const resultsRemoved: ResultRef[] = [];

  for (const id of common) {
    const ms0 = new Map(before.get(id)!.measurements.map((m) => [m.key, m] as const));
    const ms1 = new Map(after.get(id)!.measurements.map((m) => [m.key, m] as const));
    for (const key of [...ms1.keys()].sort(compareText)) {
      const m0 = ms0.get(key);
      const m1 = ms1.get(key)!;
      if (!m0) measurementsAdded.push({ id, key });
      else if (m0.status !== m1.status) statusChanges.push({ id, key, before: m0.status, after: m1.status });
    }
    for (const key of [...ms0.keys()].sort(compareText)) if (!ms1.has(key)) measurementsRemoved.push({ id, key });

    const r0 = cPrev[id] ?? {};
    const r1 = cCurr[id] ?? {};
    const names = [...new Set([...Object.keys(r0), ...Object.keys(r1)])].sort(compareText);
    for (const result of names) {
      const v0 = r0[result] ? releaseValue(r0[result]) : undefined;
      const v1 = r1[result] ? releaseValue(r1[result]) : undefined;
      if (!v0 && v1) resultsAdded.push({ id, result });
      else if (v0 && !v1) resultsRemoved.push({ id, result });
      else if (v0 && v1 && v0.value_si !== v1.value_si) {
        const sigma = Math.hypot(v0.sigma_si, v1.sigma_si);
        const shift = sigma > 0 ? (v1.value_si - v0.value_si) / sigma : Math.sign(v1.value_si - v0.value_si) * Infinity;
        moved.push({ id, result, before: v0, after: v1, shift_sigma: shift });
      }
    }
  }

  return {
    added,
    removed,
    measurements_added: measurementsAdded,
    measurements_removed: measurementsRemoved,
    moved,
    results_added: resultsAdded,
    results_removed: resultsRemoved,
    status_changes: statusChanges,
    notes: settingsNotes(previous, current),
  };
}
