/**
 * Shaped knot fits: concave or convex piecewise-linear curves, and smooth (quadratic B-spline)
 * monotone curves, each fitted by exact least squares.
 */
import type { CommonFitOptions, Direction } from './types.js';
import { boundsPair, finiteArray, sameLength, weightArray } from './validate.js';
import { checkKnotCount, checkKnotPositions, evenKnots } from './knots.js';
import { resolveDirection } from './direction.js';
import { fail, isRatchetError } from './errors.js';
import { intervalIndex } from './interpolate.js';
import { bandTimes, solveBandedQp, sparseRow, twoProductError, type SparseRow, type SymmetricBand } from './shape-qp.js';
import type { TableInterpolation } from './smooth-table.js';

/** Curvature of a knot fit: 0 any, −1 concave (slopes never increase), 1 convex (never decrease). */
export type Curvature = -1 | 0 | 1;

/** Degree of a knot fit: 1 piecewise linear, 2 smooth (quadratic B-spline). */
export type Degree = 1 | 2;

/**
 * Validates a curvature option: −1, 0 or 1; absent (undefined or null) → 0. Cost O(1).
 * @param value the option as given. @param name the argument name for the message (default `curvature`).
 * @throws RatchetError BAD_OPTION for anything else (message names the value or its type).
 * @example checkCurvature(undefined) // → 0
 */
export function checkCurvature(value: unknown, name = 'curvature'): Curvature {
  if (value === undefined || value === null) return 0;
  if (value === 0 || value === 1 || value === -1) return value;
  return fail('BAD_OPTION', name, `needs -1 (concave), 0 (any) or 1 (convex); got ${typeof value === 'number' ? String(value) : typeof value}`);
}

/**
 * Validates a degree option: 1 or 2; absent (undefined or null) → 1. Cost O(1).
 * @param value the option as given. @param name the argument name for the message (default `degree`).
 * @throws RatchetError BAD_OPTION for anything else.
 * @example checkDegree(2) // → 2
 */
export function checkDegree(value: unknown, name = 'degree'): Degree {
  if (value === undefined || value === null) return 1;
  if (value === 1 || value === 2) return value;
  return fail('BAD_OPTION', name, `needs 1 (piecewise linear) or 2 (smooth); got ${typeof value === 'number' ? String(value) : typeof value}`);
}

/** Options of {@link shapeRegression}. */
export interface ShapeFitOptions extends CommonFitOptions {
  /** A whole number K ≥ 2 (evenly spaced over the x range of rows with positive weight) or explicit positions. */
  knots: number | ArrayLike<number>;
  /** −1 concave, 0 any (default), 1 convex. */
  curvature?: Curvature | undefined;
  /** 1 piecewise linear (default), 2 smooth. */
  degree?: Degree | undefined;
}

/** Result of {@link shapeRegression}. */
export interface ShapeFit {
  readonly method: 'knots';
  readonly direction: Direction;
  readonly curvature: Curvature;
  readonly degree: Degree;
  /** Knot positions t₀ < … < t_{K−1}. */
  readonly knots: Float64Array;
  /**
   * The model's coefficients θ in the user's direction: knot values (degree 1, length K) or
   * quadratic B-spline coefficients (degree 2, length K + 1).
   */
  readonly coefficients: Float64Array;
  /**
   * The model as a table. Degree 1: the knots and their values. Degree 2: 2K − 1 rows — each knot
   * and each interval midpoint with the curve's value there — read with `interpolation`
   * `'quadratic'` (see smoothTableAt in smooth-table.ts).
   */
  readonly knotX: Float64Array;
  readonly knotY: Float64Array;
  readonly interpolation: TableInterpolation;
  /** Fitted value per input row, in input order. */
  readonly fitted: Float64Array;
  /**
   * Effective size: the number of coefficients minus the number of active shape constraints (a
   * bound that is reached does not lower it, as for the plain knot model's levels).
   */
  readonly levels: number;
  /** 1 where some row with positive weight lies in the support of the coefficient's basis function. */
  readonly identified: Uint8Array;
  /**
   * Every constraint of the problem as a sparse row a·θ ≥ b on `coefficients` (user direction):
   * shape rows first (differences or changes of slope, at most three non-zeros), then the lower
   * bound on the first coefficient and the upper bound on the last when they are finite.
   */
  readonly constraints: readonly SparseRow[];
  /**
   * Indices into `constraints` of the rows held with equality at the optimum (the final working
   * set). With Z a basis of their null space ({@link nullSpaceBasis}), the fit is the plain
   * weighted least-squares fit on the design B·Z — the basis of bands conditional on the active set.
   */
  readonly active: Int32Array;
  /** Lagrange multiplier of every constraint (≥ 0; 0 when inactive). */
  readonly multipliers: Float64Array;
}

