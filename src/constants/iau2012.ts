import { defineConstant } from "./constant.js";

/** IAU 2012 Resolution B2: re-definition of the astronomical unit of length. */
export const au = defineConstant({
  key: "au",
  name: "astronomical unit",
  latex: "\\mathrm{au}",
  value: 149597870700,
  uncertainty: 0,
  unit: "m",
  unitLatex: "\\mathrm{m}",
  exact: true,
  source: "IAU 2012 Resolution B2",
});
