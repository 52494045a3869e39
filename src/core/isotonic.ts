/**
 * Classic isotonic regression: the weighted least-squares monotone fit at every distinct x.
 */
import type { CommonFitOptions, Direction } from './types.js';
import { boundsPair, finiteArray, sameLength, weightArray } from './validate.js';
import { sortRows } from './sort-order.js';
import { resolveDirection } from './direction.js';
import { fail } from './errors.js';
import { lerp, share } from './interpolate.js';

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
 * Cost: O(n) time and memory (a radix sort that also returns the sorted x, one pass gathering y
 * and w into x order, one pass that pools ties and runs PAVA at once); typed arrays of about 60
 * bytes per row in all, the result included (68 with weights).
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
  const ws = options.weights === undefined ? null : weightArray(xs.length, options.weights);
  const [lower, upper] = boundsPair(options.lower, options.upper);
  const direction = resolveDirection(xs, ys, ws ?? undefined, options.direction);
  return isotonicChecked(xs, ys, ws, direction, lower, upper);
}

/**
 * {@link isotonicRegression} on validated copies (no checks, no copies); used by the
 * cross-validation loop, which validates once. `ws` null means unit weights (no weights array
 * is read or made). Inputs are not modified.
 *
 * One sort (which also returns the sorted x), then one pass over the rows in x order pools ties
 * and pushes each distinct x with positive weight onto the pool-adjacent-violators stack at once;
 * y and w are read through the permutation in that pass only. The arithmetic is that of
 * {@link poolTies} followed by {@link pavaSorted} (tie mean Σwy/Σw, block sums of w·mean,
 * cross-multiplied comparisons), on y and w scaled by powers of two — exact, so the result is the
 * same to the last bit away from the subnormal range — with the largest |y| near 1 and every
 * weight at most 2^-32: then no block sum or cross product can overflow, for y or w near 1e308
 * too, nor underflow for tiny ones. Typed arrays of about 60 bytes per row in all, the result's
 * included (68 with weights).
 */
export function isotonicChecked(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array | null,
  direction: Direction,
  lower: number,
  upper: number,
): IsotonicFit {
  const n = xs.length;
  let maxY = 0;
  let maxW = 0;
  for (let i = 0; i < n; i++) {
    const a = Math.abs(ys[i]!);
    if (a > maxY) maxY = a;
  }
  if (ws === null) maxW = 1;
  else for (let i = 0; i < n; i++) if (ws[i]! > maxW) maxW = ws[i]!;
  const yExp = exponentOf(maxY);
  const sign = direction === 'up' ? 1 : -1;
  const yScale = sign * 2 ** -yExp;
  const wScale = 2 ** -(exponentOf(maxW) + 32);

  const { order, sorted, spare, spareOrder } = sortRows(xs, true);
  const sx = sorted!; // distinct x are compacted into its front
  // y and w in x order, gathered in loops of independent loads (fused with the pooling below, each
  // load would wait behind PAVA's data-dependent branch: 3–4× slower at 10⁶ random rows).
  const sy = spare ?? new Float64Array(n);
  for (let k = 0; k < n; k++) sy[k] = yScale * ys[order[k]!]!;
  let sw: Float64Array | null = null;
  if (ws !== null) {
    sw = new Float64Array(n);
    for (let k = 0; k < n; k++) sw[k] = wScale * ws[order[k]!]!;
  }
  // Block stack of pool-adjacent-violators: summed weight, summed w·mean, first distinct x. The
  // summed weights live in the buffer of the fitted values, which is written only at the end.
  const fitted = new Float64Array(n);
  const stackW = fitted;
  const stackS = new Float64Array(n);
  const stackStart = spareOrder ?? new Uint32Array(n);
  // First sorted row of each distinct x (and n at the end), and the pooled weight of each.
  const groupStart = new Uint32Array(n + 1);
  const weight = new Float64Array(n);
  let top = -1;
  let m = 0;
  let active = 0;
  let k = 0;
  while (k < n) {
    const x = sx[k]!;
    groupStart[m] = k;
    let W = 0;
    let S = 0;
    if (sw === null) {
      do {
        W += wScale;
        S += wScale * sy[k]!;
        k++;
      } while (k < n && sx[k] === x);
    } else {
      do {
        const w = sw[k]!;
        W += w;
        S += w * sy[k]!;
        k++;
      } while (k < n && sx[k] === x);
    }
    sx[m] = x;
    weight[m] = W / wScale;
    if (W > 0) {
      active++;
      // Push the pooled point (mean S/W, weight W) and merge while the block below has a mean ≥
      // this block's (cross-multiplied, as pavaSorted).
      let bS = W * (S / W);
      let bW = W;
      let s = m;
      while (top >= 0 && stackS[top]! * bW >= bS * stackW[top]!) {
        bW += stackW[top]!;
        bS += stackS[top]!;
        s = stackStart[top]!;
        top--;
      }
      top++;
      stackW[top] = bW;
      stackS[top] = bS;
      stackStart[top] = s;
    }
    m++;
  }
  groupStart[m] = n;
  if (active < 2) {
    fail('TOO_FEW_POINTS', 'x', `needs at least 2 distinct values with positive weight; got ${active}`);
  }

  // Value at every distinct x: its block's level (kept monotone against rounding in the division,
  // as pavaSorted, then scaled back and clipped); zero-weight distinct x between two positive-weight
  // ones interpolate linearly, those beyond the outermost take the end value.
  const back = sign * 2 ** yExp;
  const value = new Float64Array(m);
  const blocks = top + 1;
  let levels = 0;
  let previous = -Infinity;
  let previousClipped = NaN;
  let leftX = NaN; // last distinct x with positive weight so far, and its value
  let leftV = NaN;
  let pending = 0; // first zero-weight distinct x not yet given a value
  // Candidates for the knot table: the first and the last positive-weight distinct x of every
  // block. The points between them lie on a flat stretch with flat neighbours, which the table
  // would drop anyway (without changing its later choices), so they are not even looked at.
  // Their indices go to the front of sy, which PAVA no longer needs.
  let t = 0;
  for (let b = 0; b < blocks; b++) {
    const level = Math.max(stackS[b]! / stackW[b]!, previous);
    previous = level;
    const v = Math.min(upper, Math.max(lower, back * level));
    if (v !== previousClipped) levels++;
    previousClipped = v;
    const end = b + 1 < blocks ? stackStart[b + 1]! : m;
    let lastActive = -1;
    for (let g = stackStart[b]!; g < end; g++) {
      if (weight[g]! > 0) {
        if (pending < g) fillPending(value, sx, pending, g, leftX, leftV, sx[g]!, v);
        value[g] = v;
        leftX = sx[g]!;
        leftV = v;
        pending = g + 1;
        if (lastActive < 0) sy[t++] = g;
        lastActive = g;
      }
    }
    if (lastActive !== sy[t - 1]) sy[t++] = lastActive;
  }
  if (pending < m) fillPending(value, sx, pending, m, leftX, leftV, NaN, NaN);
  for (let c = 0; c < t; c++) {
    const g = sy[c]!;
    sy[c] = sx[g]!;
    stackS[c] = value[g]!;
  }
  const [knotX, knotY] = minimalTable(sy, stackS, t);
  for (let g = 0; g < m; g++) {
    const v = value[g]!;
    for (let r = groupStart[g]!, end = groupStart[g + 1]!; r < end; r++) fitted[order[r]!] = v;
  }
  const x = m === n ? sx : sx.slice(0, m);
  return { method: 'isotonic', direction, x, value, weight: m === n ? weight : weight.slice(0, m), fitted, levels, knotX, knotY };
}

