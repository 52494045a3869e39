/**
 * Confidence and prediction bands of the knot model, and inverse (read-back) intervals, both
 * conditional on the solution's active set (docs/bands.md explains the method and its limits).
 */
import type { CommonFitOptions, Direction } from './types.js';
import { RatchetError, fail } from './errors.js';
import { finiteArray, sameLength, weightArray } from './validate.js';
import { knotRegression, type KnotFit } from './knot-fit.js';
import { intervalIndex, lerp } from './interpolate.js';
import { invertChecked } from './invert.js';
import { studentTQuantile } from './student-t.js';
import { checkCurvature, checkDegree, quadraticBasisAt, shapeRegression, type Curvature, type Degree, type ShapeFit } from './shape-fit.js';
import { nullSpaceBasis, type SparseRow } from './shape-qp.js';
import { invertQuadraticChecked, smoothTableAt } from './smooth-table.js';

/**
 * The active set of a constrained knot fit as a reduced design: θ = Z β with Z a sparse K × p
 * matrix whose columns span the knot values the active constraints allow (the null space of the
 * active constraints). Row j of Z lists knot j's non-zero coefficients in `col`/`val` from
 * `rowStart[j]` to `rowStart[j + 1]` (compressed sparse rows, columns ascending). The monotone fit
 * supplies one column per group of equal knot values ({@link monotoneActiveSetBasis}); a
 * shape-constrained fit can supply its own Z (e.g. two columns per straight stretch) and use the
 * same band machinery through {@link bandModelChecked}.
 */
export interface ActiveSetBasis {
  /** Number of knots K (rows of Z). */
  readonly knots: number;
  /** Number of free parameters p (columns of Z), ≥ 1. */
  readonly size: number;
  /** Row starts, length K + 1. */
  readonly rowStart: Int32Array;
  /** Column of each non-zero. */
  readonly col: Int32Array;
  /** Value of each non-zero. */
  readonly val: Float64Array;
}

/** Options of {@link fitBandModel}: the knot model's options (bounds are not part of a band). */
export interface BandFitOptions extends Omit<CommonFitOptions, 'lower' | 'upper'> {
  /** Knot count ≥ 2 or knot positions; 0 or absent (the classic fit) is refused. */
  knots: number | ArrayLike<number> | undefined;
}

/** A knot fit with what its bands need; made by {@link fitBandModel} or {@link bandModelChecked}. */
export interface BandModel {
  /** Direction of the fit. */
  readonly direction: Direction;
  /** Knot positions t₁ < … < t_K. */
  readonly knotX: Float64Array;
  /** Fitted knot values. */
  readonly knotY: Float64Array;
  /** Rows with positive weight. */
  readonly nUsed: number;
  /** Free parameters p of the reduced design (for the monotone fit: groups of equal knot values). */
  readonly parameters: number;
  /** Residual degrees of freedom n_used − p (≥ 1). */
  readonly dfResid: number;
  /** σ̂ = √(Σ wᵢ rᵢ² / (n_used − p)). */
  readonly sigma: number;
  /** Smallest and largest x with positive weight. */
  readonly xRange: readonly [number, number];
  /**
   * Per knot j: the variance factor of the curve at the knot, h_jj = z_jᵀ(ZᵀHZ)⁻¹z_j (so that
   * Var f(t_j) = σ̂² h_jj); and per interval j (K − 1 entries): the cross factor z_jᵀ(ZᵀHZ)⁻¹z_{j+1}.
   */
  readonly knotFactor: Float64Array;
  readonly crossFactor: Float64Array;
  /**
   * Present for the smooth fit (degree 2) only; then `knotX`/`knotY` are its 2K − 1-row quadratic
   * table (knots and interval midpoints) and `knotFactor`/`crossFactor` are empty.
   */
  readonly smooth?: SmoothBandPart;
}

/**
 * What the band of a smooth fit (quadratic B-splines, K + 1 coefficients) needs per knot interval:
 * with C = Z(ZᵀHZ)⁻¹Zᵀ the coefficients' covariance factor, interval i (K − 1 of them) meets
 * coefficients i, i + 1, i + 2, and `block[6i … 6i + 5]` holds C's entries (i,i), (i,i+1), (i,i+2),
 * (i+1,i+1), (i+1,i+2), (i+2,i+2), so Var f(x) = σ̂² b(x)ᵀC_i b(x) costs O(1) once x is located.
 */
export interface SmoothBandPart {
  /** Knot positions t₀ < … < t_{K−1}. */
  readonly knots: Float64Array;
  /** B-spline coefficients (K + 1), user direction. */
  readonly coefficients: Float64Array;
  /** Per-interval 3 × 3 covariance factor blocks, 6(K − 1) entries. */
  readonly block: Float64Array;
}

/** Band kind: for the curve (the mean) or for one new observation of weight 1. */
export type BandKind = 'confidence' | 'prediction';

/** Result of {@link bandAt}: lower edge, fitted value and upper edge per new x. */
export interface Band {
  readonly lower: Float64Array;
  readonly fit: Float64Array;
  readonly upper: Float64Array;
  /** The t quantile used, t_{(1 + level)/2, n_used − p}. */
  readonly t: number;
}

/**
 * The reduced design of a monotone knot fit: one column per group of adjacent knots with equal
 * fitted values among the knots the data determine (`identified[j] = 1`); a knot the data leave
 * free is a linear combination of its nearest determined neighbours with the interpolation
 * weights of the fill (a copy of the nearest one beyond the outermost), as the fit fills it.
 *
 * Cost O(K). Every row of Z has at most 2 non-zeros, in adjacent columns, so ZᵀHZ is tridiagonal.
 *
 * @param knotX knot positions, strictly increasing, length K ≥ 2.
 * @param knotY fitted knot values, monotone, length K.
 * @param identified 1 where the data determine the knot value, 0 where it was filled; at least one 1.
 * @throws RatchetError TOO_FEW_POINTS when no knot is identified.
 * @example monotoneActiveSetBasis([0, 1, 2, 3], [0, 1, 1, 2], [1, 1, 1, 1]).size // → 3
 */
