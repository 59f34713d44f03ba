import { describe, expect, it } from "vitest";
import { astrometricOrbit as m } from "../../src/methods/astrometric-orbit.js";
import { relativeOrbit } from "../../src/methods/relative-orbit.js";
import { codes, relErr } from "./helpers.js";
import { si } from "./sample-inputs.js";

/** A binary of known masses: its period and the measured component's barycentric semi-major axis. */
function binary(m1: number, m2: number, period: number): { period: number; a1: number; a: number } {
  const a = Math.cbrt(((m1 + m2) * period * period) / (4 * Math.PI * Math.PI));
  return { period, a, a1: (a * m2) / (m1 + m2) };
}

describe("astrometric-orbit: validation", () => {
  const ok = { period: si(2, "yr"), angular_semimajor_axis: si(3, "mas"), parallax: si(2, "mas"), primary_mass: si(0.9, "Msun") };

  it("accepts a complete orbit", () => {
    expect(m.validate(ok)).toEqual([]);
  });

  it("asks for the period and the semi-major axis", () => {
    expect(codes(m.validate({ primary_mass: si(1, "Msun") }))).toEqual(["missing-input@period", "missing-input@semimajor_axis"]);
  });

  it("needs a parallax or a distance for an angular semi-major axis, and not both", () => {
    expect(codes(m.validate({ period: 1, angular_semimajor_axis: 1e-8 }))).toEqual(["needs-parallax-or-distance@semimajor_axis"]);
    expect(codes(m.validate({ ...ok, distance: si(500, "pc") }))).toEqual(["ambiguous-input@distance"]);
  });

  it("keeps e in [0, 1) and masses positive", () => {
    expect(codes(m.validate({ ...ok, eccentricity: 1.2 }))).toEqual(["eccentricity-out-of-range@eccentricity"]);
    expect(codes(m.validate({ ...ok, primary_mass: -1 }))).toEqual(["out-of-range@primary_mass"]);
    expect(codes(m.validate({ ...ok, period: 0 }))).toEqual(["out-of-range@period"]);
  });
});

describe("astrometric-orbit: compute", () => {
  const m1 = si(0.8, "Msun");

  it("gives the mass function M2³/(M1+M2)² of a binary built from known masses", () => {
    for (const m2 of [si(1, "Mjup"), si(0.3, "Msun"), si(9.6, "Msun")]) {
      const b = binary(m1, m2, si(185, "d"));
      const r = m.compute({ period: b.period, semimajor_axis: b.a1, primary_mass: m1 });
      expect(relErr(r.mass_function, m2 ** 3 / (m1 + m2) ** 2)).toBeLessThan(1e-13);
      expect(relErr(r.secondary_mass, m2)).toBeLessThan(1e-12);
    }
  });

  it("solves the cubic exactly: m³ = f (M1 + m)² to 1e-12", () => {
    const r = m.compute({ period: si(11.6, "yr"), semimajor_axis: si(16.2, "au"), primary_mass: m1 });
    const m2 = r.secondary_mass;
    expect(relErr(m2 ** 3, r.mass_function * (m1 + m2) ** 2)).toBeLessThan(1e-12);
  });

  it("approaches the small-companion limit (f M1²)^{1/3} for a planet", () => {
    const b = binary(m1, si(1, "Mearth"), si(1, "yr"));
    const r = m.compute({ period: b.period, semimajor_axis: b.a1, primary_mass: m1 });
    const shortcut = Math.cbrt(r.mass_function * m1 * m1);
    const v = r.secondary_mass / m1;
    // m = shortcut × (1 + (2/3) v + O(v²))
    expect(Math.abs(r.secondary_mass / shortcut - 1 - (2 / 3) * v)).toBeLessThan(v * v);
  });

  it("agrees with the relative orbit: the barycentric a1 scaled by (M1+M2)/M2 gives the total mass", () => {
    const m2 = si(0.4, "Msun");
    const b = binary(m1, m2, si(30, "yr"));
    const total = relativeOrbit.compute({ period: b.period, semimajor_axis: (b.a1 * (m1 + m2)) / m2 }).total_mass;
    expect(relErr(total, m1 + m2)).toBeLessThan(1e-13);
  });

  it("gives only the mass function without the primary mass", () => {
    expect(Object.keys(m.compute({ period: 1e8, semimajor_axis: 1e10 }))).toEqual(["mass_function"]);
  });
});
