import { DEFAULT_SET, type ConstantSet } from "../constants/sets.js";
import { relativeUncertainty } from "../constants/constant.js";
import type { MethodDefinition, MethodResult } from "../methods/method.js";
import { latexNumber } from "../quantity/format.js";
import type { Quantity } from "../quantity/quantity.js";
import { computeSI } from "../quantity/compute-si.js";
import type { MeasurementRecord, SlotInput } from "../records/types.js";
import { findUnit } from "../units/catalog.js";
import { describeDimension, sameDimension, GRAVITATIONAL_PARAMETER, MASS, type Dimension } from "../units/dimension.js";
import type { Unit } from "../units/unit.js";
import { propagateFirstOrder, varianceShares, type SideUncertainty } from "../uncertainty/first-order.js";
import type { MonteCarloRun } from "../uncertainty/monte-carlo.js";
import { runMonteCarloJob, type MonteCarloJob } from "../uncertainty/monte-carlo-job.js";
import { hashSeed } from "../uncertainty/random.js";
import { compare, worstStatus } from "./compare.js";
import type {
  BudgetEntry,
  ComparisonAudit,
  EquationAudit,
  InputAudit,
  MeasurementAudit,
  ResultAudit,
  Thresholds,
} from "./types.js";

export interface AuditOptions {
  readonly draws: number;
  readonly thresholds: Thresholds;
  readonly constants?: ConstantSet;
}

const SI_UNITS: ReadonlyArray<readonly [Dimension, string, string]> = [
  [MASS, "kg", "\\mathrm{kg}"],
];

/** SI unit text and LaTeX for a dimension, as reports print them. Mass slots inside `compute` are GM. */
export function siUnitOf(d: Dimension): { text: string; latex: string } {
  for (const [dim, text, latex] of SI_UNITS) if (sameDimension(dim, d)) return { text, latex };
  const parts: Array<[string, number]> = [
    ["m", d.length],
    ["kg", d.mass],
    ["s", d.time],
    ["rad", d.angle],
  ];
  const present = parts.filter(([, n]) => n !== 0);
  if (present.length === 0) return { text: "", latex: "" };
  const text = present.map(([u, n]) => (n === 1 ? u : `${u}${n}`)).join(" ");
  const latex = "\\mathrm{" + present.map(([u, n]) => (n === 1 ? u : `${u}^{${n}}`)).join("\\,") + "}";
  return { text, latex };
}

const GM_UNIT = { text: "m3 s-2", latex: "\\mathrm{m^{3}\\,s^{-2}}" };

function isMass(d: Dimension): boolean {
  return sameDimension(d, MASS);
}

function inputAudit(input: SlotInput): InputAudit {
  const q = input.quantity;
  const s = q.unit.scale;
  return {
    field: input.field,
    slot: input.slot,
    text: q.text,
    kind: q.kind,
    value: q.value,
    plus: q.plus,
    minus: q.minus,
    unit: q.unit.id,
    unit_latex: q.unit.latex,
    value_si: q.value * s,
    plus_si: q.plus * s,
    minus_si: q.minus * s,
    unit_si: siUnitOf(q.unit.dimension).text,
  };
}

function isGM(d: Dimension): boolean {
  return sameDimension(d, GRAVITATIONAL_PARAMETER);
}

/** A published value may be given in the result's dimension or, for a mass, as GM (km³ s⁻²). */
export function acceptsPublishedDimension(result: Dimension, published: Dimension): boolean {
  return sameDimension(result, published) || (isMass(result) && isGM(published));
}

/** Factor from a published value in its unit to reporting SI (kg for masses). */
function publishedScale(result: MethodResult, pub: Quantity, K: ConstantSet): number {
  return isMass(result.dimension) && isGM(pub.unit.dimension) ? pub.unit.scale / K.G.value : pub.unit.scale;
}

/**
 * Value and σ in the display unit. Nominal solar and planetary units and GM
 * units are read straight from GM, so they carry no G uncertainty; kg and g
 * are read from the kilogram value, which does.
 */
function inDisplayUnit(
  result: MethodResult,
  unit: Unit,
  gm: { value: number; sigma: number },
  kg: { value: number; sigma: number },
): { value: number; sigma: number } {
  if (isMass(result.dimension)) {
    if (isGM(unit.dimension)) return { value: gm.value / unit.scale, sigma: gm.sigma / unit.scale };
    if (unit.gm !== undefined && (unit.gmRelativeUncertainty ?? 0) === 0) {
      return { value: gm.value / unit.gm, sigma: gm.sigma / unit.gm };
    }
  }
  return { value: kg.value / unit.scale, sigma: kg.sigma / unit.scale };
}

