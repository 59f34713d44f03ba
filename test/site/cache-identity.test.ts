import { cpSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync, existsSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runAudit } from "../../src/audit/run.js";
import { buildSite, renderSite } from "../../src/site/build.js";
import { DOWNLOADS } from "../../src/site/downloads.js";
import { listFiles } from "./helpers/html-scan.js";
import { isOpened } from "../../src/cache/lazy-audit.js";

const ROOT = path.resolve(__dirname, "../..");
const DEMO = path.join(ROOT, "content/records");
const BROKEN = path.join(ROOT, "test/fixtures/records/broken");
const DRAWS = 300;

const temp: string[] = [];
function tempDir(label: string): string {
  const d = mkdtempSync(path.join(os.tmpdir(), `steelyard-cache-site-${label}-`));
  temp.push(d);
  return d;
}
afterAll(() => {
  for (const d of temp) rmSync(d, { recursive: true, force: true });
});

/** Every file of a built site with its bytes. */
function snapshot(dir: string): Map<string, Buffer> {
  return new Map(listFiles(dir).map((f) => [f, readFileSync(path.join(dir, f))]));
}

/** The files that differ between two sites (added, removed or changed). */
function differences(a: Map<string, Buffer>, b: Map<string, Buffer>): string[] {
  const out = new Set<string>();
  for (const [f, bytes] of a) if (!b.get(f)?.equals(bytes)) out.add(f);
  for (const f of b.keys()) if (!a.has(f)) out.add(f);
  return [...out].sort();
}

function mtimes(dir: string): Map<string, number> {
  return new Map(listFiles(dir).map((f) => [f, statSync(path.join(dir, f)).mtimeMs]));
}

// the references (BibTeX) do not change when a period does
const SHARED_PAGES = ["index.html", ...DOWNLOADS.filter((d) => d.key !== "references_bib").map((d) => d.path)];

