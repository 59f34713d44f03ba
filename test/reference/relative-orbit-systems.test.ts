import { describe, expect, it } from "vitest";
import { DEFAULT_SET } from "../../src/constants/sets.js";
import { relativeOrbit } from "../../src/methods/relative-orbit.js";
import { inSolarMasses, relErr, toSI } from "./published-units.js";

/*
 * Jupiter weighed by Callisto.
 * Callisto's mean orbit: a = 1 882 700 km, sidereal period P = 16.689 0184 d
 * (JPL Solar System Dynamics, planetary satellite mean elements; from memory).
 * Jupiter: (GM)_J = 1.266 8653 × 10¹⁷ m³ s⁻², IAU 2015 Resolution B3 nominal value
 * (Prša et al. 2016, AJ 152, 41, Table 1).
 * Galilean moons' GM, km³ s⁻² (JPL satellite physical parameters; from memory):
 * Io 5959.9, Europa 3202.7, Ganymede 9887.8, Callisto 7179.3.
 * Kepler's law on Callisto's orbit weighs Jupiter, Callisto itself, and, on
 * average over their orbits, the three inner moons.
 */
describe("Jupiter and its inner moons, weighed by Callisto", () => {
  const r = relativeOrbit.compute({ period: toSI(16.6890184, "d"), semimajor_axis: toSI(1882700, "km") });
  const moons = toSI(5959.9 + 3202.7 + 9887.8 + 7179.3, "km3/s2");

  it("gives (GM)_J plus the Galilean moons", () => {
    // Jupiter's oblateness (J2) speeds Callisto up by about 3e-5 of the mass, unmodelled here;
    // a rounded to 100 km is ±8e-5 in the mass
    expect(relErr(r.total_mass, DEFAULT_SET.GM_jup.value + moons)).toBeLessThan(1e-4);
  });

  it("needs the moons: Jupiter alone is off by 2e-4", () => {
    // the moons are 2.1e-4 of Jupiter, well above the 1e-4 tolerance above
    expect(relErr(r.total_mass, DEFAULT_SET.GM_jup.value)).toBeGreaterThan(1.5e-4);
  });
});

/*
 * Pluto and Charon.
 * Brozović, Showalter, Jacobson & Buie 2015, Icarus 246, 317 (from memory):
 * GM of the Pluto system 975.5 ± 1.5 km³ s⁻²; GM Pluto 869.6 ± 1.8, GM Charon
 * 105.9 ± 1.0 km³ s⁻². Charon's orbit about Pluto: a = 19 596 km,
 * P = 6.387 2273 d (from memory).
 */
describe("Pluto–Charon, from Charon's orbit", () => {
  const orbit = { period: toSI(6.3872273, "d"), semimajor_axis: toSI(19596, "km") };
  const km3s2 = (gm: number) => gm / 1e9;

  it("gives the system GM of 975.5 km³ s⁻²", () => {
    const r = relativeOrbit.compute(orbit);
    // published GM rounded to 0.1 km³ s⁻², a to 1 km (±0.08 km³ s⁻²)
    expect(Math.abs(km3s2(r.total_mass) - 975.5)).toBeLessThan(0.15);
  });

  it("splits it by the published mass ratio into Pluto and Charon", () => {
    const r = relativeOrbit.compute({ ...orbit, mass_ratio: 105.9 / 869.6 });
    // q from two rounded GMs (±5e-4 relative) moves each component by ≤ 0.05 km³ s⁻²
    expect(Math.abs(km3s2(r.primary_mass) - 869.6)).toBeLessThan(0.2);
    expect(Math.abs(km3s2(r.secondary_mass) - 105.9)).toBeLessThan(0.2);
  });

  it("gives Charon's GM from Pluto's", () => {
    const r = relativeOrbit.compute({ ...orbit, primary_mass: toSI(869.6, "km3/s2") });
    // both published GMs rounded to 0.1 km³ s⁻², plus the total's rounding above
    expect(Math.abs(km3s2(r.secondary_mass) - 105.9)).toBeLessThan(0.2);
  });
});

/*
 * S2 about the Galactic Centre black hole.
 * GRAVITY Collaboration (Abuter et al.) 2020, A&A 636, L5, best-fit orbit
 * (from memory): a = 125.058 ± 0.041 mas, e = 0.884 649 ± 0.000 079,
 * P = 16.0455 ± 0.0013 yr, R₀ = 8246.7 ± 9.3 pc, M = (4.261 ± 0.012) × 10⁶ M☉.
 */
describe("Sgr A*, from the orbit of S2", () => {
  it("gives 4.261 million solar masses", () => {
    const r = relativeOrbit.compute({
      period: toSI(16.0455, "yr"),
      angular_semimajor_axis: toSI(125.058, "mas"),
      distance: toSI(8246.7, "pc"),
      eccentricity: 0.884649,
    });
    // the published M is rounded to 1.2e-4; its fit also carries Rømer delay and relativistic
    // terms, far below the published 0.28% uncertainty
    expect(relErr(inSolarMasses(r.total_mass), 4.261e6)).toBeLessThan(5e-4);
  });
});
