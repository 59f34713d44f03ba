import { DEFAULT_SET } from "../../src/constants/sets.js";
import { findUnit } from "../../src/units/catalog.js";

/**
 * Published values into SI through the unit catalogue, as a record would be
 * read: mass units give GM (m³ s⁻²).
 */
export function toSI(value: number, unit: string): number {
  const u = findUnit(unit);
  if (!u) throw new Error(`no unit ${unit} in the catalogue`);
  return value * (u.gm ?? u.scale);
}

/** GM in nominal solar masses: GM / (GM)☉ (IAU 2015 B3), no G needed. */
export function inSolarMasses(gm: number): number {
  return gm / DEFAULT_SET.GM_sun.value;
}

/** GM in nominal jovian masses: GM / (GM)_J (IAU 2015 B3). */
export function inJovianMasses(gm: number): number {
  return gm / DEFAULT_SET.GM_jup.value;
}

export function relErr(a: number, b: number): number {
  return Math.abs(a - b) / Math.abs(b);
}
