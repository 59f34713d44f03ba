import type { AuditReport, Status } from "../audit/types.js";
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

/** Every tension or discrepant comparison, most serious first (then by |z|, then object id). */
export function flaggedComparisons(report: AuditReport): FlagView[] {
  const out: FlagView[] = [];
  for (const obj of report.objects) {
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
  }
  return out.sort(
    (a, b) => b.status.rank - a.status.rank || b.absZ - a.absZ || (a.objectId < b.objectId ? -1 : a.objectId > b.objectId ? 1 : 0),
  );
}

export function problemsView(report: AuditReport): ProblemsView {
  return {
    problems: report.problems,
    errors: report.problems.filter((p) => p.severity === "error").length,
    warnings: report.problems.filter((p) => p.severity === "warning").length,
    flags: flaggedComparisons(report),
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
