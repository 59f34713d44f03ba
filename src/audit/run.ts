import { loadRecords } from "../records/load.js";
import { auditRecordsParallel, type RunOptions } from "./audit-records.js";
import type { AuditReport } from "./types.js";

/** Loads every record under `recordsDir` and audits it, with the Monte Carlo of large runs on worker threads. */
export async function runAudit(recordsDir: string, options: RunOptions = {}): Promise<AuditReport> {
  const outcome = await loadRecords(recordsDir);
  return auditRecordsParallel(outcome, options);
}
