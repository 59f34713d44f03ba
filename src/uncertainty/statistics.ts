/** Quantile of sorted data by linear interpolation between order statistics (Hyndman & Fan 1996, type 7). */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  if (n === 1) return sorted[0];
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

export function meanAndSd(values: ArrayLike<number>): { mean: number; sd: number } {
  const n = values.length;
  if (n === 0) return { mean: NaN, sd: NaN };
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < n; i++) {
    const x = values[i];
    const delta = x - mean;
    mean += delta / (i + 1);
    m2 += delta * (x - mean);
  }
  return { mean, sd: n > 1 ? Math.sqrt(m2 / (n - 1)) : 0 };
}
