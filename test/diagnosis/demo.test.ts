/**
 * The demo scenario's seeded slips (listed with their kinds in test/fixtures/demo-expected.json)
 * must each be diagnosed with the right cause first; the honest tension must stay unexplained.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { runAudit, type AuditReport } from "../../src/audit/index.js";

const SLIP_TO_HYPOTHESIS: Record<string, string> = {
  "year-length": "year-365d",
  "companion-ignored": "total-as-primary",
  "missing-sin3i": "sin3i-omitted",
  "k-doubled": "k-doubled",
  "parallax-unit": "parallax-mas-as-arcsec",
  "mean-distance": "mean-distance-as-semimajor-axis",
};

const expected: Record<string, Record<string, { slip: string; status: string }>> = JSON.parse(
  readFileSync(path.resolve("test/fixtures/demo-expected.json"), "utf8"),
);

let report: AuditReport;
beforeAll(async () => {
  report = await runAudit(path.resolve("content/records"), { draws: 0 });
});

describe("diagnosis of the demo's seeded slips", () => {
  const seeded = Object.entries(expected).flatMap(([id, ms]) =>
    Object.entries(ms)
      .filter(([, m]) => m.slip !== "none")
      .map(([key, m]) => ({ id, key, slip: m.slip })),
  );

  it("covers every kind of slip the scenario seeds", () => {
    expect(new Set(seeded.map((s) => s.slip))).toEqual(new Set(Object.keys(SLIP_TO_HYPOTHESIS)));
  });

  for (const { id, key, slip } of seeded) {
    it(`${id} ${key}: ${slip} comes first`, () => {
      const m = report.objects.find((o) => o.id === id)!.measurements.find((x) => x.key === key)!;
      expect(m.diagnoses, "a flagged measurement carries a diagnosis").toBeDefined();
      for (const d of m.diagnoses!) {
        expect(d.unexplained).toBe(false);
        expect(d.explained[0].hypothesis).toBe(SLIP_TO_HYPOTHESIS[slip]);
        expect(Math.abs(d.explained[0].z_after)).toBeLessThan(1);
      }
    });
  }

  it("leaves the honest tension unexplained and says so", () => {
    const honest = Object.entries(expected).flatMap(([id, ms]) =>
      Object.entries(ms)
        .filter(([, m]) => m.slip === "none" && m.status === "tension")
        .map(([key]) => ({ id, key })),
    );
    expect(honest.length).toBeGreaterThan(0);
    for (const { id, key } of honest) {
      const m = report.objects.find((o) => o.id === id)!.measurements.find((x) => x.key === key)!;
      expect(m.diagnoses![0].unexplained).toBe(true);
      expect(m.diagnoses![0].summary).toMatch(/No single slip/);
    }
  });
});
