import type { ObjectAudit, ResultAudit } from "../audit/types.js";
import type { Combined, CombinedValues } from "../combine/types.js";
import { findUnit } from "../units/catalog.js";
import { forestChart, type ForestRow } from "./charts.js";
import { formatPlain, formatShare, formatWithSigma, formatZ, withUnit } from "./display.js";
import { plainName } from "./plain-name.js";
import { unitSymbol } from "./unit-display.js";

/**
 * The "Reference values" section of an object page: per result, the value
 * combined over the measurements in use, how well they agree, which one
 * pulls hardest, which were left out and why, and a forest chart. Every text
 * is plain (templates escape it); the chart is built from escaped pieces.
 */

export interface CombinedInputView {
  readonly key: string;
  readonly anchor: string;
  readonly value: string;
  readonly weight: string;
  readonly pull: string;
}

export interface ExcludedView {
  readonly key: string;
  readonly anchor: string;
  readonly reason: string;
}

export interface PullView {
  readonly key: string;
  readonly anchor: string;
  /** "62.0 % of the weight" or "pull −1.85σ, 71.2 % of χ²". */
  readonly detail: string;
}

export interface ReferenceValueView {
  readonly result: string;
  readonly label: string;
  readonly anchor: string;
  /** "1.234 ± 0.012 M☉", or "" when no measurement could be combined. */
  readonly value: string;
  readonly count: number;
  readonly procedure: string;
  /** "—" for fewer than two measurements. */
  readonly chi2: string;
  readonly dof: number;
  /** "—" for fewer than two measurements. */
  readonly birge: string;
  readonly scaled: boolean;
  /** "uncertainty scaled by R = 1.73" when scaled, else "". */
  readonly scaledNote: string;
  /** Absent for fewer than two measurements. */
  readonly heaviest?: PullView;
  readonly mostDiscordant?: PullView;
  readonly inputs: readonly CombinedInputView[];
  readonly excluded: readonly ExcludedView[];
  readonly notes: readonly string[];
  /** Inline SVG; "" when fewer than two measurements give this result. */
  readonly chartSvg: string;
}

const PROCEDURES: Readonly<Record<Combined["procedure"], string>> = {
  "weighted-mean": "inverse-variance weighted mean",
  "linear-sigma": "Barlow's linear-σ likelihood (asymmetric uncertainties)",
};

const anchorOf = (key: string): string => `measurement-${key}`;

interface Scale {
  readonly scale: number;
  readonly symbol: string;
}

function scaleOf(unitId: string, fallback: ResultAudit | undefined): Scale {
  const u = findUnit(unitId);
  if (u) return { scale: u.scale, symbol: u.symbol };
  if (fallback && fallback.value !== 0) return { scale: fallback.value_si / fallback.value, symbol: unitSymbol(fallback.display_unit) };
  return { scale: 1, symbol: unitSymbol(unitId) };
}

/** The value ± σ that the section, the home table and the tests all print for a combined estimate. */
export function combinedValueText(c: Combined): string {
  const e = c.estimate;
  if (!e) return "";
  return withUnit(formatWithSigma(e.value, e.sigma_plus, e.sigma_minus), unitSymbol(e.display_unit));
}

export function referenceValueView(obj: ObjectAudit, c: Combined): ReferenceValueView {
  const e = c.estimate;
  const withResult = obj.measurements.filter((m) => m.results[c.result] !== undefined);
  const first = withResult[0]?.results[c.result];
  const unit = scaleOf(e ? e.display_unit : (first?.display_unit ?? ""), first);
  const used = new Set(c.inputs.map((i) => i.key));
  const excludedKeys = new Set(c.excluded.map((x) => x.key));
  const totalChi2 = c.chi2 ?? 0;

  const inputs: CombinedInputView[] = c.inputs.map((i) => ({
    key: i.key,
    anchor: anchorOf(i.key),
    value: withUnit(formatWithSigma(i.value_si / unit.scale, i.sigma_plus_si / unit.scale, i.sigma_minus_si / unit.scale), unit.symbol),
    weight: formatShare(i.weight),
    pull: formatZ(i.pull),
  }));
  const input = (key: string | null) => (key === null ? undefined : c.inputs.find((i) => i.key === key));
  const heavy = input(c.heaviest);
  const discordant = input(c.most_discordant);

  const rows: ForestRow[] = [];
  for (const m of withResult) {
    if (!used.has(m.key) && !excludedKeys.has(m.key)) continue;
    const r = m.results[c.result];
    const v = r.value_si / unit.scale;
    const plus = Number.isFinite(r.sigma_plus_si) && r.sigma_plus_si > 0 ? r.sigma_plus_si / unit.scale : 0;
    const minus = Number.isFinite(r.sigma_minus_si) && r.sigma_minus_si > 0 ? r.sigma_minus_si / unit.scale : 0;
    rows.push({ key: m.key, used: used.has(m.key), value: v, low: v - minus, high: v + plus });
  }
  const label = plainName(c.result);
  const chartSvg =
    rows.length >= 2
      ? forestChart(
          rows,
          e ? { value: e.value_si / unit.scale, low: (e.value_si - e.sigma_minus_si) / unit.scale, high: (e.value_si + e.sigma_plus_si) / unit.scale } : null,
          `reference-${c.result}-forest`,
          `Recomputed ${label} of each measurement with its 1σ error bar, and the combined value with its 1σ interval as a band${unit.symbol ? ` (${unit.symbol})` : ""}`,
          unit.symbol,
        )
      : "";

  const out: { -readonly [K in keyof ReferenceValueView]: ReferenceValueView[K] } = {
    result: c.result,
    label,
    anchor: `reference-${c.result}`,
    value: combinedValueText(c),
    count: c.count,
    procedure: PROCEDURES[c.procedure] ?? c.procedure,
    chi2: c.chi2 === null || c.count < 2 ? "\u2014" : formatPlain(c.chi2, 3),
    dof: c.dof,
    birge: c.birge_ratio === null ? "\u2014" : formatPlain(c.birge_ratio, 3),
    scaled: c.scaled,
    scaledNote: c.scaled && c.birge_ratio !== null ? `uncertainty scaled by R = ${formatPlain(c.birge_ratio, 3)}` : "",
    inputs,
    excluded: c.excluded.map((x) => ({ key: x.key, anchor: anchorOf(x.key), reason: x.reason })),
    notes: c.notes,
    chartSvg,
  };
  if (heavy && c.count > 1) out.heaviest = { key: heavy.key, anchor: anchorOf(heavy.key), detail: `${formatShare(heavy.weight)} of the weight` };
  if (discordant) {
    const share = totalChi2 > 0 ? `, ${formatShare(discordant.chi2 / totalChi2)} of χ²` : "";
    out.mostDiscordant = { key: discordant.key, anchor: anchorOf(discordant.key), detail: `pull ${formatZ(discordant.pull)}σ${share}` };
  }
  return out;
}

/** One view per result the object's combination holds, in its (sorted) key order. */
export function referenceValuesView(obj: ObjectAudit): ReferenceValueView[] {
  const combined: CombinedValues = obj.combined ?? {};
  return Object.values(combined).map((c) => referenceValueView(obj, c));
}
