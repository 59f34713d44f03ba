/**
 * Each hypothesis against an invented measurement whose published value was made WITH that slip.
 * The published numbers are computed here from the textbook formulas with the defining constants
 * typed in by hand (see measurement-cases.ts), not through the methods or the hypotheses under test:
 * Kepler's third law GM = 4π²a³/P²; the mass function f = P K₁³ (1−e²)^{3/2} / (2πG);
 * M₁ sin³i = P (1−e²)^{3/2} (K₁+K₂)² K₂ / (2πG); the enclosed mass GM = v² r.
 */
import { describe, expect, it } from "vitest";
import { HYPOTHESES } from "../../src/diagnosis/hypotheses.js";
import {
  ARCSEC, AU, DAY, DEG, G, G_2014, GM_SUN, JULIAN_YEAR, KM, LY, MAS, PC, build, cubicMass, diagnosisOf, keplerGM, pub, run,
} from "./measurement-cases.js";

const GAUSSIAN_YEAR_DAYS = (2 * Math.PI) / 0.01720209895; // 2π/k, Gaussian gravitational constant (from memory)

/**
 * The best explanation must be `id`, reproducing the published value (|z| far below 1: the slip is exact).
 * The published value carries every digit and a relative σ of 1e-7, so an exact slip lands within
 * 1e-3 σ; `zTolerance` is wider only where a stated reason says so.
 */
function expectFirst(c: ReturnType<typeof build>, result: string, id: string, zTolerance = 1e-3) {
  const d = diagnosisOf(c, result);
  expect(d.unexplained).toBe(false);
  expect(d.explained[0]?.hypothesis).toBe(id);
  expect(Math.abs(d.explained[0].z_after)).toBeLessThan(zTolerance);
  return d;
}

describe("period slips (relative orbit, a = 10 au)", () => {
  const inYears = (published: number) =>
    build("relative-orbit", { period: "30 ± 0.01 yr", semimajor_axis: "10 ± 0.005 au" }, { total_mass: pub(published, "Msun") });
  const massWith = (periodSeconds: number) => keplerGM(10 * AU, periodSeconds) / GM_SUN;

  it("finds a 365 d year, and says by how much", () => {
    const c = inYears(massWith(30 * 365 * DAY));
    const d = expectFirst(c, "total_mass", "year-365d");
    // M ∝ P⁻²: (365.25/365)²
    expect(d.explained[0].slip_factor).toBeCloseTo((365.25 / 365) ** 2, 12);
    expect(d.explained[0].factor).toBeCloseTo((365.25 / 365) ** 2, 6);
    expect(d.explained[0].description).toContain("1.0014 × ours");
    expect(d.explained[0].kind).toBe("value");
  });
  it("finds the sidereal year", () => expectFirst(inYears(massWith(30 * 365.25636 * DAY)), "total_mass", "year-sidereal"));
  it("finds the tropical year", () => expectFirst(inYears(massWith(30 * 365.24219 * DAY)), "total_mass", "year-tropical"));
  it("finds the Gaussian year", () => expectFirst(inYears(massWith(30 * GAUSSIAN_YEAR_DAYS * DAY)), "total_mass", "year-gaussian"));
  it("finds years taken as days", () => expectFirst(inYears(massWith(30 * DAY)), "total_mass", "years-as-days"));

  // M = a³/P² in au, years and M☉ is exact for GM☉ = k² au³ d⁻² (Gaussian year), which differs from the
  // IAU 2015 nominal GM☉ by 3.2e-10 relative: 3e-3 of the 1e-7 published σ, hence a tolerance of 1e-2 σ
  const inDays = (published: number) =>
    build("relative-orbit", { period: "10957.5 ± 1 d", semimajor_axis: "10 ± 0.005 au" }, { total_mass: pub(published, "Msun") });
  it("finds days turned into years of 365 d before M = a³/P² (au, yr, M☉)", () =>
    expectFirst(inDays(10 ** 3 / (10957.5 / 365) ** 2), "total_mass", "year-365d", 1e-2));
  it("finds days turned into Julian years before M = a³/P²", () =>
    expectFirst(inDays(10 ** 3 / (10957.5 / 365.25) ** 2), "total_mass", "year-julian", 1e-2));
  it("finds days taken as years", () => expectFirst(inDays(massWith(10957.5 * JULIAN_YEAR)), "total_mass", "days-as-years"));
});

