import type { AuditReport, ObjectAudit, Status } from "../audit/types.js";
import type { Problem } from "../problem.js";
import { formatZ } from "./display.js";
import { plainName } from "./object-view.js";
import { statusView, type StatusView } from "./status.js";
import { objectPath } from "./table.js";

/** A comparison in tension or discrepant, pointing at the measurement on its object's page. */
export interface FlagView {
  readonly objectId: string;
  readonly objectName: string;
  readonly page: string;
  readonly anchor: string;
  readonly measurement: string;
  readonly result: string;
  readonly z: string;
  readonly absZ: number;
  readonly status: StatusView;
}

export interface ProblemsView {
  readonly problems: readonly Problem[];
  readonly errors: number;
  readonly warnings: number;
  readonly flags: readonly FlagView[];
}

const FLAGGED: ReadonlySet<Status> = new Set<Status>(["tension", "discrepant"]);

/** One object's tension and discrepant comparisons, in the order of its measurements. */
export function objectFlags(obj: ObjectAudit): FlagView[] {
  const out: FlagView[] = [];
  // an object's status is the worst of its comparisons': the others have nothing flagged
  if (!FLAGGED.has(obj.status)) return out;
  for (const m of obj.measurements) {
    for (const c of Object.values(m.comparisons)) {
      if (!FLAGGED.has(c.status)) continue;
      out.push({
        objectId: obj.id,
        objectName: obj.name,
        page: objectPath(obj.id),
        anchor: `measurement-${m.key}`,
        measurement: m.key,
        result: plainName(c.result),
        z: formatZ(c.z),
        absZ: Math.abs(c.z),
        status: statusView(c.status),
      });
    }
  }
  return out;
}

/** The objects' flags (objectFlags, in report order) most serious first, then by |z|, then object id. */
export function sortFlags(perObject: ReadonlyArray<readonly FlagView[]>): FlagView[] {
  return perObject.flat().sort(
    (a, b) => b.status.rank - a.status.rank || b.absZ - a.absZ || (a.objectId < b.objectId ? -1 : a.objectId > b.objectId ? 1 : 0),
  );
}

/** Every tension or discrepant comparison, most serious first (then by |z|, then object id). */
export function flaggedComparisons(report: AuditReport): FlagView[] {
  return sortFlags(report.objects.map(objectFlags));
}

/** The problems page; `flags` as flaggedComparisons(report) gives them, when already at hand. */
export function problemsView(report: AuditReport, flags: readonly FlagView[] = flaggedComparisons(report)): ProblemsView {
  return {
    problems: report.problems,
    errors: report.problems.filter((p) => p.severity === "error").length,
    warnings: report.problems.filter((p) => p.severity === "warning").length,
    flags,
  };
}

/** Record problems grouped by file, for the object pages. */
export function problemsByFile(problems: readonly Problem[]): Map<string, Problem[]> {
  const out = new Map<string, Problem[]>();
  for (const p of problems) {
    const list = out.get(p.file);
    if (list) list.push(p);
    else out.set(p.file, [p]);
  }
  return out;
}