export function monotoneActiveSetBasis(knotX: ArrayLike<number>, knotY: ArrayLike<number>, identified: ArrayLike<number>): ActiveSetBasis {
  const K = knotX.length;
  const group = new Int32Array(K).fill(-1);
  let p = 0;
  let lastValue = NaN;
  for (let j = 0; j < K; j++) {
    if (!identified[j]) continue;
    if (p === 0 || knotY[j] !== lastValue) p++;
    group[j] = p - 1;
    lastValue = knotY[j]!;
  }
  if (p === 0) fail('TOO_FEW_POINTS', 'x', 'needs rows with positive weight that determine at least one knot value');
  const rowStart = new Int32Array(K + 1);
  const col: number[] = [];
  const val: number[] = [];
  for (let j = 0; j < K; j++) {
    rowStart[j] = col.length;
    if (group[j]! >= 0) {
      col.push(group[j]!);
      val.push(1);
      continue;
    }
    let l = j - 1;
    while (l >= 0 && group[l]! < 0) l--;
    let r = j + 1;
    while (r < K && group[r]! < 0) r++;
    if (l < 0 || r >= K || group[l] === group[r]) {
      col.push(l < 0 ? group[r]! : group[l]!);
      val.push(1);
    } else {
      const u = (knotX[j]! - knotX[l]!) / (knotX[r]! - knotX[l]!);
      col.push(group[l]!, group[r]!);
      val.push(1 - u, u);
    }
  }
  rowStart[K] = col.length;
  return { knots: K, size: p, rowStart, col: Int32Array.from(col), val: Float64Array.from(val) };
}

/**
 * Refuses the classic fit for bands: BAD_KNOTS with the reason, so every caller says the same.
 *
 * @param knots the knots option as given.
 * @throws RatchetError BAD_KNOTS when `knots` is 0, absent or null.
 * @example checkBandKnots(5) // → 5
 */
export function checkBandKnots<T>(knots: T | 0 | undefined | null): T {
  if (knots === undefined || knots === null || knots === 0) {
    fail(
      'BAD_KNOTS',
      'knots',
      'BAND needs the knot model (a knot count ≥ 2 or knot positions); the classic fit (knots 0) has no valid pointwise band, see README "Uncertainty: bands and read-back intervals"',
    );
  }
  return knots as T;
}

/**
 * Fits the knot model and prepares its bands: the monotone fit of {@link knotRegression}, its
 * active set as a reduced design ({@link monotoneActiveSetBasis}), σ̂ and the variance factors.
 *
 * Model, conditional on the active set: on the reduced design B̃ = BZ the constrained optimum is the
 * plain weighted least-squares fit, so Var f(x) = σ̂² b̃(x)ᵀ(B̃ᵀWB̃)⁻¹b̃(x), with
 * σ̂² = Σ wᵢ rᵢ² / (n_used − p), p the number of groups and n_used the rows with weight > 0.
 *
 * Cost: the fit, O(n log K) to assemble H = BᵀWB, O(K) for the banded factorisation and the
 * banded part of its inverse (Takahashi's recurrence). Inputs are not modified.
 *
 * @param x predictor values, finite, length n.
 * @param y responses, finite, length n.
 * @param options knots (required, ≥ 2 or positions), weights (default 1, ≥ 0), direction
 *   (`'up'` default, `'down'`, `'auto'`).
 * @throws RatchetError BAD_KNOTS (knots 0: the classic fit has no band), TOO_FEW_POINTS
 *   (n_used ≤ p, or knots the data do not determine separately), NUMERICAL (a singular or
 *   overflowing system), and the errors of {@link knotRegression}.
 * @example fitBandModel([1, 2, 3, 4], [1, 3, 2, 4], { knots: 2 }).sigma // → 0.9486832980505137
 */
export function fitBandModel(x: ArrayLike<number>, y: ArrayLike<number>, options: BandFitOptions): BandModel {
  const knots = checkBandKnots(options.knots);
  const xs = finiteArray('x', x);
  sameLength('x', xs.length, 'y', y);
  const ys = finiteArray('y', y);
  if (xs.length === 0) fail('EMPTY_INPUT', 'x', 'needs at least one value; got none');
  const ws = options.weights === undefined ? null : weightArray(xs.length, options.weights);
  const fit: KnotFit = knotRegression(xs, ys, { knots, weights: ws ?? undefined, direction: options.direction });
  const basis = monotoneActiveSetBasis(fit.knotX, fit.knotY, fit.identified);
  return bandModelChecked(xs, ys, ws, fit.knotX, fit.knotY, fit.direction, basis);
}

/**
 * {@link fitBandModel} for a fit already made, with its active set supplied as a reduced design:
 * the entry point for other constrained knot fits. `knotY` must be the constrained optimum and
 * lie in the span of Z (then it is the weighted least-squares fit on BZ); the residuals are taken
 * from it. Validated inputs: xs, ys finite of length n; ws null (unit) or ≥ 0 with a positive total.
 *
 * Cost O(n log K + K·m²), m the bandwidth of ZᵀHZ (1 for the monotone fit).
 *
 * @param xs, ys, ws the data (ws null: unit weights).
 * @param knotX, knotY the fitted knot table; `direction` the fit's direction.
 * @param basis the reduced design Z (K rows).
 * @throws RatchetError BAD_KNOTS (Z without one row per knot), TOO_FEW_POINTS (n_used ≤ p, or a
 *   singular reduced system: parameters the data do not determine), NUMERICAL (non-finite results).
 * @example bandModelChecked(Float64Array.of(1, 2, 3, 4), Float64Array.of(1, 3, 2, 4), null,
 *   Float64Array.of(1, 4), Float64Array.of(1.3, 3.7), 'up', monotoneActiveSetBasis([1, 4], [1.3, 3.7], [1, 1])).dfResid // → 2
 */
