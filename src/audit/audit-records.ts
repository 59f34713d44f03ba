import { DEFAULT_SET } from "../constants/sets.js";
import { getMethod } from "../methods/index.js";
import type { Problem } from "../problem.js";
import type { LoadOutcome } from "../records/types.js";
import type { MethodDefinition } from "../methods/method.js";
import type { MonteCarloJob } from "../uncertainty/monte-carlo-job.js";
import { startMonteCarloPool, type PoolOptions } from "../uncertainty/monte-carlo-pool.js";
import { auditMeasurement, auditWithoutDraws, monteCarloJob, withMonteCarlo, type AuditOptions } from "./audit-measurement.js";
import { DEFAULT_THRESHOLDS, worstStatus } from "./compare.js";
import { STATUSES, type AuditReport, type MeasurementAudit, type ObjectAudit, type Status } from "./types.js";
import { VERSION } from "../version.js";
import { diagnose } from "../diagnosis/diagnose.js";
import { combineObject } from "../combine/combine-object.js";

export const DEFAULT_DRAWS = 20_000;

export interface RunOptions {
  readonly draws?: number;
  readonly thresholds?: Partial<AuditOptions["thresholds"]>;
}

function resolveOptions(options: RunOptions = {}): AuditOptions {
  return {
    draws: options.draws ?? DEFAULT_DRAWS,
    thresholds: { ...DEFAULT_THRESHOLDS, ...(options.thresholds ?? {}) },
    constants: DEFAULT_SET,
  };
}

function allFinite(m: MeasurementAudit): boolean {
  return Object.values(m.results).every((r) => Number.isFinite(r.value_si) && Number.isFinite(r.sigma_si));
}

interface PlannedMeasurement {
  readonly record: LoadOutcome["records"][number];
  readonly m: LoadOutcome["records"][number]["measurements"][number];
  readonly method: MethodDefinition;
}

function planMeasurements(outcome: LoadOutcome): PlannedMeasurement[] {
  const planned: PlannedMeasurement[] = [];
  for (const record of outcome.records) {
    for (const m of record.measurements) {
      const method = getMethod(m.method);
      if (!method) throw new Error(`record ${record.id}: method ${m.method} passed the loader but is not registered`);
      planned.push({ record, m, method });
    }
  }
  return planned;
}

/** Audits every valid measurement of the loaded records; record problems pass through untouched. */
export function auditRecords(outcome: LoadOutcome, options: RunOptions = {}): AuditReport {
  const resolved = resolveOptions(options);
  const planned = planMeasurements(outcome);
  const audits = planned.map(({ record, m, method }) => auditMeasurement(record.id, method, m, resolved));
  return assembleReport(outcome, resolved, planned, audits);
}

export interface ParallelOptions extends PoolOptions {
  /** Fewer draws than this in all (measurements × draws) run on this thread; default 10 000 000. */
  readonly minDraws?: number;
}

export const PARALLEL_MIN_DRAWS = 10_000_000;

/**
 * As `auditRecords`, with the Monte Carlo of large runs on worker threads
 * while this thread audits everything else; the report is identical. Small
 * runs, and runs where no compiled worker is available, stay on this thread.
 */
export async function auditRecordsParallel(outcome: LoadOutcome, options: RunOptions = {}, parallel: ParallelOptions = {}): Promise<AuditReport> {
  const resolved = resolveOptions(options);
  const planned = planMeasurements(outcome);
  const jobs = planned.map(({ record, m, method }) => monteCarloJob(record.id, method, m, resolved));
  const sent = jobs.filter((j): j is MonteCarloJob => j !== undefined);
  const total = sent.reduce((sum, j) => sum + j.draws, 0);
  const pool = total >= (parallel.minDraws ?? PARALLEL_MIN_DRAWS) && sent.length > 0 ? startMonteCarloPool(sent, parallel) : undefined;
  if (!pool) return auditRecords(outcome, options);
  // everything but the draws, while the workers draw
  const partial = planned.map(({ record, m, method }) => auditWithoutDraws(record.id, method, m, resolved));
  const runs = await pool;
  let k = 0;
  const audits = partial.map((audit, i) => {
    const job = jobs[i];
    return job ? withMonteCarlo(audit, runs[k++], planned[i].method, resolved) : audit;
  });
  return assembleReport(outcome, resolved, planned, audits);
}

function assembleReport(
  outcome: LoadOutcome,
  resolved: AuditOptions,
  planned: readonly PlannedMeasurement[],
  audits: readonly MeasurementAudit[],
): AuditReport {
  const problems: Problem[] = [...outcome.problems];
  const objects: ObjectAudit[] = [];
  const counts = Object.fromEntries(STATUSES.map((s) => [s, 0])) as Record<Status, number>;
  let measurementCount = 0;
  let next = 0;
  for (const record of outcome.records) {
    const measurements: MeasurementAudit[] = [];
    record.measurements.forEach((m) => {
      const { method } = planned[next];
      const audit = audits[next++];
      if (!allFinite(audit)) {
        problems.push({
          code: "not-computable",
          severity: "error",
          file: record.file,
          line: m.location.line,
          column: m.location.column,
          path: `measurements[${m.key}]`,
          message: `measurement ${m.key} gives a result that is not a finite number`,
          hint: "check the inputs' units and magnitudes; a value may overflow or vanish",
        });
        return;
      }
      const diagnoses = diagnose(method, m, audit, resolved.thresholds, resolved.constants);
      measurements.push(diagnoses.length > 0 ? { ...audit, diagnoses } : audit);
    });
    if (measurements.length === 0) continue;
    for (const m of measurements) counts[m.status]++;
    measurementCount += measurements.length;
    const object = {
      id: record.id,
      name: record.name,
      file: record.file,
      aliases: record.aliases,
      ...(record.notes !== undefined ? { notes: record.notes } : {}),
      status: worstStatus(measurements.map((m) => m.status)),
      measurements,
    };
    objects.push({ ...object, combined: combineObject({ ...object, combined: {} }) });
  }
  problems.sort(
    (a, b) =>
      (a.file < b.file ? -1 : a.file > b.file ? 1 : 0) ||
      a.line - b.line ||
      a.column - b.column ||
      (a.code < b.code ? -1 : a.code > b.code ? 1 : 0),
  );
  const withErrors = new Set(outcome.filesWithErrors);
  for (const p of problems) if (p.severity === "error") withErrors.add(p.file);
  return {
    tool: { name: "steelyard", version: VERSION },
    settings: { thresholds: resolved.thresholds, draws: resolved.draws, constants: DEFAULT_SET.id },
    summary: {
      files: outcome.files.length,
      files_audited: new Set(objects.map((o) => o.file)).size,
      files_with_problems: withErrors.size,
      objects: objects.length,
      measurements: measurementCount,
      status_counts: counts,
    },
    objects,
    problems,
  };
}

/** Exit code of `check` and `build`: 2 when any record has an error, else 1 when anything is discrepant, else 0. */
export function exitCodeFor(report: AuditReport): number {
  if (report.problems.some((p) => p.severity === "error")) return 2;
  if (report.summary.status_counts.discrepant > 0) return 1;
  return 0;
}
