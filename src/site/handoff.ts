import type { ReuseBytes } from "./json-stream.js";
import type { AuditReport, ObjectAudit } from "../audit/types.js";
import type { PreviousAudit } from "./changes-view.js";
import type { OutputManifest } from "../cache/output-manifest.js";

/** What a cached build knows about its inputs, for keeping downloads that would come out the same. */
export interface SiteCache {
  /** What the last cached build wrote into this output folder (saved after the downloads). */
  readonly manifest: OutputManifest;
  /** The key of the whole report (every record file's key, in order); undefined when unknown. */
  readonly reportKey?: string;
  /** The content key of each object's record file: an object whose key the last build's audit JSON lists is copied from it. */
  readonly objectKeys?: ReadonlyMap<ObjectAudit, string>;
  /** Objects' audit JSON texts made during the audit, under the same keys, to copy where the last build's file has nothing to give. */
  readonly preparedAuditJson?: ReuseBytes;
}

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
  /** Reuse unchanged object pages and downloads (absent: write everything). */
  readonly cache?: SiteCache;
  /** Worker threads for the object pages (default os.availableParallelism(); 0: this thread). */
  readonly pageWorkers?: number;
  /** The object pages are already written (by the build pipeline): the plugin leaves them alone. */
  readonly objectPagesWritten?: boolean;
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
