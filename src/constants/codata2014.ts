import { defineConstant } from "./constant.js";

/**
 * CODATA 2014 recommended value of G, kept to recognise kilogram masses
 * computed with the older constant.
 * Mohr, Newell & Taylor 2016, Rev. Mod. Phys. 88, 035009, Table XXX.
 */
export const G = defineConstant({
  key: "G_2014",
  name: "Newtonian constant of gravitation (CODATA 2014)",
  latex: "G_{2014}",
  value: 6.67408e-11,
  uncertainty: 0.00031e-11,
  unit: "m3 kg-1 s-2",
  unitLatex: "\\mathrm{m^{3}\\,kg^{-1}\\,s^{-2}}",
  exact: false,
  source: "CODATA 2014 (Mohr et al. 2016, Rev. Mod. Phys. 88, 035009)",
});
