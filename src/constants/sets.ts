import type { Constant } from "./constant.js";
import * as codata2018 from "./codata2018.js";
import * as codata2014 from "./codata2014.js";
import * as iau2012 from "./iau2012.js";
import * as iau2015 from "./iau2015.js";
import * as derived from "./derived.js";

/** The constants a computation uses, chosen together as one named edition. */
export interface ConstantSet {
  readonly id: string;
  readonly title: string;
  readonly G: Constant;
  readonly au: Constant;
  readonly pc: Constant;
  readonly GM_sun: Constant;
  readonly GM_jup: Constant;
  readonly GM_earth: Constant;
  readonly R_sun: Constant;
  readonly R_jup: Constant;
  readonly R_earth: Constant;
  readonly c: Constant;
}

export const DEFAULT_SET: ConstantSet = Object.freeze({
  id: "codata2018-iau2015",
  title: "CODATA 2018 G; IAU 2012 au; IAU 2015 nominal solar and planetary values",
  G: codata2018.G,
  au: iau2012.au,
  pc: iau2015.pc,
  GM_sun: iau2015.GM_sun,
  GM_jup: iau2015.GM_jup,
  GM_earth: iau2015.GM_earth,
  R_sun: iau2015.R_sun,
  R_jup: iau2015.R_jup,
  R_earth: iau2015.R_earth,
  c: codata2018.c,
});

/** Every constant, for the constants page, in display order. */
export const ALL_CONSTANTS: readonly Constant[] = Object.freeze([
  codata2018.G,
  codata2018.c,
  iau2012.au,
  iau2015.pc,
  iau2015.GM_sun,
  iau2015.GM_jup,
  iau2015.GM_earth,
  iau2015.R_sun,
  iau2015.R_jup,
  iau2015.R_earth,
  derived.M_sun,
  derived.M_jup,
  derived.M_earth,
  codata2014.G,
]);
