/**
 * Median, 16th and 84th percentiles, mean and standard deviation of a sample,
 * without sorting it.
 *
 * The percentiles are exactly those of the sorted sample by linear
 * interpolation between order statistics (Hyndman & Fan 1996, type 7, as
 * `quantileSorted`): the same order statistics are picked, so the numbers are
 * identical. They are found by bucket selection. As values arrive, each is
 * put in one of 4098 buckets: 4096 over mean ± 3σ of the first 1024 values,
 * and one at each end for values beyond (the map from value to bucket is
 * monotone, so bucket order is value order), and each bucket keeps a list of
 * its values. At the end the counts show which buckets hold the wanted order
 * statistics, and only those buckets' values are sorted. A poor grid (a
 * sample whose first values are unrepresentative) costs time, never
 * exactness.
 *
 * The mean and the sample standard deviation (n − 1) come from running sums
 * of the values and of their squares, in the order of the values and both
 * taken about the first values' mean, so there is no cancellation to speak of.
 */

export interface SampleSummary {
  readonly median: number;
  readonly p16: number;
  readonly p84: number;
  readonly mean: number;
  readonly sd: number;
}

/** Φ(−1) and Φ(1): the 1σ percentiles of a normal distribution. */
export const P16 = 0.15865525393145707;
export const P84 = 0.8413447460685429;

const INNER_BUCKETS = 4096;
const TOP_BUCKET = INNER_BUCKETS + 1;
const HALF_RANGE_SIGMAS = 3;
/** Entries of a bucket table (the inner buckets and one at each end). */
export const BUCKET_TABLE_LENGTH = TOP_BUCKET + 1;
/** How many of the first values place the grid. */
const GRID_VALUES = 1024;

/** Type-7 positions of the three percentiles in a sample of n: h = (n − 1)p and the ranks either side. */
function percentilePoints(n: number): Array<{ h: number; lo: number; hi: number }> {
  return [P16, 0.5, P84].map((p) => {
    const h = (n - 1) * p;
    const lo = Math.floor(h);
    return { h, lo, hi: Math.min(lo + 1, n - 1) };
  });
}

function meanOf(values: Float64Array, from: number, to: number): number {
  let s = 0;
  for (let j = from; j < to; j++) s += values[j];
  return s / (to - from);
}

function squaredDeviations(values: Float64Array, from: number, to: number, centre: number): number {
  let q = 0;
  for (let j = from; j < to; j++) {
    const y = values[j] - centre;
    q += y * y;
  }
  return q;
}

/**
 * Buckets and sums of values[from..to): value j goes at the head of its
 * bucket's list (next[j] is the value after it, −1 at the end), and the sums
 * of (x − centre) and of its square go on into sums[0] and sums[1].
 *
 * Four values at a time: their four buckets are worked out before any list
 * is touched, which lets the processor overlap the four (bench/mc-kernel.mjs
 * shows the effect on the whole kernel). The lists and the sums are still
 * updated value by value, in order, so every list, count and sum is the same
 * as from the plain loop, bit for bit.
 */
function addToBuckets(
  values: Float64Array,
  from: number,
  to: number,
  lo: number,
  scale: number,
  centre: number,
  next: Int32Array,
  head: Int32Array,
  counts: Int32Array,
  sums: Float64Array,
): void {
  // running sums carried over from the values before, so that the result does not depend on how they were split
  let s1 = sums[0];
  let s2 = sums[1];
  let j = from;
  for (; j + 3 < to; j += 4) {
    const x0 = values[j];
    const x1 = values[j + 1];
    const x2 = values[j + 2];
    const x3 = values[j + 3];
    let t0 = (x0 - lo) * scale + 1;
    let t1 = (x1 - lo) * scale + 1;
    let t2 = (x2 - lo) * scale + 1;
    let t3 = (x3 - lo) * scale + 1;
    t0 = t0 < 0 ? 0 : t0 > TOP_BUCKET ? TOP_BUCKET : t0;
    t1 = t1 < 0 ? 0 : t1 > TOP_BUCKET ? TOP_BUCKET : t1;
    t2 = t2 < 0 ? 0 : t2 > TOP_BUCKET ? TOP_BUCKET : t2;
    t3 = t3 < 0 ? 0 : t3 > TOP_BUCKET ? TOP_BUCKET : t3;
    const b0 = t0 | 0;
    const b1 = t1 | 0;
    const b2 = t2 | 0;
    const b3 = t3 | 0;
    // in order: when two of the four share a bucket, the later one links to the earlier
    next[j] = head[b0];
    head[b0] = j;
    counts[b0]++;
    next[j + 1] = head[b1];
    head[b1] = j + 1;
    counts[b1]++;
    next[j + 2] = head[b2];
    head[b2] = j + 2;
    counts[b2]++;
    next[j + 3] = head[b3];
    head[b3] = j + 3;
    counts[b3]++;
    let y = x0 - centre;
    s1 += y;
    s2 += y * y;
    y = x1 - centre;
    s1 += y;
    s2 += y * y;
    y = x2 - centre;
    s1 += y;
    s2 += y * y;
    y = x3 - centre;
    s1 += y;
    s2 += y * y;
  }
  for (; j < to; j++) {
    const x = values[j];
    let t = (x - lo) * scale + 1;
    t = t < 0 ? 0 : t > TOP_BUCKET ? TOP_BUCKET : t;
    const b = t | 0;
    next[j] = head[b];
    head[b] = j;
    counts[b]++;
    const y = x - centre;
    s1 += y;
    s2 += y * y;
  }
  sums[0] = s1;
  sums[1] = s2;
}

