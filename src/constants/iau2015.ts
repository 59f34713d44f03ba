import { defineConstant } from "./constant.js";

/**
 * IAU 2015 Resolution B3: nominal conversion constants for stellar and
 * planetary properties. Nominal values are exact by definition: they are
 * units, not measurements (Prša et al. 2016, AJ 152, 41, Table 1).
 */
const B3 = "IAU 2015 Resolution B3 (Prša et al. 2016, AJ 152, 41)";

function nominal(key: string, name: string, latex: string, value: number, unit: string, unitLatex: string) {
  return defineConstant({ key, name, latex, value, uncertainty: 0, unit, unitLatex, exact: true, source: B3 });
}

const GM_UNIT = "m3 s-2";
const GM_LATEX = "\\mathrm{m^{3}\\,s^{-2}}";

export const GM_sun = nominal("GM_sun", "nominal solar mass parameter", "(\\mathcal{GM})^{\\mathrm{N}}_{\\odot}", 1.3271244e20, GM_UNIT, GM_LATEX);
export const R_sun = nominal("R_sun", "nominal solar radius", "\\mathcal{R}^{\\mathrm{N}}_{\\odot}", 6.957e8, "m", "\\mathrm{m}");
export const GM_earth = nominal("GM_earth", "nominal terrestrial mass parameter", "(\\mathcal{GM})^{\\mathrm{N}}_{\\oplus}", 3.986004e14, GM_UNIT, GM_LATEX);
export const R_earth = nominal("R_earth", "nominal terrestrial equatorial radius", "\\mathcal{R}^{\\mathrm{N}}_{e\\oplus}", 6.3781e6, "m", "\\mathrm{m}");
export const GM_jup = nominal("GM_jup", "nominal jovian mass parameter", "(\\mathcal{GM})^{\\mathrm{N}}_{\\mathrm{J}}", 1.2668653e17, GM_UNIT, GM_LATEX);
export const R_jup = nominal("R_jup", "nominal jovian equatorial radius", "\\mathcal{R}^{\\mathrm{N}}_{e\\mathrm{J}}", 7.1492e7, "m", "\\mathrm{m}");

/**
 * IAU 2015 Resolution B2 states the parsec as exactly 648000/π au (from memory:
 * the resolution's note on the parsec).
 */
export const pc = defineConstant({
  key: "pc",
  name: "parsec",
  latex: "\\mathrm{pc}",
  value: (648000 / Math.PI) * 149597870700,
  uncertainty: 0,
  unit: "m",
  unitLatex: "\\mathrm{m}",
  exact: true,
  source: "IAU 2015 Resolution B2 (648000/π au, with the au of IAU 2012 Resolution B2)",
  derivation: "648000/π × au",
});
