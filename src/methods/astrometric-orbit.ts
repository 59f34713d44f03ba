import type { Issue } from "../problem.js";
import { ANGLE, DIMENSIONLESS, LENGTH, MASS, TIME } from "../units/dimension.js";
import { defineMethod, type DrawColumns, type FormatNumber, type MethodEquation, type MethodInput, type SIInputs } from "./method.js";
import {
  companionMassColumn,
  keplerColumn,
  lengthColumn,
  oneColumn,
  requireOtherPositive,
  scratchColumn,
  slotsWithRule,
  zeroColumn,
} from "./batch-shared.js";
import {
  FOUR_PI_SQUARED,
  STEP_SEPARATOR,
  addChain,
  checkLengthCombination,
  checkRanges,
  companionMassPartials,
  has,
  lengthAssumptions,
  lengthOf,
  lengthSteps,
  missing,
  paren,
  restrictRow,
  solveCompanionMass,
  type RangeRule,
  alignEquations,
} from "./shared.js";

/**
 * Kepler's third law on one component's orbit about the barycentre: the
 * astrometric mass function, and the unseen companion's mass once the
 * measured component's mass is known.
 */

const INPUTS: readonly MethodInput[] = [
  { slot: "period", field: "period", dimension: TIME, symbol: "P", description: "The orbital period", optional: false },
  { slot: "semimajor_axis", field: "semimajor_axis", dimension: LENGTH, symbol: "a_{1}",
    description: "The semi-major axis of the measured component's orbit about the barycentre, as a length", optional: true },
  { slot: "angular_semimajor_axis", field: "semimajor_axis", dimension: ANGLE, symbol: "\\alpha_{1}",
    description: "The semi-major axis of the measured component's orbit about the barycentre, as an angle on the sky", optional: true },
  { slot: "parallax", field: "parallax", dimension: ANGLE, symbol: "\\varpi",
    description: "The parallax, turning the angular semi-major axis into a length", optional: true },
  { slot: "distance", field: "distance", dimension: LENGTH, symbol: "d",
    description: "The distance, turning the angular semi-major axis into a length", optional: true },
  { slot: "primary_mass", field: "primary_mass", dimension: MASS, symbol: "M_{1}",
    description: "The mass of the component whose orbit was measured", optional: true },
  { slot: "eccentricity", field: "eccentricity", dimension: DIMENSIONLESS, symbol: "e",
    description: "The orbital eccentricity (shown only: the mass function does not depend on it)", optional: true },
];

const SLOTS = INPUTS.map((i) => i.slot);

const RULES: Record<string, RangeRule> = {
  period: "positive",
  semimajor_axis: "positive",
  angular_semimajor_axis: "positive",
  parallax: "positive",
  distance: "positive",
  primary_mass: "positive",
  eccentricity: "eccentricity",
};

/** Slots under the "positive" rule, for the batch kernel. */
const POSITIVE_SLOTS = slotsWithRule(RULES, "positive");

const EQUATIONS: readonly MethodEquation[] = [
  {
    results: ["mass_function"],
    latex:
      "\\mathcal{G}f(M) = \\frac{4\\pi^{2}\\,a_{1}^{3}}{P^{2}} = \\frac{(\\mathcal{G}M_{2})^{3}}{(\\mathcal{G}M_{1}+\\mathcal{G}M_{2})^{2}}, \\qquad a_{1} = \\alpha_{1}\\,d, \\qquad d = \\frac{1\\,\\mathrm{au}}{\\varpi}",
  },
  {
    results: ["secondary_mass"],
    latex: "(\\mathcal{G}M_{2})^{3} = \\mathcal{G}f(M)\\,(\\mathcal{G}M_{1}+\\mathcal{G}M_{2})^{2}",
  },
];

function massFunction(si: SIInputs): { value: number; partials: Record<string, number>; a1: number } | undefined {
  if (!has(si, "period")) return undefined;
  const a = lengthOf(si, "semimajor_axis", "angular_semimajor_axis");
  if (!a) return undefined;
  const P = si.period;
  const f = (FOUR_PI_SQUARED * a.value ** 3) / (P * P);
  const partials: Record<string, number> = { period: (-2 * f) / P };
  addChain(partials, (3 * f) / a.value, a.partials);
  return { value: f, partials, a1: a.value };
}

