/**
 * The monotone surface: a K1 × K2 lattice of knot values over (x1, x2), interpolated bilinearly,
 * monotone along each input, fitted by weighted least squares.
 */
import { finiteArray, sameLength, weightArray } from './validate.js';
import { checkKnotCount, checkKnotPositions, evenKnots } from './knots.js';
import { fitStatistics, type FitStatistics } from './statistics.js';
import { fail } from './errors.js';
import { resolveDirection } from './direction.js';
import { addTieBreak, assembleLattice, evaluateLattice, locate } from './surface-lattice.js';
import { inducedOrder, latticeEdges, orderEnvelopeMean, type AxisDirection, type LatticeSolution, type OptimalityCertificate } from './surface-solve.js';
import { sparsePositiveDefinite, stencilToSparse } from './surface-sparse.js';
import { activeSetSparse } from './surface-active-set.js';
import { admmLattice } from './surface-admm.js';

export type { AxisDirection, OptimalityCertificate } from './surface-solve.js';

/**
 * Direction of one axis as an option: an {@link AxisDirection}, or `'auto'` — rising or falling by
 * the sign of Spearman's rank correlation of that input with y (see {@link resolveAxisDirection}).
 */
export type AxisDirectionOption = AxisDirection | 'auto';

/** Largest lattice (K1·K2 nodes) the surface accepts. */
export const SURFACE_MAX_NODES = 40000;
/**
 * Largest lattice for the iterative route (ADMM, seconds at this size); larger lattices are accepted
 * only when at most {@link SURFACE_EXACT_NODES} nodes carry data (the exact route on those alone).
 */
export const SURFACE_ITERATIVE_NODES = 3600;
/** Lattices up to this many nodes are solved exactly by the active-set method. */
export const SURFACE_EXACT_NODES = 400;
/** Lattices above this many nodes get an ADMM warm start before the exact method. */
const WARM_START_NODES = 64;
/** Largest lattice value accepted, as a multiple of the largest |y| (see the lever check). */
const LEVER_LIMIT = 1e10;
/** Sweep cap of ADMM (beyond it: NUMERICAL, "use fewer knots"). */
const MAX_SWEEPS = 10000;
/** Above this many nodes, a lattice whose data touch at most 400 nodes skips the warm start. */
const COLD_START_NODES = 2500;
/** Iteration cap of the exact method after a converged warm start (beyond it, ADMM's answer stands). */
const POLISH_ITERATIONS = 2000;
/** Relative size of the tie-break that makes the optimum unique. */
const TIE_BREAK = 1e-12;
/** Largest K1K2·(K1 + 2)² for which the banded positive-definiteness check runs (~0.2 s). */
const PD_CHECK_LIMIT = 2e8;

/** Options of {@link fitSurface}. */
export interface SurfaceOptions {
  /**
   * Knots along x1: 0 or absent — one knot at every distinct x1 with positive weight (classic);
   * a whole number K ≥ 2 — K evenly spaced knots from the smallest to the largest x1 with positive
   * weight; a list of ≥ 2 strictly increasing numbers — explicit positions.
   */
  knots1?: number | ArrayLike<number> | undefined;
  /** Knots along x2, as `knots1`. */
  knots2?: number | ArrayLike<number> | undefined;
  /**
   * `'up'` (default), `'down'`, `'auto'` (rising or falling by the sign of Spearman's rank
   * correlation of x1 with y over the rows with positive weight; see {@link resolveAxisDirection})
   * or `'none'` (unconstrained) along x1.
   */
  direction1?: AxisDirectionOption | undefined;
  /** Direction along x2, as `direction1` (the rank correlation of x2 with y). */
  direction2?: AxisDirectionOption | undefined;
  /** Non-negative finite weight per row (default all 1); rows with weight 0 have no influence. */
  weights?: ArrayLike<number> | undefined;
  /** Relative tolerance of the optimality conditions for large lattices; default 1e-9, range [1e-14, 1e-3]. */
  tolerance?: number | undefined;
}