/** Display unit of a result: the published one when given, else the method's default. */
function displayUnitFor(result: MethodResult, published: Quantity | undefined): Unit {
  if (published && acceptsPublishedDimension(result.dimension, published.unit.dimension)) {
    return published.unit;
  }
  const u = findUnit(result.displayUnit);
  if (!u) throw new Error(`method result ${result.name}: display unit ${result.displayUnit} is not in the catalogue`);
  return u;
}

/** Convert a compute-space value (GM for masses) to reporting SI (kg for masses). */
function reportSI(result: MethodResult, value: number, K: ConstantSet): number {
  return isMass(result.dimension) ? value / K.G.value : value;
}

export function measurementSeed(objectId: string, key: string): number {
  return hashSeed(`${objectId}/${key}`);
}

/** The Monte Carlo of one measurement, or undefined when no draws are asked for. */
export function monteCarloJob(objectId: string, method: MethodDefinition, m: MeasurementRecord, options: AuditOptions): MonteCarloJob | undefined {
  if (!(options.draws > 0)) return undefined;
  const inputs = Object.keys(m.inputs).sort().map((slot) => ({ slot, ...computeSI(m.inputs[slot].quantity) }));
  return { method: method.id, inputs, draws: options.draws, seed: measurementSeed(objectId, m.key) };
}

/**
 * The audit of one measurement. `monteCarlo`, when given, is the finished run
 * of `monteCarloJob` for it (as from a worker thread); otherwise the draws are
 * made here when `options.draws` > 0.
 */
export function auditMeasurement(
  objectId: string,
  method: MethodDefinition,
  m: MeasurementRecord,
  options: AuditOptions,
  monteCarlo?: MonteCarloRun,
): MeasurementAudit {
  const audit = auditWithoutDraws(objectId, method, m, options);
  const job = monteCarlo === undefined ? monteCarloJob(objectId, method, m, options) : undefined;
  const mc = monteCarlo ?? (job ? runMonteCarloJob(method, job) : undefined);
  return mc ? withMonteCarlo(audit, mc, method, options) : audit;
}

/** Adds the Monte Carlo summary to each result it covers, as the last field of the result. */
export function withMonteCarlo(audit: MeasurementAudit, mc: MonteCarloRun, method: MethodDefinition, options: AuditOptions): MeasurementAudit {
  if (mc.draws === 0) return audit;
  const K = options.constants ?? DEFAULT_SET;
  const results: Record<string, ResultAudit> = {};
  for (const [name, entry] of Object.entries(audit.results)) {
    const s = mc.summaries[name];
    const def = method.results.find((r) => r.name === name);
    if (!s || !def) {
      results[name] = entry;
      continue;
    }
    const f = isMass(def.dimension) ? 1 / K.G.value : 1;
    results[name] = {
      ...entry,
      mc: {
        draws: mc.draws,
        rejected: mc.rejected,
        median_si: s.median * f,
        p16_si: s.p16 * f,
        p84_si: s.p84 * f,
        mean_si: s.mean * f,
        sd_si: s.sd * f,
      },
    };
  }
  return { ...audit, results };
}

