import path from "node:path";
import { runAudit } from "../audit/index.js";
import type { AuditReport } from "../audit/types.js";
import { ALL_CONSTANTS } from "../constants/sets.js";
import { METHODS } from "../methods/index.js";
import { normalizeBasePath } from "./base-path.js";
import type { EleventyConfigApi } from "./eleventy-config.js";
import { takePreparedSite } from "./handoff.js";
import { CONTENT_DIR, DEMO_RECORDS, KATEX_DIST } from "./paths.js";
import { buildSiteData, type SiteData } from "./site-data.js";
import { NUNJUCKS_OPTIONS, writeObjectPages, type ObjectPagesOutcome } from "./object-pages.js";
import { writeDownloads } from "./download-files.js";
import type { SiteCache } from "./handoff.js";
import { pageSite } from "./page-render.js";
import { katexStylesheetPath, siteKatexStylesheet } from "./katex-compact.js";
import type { PreviousAudit } from "./changes-view.js";
import { readAuditJson } from "../releases/read-audit-json.js";

export interface SteelyardPluginOptions {
  /** Folder of YAML records to audit. Default: the demo records in content/records. */
  readonly recordsDir?: string;
  /** Folder the site is served from, "/" or "/prefix/". Default "/". */
  readonly basePath?: string;
  /** An audit already run; when given, the records folder is not read. */
  readonly report?: AuditReport;
  /** Monte Carlo draws when the plugin runs the audit itself. */
  readonly draws?: number;
  /** An audit JSON of the previous release (downloads/audit.json); adds the changes page. */
  readonly compareTo?: string;
}

interface ResolvedOptions {
  readonly recordsDir: string;
  readonly basePath: string;
  readonly report?: AuditReport;
  readonly draws?: number;
  readonly previous?: PreviousAudit;
  readonly cache?: SiteCache;
  readonly pageWorkers?: number;
  readonly objectPagesWritten?: boolean;
}

function resolveOptions(options: SteelyardPluginOptions): ResolvedOptions {
  const prepared = takePreparedSite();
  const rawBase = prepared?.basePath ?? options.basePath ?? "/";
  const base = normalizeBasePath(rawBase);
  if (!base.ok) {
    const i = base.issues[0];
    throw new Error(`steelyard site: ${i.message}; ${i.hint ?? ""}`);
  }
  const report = prepared?.report ?? options.report;
  const out: { -readonly [K in keyof ResolvedOptions]: ResolvedOptions[K] } = {
    recordsDir: path.resolve(prepared?.recordsDir ?? options.recordsDir ?? DEMO_RECORDS),
    basePath: base.value,
  };
  if (report !== undefined) out.report = report;
  if (options.draws !== undefined) out.draws = options.draws;
  if (prepared?.cache) out.cache = prepared.cache;
  if (prepared?.pageWorkers !== undefined) out.pageWorkers = prepared.pageWorkers;
  if (prepared?.objectPagesWritten) out.objectPagesWritten = true;
  if (prepared?.previous) out.previous = prepared.previous;
  else if (!prepared && options.compareTo !== undefined) {
    const file = path.resolve(options.compareTo);
    out.previous = { path: file, audit: readAuditJson(file) };
  }
  return out;
}

/**
 * The steelyard site as one Eleventy plugin: the audit as global data
 * `steelyard`, the downloads as virtual templates, one audit page per object
 * (written after the build), the stylesheet, table script and KaTeX's fonts
 * as passthrough copies, and KaTeX's stylesheet rewritten for the short class
 * names of the equations (siteKatexStylesheet). Pages and layouts live in the
 * package's content/ folder.
 */