export function bandModelChecked(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array | null,
  knotX: Float64Array,
  knotY: Float64Array,
  direction: Direction,
  basis: ActiveSetBasis,
): BandModel {
  const n = xs.length;
  const K = knotX.length;
  if (basis.knots !== K) fail('BAD_KNOTS', 'basis', `needs one row per knot (${K}); got ${basis.knots}`);
  const p = basis.size;
  checkBasis(basis);
  // H = BᵀWB (tridiagonal), the residuals, and the range of rows that count.
  const d = new Float64Array(K);
  const e = new Float64Array(K - 1);
  let nUsed = 0;
  let sse = 0;
  let xmin = Infinity;
  let xmax = -Infinity;
  for (let i = 0; i < n; i++) {
    const w = ws === null ? 1 : ws[i]!;
    if (!(w > 0)) continue;
    nUsed++;
    const xi = xs[i]!;
    if (xi < xmin) xmin = xi;
    if (xi > xmax) xmax = xi;
    const [j, u] = locate(knotX, xi);
    const v = 1 - u;
    d[j] = d[j]! + w * v * v;
    e[j] = e[j]! + w * v * u;
    d[j + 1] = d[j + 1]! + w * u * u;
    const r = ys[i]! - (v * knotY[j]! + u * knotY[j + 1]!);
    sse += w * r * r;
  }
  const dfResid = nUsed - p;
  if (dfResid < 1) {
    fail('TOO_FEW_POINTS', 'known_ys', `needs more rows with positive weight (${nUsed}) than fitted parameters (${p}) to estimate the scatter`);
  }
  const sigma = Math.sqrt(sse / dfResid);

  // M = ZᵀHZ in lower band storage: band[a·(m + 1) + k] = M[a][a − k], k = 0 … m.
  const { rowStart, col, val } = basis;
  let m = 0;
  for (let j = 0; j < K; j++) {
    // Rows j and j + 1 together (H couples them); an empty row (a knot held fixed) adds nothing.
    const end = j + 1 < K ? rowStart[j + 2]! : rowStart[j + 1]!;
    let hiCol = -1;
    let loCol = p;
    for (let q = rowStart[j]!; q < end; q++) {
      hiCol = Math.max(hiCol, col[q]!);
      loCol = Math.min(loCol, col[q]!);
    }
    if (hiCol >= loCol) m = Math.max(m, hiCol - loCol);
  }
  const width = m + 1;
  const band = new Float64Array(p * width);
  const addPair = (a: number, b: number, v: number): void => {
    const hi = a >= b ? a : b;
    const lo = a >= b ? b : a;
    band[hi * width + (hi - lo)] = band[hi * width + (hi - lo)]! + v;
  };
  // M = Σⱼ H_jj z_j z_jᵀ + Σⱼ H_j,j+1 (z_j z_{j+1}ᵀ + z_{j+1} z_jᵀ), z_j = row j of Z. A coupling pair
  // of equal columns lands twice on the diagonal; of different columns once on the stored
  // (lower) entry, its mirror being the upper one.
  for (let j = 0; j < K; j++) {
    for (let q = rowStart[j]!; q < rowStart[j + 1]!; q++) {
      for (let r = rowStart[j]!; r < rowStart[j + 1]!; r++) {
        if (col[r]! <= col[q]!) addPair(col[q]!, col[r]!, d[j]! * val[q]! * val[r]!);
      }
      if (j + 1 < K) {
        for (let r = rowStart[j + 1]!; r < rowStart[j + 2]!; r++) {
          const v = e[j]! * val[q]! * val[r]!;
          addPair(col[q]!, col[r]!, col[q] === col[r] ? 2 * v : v);
        }
      }
    }
  }
  const sigmaBand = bandedInverseBand(band, p, m);
  // Variance factors at the knots and across each interval.
  const knotFactor = new Float64Array(K);
  const crossFactor = new Float64Array(K - 1);
  const entry = (a: number, b: number): number => {
    const hi = a >= b ? a : b;
    const lo = a >= b ? b : a;
    return sigmaBand[hi * width + (hi - lo)]!;
  };
  const quad = (j1: number, j2: number): number => {
    let s = 0;
    for (let q = rowStart[j1]!; q < rowStart[j1 + 1]!; q++) {
      for (let r = rowStart[j2]!; r < rowStart[j2 + 1]!; r++) s += val[q]! * val[r]! * entry(col[q]!, col[r]!);
    }
    return s;
  };
  for (let j = 0; j < K; j++) knotFactor[j] = quad(j, j);
  for (let j = 0; j + 1 < K; j++) crossFactor[j] = quad(j, j + 1);
  if (!Number.isFinite(sigma) || !knotFactor.every(Number.isFinite) || !crossFactor.every(Number.isFinite)) {
    fail('NUMERICAL', 'known_ys', 'needs data whose sums of squares stay within the range of doubles for a band');
  }
  return { direction, knotX, knotY, nUsed, parameters: p, dfResid, sigma, xRange: [xmin, xmax], knotFactor, crossFactor };
}

/** Throws BAD_KNOTS unless Z's compressed rows are consistent: starts non-decreasing, columns in [0, p), values finite. */
function checkBasis(basis: ActiveSetBasis): void {
  const { knots: K, size: p, rowStart, col, val } = basis;
  let ok = Number.isInteger(p) && p >= 1 && rowStart.length === K + 1 && rowStart[0] === 0 && rowStart[K] === col.length && col.length === val.length;
  for (let j = 0; ok && j < K; j++) if (rowStart[j + 1]! < rowStart[j]!) ok = false;
  for (let q = 0; ok && q < col.length; q++) if (!(col[q]! >= 0 && col[q]! < p) || !Number.isFinite(val[q]!)) ok = false;
  if (!ok) fail('BAD_KNOTS', 'basis', 'needs compressed rows with non-decreasing starts, columns from 0 to size − 1 and finite values');
}

/** Interval j and right share u ∈ [0, 1] of x on the knots (x clamped to [t₁, t_K]). O(log K). */
function locate(t: Float64Array, x: number): [number, number] {
  const K = t.length;
  if (x <= t[0]!) return [0, 0];
  if (x >= t[K - 1]!) return [K - 2, 1];
  const j = Math.min(intervalIndex(t, x), K - 2);
  return [j, (x - t[j]!) / (t[j + 1]! - t[j]!)];
}

/**
 * The entries of M⁻¹ inside the band of the symmetric positive definite banded matrix M
 * (half-bandwidth m, lower band storage as in bandModelChecked), by the LDLᵀ factorisation and
 * Takahashi's recurrence Σ = D⁻¹L⁻¹ + (I − Lᵀ)Σ evaluated from the last row up. O(p m²).
 */
function bandedInverseBand(band: Float64Array, p: number, m: number): Float64Array {
  const w = m + 1;
  // LDLᵀ in place: L[a][a−k] (k ≥ 1) in L, D[a] in D.
  const L = new Float64Array(p * w);
  const D = new Float64Array(p);
  for (let a = 0; a < p; a++) {
    for (let k = Math.min(m, a); k >= 1; k--) {
      const b = a - k; // L[a][b] = (M[a][b] − Σ_{c<b} L[a][c] D[c] L[b][c]) / D[b]
      let s = band[a * w + k]!;
      for (let c = Math.max(a - m, 0); c < b; c++) s -= L[a * w + (a - c)]! * D[c]! * L[b * w + (b - c)]!;
      L[a * w + k] = s / D[b]!;
    }
    let s = band[a * w]!;
    for (let c = Math.max(a - m, 0); c < a; c++) s -= L[a * w + (a - c)]! ** 2 * D[c]!;
    if (!(s > 1e-13 * band[a * w]!) || !Number.isFinite(s)) {
      fail('TOO_FEW_POINTS', 'known_xs', 'needs rows that determine every fitted group of knots separately for a band; some are only jointly determined');
    }
    D[a] = s;
  }
  const S = new Float64Array(p * w);
  for (let i = p - 1; i >= 0; i--) {
    const top = Math.min(i + m, p - 1);
    // Off-diagonal entries Σ[j][i] for j = top … i + 1: −Σ_{k>i} L[k][i] Σ[k][j].
    for (let j = top; j > i; j--) {
      let s = 0;
      for (let k = i + 1; k <= top; k++) {
        const lki = L[k * w + (k - i)]!;
        const skj = k >= j ? S[k * w + (k - j)]! : S[j * w + (j - k)]!;
        s -= lki * skj;
      }
      S[j * w + (j - i)] = s;
    }
    let s = 1 / D[i]!;
    for (let k = i + 1; k <= top; k++) s -= L[k * w + (k - i)]! * S[k * w + (k - i)]!;
    S[i * w] = s;
  }
  return S;
}

