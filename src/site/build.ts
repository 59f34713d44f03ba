import path from "node:path";
import Eleventy from "@11ty/eleventy";
import { runAudit, type RunOptions } from "../audit/index.js";
import type { AuditReport } from "../audit/types.js";
import { normalizeBasePath } from "./base-path.js";
import { offerPreparedSite, takePreparedSite } from "./handoff.js";
import { CONFIG_FILE, CONTENT_DIR } from "./paths.js";
import type { Issue } from "../problem.js";
import { readAuditJson } from "../releases/read-audit-json.js";
import type { PreviousAudit } from "./changes-view.js";

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
}

export interface RenderSiteOptions {
  readonly report: AuditReport;
  readonly outDir: string;
  readonly basePath?: string;
  readonly quiet?: boolean;
  /** The previous release's audit, already read (see readPreviousAudit). */
  readonly previous?: PreviousAudit;
}

export interface BuildSiteOutcome {
  readonly report: AuditReport;
  readonly pages: number;
  /** Why the --compare-to file could not be used; empty when it was used or none was given. */
  readonly compareProblems: readonly Issue[];
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
  offerPreparedSite({ report: options.report, basePath: base.value, ...(options.previous ? { previous: options.previous } : {}) });
  try {
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

/** Audits `recordsDir` once and builds the site into `outDir`. */
export async function buildSite(options: BuildSiteOptions): Promise<BuildSiteOutcome> {
  const report = await runAudit(path.resolve(options.recordsDir), options.audit ?? {});
  const previous = options.compareTo !== undefined ? readPreviousAudit(options.compareTo) : undefined;
  const pages = await renderSite({
    report,
    outDir: options.outDir,
    ...(options.basePath !== undefined ? { basePath: options.basePath } : {}),
    ...(options.quiet !== undefined ? { quiet: options.quiet } : {}),
    ...(previous ? { previous } : {}),
  });
  return { report, pages, compareProblems: previous && !previous.audit.ok ? previous.audit.issues : [] };
}
