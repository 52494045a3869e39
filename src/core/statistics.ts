/**
 * Goodness-of-fit statistics of a fitted curve.
 */
import { scaleExponents, scaleFromExtremes, timesPowerOfTwo } from './scale.js';

import { spearman } from './direction.js';

/** Result of {@link fitStatistics}. */
export interface FitStatistics {
  /** Rows with positive weight. */
  n: number;
  /** Weighted sum of squared residuals Σ w (y − ŷ)² (+Infinity only when that exceeds the largest double). */
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
 * Cost: O(n), three passes; six when the plain sums would overflow (|y| or w near 1e308) or the
 * products underflow (1e-160-sized residuals, or y and weights whose product is below 1e-300, such
 * as y near 1e-100 with weights near 1e-250), which are then taken on values scaled by powers of
 * two so the results stay accurate. Inputs are not modified;
 * preconditions (same lengths, finite values, weights ≥ 0 with a positive total) are the
 * callers' — the fitting functions guarantee them.
 *
 * @param y observed values.
 * @param fitted fitted values, same length.
 * @param w weights (default all 1).
 * @example fitStatistics([1, 2, 3, 4], [1, 2.5, 2.5, 4]).sse // → 0.5
 */
export function fitStatistics(y: ArrayLike<number>, fitted: ArrayLike<number>, w?: ArrayLike<number>): FitStatistics {
  // Fast path: plain sums in two passes. They are exact enough unless a sum overflows (|y| or w
  // near 1e308) or squares underflow (1e-160-sized residuals); both are detected from the sums
  // themselves, and then the scaled path below recomputes everything.
  plainSums(y, fitted, w, sums);
  const sw = sums[0]!;
  const count = sums[1]!;
  const sse = sums[2]!;
  const sae = sums[3]!;
  const sst = sums[4]!;
  const sad = sums[5]!;
  const safe =
    Number.isFinite(sw) && Number.isFinite(sse) && Number.isFinite(sst) && Number.isFinite(sae) && Number.isFinite(sad) &&
    (sae === 0 || sse > TINY) && (sad === 0 || sst > TINY) &&
    // y or weights far from 1 (1e-260 y with 1e-64 weights): products w·|r| may have underflowed
    // to 0 unseen — SAE and SSE would both be 0 — so take the scaled path (see src/core/scale.ts).
    // The extremes come from the first pass of plainSums (the rows scaleExponents would read).
    !scaleFromExtremes(sums[6]!, sums[7]!, sums[8]!).needed;
  if (!safe) return scaledStatistics(y, fitted, w, count);
  // R² below the range of doubles (an awful fit of near-constant y) is reported as −MAX_VALUE.
  const r2 = sst > 0 ? Math.max(1 - sse / sst, -Number.MAX_VALUE) : sse === 0 ? 1 : 0;
  return { n: count, sse, rmse: Math.sqrt(sse / sw), mae: sae / sw, r2 };
}

/** Scratch for {@link plainSums}: Σw, count, SSE, SAE, SST, Σw|y − ȳ|, largest |y|, largest and smallest weight. */
const sums = new Float64Array(9);

/**
 * The plain weighted sums behind {@link fitStatistics}, in two passes, written into `out`
 * (Σw, rows with w > 0, SSE, SAE, SST, Σw|y − ȳ|; and from the first pass the largest |y| and
 * the largest and smallest weight of those rows, for the scale check). Results go to a Float64Array rather than an
 * object literal: accumulators that escape into an object are boxed by V8, which slowed the loops
 * severalfold.
 */
function plainSums(y: ArrayLike<number>, fitted: ArrayLike<number>, w: ArrayLike<number> | undefined, out: Float64Array): void {
  const n = y.length;
  let sw = 0;
  let swy = 0;
  let count = 0;
  let maxY = 0;
  let maxW = 0;
  let minW = Infinity;
  for (let i = 0; i < n; i++) {
    const wi = w === undefined ? 1 : w[i]!;
    if (wi > 0) {
      const yi = y[i]!;
      sw += wi;
      swy += wi * yi;
      count++;
      const a = Math.abs(yi);
      if (a > maxY) maxY = a;
      if (wi > maxW) maxW = wi;
      if (wi < minW) minW = wi;
    }
  }
  const mean = swy / sw;
  let sse = 0;
  let sae = 0;
  let sst = 0;
  let sad = 0;
  for (let i = 0; i < n; i++) {
    const wi = w === undefined ? 1 : w[i]!;
    if (wi > 0) {
      const r = y[i]! - fitted[i]!;
      sse += wi * r * r;
      sae += wi * Math.abs(r);
      const dev = y[i]! - mean;
      sst += wi * dev * dev;
      sad += wi * Math.abs(dev);
    }
  }
  out[0] = sw;
  out[1] = count;
  out[2] = sse;
  out[3] = sae;
  out[4] = sst;
  out[5] = sad;
  out[6] = maxY;
  out[7] = maxW;
  out[8] = minW;
}

/** Sums of squares below this (2^-800) may have lost precision to underflow. */
const TINY = 2 ** -800;

/**
 * {@link fitStatistics} with every sum taken on y, w and the residuals scaled by powers of two
 * (exact), so that neither the weighted mean nor the squares overflow for |y| or w near 1e308 nor
 * underflow for 1e-160-sized data. Four passes; used only when the plain sums are unsafe.
 */
function scaledStatistics(y: ArrayLike<number>, fitted: ArrayLike<number>, w: ArrayLike<number> | undefined, count: number): FitStatistics {
  const n = y.length;
  let maxY = 0;
  for (let i = 0; i < n; i++) {
    const wi = w === undefined ? 1 : w[i]!;
    if (wi > 0) {
      const a = Math.abs(y[i]!);
      if (a > maxY) maxY = a;
    }
  }
  // Weights scaled to their largest near 1, or to their geometric middle when they span more than
  // 2^600 (as the fits do; see src/core/scale.ts), so the lightest rows still count.
  const wScale = timesPowerOfTwo(1, -scaleExponents(y, w ?? null).wExp);
  const yExp = powerOfTwoExponent(maxY);
  const yScale = 2 ** -yExp;
  let sw = 0;
  let swy = 0;
  for (let i = 0; i < n; i++) {
    const wi = (w === undefined ? 1 : w[i]!) * wScale;
    if (wi > 0) {
      sw += wi;
      swy += wi * (y[i]! * yScale);
    }
  }
  const mean = (swy / sw) * 2 ** yExp;
  // The squares are summed after scaling by the largest |residual| or |deviation| (taken of halves,
  // so that a difference of two values near ±1.8e308 cannot overflow either).
  let big = 0;
  for (let i = 0; i < n; i++) {
    const wi = w === undefined ? 1 : w[i]!;
    if (wi > 0) big = Math.max(big, Math.abs(y[i]! / 2 - fitted[i]! / 2), Math.abs(y[i]! / 2 - mean / 2));
  }
  const exponent = powerOfTwoExponent(big) + 1; // |y − ŷ| ≤ 2·big ≤ 2^exponent
  const inv = 2 ** -(exponent - 1);
  let sse = 0;
  let sae = 0;
  let sst = 0;
  for (let i = 0; i < n; i++) {
    const wi = (w === undefined ? 1 : w[i]!) * wScale;
    if (wi > 0) {
      const r = (y[i]! / 2 - fitted[i]! / 2) * inv; // (y − ŷ)/2^exponent, |r| ≤ 1
      sse += wi * r * r;
      sae += wi * Math.abs(r);
      const dev = (y[i]! / 2 - mean / 2) * inv;
      sst += wi * dev * dev;
    }
  }
  const r2 = sst > 0 ? Math.max(1 - sse / sst, -Number.MAX_VALUE) : sse === 0 ? 1 : 0;
  // Scale back by 2^exponent in two steps (2^exponent itself may exceed the largest double). SSE
  // may exceed it for huge y: then it is +Infinity, the true value rounded.
  const half = 2 ** (exponent - 1);
  const rmse = Math.sqrt(sse / sw) * half * 2;
  const mae = (sae / sw) * half * 2;
  sse = ((((sse * half) / wScale) * half) * 2) * 2;
  return { n: count, sse, rmse, mae, r2 };
}

/** The exponent k (clamped to the normal range) of the smallest power of two 2^k ≥ v; 0 for v = 0. */
function powerOfTwoExponent(v: number): number {
  return v > 0 ? Math.min(1023, Math.max(-1022, Math.ceil(Math.log2(v)))) : 0;
}

/** Result of {@link spreadStatistics}: the rows STATS shows after those of {@link FitStatistics}. */
export interface SpreadStatistics {
  /**
   * Residual standard deviation σ̂ = √(Σ w r² / (n_used − p)), p = the fit's `levels`; null when
   * n_used ≤ p (no degrees of freedom left to estimate the scatter).
   */
  sigma: number | null;
  /** Residual degrees of freedom n_used − p (may be 0 or negative: then `sigma` is null). */
  dfResid: number;
  /**
   * Spearman's rank correlation of x and y over the rows with positive weight (average ranks for
   * ties; the weights do not weight the ranks); null when x or y is constant on those rows.
   */
  spearman: number | null;
}

/**
 * The scatter and association rows of STATS: σ̂, its degrees of freedom, and Spearman's ρ.
 *
 * σ̂² = SSE / (n_used − p) with SSE = Σ wᵢ (yᵢ − ŷᵢ)² over rows with positive weight, n_used their
 * count, and p = `levels` (the distinct fitted levels: PAVA blocks for the classic fit, groups of
 * equal knot values for the knot model — for the classic fit an estimate of its degrees of
 * freedom, Meyer & Woodroofe 2000). SSE comes from {@link fitStatistics}, so huge or tiny data keep
 * their accuracy.
 *
 * Cost: O(n) for σ̂, O(n) for ρ (radix-sorted ranks). Inputs are not modified; preconditions as
 * for {@link fitStatistics} (same lengths, finite values, weights ≥ 0 with a positive total).
 *
 * @param x predictor values.
 * @param y observed values, same length.
 * @param fitted fitted values, same length.
 * @param levels the fit's number of distinct fitted levels p, a whole number ≥ 1.
 * @param w weights (default all 1).
 * @example spreadStatistics([1, 2, 3, 4], [1, 3, 2, 4], [1, 2.5, 2.5, 4], 3) // → { sigma: 0.7071067811865476, dfResid: 1, spearman: 0.8 }
 * @see R `summary(lm(...))$sigma` and `cor(x, y, method = "spearman")`, which these equal for a
 *   straight-line fit (test/core/statistics-spread.test.ts).
 */
export function spreadStatistics(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  fitted: ArrayLike<number>,
  levels: number,
  w?: ArrayLike<number>,
): SpreadStatistics {
  const base = fitStatistics(y, fitted, w);
  const dfResid = base.n - levels;
  const sigma = dfResid >= 1 ? Math.sqrt(base.sse / dfResid) : null;
  const rho = spearman(x, y, w);
  return { sigma, dfResid, spearman: Number.isNaN(rho) ? null : rho };
}
