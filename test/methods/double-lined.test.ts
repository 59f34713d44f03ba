import { describe, expect, it } from "vitest";
import { doubleLined as m } from "../../src/methods/double-lined.js";
import { singleLined } from "../../src/methods/single-lined.js";
import { codes, relErr } from "./helpers.js";
import { si } from "./sample-inputs.js";

/** Semi-amplitude of the star of mass `mine` opposite `other` (GM form). */
function kOf(mine: number, other: number, period: number, inc: number, e: number): number {
  return (Math.cbrt((2 * Math.PI) / period) * other * Math.sin(inc)) / (Math.cbrt(mine + other) ** 2 * Math.sqrt(1 - e * e));
}

const ok = { period: si(24.6, "d"), k1: si(51.2, "km/s"), k2: si(49.1, "km/s") };

describe("double-lined: validation", () => {
  it("accepts period and both semi-amplitudes", () => {
    expect(m.validate(ok)).toEqual([]);
  });

  it("asks for the second semi-amplitude and points to the single-lined method", () => {
    const issues = m.validate({ period: ok.period, k1: ok.k1 });
    expect(codes(issues)).toEqual(["missing-input@k2"]);
    expect(issues[0].hint).toMatch(/single-lined/);
    expect(codes(m.validate({}))).toEqual(["missing-input@period", "missing-input@k1", "missing-input@k2"]);
  });

  it("refuses e ≥ 1, a face-on orbit and negative values", () => {
    expect(codes(m.validate({ ...ok, eccentricity: 1 }))).toEqual(["eccentricity-out-of-range@eccentricity"]);
    expect(codes(m.validate({ ...ok, inclination: 0 }))).toEqual(["inclination-out-of-range@inclination"]);
    expect(codes(m.validate({ ...ok, inclination: Math.PI - 1e-9 }))).toEqual(["inclination-out-of-range@inclination"]);
    expect(codes(m.validate({ ...ok, k2: -ok.k2, period: -1 }))).toEqual(["out-of-range@period", "out-of-range@k2"]);
  });
});

describe("double-lined: compute", () => {
  it("recovers two stars of known mass at a known inclination", () => {
    const m1 = si(1.19, "Msun");
    const m2 = si(1.25, "Msun");
    const P = si(24.6, "d");
    const inc = si(88.5, "deg");
    const e = 0.18;
    const r = m.compute({ period: P, k1: kOf(m1, m2, P, inc, e), k2: kOf(m2, m1, P, inc, e), eccentricity: e, inclination: inc });
    expect(relErr(r.primary_mass, m1)).toBeLessThan(1e-13);
    expect(relErr(r.secondary_mass, m2)).toBeLessThan(1e-13);
    expect(relErr(r.mass_ratio, m2 / m1)).toBeLessThan(1e-14);
    const a = Math.cbrt(((m1 + m2) * P * P) / (4 * Math.PI * Math.PI));
    expect(relErr(r.a_sin_i, a * Math.sin(inc))).toBeLessThan(1e-13);
    expect(relErr(r.m1_sin3i, m1 * Math.sin(inc) ** 3)).toBeLessThan(1e-13);
  });

  it("reports M sin³i unchanged at i = 90°", () => {
    const r = m.compute({ ...ok, inclination: Math.PI / 2 });
    expect(r.primary_mass).toBe(r.m1_sin3i);
    expect(r.secondary_mass).toBe(r.m2_sin3i);
  });

  it("matches the single-lined mass function of star 1: f = (M2 sin³i)³ / (M1 sin³i + M2 sin³i)²", () => {
    const r = m.compute({ ...ok, eccentricity: 0.3 });
    const f = singleLined.compute({ period: ok.period, k1: ok.k1, eccentricity: 0.3 }).mass_function;
    expect(relErr(f, r.m2_sin3i ** 3 / (r.m1_sin3i + r.m2_sin3i) ** 2)).toBeLessThan(1e-13);
  });

  it("computes the masses only with an inclination, and says so", () => {
    expect(Object.keys(m.compute(ok)).sort()).toEqual(["a_sin_i", "m1_sin3i", "m2_sin3i", "mass_ratio"]);
    expect(m.implicitAssumptions(ok)).toEqual([
      "e = 0 assumed (no eccentricity given)",
      "no inclination given: the masses are known only as M sin³i",
    ]);
    expect(m.implicitAssumptions({ ...ok, eccentricity: 0.1, inclination: 1.5 })).toEqual([]);
    expect(m.compute({ period: 1, k1: 1 })).toEqual({});
  });
});