/** The values of bucket b, from its list. */
function bucketValues(values: Float64Array, next: Int32Array, head: Int32Array, b: number, count: number): Float64Array {
  const list = new Float64Array(count);
  let k = 0;
  for (let j = head[b]; j >= 0; j = next[j]) list[k++] = values[j];
  return list;
}

/**
 * Collects a sample that arrives in pieces, values[from..to) at a time, all
 * in one array that the caller owns, and summarises values[0..n) at the end.
 */
export class SampleAccumulator {
  /** next[j]: the value after value j in its bucket's list, −1 at the end. */
  private readonly next: Int32Array;
  /** The first value of each bucket's list, −1 for none. */
  private readonly head: Int32Array;
  private readonly counts: Int32Array;
  /** Sums of (x − centre) and of its square. */
  private readonly sums = new Float64Array(2);
  private lo = NaN;
  private scale = NaN;
  private centre = NaN;
  private seen = 0;
  /** Values already in their buckets: values[0..binned). */
  private binned = 0;

  /**
   * `next` has room for every value to come, one link each; it may be reused
   * scratch space, and so may `tables` (two arrays of BUCKET_TABLE_LENGTH
   * whole numbers, cleared here), which are otherwise made afresh.
   */
  constructor(next: Int32Array, tables?: { readonly head: Int32Array; readonly counts: Int32Array }) {
    this.next = next;
    if (tables && tables.head.length >= BUCKET_TABLE_LENGTH && tables.counts.length >= BUCKET_TABLE_LENGTH) {
      this.head = tables.head.fill(-1, 0, BUCKET_TABLE_LENGTH);
      this.counts = tables.counts.fill(0, 0, BUCKET_TABLE_LENGTH);
    } else {
      this.head = new Int32Array(BUCKET_TABLE_LENGTH).fill(-1);
      this.counts = new Int32Array(BUCKET_TABLE_LENGTH);
    }
  }

  /**
   * Takes in values[from..to), which must follow the values already added.
   * The first GRID_VALUES values (or all, if fewer) place the grid; until
   * there are that many they wait in `values`, so the grid, and with it every
   * number of the summary, does not depend on how the values were split.
   */
  add(values: Float64Array, from: number, to: number): void {
    if (from !== this.seen || to > this.next.length || to > values.length) {
      throw new Error(`SampleAccumulator.add: values [${from}, ${to}) after ${this.seen} of ${this.next.length}`);
    }
    this.seen = to;
    if (this.binned === 0 && to < GRID_VALUES) return;
    this.bin(values);
  }

  /** Puts every value seen so far into its bucket, placing the grid first if need be. */
  private bin(values: Float64Array): void {
    if (this.binned === this.seen) return;
    if (this.binned === 0) this.placeGrid(values, 0, Math.min(this.seen, GRID_VALUES));
    addToBuckets(values, this.binned, this.seen, this.lo, this.scale, this.centre, this.next, this.head, this.counts, this.sums);
    this.binned = this.seen;
  }