/** Variance factor b(x)ᵀ(ZᵀHZ)⁻¹b(x) on interval j at right share u (quadratic in u). */
function factorAt(model: BandModel, j: number, u: number): number {
  const v = 1 - u;
  const f = v * v * model.knotFactor[j]! + 2 * u * v * model.crossFactor[j]! + u * u * model.knotFactor[j + 1]!;
  return f > 0 ? f : 0;
}

/** Variance factor b(x)ᵀC_i b(x) of the smooth fit at x (clamped to the knots), b scratch of length 3. */
function smoothFactorAt(smooth: SmoothBandPart, x: number, b: Float64Array): number {
  const i = quadraticBasisAt(smooth.knots, 2, x, b);
  const c = smooth.block;
  const o = 6 * i;
  const b0 = b[0]!;
  const b1 = b[1]!;
  const b2 = b[2]!;
  const f = b0 * (b0 * c[o]! + 2 * (b1 * c[o + 1]! + b2 * c[o + 2]!)) + b1 * (b1 * c[o + 3]! + 2 * b2 * c[o + 4]!) + b2 * b2 * c[o + 5]!;
  return f > 0 ? f : 0;
}

/** Checks a band level: 0 < level < 1. */
function checkLevel(level: number): number {
  if (typeof level !== 'number' || !(level > 0 && level < 1)) fail('BAD_OPTION', 'level', `needs a number strictly between 0 and 1; got ${String(level)}`);
  return level;
}

/**
 * Pointwise band of the knot model at each new x: fit ± t·σ̂·√(b(x)ᵀ(ZᵀHZ)⁻¹b(x)) for the curve
 * (`'confidence'`), or ± t·σ̂·√(1 + b(x)ᵀ(ZᵀHZ)⁻¹b(x)) for one new observation of weight 1
 * (`'prediction'`); t is Student's t quantile at (1 + level)/2 with n_used − p degrees of freedom.
 * Beyond the end knots the band is that of the end value.
 *
 * Cost O(log K) per new x (O(1) after locating it). Inputs are not modified.
 *
 * @param model from {@link fitBandModel}.
 * @param newX points, finite (any number of them, also none).
 * @param level confidence level, 0 < level < 1, default 0.95.
 * @param kind `'confidence'` (default) or `'prediction'`.
 * @throws RatchetError NON_FINITE (a new x), BAD_OPTION (level, kind).
 * @example bandAt(fitBandModel([1, 2, 3, 4], [1, 3, 2, 4], { knots: 2 }), [2.5]).upper[0] // → 4.540927391012383
 * @see R `predict.lm(…, interval = "confidence" | "prediction")`, which this equals for knots = 2.
 */
export function bandAt(model: BandModel, newX: ArrayLike<number>, level = 0.95, kind: BandKind = 'confidence'): Band {
  checkLevel(level);
  if (kind !== 'confidence' && kind !== 'prediction') fail('BAD_OPTION', 'kind', `needs 'confidence' or 'prediction'; got ${String(kind)}`);
  const xs = finiteArray('new_xs', newX);
  const t = studentTQuantile((1 + level) / 2, model.dfResid);
  const extra = kind === 'prediction' ? 1 : 0;
  const n = xs.length;
  const lower = new Float64Array(n);
  const fit = new Float64Array(n);
  const upper = new Float64Array(n);
  const tx = model.knotX;
  const ty = model.knotY;
  const smooth = model.smooth;
  if (smooth !== undefined) {
    const b = new Float64Array(3);
    for (let i = 0; i < n; i++) {
      const f = smoothTableAt(tx, ty, 'quadratic', xs[i]!);
      const half = t * model.sigma * Math.sqrt(smoothFactorAt(smooth, xs[i]!, b) + extra);
      fit[i] = f;
      lower[i] = f - half;
      upper[i] = f + half;
    }
    return { lower, fit, upper, t };
  }
  for (let i = 0; i < n; i++) {
    const [j, u] = locate(tx, xs[i]!);
    const f = u === 0 ? ty[j]! : u === 1 ? ty[j + 1]! : lerp(ty[j]!, ty[j + 1]!, u);
    const half = t * model.sigma * Math.sqrt(factorAt(model, j, u) + extra);
    fit[i] = f;
    lower[i] = f - half;
    upper[i] = f + half;
  }
  return { lower, fit, upper, t };
}

/** One row of {@link inverseBand}: lower x, read-back x, upper x — each a number or the reason it is missing. */
export interface InverseInterval {
  readonly lower: number | RatchetError;
  readonly x: number | RatchetError;
  readonly upper: number | RatchetError;
}

/**
 * Inverse-regression (calibration) interval for each target y: the read-back x (equal to
 * {@link invertChecked} with the middle rule, as RATCHET.INVERT gives) and the limits of the
 * stretch of x around it whose prediction band for the mean of `replicates` new measurements,
 * f(x) ± t·σ̂·√(b(x)ᵀ(ZᵀHZ)⁻¹b(x) + 1/replicates), contains the target (Eisenhart 1939). With
 * knots = 2 this is the classical straight-line calibration interval.
 *
 * Method: on each knot interval f is linear and the variance quadratic in the share u, so the
 * edge equation (f(u) − y₀)² = t²σ̂²(factor(u) + 1/m) is a quadratic in u; its roots on the right
 * side (the edge that rises past the target) are taken with the numerically stable formula and
 * polished by safeguarded Newton steps; the scan runs from the read-back outwards, interval by
 * interval, and stops at the first root. Exact to rounding. Cost O(K) per target.
 *
 * A limit the band does not reach inside the data's x range (smallest to largest x with positive
 * weight) is a NOT_REACHABLE error value naming the side; a target outside the curve's range
 * gives NOT_REACHABLE in all three places, as RATCHET.INVERT does.
 *
 * @param model from {@link fitBandModel}.
 * @param targets target y values (each must be finite).
 * @param level confidence level, 0 < level < 1, default 0.95.
 * @param replicates number m ≥ 1 of new measurements averaged into each target (whole or not), default 1.
 * @throws RatchetError BAD_OPTION (level, replicates), NON_FINITE (a target).
 * @example inverseBand(fitBandModel([1, 2, 3, 4, 5, 6], [10, 14, 12, 17, 16, 21], { knots: 2 }), [15], 0.8, 4)[0]
 *   // → { lower: 2.4559220474129395, x: 3.499999999999999, upper: 4.544077952587058 }
 */
