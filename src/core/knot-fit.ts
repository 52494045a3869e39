/**
 * The knot model: a monotone piecewise-linear curve through K knots, fitted by exact least squares.
 */
import type { CommonFitOptions, Direction } from './types.js';
import { boundsPair, finiteArray, sameLength, weightArray } from './validate.js';
import { checkKnotCount, checkKnotPositions, evenKnots } from './knots.js';
import { resolveDirection } from './direction.js';
import { solveMonotoneTridiagonal } from './monotone-qp.js';
import { fail } from './errors.js';
import { interpolateAt, intervalIndex, lerp } from './interpolate.js';
import { scaleExponents, scaleFromExtremes, timesPowerOfTwo } from './scale.js';

/** Options of {@link knotRegression}. */
export interface KnotFitOptions extends CommonFitOptions {
  /**
   * A whole number K ≥ 2 for K knots evenly spaced from the smallest to the largest x with
   * positive weight, or explicit strictly increasing knot positions (at least 2).
   */
  knots: number | ArrayLike<number>;
  /**
   * `true` (default): return the fitted value of every row. `false`: return the knot table only
   * (`fitted` is then an empty array) — the knot values are exactly those of the full fit, and the
   * pass that evaluates the curve at every row, and its n-sized array, are skipped.
   */
  fitted?: boolean;
}

/** Result of {@link knotRegression}. */
export interface KnotFit {
  readonly method: 'knots';
  /** Direction used (after resolving `'auto'`). */
  readonly direction: Direction;
  /** Knot positions t₁ < … < t_K. */
  readonly knotX: Float64Array;
  /** Fitted knot values θ₁ … θ_K (monotone in the direction used). */
  readonly knotY: Float64Array;
  /** Fitted value for every input row, in input order (empty when the option `fitted` is false). */
  readonly fitted: Float64Array;
  /** Number of distinct knot values (groups of equal adjacent values): the model's effective size. */
  readonly levels: number;
  /**
   * 1 where the data determine the knot value (some row with positive weight lies strictly inside
   * the knot's neighbouring intervals or on the knot), 0 where the value is filled (see below).
   */
  readonly identified: Uint8Array;
}

/**
 * Weighted least-squares monotone fit of a piecewise-linear curve with K knots.
 *
 * The curve is f(x) = Σⱼ θⱼ hⱼ(x) — linear interpolation of the knot values θ between knots
 * t₁ < … < t_K, flat beyond the end knots (x is clamped to [t₁, t_K]). It minimises
 * Σᵢ wᵢ (yᵢ − f(xᵢ))² subject to θ₁ ≤ … ≤ θ_K (direction `'up'`; reversed for `'down'`) and, when
 * given, lower ≤ θ ≤ upper as constraints of the problem (not clipping, which is not optimal here
 * because neighbouring knots are coupled).
 *
 * Method: one O(n) pass assembles the tridiagonal normal matrix H = BᵀWB and Bᵀ W y (no n × K
 * matrix); {@link solveMonotoneTridiagonal} solves the resulting QP exactly by an active-set method
 * whose subproblems are Thomas-algorithm solves; a second O(n) pass evaluates the fitted values (skipped with `fitted: false`).
 *
 * Unidentified knots: a knot whose two neighbouring intervals hold no row with positive weight
 * does not affect the fit, so its value is not determined by the data. Ratchet fits the knots that
 * are determined and fills each undetermined one by linear interpolation in t between the nearest
 * determined knots on either side (copying the nearest one beyond the outermost). The result is
 * unique, keeps the order, respects the bounds, and leaves the fitted values at the data — which
 * are always unique — unchanged. In the rarer case that the determined knots are still only
 * jointly determined (chains of intervals that each hold rows at a single interior x), a roughness
 * tie-break of relative size 1e-8, Σ (θⱼ₊₁ − θⱼ)² / (tⱼ₊₁ − tⱼ), picks a smooth optimum, and
 * four proximal refinement passes (the same QP with the tie-break centred on the previous answer)
 * remove its bias: the fitted values at rows with positive weight and the optimality conditions are
 * then exact to rounding. The knot values the data leave free (and the fitted values of weight-0
 * rows, which depend on them) come from a system of condition about 1e8, so they are reproducible
 * to about 1e-8 relative when the same data arrive in another row order.
 *
 * Cost: O(n) for evenly spaced knots, O(n log K) for explicit ones, plus O(K) per active-set
 * iteration; extra memory O(n + K) (fitted values and the tridiagonal system).
 *
 * Edge cases: ties in x need no pooling (each row enters H on its own). Rows with weight 0 get
 * f(x) but have no influence. Rows outside explicit knots are fitted by the flat end values.
 * K = 2 with knots at min and max x spans every line on that interval: when the least-squares line
 * has slope ≥ 0, the up-fit is that line. x, y or weights near 1e±300 (sums that would overflow or
 * underflow) are fitted after exact power-of-two rescaling. Inputs are never modified.
 *
 * @param x predictor values, finite, length n.
 * @param y responses, finite, length n.
 * @param options knots (required), weights (default 1; absent weights take a faster path than
 *   an array of ones), direction (`'up'` default, `'down'`, `'auto'`), lower, upper (bounds on the
 *   knot values), fitted (default true; false returns the knot table only).
 * @throws RatchetError EMPTY_INPUT, LENGTH_MISMATCH, NON_FINITE, BAD_WEIGHT, BAD_BOUNDS,
 *   BAD_OPTION (direction), BAD_KNOTS (count not a whole number ≥ 2, positions not strictly
 *   increasing, or an x range too narrow — a few ulps — for K distinct even positions),
 *   TOO_FEW_POINTS (fewer than 2 distinct x with positive weight).
 * @example knotRegression([0, 1, 2, 3], [0, 2, 1, 3], { knots: 2 }).knotY // → Float64Array [0.3, 2.7]
 * @example knotRegression([0, 1, 2, 3], [0, 2, 1, 3], { knots: 2, fitted: false }).fitted.length // → 0
 */
