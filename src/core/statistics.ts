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
 * Cost: O(n), three passes (the second finds a power-of-two scale so that squares neither
 * underflow for tiny y nor overflow for huge y). Inputs are not modified; preconditions (same
 * lengths, finite values, weights ≥ 0 with a positive total) are the callers' — the fitting
 * functions guarantee them.
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
  // Squares are summed after scaling by the largest |residual| or |deviation|, rounded to a power of
  // two so the scaling is exact: 1e-160-sized data would otherwise square to 0 (R² as 0/0 or x/0),
  // and 1e160-sized data to Infinity.
  let big = 0;
  for (let i = 0; i < n; i++) {
    const wi = w === undefined ? 1 : w[i]!;
    if (wi > 0) big = Math.max(big, Math.abs(y[i]! - fitted[i]!), Math.abs(y[i]! - mean));
  }
  const exponent = big > 0 ? Math.min(1023, Math.max(-1022, Math.ceil(Math.log2(big)))) : 0;
  const s = 2 ** exponent;
  const inv = 2 ** -exponent; // exact: s and 1/s are both normal powers of two
  let sse = 0;
  let sae = 0;
  let sst = 0;
  for (let i = 0; i < n; i++) {
    const wi = w === undefined ? 1 : w[i]!;
    if (wi > 0) {
      const r = (y[i]! - fitted[i]!) * inv;
      sse += wi * r * r;
      sae += wi * Math.abs(r);
      const dev = (y[i]! - mean) * inv;
      sst += wi * dev * dev;
    }
  }
  // R² below the range of doubles (an awful fit of near-constant y) is reported as −MAX_VALUE.
  const r2 = sst > 0 ? Math.max(1 - sse / sst, -Number.MAX_VALUE) : sse === 0 ? 1 : 0;
  sae *= s;
  const rmse = Math.sqrt(sse / sw) * s;
  sse = sse * s * s;
  return { n: count, sse, rmse, mae: sae / sw, r2 };
}
