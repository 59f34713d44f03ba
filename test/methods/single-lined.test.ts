import { describe, expect, it } from "vitest";
import { singleLined as m } from "../../src/methods/single-lined.js";
import { codes, relErr } from "./helpers.js";
import { si } from "./sample-inputs.js";

/** The semi-amplitude of star 1 in a binary of known masses (GM form): K₁ = (2π/P)^{1/3} M₂ sin i / ((M₁+M₂)^{2/3} √(1−e²)). */
function k1Of(m1: number, m2: number, period: number, inc: number, e: number): number {
  return (Math.cbrt((2 * Math.PI) / period) * m2 * Math.sin(inc)) / (Math.cbrt(m1 + m2) ** 2 * Math.sqrt(1 - e * e));
}

const ok = { period: si(4.23, "d"), k1: si(56, "m/s") };

describe("single-lined: validation", () => {
  it("accepts period and semi-amplitude alone", () => {
    expect(m.validate(ok)).toEqual([]);
  });

  it("asks for the period and the semi-amplitude", () => {
    expect(codes(m.validate({}))).toEqual(["missing-input@period", "missing-input@k1"]);
  });

  it("refuses e ≥ 1, a negative period and a negative semi-amplitude", () => {
    expect(codes(m.validate({ ...ok, eccentricity: 1 }))).toEqual(["eccentricity-out-of-range@eccentricity"]);
    expect(codes(m.validate({ ...ok, period: -ok.period }))).toEqual(["out-of-range@period"]);
    expect(codes(m.validate({ ...ok, k1: -1 }))).toEqual(["out-of-range@k1"]);
    expect(codes(m.validate({ ...ok, primary_mass: 0 }))).toEqual(["out-of-range@primary_mass"]);
  });

  it("refuses an inclination outside (0°, 180°) or with sin i ≈ 0", () => {
    expect(codes(m.validate({ ...ok, inclination: 0 }))).toEqual(["inclination-out-of-range@inclination"]);
    expect(codes(m.validate({ ...ok, inclination: Math.PI }))).toEqual(["inclination-out-of-range@inclination"]);
    expect(codes(m.validate({ ...ok, inclination: si(190, "deg") }))).toEqual(["inclination-out-of-range@inclination"]);
    expect(codes(m.validate({ ...ok, inclination: si(0.1, "arcsec") }))).toEqual(["inclination-out-of-range@inclination"]);
    expect(m.validate({ ...ok, inclination: si(91, "deg") })).toEqual([]);
  });
});

describe("single-lined: compute", () => {
  const m1 = si(1.1, "Msun");

  it("recovers a companion of known mass: f, the minimum mass and the true mass", () => {
    for (const [m2, inc, e] of [
      [si(0.47, "Mjup"), si(60, "deg"), 0],
      [si(0.6, "Msun"), si(80, "deg"), 0.3],
      [si(9, "Msun"), si(120, "deg"), 0.05],
    ] as const) {
      const P = si(20, "d");
      const r = m.compute({ period: P, k1: k1Of(m1, m2, P, inc, e), eccentricity: e, inclination: inc, primary_mass: m1 });
      expect(relErr(r.mass_function, (m2 * Math.sin(inc)) ** 3 / (m1 + m2) ** 2)).toBeLessThan(1e-13);
      expect(relErr(r.secondary_mass, m2)).toBeLessThan(1e-12);
      // a₁ sin i from Kepler's third law: a₁ = a M₂/(M₁+M₂)
      const a = Math.cbrt(((m1 + m2) * P * P) / (4 * Math.PI * Math.PI));
      expect(relErr(r.a1_sin_i, ((a * m2) / (m1 + m2)) * Math.sin(inc))).toBeLessThan(1e-13);
      expect(r.min_secondary_mass).toBeLessThan(r.secondary_mass);
    }
  });

  it("solves the exact cubic for the minimum mass, m³ = f (M1 + m)², to 1e-12", () => {
    const r = m.compute({ period: si(0.32, "d"), k1: si(433, "km/s"), primary_mass: si(0.4, "Msun") });
    const x = r.min_secondary_mass;
    expect(relErr(x ** 3, r.mass_function * (si(0.4, "Msun") + x) ** 2)).toBeLessThan(1e-12);
    // a heavy dark companion: the small-mass shortcut would be far off
    expect(Math.cbrt(r.mass_function * si(0.4, "Msun") ** 2) / x).toBeLessThan(0.5);
  });

  it("approaches the small-mass shortcut K (P M1² / 2π)^{1/3} for a planet, from above", () => {
    const r = m.compute({ ...ok, primary_mass: m1 });
    const shortcut = ok.k1 * Math.cbrt((ok.period * m1 * m1) / (2 * Math.PI));
    const v = r.min_secondary_mass / m1;
    expect(r.min_secondary_mass).toBeGreaterThan(shortcut);
    expect(Math.abs(r.min_secondary_mass / shortcut - 1 - (2 / 3) * v)).toBeLessThan(v * v);
  });

  it("scales the mass function by (1 − e²)^{3/2} and a1 sin i by (1 − e²)^{1/2}", () => {
    const circ = m.compute(ok);
    const ecc = m.compute({ ...ok, eccentricity: 0.6 });
    expect(relErr(ecc.mass_function, circ.mass_function * 0.8 ** 3)).toBeLessThan(1e-14);
    expect(relErr(ecc.a1_sin_i, circ.a1_sin_i * 0.8)).toBeLessThan(1e-14);
    expect(circ.a1_sin_i).toBe((ok.k1 * ok.period) / (2 * Math.PI));
  });

  it("computes only what the inputs allow", () => {
    expect(Object.keys(m.compute(ok)).sort()).toEqual(["a1_sin_i", "mass_function"]);
    expect(Object.keys(m.compute({ ...ok, inclination: 1 })).sort()).toEqual(["a1_sin_i", "mass_function"]);
    expect(Object.keys(m.compute({ ...ok, primary_mass: m1 })).sort()).toEqual(["a1_sin_i", "mass_function", "min_secondary_mass"]);
    expect(Object.keys(m.compute({ ...ok, primary_mass: m1, inclination: 1 })).sort()).toEqual(["a1_sin_i", "mass_function", "min_secondary_mass", "secondary_mass"]);
    expect(m.compute({ period: 1 })).toEqual({});
  });

  it("states e = 0 and sin i = 1 when they are taken", () => {
    expect(m.implicitAssumptions(ok)).toEqual(["e = 0 assumed (no eccentricity given)", "sin i = 1 (minimum mass)"]);
    expect(m.implicitAssumptions({ ...ok, eccentricity: 0, inclination: 1, primary_mass: m1 })).toEqual([]);
    expect(m.implicitAssumptions({ ...ok, eccentricity: 0.1, inclination: 1 })).toEqual(["the inclination is not used: a companion mass needs the primary mass too"]);
  });
});
