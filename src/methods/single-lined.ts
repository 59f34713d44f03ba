import type { Issue } from "../problem.js";
import { ANGLE, DIMENSIONLESS, LENGTH, MASS, TIME, VELOCITY } from "../units/dimension.js";
import { defineMethod, type DrawColumns, type FormatNumber, type MethodEquation, type MethodInput, type SIInputs } from "./method.js";
import { companionMassColumn, inclinationColumn, oneColumn, scratchColumn, zeroColumn } from "./batch-shared.js";
import {
  TWO_PI,
  checkRanges,
  companionMassPartials,
  has,
  missing,
  paren,
  restrictRow,
  solveCompanionMass,
  type RangeRule,
  alignEquations,
} from "./shared.js";

/**
 * One velocity curve: the spectroscopic mass function and the projected
 * semi-major axis of the visible star; with the visible star's mass, the
 * companion's minimum mass (sin i = 1) and, with an inclination, its mass.
 */

const INPUTS: readonly MethodInput[] = [
  { slot: "period", field: "period", dimension: TIME, symbol: "P", description: "The orbital period", optional: false },
  { slot: "k1", field: "k1", dimension: VELOCITY, symbol: "K_{1}",
    description: "The velocity semi-amplitude of the visible star", optional: false },
  { slot: "eccentricity", field: "eccentricity", dimension: DIMENSIONLESS, symbol: "e",
    description: "The orbital eccentricity", optional: true },
  { slot: "inclination", field: "inclination", dimension: ANGLE, symbol: "i",
    description: "The orbital inclination", optional: true },
  { slot: "primary_mass", field: "primary_mass", dimension: MASS, symbol: "M_{1}",
    description: "The mass of the visible star, known from elsewhere", optional: true },
];

const SLOTS = INPUTS.map((i) => i.slot);

/** 1/(2π), so that the batch kernel multiplies where compute() divides (the same to rounding). */
const INV_TWO_PI = 1 / TWO_PI;

const RULES: Record<string, RangeRule> = {
  period: "positive",
  k1: "positive",
  eccentricity: "eccentricity",
  inclination: "inclination",
  primary_mass: "positive",
};

const EQUATIONS: readonly MethodEquation[] = [
  { results: ["mass_function"], latex: "\\mathcal{G}f(M) = \\frac{P\\,K_{1}^{3}\\,(1-e^{2})^{3/2}}{2\\pi} = \\frac{(\\mathcal{G}M_{2}\\sin i)^{3}}{(\\mathcal{G}M_{1}+\\mathcal{G}M_{2})^{2}}" },
  { results: ["a1_sin_i"], latex: "a_{1}\\sin i = \\frac{K_{1}\\,P\\,\\sqrt{1-e^{2}}}{2\\pi}" },
  { results: ["min_secondary_mass"], latex: "(\\mathcal{G}M_{2,\\min})^{3} = \\mathcal{G}f(M)\\,(\\mathcal{G}M_{1}+\\mathcal{G}M_{2,\\min})^{2}" },
  { results: ["secondary_mass"], latex: "(\\mathcal{G}M_{2}\\sin i)^{3} = \\mathcal{G}f(M)\\,(\\mathcal{G}M_{1}+\\mathcal{G}M_{2})^{2}" },
];

interface Core {
  readonly P: number;
  readonly K: number;
  readonly e: number;
  readonly f: number;
  readonly a1: number;
  readonly df: Record<string, number>;
  readonly da1: Record<string, number>;
}

function core(si: SIInputs): Core | undefined {
  if (!has(si, "period") || !has(si, "k1")) return undefined;
  const P = si.period;
  const K = si.k1;
  const e = has(si, "eccentricity") ? si.eccentricity : 0;
  const w = 1 - e * e;
  const f = (P * K ** 3 * w ** 1.5) / TWO_PI;
  const a1 = (K * P * Math.sqrt(w)) / TWO_PI;
  return {
    P, K, e, f, a1,
    df: { period: f / P, k1: (3 * f) / K, eccentricity: (-3 * e * f) / w },
    da1: { period: a1 / P, k1: a1 / K, eccentricity: (-e * a1) / w },
  };
}

