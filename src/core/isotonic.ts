/**
 * Classic isotonic regression: the weighted least-squares monotone fit at every distinct x.
 */
import type { CommonFitOptions, Direction } from './types.js';
import { boundsPair, finiteArray, sameLength, weightArray } from './validate.js';
import { poolTies } from './pool-ties.js';
import { pavaSorted } from './pava.js';
import { resolveDirection } from './direction.js';
import { fail } from './errors.js';
import { lerp, share } from './interpolate.js';
import { scaleExponents, timesPowerOfTwo } from './scale.js';
import { pavaSortedWide } from './pava-wide.js';

/** Weight spreads (log₂) beyond which PAVA runs on block means (see pavaSortedWide). */
const WIDE_SPREAD = 600;

/** Result of {@link isotonicRegression}. */
export interface IsotonicFit {
  readonly method: 'isotonic';
  /** Direction used (after resolving `'auto'`). */
  readonly direction: Direction;
  /** Distinct x values of all rows, ascending. */
  readonly x: Float64Array;
  /** Fitted value at each distinct x. */
  readonly value: Float64Array;
  /** Pooled weight at each distinct x. */
  readonly weight: Float64Array;
  /** Fitted value for every input row, in input order. */
  readonly fitted: Float64Array;
  /** Number of distinct fitted levels among points with positive weight (blocks of the fit). */
  readonly levels: number;
  /**
   * The model as a knot table: the smallest set of points (x ascending) whose linear
   * interpolation, flat beyond the ends, is the prediction curve — positive-weight distinct x
   * with interior points of flat stretches, and points exactly on the line through their
   * neighbours, dropped.
   */
  readonly knotX: Float64Array;
  readonly knotY: Float64Array;
}

/**
 * Isotonic (monotone) regression by weighted pool-adjacent-violators.
 *
 * Minimises Σᵢ wᵢ (yᵢ − f(xᵢ))² over functions f that are non-decreasing (direction `'up'`) or
 * non-increasing (`'down'`) in x, evaluated at the distinct x values; then clips to
 * [lower, upper], which is optimal for the bounded problem in this model.
 *
 * Cost: O(n) time and memory (radix sort order, one pooling pass, one PAVA pass).
 *
 * Edge cases: tied x values are pooled first (one fitted value per distinct x, the weighted mean
 * of its y with summed weight). Rows with weight 0 get the curve's value at their x (linear
 * interpolation between the positive-weight points, flat beyond them) and do not influence the
 * fit. Constant y gives a constant fit. y and weights near 1e±300 are handled by exact power-of-two
 * rescaling (no overflow in the pooled sums). Inputs are never modified.
 *
 * @param x predictor values, finite, length n.
 * @param y responses, finite, length n.
 * @param options weights (default 1), direction (`'up'` default, `'down'`, `'auto'`), lower, upper.
 * @throws RatchetError EMPTY_INPUT (n = 0), LENGTH_MISMATCH, NON_FINITE, BAD_WEIGHT, BAD_BOUNDS,
 *   BAD_OPTION (direction), TOO_FEW_POINTS (fewer than two distinct x with positive weight).
 * @example isotonicRegression([1, 2, 3, 4], [1, 3, 2, 4]).fitted // → Float64Array [1, 2.5, 2.5, 4]
 * @see Robertson, Wright & Dykstra (1988), Order Restricted Statistical Inference, Wiley, ch. 1.
 */
export function isotonicRegression(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  options: CommonFitOptions = {},
): IsotonicFit {
  const xs = finiteArray('x', x);
  sameLength('x', xs.length, 'y', y);
  const ys = finiteArray('y', y);
  const ws = weightArray(xs.length, options.weights);
  const [lower, upper] = boundsPair(options.lower, options.upper);
  const direction = resolveDirection(xs, ys, options.weights === undefined ? undefined : ws, options.direction);
  return isotonicChecked(xs, ys, ws, direction, lower, upper);
}

/**
 * {@link isotonicRegression} on validated copies (no checks, no copies); used by the
 * cross-validation loop, which validates once. Inputs are not modified.
 */