/**
 * Weighted least-squares knot fit with a shape: concave or convex piecewise-linear curves
 * (degree 1, curvature ±1) and smooth monotone curves (degree 2, quadratic B-splines, any
 * curvature). Curvature 0 with degree 1 is the plain knot model ({@link knotRegression}); this
 * function solves it too (the same optimum), with the constraint bookkeeping below.
 *
 * Degree 1: f(x) = Σⱼ θⱼ hⱼ(x), hat functions on the knots, flat beyond the end knots. With slopes
 * sⱼ = (θⱼ₊₁ − θⱼ)/(tⱼ₊₁ − tⱼ): concave ⇔ s non-increasing, convex ⇔ s non-decreasing; rising
 * adds s ≥ 0, which for a concave curve needs only the last slope and for a convex one only the
 * first (falling: the mirror image, applied to −y). Degree 2: f(x) = Σⱼ cⱼ Bⱼ(x), quadratic
 * B-splines on the knot sequence t₀, t₀, t₀, t₁, …, t_{K−2}, t_{K−1}, t_{K−1}, t_{K−1} (K + 1
 * functions, x clamped to [t₀, t_{K−1}]). f′ is the linear spline with value
 * dⱼ = 2(cⱼ − cⱼ₋₁)/(τⱼ₊₂ − τⱼ) at knot t_{j−1}, so rising ⇔ c non-decreasing and convex ⇔ d
 * non-decreasing (concave: non-increasing) — exact equivalences (de Boor 2001, A Practical Guide to
 * Splines, ch. X). Every constraint is linear with at most three adjacent non-zeros; the bounds
 * lower ≤ f ≤ upper are the bounds on the first and last coefficient (f is monotone and meets
 * them at the ends).
 *
 * Method: one O(n log K) pass assembles the banded normal matrix H = BᵀWB (tridiagonal for
 * degree 1, pentadiagonal for degree 2) and BᵀWy; {@link solveBandedQp} solves the QP exactly
 * (active set on the banded KKT system), starting from the best constant with every shape
 * constraint in the working set.
 *
 * Knots with no data nearby: when H is singular or nearly so (a coefficient whose basis function
 * meets no row with positive weight, chains of such, or rows only a few ulps apart; a Cholesky
 * pivot below 1e-10 of its diagonal entry), the data do not determine every coefficient. Ratchet
 * then adds the tie-break ε Σ (θⱼ₊₁ − θⱼ)²/gⱼ (gⱼ the knot span of the difference) with
 * ε = 1e-8·tr(H)/tr(R), and runs four proximal passes (the same QP with the tie-break centred on
 * the previous answer) that remove its bias on the data-determined directions. The answer is
 * unique and satisfies the shape exactly; among the optimal fits it is close to the least rough
 * one (between data, close to linear interpolation where the shape allows it; flat beyond them).
 *
 * Cost: O(n log K) plus O(K) per active-set iteration; memory O(n + K).
 *
 * @param x predictor values, finite, length n.
 * @param y responses, finite, length n.
 * @param options knots (required), curvature (−1, 0 default, 1), degree (1 default, 2), weights
 *   (default 1), direction (`'up'` default, `'down'`, `'auto'`), lower, upper.
 * @throws RatchetError as {@link knotRegression}, plus BAD_OPTION for curvature or degree.
 * @example shapeRegression([0, 1, 2, 3], [0, 2, 2.5, 2.6], { knots: 4, curvature: -1 }).knotY
 *   // → Float64Array [0, 2, 2.5, 2.6] (already concave: the data themselves)
 * @example shapeRegression([0, 1, 2, 3], [0, 2, 1, 3], { knots: 2, degree: 2 }).knotY
 *   // → Float64Array [0.3, 1.5, 2.7] to rounding (one quadratic piece, its least-squares fit — here a line — read at both knots and the midpoint)
 */