/** A fitted monotone surface. */
export interface SurfaceModel {
  /** `'classic'` when both axes use every distinct level, otherwise `'lattice'`. */
  readonly method: 'classic' | 'lattice';
  /** The direction fitted along x1: `'auto'` resolved to `'up'` or `'down'`. */
  readonly direction1: AxisDirection;
  /** The direction fitted along x2, as `direction1`. */
  readonly direction2: AxisDirection;
  /** Knot positions along x1 (K1, ascending) and x2 (K2, ascending). */
  readonly knots1: Float64Array;
  readonly knots2: Float64Array;
  /**
   * Lattice values, K2 rows (x2 knots) × K1 columns (x1 knots), row-major:
   * `values[b·K1 + a]` is the surface at (knots1[a], knots2[b]).
   */
  readonly values: Float64Array;
  /** Fitted value per input row, in input order. */
  readonly fitted: Float64Array;
  /** 1 where some row with positive weight touches the node (its value is fitted), 0 where filled. */
  readonly identified: Uint8Array;
  /** Number of distinct values in the lattice. */
  readonly levels: number;
  /** Fit statistics over rows with positive weight. */
  readonly stats: FitStatistics;
  /** `'active-set'` (exact) or `'admm'` (to the tolerance). */
  readonly solver: 'active-set' | 'admm';
  readonly iterations: number;
  /** The optimality conditions at the solver's answer (see {@link OptimalityCertificate}). */
  readonly certificate: OptimalityCertificate;
}

/** Validated knot option of one axis: 0 (every distinct level), a count, or positions. */
export type SurfaceKnotSpec = 0 | number | Float64Array;

/**
 * Validates a knots option of one axis: absent, null or 0 → 0 (every distinct level); a whole number
 * 2 … 200 → that count; a list → strictly increasing finite positions (≥ 2, copied). O(K).
 * @throws RatchetError BAD_KNOTS (count outside 2 … 200 or not whole, positions not increasing), NON_FINITE.
 * @example checkSurfaceKnots(undefined, 'knots1') // → 0; checkSurfaceKnots([1, 3], 'knots2') → Float64Array [1, 3]
 */
export function checkSurfaceKnots(knots: number | ArrayLike<number> | undefined | null, name: string): SurfaceKnotSpec {
  if (knots === undefined || knots === null || knots === 0) return 0;
  if (typeof knots === 'number') return checkKnotCount(knots, name, 200);
  if (typeof knots.length !== 'number') fail('BAD_KNOTS', name, 'needs 0, a knot count, or knot positions');
  return checkKnotPositions(knots, name);
}

/**
 * Validates a direction of one axis: absent → `'up'`; `'up'`, `'down'`, `'auto'`, `'none'` pass
 * through. O(1).
 * @throws RatchetError BAD_OPTION for anything else.
 * @example checkAxisDirection(undefined, 'direction1') // → 'up'
 */
export function checkAxisDirection(d: unknown, name: string): AxisDirectionOption {
  if (d === undefined || d === null) return 'up';
  if (d === 'up' || d === 'down' || d === 'auto' || d === 'none') return d;
  return fail('BAD_OPTION', name, `needs 'up', 'down', 'auto' or 'none'; got ${String(d)}`);
}

/**
 * Resolves the direction of one axis. `'up'`, `'down'` and `'none'` pass through; `'auto'` is the
 * one-input rule of {@link resolveDirection} applied to this input and y: `'down'` when Spearman's
 * rank correlation (average ranks for ties) of x and y over the rows with positive weight is < 0,
 * otherwise `'up'` — also when it is exactly 0 or undefined (constant x or constant y).
 *
 * Cost: O(n) for `'auto'` (two rank passes), O(1) otherwise.
 *
 * @param x the input of this axis, finite, length n.
 * @param y responses, finite, length n.
 * @param w weights ≥ 0, length n; rows of weight 0 do not count.
 * @param d a validated option ({@link checkAxisDirection}).
 * @example resolveAxisDirection([1, 2, 3], [3, 2, 1], [1, 1, 1], 'auto') // → 'down'
 */