describe("the site with and without the cache", () => {
  for (const [label, records] of [["demo", DEMO], ["broken", BROKEN]] as const) {
    it(`is the same bytes for the ${label} records: plugin pages, pipeline uncached, cold and warm cache`, async () => {
      const report = await runAudit(records, { draws: DRAWS });
      const viaPlugin = tempDir(`${label}-plugin`);
      await renderSite({ report, outDir: viaPlugin, quiet: true });
      const uncached = tempDir(`${label}-uncached`);
      await buildSite({ recordsDir: records, outDir: uncached, quiet: true, audit: { draws: DRAWS } });
      const cacheDir = tempDir(`${label}-cache`);
      const cached = tempDir(`${label}-cached`);
      const cold = await buildSite({ recordsDir: records, outDir: cached, quiet: true, audit: { draws: DRAWS }, cacheDir });
      const coldFiles = snapshot(cached);
      const warm = await buildSite({ recordsDir: records, outDir: cached, quiet: true, audit: { draws: DRAWS }, cacheDir });

      const reference = snapshot(viaPlugin);
      expect(reference.size).toBeGreaterThan(10);
      expect(differences(reference, snapshot(uncached))).toEqual([]);
      expect(differences(reference, coldFiles)).toEqual([]);
      expect(differences(reference, snapshot(cached))).toEqual([]);
      expect(cold.stats.pagesWritten).toBe(report.objects.length);
      expect(warm.stats.pagesKept).toBe(report.objects.length);
      expect(warm.stats.pagesWritten).toBe(0);

      // the downloads are what their render functions give; the audit, streamed and padded, holds JSON.stringify's value
      for (const d of DOWNLOADS) {
        const text = reference.get(d.path)?.toString("utf8");
        expect(text, d.path).toBe(d.render(report));
        if (d.key === "audit_json") expect(JSON.stringify(JSON.parse(text!))).toBe(JSON.stringify(report));
      }
    });
  }

  it("rewrites exactly the edited record's page and the shared pages, and matches a fresh build", async () => {
    const records = tempDir("edit-records");
    cpSync(DEMO, records, { recursive: true });
    const cacheDir = tempDir("edit-cache");
    const site = tempDir("edit-site");
    await buildSite({ recordsDir: records, outDir: site, quiet: true, audit: { draws: DRAWS }, cacheDir });
    const before = snapshot(site);
    const timesBefore = mtimes(site);

    const file = path.join(records, "astrometric/skab-88.yaml");
    const text = readFileSync(file, "utf8");
    expect(text).toContain('period: "11.3 ± 0.4 yr"');
    writeFileSync(file, text.replace('period: "11.3 ± 0.4 yr"', 'period: "11.9 ± 0.4 yr"'));
    const again = await buildSite({ recordsDir: records, outDir: site, quiet: true, audit: { draws: DRAWS }, cacheDir });
    expect(again.stats.audited).toBe(1);
    expect(again.stats.pagesWritten).toBe(1);
    // the other audits came from the cache and were never deserialised: their summaries, fragments and bytes sufficed
    const opened = again.report.objects.map((o) => [o.id, isOpened(o)] as const);
    expect(opened.filter(([, state]) => state !== false)).toEqual([["skab-88", undefined]]);

    const fresh = tempDir("edit-fresh");
    await buildSite({ recordsDir: records, outDir: fresh, quiet: true, audit: { draws: DRAWS } });
    const after = snapshot(site);
    expect(differences(snapshot(fresh), after)).toEqual([]);

    // a longer period moves the recomputed mass: its page, the reference table and the downloads of values change
    const changed = differences(before, after);
    expect(changed).toEqual([...SHARED_PAGES, "objects/skab-88/index.html"].sort());
    // no other object page was even rewritten
    const timesAfter = mtimes(site);
    const rewritten = [...timesAfter].filter(([f, t]) => f.startsWith("objects/") && timesBefore.get(f) !== t).map(([f]) => f);
    expect(rewritten).toEqual(["objects/skab-88/index.html"]);
  });

  it("removes the page of a record that is gone, and rewrites every page when the base path changes", async () => {
    const records = tempDir("gone-records");
    cpSync(DEMO, records, { recursive: true });
    const cacheDir = tempDir("gone-cache");
    const site = tempDir("gone-site");
    await buildSite({ recordsDir: records, outDir: site, quiet: true, audit: { draws: DRAWS }, cacheDir });
    expect(existsSync(path.join(site, "objects/skab-88/index.html"))).toBe(true);
    rmSync(path.join(records, "astrometric/skab-88.yaml"));
    const gone = await buildSite({ recordsDir: records, outDir: site, quiet: true, audit: { draws: DRAWS }, cacheDir });
    expect(gone.stats.pagesRemoved).toBe(1);
    expect(existsSync(path.join(site, "objects/skab-88"))).toBe(false);
    const fresh = tempDir("gone-fresh");
    await buildSite({ recordsDir: records, outDir: fresh, quiet: true, audit: { draws: DRAWS } });
    expect(differences(snapshot(fresh), snapshot(site))).toEqual([]);

    const moved = await buildSite({ recordsDir: records, outDir: site, quiet: true, audit: { draws: DRAWS }, cacheDir, basePath: "/masses/" });
    expect(moved.stats.reused).toBe(moved.stats.files);
    expect(moved.stats.pagesWritten).toBe(moved.report.objects.length);
    const freshMoved = tempDir("moved-fresh");
    await buildSite({ recordsDir: records, outDir: freshMoved, quiet: true, audit: { draws: DRAWS }, basePath: "/masses/" });
    expect(differences(snapshot(freshMoved), snapshot(site))).toEqual([]);
  });
});

describe("a build with nothing to do", () => {
  it("writes nothing, tells the same, reads its report from the cache, and notices a page removed by hand", async () => {
    const cacheDir = tempDir("same-cache");
    const site = tempDir("same-site");
    const first = await buildSite({ recordsDir: DEMO, outDir: site, quiet: true, audit: { draws: DRAWS }, cacheDir });
    const times = mtimes(site);
    const bytes = snapshot(site);
    const second = await buildSite({ recordsDir: DEMO, outDir: site, quiet: true, audit: { draws: DRAWS }, cacheDir });
    expect(second.stats.audited).toBe(0);
    expect(second.stats.pagesWritten).toBe(0);
    expect(second.pages).toBe(first.pages);
    expect(second.summary).toEqual(first.summary);
    expect(second.exitCode).toBe(first.exitCode);
    expect(second.problemCount).toBe(first.problemCount);
    expect(mtimes(site)).toEqual(times);
    expect(JSON.stringify(second.report)).toBe(JSON.stringify(await runAudit(DEMO, { draws: DRAWS })));

    // a page deleted by hand is not "nothing to do": the build runs, keeps the object pages and restores the page
    rmSync(path.join(site, "methods/index.html"));
    const third = await buildSite({ recordsDir: DEMO, outDir: site, quiet: true, audit: { draws: DRAWS }, cacheDir });
    expect(third.stats.pagesKept).toBe(third.summary.objects);
    expect(differences(bytes, snapshot(site))).toEqual([]);
  });
});
