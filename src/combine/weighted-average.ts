/**
 * Weighted average of independent measurements, with χ², the Birge ratio and
 * asymmetric uncertainties.
 *
 * Symmetric uncertainties: the inverse-variance weighted mean
 *   x̄ = Σ wᵢxᵢ / Σ wᵢ,  wᵢ = 1/σᵢ²,  σ(x̄) = 1/√(Σ wᵢ),  χ² = Σ wᵢ(xᵢ − x̄)²
 * (Bevington & Robinson 2003, Data Reduction and Error Analysis for the
 * Physical Sciences, 3rd ed., ch. 4, from memory), and the Birge ratio
 * R = √(χ²/(N−1)), the ratio of the external to the internal error of the mean
 * (Birge 1932, Phys. Rev. 40, 207). R is the Particle Data Group's scale
 * factor S when no measurement is left out of S (Particle Data Group, Review
 * of Particle Physics, Introduction, the section on averages and fits, from
 * memory); the PDG also leaves out of S the measurements with σᵢ > 3√N σ(x̄),
 * which this module does not do.
 *
 * Asymmetric uncertainties (x +σ₊ −σ₋): the "linear σ" model of Barlow
 * (R. Barlow 2004, "Asymmetric statistical errors", arXiv:physics/0406120;
 * also PHYSTAT 2003 proceedings, from memory). Each measurement's likelihood
 * is a Gaussian whose width varies linearly with the true value μ:
 *   σᵢ(μ) = sᵢ + s′ᵢ(μ − xᵢ),  sᵢ = 2σ₊σ₋/(σ₊+σ₋),  s′ᵢ = (σ₊−σ₋)/(σ₊+σ₋),
 * so that σᵢ(xᵢ + σ₊) = σ₊ and σᵢ(xᵢ − σ₋) = σ₋. The estimate minimises
 * χ²(μ) = Σ ((μ − xᵢ)/σᵢ(μ))²; setting dχ²/dμ = 0 gives μ = Σ wᵢxᵢ/Σ wᵢ with
 * wᵢ = sᵢ/σᵢ(μ)³, solved by iteration. The interval is where χ² rises by 1
 * above its minimum, which may be asymmetric. With σ₊ = σ₋ everywhere this is
 * exactly the inverse-variance weighted mean. The two sides are never simply
 * averaged.
 */

export interface Datum {
  readonly value: number;
  /** Upper 1σ, > 0. */
  readonly plus: number;
  /** Lower 1σ, > 0. */
  readonly minus: number;
}

export interface Average {
  readonly mean: number;
  /** Upper and lower 1σ of the mean (internal: not scaled by the Birge ratio). */
  readonly plus: number;
  readonly minus: number;
  readonly chi2: number;
  readonly dof: number;
  /** √(χ²/(N−1)); null for a single measurement. */
  readonly birge: number | null;
  /** Each measurement's share of the total weight at the mean, summing to 1. */
  readonly weights: readonly number[];
  /** (xᵢ − mean)/σᵢ(mean) for each measurement; its square is the measurement's part of χ². */
  readonly pulls: readonly number[];
  readonly asymmetric: boolean;
}

function checkData(data: readonly Datum[]): void {
  if (data.length === 0) throw new Error("weightedAverage needs at least one measurement");
  for (const d of data) {
    if (!Number.isFinite(d.value) || !(d.plus > 0) || !(d.minus > 0) || !Number.isFinite(d.plus) || !Number.isFinite(d.minus)) {
      throw new Error(`weightedAverage: every measurement needs a finite value and positive finite uncertainties (got ${d.value} +${d.plus} -${d.minus})`);
    }
  }
}

function symmetricAverage(data: readonly Datum[]): Average {
  let sw = 0;
  let swx = 0;
  const w = data.map((d) => 1 / (d.plus * d.plus));
  data.forEach((d, i) => {
    sw += w[i];
    swx += w[i] * d.value;
  });
  const mean = swx / sw;
  const sigma = 1 / Math.sqrt(sw);
  const pulls = data.map((d) => (d.value - mean) / d.plus);
  const chi2 = pulls.reduce((s, p) => s + p * p, 0);
  const dof = data.length - 1;
  return {
    mean,
    plus: sigma,
    minus: sigma,
    chi2,
    dof,
    birge: dof > 0 ? Math.sqrt(chi2 / dof) : null,
    weights: w.map((x) => x / sw),
    pulls,
    asymmetric: false,
  };
}

interface LinearSigma {
  readonly x: number;
  readonly s: number;
  readonly sp: number;
}

/** Widths never fall below this fraction of sᵢ: beyond the model's pole the width is held there, so χ² only grows. */
const WIDTH_FLOOR = 1e-6;

