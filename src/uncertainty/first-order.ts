/**
 * First-order (linear) propagation of independent input uncertainties
 * through analytic partial derivatives:
 *   σ_f² = Σ_i (∂f/∂x_i · σ_i)².
 *
 * Asymmetric inputs are propagated side by side: an input whose increase
 * raises f gives its upper σ to f's upper side and its lower σ to f's lower
 * side, and the other way round when ∂f/∂x_i < 0. This is the usual
 * linearised treatment of asymmetric errors (common practice); the Monte
 * Carlo draws from split normals are the check on it.
 */
export interface SideUncertainty {
  readonly plus: number;
  readonly minus: number;
}

export interface FirstOrderResult {
  /** Upper 1σ. */
  readonly plus: number;
  /** Lower 1σ, positive. */
  readonly minus: number;
  /** Mean of the two sides. */
  readonly sigma: number;
  /** Variance contribution of each source, from the mean of its two sides. */
  readonly variances: Readonly<Record<string, number>>;
}

export function propagateFirstOrder(
  partials: Readonly<Record<string, number>>,
  uncertainties: Readonly<Record<string, SideUncertainty>>,
): FirstOrderResult {
  let up = 0;
  let down = 0;
  const variances: Record<string, number> = {};
  for (const source of Object.keys(uncertainties).sort()) {
    const u = uncertainties[source];
    const d = partials[source] ?? 0;
    if (u.plus === 0 && u.minus === 0) continue;
    const raise = d >= 0 ? u.plus : u.minus;
    const lower = d >= 0 ? u.minus : u.plus;
    up += (d * raise) ** 2;
    down += (d * lower) ** 2;
    const mean = (u.plus + u.minus) / 2;
    variances[source] = (d * mean) ** 2;
  }
  const plus = Math.sqrt(up);
  const minus = Math.sqrt(down);
  return { plus, minus, sigma: (plus + minus) / 2, variances };
}

/** Shares of the total variance, largest first, summing to 1 (empty when there is no variance). */
export function varianceShares(variances: Readonly<Record<string, number>>): Array<{ source: string; share: number }> {
  const total = Object.values(variances).reduce((s, v) => s + v, 0);
  if (!(total > 0)) return [];
  return Object.entries(variances)
    .map(([source, v]) => ({ source, share: v / total }))
    .sort((a, b) => b.share - a.share || (a.source < b.source ? -1 : 1));
}