describe("mass slips", () => {
  const P = 30 * JULIAN_YEAR;
  const total = keplerGM(10 * AU, P) / GM_SUN;
  it("finds the total mass reported as the primary's (relative orbit with q)", () => {
    const c = build(
      "relative-orbit",
      { period: "30 ± 0.01 yr", semimajor_axis: "10 ± 0.005 au", mass_ratio: "0.5 ± 0.01" },
      { primary_mass: pub(total, "Msun") },
    );
    const d = expectFirst(c, "primary_mass", "total-as-primary");
    // M_tot / M₁ = 1 + q
    expect(d.explained[0].slip_factor).toBeCloseTo(1.5, 12);
  });

  it("finds the small-companion shortcut (single-lined, companion not small)", () => {
    const P1 = 5.6233 * DAY;
    const K = 212.4 * KM;
    const e = 0.05;
    const f = (P1 * K ** 3 * (1 - e * e) ** 1.5) / (2 * Math.PI) / GM_SUN; // M☉
    const m1 = 0.71;
    const s = Math.sin(62 * DEG);
    const c = build(
      "single-lined",
      { period: "5.6233 ± 0.0004 d", k1: "212.4 ± 1.9 km/s", eccentricity: "0.05 ± 0.02", primary_mass: "0.71 ± 0.08 Msun", inclination: "62 ± 4 deg" },
      { secondary_mass: pub(Math.cbrt(f * m1 * m1) / s, "Msun") },
    );
    const d = expectFirst(c, "secondary_mass", "small-mass-shortcut");
    // and the exact solution is far from the shortcut here
    expect(cubicMass(f, m1, s) / (Math.cbrt(f * m1 * m1) / s)).toBeGreaterThan(2);
    expect(d.explained[0].slip_factor).toBeLessThan(0.5);
  });

  it("finds the small-companion shortcut (astrometric orbit)", () => {
    const m1 = 1.2;
    const m2 = 0.6;
    const Pa = 12 * JULIAN_YEAR;
    const aRel = Math.cbrt((GM_SUN * (m1 + m2) * Pa * Pa) / (4 * Math.PI * Math.PI));
    const a1 = aRel * (m2 / (m1 + m2));
    const f = m2 ** 3 / (m1 + m2) ** 2;
    const c = build(
      "astrometric-orbit",
      { period: "12 ± 0.01 yr", semimajor_axis: `${a1 / AU} ± 0.001 au`, primary_mass: "1.2 ± 0.05 Msun" },
      { secondary_mass: pub(Math.cbrt(f * m1 * m1), "Msun") },
    );
    expectFirst(c, "secondary_mass", "small-mass-shortcut");
  });

  it("finds G from CODATA 2014 in a kilogram mass (circular velocity)", () => {
    const v = 30 * KM;
    const r = 1.5e8 * KM;
    const c = build("circular-velocity", { velocity: "30 ± 0.5 km/s", radius: "1.5e8 ± 1e6 km" }, { enclosed_mass: pub((v * v * r) / G_2014, "kg") });
    const d = expectFirst(c, "enclosed_mass", "g-codata-2014");
    expect(d.explained[0].slip_factor).toBeCloseTo(G / G_2014, 14);
  });

  it("finds G from CODATA 2014 in a mass typed in kilograms (single-lined primary)", () => {
    const P1 = 4.2 * DAY;
    const K = 60 * KM;
    const f = (P1 * K ** 3) / (2 * Math.PI); // GM form
    const m1kg = 2.1e30;
    const mMin = cubicMass(f, m1kg * G_2014) / GM_SUN;
    const c = build(
      "single-lined",
      { period: "4.2 ± 0.001 d", k1: "60 ± 0.5 km/s", primary_mass: "2.1e30 ± 1e29 kg" },
      { min_secondary_mass: pub(mMin, "Msun") },
    );
    expectFirst(c, "min_secondary_mass", "g-codata-2014");
  });
});

