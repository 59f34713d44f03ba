import { defineConstant, relativeUncertainty, type Constant } from "./constant.js";
import { G } from "./codata2018.js";
import { GM_earth, GM_jup, GM_sun } from "./iau2015.js";

/**
 * A mass in kilograms derived from a nominal GM and a measured G carries G's
 * relative uncertainty (22 ppm for CODATA 2018).
 */
function massFromGM(key: string, name: string, latex: string, gm: Constant, g: Constant = G): Constant {
  const value = gm.value / g.value;
  return defineConstant({
    key,
    name,
    latex,
    value,
    uncertainty: value * relativeUncertainty(g),
    unit: "kg",
    unitLatex: "\\mathrm{kg}",
    exact: false,
    source: `${gm.source}; ${g.source}`,
    derivation: `${gm.key} / ${g.key}`,
  });
}

export const M_sun = massFromGM("M_sun", "solar mass (kg)", "\\mathcal{M}_{\\odot}", GM_sun);
export const M_jup = massFromGM("M_jup", "jovian mass (kg)", "\\mathcal{M}_{\\mathrm{J}}", GM_jup);
export const M_earth = massFromGM("M_earth", "terrestrial mass (kg)", "\\mathcal{M}_{\\oplus}", GM_earth);
