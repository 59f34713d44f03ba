import type {
  ComparisonAudit,
  InputAudit,
  MeasurementAudit,
  ObjectAudit,
  ResultAudit,
} from "../audit/types.js";
import type { MethodDefinition } from "../methods/method.js";
import type { Problem } from "../problem.js";
import { findUnit } from "../units/catalog.js";
import { budgetChart, comparisonChart } from "./charts.js";
import { formatByKind, formatPlain, formatRatio, formatWithSigma, formatZ, withUnit } from "./display.js";
import { renderTex } from "./katex.js";
import { referenceView, type ReferenceView } from "./reference-view.js";
import { statusView, type StatusView } from "./status.js";
import { displayScale, siUnitSymbol, unitSymbol } from "./unit-display.js";
import { plainName } from "./plain-name.js";
import { referenceValuesView, type ReferenceValueView } from "./combined-view.js";
import { diagnosisView, type DiagnosisView } from "./diagnosis-view.js";

/** What an object's audit page shows, already formatted. Text fields are record text: templates escape them. */
export interface ObjectPageView {
  readonly id: string;
  readonly name: string;
  readonly aliases: readonly string[];
  readonly notes?: string;
  readonly file: string;
  readonly status: StatusView;
  readonly measurements: readonly MeasurementView[];
  readonly problems: readonly Problem[];
  /** Per result the object's combination holds: the reference value and how it was formed. */
  readonly referenceValues: readonly ReferenceValueView[];
}

export interface InputView {
  readonly field: string;
  readonly label: string;
  /** KaTeX markup of the method's symbol for this input, "" when unknown. */
  readonly symbolHtml: string;
  readonly text: string;
  readonly kind: string;
  readonly published: string;
  readonly factor: string;
  readonly si: string;
}

export interface ComparisonView {
  readonly publishedText: string;
  readonly publishedKind: string;
  readonly publishedInUnit: string;
  readonly difference: string;
  readonly ratio: string;
  readonly z: string;
  readonly sigmaFrom: string;
  readonly status: StatusView;
  /** Inline SVG (built from escaped pieces). */
  readonly chartSvg: string;
}

export interface ResultView {
  readonly name: string;
  readonly label: string;
  readonly symbolHtml: string;
  readonly description: string;
  readonly unit: string;
  readonly firstOrder: string;
  readonly si: string;
  readonly monteCarlo?: {
    readonly median: string;
    readonly interval: string;
    readonly draws: number;
    readonly rejected: number;
  };
  readonly comparison?: ComparisonView;
  /** Likely causes, when the comparison is flagged (tension or discrepant). */
  readonly diagnosis?: DiagnosisView;
  /** Inline SVG (built from escaped pieces). */
  readonly budgetSvg: string;
}

export interface EquationView {
  readonly results: string;
  readonly generalHtml: string;
  readonly substitutedHtml: string;
}

export interface MeasurementView {
  readonly key: string;
  readonly anchor: string;
  readonly method: string;
  readonly methodTitle: string;
  readonly status: StatusView;
  readonly use: boolean;
  readonly comment?: string;
  readonly reference: ReferenceView;
  readonly assumptions: readonly string[];
  readonly inputs: readonly InputView[];
  readonly results: readonly ResultView[];
  readonly equations: readonly EquationView[];
  readonly seed: number;
}

export type MethodLookup = (id: string) => MethodDefinition | undefined;

const KIND_LABELS: Readonly<Record<string, string>> = {
  measured: "measured",
  exact: "exact (no uncertainty)",
  "upper-limit": "upper limit",
  "lower-limit": "lower limit",
};

export { plainName };

function inlineTex(tex: string | undefined): string {
  return tex ? renderTex(tex, false) : "";
}

function inputScale(input: InputAudit): number {
  const u = findUnit(input.unit);
  if (u) return u.scale;
  if (input.value !== 0) return input.value_si / input.value;
  return input.plus !== 0 ? input.plus_si / input.plus : 1;
}

function inputView(input: InputAudit, method: MethodDefinition | undefined): InputView {
  const def = method?.inputs.find((i) => i.slot === input.slot);
  const unit = unitSymbol(input.unit);
  const si = siUnitSymbol(input.unit_si);
  const scale = inputScale(input);
  const factor = unit === "" && si === "" ? "pure number" : `1\u00a0${unit || "(number)"} = ${withUnit(formatPlain(scale, 7), si)}`;
  return {
    field: input.field,
    label: def?.description ?? plainName(input.field),
    symbolHtml: inlineTex(def?.symbol),
    text: input.text,
    kind: KIND_LABELS[input.kind] ?? input.kind,
    published: withUnit(formatByKind(input.kind, input.value, input.plus, input.minus), unit),
    factor,
    si: withUnit(formatByKind(input.kind, input.value_si, input.plus_si, input.minus_si), si),
  };
}