export function shapeRegression(x: ArrayLike<number>, y: ArrayLike<number>, options: ShapeFitOptions): ShapeFit {
  const xs = finiteArray('x', x);
  sameLength('x', xs.length, 'y', y);
  const ys = finiteArray('y', y);
  const ws = options.weights === undefined ? null : weightArray(xs.length, options.weights);
  const [lower, upper] = boundsPair(options.lower, options.upper);
  const curvature = checkCurvature(options.curvature);
  const degree = checkDegree(options.degree);
  const k = options.knots;
  let knots: number | Float64Array;
  if (typeof k === 'number') knots = checkKnotCount(k);
  else if (k !== null && k !== undefined && typeof k.length === 'number') knots = checkKnotPositions(k);
  else return fail('BAD_KNOTS', 'knots', 'needs a knot count or a list of knot positions');
  const direction = resolveDirection(xs, ys, ws ?? undefined, options.direction);
  return shapeChecked(xs, ys, ws, knots, direction, curvature, degree, lower, upper);
}

/**
 * {@link shapeRegression} on validated inputs (finite x, y; weights checked or null for unit
 * weights; a checked knot count or checked positions; resolved direction; checked curvature,
 * degree and bounds). Used by the model entry and cross-validation, which validate once. Same
 * objective, cost, edge cases and errors as {@link shapeRegression}; inputs are not modified.
 * @example shapeChecked(Float64Array.of(0, 1, 2, 3), Float64Array.of(0, 2, 2.5, 2.6), null, 4, 'up', -1, 1, -Infinity, Infinity).knotY
 *   // → Float64Array [0, 2, 2.5, 2.6]
 */
