import path from "node:path";
import Eleventy from "@11ty/eleventy";
import { runAudit, type RunOptions } from "../audit/index.js";
import type { AuditReport } from "../audit/types.js";
import { normalizeBasePath } from "./base-path.js";
import { offerPreparedSite, takePreparedSite } from "./handoff.js";
import { CONFIG_FILE, CONTENT_DIR } from "./paths.js";

export interface BuildSiteOptions {
  readonly recordsDir: string;
  readonly outDir: string;
  /** "/" (default) or "/prefix/". Check user input with normalizeBasePath first: a bad one throws here. */
  readonly basePath?: string;
  readonly quiet?: boolean;
  /** Audit settings (Monte Carlo draws, status thresholds); the engine's defaults when absent. */
  readonly audit?: RunOptions;
}

export interface RenderSiteOptions {
  readonly report: AuditReport;
  readonly outDir: string;
  readonly basePath?: string;
  readonly quiet?: boolean;
}

/** Renders an audit report into a static site; resolves to the number of HTML pages written. */
export async function renderSite(options: RenderSiteOptions): Promise<number> {
  const base = normalizeBasePath(options.basePath ?? "/");
  if (!base.ok) throw new Error(`buildSite: ${base.issues[0].message}; ${base.issues[0].hint ?? ""}`);
  offerPreparedSite({ report: options.report, basePath: base.value });
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
export async function buildSite(options: BuildSiteOptions): Promise<{ report: AuditReport; pages: number }> {
  const report = await runAudit(path.resolve(options.recordsDir), options.audit ?? {});
  const pages = await renderSite({
    report,
    outDir: options.outDir,
    ...(options.basePath !== undefined ? { basePath: options.basePath } : {}),
    ...(options.quiet !== undefined ? { quiet: options.quiet } : {}),
  });
  return { report, pages };
}
