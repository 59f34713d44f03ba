import type { ResultAudit } from "../audit/types.js";
import { findUnit } from "../units/catalog.js";
import { superscript } from "./display.js";

/** The page symbol of a unit id ("Msun" → "M☉"); the id itself for units outside the catalogue. */
export function unitSymbol(id: string): string {
  const u = findUnit(id);
  return u ? u.symbol : id;
}

/** SI size of one display unit of a result, from the catalogue, else from the result's own two values. */
export function displayScale(result: ResultAudit): number {
  const u = findUnit(result.display_unit);
  if (u) return u.scale;
  return result.value !== 0 ? result.value_si / result.value : 1;
}

/** SI unit text as pages print it: "m3 s-2" → "m³ s⁻²", "" for pure numbers. */
export function siUnitSymbol(text: string): string {
  return text.replace(/([a-z])(-?\d+)/gi, (_all, u: string, n: string) => u + superscript(Number(n)));
}