export function knotRegression(x: ArrayLike<number>, y: ArrayLike<number>, options: KnotFitOptions): KnotFit {
  // Float64Array inputs are used in place (never written); their finiteness is checked inside the
  // passes of knotChecked, which saves two passes over the data. Other inputs are copied and checked.
  const auto = options.direction === 'auto';
  const xs = x instanceof Float64Array && !auto ? x : finiteArray('x', x);
  sameLength('x', xs.length, 'y', y);
  const ys = y instanceof Float64Array && !auto ? y : finiteArray('y', y);
  if (xs.length === 0) fail('EMPTY_INPUT', 'x', 'needs at least one value; got none');
  const ws = options.weights === undefined ? null : weightArray(xs.length, options.weights);
  const [lower, upper] = boundsPair(options.lower, options.upper);
  const knotsOption = options.knots;
  let knots: Float64Array | number;
  if (typeof knotsOption === 'number') knots = checkKnotCount(knotsOption);
  else if (knotsOption !== null && knotsOption !== undefined && typeof knotsOption.length === 'number') {
    knots = checkKnotPositions(knotsOption);
  } else return fail('BAD_KNOTS', 'knots', 'needs a knot count or a list of knot positions');
  const direction = resolveDirection(xs, ys, ws ?? undefined, options.direction);
  return knotChecked(xs, ys, ws, knots, direction, lower, upper, false, options.fitted !== false);
}

/**
 * {@link knotRegression} on validated copies with a resolved direction; `knots` is a checked
 * count or checked positions; `ws` null means unit weights (a faster path). Used by
 * cross-validation, which validates once. `withFitted` false skips the fitted values (an empty
 * array is returned for them); the knot table is the same either way. `sortedX` true promises x
 * ascending (cross-validation's training rows): with unit weights the range is then read off the
 * two ends instead of a pass over x.
 */
