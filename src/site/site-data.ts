import type { AuditReport, ObjectAudit } from "../audit/types.js";
import type { Problem } from "../problem.js";
import type { Constant } from "../constants/constant.js";
import type { MethodDefinition } from "../methods/method.js";
import { underBase } from "./base-path.js";
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
}

export interface SiteInputs {
  readonly report: AuditReport;
  readonly basePath: string;
  readonly methods: readonly MethodDefinition[];
  readonly constants: readonly Constant[];
  /** The previous release's audit, for the changes page. */
  readonly previous?: PreviousAudit;
}

/** homeRows(report, lookup), from each object's fragments. */
function homeRowsOf(report: AuditReport, lookup: MethodLookup): HomeRow[] {
  const rows: HomeRow[] = [];
  for (const o of report.objects) {
    const h = fragmentsOf(o).home;
    if (h === null) continue;
    // the fragment names methods from the registry; the site's own list decides
    const title = lookup(h.row.method)?.title ?? h.row.method;
    rows.push(title === h.methodTitle ? h : { ...h, methodTitle: title });
  }
  return rows;
}

export function buildSiteData(input: SiteInputs): SiteData {
  const { report } = input;
  const byId = new Map(input.methods.map((m) => [m.id, m]));
  const lookup: MethodLookup = (id) => byId.get(id);
  const byFile = problemsByFile(report.problems);
  return Object.freeze({
    basePath: input.basePath,
    version: report.tool.version,
    settings: report.settings,
    summary: report.summary,
    counts: statusCounts(report),
    statuses: [...STATUSES].map(statusView).sort((a, b) => b.rank - a.rank),
    rows: homeRowsOf(report, lookup),
    objects: report.objects,
    problems: problemsView(report, sortFlags(report.objects.map((o) => fragmentsOf(o).flags))),
    methods: methodsView(input.methods),
    constants: constantsView(input.constants),
    downloads: DOWNLOADS.map(({ key, path, title, format }) => ({ key, path, title, format })),
    objectPage: (obj: ObjectAudit) => objectPageView(obj, lookup, byFile.get(obj.file) ?? []),
    problemsOf: (file: string) => byFile.get(file) ?? [],
    link: (sitePath: string) => underBase(input.basePath, String(sitePath)),
    ...(input.previous ? { changes: changesView(report, input.previous) } : {}),
  });
}