export function shapeChecked(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array | null,
  knots: number | Float64Array,
  direction: Direction,
  curvature: Curvature,
  degree: Degree,
  lower: number,
  upper: number,
): ShapeFit {
  const n = xs.length;
  if (n === 0) fail('EMPTY_INPUT', 'x', 'needs at least one value; got none');
  let xmin = Infinity;
  let xmax = -Infinity;
  for (let i = 0; i < n; i++) {
    if (ws === null || ws[i]! > 0) {
      xmin = Math.min(xmin, xs[i]!);
      xmax = Math.max(xmax, xs[i]!);
    }
  }
  if (!(xmin < xmax)) fail('TOO_FEW_POINTS', 'x', `needs at least 2 distinct values with positive weight; got ${xmin === xmax ? 1 : 0}`);
  const t = typeof knots === 'number' ? evenKnots(xmin, xmax, knots) : knots;
  const K = t.length;
  const m = degree === 1 ? K : K + 1;
  const sign = direction === 'up' ? 1 : -1;
  // Work in the rising frame: y → sign·y flips a falling fit into a rising one, and with it the
  // curvature (−f of a concave f is convex) and the bounds.
  const lo = sign > 0 ? lower : -upper;
  const hi = sign > 0 ? upper : -lower;
  const curv = (sign * curvature) as Curvature;

  // Normal equations H = BᵀWB (bands) and c = BᵀW(sign·y).
  const p = degree;
  // Accumulated in twice the working precision (hi + lo, error-free products and sums), so that
  // a heavy row's share does not round away the light rows' share of the same entry.
  const bands = Array.from({ length: p + 1 }, (_, k) => new Float64Array(m - k));
  const lows = Array.from({ length: p + 1 }, (_, k) => new Float64Array(m - k));
  const c = new Float64Array(m);
  const cLow = new Float64Array(m);
  const basis = new Float64Array(3);
  let wMin = Infinity;
  let wMax = 0;
  for (let i = 0; i < n; i++) {
    const w = ws === null ? 1 : ws[i]!;
    if (w === 0) continue;
    if (w < wMin) wMin = w;
    if (w > wMax) wMax = w;
    const first = basisAt(t, degree, xs[i]!, basis);
    const yi = sign * ys[i]!;
    for (let a = 0; a <= p; a++) {
      const ba = basis[a]!;
      if (ba === 0) continue;
      const wa = w * ba;
      const waErr = twoProductError(w, ba, wa);
      addTwo(c, cLow, first + a, wa, waErr, yi);
      for (let b = a; b <= p; b++) addTwo(bands[b - a]!, lows[b - a]!, first + a, wa, waErr, basis[b]!);
    }
  }
  // Renormalise each hi + lo pair so that hi is the correctly rounded sum.
  const renormalise = (hi: Float64Array, lo: Float64Array): void => {
    for (let j = 0; j < hi.length; j++) {
      const s = hi[j]! + lo[j]!;
      lo[j] = Number.isFinite(s) ? lo[j]! - (s - hi[j]!) : 0;
      hi[j] = s;
    }
  };
  bands.forEach((b, k) => renormalise(b, lows[k]!));
  renormalise(c, cLow);
  for (const band of bands) for (const v of band) if (!Number.isFinite(v)) fail('NUMERICAL', 'x', 'needs values whose squares stay below about 1e300');
  for (const v of c) if (!Number.isFinite(v)) fail('NUMERICAL', 'y', 'needs values whose products with x stay below about 1e300');
  const identified = new Uint8Array(m);
  for (let j = 0; j < m; j++) identified[j] = bands[0]![j]! > 0 ? 1 : 0;

  // Constraint rows (rising frame). Difference k is θ_{k+1} − θ_k over its span g_k.
  const g = new Float64Array(m - 1);
  for (let k = 0; k < m - 1; k++) {
    g[k] = degree === 1 ? t[k + 1]! - t[k]! : (t[Math.min(k + 1, K - 1)]! - t[Math.max(k - 1, 0)]!) / 2;
  }
  const rows: SparseRow[] = [];
  if (curv === 0) {
    for (let k = 0; k < m - 1; k++) rows.push(sparseRow([k, k + 1], [-1, 1]));
  } else {
    // curv·(s_{k+1} − s_k) ≥ 0 with s_k = (θ_{k+1} − θ_k)/g_k, then the one sign row.
    for (let k = 0; k + 2 < m; k++) {
      const a = 1 / g[k]!;
      const b = 1 / g[k + 1]!;
      rows.push(sparseRow([k, k + 1, k + 2], [curv * a, -curv * (a + b), curv * b]));
    }
    const s = curv > 0 ? 0 : m - 2;
    rows.push(sparseRow([s, s + 1], [-1, 1]));
  }
  const shapeRows = rows.length;
  const loRow = Number.isFinite(lo) ? rows.push(sparseRow([0], [1], lo)) - 1 : -1;
  const hiRow = Number.isFinite(hi) ? rows.push(sparseRow([m - 1], [-1], -hi)) - 1 : -1;

  // Start: the best constant (Σc / 1ᵀH1), clipped to the bounds, every shape row working.
  const H: SymmetricBand = { bands, low: lows };
  const ones = new Float64Array(m).fill(1);
  const h1 = bandTimes(H, ones);
  let num = 0;
  let den = 0;
  for (let j = 0; j < m; j++) {
    num += c[j]!;
    den += h1[j]!;
  }
  let v = num / den;
  const working: number[] = [];
  for (let r = 0; r < shapeRows; r++) working.push(r);
  if (lo === hi) v = lo;
  if (v <= lo) {
    v = lo;
    if (loRow >= 0) working.push(loRow);
  } else if (v >= hi) {
    v = hi;
    if (hiRow >= 0) working.push(hiRow);
  }
  const start = new Float64Array(m).fill(v);

  let sol: { theta: Float64Array; multipliers: Float64Array; active: Int32Array } | null = null;
  if (lo === hi) {
    sol = { theta: start, multipliers: new Float64Array(rows.length), active: Int32Array.from(working) };
  } else if (wMax / wMin > WIDE_WEIGHTS) {
    // Weights far apart: a small Cholesky pivot of the rounded H signals a heavy row, not knots
    // without data, and the tie-break (sized to the heaviest rows) would swamp the light ones. The
    // solver works on the twice-precise normal equations and refuses (NUMERICAL, with a message)
    // when they do not determine the fit.
    if (identified.includes(0)) {
      fail('NUMERICAL', 'knots', 'needs rows near every knot when the weights span a ratio beyond about 1e6 (knots without data are filled by a tie-break sized to the heaviest rows, which would hide the light ones); remove the knots that no row reaches, or use fewer knots');
    }
    sol = solveBandedQp(H, c, rows, start, working, cLow, HEAVY_TERM_SHARE);
  } else if (positiveDefinite(bands)) {
    // Nearly singular H (rows a few ulps apart) can still defeat the KKT elimination: then the
    // tie-break below takes over.
    try {
      sol = solveBandedQp(H, c, rows, start, working, cLow);
    } catch (e) {
      if (!isRatchetError(e, 'NUMERICAL')) throw e;
    }
  }
  if (sol === null) {
    // Tie-break for coefficients the data leave free (see shapeRegression), with proximal passes.
    let trH = 0;
    for (let j = 0; j < m; j++) trH += bands[0]![j]!;
    let trR = 0;
    for (let k = 0; k < m - 1; k++) trR += 2 / g[k]!;
    const eps = (1e-8 * trH) / trR;
    const reg = bands.map((b) => b.slice());
    for (let k = 0; k < m - 1; k++) {
      const r = eps / g[k]!;
      reg[0]![k] = reg[0]![k]! + r;
      reg[0]![k + 1] = reg[0]![k + 1]! + r;
      reg[1]![k] = reg[1]![k]! - r;
    }
    const HR: SymmetricBand = { bands: reg };
    sol = solveBandedQp(HR, c, rows, start, working);
    const shifted = new Float64Array(m);
    for (let pass = 0; pass < PROXIMAL_PASSES; pass++) {
      shifted.set(c);
      const th = sol.theta;
      for (let k = 0; k < m - 1; k++) {
        const f = (eps / g[k]!) * (th[k]! - th[k + 1]!);
        shifted[k] = shifted[k]! + f;
        shifted[k + 1] = shifted[k + 1]! - f;
      }
      sol = solveBandedQp(HR, shifted, rows, start, working);
    }
    // Multipliers of the original problem: stationarity Hθ − c = Aᵀλ holds with the tie-break's
    // gradient included; report those of the last pass (the tie-break term is ~1e-8 relative).
  }
  // Rounding guard: the shape rows hold to rounding; make order and bounds hold exactly (changes of
  // an ulp or so), so that a table read-back never sees a reversed step.
  const theta = sol.theta;
  // Active difference rows (θ_{k+1} ≥ θ_k held with equality) are flat stretches: make them exactly
  // flat, as the plain knot model's groups are; an active bound pins its end exactly.
  for (const r of sol.active) {
    const row = rows[r]!;
    if (row.cols.length === 2 && row.rhs === 0 && row.coefs[0]! < 0 && row.coefs[0] === -row.coefs[1]!) {
      theta[row.cols[1]!] = theta[row.cols[0]!]!;
    } else if (r === loRow) theta[0] = lo;
    else if (r === hiRow) theta[m - 1] = hi;
  }
  for (let j = 0; j < m; j++) {
    if (j > 0 && theta[j]! < theta[j - 1]!) theta[j] = theta[j - 1]!;
    if (theta[j]! < lo) theta[j] = lo;
    if (theta[j]! > hi) theta[j] = hi;
  }
  let activeShape = 0;
  for (const r of sol.active) if (r < shapeRows) activeShape++;

  // Back to the user's direction.
  const coefficients = theta.map((q) => sign * q);
  const constraints = sign > 0 ? rows : rows.map((r) => ({ cols: r.cols, coefs: r.coefs.map((a) => -a), rhs: r.rhs }));
  const fitted = new Float64Array(n);
  for (let i = 0; i < n; i++) fitted[i] = curveAt(t, degree, coefficients, xs[i]!, basis);

  let knotX: Float64Array;
  let knotY: Float64Array;
  if (degree === 1) {
    knotX = t.slice();
    knotY = coefficients.slice();
  } else {
    knotX = new Float64Array(2 * K - 1);
    knotY = new Float64Array(2 * K - 1);
    for (let j = 0; j < K; j++) {
      knotX[2 * j] = t[j]!;
      knotY[2 * j] = curveAt(t, 2, coefficients, t[j]!, basis);
      if (j + 1 < K) {
        const mid = t[j]! + (t[j + 1]! - t[j]!) / 2;
        knotX[2 * j + 1] = mid;
        knotY[2 * j + 1] = curveAt(t, 2, coefficients, mid, basis);
      }
    }
    // The same guard on the table (the curve is monotone; its evaluation rounds).
    for (let r = 1; r < knotY.length; r++) if (sign * knotY[r]! < sign * knotY[r - 1]!) knotY[r] = knotY[r - 1]!;
  }
  return {
    method: 'knots',
    direction,
    curvature,
    degree,
    knots: t.slice(),
    coefficients,
    knotX,
    knotY,
    interpolation: degree === 1 ? 'linear' : 'quadratic',
    fitted,
    levels: m - activeShape,
    identified,
    constraints,
    active: sol.active,
    multipliers: sol.multipliers,
  };
}

