import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
// plain JavaScript modules of the benchmark, run by Node directly
import { FILES_PER_FOLDER, generateCatalogue, objectRecord } from "../../bench/generate.mjs";
import { editOnePublishedValue } from "../../bench/edit-record.mjs";
import { mergeSummaries, moduleOf, summariseProfile } from "../../bench/profile.mjs";
import { formatTable, linearFit, median, parseOptions, roundOrder, siteSize } from "../../bench/run.mjs";
import { pathToFileURL } from "node:url";
import { auditRecords } from "../../src/audit/audit-records.js";
import type { AuditReport } from "../../src/audit/types.js";
import { METHOD_IDS } from "../../src/methods/index.js";
import { loadRecordText, loadRecords } from "../../src/records/load.js";
import type { LoadOutcome } from "../../src/records/types.js";

const dirs: string[] = [];
function tempDir(): string {
  const d = mkdtempSync(path.join(os.tmpdir(), "steelyard-gen-test-"));
  dirs.push(d);
  return d;
}
afterAll(() => {
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

/** Every file under dir, relative, sorted, with its bytes. */
function snapshot(dir: string): Map<string, Buffer> {
  const out = new Map<string, Buffer>();
  const walk = (sub: string) => {
    for (const e of readdirSync(path.join(dir, sub), { withFileTypes: true })) {
      const rel = sub ? `${sub}/${e.name}` : e.name;
      if (e.isDirectory()) walk(rel);
      else out.set(rel, readFileSync(path.join(dir, rel)));
    }
  };
  walk("");
  return new Map([...out].sort(([a], [b]) => (a < b ? -1 : 1)));
}

describe("generateCatalogue: determinism", () => {
  it("writes byte-identical files for the same seed", () => {
    const a = tempDir();
    const b = tempDir();
    const sa = generateCatalogue(a, 120, "7");
    const sb = generateCatalogue(b, 120, "7");
    expect(sa).toEqual(sb);
    const fa = snapshot(a);
    const fb = snapshot(b);
    expect([...fa.keys()]).toEqual([...fb.keys()]);
    expect(fa.size).toBe(120);
    for (const [file, bytes] of fa) expect(bytes.equals(fb.get(file)!), file).toBe(true);
  });

  it("writes different numbers for another seed, under the same file names", () => {
    const a = tempDir();
    const b = tempDir();
    generateCatalogue(a, 40, "1");
    generateCatalogue(b, 40, "2");
    const fa = snapshot(a);
    const fb = snapshot(b);
    const same = [...fa].filter(([file, bytes]) => fb.get(file)?.equals(bytes)).length;
    expect(same).toBe(0);
  });

  it("makes object n the same whatever the count", () => {
    const small = tempDir();
    const large = tempDir();
    generateCatalogue(small, 25, "3");
    generateCatalogue(large, 60, "3");
    const fs = snapshot(small);
    const fl = snapshot(large);
    for (const [file, bytes] of fs) expect(bytes.equals(fl.get(file)!), file).toBe(true);
    expect(objectRecord(17, "3").text).toBe(readFileSync(path.join(large, objectRecord(17, "3").file), "utf8"));
  });

  it("nests the files in folders of FILES_PER_FOLDER", () => {
    expect(FILES_PER_FOLDER).toBe(1000);
    expect(objectRecord(1, "1").file.startsWith("000/")).toBe(true);
    expect(objectRecord(1000, "1").file.startsWith("000/")).toBe(true);
    expect(objectRecord(1001, "1").file.startsWith("001/")).toBe(true);
    expect(objectRecord(100000, "1").file.startsWith("099/")).toBe(true);
  });

  it("writes records that load without an error for thousands of objects and two seeds", () => {
    // rare draws (an eccentricity measured just above zero, a wide inclination) show only at scale
    const faults: string[] = [];
    for (const seed of ["1", "2"]) {
      for (let n = 1; n <= 2500; n++) {
        const r = objectRecord(n, seed);
        for (const p of loadRecordText(r.text, r.file).problems) faults.push(`${seed}/${r.file} ${p.severity} ${p.path}: ${p.message}`);
      }
    }
    expect(faults).toEqual([]);
  });

  it("refuses a count that is not a positive whole number", () => {
    expect(() => generateCatalogue(tempDir(), 0, "1")).toThrow(/positive whole number/);
    expect(() => generateCatalogue(tempDir(), 2.5, "1")).toThrow(/positive whole number/);
  });
});

describe("a generated catalogue of 200 objects", () => {
  let dir: string;
  let summary: ReturnType<typeof generateCatalogue>;
  let outcome: LoadOutcome;
  let report: AuditReport;

  beforeAll(async () => {
    dir = tempDir();
    summary = generateCatalogue(dir, 200, "1");
    outcome = await loadRecords(dir);
    report = auditRecords(outcome, { draws: 50 });
  });

  it("loads with no error-severity problem and every object kept", () => {
    const errors = outcome.problems.filter((p) => p.severity === "error");
    expect(errors).toEqual([]);
    expect(outcome.files.length).toBe(200);
    expect(outcome.records.length).toBe(200);
    expect(outcome.records.reduce((n, r) => n + r.measurements.length, 0)).toBe(summary.measurements);
  });

  it("uses invented designations only", () => {
    for (const r of outcome.records) {
      expect(r.name).toMatch(/^BNCH \d+( AB| b)?$/);
      expect(r.id).toMatch(/^bnch-\d+(-ab|-b)?$/);
    }
  });

  it("covers every method, and each way of giving the inputs", () => {
    const measurements = outcome.records.flatMap((r) => r.measurements);
    expect(new Set(measurements.map((m) => m.method))).toEqual(new Set(METHOD_IDS));
    const has = (method: string, slots: string[], without: string[] = []) =>
      measurements.some((m) => m.method === method && slots.every((s) => s in m.inputs) && without.every((s) => !(s in m.inputs)));
    expect(has("relative-orbit", ["angular_semimajor_axis", "parallax"])).toBe(true);
    expect(has("relative-orbit", ["semimajor_axis"], ["angular_semimajor_axis"])).toBe(true);
    expect(has("astrometric-orbit", ["angular_semimajor_axis", "parallax", "primary_mass"])).toBe(true);
    expect(has("single-lined", ["k1"], ["primary_mass", "inclination"])).toBe(true);
    expect(has("single-lined", ["primary_mass"], ["inclination"])).toBe(true);
    expect(has("single-lined", ["primary_mass", "inclination"])).toBe(true);
    expect(has("double-lined", ["k1", "k2", "inclination"])).toBe(true);
    expect(has("circular-velocity", ["radius"])).toBe(true);
    expect(has("circular-velocity", ["angular_radius", "distance"])).toBe(true);
  });

  it("writes the quantity forms records use: ±, +/-, parentheses, asymmetric, powers of ten, mappings", () => {
    const text = [...snapshot(dir).values()].map((b) => b.toString("utf8")).join("\n");
    expect(text).toMatch(/: "[\d.]+ ± [\d.]+ [a-zA-Z/_]+"/);
    expect(text).toMatch(/: "[\d.]+ \+\/- [\d.]+/);
    expect(text).toMatch(/: "[\d.]+\(\d+\)/);
    expect(text).toMatch(/: "[\d.]+ \+[\d.]+ -[\d.]+/);
    expect(text).toMatch(/: "\([\d.]+ ± [\d.]+\) × 10\^-?\d+ /);
    expect(text).toMatch(/: \{ value: "[\d.]+", sigma: [\d.]+/);
  });

  it("gives every status, each measurement the one it was made to have", () => {
    // Honest published values are computed by the generator with its own formulas and
    // constants, so agreement here checks the project's recomputation against them.
    const c = report.summary.status_counts;
    expect(c.consistent).toBeGreaterThan(0);
    expect(c.tension).toBeGreaterThan(0);
    expect(c.discrepant).toBeGreaterThan(0);
    expect(c["not-compared"]).toBeGreaterThan(0);
    const expected: Record<string, string> = { honest: "consistent", tension: "tension", discrepant: "discrepant", "not-compared": "not-compared" };
    const byId = new Map(report.objects.map((o) => [o.id, o] as const));
    let checked = 0;
    for (let n = 1; n <= 200; n++) {
      const made = objectRecord(n, "1");
      const audited = byId.get(made.id);
      expect(audited, made.id).toBeDefined();
      made.keys.forEach((key: string, i: number) => {
        const m = audited!.measurements.find((x) => x.key === key);
        expect(m?.status, `${made.id} ${key}`).toBe(expected[made.slips[i]]);
        checked++;
      });
    }
    expect(checked).toBe(summary.measurements);
  });

  it("keeps honest published values within 0.2 σ of the recomputation (rounding only)", () => {
    let honest = 0;
    for (let n = 1; n <= 200; n++) {
      const made = objectRecord(n, "1");
      const o = report.objects.find((x) => x.id === made.id)!;
      made.keys.forEach((key: string, i: number) => {
        if (made.slips[i] !== "honest") return;
        const m = o.measurements.find((x) => x.key === key)!;
        for (const cmp of Object.values(m.comparisons)) {
          // printed values are rounded to the uncertainty's last digit: at most half of 1/3 of σ off
          expect(Math.abs(cmp.z), `${made.id} ${key} ${cmp.result}`).toBeLessThan(0.2);
          honest++;
        }
      });
    }
    expect(honest).toBeGreaterThan(200);
  });
});

describe("editOnePublishedValue", () => {
  it("changes the last digit of one published value in one file, and the record still loads", async () => {
    const dir = tempDir();
    generateCatalogue(dir, 5, "1");
    const before = snapshot(dir);
    const edit = editOnePublishedValue(dir, 1);
    const after = snapshot(dir);
    const changed = [...after].filter(([file, bytes]) => !before.get(file)!.equals(bytes)).map(([file]) => file);
    expect(changed).toEqual([path.relative(dir, edit.file)]);
    expect(edit.after).not.toBe(edit.before);
    const linesBefore = before.get(changed[0])!.toString("utf8").split("\n");
    const linesAfter = after.get(changed[0])!.toString("utf8").split("\n");
    expect(linesAfter.filter((l, i) => l !== linesBefore[i]).length).toBe(1);
    const outcome = await loadRecords(dir);
    expect(outcome.problems.filter((p) => p.severity === "error")).toEqual([]);
    expect(outcome.records.length).toBe(5);
  });
});

describe("benchmark statistics and options", () => {
  it("takes the median of odd and even counts", () => {
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(Number.isNaN(median([]))).toBe(true);
  });

  it("fits a line through exact points", () => {
    const f = linearFit([{ x: 1000, y: 3 }, { x: 10000, y: 21 }, { x: 100000, y: 201 }]);
    expect(f!.slope).toBeCloseTo(0.002, 12);
    expect(f!.intercept).toBeCloseTo(1, 9);
    expect(linearFit([{ x: 1, y: 1 }])).toBeUndefined();
  });

  it("reads the options and collects every problem", () => {
    const ok = parseOptions(["--objects", "1000,10000", "--runs=5", "--skip-baseline", "--steps", "check,build,baseline"]);
    expect(ok.ok).toBe(true);
    if (ok.ok) {
      expect(ok.value.objects).toEqual([1000, 10000]);
      expect(ok.value.runs).toBe(5);
      expect(ok.value.steps).toEqual(["check", "build"]);
    }
    const bad = parseOptions(["--objects", "0", "--runs", "x", "--steps", "draw"]);
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.problems.length).toBe(3);
  });

  it("runs the steps in rounds: the first run of every step, in their order, then the second", () => {
    const order = roundOrder(["check", "build", "baseline"], 2).map(({ step, run }) => `${step}${run}`);
    expect(order).toEqual(["check0", "build0", "baseline0", "check1", "build1", "baseline1"]);
    expect(roundOrder(["build"], 0)).toEqual([]);
  });
});

describe("the catalogue's Monte Carlo jobs", () => {
  it("gives one job per measurement, of every method, the same each time", async () => {
    const { catalogueJobs } = await import("../../bench/catalogue-jobs.mjs");
    const jobs = catalogueJobs(60, 1, 100);
    let measurements = 0;
    for (let n = 1; n <= 60; n++) measurements += objectRecord(n, 1).measurements;
    expect(jobs.length).toBe(measurements);
    expect(new Set(jobs.map((j: { method: { id: string } }) => j.method.id)).size).toBe(5);
    for (const { method, job } of jobs) {
      expect(job.method).toBe(method.id);
      expect(job.draws).toBe(100);
    }
    // one seed per measurement, and the same jobs again
    expect(new Set(jobs.map((j: { job: { seed: number } }) => j.job.seed)).size).toBe(jobs.length);
    expect(JSON.stringify(catalogueJobs(60, 1, 100).map((j: { job: unknown }) => j.job))).toBe(JSON.stringify(jobs.map((j: { job: unknown }) => j.job)));
  });
});

describe("profile summary", () => {
  const root = pathToFileURL(path.resolve(import.meta.dirname, "..", "..")).href;

  it("names our files by path and packages by name", () => {
    expect(moduleOf(`${root}/dist/uncertainty/draw-stream.js`)).toBe("dist/uncertainty/draw-stream.js");
    expect(moduleOf(`${root}/node_modules/katex/dist/katex.js`)).toBe("package katex");
    expect(moduleOf(`${root}/node_modules/@11ty/eleventy/src/Eleventy.js`)).toBe("package @11ty/eleventy");
    expect(moduleOf("node:internal/fs/promises")).toBe("node internals");
    expect(moduleOf("")).toBe("(native or engine)");
  });

  it("sums self time per function and module, idle time apart", () => {
    const frame = (functionName: string, url: string, lineNumber: number) => ({ functionName, url, lineNumber, scriptId: "0", columnNumber: 0 });
    const profile = {
      nodes: [
        { id: 1, callFrame: frame("(root)", "", -1) },
        { id: 2, callFrame: frame("fill", `${root}/dist/uncertainty/draw-stream.js`, 122) },
        { id: 3, callFrame: frame("makeSymbol", `${root}/node_modules/katex/dist/katex.js`, 4711) },
        { id: 4, callFrame: frame("(idle)", "", -1) },
      ],
      // each sample is charged the interval up to the next one (µs)
      samples: [2, 2, 3, 4, 2],
      timeDeltas: [0, 1000, 2000, 3000, 4000],
    };
    const s = summariseProfile(profile);
    expect(s.total_ms).toBe(6);
    expect(s.idle_ms).toBe(4);
    expect(s.functions.map((f: { function: string; self_ms: number; line: number }) => [f.function, f.self_ms, f.line])).toEqual([
      ["fill", 3, 123],
      ["makeSymbol", 3, 4712],
    ]);
    expect(s.modules.map((m: { module: string }) => m.module).sort()).toEqual(["dist/uncertainty/draw-stream.js", "package katex"]);
  });

  it("adds the threads' self times per function and module", () => {
    const one = {
      total_ms: 5, idle_ms: 1,
      functions: [{ function: "fill", module: "dist/a.js", line: 3, self_ms: 5 }],
      modules: [{ module: "dist/a.js", self_ms: 5 }],
    };
    const two = {
      total_ms: 9, idle_ms: 2,
      functions: [{ function: "fill", module: "dist/a.js", line: 3, self_ms: 2 }, { function: "render", module: "package katex", line: 9, self_ms: 7 }],
      modules: [{ module: "dist/a.js", self_ms: 2 }, { module: "package katex", self_ms: 7 }],
    };
    const m = mergeSummaries([one, two]);
    expect(m.total_ms).toBe(14);
    expect(m.idle_ms).toBe(3);
    expect(m.functions.map((f: { function: string; self_ms: number }) => [f.function, f.self_ms])).toEqual([["fill", 7], ["render", 7]]);
    expect(m.modules).toEqual([{ module: "dist/a.js", self_ms: 7 }, { module: "package katex", self_ms: 7 }]);
  });
});

describe("the benchmark's site size", () => {
  it("counts every file's bytes once, object pages apart, and does not follow links", () => {
    const d = tempDir();
    mkdirSync(path.join(d, "objects/a"), { recursive: true });
    mkdirSync(path.join(d, "objects/b"), { recursive: true });
    mkdirSync(path.join(d, "assets/objects"), { recursive: true });
    writeFileSync(path.join(d, "index.html"), "x".repeat(100));
    writeFileSync(path.join(d, "objects/a/index.html"), "y".repeat(1000));
    writeFileSync(path.join(d, "objects/b/index.html"), "z".repeat(3000));
    // a folder named objects elsewhere is not object pages
    writeFileSync(path.join(d, "assets/objects/f.css"), "w".repeat(10));
    symlinkSync(path.join(d, "objects/b/index.html"), path.join(d, "link.html"));
    expect(siteSize(d)).toEqual({ bytes: 4110, files: 4, object_page_bytes: 4000, object_pages: 2 });
    const table = formatTable({ sizes: [{ objects: 2, steps: {}, site: siteSize(d) }] });
    expect(table).toContain("2       0.0 MB in 4 files; object pages 0.0 MB, 2.0 KB each");
  });
});
