import { describe, expect, it } from "vitest";
import { singleLined } from "../../src/methods/single-lined.js";
import { inJovianMasses, inSolarMasses, toSI } from "./published-units.js";

/*
 * 51 Pegasi b.
 * Mayor & Queloz 1995, Nature 378, 355 (from memory): P = 4.2293 ± 0.0011 d,
 * K = 59 ± 3 m/s, circular orbit adopted, and M₂ sin i = 0.47 ± 0.02 M_J for a
 * star of 1 M☉.
 */
describe("51 Pegasi b, from the star's velocity curve", () => {
  it("gives a minimum mass of 0.47 Jupiter masses", () => {
    const r = singleLined.compute({ period: toSI(4.2293, "d"), k1: toSI(59, "m/s"), primary_mass: toSI(1, "Msun") });
    // the published value is rounded to 0.01 M_J
    expect(Math.abs(inJovianMasses(r.min_secondary_mass) - 0.47)).toBeLessThan(0.005);
  });
});

/*
 * V404 Cygni, a black hole in an X-ray binary.
 * Casares & Charles 1994, MNRAS 271, L5 (from memory): P = 6.4714 ± 0.0001 d,
 * K = 208.5 ± 0.7 km/s for the K-type donor, f(M) = 6.08 ± 0.06 M☉.
 */
describe("V404 Cygni, from the donor star's velocity curve", () => {
  it("gives a mass function of 6.08 solar masses", () => {
    const r = singleLined.compute({ period: toSI(6.4714, "d"), k1: toSI(208.5, "km/s"), eccentricity: 0 });
    // the published value is rounded to 0.01 M☉
    expect(Math.abs(inSolarMasses(r.mass_function) - 6.08)).toBeLessThan(0.005);
  });
});

/*
 * A0620−00, a black hole in an X-ray binary.
 * Marsh, Robinson & Wood 1994, MNRAS 266, 137 (from memory):
 * P = 0.323 014 05 d, K = 433 ± 3 km/s, f(M) = 2.72 ± 0.06 M☉.
 */
describe("A0620−00, from the donor star's velocity curve", () => {
  it("gives a mass function of 2.72 solar masses", () => {
    const r = singleLined.compute({ period: toSI(0.32301405, "d"), k1: toSI(433, "km/s") });
    // the published value is rounded to 0.01 M☉
    expect(Math.abs(inSolarMasses(r.mass_function) - 2.72)).toBeLessThan(0.005);
  });
});

/*
 * HD 209458 b, a transiting planet: the inclination is known.
 * Torres, Winn & Holman 2008, ApJ 677, 1324 (from memory): P = 3.524 748 59 d,
 * K = 84.67 ± 0.70 m/s, i = 86.71 ± 0.05°, M* = 1.119 ± 0.033 M☉,
 * M_p = 0.685 ± 0.015 M_J, circular orbit.
 */
describe("HD 209458 b, from the velocity curve and the transit inclination", () => {
  const r = singleLined.compute({
    period: toSI(3.52474859, "d"),
    k1: toSI(84.67, "m/s"),
    inclination: toSI(86.71, "deg"),
    primary_mass: toSI(1.119, "Msun"),
  });

  it("gives 0.685 Jupiter masses", () => {
    // the published value is rounded to 0.001 M_J
    expect(Math.abs(inJovianMasses(r.secondary_mass) - 0.685)).toBeLessThan(0.001);
  });

  it("puts the minimum mass below it by the factor sin i", () => {
    // m sin i is not exactly the minimum mass, but for m/M* ≈ 6e-4 the two differ by under 1e-6
    expect(r.min_secondary_mass / r.secondary_mass).toBeCloseTo(Math.sin(toSI(86.71, "deg")), 5);
  });
});