describe("semi-major axis slips", () => {
  it("finds a₁ = a q/(1+q) used as the relative axis (relative orbit)", () => {
    const q = 0.5;
    const total = keplerGM(10 * AU * (q / (1 + q)), 30 * JULIAN_YEAR) / GM_SUN;
    const c = build(
      "relative-orbit",
      { period: "30 ± 0.01 yr", semimajor_axis: "10 ± 0.005 au", mass_ratio: "0.5 ± 0.01" },
      { total_mass: pub(total, "Msun") },
    );
    const d = expectFirst(c, "total_mass", "barycentric-as-relative");
    expect(d.explained[0].slip_factor).toBeCloseTo((1 / 3) ** 3, 13);
  });

  it("finds the relative axis used where a₁ belongs (astrometric orbit)", () => {
    const m1 = 1.2;
    const m2 = 0.6;
    const P = 12 * JULIAN_YEAR;
    const aRel = Math.cbrt((GM_SUN * (m1 + m2) * P * P) / (4 * Math.PI * Math.PI));
    const a1 = aRel * (m2 / (m1 + m2));
    // with the relative axis in the mass function, 4π²a³/(GP²) is the total mass
    const c = build(
      "astrometric-orbit",
      { period: "12 ± 0.01 yr", semimajor_axis: `${a1 / AU} ± 0.001 au`, primary_mass: "1.2 ± 0.05 Msun" },
      { mass_function: pub(m1 + m2, "Msun") },
    );
    expectFirst(c, "mass_function", "relative-as-barycentric");
  });
});

describe("velocity-curve slips (double-lined, i = 70°)", () => {
  const P = 3.84471 * DAY;
  const K1 = 79 * KM;
  const K2 = 97 * KM;
  const s = Math.sin(70 * DEG);
  /** M₁ in M☉ from the projected-mass formula with the given amplitudes and divisor sin^p i. */
  const m1 = (k1: number, k2: number, p = 3) => (P * (k1 + k2) ** 2 * k2) / (2 * Math.PI) / s ** p / GM_SUN;
  const dl = (published: number) =>
    build(
      "double-lined",
      { period: "3.84471 ± 0.00002 d", k1: "79.0 ± 0.4 km/s", k2: "97.0 ± 0.5 km/s", inclination: "70 ± 0.3 deg" },
      { primary_mass: pub(published, "Msun") },
    );

  it("finds sin³i not applied", () => expectFirst(dl(m1(K1, K2, 0)), "primary_mass", "sin3i-omitted"));
  it("finds sin³i applied twice", () => expectFirst(dl(m1(K1, K2, 6)), "primary_mass", "sin3i-twice"));
  it("finds sin i used for sin³i", () => expectFirst(dl(m1(K1, K2, 1)), "primary_mass", "sin-i-for-sin3i"));
  it("finds 2K used for both K", () => {
    const d = expectFirst(dl(m1(2 * K1, 2 * K2)), "primary_mass", "k-doubled");
    expect(d.explained[0].slip_factor).toBeCloseTo(8, 12);
  });
  it("finds both K halved", () => expectFirst(dl(m1(K1 / 2, K2 / 2)), "primary_mass", "k-halved"));
  it("finds 2K₁ used for K₁", () => expectFirst(dl(m1(2 * K1, K2)), "primary_mass", "k1-doubled"));
  it("finds 2K₂ used for K₂", () => expectFirst(dl(m1(K1, 2 * K2)), "primary_mass", "k2-doubled"));
  it("finds K₁ halved", () => expectFirst(dl(m1(K1 / 2, K2)), "primary_mass", "k1-halved"));
  it("finds K₂ halved", () => expectFirst(dl(m1(K1, K2 / 2)), "primary_mass", "k2-halved"));
  it("finds K₁ and K₂ swapped", () => {
    const d = expectFirst(dl(m1(K2, K1)), "primary_mass", "k-swapped");
    // M₁ ∝ K₂ → K₁
    expect(d.explained[0].slip_factor).toBeCloseTo(79 / 97, 12);
  });
  it("finds (1 − e²)^{3/2} left out", () => {
    const e = 0.3;
    const c = build(
      "double-lined",
      { period: "3.84471 ± 0.00002 d", k1: "79.0 ± 0.4 km/s", k2: "97.0 ± 0.5 km/s", eccentricity: "0.3 ± 0.01", inclination: "70 ± 0.3 deg" },
      { primary_mass: pub(m1(K1, K2), "Msun") },
    );
    const d = expectFirst(c, "primary_mass", "eccentricity-factor-omitted");
    expect(d.explained[0].slip_factor).toBeCloseTo((1 - e * e) ** -1.5, 12);
  });
});

