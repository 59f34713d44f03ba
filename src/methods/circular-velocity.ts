import type { Issue } from "../problem.js";
import { ANGLE, LENGTH, MASS, VELOCITY } from "../units/dimension.js";
import { defineMethod, type DrawColumns, type FormatNumber, type MethodEquation, type MethodInput, type SIInputs } from "./method.js";
import { lengthColumn, requireOtherPositive, scratchColumn, slotsWithRule } from "./batch-shared.js";
import {
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
  restrictRow,
  type RangeRule,
  alignEquations,
} from "./shared.js";

/**
 * The mass enclosed by a circular orbit of speed v and radius r: GM = v²r.
 */

const INPUTS: readonly MethodInput[] = [
  { slot: "velocity", field: "velocity", dimension: VELOCITY, symbol: "v", description: "The circular orbital speed", optional: false },
  { slot: "radius", field: "radius", dimension: LENGTH, symbol: "r", description: "The orbital radius, as a length", optional: true },
  { slot: "angular_radius", field: "radius", dimension: ANGLE, symbol: "\\theta",
    description: "The orbital radius, as an angle on the sky", optional: true },
  { slot: "parallax", field: "parallax", dimension: ANGLE, symbol: "\\varpi",
    description: "The parallax, turning the angular radius into a length", optional: true },
  { slot: "distance", field: "distance", dimension: LENGTH, symbol: "d",
    description: "The distance, turning the angular radius into a length", optional: true },
];

const SLOTS = INPUTS.map((i) => i.slot);

const RULES: Record<string, RangeRule> = {
  velocity: "positive",
  radius: "positive",
  angular_radius: "positive",
  parallax: "positive",
  distance: "positive",
};

/** Slots under the "positive" rule, for the batch kernel. */
const POSITIVE_SLOTS = slotsWithRule(RULES, "positive");

const EQUATIONS: readonly MethodEquation[] = [
  {
    results: ["enclosed_mass"],
    latex: "\\mathcal{G}M_{\\mathrm{enc}} = v^{2}\\,r, \\qquad r = \\theta\\,d, \\qquad d = \\frac{1\\,\\mathrm{au}}{\\varpi}",
  },
];

export const circularVelocity = defineMethod({
  id: "circular-velocity",
  title: "Circular velocity (enclosed mass)",
  summary:
    "The mass inside a circular orbit from its speed and radius, GM = v²r: a planet about its star, gas or masers " +
    "about a central mass, or the rotation speed of a galaxy at some radius.",
  source: {
    cite:
      "Newton's law of gravitation for a circular orbit, v² = GM(<r)/r, with the shell theorem for a spherical mass " +
      "distribution; Binney & Tremaine 2008, Galactic Dynamics, 2nd ed., Princeton University Press, ch. 2 (from memory)",
  },
  inputs: INPUTS,
  results: [
    { name: "enclosed_mass", dimension: MASS, symbol: "M_{\\mathrm{enc}}", description: "The mass inside the orbit", displayUnit: "Msun" },
  ],
  constants: ["au"],
  equations: EQUATIONS,
  assumptions: [
    "a circular orbit in Newtonian gravity, with the orbiting body's own mass negligible",
    "the mass inside the orbit is spherically distributed (for a flattened distribution such as a disc, v²r/G is only an estimate)",
    "the speed is the full orbital speed, already corrected for inclination",
  ],

  validate(si: SIInputs): Issue[] {
    const issues = checkRanges(si, INPUTS, RULES);
    if (!has(si, "velocity")) issues.push(missing("velocity", "The circular speed is missing.", 'Add velocity, e.g. "229 km/s".'));
    issues.push(...checkLengthCombination(si, "radius", "angular_radius", "radius", "radius"));
    return issues;
  },

  implicitAssumptions(si: SIInputs): string[] {
    return lengthAssumptions(si, "radius", "angular_radius", "radius");
  },

  compute(si: SIInputs): Record<string, number> {
    const r = lengthOf(si, "radius", "angular_radius");
    if (!r || !has(si, "velocity")) return {};
    return { enclosed_mass: si.velocity * si.velocity * r.value };
  },

  partials(si: SIInputs): Record<string, Record<string, number>> {
    const r = lengthOf(si, "radius", "angular_radius");
    if (!r || !has(si, "velocity")) return {};
    const v = si.velocity;
    const row: Record<string, number> = { velocity: 2 * v * r.value };
    addChain(row, v * v, r.partials);
    return { enclosed_mass: restrictRow(si, SLOTS, row) };
  },

  substituted(si, results, fmt): MethodEquation[] {
    return alignEquations(EQUATIONS, substitutedSteps(si, results, fmt));
  },

  batch(columns: DrawColumns, n: number, out: Readonly<Record<string, Float64Array>>, valid: Uint8Array): void {
    const r = scratchColumn(0, n);
    const used = lengthColumn(columns, "radius", "angular_radius", n, r, valid);
    requireOtherPositive(columns, POSITIVE_SLOTS, [...used, "velocity"], n, valid);
    const speed = columns.velocity;
    const mass = out.enclosed_mass;
    for (let j = 0; j < n; j++) {
      const v = speed[j];
      const M = v * v * r[j];
      mass[j] = M;
      if (!(v > 0 && v < Infinity && M - M === 0)) valid[j] = 0;
    }
  },
});

function substitutedSteps(si: SIInputs, results: Readonly<Record<string, number>>, fmt: FormatNumber): MethodEquation[] {
  const r = lengthOf(si, "radius", "angular_radius");
  if (!r || !has(si, "velocity") || !has(results, "enclosed_mass")) return [];
  const steps = lengthSteps(si, fmt, "radius", "angular_radius", "r");
  steps.push(
    `\\mathcal{G}M_{\\mathrm{enc}} = ${paren(fmt, si.velocity, "velocity")}^{2}\\,${paren(fmt, r.value, "radius")} = ${fmt(results.enclosed_mass, "enclosed_mass")}`,
  );
  return [{ results: ["enclosed_mass"], latex: steps.join(STEP_SEPARATOR) }];
}