export function steelyardPlugin(eleventyConfig: EleventyConfigApi, options: SteelyardPluginOptions = {}): void {
  const resolved = resolveOptions(options);
  const { basePath } = resolved;

  let reportPromise: Promise<AuditReport> | undefined;
  const report = (): Promise<AuditReport> => {
    reportPromise ??= resolved.report
      ? Promise.resolve(resolved.report)
      : runAudit(resolved.recordsDir, resolved.draws !== undefined ? { draws: resolved.draws } : {});
    return reportPromise;
  };
  let dataPromise: Promise<SiteData> | undefined;
  const siteData = (): Promise<SiteData> => {
    dataPromise ??= report().then((r) =>
      buildSiteData({
        report: r,
        basePath,
        methods: METHODS,
        constants: ALL_CONSTANTS,
        ...(resolved.previous ? { previous: resolved.previous } : {}),
      }),
    );
    return dataPromise;
  };

  eleventyConfig.setNunjucksEnvironmentOptions({ ...NUNJUCKS_OPTIONS });
  eleventyConfig.setTemplateFormats(["njk", "11ty.js"]);
  // the demo records sit inside the pages folder; they are data, not pages
  eleventyConfig.ignores.add(path.join(CONTENT_DIR, "records", "**"));

  eleventyConfig.addGlobalData("steelyard", () => siteData());
  // under --serve or --watch, every rebuild audits the records again
  eleventyConfig.addWatchTarget?.(resolved.recordsDir);
  eleventyConfig.on("eleventy.before", () => {
    if (resolved.report === undefined) {
      reportPromise = undefined;
      dataPromise = undefined;
    }
  });

  // No filters: Eleventy reuses compiled templates (bound to the first build's
  // filters) across builds in one process, so whatever depends on the build,
  // such as the base path, is read from `steelyard` instead.

  // One page per object (see object-pages.ts), rendered on worker threads
  // while Eleventy builds its own pages, then the downloads, written here
  // rather than as Eleventy templates so the audit can be streamed to disk
  // and an unchanged download kept.
  const includesDir = path.join(CONTENT_DIR, "_includes");
  let pagesRun: Promise<ObjectPagesOutcome | undefined> | undefined;
  eleventyConfig.on("eleventy.before", (event: { directories?: { output?: string }; outputMode?: string }) => {
    const outDir = event.directories?.output;
    if (event.outputMode !== "fs" || !outDir) return;
    pagesRun = resolved.objectPagesWritten
      ? Promise.resolve(undefined)
      : siteData().then((data) =>
          writeObjectPages({
            includesDir,
            outDir: path.resolve(outDir),
            site: pageSite(data),
            objects: data.objects,
            problemsOf: data.problemsOf,
            ...(resolved.pageWorkers !== undefined ? { workers: resolved.pageWorkers } : {}),
          }),
        );
    // a failure is reported by the after hook, not as an unhandled rejection
    pagesRun.catch(() => undefined);
  });
  eleventyConfig.on("eleventy.after", async (event: { directories?: { output?: string }; outputMode?: string }) => {
    const outDir = event.directories?.output;
    if (event.outputMode !== "fs" || !outDir || !pagesRun) return;
    const run = pagesRun;
    pagesRun = undefined;
    await run;
    const cache = resolved.cache;
    // the manifest is saved by buildSite, once the whole build has succeeded
    writeDownloads(
      await report(),
      path.resolve(outDir),
      cache?.reportKey !== undefined
        ? { ...cache, reportKey: cache.reportKey }
        : undefined,
    );
  });

  // the changes page exists only when there is a previous release to compare with
  if (resolved.previous) {
    eleventyConfig.addTemplate("changes.njk", '{% include "changes-page.njk" %}\n', {
      layout: "base.njk",
      title: "Changes since the previous release",
      pageKind: "changes",
      permalink: "/changes/",
    });
  }

  eleventyConfig.addPassthroughCopy({ [path.join(CONTENT_DIR, "assets")]: "assets" });
  // KaTeX's style sheet with the short class names of the equations' HTML part (katex-classes.ts), beside its fonts
  eleventyConfig.addTemplate("katex-stylesheet.njk", "{{ stylesheet | safe }}", {
    permalink: `/${katexStylesheetPath()}`,
    stylesheet: siteKatexStylesheet(),
    eleventyExcludeFromCollections: true,
  });
  eleventyConfig.addPassthroughCopy({ [path.join(KATEX_DIST, "fonts")]: "assets/katex/fonts" });
}

export default steelyardPlugin;
