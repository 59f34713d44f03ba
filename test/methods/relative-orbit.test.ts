import { describe, expect, it } from "vitest";
import { relativeOrbit as m } from "../../src/methods/relative-orbit.js";
import { codes, relErr } from "./helpers.js";
import { si } from "./sample-inputs.js";

const base = { period: si(50, "yr"), semimajor_axis: si(20, "au") };

describe("relative-orbit: validation", () => {
  it("accepts a complete linear orbit, and an angular one with a parallax", () => {
    expect(m.validate(base)).toEqual([]);
    expect(m.validate({ period: si(50, "yr"), angular_semimajor_axis: si(7.5, "arcsec"), parallax: si(379, "mas"), eccentricity: 0.59 })).toEqual([]);
  });

  it("asks for the period and the semi-major axis", () => {
    expect(codes(m.validate({}))).toEqual(["missing-input@period", "missing-input@semimajor_axis"]);
  });

  it("needs a parallax or a distance for an angular semi-major axis", () => {
    const issues = m.validate({ period: si(50, "yr"), angular_semimajor_axis: si(7.5, "arcsec") });
    expect(codes(issues)).toEqual(["needs-parallax-or-distance@semimajor_axis"]);
    expect(issues[0].hint).toMatch(/parallax/);
  });

  it("refuses a parallax together with a distance, and a linear with an angular axis", () => {
    expect(codes(m.validate({ ...base, angular_semimajor_axis: 1e-5, parallax: 1e-6, distance: 1e17 }))).toEqual([
      "ambiguous-input@semimajor_axis",
      "ambiguous-input@distance",
    ]);
  });

  it("keeps e in [0, 1) and every length, time and mass positive", () => {
    expect(codes(m.validate({ ...base, eccentricity: 1 }))).toEqual(["eccentricity-out-of-range@eccentricity"]);
    expect(codes(m.validate({ ...base, eccentricity: -0.01 }))).toEqual(["eccentricity-out-of-range@eccentricity"]);
    expect(codes(m.validate({ ...base, period: -base.period }))).toEqual(["out-of-range@period"]);
    expect(codes(m.validate({ ...base, semimajor_axis: 0 }))).toEqual(["out-of-range@semimajor_axis"]);
    expect(codes(m.validate({ ...base, mass_ratio: 0 }))).toEqual(["out-of-range@mass_ratio"]);
    expect(codes(m.validate({ period: 1, angular_semimajor_axis: 1e-6, parallax: -1e-7 }))).toEqual(["out-of-range@parallax"]);
  });

  it("takes at most one of mass ratio, primary mass and secondary mass", () => {
    expect(codes(m.validate({ ...base, mass_ratio: 0.5, primary_mass: si(2, "Msun") }))).toEqual(["ambiguous-input@primary_mass"]);
    expect(codes(m.validate({ ...base, primary_mass: si(2, "Msun"), secondary_mass: si(1, "Msun") }))).toEqual(["ambiguous-input@secondary_mass"]);
  });

  it("refuses a component mass that is not less than the total", () => {
    const total = m.compute(base).total_mass;
    expect(codes(m.validate({ ...base, primary_mass: total }))).toEqual(["component-exceeds-total@primary_mass"]);
    expect(codes(m.validate({ ...base, secondary_mass: 1.5 * total }))).toEqual(["component-exceeds-total@secondary_mass"]);
    expect(m.validate({ ...base, primary_mass: 0.999 * total })).toEqual([]);
  });

  it("collects every problem at once", () => {
    const found = codes(m.validate({ period: 0, angular_semimajor_axis: 1e-6, eccentricity: 2, mass_ratio: 1, secondary_mass: 1 }));
    expect(found).toEqual([
      "out-of-range@period",
      "eccentricity-out-of-range@eccentricity",
      "needs-parallax-or-distance@semimajor_axis",
      "ambiguous-input@secondary_mass",
    ]);
  });
});

describe("relative-orbit: compute", () => {
  it("follows a³/P²: doubling a gives eight times the mass, doubling P a quarter", () => {
    const M = m.compute(base).total_mass;
    expect(relErr(m.compute({ ...base, semimajor_axis: 2 * base.semimajor_axis }).total_mass, 8 * M)).toBeLessThan(1e-15);
    expect(relErr(m.compute({ ...base, period: 2 * base.period }).total_mass, M / 4)).toBeLessThan(1e-15);
  });

  it("gives the same mass from α and ϖ as from a = α/ϖ au", () => {
    const angular = m.compute({ period: base.period, angular_semimajor_axis: si(0.5, "arcsec"), parallax: si(0.1, "arcsec") });
    const viaDistance = m.compute({ period: base.period, angular_semimajor_axis: si(0.5, "arcsec"), distance: si(10, "pc") });
    const linear = m.compute({ period: base.period, semimajor_axis: si(5, "au") });
    expect(relErr(angular.total_mass, linear.total_mass)).toBeLessThan(1e-14);
    expect(relErr(viaDistance.total_mass, linear.total_mass)).toBeLessThan(1e-14);
  });

  it("splits the total by the mass ratio q = M2/M1", () => {
    const r = m.compute({ ...base, mass_ratio: 0.25 });
    expect(relErr(r.primary_mass + r.secondary_mass, r.total_mass)).toBeLessThan(1e-15);
    expect(relErr(r.secondary_mass / r.primary_mass, 0.25)).toBeLessThan(1e-15);
  });

  it("subtracts a known component mass from the total", () => {
    const total = m.compute(base).total_mass;
    expect(m.compute({ ...base, primary_mass: si(1, "Msun") }).secondary_mass).toBe(total - si(1, "Msun"));
    expect(m.compute({ ...base, secondary_mass: si(1, "Msun") }).primary_mass).toBe(total - si(1, "Msun"));
    expect(Object.keys(m.compute({ ...base, primary_mass: si(1, "Msun") })).sort()).toEqual(["secondary_mass", "total_mass"]);
  });

  it("does not depend on the eccentricity, and ignores a parallax when a is linear", () => {
    const M = m.compute(base).total_mass;
    expect(m.compute({ ...base, eccentricity: 0.9 }).total_mass).toBe(M);
    expect(m.compute({ ...base, parallax: si(10, "mas") }).total_mass).toBe(M);
    expect(m.implicitAssumptions({ ...base, parallax: si(10, "mas") })).toEqual(["the semi-major axis is given as a length, so the parallax is not used"]);
  });

  it("computes nothing from incomplete inputs, without throwing", () => {
    expect(m.compute({ period: base.period })).toEqual({});
    expect(m.compute({ period: base.period, angular_semimajor_axis: 1e-5 })).toEqual({});
    expect(m.partials({ semimajor_axis: base.semimajor_axis })).toEqual({});
    expect(m.substituted({}, {}, () => "x").every((e) => e.latex === "")).toBe(true);
  });

  it("states the parallax conversion when it makes it", () => {
    expect(m.implicitAssumptions({ period: 1, angular_semimajor_axis: 1e-6, parallax: 1e-7 })).toEqual([
      "distance = 1 au / parallax (no correction for parallax bias)",
      "semi-major axis = angle × distance (small-angle approximation)",
    ]);
    expect(m.implicitAssumptions(base)).toEqual([]);
  });
});