export function knotChecked(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array | null,
  knots: number | Float64Array,
  direction: Direction,
  lower: number,
  upper: number,
  rescaled = false,
  withFitted = true,
  sortedX = false,
): KnotFit {
  const n = xs.length;
  // Range of the rows that count, and the check for two distinct x. Unit weights with evenly
  // spaced knots read only x here: the largest |y| for the scale check comes from the assembly.
  const unitEven = ws === null && typeof knots === 'number';
  if (unitEven && sortedX) endsRange(xs, rangeOut);
  else if (unitEven) xRange(xs, rangeOut);
  else weightedRange(xs, ys, ws, rangeOut);
  const xmin = rangeOut[0]!;
  const xmax = rangeOut[1]!;
  if (rangeOut[2] !== 0) finiteArray('x', xs); // throws NON_FINITE naming the entry
  if (!(xmin < xmax)) fail('TOO_FEW_POINTS', 'x', `needs at least 2 distinct values with positive weight; got ${xmin === xmax ? 1 : 0}`);
  // y or weights far from 1 (1e-100-sized y with 1e-250 weights underflow in w·y), or weights spread
  // over more than 2^600: fit the exactly rescaled problem (see src/core/scale.ts). The extremes
  // come from the range pass above (a NaN y is caught by the assembly below); for unit weights
  // with even knots the weights are 1 and the largest |y| is checked after the assembly.
  const scales = scaleFromExtremes(unitEven ? 1 : rangeOut[3]!, rangeOut[4]!, rangeOut[5]!);
  if (!rescaled && (!(xmax - xmin < HUGE) || scales.needed)) {
    return knotRescaled(xs, ys, ws, knots, direction, lower, upper, withFitted);
  }
  const t = typeof knots === 'number' ? evenKnots(xmin, xmax, knots) : knots;
  const K = t.length;
  const even = typeof knots === 'number';
  const sign = direction === 'up' ? 1 : -1;
  const lo = sign > 0 ? lower : -upper;
  const hi = sign > 0 ? upper : -lower;

  // One pass assembles the tridiagonal normal equations H = BᵀWB (d, e) and c = BᵀW(sign·y).
  // Rows with weight 0 add zeros, so no branch is needed for them.
  const d = new Float64Array(K);
  const e = new Float64Array(K - 1);
  const c = new Float64Array(K);
  const maxY = assemble(xs, ys, ws, t, even, sign, d, e, c);
  if (maxY !== maxY) finiteArray('y', ys); // throws NON_FINITE
  if (!rescaled && unitEven && scaleFromExtremes(maxY, 1, 1).needed) return knotRescaled(xs, ys, ws, knots, direction, lower, upper, withFitted);
  if (!rescaled && !moderate(d, c)) return knotRescaled(xs, ys, ws, knots, direction, lower, upper, withFitted);

  // Reduced problem over the identified knots (positive diagonal).
  const identified = new Uint8Array(K);
  const idx: number[] = [];
  for (let j = 0; j < K; j++) {
    if (d[j]! > 0) {
      identified[j] = 1;
      idx.push(j);
    }
  }
  const m = idx.length;
  const rd = new Float64Array(m);
  const re = new Float64Array(Math.max(m - 1, 0));
  const rc = new Float64Array(m);
  for (let a = 0; a < m; a++) {
    rd[a] = d[idx[a]!]!;
    rc[a] = c[idx[a]!]!;
    if (a + 1 < m) re[a] = idx[a + 1] === idx[a]! + 1 ? e[idx[a]!]! : 0;
  }
  const rough = positiveDefinite(rd, re) ? null : addRoughness(rd, re, idx, t);
  // A tie-break scaled to the heaviest rows would swamp light ones: with weights spread over more
  // than 2^20 (about 1e6), failing Cholesky pivots mean ill-conditioning, not a singular chain.
  if (rough !== null && ws !== null && scales.spread > MAX_TIE_BREAK_SPREAD) illConditioned();
  const solution = solveMonotoneTridiagonal(rd, re, rc, lo, hi);
  let theta = solution.theta;
  // Small pivots with weights within 2^20 of each other come from knots the data fix only weakly
  // (tied x, tiny interpolation shares), where the solver's refinement still gives the optimum;
  // with weights spread further they mean heavy rows drowning light ones in H (docs/tolerances.md).
  if (rough === null && ws !== null && scales.spread > MAX_TIE_BREAK_SPREAD && solution.pivotRatio < MIN_PIVOT_RATIO) illConditioned();
  if (rough !== null) {
    // Proximal refinement: minimise SSE + ε·roughness(θ − θ_prev) from the tie-broken answer. Each
    // pass shrinks the tie-break's bias on the data-determined directions by a factor of about
    // ε/(curvature + ε) ≈ 1e-8, so after PROXIMAL_PASSES the fit is the exact optimum to rounding
    // while the undetermined directions stay at the smooth choice (the matrix H + εR is unchanged).
    const shifted = new Float64Array(m);
    for (let pass = 0; pass < PROXIMAL_PASSES; pass++) {
      shifted.set(rc);
      for (let a = 0; a + 1 < m; a++) {
        const f = rough.eps * rough.r[a]! * (theta[a]! - theta[a + 1]!);
        shifted[a] = shifted[a]! + f;
        shifted[a + 1] = shifted[a + 1]! - f;
      }
      theta = solveMonotoneTridiagonal(rd, re, shifted, lo, hi).theta;
    }
  }

  // Knot values: identified ones from the solve, the rest filled linearly (flat beyond the ends).
  const values = new Float64Array(K);
  for (let a = 0; a < m; a++) values[idx[a]!] = theta[a]!;
  for (let j = 0; j < K; j++) {
    if (identified[j]) continue;
    let a = 0;
    while (a < m && idx[a]! < j) a++;
    if (a === 0) values[j] = theta[0]!;
    else if (a === m) values[j] = theta[m - 1]!;
    else {
      const jl = idx[a - 1]!;
      const jr = idx[a]!;
      const vl = theta[a - 1]!;
      const vr = theta[a]!;
      values[j] = lerp(vl, vr, (t[j]! - t[jl]!) / (t[jr]! - t[jl]!));
    }
  }
  // Guard the order against rounding in the fill, then map back to the user's direction.
  for (let j = 1; j < K; j++) if (values[j]! < values[j - 1]!) values[j] = values[j - 1]!;
  let levels = 1;
  for (let j = 1; j < K; j++) if (values[j] !== values[j - 1]) levels++;
  if (sign < 0) for (let j = 0; j < K; j++) values[j] = -values[j]!;

  const fitted = new Float64Array(withFitted ? n : 0);
  if (withFitted) evaluate(xs, t, even, values, fitted);
  return { method: 'knots', direction, knotX: t, knotY: values, fitted, levels, identified };
}

