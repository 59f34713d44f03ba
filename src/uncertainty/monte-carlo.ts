import type { MethodDefinition } from "../methods/method.js";
import { Random } from "./random.js";
import { meanAndSd, quantileSorted } from "./statistics.js";

/** One input as the Monte Carlo draws it: SI value (GM for masses) with its two 1σ sides. */
export interface DrawInput {
  readonly slot: string;
  readonly value: number;
  readonly plus: number;
  readonly minus: number;
}

export interface MonteCarloRun {
  /** Accepted draws. */
  readonly draws: number;
  /** Draws outside the method's domain (e ≥ 1, a negative period, ...), redrawn. */
  readonly rejected: number;
  /** Sorted samples of each result. */
  readonly samples: Readonly<Record<string, Float64Array>>;
}

export interface SampleSummary {
  readonly median: number;
  readonly p16: number;
  readonly p84: number;
  readonly mean: number;
  readonly sd: number;
}

/** Redraws stop after this many attempts per requested draw, so a domain that rejects almost everything cannot loop forever. */
const MAX_ATTEMPTS_PER_DRAW = 5;

/**
 * Draws every uncertain input independently from its split normal, rejects
 * draws the method's own validation refuses, and keeps the results. The same
 * seed gives the same draws on every machine.
 */
export function runMonteCarlo(
  method: MethodDefinition,
  inputs: readonly DrawInput[],
  draws: number,
  seed: number,
): MonteCarloRun {
  const random = new Random(seed);
  const si: Record<string, number> = {};
  for (const input of inputs) si[input.slot] = input.value;
  const uncertain = inputs.filter((i) => i.plus > 0 || i.minus > 0);
  const names = Object.keys(method.compute(si)).sort();
  const buffers: Record<string, Float64Array> = {};
  for (const name of names) buffers[name] = new Float64Array(draws);

  let accepted = 0;
  let rejected = 0;
  const maxAttempts = draws * MAX_ATTEMPTS_PER_DRAW;
  for (let attempt = 0; accepted < draws && attempt < maxAttempts; attempt++) {
    for (const input of uncertain) si[input.slot] = random.splitNormal(input.value, input.plus, input.minus);
    if (method.validate(si).length > 0) {
      rejected++;
      continue;
    }
    const out = method.compute(si);
    let finite = true;
    for (const name of names) if (!Number.isFinite(out[name])) finite = false;
    if (!finite) {
      rejected++;
      continue;
    }
    for (const name of names) buffers[name][accepted] = out[name];
    accepted++;
  }
  const samples: Record<string, Float64Array> = {};
  for (const name of names) samples[name] = buffers[name].subarray(0, accepted).sort();
  return { draws: accepted, rejected, samples };
}

export function summarizeSorted(sorted: Float64Array): SampleSummary {
  const { mean, sd } = meanAndSd(sorted);
  return {
    median: quantileSorted(sorted, 0.5),
    p16: quantileSorted(sorted, 0.15865525393145707),
    p84: quantileSorted(sorted, 0.8413447460685429),
    mean,
    sd,
  };
}