/**
 * Gives the zero-weight distinct x at positions [from, to) their values: linear interpolation
 * between (x0, v0) and (x1, v1), or the one known end beyond the outermost positive-weight x.
 */
function fillPending(value: Float64Array, x: Float64Array, from: number, to: number, x0: number, v0: number, x1: number, v1: number): void {
  for (let g = from; g < to; g++) {
    value[g] = Number.isNaN(x0) ? v1 : Number.isNaN(x1) ? v0 : lerp(v0, v1, share(x[g]!, x0, x1));
  }
}

/**
 * Drops points that interpolation of their neighbours reproduces exactly (flat or collinear), from
 * the first `m` entries of (tx, tv); O(m). The kept points are compacted in place, then copied out.
 */
function minimalTable(tx: Float64Array, tv: Float64Array, m: number): [Float64Array, Float64Array] {
  let kept = 1;
  let px = tx[0]!;
  let pv = tv[0]!;
  for (let j = 1; j < m - 1; j++) {
    const xj = tx[j]!;
    const vj = tv[j]!;
    const a = vj - pv;
    const b = tv[j + 1]! - vj;
    const flat = a === 0 && b === 0;
    // Cross-multiplied slopes; products too small to be exact (near underflow) never count as
    // collinear — keeping a point is always safe, dropping one the line does not pass is not.
    const left = a * (tx[j + 1]! - xj);
    const right = b * (xj - px);
    const collinear = a !== 0 && left === right && Math.abs(left) > 1e-290;
    if (!flat && !collinear) {
      tx[kept] = xj;
      tv[kept] = vj;
      kept++;
      px = xj;
      pv = vj;
    }
  }
  if (m > 1) {
    tx[kept] = tx[m - 1]!;
    tv[kept] = tv[m - 1]!;
    kept++;
  }
  return [tx.slice(0, kept), tv.slice(0, kept)];
}

/** The exponent k of the smallest power of two 2^k ≥ v, clamped to the normal range; 0 for v = 0. */
function exponentOf(v: number): number {
  return v > 0 ? Math.min(1023, Math.max(-1022, Math.ceil(Math.log2(v)))) : 0;
}