/*
 * Locating a row: x lies in interval j (0 ≤ j ≤ K − 2, t_j ≤ x < t_{j+1}) with right-knot share
 * u = (x − t_j)/(t_{j+1} − t_j) ∈ [0, 1], after clamping x to [t₀, t_{K−1}].
 * - Evenly spaced knots: the scaled position p = (x − t₀)(K − 1)/(t_{K−1} − t₀) gives j = ⌊p⌋ and
 *   u = p − j in O(1). Rounding can put p on the wrong side of a knot only when p is within about
 *   1e-14 of a whole number, so when u is within 1e-9 of 0 or 1 the interval is settled against the
 *   knots themselves and u recomputed from them: a row exactly on a knot then has u = 0 exactly (a
 *   1e-16 share would make an empty neighbour look identified).
 * - Explicit knots: binary search, O(log K), u from the knots.
 * The hot loops below spell this out inline, once per kind of knots: storing j and u per row costs
 * more memory traffic than the arithmetic, and a shared helper (or one loop for both kinds)
 * measured 30–80 % slower on 1e6 rows.
 */

/** Slots per knot interval in the sums {@link assemble} keeps (five used; eight put each interval in one cache line). */
const STRIDE = 8;

/**
 * The per-interval sums, kept between calls and grown on demand (a knot fit is never re-entered
 * while it assembles, and nothing handed to a caller aliases it; see DEVELOPERS.md).
 */
let intervalSums = new Float64Array(STRIDE * 64);

/** A zeroed view of the interval sums for `intervals` intervals. */
function sumsFor(intervals: number): Float64Array {
  const size = STRIDE * Math.max(intervals, 1);
  if (intervalSums.length < size) intervalSums = new Float64Array(size);
  intervalSums.fill(0, 0, size);
  return intervalSums;
}

/**
 * Adds every row's contribution to H = BᵀWB (diagonal d, off-diagonal e) and c = BᵀW(sign·y).
 * Each row adds w·v², w·v·u, w·u², w·v·y, w·u·y (v = 1 − u) to the five sums of its interval j;
 * the interval sums then go to d_j, e_j, d_{j+1}, c_j, c_{j+1} in interval order. Rows of one
 * interval touch only their own sums, so rows in neighbouring intervals never wait on each
 * other's stores (adding straight into d, e and c measured 30–40 % slower at 10⁶ rows). All
 * three loops (unit weights, weights, explicit knots) add the same products in the same order,
 * so unit weights and an array of ones give the same sums bit for bit.
 * O(n) for even knots, O(n log K) for explicit ones. Returns NaN when some sum is not finite (a
 * y that is not finite, or an overflow, which the caller tells apart); otherwise, for unit
 * weights with even knots, the largest |y| (for the caller's scale check), and 0 for the others.
 */
