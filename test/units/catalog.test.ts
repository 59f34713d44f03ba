/**
 * Every unit in the catalogue against an outside reference.
 *
 * - Units that mathjs 15.2.0 defines (mathjs is a general-purpose maths
 *   library from the npm registry, with its own unit tables) are compared with
 *   mathjs's conversion to SI and its dimension. mathjs's "year" is the Julian
 *   year of 365.25 d (31 557 600 s), which is what our "yr" is.
 * - Units mathjs lacks (au, pc, ly, the IAU nominal solar and planetary units,
 *   mas, µas) are compared with the numbers of their defining standard:
 *   IAU 2012 Resolution B2 (au), IAU 2015 Resolution B2 (pc = 648000/π au),
 *   IAU 2015 Resolution B3 (nominal radii and GM; Prša et al. 2016, AJ 152, 41,
 *   Table 1), CODATA 2018 G (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010),
 *   the Julian year of 365.25 d and the light-year c × Julian year (IAU
 *   conventions, from memory).
 */
import { describe, expect, it } from "vitest";
import * as math from "mathjs";
import katex from "katex";
import { UNITS, findUnit, unitById, unitSpellings } from "../../src/units/catalog.js";
import type { Dimension } from "../../src/units/dimension.js";

/** Our unit id → the mathjs spelling of the same unit. */
const MATHJS_NAME: Readonly<Record<string, string>> = {
  s: "s",
  min: "minute",
  h: "hour",
  d: "day",
  yr: "year",
  m: "m",
  km: "km",
  cm: "cm",
  rad: "rad",
  deg: "deg",
  arcmin: "arcmin",
  arcsec: "arcsec",
  kg: "kg",
  g: "g",
  "m/s": "m/s",
  "km/s": "km/s",
  "m3/s2": "m^3/s^2",
  "km3/s2": "km^3/s^2",
};

/** The SI base-unit product with the same dimension, in mathjs spelling ("m^3 s^-2"). */
function mathjsBase(d: Dimension): string {
  const parts: string[] = [];
  if (d.length !== 0) parts.push(`m^${d.length}`);
  if (d.mass !== 0) parts.push(`kg^${d.mass}`);
  if (d.time !== 0) parts.push(`s^${d.time}`);
  if (d.angle !== 0) parts.push(`rad^${d.angle}`);
  return parts.join(" ");
}

function relativeDifference(a: number, b: number): number {
  return Math.abs(a - b) / Math.abs(b);
}

/**
 * Both sides evaluate the same exact definition (e.g. π/648000 rad) in IEEE
 * doubles and may round the last operation differently: allow 2 units in the
 * last place (2 × 2⁻⁵² ≈ 4.4e-16).
 */
const DOUBLE_ROUNDING = 2 * Number.EPSILON;

describe("units that mathjs defines", () => {
  for (const [id, name] of Object.entries(MATHJS_NAME)) {
    it(`${id} has the size and dimension of mathjs "${name}"`, () => {
      const ours = unitById(id);
      const theirs = math.unit(1, name);
      const base = mathjsBase(ours.dimension);
      expect(theirs.equalBase(math.unit(base))).toBe(true);
      expect(relativeDifference(ours.scale, theirs.toNumber(base))).toBeLessThanOrEqual(DOUBLE_ROUNDING);
    });
  }

  it("mathjs's year is the Julian year, so it can serve as the reference for yr", () => {
    expect(math.unit(1, "year").toNumber("s")).toBe(31557600);
  });

  it("mas and µas are 10⁻³ and 10⁻⁶ of mathjs's arcsec", () => {
    expect(relativeDifference(unitById("mas").scale, math.unit(1e-3, "arcsec").toNumber("rad"))).toBeLessThanOrEqual(DOUBLE_ROUNDING);
    expect(relativeDifference(unitById("uas").scale, math.unit(1e-6, "arcsec").toNumber("rad"))).toBeLessThanOrEqual(DOUBLE_ROUNDING);
  });
});

