/**
 * The knot model: a monotone piecewise-linear curve through K knots, fitted by exact least squares.
 */
import type { CommonFitOptions, Direction } from './types.js';
import { boundsPair, finiteArray, sameLength, weightArray } from './validate.js';
import { checkKnotCount, checkKnotPositions, evenKnots } from './knots.js';
import { resolveDirection } from './direction.js';
import { solveMonotoneTridiagonal } from './monotone-qp.js';
import { fail } from './errors.js';

/** Options of {@link knotRegression}. */
export interface KnotFitOptions extends CommonFitOptions {
  /**
   * A whole number K ≥ 2 for K knots evenly spaced from the smallest to the largest x with
   * positive weight, or explicit strictly increasing knot positions (at least 2).
   */
  knots: number | ArrayLike<number>;
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
  /** Fitted value for every input row, in input order. */
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
 * whose subproblems are Thomas-algorithm solves; a second O(n) pass evaluates the fitted values.
 *
 * Unidentified knots: a knot whose two neighbouring intervals hold no row with positive weight
 * does not affect the fit, so its value is not determined by the data. Ratchet fits the knots that
 * are determined and fills each undetermined one by linear interpolation in t between the nearest
 * determined knots on either side (copying the nearest one beyond the outermost). The result is
 * unique, keeps the order, respects the bounds, and leaves the fitted values at the data — which
 * are always unique — unchanged. In the rarer case that the determined knots are still only
 * jointly determined (chains of intervals that each hold rows at a single interior x), a roughness
 * tie-break of relative size 1e-10, Σ (θⱼ₊₁ − θⱼ)² / (tⱼ₊₁ − tⱼ), selects the smoothest optimum;
 * fitted values then agree with the exact optimum to about 1e-10 relative.
 *
 * Cost: O(n) for evenly spaced knots, O(n log K) for explicit ones, plus O(K) per active-set
 * iteration; extra memory O(n + K) (fitted values and the tridiagonal system).
 *
 * Edge cases: ties in x need no pooling (each row enters H on its own). Rows with weight 0 get
 * f(x) but have no influence. Rows outside explicit knots are fitted by the flat end values.
 * K = 2 with knots at min and max x spans every line on that interval: when the least-squares line
 * has slope ≥ 0, the up-fit is that line. Inputs are never modified.
 *
 * @param x predictor values, finite, length n.
 * @param y responses, finite, length n.
 * @param options knots (required), weights (default 1), direction (`'up'` default, `'down'`,
 *   `'auto'`), lower, upper (bounds on the knot values).
 * @throws RatchetError EMPTY_INPUT, LENGTH_MISMATCH, NON_FINITE, BAD_WEIGHT, BAD_BOUNDS,
 *   BAD_OPTION (direction), BAD_KNOTS (count not a whole number ≥ 2, positions not strictly
 *   increasing), TOO_FEW_POINTS (fewer than 2 distinct x with positive weight).
 * @example knotRegression([0, 1, 2, 3], [0, 2, 1, 3], { knots: 2 }).knotY // → Float64Array [0.3, 2.7]
 */
export function knotRegression(x: ArrayLike<number>, y: ArrayLike<number>, options: KnotFitOptions): KnotFit {
  const xs = finiteArray('x', x);
  sameLength('x', xs.length, 'y', y);
  const ys = finiteArray('y', y);
  const ws = weightArray(xs.length, options.weights);
  const [lower, upper] = boundsPair(options.lower, options.upper);
  const knotsOption = options.knots;
  let knots: Float64Array | number;
  if (typeof knotsOption === 'number') knots = checkKnotCount(knotsOption);
  else if (knotsOption !== null && knotsOption !== undefined && typeof knotsOption.length === 'number') {
    knots = checkKnotPositions(knotsOption);
  } else return fail('BAD_KNOTS', 'knots', 'needs a knot count or a list of knot positions');
  const direction = resolveDirection(xs, ys, options.weights === undefined ? undefined : ws, options.direction);
  return knotChecked(xs, ys, ws, knots, direction, lower, upper);
}

/**
 * {@link knotRegression} on validated copies with a resolved direction; `knots` is a checked
 * count or checked positions. Used by cross-validation, which validates once.
 */
export function knotChecked(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array,
  knots: number | Float64Array,
  direction: Direction,
  lower: number,
  upper: number,
): KnotFit {
  const n = xs.length;
  // Range of the rows that count, and the check for two distinct x.
  let xmin = Infinity;
  let xmax = -Infinity;
  for (let i = 0; i < n; i++) {
    if (ws[i]! > 0) {
      const v = xs[i]!;
      if (v < xmin) xmin = v;
      if (v > xmax) xmax = v;
    }
  }
  if (!(xmin < xmax)) fail('TOO_FEW_POINTS', 'x', 'needs at least 2 distinct values with positive weight');
  const t = typeof knots === 'number' ? evenKnots(xmin, xmax, knots) : knots;
  const K = t.length;
  const even = typeof knots === 'number';
  const sign = direction === 'up' ? 1 : -1;
  const lo = sign > 0 ? lower : -upper;
  const hi = sign > 0 ? upper : -lower;

  // One pass: interval index and weight share of every row, and the tridiagonal normal equations.
  const d = new Float64Array(K);
  const e = new Float64Array(K - 1);
  const c = new Float64Array(K);
  const seg = new Int32Array(n);
  const share = new Float64Array(n);
  const t0 = t[0]!;
  const tK = t[K - 1]!;
  const invStep = (K - 1) / (tK - t0);
  for (let i = 0; i < n; i++) {
    const xi = xs[i]!;
    let j: number;
    let u: number;
    if (xi <= t0) {
      j = 0;
      u = 0;
    } else if (xi >= tK) {
      j = K - 2;
      u = 1;
    } else {
      if (even) {
        j = Math.floor((xi - t0) * invStep);
        if (j > K - 2) j = K - 2;
        if (xi < t[j]!) j--;
        else if (j + 1 < K - 1 && xi >= t[j + 1]!) j++;
      } else {
        let a = 0;
        let b = K - 2;
        while (a < b) {
          const mid = (a + b + 1) >>> 1;
          if (t[mid]! <= xi) a = mid;
          else b = mid - 1;
        }
        j = a;
      }
      u = (xi - t[j]!) / (t[j + 1]! - t[j]!);
    }
    seg[i] = j;
    share[i] = u;
    const w = ws[i]!;
    if (w > 0) {
      const v = 1 - u;
      const wy = w * sign * ys[i]!;
      d[j] = d[j]! + w * v * v;
      e[j] = e[j]! + w * v * u;
      d[j + 1] = d[j + 1]! + w * u * u;
      c[j] = c[j]! + wy * v;
      c[j + 1] = c[j + 1]! + wy * u;
    }
  }

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
  if (!positiveDefinite(rd, re)) addRoughness(rd, re, idx, t);
  const { theta } = solveMonotoneTridiagonal(rd, re, rc, lo, hi);

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
      values[j] = vl === vr ? vl : vl + ((t[j]! - t[jl]!) / (t[jr]! - t[jl]!)) * (vr - vl);
    }
  }
  // Guard the order against rounding in the fill, then map back to the user's direction.
  for (let j = 1; j < K; j++) if (values[j]! < values[j - 1]!) values[j] = values[j - 1]!;
  let levels = 1;
  for (let j = 1; j < K; j++) if (values[j] !== values[j - 1]) levels++;
  if (sign < 0) for (let j = 0; j < K; j++) values[j] = -values[j]!;

  const fitted = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const j = seg[i]!;
    const u = share[i]!;
    const v0 = values[j]!;
    const v1 = values[j + 1]!;
    fitted[i] = v0 === v1 ? v0 : v0 + u * (v1 - v0);
  }
  return { method: 'knots', direction, knotX: t, knotY: values, fitted, levels, identified };
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

/** Adds the roughness tie-break ε Σ (θ_{a+1} − θ_a)² / (t_{a+1} − t_a), ε = 1e-10 · tr(H)/tr(R). */
function addRoughness(d: Float64Array, e: Float64Array, idx: number[], t: Float64Array): void {
  const m = d.length;
  const r = new Float64Array(Math.max(m - 1, 0));
  let trH = 0;
  let trR = 0;
  for (let a = 0; a < m; a++) trH += d[a]!;
  for (let a = 0; a + 1 < m; a++) {
    r[a] = 1 / (t[idx[a + 1]!]! - t[idx[a]!]!);
    trR += 2 * r[a]!;
  }
  if (!(trR > 0)) return;
  const eps = (1e-10 * trH) / trR;
  for (let a = 0; a + 1 < m; a++) {
    d[a] = d[a]! + eps * r[a]!;
    d[a + 1] = d[a + 1]! + eps * r[a]!;
    e[a] = e[a]! - eps * r[a]!;
  }
}