export const astrometricOrbit = defineMethod({
  id: "astrometric-orbit",
  title: "Astrometric orbit about the barycentre",
  summary:
    "The mass function from the period and the semi-major axis of one component's own orbit about the centre of mass, " +
    "as seen when a star wobbles around an unseen companion; with the measured star's mass, the companion's mass.",
  source: {
    cite:
      "Kepler's third law applied to one component's barycentric orbit, a₁ = a M₂/(M₁+M₂), giving the mass function " +
      "M₂³/(M₁+M₂)² = 4π²a₁³/(GP²); Carroll & Ostlie 2007, An Introduction to Modern Astrophysics, 2nd ed., Addison-Wesley, ch. 7 (from memory)",
  },
  inputs: INPUTS,
  results: [
    { name: "mass_function", dimension: MASS, symbol: "f(M)", description: "The astrometric mass function M₂³/(M₁+M₂)²", displayUnit: "Msun" },
    { name: "secondary_mass", dimension: MASS, symbol: "M_{2}", description: "The mass of the unseen companion", displayUnit: "Msun" },
  ],
  constants: ["au"],
  equations: EQUATIONS,
  assumptions: [
    "point masses in Newtonian gravity, with no third body",
    "the semi-major axis is that of the measured component itself about the barycentre; a photocentre orbit equals it only when the companion gives no light",
    "the semi-major axis is the true, deprojected one, as an astrometric orbit fit gives it, so no inclination enters",
  ],

  validate(si: SIInputs): Issue[] {
    const issues = checkRanges(si, INPUTS, RULES);
    if (!has(si, "period")) {
      issues.push(missing("period", "The orbital period is missing.", 'Add period, e.g. "61.1 d".'));
    }
    issues.push(...checkLengthCombination(si, "semimajor_axis", "angular_semimajor_axis", "semimajor_axis", "semi-major axis"));
    return issues;
  },

  implicitAssumptions(si: SIInputs): string[] {
    return lengthAssumptions(si, "semimajor_axis", "angular_semimajor_axis", "semi-major axis");
  },

  compute(si: SIInputs): Record<string, number> {
    const f = massFunction(si);
    if (!f) return {};
    const out: Record<string, number> = { mass_function: f.value };
    if (has(si, "primary_mass")) out.secondary_mass = solveCompanionMass(f.value, si.primary_mass, 1);
    return out;
  },

  partials(si: SIInputs): Record<string, Record<string, number>> {
    const f = massFunction(si);
    if (!f) return {};
    const out: Record<string, Record<string, number>> = { mass_function: restrictRow(si, SLOTS, f.partials) };
    if (has(si, "primary_mass")) {
      const m1 = si.primary_mass;
      const m2 = solveCompanionMass(f.value, m1, 1);
      const d = companionMassPartials(m2, m1, 1);
      const row: Record<string, number> = { primary_mass: d.dM1 };
      addChain(row, d.dF, f.partials);
      out.secondary_mass = restrictRow(si, SLOTS, row);
    }
    return out;
  },

  substituted(si, results, fmt): MethodEquation[] {
    return alignEquations(EQUATIONS, substitutedSteps(si, results, fmt));
  },

  batch(columns: DrawColumns, n: number, out: Readonly<Record<string, Float64Array>>, valid: Uint8Array): void {
    const a = scratchColumn(0, n);
    const used = lengthColumn(columns, "semimajor_axis", "angular_semimajor_axis", n, a, valid);
    const f = out.mass_function;
    keplerColumn(columns.period, a, columns.eccentricity ?? zeroColumn(n), n, f, valid);
    requireOtherPositive(columns, POSITIVE_SLOTS, [...used, "period", "primary_mass"], n, valid);
    if (columns.primary_mass !== undefined) companionMassColumn(f, columns.primary_mass, oneColumn(n), n, out.secondary_mass, valid);
  },
});

function substitutedSteps(si: SIInputs, results: Readonly<Record<string, number>>, fmt: FormatNumber): MethodEquation[] {
  const f = massFunction(si);
  if (!f || !has(results, "mass_function")) return [];
  const steps = lengthSteps(si, fmt, "semimajor_axis", "angular_semimajor_axis", "a_{1}");
  steps.push(
    `\\mathcal{G}f(M) = \\frac{4\\pi^{2}\\,${paren(fmt, f.a1, "semimajor_axis")}^{3}}{${paren(fmt, si.period, "period")}^{2}} = ${fmt(results.mass_function, "mass_function")}`,
  );
  const out: MethodEquation[] = [{ results: ["mass_function"], latex: steps.join(STEP_SEPARATOR) }];
  if (has(si, "primary_mass") && has(results, "secondary_mass")) {
    out.push({
      results: ["secondary_mass"],
      latex:
        `(\\mathcal{G}M_{2})^{3} = ${paren(fmt, results.mass_function, "mass_function")}\\,` +
        `\\left(${fmt(si.primary_mass, "primary_mass")} + \\mathcal{G}M_{2}\\right)^{2}` +
        ` \\;\\Rightarrow\\; \\mathcal{G}M_{2} = ${fmt(results.secondary_mass, "secondary_mass")}`,
    });
  }
  return out;
}