export function resolveAxisDirection(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number>, d: AxisDirectionOption): AxisDirection {
  return d === 'auto' ? resolveDirection(x, y, w, 'auto') : d;
}

/**
 * Weighted least-squares monotone surface over two predictors.
 *
 * The surface is bilinear interpolation of a lattice θ of K1 × K2 knot values,
 * f(x1, x2) = Σ_{a,b} θ_ab h_a(x1) g_b(x2) with h, g the hat functions of the two knot sequences,
 * and flat beyond the lattice (each x clamped to its knot range). It minimises Σᵢ wᵢ (yᵢ − f(xᵢ))²
 * subject to θ monotone along x1 in every row and along x2 in every column (each direction `'up'`,
 * `'down'` or `'none'`; `'auto'` is resolved first, per input, by the sign of Spearman's rank
 * correlation of that input with y over the rows with positive weight — ρ ≥ 0 or undefined gives
 * `'up'`, ρ < 0 `'down'`, the rule of the one-input fit; the model reports the result). A
 * monotone lattice gives a surface monotone everywhere, because on each cell ∂f/∂x1 is a convex
 * combination of the two edge differences.
 *
 * Classic case: with knots1 = knots2 = 0 the lattice is every distinct x1 × every distinct x2 (with
 * positive weight); each row sits on a node, and the fit is bivariate isotonic regression on that
 * grid — the problem R's Iso::biviso solves on complete grids (tests compare with it) — with level
 * combinations without data left free and filled as below (Dykstra & Robertson 1982, Annals of
 * Statistics 10, on the two-variable problem; citation from memory).
 *
 * Method: one O(n log K) pass assembles the 9-point stencil H = BᵀWB and BᵀWy (no n × K1K2 and no
 * dense K1K2 × K1K2 matrix). A banded Cholesky check (band storage, skipped beyond
 * M·(min(M, K1 + 1) + 1)² > 2e8 for M identified nodes) decides whether the data determine the
 * identified nodes (H positive definite on them). Then:
 * 1. Exact route (determined): an active-set method ({@link activeSetSparse}) on the identified
 *    nodes alone, under the order the lattice induces on them ({@link inducedOrder}) — no
 *    regularisation, the exact optimum up to rounding. Used when there are at most
 *    {@link SURFACE_EXACT_NODES} identified nodes, or — when every node is identified — for more,
 *    once ADMM has converged (below).
 * 2. Otherwise a tie-break of relative size 1e-12 (Σ over lattice edges of (θ_p − θ_q)², the
 *    lattice's graph Laplacian) makes H positive definite and the optimum unique;
 *    fitted values then agree with the untied optimum to about 1e-12 relative, and the active-set
 *    method runs on the whole lattice.
 * Lattices above 64 nodes first run ADMM ({@link admmLattice}: weighted pool-adjacent-violators on
 * every row and column, CG on the stencil; skipped for lattices above 2,500 nodes of which at most
 * 400 are identified, where route 1 alone is cheaper; lattices above 3,600 nodes with more than 400
 * identified are refused, BAD_KNOTS) until the optimality conditions hold to `tolerance` —
 * stationarity max|Hθ − c − Aᵀλ| ≤ tol·max(‖c‖∞, ‖Hθ‖∞) with multipliers λ ≥ 0, and
 * complementarity Σλₑ(Aθ)ₑ ≤ tol · (weighted total sum of squares of y), at an exactly feasible θ.
 * Its answer warm-starts the exact method (edges it holds tight form the first working set), which
 * then usually needs a few dozen to a few hundred iterations; if it takes more than 2,000 the ADMM answer
 * stands (`solver` says which). `certificate` reports the conditions at the returned lattice.
 *
 * Unidentified nodes (no row with positive weight inside the four cells around the node or on it —
 * the data cannot see them) are filled uniquely after the fit: each gets the mean of the largest
 * identified value below it and the smallest identified value above it in the lattice order (the
 * smallest / largest identified value overall when there is none on that side). The fill keeps the
 * lattice monotone and does not change the fitted values at the data.
 *
 * Cost: O(n log K + K1K2) to set up; ADMM O(9·K1K2) per CG step, a few steps per sweep, hundreds
 * of sweeps (at most 10,000, then NUMERICAL "use fewer knots"); the exact method a CG solve (or a
 * ≤ 31 × 31 Cholesky) per iteration. Measured on this machine (bench/surface.ts, loaded 2 cores):
 * a 30 × 30 lattice over 10⁴ rows in 0.2–0.6 s, 10 × 10 over 10⁵ rows in 0.03–0.1 s; 60 × 60
 * lattices take 1–4 s (hence the 3,600-node limit of the iterative route).
 *
 * Edge cases: ties in (x1, x2) need no pooling. Rows with weight 0 get f(x) but no influence. Rows
 * outside explicit knots are fitted by the flat edge values. Constant y gives a constant surface.
 * Direction `'none'` on both axes gives the unconstrained bilinear least-squares lattice.
 *
 * @param x1 first predictor, finite, length n ≥ 1.
 * @param x2 second predictor, finite, length n.
 * @param y responses, finite, length n.
 * @param options knots1, knots2 (default 0 = classic), direction1, direction2 (`'up'` default,
 *   `'down'`, `'auto'`, `'none'`), weights (default 1), tolerance (default 1e-9).
 * @throws RatchetError EMPTY_INPUT, LENGTH_MISMATCH, NON_FINITE, BAD_WEIGHT, BAD_OPTION (direction,
 *   tolerance), BAD_KNOTS (count not a whole number in [2, 200], positions not increasing, lattice
 *   over 40,000 nodes, or over 3,600 unless the data touch and determine at most 400, or a lattice
 *   value over 1e10 × max |y| — knots the data touch only through tiny interpolation shares),
 *   TOO_FEW_POINTS (fewer than 2 distinct values with positive weight along an
 *   axis that places knots from the data), NUMERICAL (iterative solver out of sweeps).
 * @example fitSurface([0, 1, 0, 1], [0, 0, 1, 1], [1, 2, 3, 4]).values // → Float64Array [1, 2, 3, 4]
 * @example fitSurface([0, 1, 0, 1], [0, 0, 1, 1], [4, 3, 2, 1], { direction1: 'auto', direction2: 'auto' }).direction1 // → 'down'
 * @see Luss, Rosset & Shahar (2012), Annals of Applied Statistics 6(1) — over-fit of multivariate
 *   isotonic fits.
 */