describe("velocity-curve slips (single-lined)", () => {
  const P = 5.6233 * DAY;
  const K = 212.4 * KM;
  const e = 0.05;
  const fOf = (k: number, ecc = e) => (P * k ** 3 * (1 - ecc * ecc) ** 1.5) / (2 * Math.PI) / GM_SUN;
  const sl = (published: Record<string, string>) =>
    build(
      "single-lined",
      { period: "5.6233 ± 0.0004 d", k1: "212.4 ± 1.9 km/s", eccentricity: "0.05 ± 0.02", primary_mass: "0.71 ± 0.08 Msun", inclination: "62 ± 4 deg" },
      published,
    );
  it("finds 2K used as K in the mass function", () => expectFirst(sl({ mass_function: pub(fOf(2 * K), "Msun") }), "mass_function", "k-doubled"));
  it("finds the full amplitude typed as K", () => expectFirst(sl({ mass_function: pub(fOf(K / 2), "Msun") }), "mass_function", "k-halved"));
  it("finds (1 − e²)^{3/2} left out", () =>
    expectFirst(sl({ mass_function: pub(fOf(K, 0), "Msun") }), "mass_function", "eccentricity-factor-omitted"));
  it("finds sin³i not applied: the minimum mass reported as the mass", () =>
    expectFirst(sl({ secondary_mass: pub(cubicMass(fOf(K), 0.71, 1), "Msun") }), "secondary_mass", "sin3i-omitted"));
  it("finds sin i used for sin³i in the cubic", () => {
    const s = Math.sin(62 * DEG);
    expectFirst(sl({ secondary_mass: pub(cubicMass(fOf(K), 0.71, Math.cbrt(s)), "Msun") }), "secondary_mass", "sin-i-for-sin3i");
  });
  it("finds a projected axis converted to R☉ with the older solar radius", () => {
    const a1 = (K * P * Math.sqrt(1 - e * e)) / (2 * Math.PI);
    const d = expectFirst(sl({ a1_sin_i: pub(a1 / 6.9599e8, "R_sun") }), "a1_sin_i", "solar-radius-old");
    expect(d.explained[0].slip_factor).toBeCloseTo(6.957 / 6.9599, 14);
  });
});