/** Proximal passes after the tie-break. */
const PROXIMAL_PASSES = 4;

/**
 * Weight ratio (2^20, about 1e6) beyond which the tie-break path is not taken: the same limit as
 * the plain knot model's (docs/tolerances.md, "Scale and weights").
 */
const WIDE_WEIGHTS = 2 ** 20;

/** Share ρ of a multiplier's term scale in its tolerance when the weights are far apart (see solveBandedQp). */
const HEAVY_TERM_SHARE = 2 ** -40;

/** hi[j] + lo[j] += (wa + waErr)·v, with the product's and the sum's rounding errors kept in lo. */
function addTwo(hi: Float64Array, lo: Float64Array, j: number, wa: number, waErr: number, v: number): void {
  const q = wa * v;
  const qErr = twoProductError(wa, v, q) + waErr * v;
  const h = hi[j]!;
  const s = h + q;
  const z = s - h;
  hi[j] = s;
  lo[j] = lo[j]! + ((h - (s - z)) + (q - z)) + qErr;
}

/**
 * The non-zero basis functions of a knot model at x (x clamped to [t₀, t_{K−1}]): writes their
 * values into `out` (2 for degree 1, 3 for degree 2) and returns the index of the first. Degree
 * 2 uses de Boor's recurrence on the clamped knot sequence (see {@link shapeRegression}); the
 * values are non-negative and sum to 1. Cost O(log K).
 *
 * @param t strictly increasing knots (K ≥ 2). @param degree 1 or 2. @param x finite.
 * @example quadraticBasisAt([0, 1, 2], 2, 0.5, new Float64Array(3)) // → 0, out [0.25, 0.625, 0.125]
 */
