import { DEFAULT_SET } from "../constants/sets.js";
import { relativeUncertainty } from "../constants/constant.js";
import {
  ANGLE,
  DIMENSIONLESS,
  GRAVITATIONAL_PARAMETER,
  LENGTH,
  MASS,
  TIME,
  VELOCITY,
  type Dimension,
} from "./dimension.js";
import type { Unit } from "./unit.js";

const K = DEFAULT_SET;
const DAY = 86400;
const JULIAN_YEAR = 365.25 * DAY;
const ARCSEC = Math.PI / (180 * 3600);

function unit(
  id: string,
  symbol: string,
  latex: string,
  dimension: Dimension,
  scale: number,
  definition: string,
  source: string,
  aliases: string[] = [],
  extra: Partial<Pick<Unit, "gm" | "gmRelativeUncertainty">> = {},
): Unit {
  return Object.freeze({ id, symbol, latex, dimension, scale, definition, source, aliases: Object.freeze(aliases), ...extra });
}

const SI = "SI (BIPM, The International System of Units, 9th edition, 2019)";
const G_REL = relativeUncertainty(K.G);

/** Every unit a record may use. Compound forms are built from these by parse.ts. */
export const UNITS: readonly Unit[] = Object.freeze([
  // dimensionless
  unit("1", "", "", DIMENSIONLESS, 1, "pure number", SI, ["", "dimensionless", "none"]),

  // time
  unit("s", "s", "\\mathrm{s}", TIME, 1, "SI second", SI, ["sec", "second", "seconds"]),
  unit("min", "min", "\\mathrm{min}", TIME, 60, "60 s", SI, ["minute", "minutes"]),
  unit("h", "h", "\\mathrm{h}", TIME, 3600, "3600 s", SI, ["hr", "hour", "hours"]),
  unit("d", "d", "\\mathrm{d}", TIME, DAY, "86400 s", SI, ["day", "days"]),
  unit("yr", "yr", "\\mathrm{yr}", TIME, JULIAN_YEAR, "Julian year, 365.25 d of 86400 s (exact)",
    "IAU (Julian year, 365.25 d; IAU Style Manual 1989, from memory)", ["y", "a", "year", "years", "Julian year"]),

  // length
  unit("m", "m", "\\mathrm{m}", LENGTH, 1, "SI metre", SI, ["meter", "metre", "meters", "metres"]),
  unit("km", "km", "\\mathrm{km}", LENGTH, 1e3, "1000 m", SI, ["kilometer", "kilometre", "kilometers", "kilometres"]),
  unit("cm", "cm", "\\mathrm{cm}", LENGTH, 1e-2, "10⁻² m", SI, ["centimeter", "centimetre", "centimeters", "centimetres"]),
  unit("au", "au", "\\mathrm{au}", LENGTH, K.au.value, "149 597 870 700 m (exact)", K.au.source, ["AU", "ua", "UA"]),
  unit("pc", "pc", "\\mathrm{pc}", LENGTH, K.pc.value, "648000/π au (exact)", K.pc.source, ["parsec", "parsecs"]),
  unit("kpc", "kpc", "\\mathrm{kpc}", LENGTH, 1e3 * K.pc.value, "1000 pc", K.pc.source, ["kiloparsec", "kiloparsecs"]),
  unit("Mpc", "Mpc", "\\mathrm{Mpc}", LENGTH, 1e6 * K.pc.value, "10⁶ pc", K.pc.source, ["megaparsec", "megaparsecs"]),
  unit("ly", "ly", "\\mathrm{ly}", LENGTH, K.c.value * JULIAN_YEAR, "c × Julian year = 9 460 730 472 580 800 m (exact)",
    "IAU (light-year: c × 365.25 d; from memory)", ["lyr", "light-year", "light-years", "lightyear"]),
  unit("R_sun", "R☉", "R_{\\odot}", LENGTH, K.R_sun.value, "nominal solar radius 6.957 × 10⁸ m", K.R_sun.source,
    ["Rsun", "R_Sun", "Rsol", "R☉", "R_☉", "Rsolar"]),
  unit("R_jup", "RJup", "R_{\\mathrm{J}}", LENGTH, K.R_jup.value, "nominal jovian equatorial radius 7.1492 × 10⁷ m", K.R_jup.source,
    ["Rjup", "R_J", "RJ", "R_Jup", "Rjupiter"]),
  unit("R_earth", "R⊕", "R_{\\oplus}", LENGTH, K.R_earth.value, "nominal terrestrial equatorial radius 6.3781 × 10⁶ m", K.R_earth.source,
    ["Rearth", "R_E", "R_Earth", "R⊕", "R_⊕"]),

  // angle
  unit("rad", "rad", "\\mathrm{rad}", ANGLE, 1, "radian", SI, ["radian", "radians"]),
  unit("deg", "°", "^{\\circ}", ANGLE, Math.PI / 180, "π/180 rad", SI, ["°", "degree", "degrees"]),
  unit("arcmin", "′", "'", ANGLE, Math.PI / (180 * 60), "1/60 degree", SI, ["amin", "′"]),
  unit("arcsec", "″", "''", ANGLE, ARCSEC, "1/3600 degree", SI, ["asec", "as", "″", "\""]),
  unit("mas", "mas", "\\mathrm{mas}", ANGLE, 1e-3 * ARCSEC, "10⁻³ arcsec", SI, ["milliarcsec", "milliarcsecond", "milliarcseconds"]),
  unit("uas", "µas", "\\mu\\mathrm{as}", ANGLE, 1e-6 * ARCSEC, "10⁻⁶ arcsec", SI, ["µas", "μas", "microarcsec", "microarcsecond", "microarcseconds"]),

  // velocity
  unit("m/s", "m s⁻¹", "\\mathrm{m\\,s^{-1}}", VELOCITY, 1, "metre per second", SI, ["m s-1", "m s^-1", "ms-1", "m.s-1", "m·s⁻¹"]),
  unit("km/s", "km s⁻¹", "\\mathrm{km\\,s^{-1}}", VELOCITY, 1e3, "1000 m s⁻¹", SI, ["km s-1", "km s^-1", "kms-1", "km.s-1", "kmps", "km·s⁻¹"]),

  // mass
  unit("kg", "kg", "\\mathrm{kg}", MASS, 1, "SI kilogram", SI, ["kilogram", "kilograms"], { gm: K.G.value, gmRelativeUncertainty: G_REL }),
  unit("g", "g", "\\mathrm{g}", MASS, 1e-3, "10⁻³ kg", SI, ["gram", "grams"], { gm: 1e-3 * K.G.value, gmRelativeUncertainty: G_REL }),
  unit("Msun", "M☉", "M_{\\odot}", MASS, K.GM_sun.value / K.G.value, "nominal GM☉ / G (CODATA 2018 G)", `${K.GM_sun.source}; ${K.G.source}`,
    ["M_sun", "M_Sun", "Msol", "M☉", "M_☉", "Msolar", "solar mass", "solar masses"], { gm: K.GM_sun.value, gmRelativeUncertainty: 0 }),
  unit("Mjup", "MJup", "M_{\\mathrm{J}}", MASS, K.GM_jup.value / K.G.value, "nominal GM_J / G (CODATA 2018 G)", `${K.GM_jup.source}; ${K.G.source}`,
    ["M_jup", "M_Jup", "MJ", "M_J", "Mjupiter"], { gm: K.GM_jup.value, gmRelativeUncertainty: 0 }),
  unit("Mearth", "M⊕", "M_{\\oplus}", MASS, K.GM_earth.value / K.G.value, "nominal GM⊕ / G (CODATA 2018 G)", `${K.GM_earth.source}; ${K.G.source}`,
    ["M_earth", "M_Earth", "ME", "M_E", "M⊕", "M_⊕"], { gm: K.GM_earth.value, gmRelativeUncertainty: 0 }),

  // gravitational parameter
  unit("m3/s2", "m³ s⁻²", "\\mathrm{m^{3}\\,s^{-2}}", GRAVITATIONAL_PARAMETER, 1, "cubic metre per second squared", SI,
    ["m^3/s^2", "m3 s-2", "m^3 s^-2", "m3s-2"]),
  unit("km3/s2", "km³ s⁻²", "\\mathrm{km^{3}\\,s^{-2}}", GRAVITATIONAL_PARAMETER, 1e9, "10⁹ m³ s⁻²", SI,
    ["km^3/s^2", "km3 s-2", "km^3 s^-2", "km3s-2"]),
]);

const BY_NAME = new Map<string, Unit>();
for (const u of UNITS) {
  for (const name of [u.id, ...u.aliases]) {
    if (BY_NAME.has(name)) throw new Error(`unit catalogue: ${name} is spelled twice`);
    BY_NAME.set(name, u);
  }
}

/** Exact lookup of a unit by its id or one of its aliases (case-sensitive: "Mm" is not "mm"). */
export function findUnit(name: string): Unit | undefined {
  return BY_NAME.get(name);
}

/** Every accepted spelling, for suggestions. */
export function unitSpellings(): readonly string[] {
  return [...BY_NAME.keys()];
}

export function unitById(id: string): Unit {
  const u = BY_NAME.get(id);
  if (!u) throw new Error(`no unit ${id} in the catalogue`);
  return u;
}