function assemble(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array | null,
  t: Float64Array,
  even: boolean,
  sign: number,
  d: Float64Array,
  e: Float64Array,
  c: Float64Array,
): number {
  const K = t.length;
  const sums = sumsFor(K - 1);
  let maxY = 0;
  if (!even) assembleExplicit(xs, ys, ws, t, sign, sums);
  else if (ws === null) maxY = assembleUnit(xs, ys, t, sign, sums);
  else assembleWeighted(xs, ys, ws, t, sign, sums);
  // Interval j's sums: v² to d_j, v·u to e_j, u² to d_{j+1}, v·y to c_j, u·y to c_{j+1}.
  let finite = true;
  for (let j = 0; j + 1 < K; j++) {
    const b = j * STRIDE;
    d[j] = d[j]! + sums[b]!;
    e[j] = sums[b + 1]!;
    d[j + 1] = sums[b + 2]!;
    c[j] = c[j]! + sums[b + 3]!;
    c[j + 1] = sums[b + 4]!;
  }
  for (let k = 0; k < K; k++) if (!Number.isFinite(c[k]!)) finite = false;
  // A non-finite y makes some c entry NaN or infinite (0·∞ is NaN too).
  return finite ? maxY : NaN;
}

/**
 * The interval sums for unit weights and evenly spaced knots (see {@link assemble}): the same
 * products with w = 1 (so the same sums to the bit), without reading a weight per row; returns
 * the largest |y|.
 */
function assembleUnit(xs: Float64Array, ys: Float64Array, t: Float64Array, sign: number, sums: Float64Array): number {
  const n = xs.length;
  const K = t.length;
  const t0 = t[0]!;
  const tK = t[K - 1]!;
  const last = K - 2;
  const scale = (K - 1) / (tK - t0);
  let maxY = 0;
  for (let i = 0; i < n; i++) {
    const x = xs[i]!;
    let j = 0;
    let u = 0;
    if (x >= tK) {
      j = last;
      u = 1;
    } else if (x > t0) {
      const p = (x - t0) * scale;
      j = p | 0;
      if (j > last) j = last;
      u = p - j;
      if (u < 1e-9 || u > 1 - 1e-9) {
        if (x < t[j]!) j--;
        else if (x >= t[j + 1]!) j++;
        u = (x - t[j]!) / (t[j + 1]! - t[j]!);
      }
    }
    const v = 1 - u;
    const y = ys[i]!;
    const a = Math.abs(y);
    maxY = a > maxY ? a : maxY;
    const yi = sign * y;
    const b = j * STRIDE;
    sums[b] = sums[b]! + v * v;
    sums[b + 1] = sums[b + 1]! + v * u;
    sums[b + 2] = sums[b + 2]! + u * u;
    sums[b + 3] = sums[b + 3]! + v * yi;
    sums[b + 4] = sums[b + 4]! + u * yi;
  }
  return maxY;
}

/** The interval sums for weights and evenly spaced knots (see {@link assemble}). */
function assembleWeighted(xs: Float64Array, ys: Float64Array, ws: Float64Array, t: Float64Array, sign: number, sums: Float64Array): void {
  const n = xs.length;
  const K = t.length;
  const t0 = t[0]!;
  const tK = t[K - 1]!;
  const last = K - 2;
  const scale = (K - 1) / (tK - t0);
  for (let i = 0; i < n; i++) {
    const x = xs[i]!;
    let j = 0;
    let u = 0;
    if (x >= tK) {
      j = last;
      u = 1;
    } else if (x > t0) {
      const p = (x - t0) * scale;
      j = p | 0;
      if (j > last) j = last;
      u = p - j;
      if (u < 1e-9 || u > 1 - 1e-9) {
        if (x < t[j]!) j--;
        else if (x >= t[j + 1]!) j++;
        u = (x - t[j]!) / (t[j + 1]! - t[j]!);
      }
    }
    const w = ws[i]!;
    const v = 1 - u;
    const wv = w * v;
    const wu = w * u;
    const yi = sign * ys[i]!;
    const b = j * STRIDE;
    sums[b] = sums[b]! + wv * v;
    sums[b + 1] = sums[b + 1]! + wv * u;
    sums[b + 2] = sums[b + 2]! + wu * u;
    sums[b + 3] = sums[b + 3]! + wv * yi;
    sums[b + 4] = sums[b + 4]! + wu * yi;
  }
}

