import type { Issue } from "../problem.js";
import { ANGLE, DIMENSIONLESS, LENGTH, MASS, TIME, VELOCITY } from "../units/dimension.js";
import { defineMethod, type DrawColumns, type FormatNumber, type MethodEquation, type MethodInput, type SIInputs } from "./method.js";
import { inclinationColumn, scratchColumn, zeroColumn } from "./batch-shared.js";
import { STEP_SEPARATOR, TWO_PI, alignEquations, checkRanges, has, missing, paren, restrictRow, type RangeRule } from "./shared.js";

/**
 * Two velocity curves: the projected masses M sin³i of both stars, the
 * projected separation and the mass ratio; with an inclination (an eclipsing
 * or an astrometric binary) the masses themselves.
 */

const INPUTS: readonly MethodInput[] = [
  { slot: "period", field: "period", dimension: TIME, symbol: "P", description: "The orbital period", optional: false },
  { slot: "k1", field: "k1", dimension: VELOCITY, symbol: "K_{1}", description: "The velocity semi-amplitude of star 1", optional: false },
  { slot: "k2", field: "k2", dimension: VELOCITY, symbol: "K_{2}", description: "The velocity semi-amplitude of star 2", optional: false },
  { slot: "eccentricity", field: "eccentricity", dimension: DIMENSIONLESS, symbol: "e", description: "The orbital eccentricity", optional: true },
  { slot: "inclination", field: "inclination", dimension: ANGLE, symbol: "i", description: "The orbital inclination", optional: true },
];

const SLOTS = INPUTS.map((i) => i.slot);

/** 1/(2π), so that the batch kernel multiplies where compute() divides (the same to rounding). */
const INV_TWO_PI = 1 / TWO_PI;

const RULES: Record<string, RangeRule> = {
  period: "positive",
  k1: "positive",
  k2: "positive",
  eccentricity: "eccentricity",
  inclination: "inclination",
};

const EQUATIONS: readonly MethodEquation[] = [
  { results: ["m1_sin3i"], latex: "\\mathcal{G}M_{1}\\sin^{3} i = \\frac{P\\,(1-e^{2})^{3/2}\\,(K_{1}+K_{2})^{2}\\,K_{2}}{2\\pi}" },
  { results: ["m2_sin3i"], latex: "\\mathcal{G}M_{2}\\sin^{3} i = \\frac{P\\,(1-e^{2})^{3/2}\\,(K_{1}+K_{2})^{2}\\,K_{1}}{2\\pi}" },
  { results: ["a_sin_i"], latex: "a\\sin i = \\frac{(K_{1}+K_{2})\\,P\\,\\sqrt{1-e^{2}}}{2\\pi}" },
  { results: ["mass_ratio"], latex: "q = \\frac{M_{2}}{M_{1}} = \\frac{K_{1}}{K_{2}}" },
  {
    results: ["primary_mass", "secondary_mass"],
    latex: "\\mathcal{G}M_{1} = \\frac{\\mathcal{G}M_{1}\\sin^{3} i}{\\sin^{3} i}, \\qquad \\mathcal{G}M_{2} = \\frac{\\mathcal{G}M_{2}\\sin^{3} i}{\\sin^{3} i}",
  },
];

interface Core {
  readonly P: number;
  readonly K1: number;
  readonly K2: number;
  readonly e: number;
  readonly m1s: number;
  readonly m2s: number;
  readonly asini: number;
  readonly q: number;
  readonly d: Record<string, Record<string, number>>;
}

function core(si: SIInputs): Core | undefined {
  if (!has(si, "period") || !has(si, "k1") || !has(si, "k2")) return undefined;
  const P = si.period;
  const K1 = si.k1;
  const K2 = si.k2;
  const e = has(si, "eccentricity") ? si.eccentricity : 0;
  const w = 1 - e * e;
  const S = K1 + K2;
  const C = (P * w ** 1.5) / TWO_PI;
  const m1s = C * S * S * K2;
  const m2s = C * S * S * K1;
  const asini = (S * P * Math.sqrt(w)) / TWO_PI;
  const q = K1 / K2;
  return {
    P, K1, K2, e, m1s, m2s, asini, q,
    d: {
      m1_sin3i: { period: m1s / P, k1: (2 * m1s) / S, k2: (2 * m1s) / S + m1s / K2, eccentricity: (-3 * e * m1s) / w },
      m2_sin3i: { period: m2s / P, k1: (2 * m2s) / S + m2s / K1, k2: (2 * m2s) / S, eccentricity: (-3 * e * m2s) / w },
      a_sin_i: { period: asini / P, k1: asini / S, k2: asini / S, eccentricity: (-e * asini) / w },
      mass_ratio: { period: 0, k1: 1 / K2, k2: -K1 / (K2 * K2), eccentricity: 0 },
    },
  };
}

