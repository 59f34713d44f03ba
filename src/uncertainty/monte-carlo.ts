import type { MethodDefinition } from "../methods/method.js";
import { DrawStream } from "./draw-stream.js";
import { BUCKET_TABLE_LENGTH, P16, P84, SampleAccumulator, type SampleSummary } from "./sample-summary.js";
import { meanAndSd, quantileSorted } from "./statistics.js";

export type { SampleSummary } from "./sample-summary.js";

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
  /** Draws outside the method's domain (e ≥ 1, a negative period, ...) or with a result that is not finite, redrawn. */
  readonly rejected: number;
  /** Median, 16th and 84th percentiles, mean and sd of each result over the accepted draws, by result name. */
  readonly summaries: Readonly<Record<string, SampleSummary>>;
}

export interface MonteCarloOptions {
  /** Attempts per block (default 4096). The results do not depend on it. */
  readonly blockSize?: number;
  /**
   * "auto" (default) uses the method's batch kernel where it has one; "per-draw"
   * calls validate() and compute() for every draw, as a reference.
   */
  readonly path?: "auto" | "per-draw";
}

/** Redraws stop after this many attempts per requested draw, so a domain that rejects almost everything cannot loop forever. */
export const MAX_ATTEMPTS_PER_DRAW = 5;

const DEFAULT_BLOCK = 4096;

/**
 * Typed arrays kept from run to run, so that a long audit does not allocate
 * (and collect) a few hundred kilobytes per measurement. Runs are synchronous
 * and never nested, so one set per thread suffices.
 */
class Workspace {
  private readonly float: Float64Array[] = [];
  private readonly int: Int32Array[] = [];
  private bytes = new Uint8Array(0);
  private readonly table: Array<{ head: Int32Array; counts: Int32Array }> = [];

  /** Float column k with room for n values; contents undefined. */
  floats(k: number, n: number): Float64Array {
    if (!this.float[k] || this.float[k].length < n) this.float[k] = new Float64Array(n);
    return this.float[k];
  }

  ints(k: number, n: number): Int32Array {
    if (!this.int[k] || this.int[k].length < n) this.int[k] = new Int32Array(n);
    return this.int[k];
  }

  /** The bucket tables of accumulator k (contents undefined; the accumulator clears them). */
  tables(k: number): { head: Int32Array; counts: Int32Array } {
    while (this.table.length <= k) this.table.push({ head: new Int32Array(BUCKET_TABLE_LENGTH), counts: new Int32Array(BUCKET_TABLE_LENGTH) });
    return this.table[k];
  }

  flags(n: number): Uint8Array {
    if (this.bytes.length < n) this.bytes = new Uint8Array(n);
    return this.bytes;
  }
}

const workspace = new Workspace();

/**
 * Draws every uncertain input independently from its split normal, rejects
 * draws the method's own validation refuses or whose results are not finite,
 * and summarises each result over the first `draws` accepted draws.
 *
 * Each uncertain input has its own stream, seeded from `seed` and its slot
 * name; attempt k takes the k-th draw of every stream. The accepted draws
 * are the first `draws` valid attempts (at most `draws` × 5 attempts), so the
 * result depends on the seed alone, not on the block size, and the batch
 * kernel and the per-draw path give the same draws, the same rejections and,
 * up to the kernel's rounding (≤ 1e-12 relative), the same summaries.
 */
export function runMonteCarlo(
  method: MethodDefinition,
  inputs: readonly DrawInput[],
  draws: number,
  seed: number,
  options: MonteCarloOptions = {},
): MonteCarloRun {
  if (!Number.isInteger(draws) || draws < 0) throw new Error(`runMonteCarlo: draws must be a whole number ≥ 0, got ${draws}`);
  const block = Math.max(1, Math.min(options.blockSize ?? DEFAULT_BLOCK, Math.max(draws, 1)));
  const nominal: Record<string, number> = {};
  for (const input of inputs) nominal[input.slot] = input.value;
  const names = Object.keys(method.compute(nominal)).sort();
  const uncertain = inputs.filter((i) => i.plus > 0 || i.minus > 0);
  const streams = uncertain.map((i) => new DrawStream(seed, i.slot));
  // the kernel needs a combination of slots that validate() accepts; presence checks do not depend on values
  const useKernel = options.path !== "per-draw" && method.batch !== undefined && method.validate(nominal).length === 0;
  const capacity = draws + block;
  const buffers = names.map((_, k) => workspace.floats(k, capacity));
  const accumulators = names.map((_, k) => new SampleAccumulator(workspace.ints(k, capacity), workspace.tables(k)));
  const run: Draw = { method, inputs, uncertain, streams, names, buffers, accumulators, draws, block };
  const counts = useKernel ? drawWithKernel(run) : drawPerDraw(run);
  const summaries: Record<string, SampleSummary> = {};
  names.forEach((name, k) => {
    summaries[name] = accumulators[k].summary(buffers[k]);
  });
  return { draws: counts.accepted, rejected: counts.rejected, summaries };
}

