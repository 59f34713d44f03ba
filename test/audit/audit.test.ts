/**
 * The audit engine end to end on invented records (test/fixtures/audit/records), checked against
 * an independent computation written out here with the defining constants typed in by hand:
 * au = 149 597 870 700 m (IAU 2012 B2), GM☉ = 1.3271244e20 m³ s⁻² (IAU 2015 B3),
 * G = 6.67430e-11 (CODATA 2018), Julian year = 365.25 d. First-order sigmas are checked against
 * numerical (central-difference) propagation in this file, not the methods' analytic partials.
 */
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { auditRecords, exitCodeFor } from "../../src/audit/audit-records.js";
import type { AuditReport, MeasurementAudit } from "../../src/audit/types.js";
import { loadRecords } from "../../src/records/load.js";

const AU = 149597870700;
const GM_SUN = 1.3271244e20;
const G = 6.6743e-11;
const DAY = 86400;
const YR = 365.25 * DAY;
const MAS = Math.PI / 180 / 3600 / 1000;
const ARCSEC = Math.PI / 180 / 3600;
const DEG = Math.PI / 180;
const MPC = 1e6 * (648000 / Math.PI) * AU;
const MSUN_KG = GM_SUN / G;

/** Numerical first-order σ: central differences of f over independent inputs x ± σ. */
function numericSigma(f: (x: number[]) => number, x: number[], sigma: number[]): number {
  let v = 0;
  x.forEach((xi, i) => {
    if (sigma[i] === 0) return;
    const h = Math.abs(xi) * 1e-6 || 1e-9;
    const up = [...x];
    const dn = [...x];
    up[i] = xi + h;
    dn[i] = xi - h;
    const d = (f(up) - f(dn)) / (2 * h);
    v += (d * sigma[i]) ** 2;
  });
  return Math.sqrt(v);
}

/** Solve m³ = f (M1 + m)² for m by bisection (independent of the methods' own solver). */
function cubicMass(f: number, m1: number): number {
  let lo = 0;
  let hi = 1e3 * (m1 + f) + 1;
  for (let i = 0; i < 300; i++) {
    const mid = (lo + hi) / 2;
    if (mid ** 3 - f * (m1 + mid) ** 2 > 0) hi = mid;
    else lo = mid;
  }
  return (lo + hi) / 2;
}

let report: AuditReport;
const measurement = (id: string, key: string): MeasurementAudit => {
  const o = report.objects.find((x) => x.id === id);
  if (!o) throw new Error(`no object ${id}`);
  const m = o.measurements.find((x) => x.key === key);
  if (!m) throw new Error(`no measurement ${key}`);
  return m;
};

beforeAll(async () => {
  const outcome = await loadRecords(path.resolve("test/fixtures/audit/records"));
  report = auditRecords(outcome, { draws: 20_000 });
});