export function quadraticBasisAt(t: ArrayLike<number>, degree: Degree, x: number, out: Float64Array): number {
  return basisAt(t, degree, x, out);
}

function basisAt(t: ArrayLike<number>, degree: Degree, x: number, out: Float64Array): number {
  const K = t.length;
  const xc = x <= t[0]! ? t[0]! : x >= t[K - 1]! ? t[K - 1]! : x;
  const i = intervalIndex(t, xc);
  const a = t[i]!;
  const b = t[i + 1]!;
  if (degree === 1) {
    const u = (xc - a) / (b - a);
    out[0] = 1 - u;
    out[1] = u;
    out[2] = 0;
    return i;
  }
  // τ_{μ−1}, τ_μ = t_i, τ_{μ+1} = t_{i+1}, τ_{μ+2} with clamped ends.
  const tm1 = t[Math.max(i - 1, 0)]!;
  const tp2 = t[Math.min(i + 2, K - 1)]!;
  // Degree 1 on [a, b]: N_{μ−1,1} = (b − x)/(b − a), N_{μ,1} = (x − a)/(b − a).
  const h = b - a;
  const n0 = (b - xc) / h;
  const n1 = (xc - a) / h;
  // Degree 2: B_{μ−2} = (b − x)/(b − τ_{μ−1}) n0; B_{μ−1} = (x − τ_{μ−1})/(b − τ_{μ−1}) n0 + (τ_{μ+2} − x)/(τ_{μ+2} − a) n1;
  // B_μ = (x − a)/(τ_{μ+2} − a) n1.
  const l = b - tm1;
  const r = tp2 - a;
  out[0] = ((b - xc) / l) * n0;
  out[1] = ((xc - tm1) / l) * n0 + ((tp2 - xc) / r) * n1;
  out[2] = ((xc - a) / r) * n1;
  return i;
}

/** f(x) from the coefficients (scratch `basis` of length 3). */
function curveAt(t: ArrayLike<number>, degree: Degree, coefs: Float64Array, x: number, basis: Float64Array): number {
  const first = basisAt(t, degree, x, basis);
  let s = 0;
  for (let a = 0; a <= degree; a++) s += basis[a]! * coefs[first + a]!;
  return s;
}

/** True when the symmetric banded matrix is numerically positive definite (banded Cholesky pivots). */
function positiveDefinite(bands: readonly Float64Array[]): boolean {
  const m = bands[0]!.length;
  const p = bands.length - 1;
  // L stored by bands: L[k][i] = L(i + k, i).
  const L = bands.map((b) => new Float64Array(b.length));
  for (let j = 0; j < m; j++) {
    let dj = bands[0]![j]!;
    for (let k = 1; k <= p && j - k >= 0; k++) dj -= L[k]![j - k]! ** 2;
    if (!(dj > 1e-10 * bands[0]![j]!) || !(dj > 0)) return false;
    const ljj = Math.sqrt(dj);
    L[0]![j] = ljj;
    for (let k = 1; k <= p && j + k < m; k++) {
      // L(j+k, j) = (H(j+k, j) − Σ_{q<j} L(j+k, q) L(j, q)) / L(j, j)
      let s = bands[k]![j]!;
      for (let q = Math.max(0, j + k - p); q < j; q++) s -= L[j + k - q]![q]! * L[j - q]![q]!;
      L[k]![j] = s / ljj;
    }
  }
  return true;
}
