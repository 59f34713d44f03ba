import { MASS, sameDimension } from "../units/dimension.js";
import type { Quantity, SIValue } from "./quantity.js";

/**
 * A quantity as a method's `compute` sees it: value and both 1σ sides in SI,
 * with masses as GM (m³ s⁻²). Masses in nominal solar or planetary units turn
 * into GM exactly; a mass in kg or g goes through G and inherits its relative
 * uncertainty; a value typed as GM (km3/s2) is read straight.
 */
export function computeSI(q: Quantity): SIValue {
  if (sameDimension(q.unit.dimension, MASS)) {
    const gm = q.unit.gm;
    if (gm === undefined) throw new Error(`mass unit ${q.unit.id} has no GM in the unit catalogue`);
    const rel = q.unit.gmRelativeUncertainty ?? 0;
    const value = q.value * gm;
    const widen = (s: number) => Math.hypot(s * gm, rel * value);
    return { value, plus: widen(q.plus), minus: widen(q.minus) };
  }
  const s = q.unit.scale;
  return { value: q.value * s, plus: q.plus * s, minus: q.minus * s };
}
