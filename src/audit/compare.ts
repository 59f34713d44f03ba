import type { QuantityKind } from "../quantity/quantity.js";
import type { Status, Thresholds } from "./types.js";

/**
 * Default thresholds: |z| ≤ 1 consistent, 1 < |z| ≤ 3 tension, |z| > 3
 * discrepant. The recomputed and published values share their inputs, so z
 * is not a test of two independent measurements: it measures how far the
 * published number sits from what its own inputs give, in units of the
 * published uncertainty. A flag is a prompt to reread the paper.
 */
export const DEFAULT_THRESHOLDS: Thresholds = Object.freeze({ tension: 1, discrepant: 3 });

export function statusOf(z: number, thresholds: Thresholds = DEFAULT_THRESHOLDS): Status {
  if (!Number.isFinite(z)) return Number.isNaN(z) ? "not-compared" : "discrepant";
  const a = Math.abs(z);
  if (a <= thresholds.tension) return "consistent";
  if (a <= thresholds.discrepant) return "tension";
  return "discrepant";
}

const RANK: Record<Status, number> = { "not-compared": 0, consistent: 1, tension: 2, discrepant: 3 };

/** The worst of several statuses; "not-compared" when there are none. */
export function worstStatus(statuses: Iterable<Status>): Status {
  let worst: Status = "not-compared";
  for (const s of statuses) if (RANK[s] > RANK[worst]) worst = s;
  return worst;
}

export interface Published {
  readonly kind: QuantityKind;
  readonly value: number;
  readonly plus: number;
  readonly minus: number;
}

export interface Recomputed {
  readonly value: number;
  readonly plus: number;
  readonly minus: number;
}

export interface Comparison {
  readonly difference: number;
  readonly ratio: number;
  readonly sigmaUsed: number;
  readonly sigmaFrom: "published" | "recomputed";
  readonly z: number;
  readonly status: Status;
}

/**
 * z = (recomputed − published) / σ, where σ is the published uncertainty on
 * the side of the difference (a recomputed value above the published one is
 * measured with the published upper σ), or ours on the side facing the
 * published value when none was published. A limit is met (z = 0) when the
 * recomputed value lies on its allowed side, and otherwise measured from the
 * limit with our own σ.
 */
export function compare(ours: Recomputed, published: Published, thresholds: Thresholds = DEFAULT_THRESHOLDS): Comparison {
  const difference = ours.value - published.value;
  const ratio = ours.value / published.value;
  if (published.kind === "upper-limit" || published.kind === "lower-limit") {
    const violated = published.kind === "upper-limit" ? difference > 0 : difference < 0;
    const sigmaUsed = difference > 0 ? ours.minus : ours.plus;
    const z = violated ? difference / sigmaUsed : 0;
    return { difference, ratio, sigmaUsed, sigmaFrom: "recomputed", z, status: statusOf(z, thresholds) };
  }
  const publishedSide = difference > 0 ? published.plus : published.minus;
  let sigmaUsed = publishedSide;
  let sigmaFrom: "published" | "recomputed" = "published";
  if (!(publishedSide > 0)) {
    sigmaUsed = difference > 0 ? ours.minus : ours.plus;
    sigmaFrom = "recomputed";
  }
  let z: number;
  if (difference === 0) z = 0;
  else if (sigmaUsed > 0) z = difference / sigmaUsed;
  else z = Math.sign(difference) * Infinity;
  return { difference, ratio, sigmaUsed, sigmaFrom, z, status: statusOf(z, thresholds) };
}
