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
import { checkCurvature, checkDegree, shapeRegression, type Curvature, type Degree } from './shape-fit.js';
import { nullSpaceBasis } from './shape-qp.js';

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
  const tx = model.knotX;
  const K = tx.length;
  const ty = Float64Array.from(model.knotY, (v) => s * v); // rising
  const scale = t * model.sigma;
  const extra = 1 / replicates;
  const [dataLo, dataHi] = model.xRange;
  const out: InverseInterval[] = [];
  for (let i = 0; i < ys.length; i++) {
    let x0: number;
    try {
      x0 = invertChecked(tx, model.knotY, ys[i]!, 'middle');
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
      const root = edgeRoot(model, ty, j, y0, scale, extra, uMin, uMax, -1);
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
      const root = edgeRoot(model, ty, j, y0, scale, extra, uMin, uMax, 1);
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
  if (Math.abs(A) <= 1e-14 * scaleABC) {
    if (B !== 0) roots.push(-C / B);
  } else {
    const disc = B * B - 4 * A * C;
    if (disc >= 0) {
      const q = -0.5 * (B + (B >= 0 ? 1 : -1) * Math.sqrt(disc));
      roots.push(q / A);
      if (q !== 0) roots.push(C / q);
    } else if (disc > -1e-12 * B * B) roots.push(-B / (2 * A)); // a touching (double) root
  }
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
    const tol = 1e-12 * (Math.abs(ty[j]!) + Math.abs(ty[j + 1]!) + Math.abs(y0) + c);
    if (side < 0 ? gap > tol : gap < -tol) continue;
    if (best === null || (side < 0 ? u > best : u < best)) best = u;
  }
  return best;
}

/** Options of {@link fitShapedBandModel}: those of {@link fitBandModel} plus the shape. */
export interface ShapedBandFitOptions extends BandFitOptions {
  /** −1 concave, 0 any (default), 1 convex. */
  curvature?: Curvature | undefined;
  /** 1 piecewise linear (default). Degree 2 (smooth) has no band yet and is refused. */
  degree?: Degree | undefined;
}

/**
 * The band model of any knot fit the worksheet offers: the plain knot model as
 * {@link fitBandModel}, and a concave or convex one (curvature ±1, degree 1) conditional on its
 * active set — the active shape rows of {@link shapeRegression} define the null-space basis Z
 * ({@link nullSpaceBasis}), on which the shaped optimum is the plain weighted least-squares fit
 * (docs/shapes.md, "For bands conditional on the active set"), so
 * Var f(x) = σ̂² b(x)ᵀZ(ZᵀBᵀWBZ)⁻¹Zᵀb(x) with p = columns of Z.
 *
 * Cost: the fit, plus O(K²·a) for the null space of a active rows and O(K·m²) for the banded
 * factorisation (m the bandwidth of ZᵀHZ). Inputs are not modified.
 *
 * @param x, y the data (finite, same length n ≥ 1).
 * @param options knots (≥ 2 or positions; 0 refused as in {@link checkBandKnots}), weights, direction,
 *   curvature (−1, 0 default, 1), degree (1 default; 2 refused).
 * @throws RatchetError BAD_KNOTS (classic fit), BAD_OPTION (degree 2: the smooth fit has no band;
 *   curvature or degree outside their sets), and the errors of {@link fitBandModel}.
 * @example fitShapedBandModel([1, 2, 3, 4], [1, 3, 2, 4], { knots: 2, curvature: 1 }).sigma // → 0.9486832980505138 (a line: no active row)
 */
export function fitShapedBandModel(x: ArrayLike<number>, y: ArrayLike<number>, options: ShapedBandFitOptions): BandModel {
  const curvature = checkCurvature(options.curvature);
  const degree = checkDegree(options.degree);
  const knots = checkBandKnots(options.knots);
  if (degree === 2) {
    fail('BAD_OPTION', 'degree', 'needs 1 (piecewise linear) for a band: the smooth fit (degree 2) has no band or read-back interval yet');
  }
  if (curvature === 0) return fitBandModel(x, y, options);
  const xs = finiteArray('x', x);
  sameLength('x', xs.length, 'y', y);
  const ys = finiteArray('y', y);
  if (xs.length === 0) fail('EMPTY_INPUT', 'x', 'needs at least one value; got none');
  const ws = options.weights === undefined ? null : weightArray(xs.length, options.weights);
  const fit = shapeRegression(xs, ys, { knots, weights: ws ?? undefined, direction: options.direction, curvature, degree: 1 });
  const K = fit.knotX.length;
  const activeRows = Array.from(fit.active, (i) => fit.constraints[i]!);
  const columns = nullSpaceBasis(K, activeRows);
  if (columns.length === 0) fail('TOO_FEW_POINTS', 'known_ys', 'needs a fit with at least one free parameter for a band');
  // Z in compressed rows; entries below rounding of the basis are dropped.
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
  const basis: ActiveSetBasis = { knots: K, size: columns.length, rowStart, col: Int32Array.from(col), val: Float64Array.from(val) };
  return bandModelChecked(xs, ys, ws, fit.knotX, fit.knotY, fit.direction, basis);
}
