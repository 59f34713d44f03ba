import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { auditRecords } from "../../src/audit/audit-records.js";
import type { AuditReport } from "../../src/audit/types.js";
import { combineReport } from "../../src/combine/combine-object.js";
import { loadRecordText } from "../../src/records/load.js";
import type { LoadOutcome, ObjectRecord } from "../../src/records/types.js";
import { compareReleases } from "../../src/releases/compare-releases.js";
import { parseAuditJson, readAuditJson } from "../../src/releases/read-audit-json.js";

const AU = 149597870700; // IAU 2012 B2
const GM_SUN = 1.3271244e20; // IAU 2015 B3
const YR = 365.25 * 86400;
const kepler = (aAu: number, pYr: number) => (4 * Math.PI ** 2 * (aAu * AU) ** 3) / (pYr * YR) ** 2 / GM_SUN;

interface Orbit {
  key: string;
  a: number;
  published: string;
  extra?: string[];
}

function record(id: string, orbits: Orbit[]): string {
  const lines = [`name: ${id.toUpperCase()}`, `id: ${id}`, "measurements:"];
  for (const o of orbits) {
    lines.push(
      `  - key: ${o.key}`,
      "    method: relative-orbit",
      "    reference:",
      `      cite: "Invented ${o.key}, J. Invented Astron. 2, 3"`,
      "    inputs:",
      '      period: "30 ± 0.03 yr"',
      `      semimajor_axis: "${o.a} ± 0.01 au"`,
      ...(o.extra ?? []).map((l) => `      ${l}`),
      "    published:",
      `      total_mass: "${o.published}"`,
    );
  }
  return lines.join("\n") + "\n";
}

function audit(files: Record<string, string>, tension = 1): AuditReport {
  const records: ObjectRecord[] = [];
  for (const [file, text] of Object.entries(files)) {
    const out = loadRecordText(text, file);
    if (!out.record) throw new Error(`${file} does not load: ${out.problems.map((p) => p.message).join("; ")}`);
    records.push(out.record);
  }
  records.sort((a, b) => (a.id < b.id ? -1 : 1));
  const outcome: LoadOutcome = { records, problems: [], files: Object.keys(files).sort(), filesWithErrors: [] };
  return auditRecords(outcome, { draws: 0, thresholds: { tension } });
}

const M10 = kepler(10, 30);
// first-order relative σ of 4π²a³/P² in kilograms: √((3σa/a)² + (2σP/P)² + (σG/G)²), CODATA 2018 σG/G
const G_REL = 0.00015 / 6.6743;
const rel = (a: number) => Math.hypot((3 * 0.01) / a, (2 * 0.03) / 30, G_REL);

const previous = audit({
  "vell-1.yaml": record("vell-1", [{ key: "orbit", a: 10, published: `${M10} ± ${0.005 * M10} Msun` }]),
  "vell-2.yaml": record("vell-2", [
    { key: "a", a: 10, published: `${M10} ± ${0.01 * M10} Msun` },
    { key: "b", a: 10.02, published: `${kepler(10.02, 30)} ± ${0.01 * M10} Msun` },
  ]),
  "vell-3.yaml": record("vell-3", [{ key: "only", a: 12, published: `${kepler(12, 30)} ± 0.1 Msun` }]),
});

const current = audit({
  // a edited from 10 to 10.03 au: the value moves by +0.9 % against a published σ of 0.5 %
  "vell-1.yaml": record("vell-1", [{ key: "orbit", a: 10.03, published: `${M10} ± ${0.005 * M10} Msun` }]),
  // measurement b replaced by c, which also gives the component masses
  "vell-2.yaml": record("vell-2", [
    { key: "a", a: 10, published: `${M10} ± ${0.01 * M10} Msun` },
    { key: "c", a: 9.99, published: `${kepler(9.99, 30)} ± ${0.01 * M10} Msun`, extra: ['mass_ratio: "0.8 ± 0.02"'] },
  ]),
  "vell-4.yaml": record("vell-4", [{ key: "new", a: 8, published: `${kepler(8, 30)} ± 0.1 Msun` }]),
});

