/**
 * The demo records (content/records) against test/fixtures/demo-expected.json: values, first-order
 * uncertainties, z and statuses worked out by a separate implementation of the same formulas
 * (Kepler's third law, the mass functions, v²r/G) with IAU 2015 nominal GM values, cross-checked
 * against the textbook solar-unit forms M = a³/P² (au, yr) and f = 1.0361e-7 (1 − e²)^{3/2} K³ P
 * (km/s, d) (both common practice).
 *
 * Each demo object carries at most one seeded slip (the "slip" field); the statuses follow from it.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { runAudit, type AuditReport, type MeasurementAudit } from "../../src/audit/index.js";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");

interface Expected {
  status: string;
  slip: string;
  results: Record<string, number>;
  sigmas: Record<string, number>;
  units: Record<string, string>;
  z?: Record<string, number>;
}
const expected: Record<string, Record<string, Expected>> = JSON.parse(
  readFileSync(path.join(root, "test/fixtures/demo-expected.json"), "utf8"),
);

let report: AuditReport;
const byId = new Map<string, Map<string, MeasurementAudit>>();

beforeAll(async () => {
  report = await runAudit(path.join(root, "content/records"), { draws: 0 });
  for (const o of report.objects) byId.set(o.id, new Map(o.measurements.map((m) => [m.key, m])));
});

describe("demo records", () => {
  it("load without a single problem", () => {
    expect(report.problems).toEqual([]);
    expect(report.summary.files_with_problems).toBe(0);
  });

  it("are the objects and measurements the expected-values file lists", () => {
    expect([...byId.keys()].sort()).toEqual(Object.keys(expected).sort());
    for (const [id, ms] of Object.entries(expected)) {
      expect([...byId.get(id)!.keys()].sort(), id).toEqual(Object.keys(ms).sort());
    }
  });

  it("has at least 32 objects and every status the demo is meant to show", () => {
    expect(report.objects.length).toBeGreaterThanOrEqual(32);
    const c = report.summary.status_counts;
    expect(c.consistent).toBeGreaterThan(0);
    expect(c.tension).toBeGreaterThanOrEqual(2);
    expect(c.discrepant).toBeGreaterThanOrEqual(5);
    expect(c["not-compared"]).toBeGreaterThanOrEqual(3);
  });

  for (const [id, ms] of Object.entries(expected)) {
    for (const [key, e] of Object.entries(ms)) {
      it(`${id} / ${key}: ${e.status}${e.slip === "none" ? "" : ` (${e.slip})`}`, () => {
        const m = byId.get(id)!.get(key)!;
        expect(m.status).toBe(e.status);
        for (const [name, value] of Object.entries(e.results)) {
          const r = m.results[name];
          expect(r, name).toBeDefined();
          expect(r.display_unit, name).toBe(e.units[name]);
          // same closed forms in double precision; the file keeps 10 significant digits
          expect(Math.abs(r.value / value - 1), name).toBeLessThan(1e-8);
          // the file's σ comes from finite-difference partials and keeps 4 significant digits
          expect(Math.abs(r.sigma / e.sigmas[name] - 1), `${name} sigma`).toBeLessThan(1e-3);
        }
        for (const [name, z] of Object.entries(e.z ?? {})) {
          // the file keeps z to 3 decimals
          expect(Math.abs(m.comparisons[name].z - z), `${name} z`).toBeLessThanOrEqual(5e-4 + 1e-6 * Math.abs(z));
        }
      });
    }
  }
});