/** The audit of one measurement without its Monte Carlo. */
export function auditWithoutDraws(objectId: string, method: MethodDefinition, m: MeasurementRecord, options: AuditOptions): MeasurementAudit {
  const K = options.constants ?? DEFAULT_SET;
  const gRel = relativeUncertainty(K.G);
  const slots = Object.keys(m.inputs).sort();
  const si: Record<string, number> = {};
  const sides: Record<string, SideUncertainty> = {};
  for (const slot of slots) {
    const v = computeSI(m.inputs[slot].quantity);
    si[slot] = v.value;
    sides[slot] = { plus: v.plus, minus: v.minus };
  }

  const computed = method.compute(si);
  const partials = method.partials(si);
  const seed = measurementSeed(objectId, m.key);

  const labels: Record<string, string> = {};
  for (const i of method.inputs) labels[i.slot] = i.field.replace(/_/g, " ");
  labels.G = "G (CODATA 2018)";

  const results: Record<string, ResultAudit> = {};
  const comparisons: Record<string, ComparisonAudit> = {};
  for (const def of method.results) {
    if (!(def.name in computed)) continue;
    const raw = computed[def.name];
    const fo = propagateFirstOrder(partials[def.name] ?? {}, sides);
    const variances: Record<string, number> = { ...fo.variances };
    let value_si = reportSI(def, raw, K);
    let plus = reportSI(def, fo.plus, K);
    let minus = reportSI(def, fo.minus, K);
    if (isMass(def.dimension)) {
      // M = GM / G: G's relative uncertainty adds in quadrature, for kilograms only
      plus = Math.hypot(plus, value_si * gRel);
      minus = Math.hypot(minus, value_si * gRel);
      const gmToKg = 1 / K.G.value;
      for (const k of Object.keys(variances)) variances[k] *= gmToKg * gmToKg;
      variances.G = (value_si * gRel) ** 2;
    }
    const sigma = (plus + minus) / 2;
    const budget: BudgetEntry[] = varianceShares(variances).map(({ source, share }) => ({
      source,
      label: labels[source] ?? source,
      share,
    }));
    const pub = m.published[def.name]?.quantity;
    const unit = displayUnitFor(def, pub);
    const unitSI = siUnitOf(def.dimension);
    const entry: ResultAudit = {
      name: def.name,
      value_si,
      sigma_si: sigma,
      sigma_plus_si: plus,
      sigma_minus_si: minus,
      unit_si: unitSI.text,
      display_unit: unit.id,
      display_unit_latex: unit.latex,
      ...inDisplayUnit(def, unit, { value: raw, sigma: fo.sigma }, { value: value_si, sigma }),
      budget,
    };
    results[def.name] = entry;

    if (pub) {
      if (!acceptsPublishedDimension(def.dimension, pub.unit.dimension)) {
        throw new Error(`published ${def.name} has dimension ${describeDimension(pub.unit.dimension)}: the loader should have refused it`);
      }
      const s = publishedScale(def, pub, K);
      const c = compare(
        { value: value_si, plus, minus },
        { kind: pub.kind, value: pub.value * s, plus: pub.plus * s, minus: pub.minus * s },
        options.thresholds,
      );
      comparisons[def.name] = {
        result: def.name,
        published_text: pub.text,
        published_kind: pub.kind,
        published_value: pub.value,
        published_plus: pub.plus,
        published_minus: pub.minus,
        published_unit: pub.unit.id,
        published_si: pub.value * s,
        published_plus_si: pub.plus * s,
        published_minus_si: pub.minus * s,
        difference_si: c.difference,
        ratio: c.ratio,
        sigma_used_si: c.sigmaUsed,
        sigma_from: c.sigmaFrom,
        z: c.z,
        status: c.status,
      };
    }
  }

  const equations = buildEquations(method, si, computed, K);
  const assumptions = [...method.assumptions, ...method.implicitAssumptions(si)];
  const status = worstStatus(Object.values(comparisons).map((c) => c.status));
  const out: MeasurementAudit = {
    key: m.key,
    method: method.id,
    status,
    use: m.use,
    ...(m.comment !== undefined ? { comment: m.comment } : {}),
    reference: m.reference,
    inputs: Object.fromEntries(slots.map((slot) => [m.inputs[slot].field, inputAudit(m.inputs[slot])])),
    assumptions,
    results,
    comparisons,
    equations,
    seed,
  };
  return out;
}

function buildEquations(
  method: MethodDefinition,
  si: Record<string, number>,
  computed: Record<string, number>,
  K: ConstantSet,
): EquationAudit[] {
  const dims: Record<string, Dimension> = {};
  for (const i of method.inputs) dims[i.slot] = i.dimension;
  for (const r of method.results) dims[r.name] = r.dimension;
  const fmt = (valueSI: number, name: string): string => {
    const d = dims[name];
    const unit = d && isMass(d) ? GM_UNIT : d ? siUnitOf(d) : { latex: "" };
    const number = latexNumber(valueSI);
    return unit.latex ? `${number}\\,${unit.latex}` : number;
  };
  const substituted = method.substituted(si, computed, fmt);
  // an equation whose substituted form is empty does not apply to the inputs given
  const out: EquationAudit[] = method.equations
    .map((eq, i) => ({ results: eq.results, general: eq.latex, substituted: substituted[i]?.latex ?? "" }))
    .filter((eq) => eq.substituted !== "");
  // the step from GM to solar masses needs no G; kilograms do
  for (const r of method.results) {
    if (!isMass(r.dimension) || !(r.name in computed)) continue;
    const gm = computed[r.name];
    out.push({
      results: [r.name],
      general: `${r.symbol} = \\frac{\\mathcal{G}${r.symbol}}{(\\mathcal{GM})^{\\mathrm{N}}_{\\odot}}\\,M_{\\odot} = \\frac{\\mathcal{G}${r.symbol}}{G}`,
      substituted:
        `${r.symbol} = \\frac{${latexNumber(gm)}\\,${GM_UNIT.latex}}{${latexNumber(K.GM_sun.value, 8)}\\,${GM_UNIT.latex}}\\,M_{\\odot} = ` +
        `${latexNumber(gm / K.GM_sun.value)}\\,M_{\\odot} = ${latexNumber(gm / K.G.value)}\\,\\mathrm{kg}`,
    });
  }
  return out;
}
