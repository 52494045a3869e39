/**
 * Goodness-of-fit statistics of a fitted curve.
 */

/** Result of {@link fitStatistics}. */
export interface FitStatistics {
  /** Rows with positive weight. */
  n: number;
  /** Weighted sum of squared residuals Σ w (y − ŷ)². */
  sse: number;
  /** Root mean squared error √(SSE / Σw); with unit weights √(SSE / n). */
  rmse: number;
  /** Weighted mean absolute error Σ w |y − ŷ| / Σw. */
  mae: number;
  /**
   * Coefficient of determination 1 − SSE / SST with SST = Σ w (y − ȳ_w)². When y is constant
   * (SST = 0) it is 1 for a perfect fit and 0 otherwise (scikit-learn's `r2_score` convention).
   */
  r2: number;
}

/**
 * Weighted fit statistics of `fitted` against `y`. Rows with weight 0 are ignored.
 *
 * Cost: O(n), two passes. Inputs are not modified; preconditions (same lengths, finite values,
 * weights ≥ 0 with a positive total) are the callers' — the fitting functions guarantee them.
 *
 * @param y observed values.
 * @param fitted fitted values, same length.
 * @param w weights (default all 1).
 * @example fitStatistics([1, 2, 3, 4], [1, 2.5, 2.5, 4]).sse // → 0.5
 */
export function fitStatistics(y: ArrayLike<number>, fitted: ArrayLike<number>, w?: ArrayLike<number>): FitStatistics {
  const n = y.length;
  let sw = 0;
  let swy = 0;
  let count = 0;
  for (let i = 0; i < n; i++) {
    const wi = w === undefined ? 1 : w[i]!;
    if (wi > 0) {
      sw += wi;
      swy += wi * y[i]!;
      count++;
    }
  }
  const mean = swy / sw;
  let sse = 0;
  let sae = 0;
  let sst = 0;
  for (let i = 0; i < n; i++) {
    const wi = w === undefined ? 1 : w[i]!;
    if (wi > 0) {
      const r = y[i]! - fitted[i]!;
      sse += wi * r * r;
      sae += wi * Math.abs(r);
      const dev = y[i]! - mean;
      sst += wi * dev * dev;
    }
  }
  const r2 = sst > 0 ? 1 - sse / sst : sse === 0 ? 1 : 0;
  return { n: count, sse, rmse: Math.sqrt(sse / sw), mae: sae / sw, r2 };
}
