import { cpSync, mkdtempSync, readdirSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runAudit } from "../../src/audit/run.js";
import { fileProblems, readRecordCache, recordCacheFolder, runPipeline } from "../../src/build/pipeline.js";
import { problemsByFile } from "../../src/site/problems-view.js";

const ROOT = path.resolve(__dirname, "../..");
const DRAWS = 300;
const FOLDERS = {
  demo: path.join(ROOT, "content/records"),
  broken: path.join(ROOT, "test/fixtures/records/broken"),
  good: path.join(ROOT, "test/fixtures/records/good"),
  site: path.join(ROOT, "test/fixtures/site/records"),
  missing: path.join(ROOT, "test/fixtures/records/no-such-folder"),
};

const temp: string[] = [];
function tempDir(label: string): string {
  const d = mkdtempSync(path.join(os.tmpdir(), `steelyard-pipeline-${label}-`));
  temp.push(d);
  return d;
}
afterAll(() => {
  for (const d of temp) rmSync(d, { recursive: true, force: true });
});

describe("the build pipeline's report", () => {
  for (const [label, dir] of Object.entries(FOLDERS)) {
    it(`is runAudit's report, key for key, for the ${label} records: uncached, cold cache and warm cache`, async () => {
      const expected = JSON.stringify(await runAudit(dir, { draws: DRAWS }));
      const cacheDir = tempDir(label);
      const plain = await runPipeline(dir, { audit: { draws: DRAWS } });
      const cold = await runPipeline(dir, { audit: { draws: DRAWS }, cacheDir });
      const warm = await runPipeline(dir, { audit: { draws: DRAWS }, cacheDir });
      expect(JSON.stringify(plain.report)).toBe(expected);
      expect(JSON.stringify(cold.report)).toBe(expected);
      expect(JSON.stringify(warm.report)).toBe(expected);
      if (label !== "missing") {
        expect(cold.stats.reused).toBe(0);
        expect(warm.stats.reused).toBe(warm.stats.files);
        expect(warm.stats.audited).toBe(0);
        expect(warm.stats.files).toBeGreaterThan(0);
        expect(warm.reportKey).toBe(cold.reportKey);
      }
    });
  }

  it("lists each object file's problems as the report does", async () => {
    const cacheDir = tempDir("problems");
    const { report } = await runPipeline(FOLDERS.broken, { audit: { draws: DRAWS }, cacheDir });
    const entries = [...readRecordCache(cacheDir, FOLDERS.broken).values()];
    const byFile = problemsByFile(report.problems);
    // a file left out for a duplicate id is audited too, but its object is not in the report
    const kept = new Set(report.objects.map((o) => o.file));
    const withObject = entries.filter((e) => e.audit?.object && kept.has(e.file));
    expect(entries.some((e) => e.audit?.object && !kept.has(e.file))).toBe(true);
    expect(withObject.length).toBeGreaterThan(0);
    let withProblems = 0;
    for (const e of withObject) {
      expect(fileProblems(e)).toEqual(byFile.get(e.file) ?? []);
      if ((byFile.get(e.file) ?? []).length > 0) withProblems++;
    }
    // the corpus has audited records that carry warnings or partial errors
    expect(withProblems).toBeGreaterThan(0);
  });

  it("follows edits, removals and an id that passes to another file, and a change of settings", async () => {
    const records = tempDir("records");
    cpSync(FOLDERS.broken, records, { recursive: true });
    const cacheDir = tempDir("edits");
    await runPipeline(records, { audit: { draws: DRAWS }, cacheDir });
    // the first of two files with one id goes: the second, never audited so far, takes the id
    rmSync(path.join(records, "duplicate-id-first.yaml"));
    const after = await runPipeline(records, { audit: { draws: DRAWS }, cacheDir });
    expect(JSON.stringify(after.report)).toBe(JSON.stringify(await runAudit(records, { draws: DRAWS })));
    expect(after.stats.audited).toBe(0);
    expect(after.report.problems.some((p) => p.code === "duplicate-id")).toBe(false);
    // other thresholds: every file is audited again
    const strict = await runPipeline(records, { audit: { draws: DRAWS, thresholds: { tension: 0.5, discrepant: 2 } }, cacheDir });
    expect(strict.stats.reused).toBe(0);
    expect(JSON.stringify(strict.report)).toBe(JSON.stringify(await runAudit(records, { draws: DRAWS, thresholds: { tension: 0.5, discrepant: 2 } })));
  });

  it("reads a damaged cache file as a cold cache", async () => {
    const cacheDir = tempDir("damaged");
    const { writeFileSync } = await import("node:fs");
    await runPipeline(FOLDERS.good, { audit: { draws: DRAWS }, cacheDir });
    const folder = recordCacheFolder(cacheDir, FOLDERS.good);
    for (const f of readdirSync(folder)) writeFileSync(path.join(folder, f), "damaged");
    const again = await runPipeline(FOLDERS.good, { audit: { draws: DRAWS }, cacheDir });
    expect(again.stats.reused).toBe(0);
    expect(JSON.stringify(again.report)).toBe(JSON.stringify(await runAudit(FOLDERS.good, { draws: DRAWS })));
  });
});