export function fitSurface(
  x1: ArrayLike<number>,
  x2: ArrayLike<number>,
  y: ArrayLike<number>,
  options: SurfaceOptions = {},
): SurfaceModel {
  const { xs1, xs2, ys, ws, d1, d2, tol } = checkSurfaceInputs(x1, x2, y, options);
  const spec1 = checkSurfaceKnots(options.knots1, 'knots1');
  const spec2 = checkSurfaceKnots(options.knots2, 'knots2');
  return surfaceChecked(xs1, xs2, ys, ws, spec1, spec2, d1, d2, tol);
}

/** Validated copies of the inputs and options shared by fitSurface and crossValidateSurface. */
export interface SurfaceInputs {
  xs1: Float64Array;
  xs2: Float64Array;
  ys: Float64Array;
  ws: Float64Array;
  d1: AxisDirectionOption;
  d2: AxisDirectionOption;
  tol: number;
}

/**
 * Checks and copies x1, x2, y, the weights, both directions and the tolerance (default 1e-9, in
 * [1e-14, 1e-3]). O(n). @throws RatchetError EMPTY_INPUT, LENGTH_MISMATCH, NON_FINITE, BAD_WEIGHT,
 * BAD_OPTION.
 */
export function checkSurfaceInputs(
  x1: ArrayLike<number>,
  x2: ArrayLike<number>,
  y: ArrayLike<number>,
  options: { weights?: ArrayLike<number> | undefined; direction1?: unknown; direction2?: unknown; tolerance?: number | undefined },
): SurfaceInputs {
  const xs1 = finiteArray('x1', x1);
  sameLength('x1', xs1.length, 'x2', x2);
  const xs2 = finiteArray('x2', x2);
  sameLength('x1', xs1.length, 'y', y);
  const ys = finiteArray('y', y);
  const ws = weightArray(xs1.length, options.weights);
  const d1 = checkAxisDirection(options.direction1, 'direction1');
  const d2 = checkAxisDirection(options.direction2, 'direction2');
  const tol = options.tolerance ?? 1e-9;
  if (typeof tol !== 'number' || !(tol >= 1e-14 && tol <= 1e-3)) {
    fail('BAD_OPTION', 'tolerance', `needs a number in [1e-14, 1e-3]; got ${String(tol)}`);
  }
  return { xs1, xs2, ys, ws, d1, d2, tol };
}

