import { existsSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import { auditRecords, auditRecordsParallel } from "../../src/audit/audit-records.js";
import { loadRecords } from "../../src/records/load.js";
import type { LoadOutcome } from "../../src/records/types.js";
import { defaultWorkerUrl, startMonteCarloPool } from "../../src/uncertainty/monte-carlo-pool.js";

/**
 * The worker pool must give the very numbers one thread gives: the audit
 * report of the same records, byte for byte, whichever path ran the draws.
 *
 * Worker threads run compiled JavaScript, so the pool itself is exercised
 * through dist/ (the project is compiled before the tests, as the
 * command-line tests need too); from the TypeScript sources, as here under the
 * test runner, the pool does not start and the audit stays on this thread.
 */

const DIST = path.resolve("dist");
const WORKER = path.join(DIST, "uncertainty/monte-carlo-worker.js");

type AuditModule = typeof import("../../src/audit/audit-records.js");
type LoadModule = typeof import("../../src/records/load.js");
type PoolModule = typeof import("../../src/uncertainty/monte-carlo-pool.js");
type MonteCarloModule = typeof import("../../src/uncertainty/monte-carlo.js");
type MethodsModule = typeof import("../../src/methods/index.js");

async function compiled<T>(relative: string): Promise<T> {
  const file = path.join(DIST, relative);
  if (!existsSync(file)) throw new Error(`${file} is missing: compile the project first (npx tsc -p .)`);
  return (await import(pathToFileURL(file).href)) as T;
}

const RECORD_DIRS = ["content/records", "test/fixtures/audit/records", "test/fixtures/site/records"];

/** Every record of the demo and the fixtures in one outcome, ids kept apart by folder. */
async function allRecords(load: LoadModule["loadRecords"]): Promise<LoadOutcome> {
  const outcomes = await Promise.all(RECORD_DIRS.map((dir) => load(path.resolve(dir))));
  return {
    records: outcomes.flatMap((o) => o.records),
    problems: outcomes.flatMap((o) => o.problems),
    files: outcomes.flatMap((o) => o.files),
    filesWithErrors: outcomes.flatMap((o) => o.filesWithErrors),
  };
}

describe("Monte Carlo pool, from the TypeScript sources", () => {
  it("finds no compiled worker beside the sources, so it does not start", () => {
    expect(defaultWorkerUrl()).toBeUndefined();
    expect(startMonteCarloPool([{ method: "relative-orbit", inputs: [], draws: 1, seed: 1 }])).toBeUndefined();
  });

  it("falls back to one thread with the same report", async () => {
    const outcome = await loadRecords(path.resolve("test/fixtures/audit/records"));
    const serial = auditRecords(outcome, { draws: 500 });
    const parallel = await auditRecordsParallel(outcome, { draws: 500 }, { minDraws: 0 });
    expect(JSON.stringify(parallel)).toBe(JSON.stringify(serial));
  });
});

describe("Monte Carlo pool, compiled", () => {
  let audit: AuditModule;
  let outcome: LoadOutcome;

  beforeAll(async () => {
    audit = await compiled<AuditModule>("audit/audit-records.js");
    const load = await compiled<LoadModule>("records/load.js");
    outcome = await allRecords(load.loadRecords);
  });

  it("has a compiled worker", () => {
    expect(existsSync(WORKER)).toBe(true);
  });

  it("gives a byte-identical audit report on worker threads and on one thread", async () => {
    expect(outcome.records.length).toBeGreaterThan(40);
    const options = { draws: 3000 };
    const serial = JSON.stringify(audit.auditRecords(outcome, options));
    for (const workers of [1, 2, 3]) {
      const parallel = JSON.stringify(await audit.auditRecordsParallel(outcome, options, { minDraws: 0, workers, chunk: 5 }));
      expect(parallel.length, `${workers} workers`).toBe(serial.length);
      expect(parallel === serial, `${workers} workers`).toBe(true);
    }
    // and the report does hold Monte Carlo results
    expect(serial).toContain('"median_si"');
  });

  it("stays on one thread below the size limit, with the same report", async () => {
    const small = { ...outcome, records: outcome.records.slice(0, 3) };
    const serial = JSON.stringify(audit.auditRecords(small, { draws: 200 }));
    expect(JSON.stringify(await audit.auditRecordsParallel(small, { draws: 200 }))).toBe(serial);
    expect(JSON.stringify(await audit.auditRecordsParallel(small, { draws: 0 }, { minDraws: 0 }))).toBe(
      JSON.stringify(audit.auditRecords(small, { draws: 0 })),
    );
  });

  it("returns the runs in job order, as one thread computes them", async () => {
    const pool = await compiled<PoolModule>("uncertainty/monte-carlo-pool.js");
    const mc = await compiled<MonteCarloModule>("uncertainty/monte-carlo.js");
    const methods = await compiled<MethodsModule>("methods/index.js");
    const jobs = Array.from({ length: 37 }, (_, k) => ({
      method: k % 2 === 0 ? "circular-velocity" : "single-lined",
      inputs:
        k % 2 === 0
          ? [
              { slot: "radius", value: 2.5e20, plus: 1e19, minus: 1e19 },
              { slot: "velocity", value: 2.2e5, plus: 5e3, minus: 4e3 },
            ]
          : [
              { slot: "k1", value: 50 + k, plus: 2, minus: 2 },
              { slot: "period", value: 4e5, plus: 10, minus: 10 },
              { slot: "primary_mass", value: 1.3e20, plus: 5e18, minus: 5e18 },
            ],
      draws: 700 + k,
      seed: 1000 + k,
    }));
    const runs = await pool.startMonteCarloPool(jobs, { workers: 3, chunk: 4 })!;
    const serial = jobs.map((j) => mc.runMonteCarlo(methods.getMethod(j.method)!, j.inputs, j.draws, j.seed));
    expect(runs).toEqual(serial);
    expect(runs.map((r) => r.draws)).toEqual(jobs.map((j) => j.draws));
  });

  it("rejects when a worker fails", async () => {
    const pool = await compiled<PoolModule>("uncertainty/monte-carlo-pool.js");
    const bad = [{ method: "no-such-method", inputs: [], draws: 10, seed: 1 }];
    await expect(pool.startMonteCarloPool(bad, { workers: 1 })!).rejects.toThrow(/unknown method no-such-method/);
  });
});
