import type { Dimension } from "../units/dimension.js";
import type { Issue } from "../problem.js";

/**
 * SI numbers keyed by slot name. Mass slots carry GM (m³ s⁻²), not kg:
 * masses in nominal solar or planetary units then need no G at all.
 */
export type SIInputs = Readonly<Record<string, number>>;

export interface MethodInput {
  /** Slot name as `compute` sees it, e.g. "angular_semimajor_axis". */
  readonly slot: string;
  /** The record field that fills this slot, e.g. "semimajor_axis". Several slots may share a field, told apart by dimension. */
  readonly field: string;
  /** Dimension of the field in the record. MASS slots are handed to `compute` as GM. */
  readonly dimension: Dimension;
  /** LaTeX symbol. */
  readonly symbol: string;
  readonly description: string;
  readonly optional: boolean;
}

export interface MethodResult {
  /** Result key, as in records' `published` block and in reports. */
  readonly name: string;
  /** MASS results are computed as GM and reported in kg; LENGTH in m; DIMENSIONLESS as numbers. */
  readonly dimension: Dimension;
  readonly symbol: string;
  readonly description: string;
  /** Default display unit id (from the unit catalogue). */
  readonly displayUnit: string;
}

export interface MethodEquation {
  /** Which result(s) this equation gives. */
  readonly results: readonly string[];
  /** General form, LaTeX, symbols only. */
  readonly latex: string;
}

export interface MethodSource {
  readonly cite: string;
  readonly doi?: string;
  readonly url?: string;
}

/** Draws of the present slots for the Monte Carlo: one SI value (GM for masses) per draw, keyed by slot. */
export type DrawColumns = Readonly<Record<string, Float64Array>>;

/** A number as it should be typeset, with its unit in LaTeX. */
export type FormatNumber = (valueSI: number, slotOrResult: string) => string;

export interface MethodDefinition {
  readonly id: string;
  readonly title: string;
  readonly summary: string;
  readonly source: MethodSource;
  readonly inputs: readonly MethodInput[];
  readonly results: readonly MethodResult[];
  /** Keys of the constants it uses (see constants/sets.ts). */
  readonly constants: readonly string[];
  readonly equations: readonly MethodEquation[];
  /** Plain-words assumptions the method always makes. */
  readonly assumptions: readonly string[];
  /**
   * Checks the combination and ranges of the present slots (SI values).
   * Returns issues whose `path` is the record field, e.g. "eccentricity".
   */
  validate(si: SIInputs): Issue[];
  /** Assumptions that follow from which optional inputs are absent, in plain words. */
  implicitAssumptions(si: SIInputs): string[];
  /** Pure: SI (GM for masses) in, SI (GM for masses) out; only results computable from the present slots. */
  compute(si: SIInputs): Record<string, number>;
  /** Analytic ∂result/∂slot for each computed result and each present slot. */
  partials(si: SIInputs): Record<string, Record<string, number>>;
  /**
   * The equations with the numbers substituted, LaTeX; `fmt` typesets one SI value of a slot or result
   * (mass slots and results are passed as GM). One entry per general equation, in the same order and
   * with the same `results`; `latex` is "" where that equation does not apply to the inputs given.
   */
  substituted(si: SIInputs, results: Readonly<Record<string, number>>, fmt: FormatNumber): MethodEquation[];
  /**
   * Optional typed-array form of validate() and compute() for the Monte Carlo. For each draw j < n of
   * the present slots' columns it writes every result compute() would give into out[result][j] and sets
   * valid[j] to 1, or to 0 where validate() would refuse the draw's values (the range checks) or a result
   * is not finite. Called only with a combination of slots that validate() accepts: which slots are
   * present decides the missing and ambiguous inputs, so those checks are left out. `out` holds one
   * column for each result compute() gives for these slots.
   */
  batch?(columns: DrawColumns, n: number, out: Readonly<Record<string, Float64Array>>, valid: Uint8Array): void;
}

export function defineMethod(m: MethodDefinition): MethodDefinition {
  const slots = new Set<string>();
  for (const i of m.inputs) {
    if (slots.has(i.slot)) throw new Error(`method ${m.id}: slot ${i.slot} declared twice`);
    slots.add(i.slot);
  }
  return Object.freeze(m);
}
