import { compare, statusOf } from "../audit/compare.js";
import type { AuditReport, ComparisonAudit, MeasurementAudit, Thresholds } from "../audit/types.js";
import { DEFAULT_SET, type ConstantSet } from "../constants/sets.js";
import { getMethod } from "../methods/index.js";
import type { MethodDefinition } from "../methods/method.js";
import { formatNumber } from "../quantity/format.js";
import type { MeasurementRecord, ObjectRecord } from "../records/types.js";
import { findUnit } from "../units/catalog.js";
import { applyInputChanges, reaudit, withoutUncertainty } from "./apply-change.js";
import { HYPOTHESES } from "./hypotheses.js";
import type { Change, Diagnosis, DiagnosisContext, Explanation, Hypothesis } from "./types.js";

/**
 * Tries every single slip of the hypothesis list on each flagged comparison
 * (status tension or discrepant) and keeps those after which the published
 * value sits within the tension threshold of the recomputed one, with z
 * computed exactly as the report computes it.
 *
 * The uncertainty rule (hypotheses with `omitted` slots): the published σ on
 * the side of the difference must match our first-order σ on the same side
 * computed without the omitted slots' uncertainty to within
 * SIGMA_MATCH (20 %), and that σ must be at most SIGMA_SHORTFALL (0.7) of our
 * σ with them, i.e. the omitted term carries more than half of our variance.
 * Then the omitted term is put back into the published σ in quadrature and z
 * is recomputed; the value itself is unchanged.
 */
export const SIGMA_MATCH = 0.2;
export const SIGMA_SHORTFALL = 0.7;

interface Evaluated {
  readonly z: number;
  readonly after: number;
  readonly kind: "value" | "uncertainty";
  readonly detail?: string;
}

const compareText = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