/** The interval sums for explicit knots (binary search per row; see {@link assemble}). */
function assembleExplicit(xs: Float64Array, ys: Float64Array, ws: Float64Array | null, t: Float64Array, sign: number, sums: Float64Array): void {
  const n = xs.length;
  const K = t.length;
  const t0 = t[0]!;
  const tK = t[K - 1]!;
  const last = K - 2;
  for (let i = 0; i < n; i++) {
    const x = xs[i]!;
    let j = 0;
    let u = 0;
    if (x >= tK) {
      j = last;
      u = 1;
    } else if (x > t0) {
      j = intervalIndex(t, x);
      u = (x - t[j]!) / (t[j + 1]! - t[j]!);
    }
    const w = ws === null ? 1 : ws[i]!;
    const v = 1 - u;
    const wv = w * v;
    const wu = w * u;
    const yi = sign * ys[i]!;
    const b = j * STRIDE;
    sums[b] = sums[b]! + wv * v;
    sums[b + 1] = sums[b + 1]! + wv * u;
    sums[b + 2] = sums[b + 2]! + wu * u;
    sums[b + 3] = sums[b + 3]! + wv * yi;
    sums[b + 4] = sums[b + 4]! + wu * yi;
  }
}

/**
 * Writes the curve through (t, values) at every x into `out` (flat beyond the end knots), clamped
 * to each segment so rounding never leaves it. The values are moderate (huge data are rescaled
 * first), so v1 − v0 cannot overflow. O(n) for even knots; explicit knots use interpolateAt,
 * O(n log K).
 */
function evaluate(xs: Float64Array, t: Float64Array, even: boolean, values: Float64Array, out: Float64Array): void {
  const n = xs.length;
  const K = t.length;
  const t0 = t[0]!;
  const tK = t[K - 1]!;
  const last = K - 2;
  const first = values[0]!;
  const end = values[K - 1]!;
  const scale = (K - 1) / (tK - t0);
  if (!even) {
    for (let i = 0; i < n; i++) out[i] = interpolateAt(t, values, xs[i]!);
    return;
  }
  for (let i = 0; i < n; i++) {
    const x = xs[i]!;
    if (x >= tK) {
      out[i] = end;
      continue;
    }
    if (!(x > t0)) {
      out[i] = first;
      continue;
    }
    const p = (x - t0) * scale;
    let j = p | 0;
    if (j > last) j = last;
    let u = p - j;
    if (u < 1e-9 || u > 1 - 1e-9) {
      if (x < t[j]!) j--;
      else if (x >= t[j + 1]!) j++;
      u = (x - t[j]!) / (t[j + 1]! - t[j]!);
    }
    const v0 = values[j]!;
    const v1 = values[j + 1]!;
    let v = v0;
    if (v0 !== v1 && u > 0) {
      v = u >= 1 ? v1 : v0 + u * (v1 - v0);
      if (v0 < v1 ? v > v1 : v < v1) v = v1;
    }
    out[i] = v;
  }
}

/** Scratch for {@link weightedRange}'s three results. */
const rangeOut = new Float64Array(6);

/**
 * Writes into `out` the smallest and largest x among rows with positive weight (all rows when `ws`
 * is null), a sum that is 0 exactly when every x is finite (v − v is NaN for NaN and ±Infinity),
 * and, for the scale check (scaleFromExtremes), the largest |y| and the largest and smallest
 * weight of those rows. O(n), one pass. Results go to a Float64Array rather than a returned tuple:
 * accumulators that escape into an array literal are boxed by V8, which made this loop 3× slower.
 */
