/**
 * Every constant against the standard that defines or measures it.
 *
 * Exactly defined constants are compared with toBe. Measured ones are
 * compared with the published decimal to 1 part in 10⁹: one unit in the last
 * published digit of G is 1.5 ppm, so a single wrong digit fails, while the
 * binary rounding of the decimal (~10⁻¹⁶) never does.
 */
import { describe, expect, it } from "vitest";
import * as math from "mathjs";
import { ALL_CONSTANTS, DEFAULT_SET, codata2014, codata2018, defineConstant, derived, iau2012, iau2015, relativeUncertainty } from "../../src/constants/index.js";

const DIGIT_TOLERANCE = 1e-9;

function relativeDifference(a: number, b: number): number {
  return Math.abs(a - b) / Math.abs(b);
}

// CODATA 2018: Tiesinga, Mohr, Newell & Taylor 2021, Rev. Mod. Phys. 93, 025010,
// table of recommended values: G = 6.674 30(15) × 10⁻¹¹ m³ kg⁻¹ s⁻²; c = 299 792 458 m s⁻¹ exact.
describe("CODATA 2018 (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010)", () => {
  it("G = 6.674 30(15) × 10⁻¹¹ m³ kg⁻¹ s⁻², measured", () => {
    expect(relativeDifference(codata2018.G.value, 6.6743e-11)).toBeLessThan(DIGIT_TOLERANCE);
    expect(relativeDifference(codata2018.G.uncertainty, 0.00015e-11)).toBeLessThan(DIGIT_TOLERANCE);
    expect(codata2018.G.exact).toBe(false);
    expect(codata2018.G.unit).toBe("m3 kg-1 s-2");
  });

  it("G's relative standard uncertainty is 2.2 × 10⁻⁵ (22 ppm)", () => {
    // 0.00015 / 6.67430 = 2.2474e-5; CODATA states it rounded as 2.2e-5.
    expect(relativeUncertainty(codata2018.G)).toBeCloseTo(2.2474e-5, 9);
  });

  it("c = 299 792 458 m s⁻¹, exact", () => {
    expect(codata2018.c.value).toBe(299792458);
    expect(codata2018.c.uncertainty).toBe(0);
    expect(codata2018.c.exact).toBe(true);
  });

  // mathjs 15.2.0 (general-purpose maths library from the npm registry) ships
  // CODATA 2018 physical constants: an independent copy of the same values.
  it("agrees with mathjs's gravitationConstant and speedOfLight", () => {
    expect(relativeDifference(codata2018.G.value, math.gravitationConstant.toNumber("m^3 kg^-1 s^-2"))).toBeLessThan(DIGIT_TOLERANCE);
    expect(codata2018.c.value).toBe(math.speedOfLight.toNumber("m/s"));
  });
});

// CODATA 2014: Mohr, Newell & Taylor 2016, Rev. Mod. Phys. 88, 035009:
// G = 6.674 08(31) × 10⁻¹¹ m³ kg⁻¹ s⁻².
describe("CODATA 2014 (Mohr et al. 2016, Rev. Mod. Phys. 88, 035009)", () => {
  it("G = 6.674 08(31) × 10⁻¹¹ m³ kg⁻¹ s⁻², measured, 46 ppm", () => {
    expect(relativeDifference(codata2014.G.value, 6.67408e-11)).toBeLessThan(DIGIT_TOLERANCE);
    expect(relativeDifference(codata2014.G.uncertainty, 0.00031e-11)).toBeLessThan(DIGIT_TOLERANCE);
    expect(codata2014.G.exact).toBe(false);
    expect(relativeUncertainty(codata2014.G)).toBeCloseTo(4.645e-5, 8);
  });

  it("differs from CODATA 2018 G by 33 ppm, more than the 2018 uncertainty", () => {
    const shift = (codata2018.G.value - codata2014.G.value) / codata2018.G.value;
    expect(shift).toBeCloseTo(3.296e-5, 8);
    expect(shift).toBeGreaterThan(relativeUncertainty(codata2018.G));
  });
});

// IAU 2012 Resolution B2: the astronomical unit is 149 597 870 700 m exactly.
describe("IAU 2012 Resolution B2", () => {
  it("au = 149 597 870 700 m, exact", () => {
    expect(iau2012.au.value).toBe(149597870700);
    expect(iau2012.au.uncertainty).toBe(0);
    expect(iau2012.au.exact).toBe(true);
  });
});

// IAU 2015 Resolution B3, nominal conversion constants; Prša et al. 2016, AJ 152, 41, Table 1.
// Nominal values are exact by definition.
describe("IAU 2015 Resolution B3 (Prša et al. 2016, AJ 152, 41, Table 1)", () => {
  const table: Array<[string, number, number, string]> = [
    ["GM_sun", iau2015.GM_sun.value, 1.3271244e20, "m3 s-2"],
    ["R_sun", iau2015.R_sun.value, 6.957e8, "m"],
    ["GM_earth", iau2015.GM_earth.value, 3.986004e14, "m3 s-2"],
    ["R_earth", iau2015.R_earth.value, 6.3781e6, "m"],
    ["GM_jup", iau2015.GM_jup.value, 1.2668653e17, "m3 s-2"],
    ["R_jup", iau2015.R_jup.value, 7.1492e7, "m"],
  ];
  for (const [key, value, published, unit] of table) {
    it(`${key} = ${published} ${unit}, exact`, () => {
      expect(value).toBe(published);
      const c = ALL_CONSTANTS.find((k) => k.key === key)!;
      expect(c.exact).toBe(true);
      expect(c.uncertainty).toBe(0);
      expect(c.unit).toBe(unit);
    });
  }
});