/** 2^e nearest the largest |v| over rows with positive weight (1 when all are 0). O(n). */
function powerOfTwoScale(v: Float64Array, w: Float64Array): number {
  let m = 0;
  for (let i = 0; i < v.length; i++) if (w[i]! > 0) m = Math.max(m, Math.abs(v[i]!));
  return m > 0 && Number.isFinite(m) ? 2 ** Math.min(1023, Math.max(-1022, Math.round(Math.log2(m)))) : 1;
}

/** Knot positions of one axis from its spec and the positive-weight rows. */
function axisKnots(x: Float64Array, w: Float64Array, spec: SurfaceKnotSpec, name: string, knotsName: string): Float64Array {
  if (typeof spec !== 'number') return spec;
  if (spec === 0) {
    const vals: number[] = [];
    for (let i = 0; i < x.length; i++) if (w[i]! > 0) vals.push(x[i]! + 0);
    vals.sort((a, b) => a - b);
    const out: number[] = [];
    for (const v of vals) if (out.length === 0 || v > out[out.length - 1]!) out.push(v);
    if (out.length < 2) {
      fail('TOO_FEW_POINTS', name, `needs at least 2 distinct values with positive weight; got ${out.length}`);
    }
    if (out.length > SURFACE_MAX_NODES / 2) {
      fail('BAD_KNOTS', knotsName, `needs a knot count when ${name} has more than ${SURFACE_MAX_NODES / 2} distinct values; got ${out.length}`);
    }
    return Float64Array.from(out);
  }
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < x.length; i++) {
    if (w[i]! > 0) {
      lo = Math.min(lo, x[i]!);
      hi = Math.max(hi, x[i]!);
    }
  }
  if (!(lo < hi)) fail('TOO_FEW_POINTS', name, 'needs at least 2 distinct values with positive weight to place knots');
  return evenKnots(lo, hi, spec);
}

/**
 * {@link fitSurface} on validated copies (used by cross-validation, which validates once): same
 * method, cost, errors and result; an `'auto'` direction is resolved on these rows. Inputs are not
 * modified. `tol` defaults to 1e-9.
 * @example surfaceChecked(Float64Array.from([0, 1, 0, 1]), Float64Array.from([0, 0, 1, 1]), Float64Array.from([1, 2, 3, 4]),
 *   Float64Array.from([1, 1, 1, 1]), 0, 0, 'up', 'up').values // → Float64Array [1, 2, 3, 4]
 */
