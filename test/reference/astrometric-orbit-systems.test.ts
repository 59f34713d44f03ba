import { describe, expect, it } from "vitest";
import { astrometricOrbit } from "../../src/methods/astrometric-orbit.js";
import { inJovianMasses, relErr, toSI } from "./published-units.js";

/*
 * Gliese 876 b, the first planet weighed by astrometry.
 * Benedict et al. 2002, ApJ 581, L115 (HST Fine Guidance Sensor astrometry;
 * from memory): perturbation semi-major axis α = 0.25 ± 0.06 mas, parallax
 * ϖ = 214.6 ± 0.2 mas, period P = 60.94 d (from the velocity orbit), star mass
 * M* = 0.32 M☉, planet mass M_b = 1.89 ± 0.34 M_J.
 */
describe("Gliese 876 b, from the star's astrometric orbit", () => {
  it("gives 1.89 Jupiter masses", () => {
    const r = astrometricOrbit.compute({
      period: toSI(60.94, "d"),
      angular_semimajor_axis: toSI(0.25, "mas"),
      parallax: toSI(214.6, "mas"),
      primary_mass: toSI(0.32, "Msun"),
    });
    // α is published to two digits (±2%), and M_b scales as α
    expect(relErr(inJovianMasses(r.secondary_mass), 1.89)).toBeLessThan(0.02);
  });
});

/*
 * ε Eridani b.
 * Benedict et al. 2006, AJ 132, 2206 (HST astrometry with velocities; from
 * memory): α = 1.88 ± 0.20 mas, P = 2502 ± 10 d, parallax ϖ = 310.94 mas,
 * star mass M* = 0.83 M☉, planet mass M_b = 1.55 ± 0.24 M_J.
 */
describe("ε Eridani b, from the star's astrometric orbit", () => {
  it("gives 1.55 Jupiter masses", () => {
    const r = astrometricOrbit.compute({
      period: toSI(2502, "d"),
      angular_semimajor_axis: toSI(1.88, "mas"),
      parallax: toSI(310.94, "mas"),
      primary_mass: toSI(0.83, "Msun"),
    });
    // α to three digits (±0.3%), M_b to three (±0.3%), and the paper's parallax choice (≈0.2%)
    expect(relErr(inJovianMasses(r.secondary_mass), 1.55)).toBeLessThan(0.01);
  });
});