interface Draw {
  readonly method: MethodDefinition;
  readonly inputs: readonly DrawInput[];
  readonly uncertain: readonly DrawInput[];
  readonly streams: readonly DrawStream[];
  readonly names: readonly string[];
  /** One per result: accepted draws at [0, accepted), room for one more block. */
  readonly buffers: readonly Float64Array[];
  readonly accumulators: readonly SampleAccumulator[];
  readonly draws: number;
  readonly block: number;
}

interface Counts {
  readonly accepted: number;
  readonly rejected: number;
}

function drawWithKernel(run: Draw): Counts {
  const { method, inputs, uncertain, streams, names, buffers, accumulators, draws, block } = run;
  const batch = method.batch!;
  const columns: Record<string, Float64Array> = {};
  const first = names.length;
  inputs.forEach((input, k) => {
    const column = workspace.floats(first + k, block);
    column.fill(input.value, 0, block);
    columns[input.slot] = column;
  });
  const valid = workspace.flags(block);
  const maxAttempts = draws * MAX_ATTEMPTS_PER_DRAW;
  let attempts = 0;
  let accepted = 0;
  let rejected = 0;
  while (accepted < draws && attempts < maxAttempts) {
    const n = Math.min(block, maxAttempts - attempts);
    uncertain.forEach((input, k) => streams[k].fill(columns[input.slot], n, input.value, input.plus, input.minus));
    // results land straight in place; rejected draws are squeezed out below
    const out: Record<string, Float64Array> = {};
    names.forEach((name, k) => {
      out[name] = buffers[k].subarray(accepted, accepted + n);
    });
    batch(columns, n, out, valid);
    const { kept, used } = squeeze(valid, n, draws - accepted, buffers, accepted);
    rejected += used - kept;
    for (let k = 0; k < names.length; k++) accumulators[k].add(buffers[k], accepted, accepted + kept);
    accepted += kept;
    attempts += used;
  }
  return { accepted, rejected };
}

/**
 * Moves the valid draws of a block, which the kernel wrote at buffers[k][at..at+n),
 * down over the rejected ones, stopping once `need` are kept. Returns how many
 * were kept and how many attempts that used.
 */
function squeeze(valid: Uint8Array, n: number, need: number, buffers: readonly Float64Array[], at: number): { kept: number; used: number } {
  const firstBad = valid.subarray(0, n).indexOf(0);
  if (firstBad < 0 || firstBad >= need) {
    const kept = Math.min(n, need);
    return { kept, used: kept };
  }
  let kept = firstBad;
  let used = firstBad;
  for (; used < n && kept < need; used++) {
    if (valid[used] !== 1) continue;
    for (let k = 0; k < buffers.length; k++) buffers[k][at + kept] = buffers[k][at + used];
    kept++;
  }
  return { kept, used };
}

function drawPerDraw(run: Draw): Counts {
  const { method, inputs, uncertain, streams, names, buffers, accumulators, draws, block } = run;
  const si: Record<string, number> = {};
  for (const input of inputs) si[input.slot] = input.value;
  const columns = uncertain.map((_, k) => workspace.floats(names.length + k, block));
  const maxAttempts = draws * MAX_ATTEMPTS_PER_DRAW;
  let attempts = 0;
  let accepted = 0;
  let rejected = 0;
  while (accepted < draws && attempts < maxAttempts) {
    const n = Math.min(block, maxAttempts - attempts);
    uncertain.forEach((input, k) => streams[k].fill(columns[k], n, input.value, input.plus, input.minus));
    const before = accepted;
    let used = 0;
    for (; used < n && accepted < draws; used++) {
      uncertain.forEach((input, k) => {
        si[input.slot] = columns[k][used];
      });
      if (method.validate(si).length > 0) {
        rejected++;
        continue;
      }
      const out = method.compute(si);
      if (!names.every((name) => Number.isFinite(out[name]))) {
        rejected++;
        continue;
      }
      names.forEach((name, k) => {
        buffers[k][accepted] = out[name];
      });
      accepted++;
    }
    for (let k = 0; k < names.length; k++) accumulators[k].add(buffers[k], before, accepted);
    attempts += used;
  }
  return { accepted, rejected };
}

/** Summary of an already sorted sample, by sorting's own order statistics. */
export function summarizeSorted(sorted: Float64Array): SampleSummary {
  const { mean, sd } = meanAndSd(sorted);
  return {
    median: quantileSorted(sorted, 0.5),
    p16: quantileSorted(sorted, P16),
    p84: quantileSorted(sorted, P84),
    mean,
    sd,
  };
}
