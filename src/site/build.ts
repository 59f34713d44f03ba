import path from "node:path";
import type { RunOptions } from "../audit/index.js";
import type { AuditReport } from "../audit/types.js";
import { normalizeBasePath } from "./base-path.js";
import { offerPreparedSite, takePreparedSite, type SiteCache } from "./handoff.js";
import { recordStoreState } from "../cache/record-store.js";
import { keyRecordFolder, pageSiteKey, readRecordCache, recordCacheFolder, reportFromEntries, reportSettings, runPipeline, type PipelineStats } from "../build/pipeline.js";
import { exitCodeFor } from "../audit/audit-records.js";
import { digest } from "../cache/digest.js";
import { folderDigest } from "../cache/fingerprint.js";
import { readFileSync } from "node:fs";
import type { PageSite } from "./page-render.js";
import { VERSION } from "../version.js";
import { cacheFileFor } from "../cache/cache-dir.js";
import { OutputManifest } from "../cache/output-manifest.js";
import { CONFIG_FILE, CONTENT_DIR, PACKAGE_ROOT } from "./paths.js";
import type { Issue } from "../problem.js";
import { readAuditJson } from "../releases/read-audit-json.js";
import type { PreviousAudit } from "./changes-view.js";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import { PreparedElements, type ReuseBytes } from "./json-stream.js";
import { AUDIT_JSON_PAD, AUDIT_JSON_PATH } from "./downloads.js";
import { auditJsonText } from "../cache/lazy-audit.js";
import type { RecordEntry } from "../build/record-work.js";
import { loadRenderStore, saveRenderStore } from "./render-store.js";

export interface BuildSiteOptions {
  readonly recordsDir: string;
  readonly outDir: string;
  /** "/" (default) or "/prefix/". Check user input with normalizeBasePath first: a bad one throws here. */
  readonly basePath?: string;
  readonly quiet?: boolean;
  /** Audit settings (Monte Carlo draws, status thresholds); the engine's defaults when absent. */
  readonly audit?: RunOptions;
  /**
   * The audit JSON of the previous release (its downloads/audit.json): adds a
   * changes page. A file that cannot be read or is not an audit does not stop
   * the build; its problems are shown on that page and returned.
   */
  readonly compareTo?: string;
  /**
   * Folder of the build cache: record files and object pages that have not
   * changed are neither audited nor written again. Absent: no cache.
   */
  readonly cacheDir?: string;
  /** Worker threads for the object pages; default os.availableParallelism(), 0 renders on this thread. */
  readonly pageWorkers?: number;
}

export interface RenderSiteOptions {
  readonly report: AuditReport;
  readonly outDir: string;
  readonly basePath?: string;
  readonly quiet?: boolean;
  /** The previous release's audit, already read (see readPreviousAudit). */
  readonly previous?: PreviousAudit;
  /** Reuse unchanged pages and downloads (see buildSite's cacheDir). */
  readonly cache?: SiteCache;
  readonly pageWorkers?: number;
  /** The object pages are already written (buildSite's pipeline does this). */
  readonly objectPagesWritten?: boolean;
}

export interface BuildSiteOutcome {
  readonly report: AuditReport;
  readonly pages: number;
  /** Why the --compare-to file could not be used; empty when it was used or none was given. */
  readonly compareProblems: readonly Issue[];
  /** Record files reused and audited, object pages written, kept and removed. */
  readonly stats: PipelineStats;
  readonly summary: AuditReport["summary"];
  readonly problemCount: number;
  /** As exitCodeFor(report). */
  readonly exitCode: number;
}

/** Reads the previous release's audit JSON; never throws (a bad file gives issues). */
export function readPreviousAudit(file: string): PreviousAudit {
  const full = path.resolve(file);
  return { path: full, audit: readAuditJson(full) };
}