export const doubleLined = defineMethod({
  id: "double-lined",
  title: "Double-lined velocity curves",
  summary:
    "The projected masses M sin³i of both stars, the projected separation and the mass ratio from the period and both " +
    "velocity semi-amplitudes; with the inclination, as from eclipses or an astrometric orbit, the two masses.",
  source: {
    cite:
      "The double-lined spectroscopic binary relations M₁,₂ sin³i = P(1−e²)^{3/2}(K₁+K₂)²K₂,₁/(2πG) and M₂/M₁ = K₁/K₂; " +
      "Hilditch 2001, An Introduction to Close Binary Stars, Cambridge University Press, ch. 3 (from memory)",
  },
  inputs: INPUTS,
  results: [
    { name: "m1_sin3i", dimension: MASS, symbol: "M_{1}\\sin^{3} i", description: "The projected mass of star 1", displayUnit: "Msun" },
    { name: "m2_sin3i", dimension: MASS, symbol: "M_{2}\\sin^{3} i", description: "The projected mass of star 2", displayUnit: "Msun" },
    { name: "a_sin_i", dimension: LENGTH, symbol: "a\\sin i", description: "The projected semi-major axis of the relative orbit", displayUnit: "au" },
    { name: "mass_ratio", dimension: DIMENSIONLESS, symbol: "q", description: "The mass ratio M₂/M₁", displayUnit: "1" },
    { name: "primary_mass", dimension: MASS, symbol: "M_{1}", description: "The mass of star 1", displayUnit: "Msun" },
    { name: "secondary_mass", dimension: MASS, symbol: "M_{2}", description: "The mass of star 2", displayUnit: "Msun" },
  ],
  constants: [],
  equations: EQUATIONS,
  assumptions: [
    "point masses in Newtonian gravity, with no third body",
    "both semi-amplitudes belong to the stars' centres of mass (no proximity or line-blending effects)",
  ],

  validate(si: SIInputs): Issue[] {
    const issues = checkRanges(si, INPUTS, RULES);
    if (!has(si, "period")) issues.push(missing("period", "The orbital period is missing.", 'Add period, e.g. "24.59 d".'));
    if (!has(si, "k1")) issues.push(missing("k1", "The velocity semi-amplitude of star 1 is missing.", 'Add k1, e.g. "51.2 km/s".'));
    if (!has(si, "k2")) issues.push(missing("k2", "The velocity semi-amplitude of star 2 is missing.", 'Add k2, e.g. "49.1 km/s"; with one velocity curve only, use the single-lined method.'));
    return issues;
  },

  implicitAssumptions(si: SIInputs): string[] {
    const out: string[] = [];
    if (!has(si, "eccentricity")) out.push("e = 0 assumed (no eccentricity given)");
    if (!has(si, "inclination")) out.push("no inclination given: the masses are known only as M sin³i");
    return out;
  },

  compute(si: SIInputs): Record<string, number> {
    const c = core(si);
    if (!c) return {};
    const out: Record<string, number> = { m1_sin3i: c.m1s, m2_sin3i: c.m2s, a_sin_i: c.asini, mass_ratio: c.q };
    if (has(si, "inclination")) {
      const s3 = Math.sin(si.inclination) ** 3;
      out.primary_mass = c.m1s / s3;
      out.secondary_mass = c.m2s / s3;
    }
    return out;
  },

  partials(si: SIInputs): Record<string, Record<string, number>> {
    const c = core(si);
    if (!c) return {};
    const out: Record<string, Record<string, number>> = {};
    for (const [name, row] of Object.entries(c.d)) out[name] = restrictRow(si, SLOTS, row);
    if (has(si, "inclination")) {
      const i = si.inclination;
      const s = Math.sin(i);
      const s3 = s * s * s;
      const cot3 = (3 * Math.cos(i)) / s;
      for (const [name, proj] of [["primary_mass", "m1_sin3i"], ["secondary_mass", "m2_sin3i"]] as const) {
        const M = (proj === "m1_sin3i" ? c.m1s : c.m2s) / s3;
        const row: Record<string, number> = {};
        for (const [slot, v] of Object.entries(c.d[proj])) row[slot] = v / s3;
        row.inclination = -M * cot3;
        out[name] = restrictRow(si, SLOTS, row);
      }
    }
    return out;
  },

  substituted(si, results, fmt): MethodEquation[] {
    return alignEquations(EQUATIONS, substitutedSteps(si, results, fmt));
  },

  batch(columns: DrawColumns, n: number, out: Readonly<Record<string, Float64Array>>, valid: Uint8Array): void {
    const period = columns.period;
    const k1 = columns.k1;
    const k2 = columns.k2;
    const ecc = columns.eccentricity ?? zeroColumn(n);
    const m1Out = out.m1_sin3i;
    const m2Out = out.m2_sin3i;
    const aOut = out.a_sin_i;
    const qOut = out.mass_ratio;
    for (let j = 0; j < n; j++) {
      const P = period[j];
      const K1 = k1[j];
      const K2 = k2[j];
      const e = ecc[j];
      const w = 1 - e * e;
      const root = Math.sqrt(w);
      const S = K1 + K2;
      const C = P * (w * root) * INV_TWO_PI;
      const m1s = C * S * S * K2;
      const m2s = C * S * S * K1;
      const asini = S * P * root * INV_TWO_PI;
      const q = K1 / K2;
      m1Out[j] = m1s;
      m2Out[j] = m2s;
      aOut[j] = asini;
      qOut[j] = q;
      valid[j] =
        P > 0 && P < Infinity && K1 > 0 && K1 < Infinity && K2 > 0 && K2 < Infinity && e >= 0 && e < 1 &&
        m1s - m1s === 0 && m2s - m2s === 0 && asini - asini === 0 && q - q === 0
          ? 1
          : 0;
    }
    const incl = columns.inclination;
    if (incl !== undefined) {
      const sines = scratchColumn(0, n);
      inclinationColumn(incl, n, sines, valid);
      const primary = out.primary_mass;
      const secondary = out.secondary_mass;
      for (let j = 0; j < n; j++) {
        const s = sines[j];
        const s3 = s * s * s;
        const M1 = m1Out[j] / s3;
        const M2 = m2Out[j] / s3;
        primary[j] = M1;
        secondary[j] = M2;
        if (!(M1 - M1 === 0 && M2 - M2 === 0)) valid[j] = 0;
      }
    }
  },
});