function weightedRange(xs: Float64Array, ys: Float64Array, ws: Float64Array | null, out: Float64Array): void {
  if (ws === null) {
    unitRange(xs, ys, out);
    return;
  }
  let xmin = Infinity;
  let xmax = -Infinity;
  let finiteX = 0;
  let maxY = 0;
  let maxW = 0;
  let minW = Infinity;
  for (let i = 0; i < xs.length; i++) {
    const v = xs[i]!;
    finiteX += v - v;
    const w = ws[i]!;
    if (w > 0) {
      if (v < xmin) xmin = v;
      if (v > xmax) xmax = v;
      const a = Math.abs(ys[i]!);
      if (a > maxY) maxY = a;
      if (w > maxW) maxW = w;
      if (w < minW) minW = w;
    }
  }
  out[0] = xmin;
  out[1] = xmax;
  out[2] = finiteX;
  out[3] = maxY;
  out[4] = maxW;
  out[5] = minW;
}

/**
 * The range pass for unit weights with evenly spaced knots: smallest and largest x into out[0],
 * out[1] (−0 read as +0), and out[2] = 0 exactly when both are finite — Math.min and Math.max
 * carry a NaN through and an infinite x ends up as an extreme, so no per-row test is needed. The
 * largest |y| is left to the assembly (out[3] = 0), the weights are 1. O(n), reads x only.
 */
function xRange(xs: Float64Array, out: Float64Array): void {
  let xmin = Infinity;
  let xmax = -Infinity;
  for (let i = 0; i < xs.length; i++) {
    const v = xs[i]!;
    xmin = Math.min(xmin, v);
    xmax = Math.max(xmax, v);
  }
  out[0] = xmin + 0;
  out[1] = xmax + 0;
  out[2] = Number.isFinite(xmin) && Number.isFinite(xmax) ? 0 : 1;
  out[3] = 0;
  out[4] = 1;
  out[5] = 1;
}

/** {@link xRange} for x in ascending order: the two ends. O(1). */
function endsRange(xs: Float64Array, out: Float64Array): void {
  const xmin = xs[0]!;
  const xmax = xs[xs.length - 1]!;
  out[0] = xmin + 0;
  out[1] = xmax + 0;
  out[2] = Number.isFinite(xmin) && Number.isFinite(xmax) ? 0 : 1;
  out[3] = 0;
  out[4] = 1;
  out[5] = 1;
}

/** {@link weightedRange} for unit weights (explicit knots): every row counts. */
function unitRange(xs: Float64Array, ys: Float64Array, out: Float64Array): void {
  let xmin = Infinity;
  let xmax = -Infinity;
  let finiteX = 0;
  let maxY = 0;
  for (let i = 0; i < xs.length; i++) {
    const v = xs[i]!;
    finiteX += v - v;
    xmin = v < xmin ? v : xmin;
    xmax = v > xmax ? v : xmax;
    const a = Math.abs(ys[i]!);
    maxY = a > maxY ? a : maxY;
  }
  out[0] = xmin;
  out[1] = xmax;
  out[2] = finiteX;
  out[3] = maxY;
  out[4] = 1;
  out[5] = 1;
}

/** Sums beyond this (2^900) are rescaled before solving, so that no product can overflow. */
const HUGE = 2 ** 900;

/**
 * True when the assembled sums are far from overflow and the positive diagonal entries far from
 * underflow: then no product in the solve can leave the range of doubles.
 */
function moderate(d: Float64Array, c: Float64Array): boolean {
  let maxD = 0;
  let minD = Infinity;
  let maxC = 0;
  for (let j = 0; j < d.length; j++) {
    const v = d[j]!;
    if (v > maxD) maxD = v;
    if (v > 0 && v < minD) minD = v;
    const a = Math.abs(c[j]!);
    if (a > maxC) maxC = a;
  }
  return maxD < HUGE && maxC < HUGE && minD > 1 / HUGE;
}

/**
 * {@link knotChecked} for data whose sums would overflow or underflow (x, y or weights near 1e±300):
 * fits x, y and w scaled by powers of two — which is exact, so this is the same fit — and scales
 * the knot positions, knot values and fitted values back.
 */
