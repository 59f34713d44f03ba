import type { Unit } from "../units/unit.js";

/**
 * - measured: a value with a (possibly asymmetric) 1σ uncertainty;
 * - exact: a bare value, taken without uncertainty;
 * - upper-limit / lower-limit: "< 3.2 Msun" / "> 5 Msun", for published results only.
 */
export type QuantityKind = "measured" | "exact" | "upper-limit" | "lower-limit";

export interface Quantity {
  readonly kind: QuantityKind;
  /** The value in `unit`, as typed. For limits: the limit. */
  readonly value: number;
  /** Upward 1σ uncertainty in `unit`; 0 for exact values and limits. */
  readonly plus: number;
  /** Downward 1σ uncertainty in `unit`, as a positive number; 0 for exact values and limits. */
  readonly minus: number;
  readonly unit: Unit;
  /** The unit as typed in the record. */
  readonly unitText: string;
  /** The quantity as typed (strings) or a canonical text (mappings). */
  readonly text: string;
  /** Decimal places of the value as typed, for display; undefined when unknown. */
  readonly decimals?: number;
}

export interface SIValue {
  readonly value: number;
  readonly plus: number;
  readonly minus: number;
}

export function isSymmetric(q: Pick<Quantity, "plus" | "minus">): boolean {
  return q.plus === q.minus;
}

/** Value and uncertainties in SI base units (mass units in kg). */
export function toSI(q: Quantity): SIValue {
  const s = q.unit.scale;
  return { value: q.value * s, plus: q.plus * s, minus: q.minus * s };
}
