import type { ComparisonAudit, MeasurementAudit, ObjectAudit, ResultAudit } from "../audit/types.js";
import type { Combined } from "../combine/types.js";

/** The one result that stands for an object in the reference table. */
export interface Headline {
  readonly measurement: MeasurementAudit;
  readonly result: ResultAudit;
  readonly comparison?: ComparisonAudit;
}

function zWeight(c: ComparisonAudit): number {
  return Number.isNaN(c.z) ? -1 : Math.abs(c.z);
}

/**
 * The comparison with the largest |z| over all the object's measurements (so
 * the row's z and status agree with the object's worst status); ties go to the
 * earlier measurement and result. An object with no comparison is shown by the
 * first result of its first measurement.
 */
export function headlineOf(obj: ObjectAudit): Headline | undefined {
  let best: Headline | undefined;
  let bestWeight = -Infinity;
  for (const m of obj.measurements) {
    for (const c of Object.values(m.comparisons)) {
      const r = m.results[c.result];
      if (!r) continue;
      const w = zWeight(c);
      if (w > bestWeight) {
        best = { measurement: m, result: r, comparison: c };
        bestWeight = w;
      }
    }
  }
  if (best) return best;
  for (const m of obj.measurements) {
    const first = Object.values(m.results)[0];
    if (first) return { measurement: m, result: first };
  }
  return undefined;
}

/**
 * The combined reference value the table shows for the headline's result in
 * place of the one measurement's value: when it combines two or more
 * measurements, or when its one measurement is another than the headline's
 * (the headline's is not in use). Undefined when the measurement's own value
 * stands (nothing combined, or the combination is that measurement alone).
 */
export function headlineCombined(obj: ObjectAudit, h: Headline): Combined | undefined {
  const c = obj.combined?.[h.result.name];
  if (!c || !c.estimate || c.count === 0) return undefined;
  if (c.count === 1 && c.inputs[0]?.key === h.measurement.key) return undefined;
  return c;
}
