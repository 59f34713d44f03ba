import type { Dimension } from "./dimension.js";

/**
 * A unit: its display forms, its size in SI base units and its dimension.
 * Values are stored in SI; a unit only converts at the boundary.
 */
export interface Unit {
  /** Canonical plain symbol, as it appears in reports: "Msun", "km/s", "mas". */
  readonly id: string;
  /** Display symbol for pages (may use Unicode): "M☉", "km s⁻¹". */
  readonly symbol: string;
  /** LaTeX form: "M_{\\odot}", "\\mathrm{km\\,s^{-1}}". */
  readonly latex: string;
  readonly dimension: Dimension;
  /** Size of one unit in SI base units (m, kg, s, rad and their products). */
  readonly scale: number;
  /**
   * Mass units only: GM of one unit, m³ s⁻². Nominal solar and planetary
   * units are defined by their GM (IAU 2015 B3), so a mass in them converts
   * to GM exactly; kg and g convert through G and inherit its uncertainty.
   */
  readonly gm?: number;
  /** Relative standard uncertainty of `gm` (G's, for kg and g); 0 when exact. */
  readonly gmRelativeUncertainty?: number;
  /** How `scale` is obtained, in words. */
  readonly definition: string;
  /** The standard or convention that defines it. */
  readonly source: string;
  /** Other spellings accepted in records. */
  readonly aliases: readonly string[];
}

export function convertToSI(value: number, unit: Unit): number {
  return value * unit.scale;
}

export function convertFromSI(valueSI: number, unit: Unit): number {
  return valueSI / unit.scale;
}