describe("angle and distance unit slips", () => {
  // relative orbit: a = α/ϖ au when both are in the same angular unit
  const P = 21.64 * JULIAN_YEAR;
  const massFor = (aAu: number) => keplerGM(aAu * AU, P) / GM_SUN;
  const ro = (alpha: string, parallax: string, published: number) =>
    build("relative-orbit", { period: "21.64 ± 0.05 yr", semimajor_axis: alpha, parallax }, { total_mass: pub(published, "Msun") });

  it("finds a parallax in mas read as arcsec", () =>
    expectFirst(ro("712 ± 3 mas", "74.52 ± 0.21 mas", massFor(712 / 74520)), "total_mass", "parallax-mas-as-arcsec"));
  it("finds a parallax in arcsec read as mas", () =>
    expectFirst(ro("0.712 ± 0.003 arcsec", "0.07452 ± 0.00021 arcsec", massFor(0.712 / 0.00007452)), "total_mass", "parallax-arcsec-as-mas"));
  it("finds an angular axis in mas read as arcsec", () =>
    expectFirst(ro("712 ± 3 mas", "74.52 ± 0.21 mas", massFor(712000 / 74.52)), "total_mass", "angle-mas-as-arcsec"));
  it("finds an angular axis in arcsec read as mas", () =>
    expectFirst(ro("0.712 ± 0.003 arcsec", "0.07452 ± 0.00021 arcsec", massFor(0.000712 / 0.07452)), "total_mass", "angle-arcsec-as-mas"));
  it("lists both readings when they cannot be told apart (α in arcsec, ϖ in mas)", () => {
    const d = diagnosisOf(ro("0.712 ± 0.003 arcsec", "74.52 ± 0.21 mas", massFor(0.712 / 74.52)), "total_mass");
    expect(d.explained.map((e) => e.hypothesis)).toEqual(["angle-arcsec-as-mas", "parallax-mas-as-arcsec"]);
    expect(d.explained[0].z_after).toBeCloseTo(d.explained[1].z_after, 6);
  });

  // circular velocity: GM = v² θ d
  const v = 184 * KM;
  const theta = 95 * ARCSEC;
  const cv = (distance: string, dMetres: number) =>
    build("circular-velocity", { velocity: "184 ± 6 km/s", radius: "95 ± 3 arcsec", distance }, { enclosed_mass: pub((v * v * theta * dMetres) / GM_SUN, "Msun") });
  it("finds light-years read as parsecs", () => expectFirst(cv("2.4e7 ± 1e6 ly", 2.4e7 * PC), "enclosed_mass", "distance-ly-as-pc"));
  it("finds parsecs read as light-years", () => expectFirst(cv("7.3e6 ± 4e5 pc", 7.3e6 * LY), "enclosed_mass", "distance-pc-as-ly"));
  it("finds kpc read as pc", () => expectFirst(cv("7300 ± 400 kpc", 7300 * PC), "enclosed_mass", "distance-kpc-as-pc"));
  it("finds pc read as kpc", () => expectFirst(cv("7.3e6 ± 4e5 pc", 7.3e9 * PC), "enclosed_mass", "distance-pc-as-kpc"));
  it("finds a radius in R☉ converted with the older solar radius", () => {
    const c = build("circular-velocity", { velocity: "184 ± 6 km/s", radius: "12.5 ± 0.1 R_sun" }, { enclosed_mass: pub((v * v * 12.5 * 6.9599e8) / GM_SUN, "Msun") });
    expectFirst(c, "enclosed_mass", "solar-radius-old");
  });
});

describe("an understated published uncertainty: the distance term left out", () => {
  // relative orbit from angles: σ_M/M = √((2σP/P)² + (3σα/α)² + (3σϖ/ϖ)²)
  const P = 21.64;
  const alpha = 0.712;
  const plx = 0.07452;
  const sP = 0.01;
  const sA = 0.0005;
  const sPlx = 0.0008;
  const M = keplerGM((alpha / plx) * AU, P * JULIAN_YEAR) / GM_SUN;
  const relWithout = Math.hypot((2 * sP) / P, (3 * sA) / alpha);
  const relWith = Math.hypot(relWithout, (3 * sPlx) / plx);
  const make = (published: number, sigma: number) =>
    build(
      "relative-orbit",
      { period: `${P} ± ${sP} yr`, semimajor_axis: `${alpha} ± ${sA} arcsec`, parallax: `${plx} ± ${sPlx} arcsec` },
      { total_mass: `${published} ± ${sigma} Msun` },
    );

  it("checks the construction: the parallax term carries most of the variance", () => {
    expect(relWithout / relWith).toBeLessThan(0.5);
  });

  it("explains a tension when the published σ matches ours without the parallax term", () => {
    // published 2σ_without above ours, with σ_without: z = −2 as published, −2 σ_without/σ_with restored
    const sigma = 1.05 * relWithout * M;
    const c = make(M * (1 + 2 * relWithout), sigma);
    const d = diagnosisOf(c, "total_mass");
    expect(d.status).toBe("tension");
    const e = d.explained.find((x) => x.hypothesis === "distance-uncertainty-omitted");
    expect(e).toBeDefined();
    expect(d.explained[0].hypothesis).toBe("distance-uncertainty-omitted");
    expect(e!.kind).toBe("uncertainty");
    expect(e!.slip_factor).toBe(1);
    // z restored = Δ / √(σ_pub² + σ_ϖ-term²), first order (the report's own propagation, 1e-3 relative)
    const term = M * Math.sqrt(relWith ** 2 - relWithout ** 2);
    const expected = (-2 * relWithout * M) / Math.hypot(sigma, term);
    expect(e!.z_after).toBeCloseTo(expected, 2);
    expect(e!.description).toContain("not the value");
  });

  it("does not claim it when the published σ is far from ours without the term", () => {
    const c = make(M * (1 + 2 * relWithout), 0.5 * relWithout * M);
    const d = diagnosisOf(c, "total_mass");
    expect(d.explained.find((x) => x.hypothesis === "distance-uncertainty-omitted")).toBeUndefined();
  });

  it("does not claim it when the distance term is small", () => {
    const c = build(
      "relative-orbit",
      { period: `${P} ± ${sP} yr`, semimajor_axis: `${alpha} ± ${sA} arcsec`, parallax: `${plx} ± 0.00001 arcsec` },
      { total_mass: `${M * (1 + 2 * relWithout)} ± ${relWithout * M} Msun` },
    );
    expect(diagnosisOf(c, "total_mass").explained.map((e) => e.hypothesis)).not.toContain("distance-uncertainty-omitted");
  });
});