  /** The grid from the first values: mean ± 3σ, or any finite grid when they do not spread. */
  private placeGrid(values: Float64Array, from: number, to: number): void {
    const m = meanOf(values, from, to);
    const centre = Number.isFinite(m) ? m : values[from];
    const sd = to - from > 1 ? Math.sqrt(squaredDeviations(values, from, to, centre) / (to - from - 1)) : 0;
    const width = 2 * HALF_RANGE_SIGMAS * sd;
    const spread = sd > 0 && Number.isFinite(width) && Number.isFinite(INNER_BUCKETS / width);
    this.centre = centre;
    this.lo = spread ? centre - HALF_RANGE_SIGMAS * sd : centre;
    this.scale = spread ? INNER_BUCKETS / width : Math.abs(centre) > 0 ? INNER_BUCKETS / Math.abs(centre) : 1;
    if (!Number.isFinite(this.lo) || !Number.isFinite(this.scale)) {
      this.lo = 0;
      this.scale = 0;
    }
  }

  /** Summary of values[0..n), n being all the values added. */
  summary(values: Float64Array): SampleSummary {
    const n = this.seen;
    if (n === 0) return { median: NaN, p16: NaN, p84: NaN, mean: NaN, sd: NaN };
    this.bin(values);
    const s1 = this.sums[0];
    const s2 = this.sums[1];
    const mean = this.centre + s1 / n;
    const sd = n > 1 ? Math.sqrt(Math.max(0, (s2 - (s1 * s1) / n) / (n - 1))) : 0;
    const points = percentilePoints(n);
    const stats = this.orderStatistics(values, points.flatMap((p) => [p.lo, p.hi]));
    const quantile = (k: number): number => {
      const p = points[k];
      const a = stats[2 * k];
      const b = stats[2 * k + 1];
      return a + (p.h - p.lo) * (b - a);
    };
    return { median: quantile(1), p16: quantile(0), p84: quantile(2), mean, sd };
  }

  /** Order statistics x₍ᵣ₎ of values[0..n) at 0-based ranks. */
  private orderStatistics(values: Float64Array, ranks: readonly number[]): number[] {
    const counts = this.counts;
    const lists = new Map<number, Float64Array>();
    // one walk up the buckets, in rank order, finds the bucket of every rank
    const order = ranks.map((_, k) => k).sort((a, b) => ranks[a] - ranks[b]);
    const out: number[] = new Array(ranks.length);
    let below = 0;
    let b = 0;
    for (const k of order) {
      const r = ranks[k];
      while (below + counts[b] <= r) below += counts[b++];
      let list = lists.get(b);
      if (list === undefined) {
        list = bucketValues(values, this.next, this.head, b, counts[b]);
        sortNumbers(list, 0, list.length - 1);
        lists.set(b, list);
      }
      out[k] = list[r - below];
    }
    return out;
  }
}

/** a before b in the order of Float64Array.prototype.sort: numeric, with −0 before +0 (no NaN here). */
function before(a: number, b: number): boolean {
  return a < b || (a === 0 && b === 0 && 1 / a < 1 / b);
}

/**
 * Sorts list[lo..hi] in place as Float64Array.prototype.sort would: insertion
 * sort for short runs (the usual bucket holds a few values), quicksort with a
 * median-of-three pivot above that.
 */
function sortNumbers(list: Float64Array, lo: number, hi: number): void {
  while (hi - lo > 24) {
    const mid = (lo + hi) >>> 1;
    if (before(list[mid], list[lo])) swap(list, mid, lo);
    if (before(list[hi], list[lo])) swap(list, hi, lo);
    if (before(list[hi], list[mid])) swap(list, hi, mid);
    const pivot = list[mid];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (before(list[i], pivot)) i++;
      while (before(pivot, list[j])) j--;
      if (i <= j) swap(list, i++, j--);
    }
    // the smaller side by recursion, the larger by the loop
    if (j - lo < hi - i) {
      sortNumbers(list, lo, j);
      lo = i;
    } else {
      sortNumbers(list, i, hi);
      hi = j;
    }
  }
  for (let k = lo + 1; k <= hi; k++) {
    const x = list[k];
    let m = k - 1;
    while (m >= lo && before(x, list[m])) {
      list[m + 1] = list[m];
      m--;
    }
    list[m + 1] = x;
  }
}

function swap(list: Float64Array, i: number, j: number): void {
  const t = list[i];
  list[i] = list[j];
  list[j] = t;
}

/** Summary of values[0..n) in one go; the values are left as they are. */
export function summarizeSample(values: Float64Array, n: number = values.length): SampleSummary {
  if (n > values.length) throw new Error(`summarizeSample: ${n} values asked of ${values.length}`);
  const acc = new SampleAccumulator(new Int32Array(n));
  acc.add(values, 0, n);
  return acc.summary(values);
}