export function inverseBand(model: BandModel, targets: ArrayLike<number>, level = 0.95, replicates = 1): InverseInterval[] {
  checkLevel(level);
  if (typeof replicates !== 'number' || !(replicates >= 1) || !Number.isFinite(replicates)) {
    fail('BAD_OPTION', 'replicates', `needs a number ≥ 1; got ${String(replicates)}`);
  }
  const ys = finiteArray('target_ys', targets);
  const t = studentTQuantile((1 + level) / 2, model.dfResid);
  const s = model.direction === 'up' ? 1 : -1;
  const smooth = model.smooth;
  // The scan runs over knot intervals: the table's rows for degree 1, the knots for the smooth fit.
  const tx = smooth === undefined ? model.knotX : smooth.knots;
  const K = tx.length;
  // Rising values: knot values (degree 1) or B-spline coefficients (degree 2).
  const ty = Float64Array.from(smooth === undefined ? model.knotY : smooth.coefficients, (v) => s * v);
  const edge = smooth === undefined ? edgeRoot : (_: BandModel, c: Float64Array, j: number, y: number, sc: number, ex: number, lo: number, hi: number, side: -1 | 1) => smoothEdgeRoot(smooth, c, j, y, sc, ex, lo, hi, side);
  const scale = t * model.sigma;
  const extra = 1 / replicates;
  const [dataLo, dataHi] = model.xRange;
  const out: InverseInterval[] = [];
  for (let i = 0; i < ys.length; i++) {
    let x0: number;
    try {
      x0 = smooth === undefined ? invertChecked(tx, model.knotY, ys[i]!, 'middle') : invertQuadraticChecked(model.knotX, model.knotY, ys[i]!, 'middle');
    } catch (err) {
      if (!(err instanceof RatchetError)) throw err;
      // The read-back's own message, under this function's argument name.
      const e = new RatchetError(err.code, 'target_ys', err.message.slice(err.argument.length + 2));
      out.push({ lower: e, x: e, upper: e });
      continue;
    }
    const y0 = s * ys[i]!;
    const searchLo = Math.max(tx[0]!, Math.min(dataLo, x0));
    const searchHi = Math.min(tx[K - 1]!, Math.max(dataHi, x0));
    const [j0, u0] = locate(tx, x0);
    // Left limit: largest x < x0 with f(x) + t·se(x) = y0 (f ≤ y0 there).
    let lower: number | RatchetError = new RatchetError(
      'NOT_REACHABLE',
      'target_ys',
      // Left of the read-back a rising curve lies below the target (its upper edge must fall to
      // it), a falling one above (its lower edge must rise to it).
      `needs a band whose ${s > 0 ? 'upper edge falls' : 'lower edge rises'} to ${ys[i]} inside the data's x range; the lower x limit lies below ${searchLo}`,
    );
    for (let j = j0; j >= 0 && tx[j + 1]! > searchLo; j--) {
      const uMax = j === j0 ? u0 : 1;
      const uMin = tx[j]! >= searchLo ? 0 : (searchLo - tx[j]!) / (tx[j + 1]! - tx[j]!);
      const root = edge(model, ty, j, y0, scale, extra, uMin, uMax, -1);
      if (root !== null) {
        lower = lerp(tx[j]!, tx[j + 1]!, root);
        break;
      }
    }
    let upper: number | RatchetError = new RatchetError(
      'NOT_REACHABLE',
      'target_ys',
      `needs a band whose ${s > 0 ? 'lower edge rises' : 'upper edge falls'} to ${ys[i]} inside the data's x range; the upper x limit lies above ${searchHi}`,
    );
    for (let j = j0; j < K - 1 && tx[j]! < searchHi; j++) {
      const uMin = j === j0 ? u0 : 0;
      const uMax = tx[j + 1]! <= searchHi ? 1 : (searchHi - tx[j]!) / (tx[j + 1]! - tx[j]!);
      const root = edge(model, ty, j, y0, scale, extra, uMin, uMax, 1);
      if (root !== null) {
        upper = lerp(tx[j]!, tx[j + 1]!, root);
        break;
      }
    }
    out.push({ lower, x: x0, upper });
  }
  return out;
}

/**
 * On interval j (rising values ty), the root u ∈ [uMin, uMax] of the band edge reaching y0 that
 * lies nearest the read-back: for side −1 the largest u with f(u) + c·√V(u) = y0, for side +1
 * the smallest u with f(u) − c·√V(u) = y0, where V(u) = factor(u) + extra and c = t·σ̂. Null
 * when there is none.
 */
