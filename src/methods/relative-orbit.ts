import { issue, type Issue } from "../problem.js";
import { ANGLE, DIMENSIONLESS, LENGTH, MASS, TIME } from "../units/dimension.js";
import { defineMethod, type DrawColumns, type FormatNumber, type MethodEquation, type MethodInput, type SIInputs } from "./method.js";
import { keplerColumn, lengthColumn, requireOtherPositive, scratchColumn, slotsWithRule, zeroColumn } from "./batch-shared.js";
import {
  FOUR_PI_SQUARED,
  STEP_SEPARATOR,
  addChain,
  checkLengthCombination,
  checkRanges,
  has,
  lengthAssumptions,
  lengthOf,
  lengthSteps,
  missing,
  paren,
  presentSlots,
  restrictRow,
  type RangeRule,
  alignEquations,
} from "./shared.js";

/**
 * Kepler's third law on the relative orbit of two bodies: the total mass from
 * the period and the semi-major axis of one body's orbit about the other.
 */

const INPUTS: readonly MethodInput[] = [
  { slot: "period", field: "period", dimension: TIME, symbol: "P", description: "The orbital period", optional: false },
  { slot: "semimajor_axis", field: "semimajor_axis", dimension: LENGTH, symbol: "a",
    description: "The semi-major axis of the relative orbit, as a length", optional: true },
  { slot: "angular_semimajor_axis", field: "semimajor_axis", dimension: ANGLE, symbol: "\\alpha",
    description: "The semi-major axis of the relative orbit, as an angle on the sky", optional: true },
  { slot: "parallax", field: "parallax", dimension: ANGLE, symbol: "\\varpi",
    description: "The parallax, turning the angular semi-major axis into a length", optional: true },
  { slot: "distance", field: "distance", dimension: LENGTH, symbol: "d",
    description: "The distance, turning the angular semi-major axis into a length", optional: true },
  { slot: "mass_ratio", field: "mass_ratio", dimension: DIMENSIONLESS, symbol: "q",
    description: "The mass ratio M₂/M₁, splitting the total into the two masses", optional: true },
  { slot: "primary_mass", field: "primary_mass", dimension: MASS, symbol: "M_{1}",
    description: "The mass of the primary, known from elsewhere", optional: true },
  { slot: "secondary_mass", field: "secondary_mass", dimension: MASS, symbol: "M_{2}",
    description: "The mass of the secondary, known from elsewhere", optional: true },
  { slot: "eccentricity", field: "eccentricity", dimension: DIMENSIONLESS, symbol: "e",
    description: "The orbital eccentricity (shown only: Kepler's third law does not depend on it)", optional: true },
];

const SLOTS = INPUTS.map((i) => i.slot);

const RULES: Record<string, RangeRule> = {
  period: "positive",
  semimajor_axis: "positive",
  angular_semimajor_axis: "positive",
  parallax: "positive",
  distance: "positive",
  mass_ratio: "positive",
  primary_mass: "positive",
  secondary_mass: "positive",
  eccentricity: "eccentricity",
};

/** Slots under the "positive" rule, for the batch kernel. */
const POSITIVE_SLOTS = slotsWithRule(RULES, "positive");

const SPLITTERS = ["mass_ratio", "primary_mass", "secondary_mass"] as const;

const EQUATIONS: readonly MethodEquation[] = [
  {
    results: ["total_mass"],
    latex: "\\mathcal{G}M_{\\mathrm{tot}} = \\frac{4\\pi^{2}\\,a^{3}}{P^{2}}, \\qquad a = \\alpha\\,d, \\qquad d = \\frac{1\\,\\mathrm{au}}{\\varpi}",
  },
  {
    results: ["primary_mass", "secondary_mass"],
    latex: "\\mathcal{G}M_{1} = \\frac{\\mathcal{G}M_{\\mathrm{tot}}}{1+q}, \\qquad \\mathcal{G}M_{2} = \\frac{q\\,\\mathcal{G}M_{\\mathrm{tot}}}{1+q}",
  },
  { results: ["secondary_mass"], latex: "\\mathcal{G}M_{2} = \\mathcal{G}M_{\\mathrm{tot}} - \\mathcal{G}M_{1}" },
  { results: ["primary_mass"], latex: "\\mathcal{G}M_{1} = \\mathcal{G}M_{\\mathrm{tot}} - \\mathcal{G}M_{2}" },
];

function totalMass(si: SIInputs): { value: number; partials: Record<string, number> } | undefined {
  if (!has(si, "period")) return undefined;
  const a = lengthOf(si, "semimajor_axis", "angular_semimajor_axis");
  if (!a) return undefined;
  const P = si.period;
  const M = (FOUR_PI_SQUARED * a.value ** 3) / (P * P);
  const partials: Record<string, number> = { period: (-2 * M) / P };
  addChain(partials, (3 * M) / a.value, a.partials);
  return { value: M, partials };
}