function comparisonView(r: ResultAudit, c: ComparisonAudit, idPrefix: string): ComparisonView {
  const scale = displayScale(r);
  const unit = unitSymbol(r.display_unit);
  const diff = c.difference_si / scale;
  return {
    publishedText: c.published_text,
    publishedKind: KIND_LABELS[c.published_kind] ?? c.published_kind,
    publishedInUnit: withUnit(
      formatByKind(c.published_kind, c.published_si / scale, c.published_plus_si / scale, c.published_minus_si / scale),
      unit,
    ),
    difference: withUnit((diff > 0 ? "+" : "") + formatPlain(diff, 3), unit),
    ratio: formatRatio(c.ratio),
    z: formatZ(c.z),
    sigmaFrom: c.sigma_from === "published" ? "the published uncertainty" : "the recomputed uncertainty",
    status: statusView(c.status),
    chartSvg: comparisonChart(r, c, `${idPrefix}-comparison`, unit),
  };
}

function resultView(r: ResultAudit, m: MeasurementAudit, method: MethodDefinition | undefined): ResultView {
  const def = method?.results.find((x) => x.name === r.name);
  const scale = displayScale(r);
  const unit = unitSymbol(r.display_unit);
  const idPrefix = `${m.key}-${r.name}`;
  const c = m.comparisons[r.name];
  const out: { -readonly [K in keyof ResultView]: ResultView[K] } = {
    name: r.name,
    label: plainName(r.name),
    symbolHtml: inlineTex(def?.symbol),
    description: def?.description ?? "",
    unit,
    firstOrder: withUnit(formatWithSigma(r.value, r.sigma_plus_si / scale, r.sigma_minus_si / scale), unit),
    si: withUnit(formatWithSigma(r.value_si, r.sigma_plus_si, r.sigma_minus_si), siUnitSymbol(r.unit_si)),
    budgetSvg: budgetChart(r.budget, `${idPrefix}-budget`, plainName(r.name)),
  };
  if (r.mc) {
    const lo = r.mc.p16_si / scale;
    const hi = r.mc.p84_si / scale;
    const sigma = Math.max((hi - lo) / 2, 0);
    out.monteCarlo = {
      median: withUnit(formatWithSigma(r.mc.median_si / scale, r.mc.p84_si / scale - r.mc.median_si / scale, r.mc.median_si / scale - lo), unit),
      interval: withUnit(`${formatPlain(lo, sigma > 0 ? 5 : 6)} to ${formatPlain(hi, sigma > 0 ? 5 : 6)}`, unit),
      draws: r.mc.draws,
      rejected: r.mc.rejected,
    };
  }
  if (c) out.comparison = comparisonView(r, c, idPrefix);
  const d = m.diagnoses?.find((x) => x.result === r.name);
  if (d) out.diagnosis = diagnosisView(d);
  return out;
}

/** Inputs in the order the method declares its slots; unknown slots last, by field name. */
function inputsInMethodOrder(inputs: InputAudit[], method: MethodDefinition | undefined): InputAudit[] {
  const order = new Map((method?.inputs ?? []).map((i, n) => [i.slot, n]));
  const rank = (i: InputAudit): number => order.get(i.slot) ?? Number.MAX_SAFE_INTEGER;
  return [...inputs].sort((a, b) => rank(a) - rank(b) || (a.field < b.field ? -1 : a.field > b.field ? 1 : 0));
}

/**
 * Markup for a display equation: the typeset string, or a stand-in that a
 * page writer swaps for it (see page-bytes.ts). `repeats` says that other
 * pages show the very same TeX (a method's general form).
 */
export type DisplayTex = (tex: string, repeats?: boolean) => string;

const typesetDisplay: DisplayTex = (tex) => renderTex(tex, true);

function measurementView(m: MeasurementAudit, lookup: MethodLookup, displayTex: DisplayTex): MeasurementView {
  const method = lookup(m.method);
  const out: { -readonly [K in keyof MeasurementView]: MeasurementView[K] } = {
    key: m.key,
    anchor: `measurement-${m.key}`,
    method: m.method,
    methodTitle: method?.title ?? m.method,
    status: statusView(m.status),
    use: m.use,
    reference: referenceView(m.reference),
    assumptions: m.assumptions,
    inputs: inputsInMethodOrder(Object.values(m.inputs), method).map((i) => inputView(i, method)),
    results: Object.values(m.results).map((r) => resultView(r, m, method)),
    equations: m.equations.map((eq) => ({
      results: eq.results.map(plainName).join(", "),
      generalHtml: displayTex(eq.general, true),
      substitutedHtml: eq.substituted ? displayTex(eq.substituted) : "",
    })),
    seed: m.seed,
  };
  if (m.comment !== undefined) out.comment = m.comment;
  return out;
}

export function objectPageView(
  obj: ObjectAudit,
  lookup: MethodLookup,
  problems: readonly Problem[] = [],
  displayTex: DisplayTex = typesetDisplay,
): ObjectPageView {
  const out: { -readonly [K in keyof ObjectPageView]: ObjectPageView[K] } = {
    id: obj.id,
    name: obj.name,
    aliases: obj.aliases,
    file: obj.file,
    status: statusView(obj.status),
    measurements: obj.measurements.map((m) => measurementView(m, lookup, displayTex)),
    problems,
    referenceValues: referenceValuesView(obj),
  };
  if (obj.notes !== undefined) out.notes = obj.notes;
  return out;
}