/** Renders an audit report into a static site; resolves to the number of HTML pages written. */
export async function renderSite(options: RenderSiteOptions): Promise<number> {
  const base = normalizeBasePath(options.basePath ?? "/");
  if (!base.ok) throw new Error(`buildSite: ${base.issues[0].message}; ${base.issues[0].hint ?? ""}`);
  offerPreparedSite({
    report: options.report,
    basePath: base.value,
    ...(options.previous ? { previous: options.previous } : {}),
    ...(options.cache ? { cache: options.cache } : {}),
    ...(options.pageWorkers !== undefined ? { pageWorkers: options.pageWorkers } : {}),
    ...(options.objectPagesWritten ? { objectPagesWritten: true } : {}),
  });
  try {
    // loaded here, not at the top: a build with nothing to do never needs it
    const { default: Eleventy } = await importEleventy();
    const eleventy = new Eleventy(CONTENT_DIR, path.resolve(options.outDir), {
      configPath: CONFIG_FILE,
      pathPrefix: base.value,
      quietMode: options.quiet ?? true,
    });
    // quiet also drops the summary line Eleventy prints even in quiet mode; failures still reject
    if (options.quiet ?? true) eleventy.disableLogger();
    const [, templates] = await eleventy.write();
    const sitePages = templates.filter((t) => typeof t.outputPath === "string" && t.outputPath.endsWith(".html")).length;
    // the object pages are written by the plugin after Eleventy's own (it throws if one fails)
    return sitePages + options.report.objects.length;
  } finally {
    // if Eleventy failed before the plugin ran, do not leave the report for the next build
    takePreparedSite();
  }
}

/** What the command line reports of a build, kept with its stamp so that a build with nothing to do can say it again. */
interface BuildTold {
  readonly pages: number;
  readonly summary: AuditReport["summary"];
  readonly problemCount: number;
  readonly exitCode: number;
  readonly compareProblems: readonly Issue[];
}

function fileDigest(file: string): string {
  try {
    return digest([readFileSync(file)]);
  } catch {
    return "missing";
  }
}

function outcomeOf(told: BuildTold, stats: PipelineStats, report: () => AuditReport): BuildSiteOutcome {
  let cached: AuditReport | undefined;
  return {
    get report() {
      cached ??= report();
      return cached;
    },
    pages: told.pages,
    compareProblems: told.compareProblems,
    stats,
    summary: told.summary,
    problemCount: told.problemCount,
    exitCode: told.exitCode,
  };
}

/**
 * Audits `recordsDir` once and builds the site into `outDir`: the record
 * files are audited and their object pages written by the build pipeline
 * (worker threads for large runs, the cache when `cacheDir` is given), then
 * Eleventy builds the other pages and the plugin writes the downloads.
 *
 * With a cache, a build whose inputs (every record file's bytes, the
 * settings, the base path, the previous release's audit, the templates and
 * assets, the tool and its locked dependencies) are those of the last build
 * into the same folder, and whose output files are all as that build left
 * them, writes nothing; its report is read from the cache only if asked for.
 */
