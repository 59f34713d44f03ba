import { all, create } from "mathjs";
import { describe, expect, it } from "vitest";
import { DEFAULT_SET } from "../../src/constants/sets.js";
import { circularVelocity } from "../../src/methods/circular-velocity.js";
import { relErr, toSI } from "./published-units.js";

/*
 * The Sun, from the Gaussian gravitational constant.
 * IAU 1976 System of Astronomical Constants: k = 0.017 202 098 95 (defining),
 * the mean motion in radians per day of a massless body at 1 au, so a circular
 * orbit of radius 1 au has speed k au/d. With 1 au = 149 597 870 700 m
 * (IAU 2012 Resolution B2), the IAU 2009 System (Luzum et al. 2011, Celest.
 * Mech. Dyn. Astron. 110, 293, Table 1; from memory) gives the TDB-compatible
 * GM☉ = 1.327 124 400 41 × 10²⁰ m³ s⁻² and 1 au = 149 597 870 700 ± 3 m.
 */
describe("the Sun, from the Gaussian constant", () => {
  const au = DEFAULT_SET.au.value;
  const k = 0.01720209895;
  const r = circularVelocity.compute({ velocity: (k * au) / toSI(1, "d"), radius: toSI(1, "au") });

  it("gives the IAU 2009 heliocentric gravitational constant", () => {
    // the IAU 2009 au carried ±3 m (2e-11), so GM = k²A³/D² agrees to ±6e-11
    expect(relErr(r.enclosed_mass, 1.32712440041e20)).toBeLessThan(1e-10);
  });

  it("gives the IAU 2015 nominal (GM)☉ to its eight digits", () => {
    // the nominal value 1.327 1244 × 10²⁰ is rounded to 8 digits (±3.8e-9)
    expect(relErr(r.enclosed_mass, DEFAULT_SET.GM_sun.value)).toBeLessThan(4e-9);
  });
});

/*
 * The Milky Way inside the Sun's orbit.
 * Eilers, Hogg, Rix & Ness 2019, ApJ 871, 120 (from memory): circular speed at
 * the Sun v_c = 229.0 ± 0.2 km/s (statistical; systematics of a few per cent),
 * at R₀ = 8.122 ± 0.031 kpc (GRAVITY Collaboration 2018, A&A 615, L15).
 * They publish no enclosed mass; GM = v²R for a spherical mass is compared with
 * the same quantity worked out independently by the mathjs unit system, with
 * the parsec built from its IAU definition (648 000/π au, IAU 2015 B2).
 */
describe("the Milky Way inside the solar circle", () => {
  const r = circularVelocity.compute({ velocity: toSI(229.0, "km/s"), radius: toSI(8.122, "kpc") });

  it("matches mathjs's own unit algebra for v²R", () => {
    const math = create(all);
    math.createUnit("astrounit", "149597870700 m");
    math.createUnit("parsecs", `${648000 / Math.PI} astrounit`);
    const gm = math.evaluate("(229.0 km/s)^2 * (8.122 * 1000 parsecs)").toNumber("m^3/s^2");
    // same arithmetic in a different order: a few ulp
    expect(relErr(r.enclosed_mass, gm)).toBeLessThan(1e-13);
  });
});

/*
 * The Earth, from the geostationary orbit.
 * A geostationary satellite circles at r = 42 164 km with the sidereal day
 * T = 86 164.0905 s (both from memory; the radius is the figure commonly
 * quoted for the geostationary ring), so v = 2πr/T. Check value: (GM)⊕ =
 * 3.986 004 × 10¹⁴ m³ s⁻², IAU 2015 Resolution B3 nominal.
 */
describe("the Earth, from the geostationary orbit", () => {
  it("gives the nominal (GM)⊕", () => {
    const rGeo = toSI(42164, "km");
    const v = (2 * Math.PI * rGeo) / 86164.0905;
    const r = circularVelocity.compute({ velocity: v, radius: rGeo });
    // r rounded to 1 km: ±3.6e-5 in GM; the Earth's oblateness shifts the true ring by ~0.5 km
    expect(relErr(r.enclosed_mass, DEFAULT_SET.GM_earth.value)).toBeLessThan(5e-5);
  });
});
