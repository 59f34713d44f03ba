import { execFileSync, spawnSync } from "node:child_process";
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
// plain JavaScript modules of the benchmark, run by Node directly
import { generateCatalogue } from "../../bench/generate.mjs";
import { editOnePublishedValue } from "../../bench/edit-record.mjs";
import { listFiles } from "../site/helpers/html-scan.js";
import { runAudit } from "../../src/audit/run.js";
import { reportJsonChunks } from "../../src/report/json-report.js";

/**
 * The compiled build with its worker threads (which the sources under the
 * test runner never start): workers audit, write pages and fragments, and
 * hand the audits over through spill files. Its site must be the bytes of a
 * build on one thread, with and without the cache, and it must leave no
 * spill folder behind.
 */

const ROOT = path.resolve(__dirname, "../..");
const OBJECTS = 240; // above the 200 files from which the build uses workers
const DRAWS = "300";
const temp = mkdtempSync(path.join(os.tmpdir(), "steelyard-build-workers-"));
const childTmp = path.join(temp, "tmp");
const records = path.join(temp, "records");

afterAll(() => rmSync(temp, { recursive: true, force: true }));

beforeAll(() => {
  if (!existsSync(path.join(ROOT, "dist/cli.js"))) execFileSync("npx", ["tsc", "-p", "."], { cwd: ROOT, stdio: "inherit" });
  generateCatalogue(records, OBJECTS);
  execFileSync("mkdir", ["-p", childTmp]);
});

/** Runs the compiled command line in a child whose temporary folder is our own. */
function cli(...args: string[]): void {
  const r = spawnSync(process.execPath, ["bin/steelyard.js", ...args], { cwd: ROOT, encoding: "utf8", env: { ...process.env, TMPDIR: childTmp } });
  expect(r.stderr).toBe("");
  expect(r.status).toBe(0);
}

/** `check --json` of a folder by the compiled command line: its standard output. */
function checkJson(dir: string): string {
  const r = spawnSync(process.execPath, ["bin/steelyard.js", "check", dir, "--json", "--draws", DRAWS], {
    cwd: ROOT,
    encoding: "utf8",
    maxBuffer: 1 << 28,
    env: { ...process.env, TMPDIR: childTmp },
  });
  expect(r.stderr).toBe("");
  return r.stdout;
}

/** The compiled buildSite on one thread (no build or page workers). */
function oneThread(outDir: string): void {
  const script = `import(${JSON.stringify(path.join(ROOT, "dist/site/build.js"))}).then((m) => m.buildSite({ recordsDir: ${JSON.stringify(records)}, outDir: ${JSON.stringify(outDir)}, quiet: true, audit: { draws: ${DRAWS} }, pageWorkers: 0 }))`;
  const r = spawnSync(process.execPath, ["--input-type=module", "-e", script], { cwd: ROOT, encoding: "utf8", env: { ...process.env, TMPDIR: childTmp } });
  expect(r.stderr).toBe("");
  expect(r.status).toBe(0);
}

function snapshot(dir: string): Map<string, string> {
  return new Map(listFiles(dir).map((f) => [f, readFileSync(path.join(dir, f)).toString("base64")]));
}

function differences(a: Map<string, string>, b: Map<string, string>): string[] {
  const out = new Set<string>();
  for (const [f, bytes] of a) if (b.get(f) !== bytes) out.add(f);
  for (const f of b.keys()) if (!a.has(f)) out.add(f);
  return [...out].sort();
}

describe("the compiled build on worker threads", () => {
  it("writes the site a build on one thread writes, and leaves no spill folder", () => {
    const workers = path.join(temp, "workers");
    const single = path.join(temp, "single");
    cli("build", records, "--out", workers, "--no-cache", "--draws", DRAWS, "--exit-zero", "--quiet");
    oneThread(single);
    expect(listFiles(workers).filter((f) => f.startsWith("objects/"))).toHaveLength(OBJECTS);
    expect(differences(snapshot(single), snapshot(workers))).toEqual([]);
    expect(readdirSync(childTmp).filter((n) => n.startsWith("steelyard-audits-"))).toEqual([]);
  });

  it("rebuilds after an edit from its cache to the bytes of a fresh build", () => {
    const cached = path.join(temp, "cached");
    const cache = path.join(temp, "cache");
    const fresh = path.join(temp, "fresh");
    cli("build", records, "--out", cached, "--cache-dir", cache, "--draws", DRAWS, "--exit-zero", "--quiet");
    // the cold build made the objects' audit JSON texts as the workers sent their audits in, and cleared them away
    const freshBefore = path.join(temp, "fresh-before");
    cli("build", records, "--out", freshBefore, "--no-cache", "--draws", DRAWS, "--exit-zero", "--quiet");
    expect(differences(snapshot(freshBefore), snapshot(cached))).toEqual([]);
    expect(readdirSync(childTmp).filter((n) => n.startsWith("steelyard-audit-json-"))).toEqual([]);
    editOnePublishedValue(records, 2);
    cli("build", records, "--out", cached, "--cache-dir", cache, "--draws", DRAWS, "--exit-zero", "--quiet");
    cli("build", records, "--out", fresh, "--no-cache", "--draws", DRAWS, "--exit-zero", "--quiet");
    expect(differences(snapshot(fresh), snapshot(cached))).toEqual([]);
    // the cache holds a blob file of audits beside each shard that has entries
    const store = readdirSync(cache).find((n) => n.startsWith("records-"))!;
    expect(readdirSync(path.join(cache, store)).some((n) => n.endsWith(".blobs"))).toBe(true);
  });

  it("checks on worker threads to the very JSON report that one thread gives, and leaves no spill folder", async () => {
    const stdout = checkJson(records);
    const want = [...reportJsonChunks(await runAudit(records, { draws: Number(DRAWS) }))].join("");
    expect(stdout).toBe(want);
    expect(readdirSync(childTmp).filter((n) => n.startsWith("steelyard-audits-"))).toEqual([]);
  });

  it("checks on worker threads, which read the files and send only summaries, to the report of one thread when records clash or break", async () => {
    // the same catalogue, with an id used twice, a file that is not YAML, a record that misses a field and a file over the size limit
    const mixed = path.join(temp, "mixed");
    cpSync(records, mixed, { recursive: true });
    const first = readFileSync(path.join(mixed, "000", "bnch-1.yaml"), "utf8");
    writeFileSync(path.join(mixed, "000", "bnch-1-again.yaml"), first);
    writeFileSync(path.join(mixed, "000", "broken.yaml"), "name: [unclosed\n");
    writeFileSync(path.join(mixed, "000", "no-measurements.yaml"), 'name: Lone\nid: "lone-1"\n');
    writeFileSync(path.join(mixed, "000", "too-large.yaml"), "# " + "x".repeat(1024 * 1024) + "\n");
    const stdout = checkJson(mixed);
    const report = await runAudit(mixed, { draws: Number(DRAWS) });
    expect(report.problems.map((p) => p.code)).toEqual(expect.arrayContaining(["duplicate-id"]));
    expect(report.problems.some((p) => p.file === "000/broken.yaml")).toBe(true);
    expect(report.problems.some((p) => p.file === "000/too-large.yaml")).toBe(true);
    expect(stdout).toBe([...reportJsonChunks(report)].join(""));
  });
});

