import type { AuditReport } from "../audit/types.js";
import type { PreviousAudit } from "./changes-view.js";

/**
 * buildSite runs the audit once, then has Eleventy load the configuration
 * file, whose plugin would otherwise run the audit again. The prepared report
 * is handed over through one process-wide slot (a registered symbol, so the
 * compiled plugin and the source build share it) and taken exactly once.
 */
export interface PreparedSite {
  readonly report: AuditReport;
  readonly basePath: string;
  readonly recordsDir?: string;
  /** The previous release's audit, already read, for the changes page. */
  readonly previous?: PreviousAudit;
}

const SLOT = Symbol.for("steelyard.site.prepared");

type Holder = { [SLOT]?: PreparedSite };

export function offerPreparedSite(site: PreparedSite): void {
  const holder = globalThis as Holder;
  if (holder[SLOT] !== undefined) throw new Error("a prepared site is already waiting: builds must not overlap in one process");
  holder[SLOT] = site;
}

/** The prepared site, if one is waiting; the slot is emptied. */
export function takePreparedSite(): PreparedSite | undefined {
  const holder = globalThis as Holder;
  const site = holder[SLOT];
  delete holder[SLOT];
  return site;
}