function edgeRoot(
  model: BandModel,
  ty: Float64Array,
  j: number,
  y0: number,
  c: number,
  extra: number,
  uMin: number,
  uMax: number,
  side: -1 | 1,
): number | null {
  if (!(uMax >= uMin)) return null;
  const a0 = ty[j]! - y0; // f(u) − y0 = a0 + a1 u
  const a1 = ty[j + 1]! - ty[j]!;
  const k0 = model.knotFactor[j]!;
  const kc = model.crossFactor[j]!;
  const k1 = model.knotFactor[j + 1]!;
  const c2 = c * c;
  // V(u) = k0 (1 − u)² + 2 kc u (1 − u) + k1 u² + extra = v0 + v1 u + v2 u².
  const v0 = k0 + extra;
  const v1 = 2 * (kc - k0);
  const v2 = k0 - 2 * kc + k1;
  // P(u) = (a0 + a1 u)² − c² V(u) = A u² + B u + C.
  const A = a1 * a1 - c2 * v2;
  const B = 2 * a0 * a1 - c2 * v1;
  const C = a0 * a0 - c2 * v0;
  const P = (u: number): number => (a0 + a1 * u) ** 2 - c2 * (v0 + u * (v1 + u * v2));
  const dP = (u: number): number => 2 * a1 * (a0 + a1 * u) - c2 * (v1 + 2 * u * v2);
  const roots: number[] = [];
  const scaleABC = Math.max(Math.abs(A), Math.abs(B), Math.abs(C));
  let vertex = NaN; // P's maximum when it stays below 0: where the edge comes closest to y0
  if (Math.abs(A) <= 1e-14 * scaleABC) {
    if (B !== 0) roots.push(-C / B);
  } else {
    const disc = B * B - 4 * A * C;
    if (disc >= 0) {
      const q = -0.5 * (B + (B >= 0 ? 1 : -1) * Math.sqrt(disc));
      roots.push(q / A);
      if (q !== 0) roots.push(C / q);
    } else if (A < 0) vertex = -B / (2 * A);
  }
  const tol = touchTolerance(Math.abs(ty[j]!) + Math.abs(ty[j + 1]!), y0, c);
  const touches = (u: number): boolean => touchesTarget(a0 + a1 * u, c * Math.sqrt(Math.max(v0 + u * (v1 + u * v2), 0)), tol, side);
  let best: number | null = null;
  const span = 1e-9;
  for (let u of roots) {
    if (!Number.isFinite(u) || u < uMin - span || u > uMax + span) continue;
    // Safeguarded Newton polish on P inside [uMin, uMax].
    for (let it = 0; it < 3; it++) {
      const g = dP(u);
      if (g === 0) break;
      const next = u - P(u) / g;
      if (!(Math.abs(next - u) < 1e-6)) break;
      u = next;
    }
    u = Math.min(Math.max(u, uMin), uMax);
    const gap = a0 + a1 * u; // f − y0: ≤ 0 on the upper edge's root (left side), ≥ 0 on the lower edge's
    if (side < 0 ? gap > tol : gap < -tol) continue;
    if (best === null || (side < 0 ? u > best : u < best)) best = u;
  }
  // Touching points (the rule of touchesTarget): P's maximum inside the interval, and the inward
  // end when P falls from it outwards (the edge turns back there, at a knot).
  const touching: number[] = [];
  if (vertex >= uMin - span && vertex <= uMax + span) touching.push(Math.min(Math.max(vertex, uMin), uMax));
  if (side > 0 ? dP(uMin) <= 0 : dP(uMax) >= 0) touching.push(side > 0 ? uMin : uMax);
  for (const u of touching) {
    if (!touches(u)) continue;
    if (best === null || (side < 0 ? u > best : u < best)) best = u;
  }
  return best;
}

/** Coefficients (ascending powers) of the product of two polynomials. */
function polyMul(a: readonly number[], b: readonly number[]): number[] {
  const out = new Array<number>(a.length + b.length - 1).fill(0);
  for (let i = 0; i < a.length; i++) for (let k = 0; k < b.length; k++) out[i + k] = out[i + k]! + a[i]! * b[k]!;
  return out;
}

/** Horner evaluation of a polynomial given by ascending coefficients. */
function polyAt(a: readonly number[], u: number): number {
  let v = 0;
  for (let i = a.length - 1; i >= 0; i--) v = v * u + a[i]!;
  return v;
}

/** The derivative's ascending coefficients. */
function polyDerivative(a: readonly number[]): number[] {
  const out: number[] = [];
  for (let i = 1; i < a.length; i++) out.push(i * a[i]!);
  return out;
}

/**
 * Points lo = p₀ < p₁ < … < p_r = hi such that the polynomial is monotone on each [p_k, p_{k+1}]:
 * the sign changes of its derivative, found by the same rule one degree down (a polynomial of
 * degree d has at most d − 1 of them, and a constant none), so every root is isolated exactly.
 */
function monotonePieces(a: readonly number[], lo: number, hi: number): number[] {
  const pts = [lo];
  if (a.length > 2) {
    const d = polyDerivative(a);
    const inner = monotonePieces(d, lo, hi);
    for (let k = 0; k + 1 < inner.length; k++) {
      const l = inner[k]!;
      const r = inner[k + 1]!;
      const fl = polyAt(d, l);
      const fr = polyAt(d, r);
      if ((fl < 0 && fr > 0) || (fl > 0 && fr < 0)) {
        const root = bisectRoot(d, l, r, fl < 0);
        if (root > pts[pts.length - 1]! && root < hi) pts.push(root);
      }
    }
  }
  pts.push(hi);
  return pts;
}

/**
 * The sign change of a polynomial monotone on [l, r] (negative at l when `negLeft`), by bisection
 * to adjacent doubles: exact to the rounding of its evaluation. At most about 64 halvings.
 */
function bisectRoot(a: readonly number[], l: number, r: number, negLeft: boolean): number {
  for (;;) {
    const mid = l + (r - l) / 2;
    if (!(mid > l && mid < r)) break;
    const v = polyAt(a, mid);
    if (v === 0) return mid;
    if (v < 0 === negLeft) l = mid;
    else r = mid;
  }
  return Math.abs(polyAt(a, l)) <= Math.abs(polyAt(a, r)) ? l : r;
}

/**
 * {@link edgeRoot} for the smooth fit: on knot interval j (u the share of the interval), f is a
 * quadratic in u (B-spline coefficients `cr`, rising), its variance factor a quartic, so
 * P(u) = (f(u) − y0)² − c²(factor(u) + extra) is a quartic. Its monotone pieces come from the
 * sign changes of P′, P″, P‴ (each isolated by the one below), and the first piece, walking from
 * the read-back outwards, on which P turns from ≤ 0 to > 0 holds the limit; bisection finds it to
 * rounding. Null when the band does not reach y0 on [uMin, uMax].
 */
function smoothEdgeRoot(
  smooth: SmoothBandPart,
  cr: Float64Array,
  j: number,
  y0: number,
  c: number,
  extra: number,
  uMin: number,
  uMax: number,
  side: -1 | 1,
): number | null {
  if (!(uMax >= uMin)) return null;
  const t = smooth.knots;
  const K = t.length;
  const a = t[j]!;
  const b = t[j + 1]!;
  const tm1 = t[Math.max(j - 1, 0)]!;
  const tp2 = t[Math.min(j + 2, K - 1)]!;
  const h = b - a;
  const al = h / (b - tm1);
  const be = h / (tp2 - a);
  const ga = (a - tm1) / (b - tm1);
  // The three B-splines on the interval as polynomials in u (de Boor's recurrence, expanded).
  const p0 = [al, -2 * al, al];
  const p1 = [ga, 2 * al, -al - be];
  const p2 = [0, 0, be];
  const c0 = cr[j]!;
  const c1 = cr[j + 1]!;
  const c2 = cr[j + 2]!;
  const F = [c0 * p0[0]! + c1 * p1[0]! - y0, c0 * p0[1]! + c1 * p1[1]!, c0 * p0[2]! + c1 * p1[2]! + c2 * p2[2]!];
  const S = smooth.block;
  const o = 6 * j;
  const V = [extra, 0, 0, 0, 0];
  const add = (pa: readonly number[], pb: readonly number[], w: number): void => {
    const q = polyMul(pa, pb);
    for (let k = 0; k < q.length; k++) V[k] = V[k]! + w * q[k]!;
  };
  add(p0, p0, S[o]!);
  add(p0, p1, 2 * S[o + 1]!);
  add(p0, p2, 2 * S[o + 2]!);
  add(p1, p1, S[o + 3]!);
  add(p1, p2, 2 * S[o + 4]!);
  add(p2, p2, S[o + 5]!);
  const FF = polyMul(F, F);
  const c2t = c * c;
  const P = FF.map((v, k) => v - c2t * V[k]!);
  const pts = monotonePieces(P, uMin, uMax);
  const tol = touchTolerance(Math.abs(c0) + Math.abs(c1) + Math.abs(c2), y0, c);
  const touches = (u: number): boolean => touchesTarget(polyAt(F, u), c * Math.sqrt(Math.max(polyAt(V, u), 0)), tol, side);
  // Walk the pieces outwards; each piece's inner end is checked first: P > 0 there (the edge is
  // already past y0), or a touching point — P does not rise on the piece after it (a maximum of
  // P: inside the interval, or at the knot where the walk enters) and the edge is within tol of y0.
  const last = pts.length - 1;
  for (let k = 0; k < last; k++) {
    const inner = side > 0 ? pts[k]! : pts[last - k]!;
    const outer = side > 0 ? pts[k + 1]! : pts[last - k - 1]!;
    const pIn = polyAt(P, inner);
    const pOut = polyAt(P, outer);
    if (pIn > 0 || (pOut <= pIn && touches(inner))) return inner;
    if (pOut > 0) return side > 0 ? bisectRoot(P, inner, outer, true) : bisectRoot(P, outer, inner, false);
  }
  return null;
}