export function isotonicChecked(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array,
  direction: Direction,
  lower: number,
  upper: number,
): IsotonicFit {
  // Products w·y would overflow while pooling ties for values near 1e308, and underflow for 1e-100
  // y with 1e-250 weights: then pool y and w scaled by powers of two (exact; see src/core/scale.ts)
  // and keep the pooled values in those units (the fit is scaled back at the end).
  const scales = scaleExponents(ys, ws);
  const prescale = scales.needed;
  const yUnit = prescale ? scales.yExp : 0;
  const pooled = prescale
    ? poolTies(xs, ys.map((v) => timesPowerOfTwo(v, -scales.yExp)), ws.map((v) => timesPowerOfTwo(v, -scales.wExp)))
    : poolTies(xs, ys, ws);
  const m = pooled.x.length;
  // Positions with positive pooled weight take part in PAVA.
  const active: number[] = [];
  for (let j = 0; j < m; j++) if (pooled.w[j]! > 0) active.push(j);
  if (active.length < 2) {
    fail('TOO_FEW_POINTS', 'x', `needs at least 2 distinct values with positive weight; got ${active.length}`);
  }
  // PAVA runs on y and w scaled by powers of two (exact, so the result is the same bit for bit),
  // with the largest |y| and the total weight near 1: its cross-multiplied block sums then neither
  // overflow for y or w near 1e308 nor underflow for tiny ones.
  let maxY = 0;
  let maxW = 0;
  for (let k = 0; k < active.length; k++) {
    maxY = Math.max(maxY, Math.abs(pooled.y[active[k]!]!));
    maxW = Math.max(maxW, pooled.w[active[k]!]!);
  }
  const yExp = exponentOf(maxY);
  // Weights to at most 2^-32 each, so that even 2^32 of them sum (and square) far from overflow.
  // Weights spread over more than 2^600 (prescaled to their geometric middle) go to the PAVA on
  // block means, which never multiplies two of them.
  const wide = prescale && scales.spread > WIDE_SPREAD;
  const wScale = wide ? 1 : 2 ** -(exponentOf(maxW) + 32);
  const sign = direction === 'up' ? 1 : -1;
  const yScale = sign * 2 ** -yExp;
  const ay = new Float64Array(active.length);
  const aw = new Float64Array(active.length);
  for (let k = 0; k < active.length; k++) {
    ay[k] = yScale * pooled.y[active[k]!]!;
    aw[k] = wScale * pooled.w[active[k]!]!;
  }
  const { fitted: af, starts } = wide ? pavaSortedWide(ay, aw) : pavaSorted(ay, aw);
  const back = sign * 2 ** yExp;
  const tx = new Float64Array(active.length);
  const tv = new Float64Array(active.length);
  for (let k = 0; k < active.length; k++) {
    tx[k] = pooled.x[active[k]!]!;
    tv[k] = Math.min(upper, Math.max(lower, timesPowerOfTwo(back * af[k]!, yUnit)));
  }
  // Levels: distinct values after clipping (clipping may merge blocks at a bound).
  let levels = starts.length > 0 ? 1 : 0;
  for (let b = 1; b < starts.length; b++) if (tv[starts[b]!] !== tv[starts[b - 1]!]) levels++;
  const value = new Float64Array(m);
  {
    let k = 0;
    for (let j = 0; j < m; j++) {
      while (k < active.length && active[k]! < j) k++;
      if (k < active.length && active[k] === j) value[j] = tv[k]!;
      else if (k === 0) value[j] = tv[0]!;
      else if (k >= active.length) value[j] = tv[active.length - 1]!;
      else {
        // Zero-weight distinct x strictly between two active positions: interpolate linearly.
        const x0 = tx[k - 1]!;
        const x1 = tx[k]!;
        value[j] = lerp(tv[k - 1]!, tv[k]!, share(pooled.x[j]!, x0, x1));
      }
    }
  }
  const fitted = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) fitted[i] = value[pooled.group[i]!]!;
  const [knotX, knotY] = minimalTable(tx, tv);
  // Pooled weights back in the caller's units (they were pooled in rescaled units).
  if (prescale) for (let j = 0; j < m; j++) pooled.w[j] = timesPowerOfTwo(pooled.w[j]!, scales.wExp);
  return { method: 'isotonic', direction, x: pooled.x, value, weight: pooled.w, fitted, levels, knotX, knotY };
}

/** Drops points that interpolation of their neighbours reproduces exactly (flat or collinear). O(m). */
function minimalTable(tx: Float64Array, tv: Float64Array): [Float64Array, Float64Array] {
  const m = tx.length;
  const keep: number[] = [0];
  for (let j = 1; j < m - 1; j++) {
    const p = keep[keep.length - 1]!;
    const a = tv[j]! - tv[p]!;
    const b = tv[j + 1]! - tv[j]!;
    const flat = a === 0 && b === 0;
    // Cross-multiplied slopes; products too small to be exact (near underflow) never count as
    // collinear — keeping a point is always safe, dropping one the line does not pass is not.
    const left = a * (tx[j + 1]! - tx[j]!);
    const right = b * (tx[j]! - tx[p]!);
    const collinear = a !== 0 && left === right && Math.abs(left) > 1e-290;
    if (!flat && !collinear) keep.push(j);
  }
  if (m > 1) keep.push(m - 1);
  const kx = new Float64Array(keep.length);
  const kv = new Float64Array(keep.length);
  keep.forEach((j, k) => {
    kx[k] = tx[j]!;
    kv[k] = tv[j]!;
  });
  return [kx, kv];
}

/** The exponent k of the smallest power of two 2^k ≥ v, clamped to the normal range; 0 for v = 0. */
function exponentOf(v: number): number {
  return v > 0 ? Math.min(1023, Math.max(-1022, Math.ceil(Math.log2(v)))) : 0;
}
