import type { AuditReport, ObjectAudit } from "../audit/types.js";
import type { Problem } from "../problem.js";
import type { Constant } from "../constants/constant.js";
import type { MethodDefinition } from "../methods/method.js";
import path from "node:path";
import { underBase } from "./base-path.js";
import { homeRowHtmlOf, type HomeRowRenderer } from "./home-rows.js";
import { createPageRenderer, pageSite } from "./page-render.js";
import { CONTENT_DIR } from "./paths.js";
import { katexStylesheetPath } from "./katex-compact.js";
import { constantsView, type ConstantView } from "./constants-view.js";
import { DOWNLOADS } from "./downloads.js";
import { fragmentsOf } from "./fragments.js";
import { statusCounts, type HomeRow, type StatusCount } from "./home-view.js";
import { methodsView, type MethodView } from "./methods-view.js";
import { objectPageView, type MethodLookup, type ObjectPageView } from "./object-view.js";
import { problemsByFile, problemsView, sortFlags, type ProblemsView } from "./problems-view.js";
import { STATUSES } from "../audit/types.js";
import { statusView, type StatusView } from "./status.js";
import { changesView, type ChangesView, type PreviousAudit } from "./changes-view.js";

/** Everything the pages read, as the global data value `steelyard`. */
export interface SiteData {
  readonly basePath: string;
  readonly version: string;
  readonly settings: AuditReport["settings"];
  readonly summary: AuditReport["summary"];
  readonly counts: readonly StatusCount[];
  readonly statuses: readonly StatusView[];
  readonly rows: readonly HomeRow[];
  /** The rows as the home table's HTML (see home-rows.ts), made when first read. */
  readonly homeRowsHtml: string;
  /** The report's objects, for one page each. */
  readonly objects: readonly ObjectAudit[];
  readonly problems: ProblemsView;
  readonly methods: readonly MethodView[];
  readonly constants: readonly ConstantView[];
  readonly downloads: ReadonlyArray<{ readonly key: string; readonly path: string; readonly title: string; readonly format: string }>;
  /** What changed since the previous release; undefined when no previous audit was given. */
  readonly changes?: ChangesView;
  /** The audit page of one object (built when its page is rendered). */
  objectPage(obj: ObjectAudit): ObjectPageView;
  /** The problems of one record file. */
  problemsOf(file: string): readonly Problem[];
  /** A site path under the base path: {{ steelyard.link("objects/x/") }}. */
  link(sitePath: string): string;
  /** The site path of the equations' style sheet (katexStylesheetPath). */
  readonly katexStylesheet: string;
}

export interface SiteInputs {
  readonly report: AuditReport;
  readonly basePath: string;
  readonly methods: readonly MethodDefinition[];
  readonly constants: readonly Constant[];
  /** The previous release's audit, for the changes page. */
  readonly previous?: PreviousAudit;
  /** Where the templates of the rows are (default: the site's own includes). */
  readonly includesDir?: string;
}

/** homeRows(report, lookup), from each object's fragments, each with its object and whether it is the fragment's own row. */
function homeRowsOf(report: AuditReport, lookup: MethodLookup): Array<{ obj: ObjectAudit; row: HomeRow; own: boolean }> {
  const rows: Array<{ obj: ObjectAudit; row: HomeRow; own: boolean }> = [];
  for (const o of report.objects) {
    const h = fragmentsOf(o).home;
    if (h === null) continue;
    // the fragment names methods from the registry; the site's own list decides
    const title = lookup(h.row.method)?.title ?? h.row.method;
    rows.push(title === h.methodTitle ? { obj: o, row: h, own: true } : { obj: o, row: { ...h, methodTitle: title }, own: false });
  }
  return rows;
}

/** The rows' HTML: each object's own row as adopted for this base path, the others rendered now. */
function homeRowsHtmlOf(rows: ReadonlyArray<{ obj: ObjectAudit; row: HomeRow; own: boolean }>, basePath: string, renderer: () => HomeRowRenderer): string {
  let render: HomeRowRenderer | undefined;
  const parts: string[] = new Array(rows.length);
  rows.forEach(({ obj, row, own }, i) => {
    const html = own ? homeRowHtmlOf(obj, basePath) : undefined;
    parts[i] = html ?? (render ??= renderer())(row);
  });
  return parts.join("");
}

export function buildSiteData(input: SiteInputs): SiteData {
  const { report } = input;
  const byId = new Map(input.methods.map((m) => [m.id, m]));
  const lookup: MethodLookup = (id) => byId.get(id);
  const byFile = problemsByFile(report.problems);
  const homeRows = homeRowsOf(report, lookup);
  let rowsHtml: string | undefined;
  const includesDir = input.includesDir ?? path.join(CONTENT_DIR, "_includes");
  return Object.freeze({
    basePath: input.basePath,
    version: report.tool.version,
    settings: report.settings,
    summary: report.summary,
    counts: statusCounts(report),
    statuses: [...STATUSES].map(statusView).sort((a, b) => b.rank - a.rank),
    rows: homeRows.map((r) => r.row),
    get homeRowsHtml(): string {
      // the rows no build worker made go through the object pages' renderer, as on a worker
      const site = () => pageSite({ basePath: input.basePath, version: report.tool.version, settings: report.settings, changes: input.previous });
      rowsHtml ??= homeRowsHtmlOf(homeRows, input.basePath, () => createPageRenderer(includesDir, site()).homeRow);
      return rowsHtml;
    },
    objects: report.objects,
    problems: problemsView(report, sortFlags(report.objects.map((o) => fragmentsOf(o).flags))),
    methods: methodsView(input.methods),
    constants: constantsView(input.constants),
    downloads: DOWNLOADS.map(({ key, path, title, format }) => ({ key, path, title, format })),
    objectPage: (obj: ObjectAudit) => objectPageView(obj, lookup, byFile.get(obj.file) ?? []),
    problemsOf: (file: string) => byFile.get(file) ?? [],
    link: (sitePath: string) => underBase(input.basePath, String(sitePath)),
    katexStylesheet: katexStylesheetPath(),
    ...(input.previous ? { changes: changesView(report, input.previous) } : {}),
  });
}