describe("units checked against their defining standard", () => {
  it("time units are exact multiples of the SI second; yr is the Julian year of 365.25 d", () => {
    expect(unitById("s").scale).toBe(1);
    expect(unitById("min").scale).toBe(60);
    expect(unitById("h").scale).toBe(3600);
    expect(unitById("d").scale).toBe(86400);
    expect(unitById("yr").scale).toBe(365.25 * 86400);
    expect(unitById("yr").scale).toBe(31557600);
  });

  // IAU 2012 Resolution B2: 1 au = 149 597 870 700 m exactly.
  it("au is the IAU 2012 B2 astronomical unit", () => {
    expect(unitById("au").scale).toBe(149597870700);
  });

  // IAU 2015 Resolution B2: 1 pc = 648000/π au = 3.085 677 581 491 3673 × 10¹⁶ m
  // (17-digit value from memory). π is irrational, so the double is rounded:
  // allow one unit in the last place.
  it("pc is 648000/π au (IAU 2015 B2), and kpc, Mpc are 10³ and 10⁶ of it", () => {
    const pc = 3.0856775814913673e16;
    expect(relativeDifference(unitById("pc").scale, pc)).toBeLessThanOrEqual(Number.EPSILON);
    expect(relativeDifference(unitById("kpc").scale, 1e3 * pc)).toBeLessThanOrEqual(DOUBLE_ROUNDING);
    expect(relativeDifference(unitById("Mpc").scale, 1e6 * pc)).toBeLessThanOrEqual(DOUBLE_ROUNDING);
  });

  // The light-year is c × 365.25 d = 9 460 730 472 580 800 m exactly (from memory),
  // an even integer that a double holds exactly.
  it("ly is c × Julian year", () => {
    expect(unitById("ly").scale).toBe(9460730472580800);
  });

  // IAU 2015 Resolution B3, nominal values (Prša et al. 2016, AJ 152, 41, Table 1): exact by definition.
  it("nominal radii are the IAU 2015 B3 values", () => {
    expect(unitById("R_sun").scale).toBe(6.957e8);
    expect(unitById("R_jup").scale).toBe(7.1492e7);
    expect(unitById("R_earth").scale).toBe(6.3781e6);
  });

  // IAU 2015 B3 nominal GM; G from CODATA 2018 (6.67430(15) × 10⁻¹¹ m³ kg⁻¹ s⁻²).
  // The kilogram size is GM / G: one division, so one rounding (1 ulp).
  it("nominal mass units carry the exact IAU 2015 B3 GM and their kilogram size is GM / G", () => {
    const G = 6.6743e-11;
    const cases: Array<[string, number]> = [
      ["Msun", 1.3271244e20],
      ["Mjup", 1.2668653e17],
      ["Mearth", 3.986004e14],
    ];
    for (const [id, gm] of cases) {
      const u = unitById(id);
      expect(u.gm).toBe(gm);
      expect(u.gmRelativeUncertainty).toBe(0);
      expect(relativeDifference(u.scale, gm / G)).toBeLessThanOrEqual(Number.EPSILON);
    }
    // 1.3271244e20 / 6.6743e-11 = 1.988 409 87 × 10³⁰ kg (arithmetic); 5 × 10⁻⁹ covers the 9 digits written.
    expect(relativeDifference(unitById("Msun").scale, 1.98840987e30)).toBeLessThan(5e-9);
  });

  // kg and g reach GM through G and inherit its relative uncertainty, 0.00015/6.67430 = 22.47 ppm.
  it("kg and g convert to GM through CODATA 2018 G", () => {
    expect(unitById("kg").gm).toBe(6.6743e-11);
    expect(relativeDifference(unitById("g").gm!, 6.6743e-14)).toBeLessThanOrEqual(Number.EPSILON);
    // Published uncertainty 0.00015 over 6.67430; 1e-6 relative covers the double rounding of the quotient.
    expect(relativeDifference(unitById("kg").gmRelativeUncertainty!, 0.00015 / 6.6743)).toBeLessThan(1e-6);
    expect(unitById("kg").gmRelativeUncertainty!).toBeCloseTo(22.47e-6, 8);
    expect(unitById("g").gmRelativeUncertainty).toBe(unitById("kg").gmRelativeUncertainty);
  });

  it("the pure number has size 1 and no dimension", () => {
    const one = unitById("1");
    expect(one.scale).toBe(1);
    expect([one.dimension.length, one.dimension.mass, one.dimension.time, one.dimension.angle]).toEqual([0, 0, 0, 0]);
  });

  it("every catalogue unit has exactly one outside check in this file", () => {
    const checkedHere = new Set([
      ...Object.keys(MATHJS_NAME),
      "mas", "uas", "au", "pc", "kpc", "Mpc", "ly", "R_sun", "R_jup", "R_earth", "Msun", "Mjup", "Mearth", "1",
    ]);
    const ids = UNITS.map((u) => u.id);
    expect(ids.filter((id) => !checkedHere.has(id))).toEqual([]);
    expect([...checkedHere].filter((id) => !ids.includes(id))).toEqual([]);
  });
});

describe("catalogue bookkeeping", () => {
  it("every unit states how it is defined and by which standard", () => {
    for (const u of UNITS) {
      expect(u.definition.length, u.id).toBeGreaterThan(0);
      expect(u.source.length, u.id).toBeGreaterThan(0);
      expect(Number.isFinite(u.scale) && u.scale > 0, u.id).toBe(true);
    }
  });

  it("every id and alias finds its own unit, and no spelling is shared", () => {
    const seen = new Map<string, string>();
    for (const u of UNITS) {
      for (const name of [u.id, ...u.aliases]) {
        expect(seen.get(name), name).toBeUndefined();
        seen.set(name, u.id);
        expect(findUnit(name)).toBe(u);
      }
    }
    expect(unitSpellings().length).toBe(seen.size);
  });

  it("mass units, and only they, carry a GM", () => {
    for (const u of UNITS) expect(u.gm !== undefined, u.id).toBe(u.dimension.mass === 1);
  });

  it("every unit's LaTeX renders with KaTeX in strict mode", () => {
    for (const u of UNITS) {
      const html = katex.renderToString(`1\\,${u.latex}`, { throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml" });
      expect(html, u.id).toContain("katex");
    }
  });
});