export const singleLined = defineMethod({
  id: "single-lined",
  title: "Single-lined velocity curve (mass function)",
  summary:
    "The mass function and the projected orbit size from the period and the velocity semi-amplitude of one star, " +
    "as for a star with an unseen companion or a planet found by radial velocities. With the visible star's mass the " +
    "companion's minimum mass follows, and with an inclination its mass.",
  source: {
    cite:
      "The spectroscopic mass function f(M) = PK₁³(1−e²)^{3/2}/(2πG) = (M₂ sin i)³/(M₁+M₂)²; Hilditch 2001, " +
      "An Introduction to Close Binary Stars, Cambridge University Press, ch. 3 (from memory)",
  },
  inputs: INPUTS,
  results: [
    { name: "mass_function", dimension: MASS, symbol: "f(M)", description: "The spectroscopic mass function (M₂ sin i)³/(M₁+M₂)²", displayUnit: "Msun" },
    { name: "a1_sin_i", dimension: LENGTH, symbol: "a_{1}\\sin i", description: "The projected semi-major axis of the visible star's orbit", displayUnit: "au" },
    { name: "min_secondary_mass", dimension: MASS, symbol: "M_{2,\\min}", description: "The companion's minimum mass (sin i = 1), from the exact cubic", displayUnit: "Msun" },
    { name: "secondary_mass", dimension: MASS, symbol: "M_{2}", description: "The companion's mass at the given inclination", displayUnit: "Msun" },
  ],
  constants: [],
  equations: EQUATIONS,
  assumptions: [
    "point masses in Newtonian gravity, with no third body",
    "the semi-amplitude is that of the star's centre of mass (no tidal, rotational or heating distortion of the velocity curve)",
  ],

  validate(si: SIInputs): Issue[] {
    const issues = checkRanges(si, INPUTS, RULES);
    if (!has(si, "period")) issues.push(missing("period", "The orbital period is missing.", 'Add period, e.g. "4.2308 d".'));
    if (!has(si, "k1")) issues.push(missing("k1", "The velocity semi-amplitude is missing.", 'Add k1, e.g. "55.9 m/s".'));
    return issues;
  },

  implicitAssumptions(si: SIInputs): string[] {
    const out: string[] = [];
    if (!has(si, "eccentricity")) out.push("e = 0 assumed (no eccentricity given)");
    if (!has(si, "inclination")) out.push("sin i = 1 (minimum mass)");
    else if (!has(si, "primary_mass")) out.push("the inclination is not used: a companion mass needs the primary mass too");
    return out;
  },

  compute(si: SIInputs): Record<string, number> {
    const c = core(si);
    if (!c) return {};
    const out: Record<string, number> = { mass_function: c.f, a1_sin_i: c.a1 };
    if (has(si, "primary_mass")) {
      out.min_secondary_mass = solveCompanionMass(c.f, si.primary_mass, 1);
      if (has(si, "inclination")) out.secondary_mass = solveCompanionMass(c.f, si.primary_mass, Math.sin(si.inclination));
    }
    return out;
  },

  partials(si: SIInputs): Record<string, Record<string, number>> {
    const c = core(si);
    if (!c) return {};
    const out: Record<string, Record<string, number>> = {
      mass_function: restrictRow(si, SLOTS, c.df),
      a1_sin_i: restrictRow(si, SLOTS, c.da1),
    };
    if (has(si, "primary_mass")) {
      const m1 = si.primary_mass;
      const solved = (s: number, extra: Record<string, number>): Record<string, number> => {
        const m = solveCompanionMass(c.f, m1, s);
        const d = companionMassPartials(m, m1, s);
        const row: Record<string, number> = { primary_mass: d.dM1 };
        for (const [slot, v] of Object.entries(c.df)) row[slot] = d.dF * v;
        if (extra.inclination !== undefined) row.inclination = d.dSin * extra.inclination;
        return restrictRow(si, SLOTS, row);
      };
      out.min_secondary_mass = solved(1, {});
      if (has(si, "inclination")) {
        const i = si.inclination;
        out.secondary_mass = solved(Math.sin(i), { inclination: Math.cos(i) });
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
    const ecc = columns.eccentricity ?? zeroColumn(n);
    const f = out.mass_function;
    const a1 = out.a1_sin_i;
    for (let j = 0; j < n; j++) {
      const P = period[j];
      const K = k1[j];
      const e = ecc[j];
      const w = 1 - e * e;
      const root = Math.sqrt(w);
      const fj = P * (K * K * K) * (w * root) * INV_TWO_PI;
      const aj = K * P * root * INV_TWO_PI;
      f[j] = fj;
      a1[j] = aj;
      valid[j] = P > 0 && P < Infinity && K > 0 && K < Infinity && e >= 0 && e < 1 && fj - fj === 0 && aj - aj === 0 ? 1 : 0;
    }
    // sin i is checked whenever an inclination is given, used or not
    const incl = columns.inclination;
    const sines = incl === undefined ? undefined : scratchColumn(0, n);
    if (incl !== undefined) inclinationColumn(incl, n, sines!, valid);
    const primary = columns.primary_mass;
    if (primary !== undefined) {
      companionMassColumn(f, primary, oneColumn(n), n, out.min_secondary_mass, valid);
      if (sines !== undefined) companionMassColumn(f, primary, sines, n, out.secondary_mass, valid);
    }
  },
});

function substitutedSteps(si: SIInputs, results: Readonly<Record<string, number>>, fmt: FormatNumber): MethodEquation[] {
  const c = core(si);
  if (!c || !has(results, "mass_function")) return [];
  const P = paren(fmt, c.P, "period");
  const K = paren(fmt, c.K, "k1");
  const e = paren(fmt, c.e, "eccentricity");
  const out: MethodEquation[] = [
    {
      results: ["mass_function"],
      latex: `\\mathcal{G}f(M) = \\frac{${P}\\,${K}^{3}\\,\\left(1-${e}^{2}\\right)^{3/2}}{2\\pi} = ${fmt(results.mass_function, "mass_function")}`,
    },
  ];
  if (has(results, "a1_sin_i")) {
    out.push({
      results: ["a1_sin_i"],
      latex: `a_{1}\\sin i = \\frac{${K}\\,${P}\\,\\sqrt{1-${e}^{2}}}{2\\pi} = ${fmt(results.a1_sin_i, "a1_sin_i")}`,
    });
  }
  const f = paren(fmt, results.mass_function, "mass_function");
  if (has(si, "primary_mass") && has(results, "min_secondary_mass")) {
    out.push({
      results: ["min_secondary_mass"],
      latex:
        `(\\mathcal{G}M_{2,\\min})^{3} = ${f}\\,\\left(${fmt(si.primary_mass, "primary_mass")} + \\mathcal{G}M_{2,\\min}\\right)^{2}` +
        ` \\;\\Rightarrow\\; \\mathcal{G}M_{2,\\min} = ${fmt(results.min_secondary_mass, "min_secondary_mass")}`,
    });
  }
  if (has(si, "primary_mass") && has(si, "inclination") && has(results, "secondary_mass")) {
    out.push({
      results: ["secondary_mass"],
      latex:
        `\\left(\\mathcal{G}M_{2}\\,\\sin ${paren(fmt, si.inclination, "inclination")}\\right)^{3} = ${f}\\,` +
        `\\left(${fmt(si.primary_mass, "primary_mass")} + \\mathcal{G}M_{2}\\right)^{2}` +
        ` \\;\\Rightarrow\\; \\mathcal{G}M_{2} = ${fmt(results.secondary_mass, "secondary_mass")}`,
    });
  }
  return out;
}
