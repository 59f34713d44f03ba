import { defineConstant } from "./constant.js";

/**
 * CODATA 2018 recommended values.
 * Tiesinga, Mohr, Newell & Taylor 2021, Rev. Mod. Phys. 93, 025010, Table XXXI.
 */
const SOURCE = "CODATA 2018 (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010)";

export const G = defineConstant({
  key: "G",
  name: "Newtonian constant of gravitation",
  latex: "G",
  value: 6.6743e-11,
  uncertainty: 0.00015e-11,
  unit: "m3 kg-1 s-2",
  unitLatex: "\\mathrm{m^{3}\\,kg^{-1}\\,s^{-2}}",
  exact: false,
  source: SOURCE,
});

export const c = defineConstant({
  key: "c",
  name: "speed of light in vacuum",
  latex: "c",
  value: 299792458,
  uncertainty: 0,
  unit: "m s-1",
  unitLatex: "\\mathrm{m\\,s^{-1}}",
  exact: true,
  source: `${SOURCE}; exact since the 1983 definition of the metre`,
});