describe("audit of invented records against an independent computation", () => {
  it("loads every fixture without problems", () => {
    expect(report.problems.filter((p) => p.severity === "error")).toEqual([]);
    expect(report.objects.map((o) => o.id)).toEqual(["tarn-14-ab", "tarn-astrometric", "tarn-rotation", "tarn-sb1", "tarn-sb2"]);
    expect(exitCodeFor(report)).toBeLessThanOrEqual(1);
  });

  it("relative orbit: total and component masses, first-order sigma and Monte Carlo", () => {
    const total = (x: number[]) => (4 * Math.PI ** 2 * ((x[1] * ARCSEC) / (x[2] * MAS) * AU) ** 3) / (x[0] * YR) ** 2 / G;
    const x = [41.2, 1.832, 122.9, 0.82];
    const s = [0.08, 0.006, 0.5, 0.03];
    const m = measurement("tarn-14-ab", "orbit-a");
    const r = m.results.total_mass;
    expect(Math.abs(r.value_si / total(x) - 1)).toBeLessThan(1e-6);
    // our σ adds G's 22 ppm, far below the 2 % tolerance
    expect(Math.abs(r.sigma_si / numericSigma(total, x, s) - 1)).toBeLessThan(0.02);
    expect(r.display_unit).toBe("Msun");
    expect(Math.abs(r.value - total(x) / MSUN_KG)).toBeLessThan(1e-9);
    const primary = (v: number[]) => total(v) / (1 + v[3]);
    expect(Math.abs(m.results.primary_mass.value_si / primary(x) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(m.results.primary_mass.sigma_si / numericSigma(primary, x, s) - 1)).toBeLessThan(0.02);
    // Monte Carlo: with ~3 % relative σ the median sits near the value and the 68 % half-width near σ
    const mc = r.mc!;
    expect(mc.draws).toBe(20_000);
    expect(Math.abs(mc.median_si / r.value_si - 1)).toBeLessThan(0.01);
    expect(Math.abs((mc.p84_si - mc.p16_si) / 2 / r.sigma_si - 1)).toBeLessThan(0.05);
    // statuses from the published values: 1.95 ± 0.04 published
    const z = (r.value - 1.95) / 0.04;
    expect(m.comparisons.total_mass.z).toBeCloseTo(z, 6);
    // recomputed 1.951 against 1.95 ± 0.04, and 1.072 against 1.07 +0.03 −0.02: both within 1σ
    expect(Math.abs(z)).toBeLessThan(0.1);
    expect(m.comparisons.primary_mass.sigma_from).toBe("published");
    expect(m.comparisons.primary_mass.sigma_used_si / MSUN_KG).toBeCloseTo(0.03, 9);
    expect(m.status).toBe("consistent");
  });

  it("single-lined: mass function, a1 sin i, minimum and true companion mass", () => {
    const fm = (v: number[]) => (v[0] * DAY * (v[1] * 1e3) ** 3 * (1 - v[2] ** 2) ** 1.5) / (2 * Math.PI) / GM_SUN;
    const x = [5.6233, 212.4, 0.05];
    const s = [0.0004, 1.9, 0.02];
    const m = measurement("tarn-sb1", "rv-2020");
    const f = fm(x);
    expect(Math.abs(m.results.mass_function.value_si / (f * MSUN_KG) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(m.results.mass_function.sigma_si / (numericSigma(fm, x, s) * MSUN_KG) - 1)).toBeLessThan(0.02);
    const a1 = (x[1] * 1e3 * x[0] * DAY * Math.sqrt(1 - x[2] ** 2)) / (2 * Math.PI);
    expect(Math.abs(m.results.a1_sin_i.value_si / a1 - 1)).toBeLessThan(1e-6);
    const mmin = cubicMass(f, 0.71);
    expect(Math.abs(m.results.min_secondary_mass.value_si / (mmin * MSUN_KG) - 1)).toBeLessThan(1e-6);
    const sin3 = Math.sin(62 * DEG) ** 3;
    const m2 = cubicMass(f / sin3, 0.71);
    expect(Math.abs(m.results.secondary_mass.value_si / (m2 * MSUN_KG) - 1)).toBeLessThan(1e-6);
    const m2f = (v: number[]) => cubicMass(fm(v) / Math.sin(v[4] * DEG) ** 3, v[3]);
    const xs = [...x, 0.71, 62];
    const ss = [...s, 0.08, 4];
    expect(Math.abs(m.results.secondary_mass.sigma_si / (numericSigma(m2f, xs, ss) * MSUN_KG) - 1)).toBeLessThan(0.02);
  });

  it("double-lined: masses from both semi-amplitudes and the inclination", () => {
    const m1 = (v: number[]) =>
      (v[0] * DAY * ((v[1] + v[2]) * 1e3) ** 2 * v[2] * 1e3) / (2 * Math.PI) / Math.sin(v[3] * DEG) ** 3 / GM_SUN;
    const x = [3.84471, 79.0, 97.0, 86.1];
    const s = [0.00002, 0.4, 0.5, 0.3];
    const m = measurement("tarn-sb2", "eb-2022");
    expect(Math.abs(m.results.primary_mass.value_si / (m1(x) * MSUN_KG) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(m.results.primary_mass.sigma_si / (numericSigma(m1, x, s) * MSUN_KG) - 1)).toBeLessThan(0.02);
    expect(m.results.mass_ratio.value_si).toBeCloseTo(79.0 / 97.0, 12);
    // 1.2053 recomputed against 1.208 ± 0.012
    expect(m.comparisons.primary_mass.z).toBeCloseTo((m1(x) - 1.208) / 0.012, 4);
    expect(m.status).toBe("consistent");
    expect(m.assumptions.join(" ")).toMatch(/e = 0|circular/i);
  });

  it("circular velocity: enclosed mass from an angular radius and a distance", () => {
    const mass = (v: number[]) => ((v[0] * 1e3) ** 2 * v[1] * ARCSEC * v[2] * MPC) / G;
    const x = [184, 95, 7.3];
    const s = [6, 3, 0.4];
    const m = measurement("tarn-rotation", "rotation");
    expect(Math.abs(m.results.enclosed_mass.value_si / mass(x) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(m.results.enclosed_mass.sigma_si / numericSigma(mass, x, s) - 1)).toBeLessThan(0.02);
    expect(m.status).toBe("not-compared");
    // the budget: shares sum to one; velocity (2 × 3.3 %) outweighs radius (3.2 %)
    const shares = m.results.enclosed_mass.budget;
    expect(shares.reduce((t, b) => t + b.share, 0)).toBeCloseTo(1, 12);
    expect(shares[0].source).toBe("velocity");
  });

  it("astrometric orbit: mass function and the dark companion's mass", () => {
    const fm = (v: number[]) => (4 * Math.PI ** 2 * ((v[1] / v[2]) * AU) ** 3) / (v[0] * DAY) ** 2 / GM_SUN;
    const x = [182.4, 1.93, 2.41];
    const m = measurement("tarn-astrometric", "wobble");
    expect(Math.abs(m.results.mass_function.value_si / (fm(x) * MSUN_KG) - 1)).toBeLessThan(1e-6);
    const m2 = cubicMass(fm(x), 0.95);
    expect(Math.abs(m.results.secondary_mass.value_si / (m2 * MSUN_KG) - 1)).toBeLessThan(1e-6);
    const m2f = (v: number[]) => cubicMass(fm(v), v[3]);
    expect(
      Math.abs(m.results.secondary_mass.sigma_si / (numericSigma(m2f, [...x, 0.95], [0.9, 0.04, 0.03, 0.05]) * MSUN_KG) - 1),
    ).toBeLessThan(0.02);
  });

  it("is reproducible: the same records give the same report, draws included", async () => {
    const again = auditRecords(await loadRecords(path.resolve("test/fixtures/audit/records")), { draws: 20_000 });
    expect(JSON.stringify(again)).toBe(JSON.stringify(report));
  });

  it("reports a bad record as a problem, still audits the good ones, and exits 2", async () => {
    const mixed = auditRecords(await loadRecords(path.resolve("test/fixtures/audit/broken")), { draws: 100 });
    expect(mixed.problems.some((p) => p.code === "unknown-unit" && p.file === "unknown-unit.yaml" && p.line === 7)).toBe(true);
    expect(exitCodeFor(mixed)).toBe(2);
  });
});

describe("masses given as GM", () => {
  it("accepts km3/s2 for a mass input and a published mass, and compares in GM", async () => {
    const { loadRecordText } = await import("../../src/records/load.js");
    const text = [
      "name: Tarnwick Moon",
      "measurements:",
      "  - key: moon",
      "    method: relative-orbit",
      "    reference: { cite: \"Invented 2020\" }",
      "    inputs:",
      "      period: 10 ± 0.01 d",
      "      semimajor_axis: 200000 ± 100 km",
      "      secondary_mass: 1820 ± 15 km3/s2",
      "    published:",
      "      total_mass: 423100 ± 1500 km3/s2",
    ].join("\n");
    const { record, problems } = loadRecordText(text, "moon.yaml");
    expect(problems).toEqual([]);
    const r = auditRecords({ records: [record!], problems: [], files: ["moon.yaml"], filesWithErrors: [] }, { draws: 0 });
    const m = r.objects[0].measurements[0];
    const gmTotal = (4 * Math.PI ** 2 * 2e8 ** 3) / (10 * DAY) ** 2;
    expect(Math.abs(m.results.total_mass.value_si / (gmTotal / G) - 1)).toBeLessThan(1e-9);
    // shown in the published GM unit, read straight from GM (no G)
    expect(m.results.total_mass.display_unit).toBe("km3/s2");
    expect(m.results.total_mass.value).toBeCloseTo(gmTotal / 1e9, 6);
    expect(m.results.primary_mass.value_si * G).toBeCloseTo(gmTotal - 1820e9, -3);
    expect(m.comparisons.total_mass.z).toBeCloseTo((gmTotal / 1e9 - 423100) / 1500, 4);
  });
});