describe("compareReleases on two audits of edited records", () => {
  const diff = compareReleases(previous, current);

  it("lists the objects added and removed", () => {
    expect(diff.added).toEqual(["vell-4"]);
    expect(diff.removed).toEqual(["vell-3"]);
  });

  it("lists the measurements added and removed in objects present in both", () => {
    expect(diff.measurements_added).toEqual([{ id: "vell-2", key: "c" }]);
    expect(diff.measurements_removed).toEqual([{ id: "vell-2", key: "b" }]);
  });

  it("lists exactly the status that changed", () => {
    expect(diff.status_changes).toEqual([{ id: "vell-1", key: "orbit", before: "consistent", after: "tension" }]);
  });

  it("lists the moved values with their shift in σ", () => {
    expect(diff.moved.map((m) => `${m.id}/${m.result}`)).toEqual(["vell-1/total_mass", "vell-2/total_mass"]);
    const v1 = diff.moved[0];
    const m0 = M10;
    const m1 = kepler(10.03, 30);
    // one measurement each: the combined value is the recomputed one and its first-order σ
    expect(v1.before.value).toBeCloseTo(m0, 12);
    expect(v1.after.value).toBeCloseTo(m1, 12);
    const expected = (m1 - m0) / Math.hypot(rel(10) * m0, rel(10.03) * m1);
    // the σ computed here by hand and the audit's partials agree to rounding
    expect(v1.shift_sigma).toBeCloseTo(expected, 9);
    expect(v1.shift_sigma).toBeGreaterThan(0);
    // vell-2: b (10.02 au) replaced by c (9.99 au) lowers the average
    expect(diff.moved[1].shift_sigma).toBeLessThan(0);
    expect(diff.moved[1].after.count).toBe(2);
  });

  it("lists results that appeared", () => {
    expect(diff.results_added).toEqual([
      { id: "vell-2", result: "primary_mass" },
      { id: "vell-2", result: "secondary_mass" },
    ]);
    expect(diff.results_removed).toEqual([]);
  });

  it("reports nothing between an audit and itself", () => {
    const same = compareReleases(current, current);
    expect(same).toEqual({
      added: [],
      removed: [],
      measurements_added: [],
      measurements_removed: [],
      moved: [],
      results_added: [],
      results_removed: [],
      status_changes: [],
      notes: [],
    });
  });

  it("uses the combined values it is given", () => {
    const cPrev = combineReport(previous.objects);
    const cCurr = combineReport(current.objects);
    expect(compareReleases(previous, current, cPrev, cCurr)).toEqual(diff);
    // with the previous combination passed as both, no value moves
    expect(compareReleases(previous, current, cPrev, cPrev).moved).toEqual([]);
  });

  it("notes changed thresholds, which change statuses without moving values", () => {
    const strict = audit({ "vell-1.yaml": record("vell-1", [{ key: "orbit", a: 10.03, published: `${M10} ± ${0.005 * M10} Msun` }]) }, 2);
    const loose = audit({ "vell-1.yaml": record("vell-1", [{ key: "orbit", a: 10.03, published: `${M10} ± ${0.005 * M10} Msun` }]) }, 1);
    const d = compareReleases(strict, loose);
    expect(d.moved).toEqual([]);
    expect(d.status_changes).toEqual([{ id: "vell-1", key: "orbit", before: "consistent", after: "tension" }]);
    expect(d.notes).toHaveLength(1);
    expect(d.notes[0]).toContain("thresholds changed");
  });
});

describe("readAuditJson", () => {
  const dir = mkdtempSync(join(tmpdir(), "steelyard-releases-"));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it("reads back an audit written as JSON", () => {
    const file = join(dir, "audit.json");
    writeFileSync(file, JSON.stringify(current, null, 2));
    const r = readAuditJson(file);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(compareReleases(previous, r.value)).toEqual(compareReleases(previous, current));
  });

  it("says when the file is missing", () => {
    const r = readAuditJson(join(dir, "nowhere.json"));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues[0].code).toBe("cannot-read");
    expect(r.issues[0].message).toContain("no such file");
  });

  it("says when the text is not JSON", () => {
    const r = parseAuditJson("{ objects: [", "broken.json");
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues).toHaveLength(1);
    expect(r.issues[0].code).toBe("not-json");
    expect(r.issues[0].message).toMatch(/^broken\.json is not valid JSON/);
  });

  it("refuses a foreign JSON file with a clear problem", () => {
    const r = parseAuditJson(JSON.stringify({ name: "some-package", version: "1.0.0", dependencies: {} }), "package.json");
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues).toHaveLength(1);
    expect(r.issues[0].path).toBe("tool");
    expect(r.issues[0].message).toBe("package.json: tool should be an object, found nothing");
  });

  it("refuses another tool's audit", () => {
    const r = parseAuditJson(JSON.stringify({ ...current, tool: { name: "other", version: "1" } }), "x.json");
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues.map((i) => i.path)).toEqual(["tool.name"]);
  });

  it("collects every bad field with its path", () => {
    const broken = JSON.parse(JSON.stringify(current));
    broken.objects[0].measurements[0].status = "fine";
    broken.objects[0].measurements[0].results.total_mass.value_si = "big";
    delete broken.objects[1].id;
    broken.settings.thresholds.tension = null;
    const r = parseAuditJson(JSON.stringify(broken), "edited.json");
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues.map((i) => i.path)).toEqual([
      "settings.thresholds.tension",
      "objects[0].measurements[0].status",
      "objects[0].measurements[0].results.total_mass.value_si",
      "objects[1].id",
    ]);
    expect(r.issues[1].message).toContain("should be one of consistent, tension, discrepant, not-compared");
  });

  it("accepts null for a z that JSON could not hold (an infinite z)", () => {
    const edited = JSON.parse(JSON.stringify(current));
    edited.objects[0].measurements[0].comparisons.total_mass.z = null;
    expect(parseAuditJson(JSON.stringify(edited), "inf.json").ok).toBe(true);
  });

  it("stops listing after a limit and counts the rest", () => {
    const many = { tool: { name: "steelyard", version: "0" }, settings: {}, summary: {}, objects: Array.from({ length: 40 }, () => 7), problems: [] };
    const r = parseAuditJson(JSON.stringify(many), "many.json");
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.issues).toHaveLength(26);
    expect(r.issues[25].message).toMatch(/more problems not listed$/);
  });
});