function knotRescaled(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array | null,
  knots: number | Float64Array,
  direction: Direction,
  lower: number,
  upper: number,
  withFitted: boolean,
): KnotFit {
  let mx = 0;
  for (let i = 0; i < xs.length; i++) mx = Math.max(mx, Math.abs(xs[i]!));
  if (typeof knots !== 'number') for (let j = 0; j < knots.length; j++) mx = Math.max(mx, Math.abs(knots[j]!));
  const ex = exponentOf(mx);
  // y to a largest |y| near 1; weights to a largest weight near 1, or their geometric middle near
  // 1 when they span more than 2^600 (then both ends stay representable).
  const { yExp: ey, wExp: ew } = scaleExponents(ys, ws);
  const sx = 2 ** -ex;
  const fit = knotChecked(
    xs.map((v) => v * sx),
    ys.map((v) => timesPowerOfTwo(v, -ey)),
    ws === null ? null : ws.map((v) => timesPowerOfTwo(v, -ew)),
    typeof knots === 'number' ? knots : knots.map((v) => v * sx),
    direction,
    timesPowerOfTwo(lower, -ey),
    timesPowerOfTwo(upper, -ey),
    true,
    withFitted,
  );
  const up = timesPowerOfTwo;
  return {
    ...fit,
    knotX: typeof knots === 'number' ? fit.knotX.map((v) => up(v, ex)) : knots,
    knotY: fit.knotY.map((v) => up(v, ey)),
    fitted: fit.fitted.map((v) => up(v, ey)),
  };
}

/** The exponent k of the smallest power of two 2^k ≥ v, clamped to the normal range; 0 for v = 0. */
function exponentOf(v: number): number {
  return v > 0 ? Math.min(1023, Math.max(-1022, Math.ceil(Math.log2(v)))) : 0;
}

/** True when the tridiagonal matrix (d, e) is numerically positive definite (Cholesky pivots). */
function positiveDefinite(d: Float64Array, e: Float64Array): boolean {
  let piv = d[0]!;
  if (!(piv > 0)) return false;
  for (let k = 1; k < d.length; k++) {
    piv = d[k]! - (e[k - 1]! * e[k - 1]!) / piv;
    if (!(piv > 1e-12 * d[k]!)) return false;
  }
  return true;
}

/**
 * Smallest pivot / diagonal ratio of the final normal equations that still determines every knot
 * value to about 1e-9 relative (rounding u ≈ 1.1e-16 is amplified by about 1/ratio). Below it the
 * fit is refused with NUMERICAL rather than returned inaccurate; see docs/tolerances.md.
 */
const MIN_PIVOT_RATIO = 1e-6;

/** Throws NUMERICAL for normal equations too ill-conditioned to give the fit to 1e-9. */
function illConditioned(): never {
  return fail(
    'NUMERICAL',
    'knots',
    'needs normal equations that determine every knot value to 1e-9; these do not (rows whose weights differ ' +
      'by more than about 1e6 share an interval between two knots, or a knot is reached only through tiny ' +
      "interpolation shares): put a knot at the heavy rows' x, use fewer knots, or less extreme weights",
  );
}

/** log₂ of the largest weight spread (about 1e6) for which a failing Cholesky pivot is taken as a singular chain. */
const MAX_TIE_BREAK_SPREAD = 20;

/** Refinement passes after a roughness tie-break (see knotChecked). */
const PROXIMAL_PASSES = 4;

/**
 * Adds the roughness tie-break ε Σ (θ_{a+1} − θ_a)² / (t_{a+1} − t_a), ε = 1e-8 · tr(H)/tr(R), to
 * (d, e) in place; returns ε and the edge weights r_a = 1/(t_{a+1} − t_a) (null when m < 2).
 */
function addRoughness(d: Float64Array, e: Float64Array, idx: number[], t: Float64Array): { eps: number; r: Float64Array } | null {
  const m = d.length;
  const r = new Float64Array(Math.max(m - 1, 0));
  let trH = 0;
  let trR = 0;
  for (let a = 0; a < m; a++) trH += d[a]!;
  for (let a = 0; a + 1 < m; a++) {
    r[a] = 1 / (t[idx[a + 1]!]! - t[idx[a]!]!);
    trR += 2 * r[a]!;
  }
  if (!(trR > 0)) return null;
  const eps = (1e-8 * trH) / trR;
  for (let a = 0; a + 1 < m; a++) {
    d[a] = d[a]! + eps * r[a]!;
    d[a + 1] = d[a + 1]! + eps * r[a]!;
    e[a] = e[a]! - eps * r[a]!;
  }
  return { eps, r };
}