/** The first of mass_ratio, primary_mass, secondary_mass that is present. */
function splitter(si: SIInputs): (typeof SPLITTERS)[number] | undefined {
  return SPLITTERS.find((s) => has(si, s));
}

export const relativeOrbit = defineMethod({
  id: "relative-orbit",
  title: "Relative orbit (Kepler's third law)",
  summary:
    "The total mass of two bodies from the period and the semi-major axis of their relative orbit: a visual binary, " +
    "a star about a dark central mass, or a moon about its planet. A mass ratio or one known component mass splits the total.",
  source: {
    cite:
      "Kepler's third law in Newton's form, G(M₁+M₂) = 4π²a³/P² (Newton 1687, Principia, Book III); as set out in " +
      "Carroll & Ostlie 2007, An Introduction to Modern Astrophysics, 2nd ed., Addison-Wesley, ch. 2 and 7 (from memory)",
  },
  inputs: INPUTS,
  results: [
    { name: "total_mass", dimension: MASS, symbol: "M_{\\mathrm{tot}}", description: "The total mass of the two bodies", displayUnit: "Msun" },
    { name: "primary_mass", dimension: MASS, symbol: "M_{1}", description: "The mass of the primary", displayUnit: "Msun" },
    { name: "secondary_mass", dimension: MASS, symbol: "M_{2}", description: "The mass of the secondary", displayUnit: "Msun" },
  ],
  constants: ["au"],
  equations: EQUATIONS,
  assumptions: [
    "point masses (or spherical bodies) in Newtonian gravity, with no third body",
    "the semi-major axis is that of the relative orbit, one body about the other, not about the barycentre",
  ],

  validate(si: SIInputs): Issue[] {
    const issues = checkRanges(si, INPUTS, RULES);
    if (!has(si, "period")) {
      issues.push(missing("period", "The orbital period is missing.", 'Add period, e.g. "50.13 yr".'));
    }
    issues.push(...checkLengthCombination(si, "semimajor_axis", "angular_semimajor_axis", "semimajor_axis", "semi-major axis"));
    const splitters = presentSlots(si, SPLITTERS);
    if (splitters.length > 1) {
      issues.push(issue("ambiguous-input", `Only one of mass_ratio, primary_mass and secondary_mass can split the total mass; got ${splitters.join(" and ")}.`,
        "Keep the one the published masses were derived with.", splitters[1]));
    }
    if (issues.length === 0 && splitters.length === 1 && splitters[0] !== "mass_ratio") {
      const total = totalMass(si);
      const given = splitters[0];
      if (total && si[given] >= total.value) {
        issues.push(issue("component-exceeds-total",
          `The given ${given === "primary_mass" ? "primary" : "secondary"} mass is not less than the total mass that the orbit gives, so the other mass would be zero or negative.`,
          "Check the units of the masses, the semi-major axis and the period; or drop the component mass and compare the total only.", given));
      }
    }
    return issues;
  },

  implicitAssumptions(si: SIInputs): string[] {
    return lengthAssumptions(si, "semimajor_axis", "angular_semimajor_axis", "semi-major axis");
  },

  compute(si: SIInputs): Record<string, number> {
    const total = totalMass(si);
    if (!total) return {};
    const M = total.value;
    const out: Record<string, number> = { total_mass: M };
    const by = splitter(si);
    if (by === "mass_ratio") {
      const q = si.mass_ratio;
      out.primary_mass = M / (1 + q);
      out.secondary_mass = (q * M) / (1 + q);
    } else if (by === "primary_mass") {
      out.secondary_mass = M - si.primary_mass;
    } else if (by === "secondary_mass") {
      out.primary_mass = M - si.secondary_mass;
    }
    return out;
  },

  partials(si: SIInputs): Record<string, Record<string, number>> {
    const total = totalMass(si);
    if (!total) return {};
    const M = total.value;
    const dM = total.partials;
    const out: Record<string, Record<string, number>> = { total_mass: restrictRow(si, SLOTS, dM) };
    const by = splitter(si);
    if (by === "mass_ratio") {
      const q = si.mass_ratio;
      const m1: Record<string, number> = { mass_ratio: -M / ((1 + q) * (1 + q)) };
      addChain(m1, 1 / (1 + q), dM);
      const m2: Record<string, number> = { mass_ratio: M / ((1 + q) * (1 + q)) };
      addChain(m2, q / (1 + q), dM);
      out.primary_mass = restrictRow(si, SLOTS, m1);
      out.secondary_mass = restrictRow(si, SLOTS, m2);
    } else if (by === "primary_mass") {
      const m2: Record<string, number> = { primary_mass: -1 };
      addChain(m2, 1, dM);
      out.secondary_mass = restrictRow(si, SLOTS, m2);
    } else if (by === "secondary_mass") {
      const m1: Record<string, number> = { secondary_mass: -1 };
      addChain(m1, 1, dM);
      out.primary_mass = restrictRow(si, SLOTS, m1);
    }
    return out;
  },

  substituted(si, results, fmt): MethodEquation[] {
    return alignEquations(EQUATIONS, substitutedSteps(si, results, fmt));
  },

  batch(columns: DrawColumns, n: number, out: Readonly<Record<string, Float64Array>>, valid: Uint8Array): void {
    const a = scratchColumn(0, n);
    const used = lengthColumn(columns, "semimajor_axis", "angular_semimajor_axis", n, a, valid);
    const total = out.total_mass;
    keplerColumn(columns.period, a, columns.eccentricity ?? zeroColumn(n), n, total, valid);
    requireOtherPositive(columns, POSITIVE_SLOTS, [...used, "period", ...SPLITTERS], n, valid);
    // the same splitter as compute(): mass ratio, else primary mass, else secondary mass
    const by = SPLITTERS.find((s) => columns[s] !== undefined);
    if (by === "mass_ratio") {
      const ratio = columns.mass_ratio;
      const primary = out.primary_mass;
      const secondary = out.secondary_mass;
      for (let j = 0; j < n; j++) {
        const M = total[j];
        const q = ratio[j];
        const m1 = M / (1 + q);
        const m2 = (q * M) / (1 + q);
        primary[j] = m1;
        secondary[j] = m2;
        if (!(q > 0 && q < Infinity && m1 - m1 === 0 && m2 - m2 === 0)) valid[j] = 0;
      }
    } else if (by !== undefined) {
      // a known component: the other is the difference, and the known one must stay below the total
      const given = columns[by];
      const other = by === "primary_mass" ? out.secondary_mass : out.primary_mass;
      const period = columns.period;
      for (let j = 0; j < n; j++) {
        const M = total[j];
        const g = given[j];
        const rest = M - g;
        other[j] = rest;
        // within rounding of the total, decide on the total exactly as validate() computes it
        const below = Math.abs(rest) > 1e-12 * M ? g < M : g < (FOUR_PI_SQUARED * a[j] ** 3) / (period[j] * period[j]);
        if (!(g > 0 && g < Infinity && below && rest - rest === 0)) valid[j] = 0;
      }
    }
  },
});