function substitutedSteps(si: SIInputs, results: Readonly<Record<string, number>>, fmt: FormatNumber): MethodEquation[] {
  const c = core(si);
  if (!c || !has(results, "m1_sin3i")) return [];
  const P = paren(fmt, c.P, "period");
  const K1 = fmt(c.K1, "k1");
  const K2 = fmt(c.K2, "k2");
  const e = paren(fmt, c.e, "eccentricity");
  const sum = `\\left(${K1} + ${K2}\\right)`;
  const ecc = `\\left(1-${e}^{2}\\right)`;
  const out: MethodEquation[] = [
    {
      results: ["m1_sin3i"],
      latex: `\\mathcal{G}M_{1}\\sin^{3} i = \\frac{${P}\\,${ecc}^{3/2}\\,${sum}^{2}\\,\\left(${K2}\\right)}{2\\pi} = ${fmt(results.m1_sin3i, "m1_sin3i")}`,
    },
    {
      results: ["m2_sin3i"],
      latex: `\\mathcal{G}M_{2}\\sin^{3} i = \\frac{${P}\\,${ecc}^{3/2}\\,${sum}^{2}\\,\\left(${K1}\\right)}{2\\pi} = ${fmt(results.m2_sin3i, "m2_sin3i")}`,
    },
    {
      results: ["a_sin_i"],
      latex: `a\\sin i = \\frac{${sum}\\,${P}\\,\\sqrt{1-${e}^{2}}}{2\\pi} = ${fmt(results.a_sin_i, "a_sin_i")}`,
    },
    {
      results: ["mass_ratio"],
      latex: `q = \\frac{${K1}}{${K2}} = ${fmt(results.mass_ratio, "mass_ratio")}`,
    },
  ];
  if (has(si, "inclination") && has(results, "primary_mass") && has(results, "secondary_mass")) {
    const s3 = `\\sin^{3} ${paren(fmt, si.inclination, "inclination")}`;
    out.push({
      results: ["primary_mass", "secondary_mass"],
      latex:
        `\\mathcal{G}M_{1} = \\frac{${fmt(results.m1_sin3i, "m1_sin3i")}}{${s3}} = ${fmt(results.primary_mass, "primary_mass")}` +
        `${STEP_SEPARATOR}\\mathcal{G}M_{2} = \\frac{${fmt(results.m2_sin3i, "m2_sin3i")}}{${s3}} = ${fmt(results.secondary_mass, "secondary_mass")}`,
    });
  }
  return out;
}
