import { DEFAULT_SET } from "../constants/sets.js";
import { issue, type Issue } from "../problem.js";
import type { FormatNumber, MethodEquation, MethodInput, SIInputs } from "./method.js";

/**
 * Helpers shared by the mass methods: presence and range checks, the
 * parallax-to-distance and angle-to-length conversions with their partial
 * derivatives, and the exact solution of the mass-function cubic.
 */

export const TWO_PI = 2 * Math.PI;
export const FOUR_PI_SQUARED = 4 * Math.PI * Math.PI;

/** The astronomical unit in metres (IAU 2012 B2, exact), used by d = 1 au / ϖ. */
export const AU = DEFAULT_SET.au.value;

/** Below this, sin i is taken as zero: the orbit is within about 0.2″ of face-on. */
export const MIN_SIN_INCLINATION = 1e-6;

export function has(si: SIInputs, slot: string): boolean {
  return typeof si[slot] === "number";
}

export function presentSlots(si: SIInputs, slots: readonly string[]): string[] {
  return slots.filter((s) => has(si, s));
}

/** How each slot's value must lie. */
export type RangeRule = "positive" | "eccentricity" | "inclination" | "any";

function fieldOf(inputs: readonly MethodInput[], slot: string): string {
  const input = inputs.find((i) => i.slot === slot);
  if (!input) throw new Error(`no input slot ${slot}`);
  return input.field;
}

/**
 * Every range problem of the present slots: unknown slots, non-finite
 * numbers, non-positive lengths, times, speeds and masses, 0 ≤ e < 1, and
 * 0 < i < 180° with sin i not close to zero.
 */
export function checkRanges(
  si: SIInputs,
  inputs: readonly MethodInput[],
  rules: Readonly<Record<string, RangeRule>>,
): Issue[] {
  const issues: Issue[] = [];
  const known = new Set(inputs.map((i) => i.slot));
  for (const slot of Object.keys(si)) {
    if (!known.has(slot)) {
      issues.push(issue("unknown-input", `This method has no input called "${slot}".`,
        `Remove it, or choose a method that uses it. Inputs of this method: ${[...known].join(", ")}.`, slot));
    }
  }
  for (const input of inputs) {
    if (!has(si, input.slot)) continue;
    const v = si[input.slot];
    const path = input.field;
    if (!Number.isFinite(v)) {
      issues.push(issue("out-of-range", `${input.description} is not a finite number.`, "Give a finite number with its unit.", path));
      continue;
    }
    const rule = rules[input.slot] ?? "any";
    if (rule === "positive" && !(v > 0)) {
      issues.push(issue("out-of-range", `${input.description} must be greater than zero.`,
        "Check the sign and the unit of the value in the record.", path));
    } else if (rule === "eccentricity" && !(v >= 0 && v < 1)) {
      issues.push(issue("eccentricity-out-of-range", `The eccentricity must satisfy 0 ≤ e < 1 for a bound orbit; got ${v}.`,
        "Give the eccentricity as a plain number between 0 and 1 (not in per cent).", path));
    } else if (rule === "inclination") {
      if (!(v > 0 && v < Math.PI)) {
        issues.push(issue("inclination-out-of-range", "The inclination must lie strictly between 0° and 180°.",
          "Give the inclination in degrees (e.g. 87.3 deg); 0° and 180° are face-on orbits, which show no velocity curve.", path));
      } else if (Math.sin(v) < MIN_SIN_INCLINATION) {
        issues.push(issue("inclination-out-of-range", "The inclination is so close to face-on that sin i is nearly zero and the masses are unbounded.",
          "Check the value and its unit; a face-on orbit cannot give masses from velocities.", path));
      }
    }
  }
  return issues;
}

export function missing(field: string, message: string, hint: string): Issue {
  return issue("missing-input", message, hint, field);
}

/**
 * Distance in metres from `distance` or from `parallax` (d = 1 au / ϖ,
 * small-angle), with ∂d/∂slot. `distance` wins when both are present (which
 * validation reports as ambiguous).
 */
export interface Derived {
  readonly value: number;
  /** ∂value/∂slot for the slots it depends on. */
  readonly partials: Readonly<Record<string, number>>;
}

export function distanceOf(si: SIInputs): Derived | undefined {
  if (has(si, "distance")) return { value: si.distance, partials: { distance: 1 } };
  if (has(si, "parallax")) {
    const p = si.parallax;
    return { value: AU / p, partials: { parallax: -AU / (p * p) } };
  }
  return undefined;
}