// IAU 2015 Resolution B2: the parsec is 648000/π au; 3.085 677 581 491 3673 × 10¹⁶ m (from memory).
describe("IAU 2015 Resolution B2: parsec", () => {
  it("pc = 648000/π au = 3.085 677 581 491 3673 × 10¹⁶ m", () => {
    // π is irrational, so the double is a rounding: one unit in the last place.
    expect(relativeDifference(iau2015.pc.value, 3.0856775814913673e16)).toBeLessThanOrEqual(Number.EPSILON);
    expect(iau2015.pc.exact).toBe(true);
  });
});

// Mass in kilograms = nominal GM / G (IAU 2015 B3 recommends this derivation).
// With CODATA 2018 G: 1.3271244e20 / 6.67430e-11 = 1.988 41 × 10³⁰ kg (arithmetic),
// carrying G's 22 ppm. Prša et al. 2016 quote 1.988 48(9) × 10³⁰ kg with CODATA 2014 G (from memory).
describe("masses derived from nominal GM and G", () => {
  it("the solar mass is GM_sun / G = 1.988 41 × 10³⁰ kg with G's relative uncertainty", () => {
    // 6 digits typed: 5e-6 relative covers their rounding.
    expect(relativeDifference(derived.M_sun.value, 1.98841e30)).toBeLessThan(5e-6);
    expect(relativeDifference(derived.M_sun.value, 1.3271244e20 / 6.6743e-11)).toBeLessThanOrEqual(Number.EPSILON);
    expect(relativeDifference(relativeUncertainty(derived.M_sun), relativeUncertainty(codata2018.G))).toBeLessThan(1e-12);
    expect(derived.M_sun.uncertainty).toBeCloseTo(4.469e25, -22);
    expect(derived.M_sun.exact).toBe(false);
    expect(derived.M_sun.derivation).toBe("GM_sun / G");
  });

  it("with CODATA 2014 G the same derivation gives the 1.988 48 × 10³⁰ kg quoted by Prša et al. 2016", () => {
    // Value from memory, quoted to 6 digits: 5e-6 relative.
    expect(relativeDifference(iau2015.GM_sun.value / codata2014.G.value, 1.98848e30)).toBeLessThan(5e-6);
  });

  it("the jovian and terrestrial masses follow the same rule", () => {
    // 1.2668653e17 / 6.6743e-11 = 1.898 12 × 10²⁷ kg; 3.986004e14 / 6.6743e-11 = 5.972 17 × 10²⁴ kg (arithmetic, 6 digits).
    expect(relativeDifference(derived.M_jup.value, 1.89812e27)).toBeLessThan(5e-6);
    expect(relativeDifference(derived.M_earth.value, 5.97217e24)).toBeLessThan(5e-6);
    for (const m of [derived.M_jup, derived.M_earth]) {
      expect(relativeDifference(relativeUncertainty(m), relativeUncertainty(codata2018.G))).toBeLessThan(1e-12);
    }
  });
});

describe("constant sets and bookkeeping", () => {
  it("the default set is CODATA 2018 G with IAU 2012 au and IAU 2015 nominal values", () => {
    expect(DEFAULT_SET.G).toBe(codata2018.G);
    expect(DEFAULT_SET.c).toBe(codata2018.c);
    expect(DEFAULT_SET.au).toBe(iau2012.au);
    expect(DEFAULT_SET.pc).toBe(iau2015.pc);
    expect(DEFAULT_SET.GM_sun).toBe(iau2015.GM_sun);
    expect(DEFAULT_SET.R_sun).toBe(iau2015.R_sun);
  });

  it("every constant names its standard, and exact ones have no uncertainty", () => {
    expect(new Set(ALL_CONSTANTS.map((c) => c.key)).size).toBe(ALL_CONSTANTS.length);
    for (const c of ALL_CONSTANTS) {
      expect(c.source.length, c.key).toBeGreaterThan(0);
      expect(c.exact ? c.uncertainty === 0 : c.uncertainty > 0, c.key).toBe(true);
    }
  });

  it("defineConstant refuses an exact constant with an uncertainty and a non-finite value", () => {
    const base = { key: "x", name: "x", latex: "x", value: 1, uncertainty: 0, unit: "m", unitLatex: "\\mathrm{m}", exact: true, source: "test" };
    expect(() => defineConstant({ ...base, uncertainty: 0.1 })).toThrow(/exact/);
    expect(() => defineConstant({ ...base, value: Number.NaN })).toThrow(/finite/);
    expect(() => defineConstant({ ...base, exact: false, uncertainty: -1 })).toThrow(/non-negative/);
  });
});
