/**
 * "Did you mean ...?" for misspelled field, method, input and result names.
 */

/** Optimal string alignment distance: insertions, deletions, substitutions and adjacent transpositions. */
export function editDistance(a: string, b: string): number {
  const n = a.length;
  const m = b.length;
  if (n === 0) return m;
  if (m === 0) return n;
  let prev2 = new Array<number>(m + 1).fill(0);
  let prev = Array.from({ length: m + 1 }, (_, j) => j);
  let cur = new Array<number>(m + 1).fill(0);
  for (let i = 1; i <= n; i++) {
    cur[0] = i;
    for (let j = 1; j <= m; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let d = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d = Math.min(d, prev2[j - 2] + 1);
      cur[j] = d;
    }
    [prev2, prev, cur] = [prev, cur, prev2];
  }
  return prev[m];
}

/**
 * The closest candidate, compared case-insensitively with "_" and "-" taken as
 * the same; undefined when none is close enough (at most a third of the
 * longer word's letters changed, and never more than 3).
 */
export function closest(word: string, candidates: Iterable<string>): string | undefined {
  const norm = (s: string) => s.toLowerCase().replace(/-/g, "_");
  const w = norm(word);
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const c of candidates) {
    const d = editDistance(w, norm(c));
    if (d < bestDistance || (d === bestDistance && best !== undefined && c < best)) {
      best = c;
      bestDistance = d;
    }
  }
  if (best === undefined) return undefined;
  const limit = Math.min(3, Math.max(1, Math.floor(Math.max(w.length, best.length) / 3)));
  return bestDistance <= limit ? best : undefined;
}

/** "; did you mean 'period'?" or "". */
export function didYouMean(word: string, candidates: Iterable<string>): string {
  const c = closest(word, candidates);
  return c === undefined ? "" : `; did you mean '${c}'?`;
}