/**
 * A length from its linear slot, or from its angular slot times the distance
 * (a = α d, α in rad).
 */
export function lengthOf(si: SIInputs, linearSlot: string, angularSlot: string): Derived | undefined {
  if (has(si, linearSlot)) return { value: si[linearSlot], partials: { [linearSlot]: 1 } };
  if (!has(si, angularSlot)) return undefined;
  const d = distanceOf(si);
  if (!d) return undefined;
  const alpha = si[angularSlot];
  const partials: Record<string, number> = { [angularSlot]: d.value };
  for (const [slot, dd] of Object.entries(d.partials)) partials[slot] = alpha * dd;
  return { value: alpha * d.value, partials };
}

/**
 * Validation shared by every method that takes a length either linearly or as
 * an angle with a parallax or a distance.
 */
export function checkLengthCombination(
  si: SIInputs,
  linearSlot: string,
  angularSlot: string,
  field: string,
  what: string,
): Issue[] {
  const issues: Issue[] = [];
  const linear = has(si, linearSlot);
  const angular = has(si, angularSlot);
  if (!linear && !angular) {
    issues.push(missing(field, `The ${what} is missing.`, `Add ${field}: either as a length (e.g. "12.3 au") or as an angle (e.g. "0.41 arcsec") with a parallax or a distance.`));
  }
  if (linear && angular) {
    issues.push(issue("ambiguous-input", `The ${what} is given both as a length and as an angle.`, "Keep one of the two.", field));
  }
  if (has(si, "parallax") && has(si, "distance")) {
    issues.push(issue("ambiguous-input", "Both a parallax and a distance are given; only one can be used.",
      "Keep the one the published mass was computed with, and drop the other.", "distance"));
  }
  if (angular && !linear && !has(si, "parallax") && !has(si, "distance")) {
    issues.push(issue("needs-parallax-or-distance", `The ${what} is an angle, and turning it into a length needs a parallax or a distance.`,
      `Add parallax (e.g. "379.2 mas") or distance (e.g. "2.64 pc"), or give the ${what} as a length.`, field));
  }
  return issues;
}

/** Plain-words assumptions that follow from how a length was given. */
export function lengthAssumptions(si: SIInputs, linearSlot: string, angularSlot: string, what: string): string[] {
  const out: string[] = [];
  if (has(si, linearSlot)) {
    if (has(si, "parallax")) out.push(`the ${what} is given as a length, so the parallax is not used`);
    if (has(si, "distance")) out.push(`the ${what} is given as a length, so the distance is not used`);
  } else if (has(si, angularSlot)) {
    if (has(si, "distance")) out.push(`${what} = angle × distance (small-angle approximation)`);
    else if (has(si, "parallax")) {
      out.push("distance = 1 au / parallax (no correction for parallax bias)");
      out.push(`${what} = angle × distance (small-angle approximation)`);
    }
  }
  return out;
}

/**
 * Exact solution of (m sin i)³ = f (M₁ + m)² for m > 0, with f, M₁ and m in
 * GM form (m³ s⁻²) and s = sin i in (0, 1].
 *
 * The left side over the right grows monotonically in m from 0, so the
 * positive root is unique. With v = m/M₁ and c = f/(s³M₁) the equation is
 * F(v) = v − c^{1/3}(1+v)^{2/3} = 0; F is convex with F(0) < 0, so Newton's
 * method from any point with F ≥ 0, here v₀ = max(1, 4c), falls monotonically
 * onto the root.
 */
export function solveCompanionMass(f: number, m1: number, sinI: number): number {
  if (!(f >= 0) || !(m1 >= 0) || !(sinI > 0 && sinI <= 1 + 1e-15)) {
    throw new Error(`solveCompanionMass: needs f ≥ 0, M1 ≥ 0 and 0 < sin i ≤ 1 (got ${f}, ${m1}, ${sinI})`);
  }
  const s3 = sinI * sinI * sinI;
  if (m1 === 0) return f / s3;
  if (f === 0) return 0;
  const c = f / (s3 * m1);
  const c13 = Math.cbrt(c);
  let v = Math.max(1, 4 * c);
  for (let n = 0; n < 200; n++) {
    const w = Math.cbrt(1 + v);
    const F = v - c13 * w * w;
    const dF = 1 - (2 / 3) * (c13 / w);
    const next = v - F / dF;
    if (!(next < v) || v - next <= 4e-16 * v) return m1 * Math.max(next, 0);
    v = next;
  }
  throw new Error(`solveCompanionMass: no convergence for f=${f}, M1=${m1}, sin i=${sinI}`);
}