describe("what no slip explains", () => {
  it("says so for a clean 30 % discrepancy", () => {
    const M = keplerGM(10 * AU, 30 * JULIAN_YEAR) / GM_SUN;
    const c = build("relative-orbit", { period: "30 ± 0.01 yr", semimajor_axis: "10 ± 0.005 au" }, { total_mass: pub(1.3 * M, "Msun", 1e-3) });
    const d = diagnosisOf(c, "total_mass");
    expect(d.status).toBe("discrepant");
    expect(d.unexplained).toBe(true);
    expect(d.explained).toEqual([]);
    expect(d.tried.length).toBeGreaterThan(3);
    expect(d.summary).toMatch(/^No single slip of the \d+ tried reconciles/);
    expect(d.summary).toContain("not a verdict");
  });

  it("diagnoses nothing when every comparison is consistent", () => {
    const M = keplerGM(10 * AU, 30 * JULIAN_YEAR) / GM_SUN;
    const c = build("relative-orbit", { period: "30 ± 0.01 yr", semimajor_axis: "10 ± 0.005 au" }, { total_mass: pub(M, "Msun", 1e-3) });
    expect(c.audit.comparisons.total_mass.status).toBe("consistent");
    expect(run(c)).toEqual([]);
  });

  it("ranks several explanations by |z| and keeps only those within the threshold", () => {
    // a loose published σ lets the close year lengths all reconcile; the exact one comes first
    const M = keplerGM(10 * AU, 30 * 365 * DAY) / GM_SUN;
    const c = build("relative-orbit", { period: "30 ± 0.01 yr", semimajor_axis: "10 ± 0.005 au" }, { total_mass: pub(M, "Msun", 4e-4) });
    const d = diagnosisOf(c, "total_mass");
    const z = d.explained.map((e) => Math.abs(e.z_after));
    expect(z).toEqual([...z].sort((a, b) => a - b));
    expect(z.every((x) => x <= 1)).toBe(true);
    expect(d.explained[0].hypothesis).toBe("year-365d");
    expect(d.summary).toContain('"Period converted with a 365 d year"');
  });
});

describe("the hypothesis list", () => {
  it("has unique kebab-case ids, titles and descriptions, and known methods", () => {
    const methods = new Set(["relative-orbit", "astrometric-orbit", "single-lined", "double-lined", "circular-velocity"]);
    const ids = HYPOTHESES.map((h) => h.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const h of HYPOTHESES) {
      expect(h.id).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
      expect(h.title.length).toBeGreaterThan(5);
      expect(h.description.length).toBeGreaterThan(20);
      expect(h.methods.length).toBeGreaterThan(0);
      for (const m of h.methods) expect(methods.has(m)).toBe(true);
    }
  });
});

describe("mean distance for the semi-major axis (relative orbit, e = 0.4)", () => {
  // the time-averaged separation a(1 + e²/2) = 1.08 a in Kepler's law gives a mass 1.08³ = 1.259712 × too large
  it("finds the mean distance used as a", () => {
    const trueMass = keplerGM(10 * AU, 30 * JULIAN_YEAR) / GM_SUN;
    const c = build(
      "relative-orbit",
      { period: "30 ± 0.01 yr", semimajor_axis: "10 ± 0.005 au", eccentricity: "0.4 ± 0.01" },
      { total_mass: pub(trueMass * 1.08 ** 3, "Msun") },
    );
    const d = expectFirst(c, "total_mass", "mean-distance-as-semimajor-axis");
    expect(d.explained[0].slip_factor).toBeCloseTo(1.08 ** 3, 12);
  });
});