/**
 * The tolerance τ of the touching rule ({@link touchesTarget}), in units of y: 1e-12 times the
 * size of the numbers the edge on one knot interval is made of — `values`, the sum of the
 * absolute values defining the curve there (the two knot values for degree 1, the three B-spline
 * coefficients for degree 2) — plus |y₀| and c = t·σ̂. The same τ bounds the sign of f − y₀ at a
 * root (which edge it belongs to).
 */
function touchTolerance(values: number, y0: number, c: number): number {
  return 1e-12 * (values + Math.abs(y0) + c);
}

/**
 * The touching rule shared by both degrees. At a point where the band edge that must reach y₀
 * (the upper edge left of the read-back, the lower edge right of it, for rising values) comes
 * closest to y₀ without crossing it, the edge counts as reaching y₀ there (a double root of the
 * edge equation) when it misses y₀ by at most τ: c·√V − |f − y₀| ≤ τ, with `gap` = f − y₀ on the
 * edge's side (≤ τ for side −1, ≥ −τ for side +1) and `half` = c·√V the band's half-width.
 */
function touchesTarget(gap: number, half: number, tol: number, side: -1 | 1): boolean {
  if (side < 0 ? gap > tol : gap < -tol) return false;
  return half - Math.abs(gap) <= tol;
}

/**
 * {@link bandModelChecked} for a smooth fit (degree 2): H = BᵀWB on the K + 1 quadratic B-splines
 * (pentadiagonal, one pass), Z the null space of the fit's active rows, M = ZᵀHZ in band storage,
 * the band of M⁻¹ (Takahashi), and per knot interval the 3 × 3 block of C = ZM⁻¹Zᵀ on the
 * coefficients touching it. Cost O(n log K + K·m²) plus the null space, m the bandwidth of M.
 */
function smoothBandModelChecked(xs: Float64Array, ys: Float64Array, ws: Float64Array | null, fit: ShapeFit): BandModel {
  const t = fit.knots;
  const K = t.length;
  const nc = K + 1;
  const coefs = fit.coefficients;
  const h0 = new Float64Array(nc);
  const h1 = new Float64Array(nc);
  const h2 = new Float64Array(nc);
  const b = new Float64Array(3);
  let nUsed = 0;
  let sse = 0;
  let xmin = Infinity;
  let xmax = -Infinity;
  for (let i = 0; i < xs.length; i++) {
    const w = ws === null ? 1 : ws[i]!;
    if (!(w > 0)) continue;
    nUsed++;
    const xi = xs[i]!;
    if (xi < xmin) xmin = xi;
    if (xi > xmax) xmax = xi;
    const q = quadraticBasisAt(t, 2, xi, b);
    const b0 = b[0]!;
    const b1 = b[1]!;
    const b2 = b[2]!;
    h0[q] = h0[q]! + w * b0 * b0;
    h0[q + 1] = h0[q + 1]! + w * b1 * b1;
    h0[q + 2] = h0[q + 2]! + w * b2 * b2;
    h1[q] = h1[q]! + w * b0 * b1;
    h1[q + 1] = h1[q + 1]! + w * b1 * b2;
    h2[q] = h2[q]! + w * b0 * b2;
    const r = ys[i]! - (b0 * coefs[q]! + b1 * coefs[q + 1]! + b2 * coefs[q + 2]!);
    sse += w * r * r;
  }
  const activeRows: SparseRow[] = Array.from(fit.active, (i) => fit.constraints[i]!);
  const basis = denseToBasis(nc, nullSpaceBasis(nc, activeRows));
  const p = basis.size;
  const dfResid = nUsed - p;
  if (dfResid < 1) {
    fail('TOO_FEW_POINTS', 'known_ys', `needs more rows with positive weight (${nUsed}) than fitted parameters (${p}) to estimate the scatter`);
  }
  const sigma = Math.sqrt(sse / dfResid);
  const { rowStart, col, val } = basis;
  const hAt = (r: number, q: number): number => {
    const d = r > q ? r - q : q - r;
    const lo = r < q ? r : q;
    return d === 0 ? h0[lo]! : d === 1 ? h1[lo]! : h2[lo]!;
  };
  // Bandwidth: the spread of columns over every window of three coefficient rows (H couples them).
  let m = 0;
  for (let r = 0; r < nc; r++) {
    const end = rowStart[Math.min(r + 3, nc)]!;
    let hiCol = -1;
    let loCol = p;
    for (let q = rowStart[r]!; q < end; q++) {
      hiCol = Math.max(hiCol, col[q]!);
      loCol = Math.min(loCol, col[q]!);
    }
    if (hiCol >= loCol) m = Math.max(m, hiCol - loCol);
  }
  const width = m + 1;
  const band = new Float64Array(p * width);
  for (let r = 0; r < nc; r++) {
    for (let r2 = Math.max(0, r - 2); r2 <= Math.min(nc - 1, r + 2); r2++) {
      const hv = hAt(r, r2);
      if (hv === 0) continue;
      for (let q = rowStart[r]!; q < rowStart[r + 1]!; q++) {
        for (let q2 = rowStart[r2]!; q2 < rowStart[r2 + 1]!; q2++) {
          const a = col[q]!;
          const a2 = col[q2]!;
          if (a2 > a) continue; // lower triangle only; the mirror pair adds the upper one
          band[a * width + (a - a2)] = band[a * width + (a - a2)]! + hv * val[q]! * val[q2]!;
        }
      }
    }
  }
  const S = bandedInverseBand(band, p, m);
  const entry = (a: number, a2: number): number => (a >= a2 ? S[a * width + (a - a2)]! : S[a2 * width + (a2 - a)]!);
  const cov = (r: number, r2: number): number => {
    let v = 0;
    for (let q = rowStart[r]!; q < rowStart[r + 1]!; q++) {
      for (let q2 = rowStart[r2]!; q2 < rowStart[r2 + 1]!; q2++) v += val[q]! * val[q2]! * entry(col[q]!, col[q2]!);
    }
    return v;
  };
  const block = new Float64Array(6 * (K - 1));
  for (let i = 0; i + 1 < K; i++) {
    const o = 6 * i;
    block[o] = cov(i, i);
    block[o + 1] = cov(i, i + 1);
    block[o + 2] = cov(i, i + 2);
    block[o + 3] = cov(i + 1, i + 1);
    block[o + 4] = cov(i + 1, i + 2);
    block[o + 5] = cov(i + 2, i + 2);
  }
  if (!Number.isFinite(sigma) || !block.every(Number.isFinite)) {
    fail('NUMERICAL', 'known_ys', 'needs data whose sums of squares stay within the range of doubles for a band');
  }
  return {
    direction: fit.direction,
    knotX: fit.knotX,
    knotY: fit.knotY,
    nUsed,
    parameters: p,
    dfResid,
    sigma,
    xRange: [xmin, xmax],
    knotFactor: new Float64Array(0),
    crossFactor: new Float64Array(0),
    smooth: { knots: fit.knots, coefficients: coefs, block },
  };
}