export function surfaceChecked(
  xs1: Float64Array,
  xs2: Float64Array,
  ys: Float64Array,
  ws: Float64Array,
  spec1: SurfaceKnotSpec,
  spec2: SurfaceKnotSpec,
  dir1: AxisDirectionOption,
  dir2: AxisDirectionOption,
  tol = 1e-9,
): SurfaceModel {
  const d1 = resolveAxisDirection(xs1, ys, ws, dir1);
  const d2 = resolveAxisDirection(xs2, ys, ws, dir2);
  const t1 = axisKnots(xs1, ws, spec1, 'x1', 'knots1');
  const t2 = axisKnots(xs2, ws, spec2, 'x2', 'knots2');
  const k1 = t1.length;
  const k2 = t2.length;
  const N = k1 * k2;
  if (N > SURFACE_MAX_NODES) {
    fail('BAD_KNOTS', 'knots1', `needs a lattice of at most ${SURFACE_MAX_NODES} nodes (K1·K2); got ${k1}×${k2} = ${N}`);
  }
  const loc = locate(t1, t2, xs1, xs2);
  // Solve on y and w scaled by powers of two (exact) so sums of squares neither overflow nor underflow.
  const sy = powerOfTwoScale(ys, ws);
  const sw = powerOfTwoScale(ws, ws);
  const yS = ys.map((v) => v / sy);
  const wS = ws.map((v) => v / sw);
  const sys = assembleLattice(k1, k2, loc, yS, wS);
  const identified = new Uint8Array(N);
  const index = new Int32Array(N).fill(-1);
  const seenNodes: number[] = [];
  for (let p = 0; p < N; p++) {
    if (sys.dataDiagonal[p]! > 0) {
      identified[p] = 1;
      index[p] = seenNodes.length;
      seenNodes.push(p);
    }
  }
  const nodes = Int32Array.from(seenNodes);
  const M = nodes.length;

  // Weighted total sum of squares (scaled data): the scale of the complementarity condition.
  let sumW = 0;
  let swy = 0;
  for (let i = 0; i < yS.length; i++) {
    sumW += wS[i]!;
    swy += wS[i]! * yS[i]!;
  }
  let sst = 0;
  let syy = 0;
  for (let i = 0; i < yS.length; i++) {
    const dv = yS[i]! - swy / sumW;
    sst += wS[i]! * dv * dv;
    syy += wS[i]! * yS[i]! * yS[i]!;
  }
  const scaleSS = sst > 0 ? sst : syy > 0 ? syy : 1;

  // Are the identified nodes determined by the data (H positive definite on them)?
  const dataMatrix = stencilToSparse(sys, nodes, index);
  const band = Math.min(M, k1 + 1) + 1;
  const determined = M * band * band <= PD_CHECK_LIMIT && sparsePositiveDefinite(dataMatrix);
  // ADMM on the whole lattice: the answer for large lattices and a warm start for the exact method.
  if (!(determined && M === N)) addTieBreak(sys, TIE_BREAK);
  const edges = latticeEdges(k1, k2, d1, d2);
  // (Skipped when few identified nodes sit in a large lattice: the exact method on them alone is cheaper.)
  const compactCold = determined && M <= SURFACE_EXACT_NODES && N > COLD_START_NODES;
  if (N > SURFACE_ITERATIVE_NODES && edges.lo.length > 0 && !(determined && M <= SURFACE_EXACT_NODES)) {
    fail(
      'BAD_KNOTS',
      'knots1',
      `with knots2, needs a lattice of at most ${SURFACE_ITERATIVE_NODES} nodes unless the data touch and determine at most ${SURFACE_EXACT_NODES} of them; got ${k1}×${k2} = ${N} with ${M} touched by the data — use fewer knots (or knot counts instead of every level)`,
    );
  }
  const approx = N > WARM_START_NODES && edges.lo.length > 0 && !compactCold ? admmLattice(sys, edges, d1, d2, scaleSS, tol, MAX_SWEEPS, false) : null;
  const approxOk = approx !== null && approx.certificate.stationarity <= tol && approx.certificate.complementarity <= tol;
  const exactLimit = approxOk ? POLISH_ITERATIONS : undefined;
  let sol: LatticeSolution | null = null;
  let theta: Float64Array | null = null;
  if (determined && (M <= SURFACE_EXACT_NODES || (approxOk && M === N))) {
    // Exact: the identified nodes alone, under the order the lattice induces on them.
    const rhs = new Float64Array(M);
    const warm = approx ? new Float64Array(M) : undefined;
    for (let i = 0; i < M; i++) {
      rhs[i] = sys.rhs[nodes[i]!]!;
      if (warm) warm[i] = approx!.theta[nodes[i]!]!;
    }
    // With every node identified the induced order is the lattice's own (covering pairs = neighbours).
    const order = M === N ? edges : inducedOrder(k1, d1, d2, nodes);
    sol = activeSetSparse(dataMatrix, rhs, order, scaleSS, exactLimit, warm);
    if (sol) {
      theta = new Float64Array(N);
      for (let i = 0; i < M; i++) theta[nodes[i]!] = sol.theta[i]!;
    }
  } else if (N <= SURFACE_EXACT_NODES || approxOk || edges.lo.length === 0) {
    const all = new Int32Array(N).map((_, p) => p);
    sol = activeSetSparse(stencilToSparse(sys, all, all), sys.rhs, edges, scaleSS, edges.lo.length === 0 ? undefined : exactLimit, approx?.theta);
    if (sol) theta = sol.theta;
  }
  if (!sol || !theta) {
    if (!approx) return fail('NUMERICAL', 'knots', 'internal: the active-set method did not converge');
    if (!approxOk) {
      const c = approx.certificate;
      fail(
        'NUMERICAL',
        'knots',
        `the iterative solver did not reach its tolerance ${tol} (stationarity ${c.stationarity.toPrecision(2)}, complementarity ${c.complementarity.toPrecision(2)}); use fewer knots`,
      );
    }
    sol = approx;
    theta = approx.theta;
  }

  // Guard the order against rounding and fill the nodes the data do not see.
  const values = orderEnvelopeMean(theta, k1, k2, d1, d2, identified);
  // A node the data touch only through a tiny interpolation share can need an enormous value (a
  // lever). Beyond LEVER_LIMIT × max |y| such a lattice is a symptom, not a model: refuse it.
  let ymax = 0;
  for (let i = 0; i < yS.length; i++) if (wS[i]! > 0) ymax = Math.max(ymax, Math.abs(yS[i]!));
  for (let p = 0; p < N; p++) {
    if (Math.abs(values[p]!) > LEVER_LIMIT * ymax) {
      fail(
        'BAD_KNOTS',
        'knots1',
        `with knots2, needs a lattice the data reach: a lattice value would be ${(values[p]! * sy).toPrecision(3)}, over 1e10 times the largest |y|, because some knots see the data only through tiny interpolation shares; use fewer knots or knot positions inside the data`,
      );
    }
    values[p] = values[p]! * sy;
  }
  const fitted = evaluateLattice(values, k1, loc);
  const distinct = new Set<number>();
  for (let p = 0; p < N; p++) distinct.add(values[p]! + 0);
  const classic = spec1 === 0 && spec2 === 0;
  return {
    method: classic ? 'classic' : 'lattice',
    direction1: d1,
    direction2: d2,
    knots1: t1,
    knots2: t2,
    values,
    fitted,
    identified,
    levels: distinct.size,
    stats: fitStatistics(ys, fitted, ws),
    solver: sol.solver,
    iterations: sol.iterations,
    certificate: sol.certificate,
  };
}

/**
 * The surface at new (x1, x2) pairs: bilinear interpolation of the lattice, flat beyond its edges.
 * Cost O(k log K). @throws RatchetError NON_FINITE, LENGTH_MISMATCH.
 * @example predictSurface(fitSurface([0, 1, 0, 1], [0, 0, 1, 1], [1, 2, 3, 4]), [0.5, 9], [0.5, -1]) // → Float64Array [2.5, 2]
 */
export function predictSurface(
  model: Pick<SurfaceModel, 'knots1' | 'knots2' | 'values'>,
  newX1: ArrayLike<number>,
  newX2: ArrayLike<number>,
): Float64Array {
  const a = finiteArray('new_x1', newX1, true);
  sameLength('new_x1', a.length, 'new_x2', newX2);
  const b = finiteArray('new_x2', newX2, true);
  const loc = locate(model.knots1, model.knots2, a, b);
  return evaluateLattice(model.values, model.knots1.length, loc);
}