/** "the total mass of the two bodies", "the companion's minimum mass": the method's description up to any bracket or comma. */
function resultLabel(method: MethodDefinition, result: string): string {
  const d = method.results.find((r) => r.name === result)?.description;
  if (!d) return `the ${result.replace(/_/g, " ")}`;
  const cut = d.split(/ \(|,/)[0].trim();
  const lower = cut.charAt(0).toLowerCase() + cut.slice(1);
  return /^the /.test(lower) ? lower : `the ${lower}`;
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

function displayOf(audit: MeasurementAudit, result: string): { scale: number; symbol: string } {
  const id = audit.results[result]?.display_unit;
  const unit = id !== undefined ? findUnit(id) : undefined;
  if (!unit) return { scale: 1, symbol: audit.results[result]?.unit_si ?? "" };
  return { scale: unit.scale, symbol: unit.symbol };
}

function published(c: ComparisonAudit) {
  return { kind: c.published_kind, value: c.published_si, plus: c.published_plus_si, minus: c.published_minus_si };
}

function evaluateValue(ctx: DiagnosisContext, change: Change, thresholds: Thresholds): Evaluated | undefined {
  let audit = ctx.audit;
  if (change.inputs && change.inputs.length > 0) {
    const changed = reaudit(ctx.method, applyInputChanges(ctx.record, change.inputs), thresholds, ctx.constants);
    if (!changed) return undefined;
    audit = changed;
  }
  const own = audit.results[ctx.result];
  let value: number;
  let plus: number;
  let minus: number;
  const rc = change.result;
  if (rc?.kind === "use-result") {
    const other = audit.results[rc.result];
    if (!other) return undefined;
    ({ value_si: value, sigma_plus_si: plus, sigma_minus_si: minus } = other);
  } else {
    if (!own) return undefined;
    const f = rc?.kind === "factor" ? rc.factor : rc?.kind === "value" ? rc.value_si / own.value_si : 1;
    value = rc?.kind === "value" ? rc.value_si : own.value_si * f;
    plus = own.sigma_plus_si * Math.abs(f);
    minus = own.sigma_minus_si * Math.abs(f);
  }
  if (!Number.isFinite(value)) return undefined;
  const c = compare({ value, plus, minus }, published(ctx.comparison), thresholds);
  return { z: c.z, after: value, kind: "value" };
}

function evaluateUncertainty(ctx: DiagnosisContext, omitted: readonly string[], thresholds: Thresholds): Evaluated | undefined {
  const c = ctx.comparison;
  const ours = ctx.audit.results[ctx.result];
  if (!ours || omitted.length === 0) return undefined;
  const upper = c.difference_si > 0;
  const sigmaPublished = upper ? c.published_plus_si : c.published_minus_si;
  const withTerm = upper ? ours.sigma_plus_si : ours.sigma_minus_si;
  const reduced = reaudit(ctx.method, withoutUncertainty(ctx.record, omitted), thresholds, ctx.constants)?.results[ctx.result];
  if (!reduced) return undefined;
  const withoutTerm = upper ? reduced.sigma_plus_si : reduced.sigma_minus_si;
  if (!(sigmaPublished > 0 && withoutTerm > 0 && withTerm > 0)) return undefined;
  if (Math.abs(sigmaPublished / withoutTerm - 1) > SIGMA_MATCH) return undefined;
  if (withoutTerm > SIGMA_SHORTFALL * withTerm) return undefined;
  const term = Math.sqrt(Math.max(withTerm * withTerm - withoutTerm * withoutTerm, 0));
  const z = c.difference_si / Math.hypot(sigmaPublished, term);
  const d = displayOf(ctx.audit, ctx.result);
  const f = (x: number) => `${formatNumber(x / d.scale, 3)} ${d.symbol}`.trim();
  const detail =
    `The published uncertainty (${f(sigmaPublished)}) matches ours without the ${omitted.join(" and ")} term ` +
    `(${f(withoutTerm)}) but is far below ours with it (${f(withTerm)}): the term seems to be missing from the ` +
    `published error budget. With it restored, z would be ${formatNumber(z, 2)} instead of ${formatNumber(c.z, 2)}. ` +
    `This explains an understated uncertainty, not the value.`;
  return { z, after: ours.value_si, kind: "uncertainty", detail };
}

function explain(ctx: DiagnosisContext, h: Hypothesis, change: Change, e: Evaluated, thresholds: Thresholds): Explanation {
  const ours = ctx.audit.results[ctx.result].value_si;
  const pub = ctx.comparison.published_si;
  const slip = e.after / ours;
  const factor = pub / ours;
  let description: string;
  if (e.detail !== undefined) {
    description = e.detail;
  } else {
    const d = displayOf(ctx.audit, ctx.result);
    const v = (x: number) => `${formatNumber(x / d.scale, 5)} ${d.symbol}`.trim();
    description =
      `${capitalise(change.phrase)}, ${resultLabel(ctx.method, ctx.result)} would be ${formatNumber(slip, 5)} × ours ` +
      `(${v(e.after)}), against the published ${v(pub)} (${formatNumber(factor, 5)} × ours): ` +
      `z would be ${formatNumber(e.z, 2)} instead of ${formatNumber(ctx.comparison.z, 2)}.`;
  }
  return {
    hypothesis: h.id,
    title: h.title,
    description,
    kind: e.kind,
    z_after: e.z,
    status_after: statusOf(e.z, thresholds),
    factor,
    slip_factor: slip,
    recomputed_after_si: e.after,
  };
}

function summaryOf(ctx: DiagnosisContext, explained: readonly Explanation[], tried: number): string {
  const label = resultLabel(ctx.method, ctx.result);
  const z = formatNumber(ctx.comparison.z, 2);
  if (explained.length === 0) {
    return (
      `No single slip of the ${tried} tried reconciles the published value of ${label} with its own inputs (z = ${z}). ` +
      `The difference may come from inputs the record lacks, another method, rounding, or several slips at once: ` +
      `a prompt to reread the paper, not a verdict.`
    );
  }
  const best = explained[0];
  const count = explained.length === 1 ? "One single slip" : `${explained.length} single slips`;
  return (
    `${count} would reconcile the published value of ${label} (z = ${z}); the closest is "${best.title}" ` +
    `(z = ${formatNumber(best.z_after, 2)}). A match is a prompt to reread the paper with that slip in mind, not proof that it was made.`
  );
}

/** The diagnosis of one comparison of one measurement, whatever its status. */
export function diagnoseComparison(
  method: MethodDefinition,
  record: MeasurementRecord,
  audit: MeasurementAudit,
  result: string,
  thresholds: Thresholds,
  constants: ConstantSet = DEFAULT_SET,
  hypotheses: readonly Hypothesis[] = HYPOTHESES,
): Diagnosis {
  const comparison = audit.comparisons[result];
  if (!comparison) throw new Error(`diagnosis: measurement ${audit.key} has no comparison for ${result}`);
  const ctx: DiagnosisContext = { method, record, audit, result, comparison, constants };
  const explained: Explanation[] = [];
  const tried: string[] = [];
  for (const h of hypotheses) {
    if (!h.methods.includes(method.id)) continue;
    if (h.results && !h.results.includes(result)) continue;
    if (!h.applies(ctx)) continue;
    const change = h.transform(ctx);
    if (!change) continue;
    tried.push(h.id);
    const e = change.omitted ? evaluateUncertainty(ctx, change.omitted, thresholds) : evaluateValue(ctx, change, thresholds);
    if (e && Math.abs(e.z) <= thresholds.tension) explained.push(explain(ctx, h, change, e, thresholds));
  }
  explained.sort((a, b) => Math.abs(a.z_after) - Math.abs(b.z_after) || compareText(a.hypothesis, b.hypothesis));
  tried.sort(compareText);
  return {
    key: audit.key,
    method: method.id,
    result,
    status: comparison.status,
    z: comparison.z,
    explained,
    unexplained: explained.length === 0,
    summary: summaryOf(ctx, explained, tried.length),
    tried,
  };
}

/**
 * One diagnosis per flagged comparison (status tension or discrepant) of a
 * measurement, sorted by result name; empty when nothing is flagged.
 */
export function diagnose(
  method: MethodDefinition,
  record: MeasurementRecord,
  audit: MeasurementAudit,
  thresholds: Thresholds,
  constants: ConstantSet = DEFAULT_SET,
  hypotheses: readonly Hypothesis[] = HYPOTHESES,
): Diagnosis[] {
  return Object.keys(audit.comparisons)
    .sort(compareText)
    .filter((r) => audit.comparisons[r].status === "tension" || audit.comparisons[r].status === "discrepant")
    .map((r) => diagnoseComparison(method, record, audit, r, thresholds, constants, hypotheses));
}

/** Diagnoses keyed by object id, then measurement key; only measurements with a flagged comparison appear. */
export type DiagnosisIndex = Readonly<Record<string, Readonly<Record<string, readonly Diagnosis[]>>>>;

/** Every flagged comparison of a report, diagnosed against the records it was made from. */
export function diagnoseReport(report: AuditReport, records: readonly ObjectRecord[], constants: ConstantSet = DEFAULT_SET): DiagnosisIndex {
  const byId = new Map(records.map((r) => [r.id, r] as const));
  const out: Record<string, Record<string, readonly Diagnosis[]>> = {};
  for (const object of [...report.objects].sort((a, b) => compareText(a.id, b.id))) {
    const record = byId.get(object.id);
    if (!record) continue;
    const entries: Record<string, readonly Diagnosis[]> = {};
    for (const audit of [...object.measurements].sort((a, b) => compareText(a.key, b.key))) {
      const m = record.measurements.find((x) => x.key === audit.key);
      const method = getMethod(audit.method);
      if (!m || !method) continue;
      const found = diagnose(method, m, audit, report.settings.thresholds, constants);
      if (found.length > 0) entries[audit.key] = found;
    }
    if (Object.keys(entries).length > 0) out[object.id] = entries;
  }
  return out;
}