export async function buildSite(options: BuildSiteOptions): Promise<BuildSiteOutcome> {
  const outDir = path.resolve(options.outDir);
  const base = normalizeBasePath(options.basePath ?? "/");
  if (!base.ok) throw new Error(`buildSite: ${base.issues[0].message}; ${base.issues[0].hint ?? ""}`);
  const audit = options.audit ?? {};
  const site: PageSite = { basePath: base.value, version: VERSION, settings: reportSettings(audit), hasChanges: options.compareTo !== undefined };
  const includesDir = path.join(CONTENT_DIR, "_includes");
  const cacheDir = options.cacheDir;
  const manifest = cacheDir !== undefined ? new OutputManifest(cacheFileFor(cacheDir, "site", outDir), outDir) : undefined;
  const recordsCache = cacheDir !== undefined ? recordCacheFolder(cacheDir, options.recordsDir) : undefined;

  const keyed = cacheDir !== undefined ? await keyRecordFolder(options.recordsDir, audit, cacheDir) : undefined;
  let stampKey: string | undefined;
  if (manifest && keyed?.reportKey !== undefined && recordsCache) {
    stampKey = digest([
      keyed.reportKey,
      pageSiteKey(includesDir, site),
      folderDigest(CONTENT_DIR, () => true),
      options.compareTo !== undefined ? fileDigest(path.resolve(options.compareTo)) : "no previous release",
      fileDigest(path.join(PACKAGE_ROOT, "package-lock.json")),
    ]);
    const last = manifest.previousStamp;
    if (last && last.key === stampKey && last.recordsCache === recordStoreState(recordsCache) && manifest.lastBuildUntouched()) {
      const told = last.outcome as BuildTold;
      const stats = { files: keyed.files.length, reused: keyed.files.length, audited: 0, pagesWritten: 0, pagesKept: told.summary.objects, pagesRemoved: 0 };
      return outcomeOf(told, stats, () => {
        const byFile = readRecordCache(cacheDir!, options.recordsDir);
        const entries = keyed.files.map((f) => {
          const e = byFile.get(f);
          if (!e) throw new Error(`buildSite: the cache lost the entry of ${f} after the build was found unchanged; build again`);
          return e;
        });
        return reportFromEntries(keyed.files, entries, audit).report;
      });
    }
  }

  const previous = options.compareTo !== undefined ? readPreviousAudit(options.compareTo) : undefined;
  // the equation shapes and compiled templates of earlier builds: this build typesets and compiles only what is new
  const rendering = cacheDir !== undefined ? loadRenderStore(cacheDir) : undefined;
  // Eleventy's modules load while the workers audit (this thread waits on them then); renderSite imports the same module
  importEleventy().catch(() => undefined);
  // With nothing to copy from the last build's audit JSON, each audited object's text in it is made
  // as the object comes in from a worker, while this thread waits, instead of after the audit.
  const prepared = manifest && !manifest.previousSegments(AUDIT_JSON_PATH) ? preparedAuditJson() : undefined;
  let pages: number;
  let run: Awaited<ReturnType<typeof runPipeline>>;
  try {
    run = await runPipeline(
      options.recordsDir,
      {
        audit,
        ...(cacheDir !== undefined ? { cacheDir } : {}),
        pages: { includesDir, outDir, site, ...(manifest ? { manifest } : {}) },
        ...(options.pageWorkers !== undefined ? { workers: options.pageWorkers } : {}),
        ...(prepared ? { onAudited: prepared.add } : {}),
      },
      keyed,
    );
    const cache: SiteCache | undefined = manifest
      ? {
          manifest,
          ...(run.reportKey !== undefined ? { reportKey: run.reportKey } : {}),
          ...(run.objectKeys ? { objectKeys: run.objectKeys } : {}),
          ...(prepared ? { preparedAuditJson: prepared.close() } : {}),
        }
      : undefined;
    pages = await renderSite({
      report: run.report,
      outDir,
      basePath: base.value,
      ...(options.quiet !== undefined ? { quiet: options.quiet } : {}),
      ...(previous ? { previous } : {}),
      ...(cache ? { cache } : {}),
      objectPagesWritten: true,
    });
  } finally {
    prepared?.remove();
  }
  const { report } = run;
  // with what this thread typeset and the workers sent (the site's other pages are written by now)
  if (rendering) saveRenderStore(rendering);
  const told: BuildTold = {
    pages,
    summary: report.summary,
    problemCount: report.problems.length,
    exitCode: exitCodeFor(report),
    compareProblems: previous && !previous.audit.ok ? previous.audit.issues : [],
  };
  if (manifest) {
    // a stamp only when the report's key is the one checked above (no file changed meanwhile)
    if (stampKey !== undefined && recordsCache && run.reportKey === keyed?.reportKey) {
      manifest.setStamp({ key: stampKey, recordsCache: recordStoreState(recordsCache), outcome: told });
    }
    manifest.trackRest("objects");
    try {
      manifest.save();
    } catch {
      // a manifest that cannot be written only makes the next build slower
    }
  }
  return outcomeOf(told, run.stats, () => report);
}

/** A temporary file of audit JSON texts, keyed by record file key, filled as entries are audited. */
function preparedAuditJson(): { add: (entries: readonly RecordEntry[]) => void; close: () => ReuseBytes; remove: () => void } {
  const dir = mkdtempSync(path.join(os.tmpdir(), "steelyard-audit-json-"));
  const remove = (): void => rmSync(dir, { recursive: true, force: true });
  let texts: PreparedElements;
  try {
    texts = new PreparedElements(path.join(dir, "objects.json"), AUDIT_JSON_PAD);
  } catch (error) {
    remove();
    throw error;
  }
  return {
    add: (entries) => {
      for (const e of entries) if (e.key !== "" && e.audit?.object) texts.add(e.key, auditJsonText(e.audit.object));
    },
    close: () => texts.close(),
    remove: () => {
      texts.close();
      remove();
    },
  };
}

/**
 * Eleventy's module, loaded once per process. On Node 20 Eleventy registers
 * an ESM resolve hook (module.register) that busts the import cache of
 * JavaScript files changed while it watches or serves; every later import
 * then goes through a loader thread. A steelyard build never watches, and its
 * plugin gets each build's data through the handoff, not a fresh import, so
 * the hook is skipped with the switch Eleventy documents for it, unless the
 * environment already sets that switch. (About 60 ms of a one-record rebuild.)
 */
function importEleventy(): Promise<typeof import("@11ty/eleventy")> {
  process.env.ELEVENTY_SKIP_ESM_RESOLVER ??= "1";
  return import("@11ty/eleventy");
}
