import type { Diagnosis, Explanation } from "../diagnosis/types.js";
import { getHypothesis } from "../diagnosis/hypotheses.js";
import { formatRatio, formatZ } from "./display.js";
import { statusView, type StatusView } from "./status.js";

/**
 * The "likely causes" of one flagged comparison, as its result section shows
 * them: the slips that reconcile the published value, best first, or the
 * sentence that none does, and the list of slips tried. Every text is plain
 * (templates escape it).
 */
export interface CauseView {
  readonly hypothesis: string;
  readonly title: string;
  readonly description: string;
  /** "value" or "uncertainty" (the slip explains an understated published σ, not the value). */
  readonly kind: Explanation["kind"];
  readonly zAfter: string;
  readonly statusAfter: StatusView;
  /** published / recomputed, as a ratio. */
  readonly factor: string;
  /** recomputed after the slip / recomputed. */
  readonly slipFactor: string;
}

export interface TriedView {
  readonly hypothesis: string;
  readonly title: string;
  /** Whether this slip is one of the causes listed. */
  readonly matched: boolean;
}

export interface DiagnosisView {
  readonly result: string;
  readonly z: string;
  readonly status: StatusView;
  readonly unexplained: boolean;
  readonly summary: string;
  /** Best first, as the diagnosis ranks them. */
  readonly causes: readonly CauseView[];
  /** Sorted by title. */
  readonly tried: readonly TriedView[];
}

/** The title a page shows for a hypothesis id; the id itself when the list no longer holds it (an older audit). */
export function hypothesisTitle(id: string): string {
  return getHypothesis(id)?.title ?? id;
}

function causeView(e: Explanation): CauseView {
  return {
    hypothesis: e.hypothesis,
    title: e.title,
    description: e.description,
    kind: e.kind,
    zAfter: formatZ(e.z_after),
    statusAfter: statusView(e.status_after),
    factor: formatRatio(e.factor),
    slipFactor: formatRatio(e.slip_factor),
  };
}

export function diagnosisView(d: Diagnosis): DiagnosisView {
  const matched = new Set(d.explained.map((e) => e.hypothesis));
  const tried = d.tried
    .map((id) => ({ hypothesis: id, title: hypothesisTitle(id), matched: matched.has(id) }))
    .sort((a, b) => (a.title < b.title ? -1 : a.title > b.title ? 1 : 0));
  return {
    result: d.result,
    z: formatZ(d.z),
    status: statusView(d.status),
    unexplained: d.unexplained,
    summary: d.summary,
    causes: d.explained.map(causeView),
    tried,
  };
}