function width(m: LinearSigma, mu: number): number {
  return Math.max(m.s + m.sp * (mu - m.x), WIDTH_FLOOR * m.s);
}

function chi2At(models: readonly LinearSigma[], mu: number): number {
  let c = 0;
  for (const m of models) {
    const u = (mu - m.x) / width(m, mu);
    c += u * u;
  }
  return c;
}

function fixedPoint(models: readonly LinearSigma[], start: number): number | undefined {
  let mu = start;
  for (let n = 0; n < 1000; n++) {
    let sw = 0;
    let swx = 0;
    for (const m of models) {
      const sig = width(m, mu);
      const w = m.s / (sig * sig * sig);
      sw += w;
      swx += w * m.x;
    }
    const next = swx / sw;
    if (Math.abs(next - mu) <= 1e-15 * Math.max(Math.abs(next), Math.abs(mu)) || next === mu) return next;
    mu = next;
  }
  return undefined;
}

/** Golden-section minimum of χ² on [lo, hi], the fallback when the iteration does not settle. */
function goldenMinimum(models: readonly LinearSigma[], lo: number, hi: number): number {
  const r = (Math.sqrt(5) - 1) / 2;
  let a = lo;
  let b = hi;
  let c = b - r * (b - a);
  let d = a + r * (b - a);
  for (let n = 0; n < 400 && b - a > 1e-15 * Math.max(Math.abs(a), Math.abs(b)); n++) {
    if (chi2At(models, c) < chi2At(models, d)) b = d;
    else a = c;
    c = b - r * (b - a);
    d = a + r * (b - a);
  }
  return (a + b) / 2;
}

/** Distance from `mu` in direction `dir` at which χ² reaches `target`. */
function riseTo(models: readonly LinearSigma[], mu: number, target: number, dir: 1 | -1, step: number): number {
  let near = 0;
  let far = step;
  for (let n = 0; n < 200 && chi2At(models, mu + dir * far) < target; n++) {
    near = far;
    far *= 2;
  }
  for (let n = 0; n < 200; n++) {
    const mid = (near + far) / 2;
    if (mid === near || mid === far) break;
    if (chi2At(models, mu + dir * mid) < target) near = mid;
    else far = mid;
  }
  return (near + far) / 2;
}

function linearSigmaAverage(data: readonly Datum[]): Average {
  const models: LinearSigma[] = data.map((d) => ({
    x: d.value,
    s: (2 * d.plus * d.minus) / (d.plus + d.minus),
    sp: (d.plus - d.minus) / (d.plus + d.minus),
  }));
  const start = symmetricAverage(models.map((m) => ({ value: m.x, plus: m.s, minus: m.s }))).mean;
  let mean = fixedPoint(models, start);
  if (mean === undefined) {
    const lo = Math.min(...data.map((d) => d.value - 5 * d.minus));
    const hi = Math.max(...data.map((d) => d.value + 5 * d.plus));
    mean = goldenMinimum(models, lo, hi);
  }
  const chi2 = chi2At(models, mean);
  const step = 1 / Math.sqrt(models.reduce((s, m) => s + 1 / (m.s * m.s), 0));
  const plus = riseTo(models, mean, chi2 + 1, 1, step);
  const minus = riseTo(models, mean, chi2 + 1, -1, step);
  const raw = models.map((m) => {
    const sig = width(m, mean!);
    return m.s / (sig * sig * sig);
  });
  const total = raw.reduce((s, w) => s + w, 0);
  const pulls = models.map((m) => (m.x - mean!) / width(m, mean!));
  const dof = data.length - 1;
  return {
    mean,
    plus,
    minus,
    chi2,
    dof,
    birge: dof > 0 ? Math.sqrt(chi2 / dof) : null,
    weights: raw.map((w) => w / total),
    pulls,
    asymmetric: true,
  };
}

/**
 * The weighted average of independent measurements: the inverse-variance
 * mean when every uncertainty is symmetric, else Barlow's linear-σ likelihood.
 * Throws for an empty list or a measurement without a positive uncertainty:
 * callers leave those out first (a programmer mistake otherwise).
 */
export function weightedAverage(data: readonly Datum[]): Average {
  checkData(data);
  if (data.length === 1) {
    // exactly the measurement itself (the sums would round it), with its own two sides
    const d = data[0];
    return { mean: d.value, plus: d.plus, minus: d.minus, chi2: 0, dof: 0, birge: null, weights: [1], pulls: [0], asymmetric: d.plus !== d.minus };
  }
  return data.every((d) => d.plus === d.minus) ? symmetricAverage(data) : linearSigmaAverage(data);
}

/** The Birge ratio's verdict: scale the uncertainty by R when R > 1, leave it alone otherwise. */
export function birgeScale(birge: number | null): number {
  return birge !== null && birge > 1 ? birge : 1;
}