/** Dense null-space columns as a compressed-row {@link ActiveSetBasis}; entries at or below 1e-14 are dropped. */
function denseToBasis(K: number, columns: readonly Float64Array[]): ActiveSetBasis {
  if (columns.length === 0) fail('TOO_FEW_POINTS', 'known_ys', 'needs a fit with at least one free parameter for a band');
  const rowStart = new Int32Array(K + 1);
  const col: number[] = [];
  const val: number[] = [];
  for (let j = 0; j < K; j++) {
    rowStart[j] = col.length;
    for (let c = 0; c < columns.length; c++) {
      const v = columns[c]![j]!;
      if (Math.abs(v) > 1e-14) {
        col.push(c);
        val.push(v);
      }
    }
  }
  rowStart[K] = col.length;
  return { knots: K, size: columns.length, rowStart, col: Int32Array.from(col), val: Float64Array.from(val) };
}

/** Options of {@link fitShapedBandModel}: those of {@link fitBandModel} plus the shape. */
export interface ShapedBandFitOptions extends BandFitOptions {
  /** −1 concave, 0 any (default), 1 convex. */
  curvature?: Curvature | undefined;
  /** 1 piecewise linear (default), 2 smooth (quadratic B-splines). */
  degree?: Degree | undefined;
}

/**
 * The band model of any knot fit the worksheet offers: the plain knot model as
 * {@link fitBandModel}, and a concave or convex one (curvature ±1) or a smooth one (degree 2,
 * quadratic B-splines, any curvature) conditional on its active set — the active rows of
 * {@link shapeRegression} define the null-space basis Z ({@link nullSpaceBasis}) of the knot
 * values (degree 1) or the K + 1 B-spline coefficients (degree 2), on which the shaped optimum is
 * the plain weighted least-squares fit (docs/shapes.md, "For bands conditional on the active
 * set"), so Var f(x) = σ̂² b(x)ᵀZ(ZᵀBᵀWBZ)⁻¹Zᵀb(x), b(x) the basis values at x (2 or 3 non-zeros),
 * p = columns of Z, Student t with n_used − p degrees of freedom. Beyond the end knots: the band
 * of the end value. The smooth model keeps per knot interval the 3 × 3 covariance factor block
 * of the coefficients touching it, so {@link bandAt} stays O(log K) per x; {@link inverseBand}
 * reads back x on its quadratic table (as RATCHET.INVERT) and solves a quartic per interval.
 *
 * Cost: the fit, plus O(K²·a) for the null space of a active rows and O(K·m²) for the banded
 * factorisation (m the bandwidth of ZᵀHZ). Inputs are not modified.
 *
 * @param x, y the data (finite, same length n ≥ 1).
 * @param options knots (≥ 2 or positions; 0 refused as in {@link checkBandKnots}), weights, direction,
 *   curvature (−1, 0 default, 1), degree (1 default, 2).
 * @throws RatchetError BAD_KNOTS (classic fit), BAD_OPTION (curvature or degree outside their
 *   sets), TOO_FEW_POINTS (n_used ≤ p, or coefficients the data do not determine separately),
 *   and the errors of {@link fitBandModel}.
 * @example fitShapedBandModel([1, 2, 3, 4], [1, 3, 2, 4], { knots: 2, curvature: 1 }).sigma // → 0.9486832980505138 (a line: no active row)
 * @example fitShapedBandModel([1, 2, 3, 4, 5, 6], [1, 3, 2, 4, 5, 7], { knots: 2, degree: 2 }).dfResid // → 3 (one quadratic piece: 3 B-spline coefficients, none held by a constraint)
 */
export function fitShapedBandModel(x: ArrayLike<number>, y: ArrayLike<number>, options: ShapedBandFitOptions): BandModel {
  const curvature = checkCurvature(options.curvature);
  const degree = checkDegree(options.degree);
  const knots = checkBandKnots(options.knots);
  if (curvature === 0 && degree === 1) return fitBandModel(x, y, options);
  const xs = finiteArray('x', x);
  sameLength('x', xs.length, 'y', y);
  const ys = finiteArray('y', y);
  if (xs.length === 0) fail('EMPTY_INPUT', 'x', 'needs at least one value; got none');
  const ws = options.weights === undefined ? null : weightArray(xs.length, options.weights);
  const fit = shapeRegression(xs, ys, { knots, weights: ws ?? undefined, direction: options.direction, curvature, degree });
  if (degree === 2) return smoothBandModelChecked(xs, ys, ws, fit);
  const K = fit.knotX.length;
  const activeRows = Array.from(fit.active, (i) => fit.constraints[i]!);
  const basis = denseToBasis(K, nullSpaceBasis(K, activeRows));
  return bandModelChecked(xs, ys, ws, fit.knotX, fit.knotY, fit.direction, basis);
}
