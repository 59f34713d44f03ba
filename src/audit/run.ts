import { loadRecords } from "../records/load.js";
import { auditRecords, type RunOptions } from "./audit-records.js";
import type { AuditReport } from "./types.js";

/** Loads every record under `recordsDir` and audits it. */
export async function runAudit(recordsDir: string, options: RunOptions = {}): Promise<AuditReport> {
  const outcome = await loadRecords(recordsDir);
  return auditRecords(outcome, options);
}