function substitutedSteps(si: SIInputs, results: Readonly<Record<string, number>>, fmt: FormatNumber): MethodEquation[] {
  const total = totalMass(si);
  if (!total || !has(results, "total_mass")) return [];
  const M = results.total_mass;
  const a = lengthOf(si, "semimajor_axis", "angular_semimajor_axis")!;
  const steps = lengthSteps(si, fmt, "semimajor_axis", "angular_semimajor_axis", "a");
  steps.push(
    `\\mathcal{G}M_{\\mathrm{tot}} = \\frac{4\\pi^{2}\\,${paren(fmt, a.value, "semimajor_axis")}^{3}}{${paren(fmt, si.period, "period")}^{2}} = ${fmt(M, "total_mass")}`,
  );
  const out: MethodEquation[] = [{ results: ["total_mass"], latex: steps.join(STEP_SEPARATOR) }];
  const by = splitter(si);
  const tot = fmt(M, "total_mass");
  if (by === "mass_ratio" && has(results, "primary_mass") && has(results, "secondary_mass")) {
    const q = fmt(si.mass_ratio, "mass_ratio");
    out.push({
      results: ["primary_mass", "secondary_mass"],
      latex:
        `\\mathcal{G}M_{1} = \\frac{${tot}}{1+${q}} = ${fmt(results.primary_mass, "primary_mass")}` +
        `${STEP_SEPARATOR}\\mathcal{G}M_{2} = \\frac{${q}\\times${tot}}{1+${q}} = ${fmt(results.secondary_mass, "secondary_mass")}`,
    });
  } else if (by === "primary_mass" && has(results, "secondary_mass")) {
    out.push({
      results: ["secondary_mass"],
      latex: `\\mathcal{G}M_{2} = ${tot} - ${fmt(si.primary_mass, "primary_mass")} = ${fmt(results.secondary_mass, "secondary_mass")}`,
    });
  } else if (by === "secondary_mass" && has(results, "primary_mass")) {
    out.push({
      results: ["primary_mass"],
      latex: `\\mathcal{G}M_{1} = ${tot} - ${fmt(si.secondary_mass, "secondary_mass")} = ${fmt(results.primary_mass, "primary_mass")}`,
    });
  }
  return out;
}