/**
 * Partial derivatives of the solved m by implicit differentiation of
 * s³m³ − f (M₁+m)² = 0, written with the root itself so they stay accurate
 * when m ≪ M₁ or m ≫ M₁:
 *   ∂m/∂f  = (M₁+m)³ / (s³ m² (3M₁+m))
 *   ∂m/∂M₁ = 2m / (3M₁+m)
 *   ∂m/∂s  = −3m (M₁+m) / (s (3M₁+m))
 */
export function companionMassPartials(m: number, m1: number, sinI: number): { dF: number; dM1: number; dSin: number } {
  const s3 = sinI * sinI * sinI;
  const k = 3 * m1 + m;
  return {
    dF: ((m1 + m) ** 3) / (s3 * m * m * k),
    dM1: (2 * m) / k,
    dSin: (-3 * m * (m1 + m)) / (sinI * k),
  };
}

/** Adds `scale × ∂x/∂slot` into `out` for every slot that x depends on. */
export function addChain(out: Record<string, number>, scale: number, partials: Readonly<Record<string, number>>): void {
  for (const [slot, d] of Object.entries(partials)) out[slot] = (out[slot] ?? 0) + scale * d;
}

/** One row of partials: zero for every present slot, to be filled in. */
export function zeroRow(si: SIInputs, slots: readonly string[]): Record<string, number> {
  const row: Record<string, number> = {};
  for (const s of slots) if (has(si, s)) row[s] = 0;
  return row;
}

/** Keeps only the present slots in a row (chain rules may name a slot that is absent). */
export function restrictRow(si: SIInputs, slots: readonly string[], row: Readonly<Record<string, number>>): Record<string, number> {
  const out = zeroRow(si, slots);
  for (const s of Object.keys(out)) out[s] = row[s] ?? 0;
  return out;
}

/** A number typeset in brackets, so that a negative exponent or a unit never runs into an operator. */
export function paren(fmt: FormatNumber, value: number, name: string): string {
  return `\\left(${fmt(value, name)}\\right)`;
}

/**
 * The substituted steps that turn an angle into a length:
 * "d = 1 au / (ϖ) = (d)" and "a = (α) × (d) = (a)", joined by wide spaces.
 * Empty when the length was given linearly.
 */
export function lengthSteps(
  si: SIInputs,
  fmt: FormatNumber,
  linearSlot: string,
  angularSlot: string,
  symbol: string,
): string[] {
  if (has(si, linearSlot) || !has(si, angularSlot)) return [];
  const d = distanceOf(si);
  const a = lengthOf(si, linearSlot, angularSlot);
  if (!d || !a) return [];
  const steps: string[] = [];
  if (!has(si, "distance")) {
    steps.push(`d = \\frac{1\\,\\mathrm{au}}{${fmt(si.parallax, "parallax")}} = ${fmt(d.value, "distance")}`);
  }
  const dText = has(si, "distance") ? fmt(si.distance, "distance") : fmt(d.value, "distance");
  steps.push(`${symbol} = ${fmt(si[angularSlot], angularSlot)} \\times ${dText} = ${fmt(a.value, linearSlot)}`);
  return steps;
}

export const STEP_SEPARATOR = ", \\qquad ";

/**
 * Lines the substituted equations up with the general ones: one entry per
 * general equation, in the same order and with the same `results`, and an
 * empty `latex` where the equation does not apply to the inputs given.
 */
export function alignEquations(general: readonly MethodEquation[], produced: readonly MethodEquation[]): MethodEquation[] {
  const byKey = new Map(produced.map((eq) => [eq.results.join("|"), eq.latex] as const));
  if (byKey.size !== produced.length) throw new Error("two substituted equations give the same results");
  const out = general.map((eq) => ({ results: eq.results, latex: byKey.get(eq.results.join("|")) ?? "" }));
  const known = new Set(general.map((eq) => eq.results.join("|")));
  for (const key of byKey.keys()) if (!known.has(key)) throw new Error(`substituted equation for ${key} has no general form`);
  return out;
}
