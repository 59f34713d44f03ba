import type { MeasurementAudit, ObjectAudit, ResultAudit } from "../audit/types.js";
import { formatNumber } from "../quantity/format.js";
import { findUnit } from "../units/catalog.js";
import type { Combined, CombinedEstimate, CombinedInput, CombinedValues, ExcludedInput } from "./types.js";
import { birgeScale, weightedAverage, type Datum } from "./weighted-average.js";

/**
 * Per object and result, the reference value combined from every measurement
 * marked `use: true` that gives the result. Measurements marked `use: false`
 * are listed with their comment as the reason and are not combined; neither
 * are results without a positive, finite uncertainty (they cannot be weighted).
 */

const compareText = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

function notUsedReason(m: MeasurementAudit): string {
  const comment = m.comment?.trim();
  return comment ? `marked not to be used: ${comment}` : "marked not to be used (no comment given)";
}

function weighable(r: ResultAudit): boolean {
  return (
    Number.isFinite(r.value_si) &&
    Number.isFinite(r.sigma_plus_si) &&
    Number.isFinite(r.sigma_minus_si) &&
    r.sigma_plus_si > 0 &&
    r.sigma_minus_si > 0
  );
}

/** The display unit most of the combined measurements use; ties go to the first by key. */
function displayUnitOf(results: readonly ResultAudit[]): { id: string; latex: string; scale: number } {
  const counts = new Map<string, number>();
  for (const r of results) counts.set(r.display_unit, (counts.get(r.display_unit) ?? 0) + 1);
  let best: ResultAudit | undefined;
  for (const r of results) if (!best || counts.get(r.display_unit)! > counts.get(best.display_unit)!) best = r;
  const unit = best ? findUnit(best.display_unit) : undefined;
  if (!best || !unit) return { id: best?.unit_si ?? "", latex: "", scale: 1 };
  return { id: unit.id, latex: unit.latex, scale: unit.scale };
}

function argMax(values: readonly number[]): number {
  let best = 0;
  for (let i = 1; i < values.length; i++) if (values[i] > values[best]) best = i;
  return best;
}

export function combineResult(result: string, measurements: readonly MeasurementAudit[]): Combined {
  const sorted = [...measurements].sort((a, b) => compareText(a.key, b.key));
  const used: Array<{ m: MeasurementAudit; r: ResultAudit }> = [];
  const excluded: ExcludedInput[] = [];
  for (const m of sorted) {
    const r = m.results[result];
    if (!r) continue;
    if (!m.use) excluded.push({ key: m.key, method: m.method, reason: notUsedReason(m) });
    else if (!weighable(r)) excluded.push({ key: m.key, method: m.method, reason: "no positive uncertainty, so it cannot be weighted" });
    else used.push({ m, r });
  }
  const notes: string[] = [];
  if (used.length === 0) {
    if (excluded.length > 0) notes.push("No measurement of this result could be combined.");
    return {
      result,
      count: 0,
      estimate: null,
      procedure: "weighted-mean",
      chi2: null,
      dof: 0,
      birge_ratio: null,
      scaled: false,
      inputs: [],
      heaviest: null,
      most_discordant: null,
      excluded,
      notes,
    };
  }

  const data: Datum[] = used.map(({ r }) => ({ value: r.value_si, plus: r.sigma_plus_si, minus: r.sigma_minus_si }));
  const avg = weightedAverage(data);
  const scale = birgeScale(avg.birge);
  const scaled = scale > 1;
  const inputs: CombinedInput[] = used.map(({ m, r }, i) => ({
    key: m.key,
    method: m.method,
    value_si: r.value_si,
    sigma_plus_si: r.sigma_plus_si,
    sigma_minus_si: r.sigma_minus_si,
    weight: avg.weights[i],
    pull: avg.pulls[i],
    chi2: avg.pulls[i] * avg.pulls[i],
  }));

  const unit = displayUnitOf(used.map((u) => u.r));
  const plus = avg.plus * scale;
  const minus = avg.minus * scale;
  const estimate: CombinedEstimate = {
    value_si: avg.mean,
    sigma_plus_si: plus,
    sigma_minus_si: minus,
    sigma_si: (plus + minus) / 2,
    internal_sigma_plus_si: avg.plus,
    internal_sigma_minus_si: avg.minus,
    unit_si: used[0].r.unit_si,
    display_unit: unit.id,
    display_unit_latex: unit.latex,
    value: avg.mean / unit.scale,
    sigma_plus: plus / unit.scale,
    sigma_minus: minus / unit.scale,
  };

  if (avg.asymmetric) {
    notes.push(
      "Some uncertainties are asymmetric: the average maximises Barlow's linear-σ likelihood and its interval is where χ² rises by 1; the two sides are not averaged.",
    );
  }
  if (avg.birge !== null) {
    const r = formatNumber(avg.birge, 3);
    notes.push(
      scaled
        ? `The measurements scatter more than their uncertainties allow (Birge ratio R = ${r} > 1): the uncertainty of the average is multiplied by R.`
        : `The scatter is within the uncertainties (Birge ratio R = ${r} ≤ 1): the uncertainty of the average is not scaled.`,
    );
    notes.push(
      "The average treats the measurements as independent; measurements that share an input (the same parallax, say) are not, and the combined uncertainty is then too small.",
    );
  }
  if (excluded.length > 0) {
    notes.push(`${excluded.length} measurement${excluded.length === 1 ? " is" : "s are"} listed but not combined.`);
  }

  return {
    result,
    count: used.length,
    estimate,
    procedure: avg.asymmetric ? "linear-sigma" : "weighted-mean",
    chi2: avg.chi2,
    dof: avg.dof,
    birge_ratio: avg.birge,
    scaled,
    inputs,
    heaviest: inputs[argMax(inputs.map((x) => x.weight))].key,
    most_discordant: inputs.length > 1 ? inputs[argMax(inputs.map((x) => x.chi2))].key : null,
    excluded,
    notes,
  };
}

/** Every result any of the object's measurements gives, combined; keys sorted. */
export function combineObject(object: ObjectAudit): CombinedValues {
  const names = new Set<string>();
  for (const m of object.measurements) for (const name of Object.keys(m.results)) names.add(name);
  const out: Record<string, Combined> = {};
  for (const name of [...names].sort(compareText)) out[name] = combineResult(name, object.measurements);
  return out;
}

/** combineObject for every object of a report, keyed by object id (sorted). */
export function combineReport(objects: readonly ObjectAudit[]): Readonly<Record<string, CombinedValues>> {
  const out: Record<string, CombinedValues> = {};
  for (const o of [...objects].sort((a, b) => compareText(a.id, b.id))) out[o.id] = combineObject(o);
  return out;
}
