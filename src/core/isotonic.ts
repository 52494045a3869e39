/**
 * Classic isotonic regression: the weighted least-squares monotone fit at every distinct x.
 */
import type { CommonFitOptions, Direction } from './types.js';
import { boundsPair, finiteArray, sameLength, weightArray } from './validate.js';
import { sortRows } from './sort-order.js';
import { resolveDirection } from './direction.js';
import { fail } from './errors.js';
import { lerp, share } from './interpolate.js';
import { scaleExponents, timesPowerOfTwo, type ScaleExponents } from './scale.js';
import { poolTies } from './pool-ties.js';
import { pavaSortedWide } from './pava-wide.js';
import { Slot, scratchF64, scratchU32 } from './scratch.js';

/** The empty array that stands for x, value and weight when a caller asked for no details. */
const NONE = new Float64Array(0);

/** Weight spreads (log₂) beyond which PAVA runs on block means (see pavaSortedWide). */
const WIDE_SPREAD = 600;

/** Result of {@link isotonicRegression}. */
export interface IsotonicFit {
  readonly method: 'isotonic';
  /** Direction used (after resolving `'auto'`). */
  readonly direction: Direction;
  /** Distinct x values of all rows, ascending (empty when isotonicChecked was asked for no details). */
  readonly x: Float64Array;
  /** Fitted value at each distinct x (empty likewise). */
  readonly value: Float64Array;
  /** Pooled weight at each distinct x (empty likewise). */
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
 * and w into x order, one pass that pools ties and runs PAVA at once); working arrays of about
 * 60 bytes per row (68 with weights), kept between calls as scratch memory (src/core/scratch.ts),
 * so a repeated fit allocates only its results: the fitted values and, here, copies of the
 * distinct x, their values and pooled weights (about 32 bytes per row).
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
 *   BAD_OPTION (direction), TOO_FEW_POINTS (fewer than two distinct x with positive weight),
 *   NUMERICAL (positive weights spread over more than about 1e512, beyond the documented range).
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
 * too, nor underflow for tiny ones. The factors come from {@link scaleExponents} (src/core/scale.ts),
 * computed first: for data near 1 they are small powers of two; for y or weights near 1e±300 they
 * are the exact rescaling, applied as y and w are gathered. Weights spread over more than 2^600
 * take a pooled path instead (poolTies, then PAVA on block means: pavaSortedWide). Working arrays
 * of about 60 bytes per row (68 with weights), in scratch memory.
 *
 * Scratch memory (src/core/scratch.ts) holds every n-sized working array — the sort's keys and
 * indices, y and w in x order, the block stack, the groups — so a repeated fit allocates only its
 * results. `details` false (fitChecked, which keeps only the table, fitted values and levels)
 * returns x, value and weight empty instead of copying them out: one fresh n-sized array (fitted).
 * `withFitted` false (cross-validation, which scores the knot table) also returns `fitted` empty
 * and skips the pass that writes it: the knot table and levels are the same to the bit either way.
 *
 * @throws RatchetError TOO_FEW_POINTS (fewer than two distinct x with positive weight), NUMERICAL
 *   (positive weights spread over more than about 1e512).
 */
export function isotonicChecked(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array | null,
  direction: Direction,
  lower: number,
  upper: number,
  details = true,
  withFitted = true,
): IsotonicFit {
  // One pass finds the power-of-two scales of y and w (src/core/scale.ts). Weights spread over more
  // than 2^600 go to the pooled path with PAVA on block means; everything else runs the one-pass
  // fit below on y and w multiplied by powers of two as they are gathered (exact).
  const scales = scaleExponents(ys, ws);
  if (scales.needed && scales.spread > WIDE_SPREAD) return isotonicWide(xs, ys, ws!, scales, direction, lower, upper);
  const n = xs.length;
  // y to its largest |y| among positive-weight rows in (1/2, 1], every weight to at most 2^-32 (so
  // that even 2^32 of them sum and square far from overflow). Each factor is applied as two halves,
  // which stay within the range of doubles for the exponents of 1e±308 data; near 1 (no rescaling
  // needed) the second halves are small powers of two too, and the products are exact either way.
  const sign = direction === 'up' ? 1 : -1;
  const yHalf = Math.trunc(scales.yExp / 2);
  const yScale = sign * 2 ** -yHalf;
  const yScale2 = 2 ** -(scales.yExp - yHalf);
  const wExp = scales.wExp + 32;
  const wHalf = Math.trunc(wExp / 2);
  const wScale = 2 ** -wHalf;
  const wScale2 = 2 ** -(wExp - wHalf);

  const { order, sorted, spare, spareOrder } = sortRows(xs, true);
  const sx = sorted!; // distinct x are compacted into its front
  // y and w in x order, gathered in loops of independent loads (fused with the pooling below, each
  // load would wait behind PAVA's data-dependent branch: 3–4× slower at 10⁶ random rows).
  const sy = spare;
  let sw: Float64Array | null = null;
  if (ws === null) {
    for (let k = 0; k < n; k++) sy[k] = yScale * ys[order[k]!]! * yScale2;
  } else {
    // Rows of weight 0 take y = 0: their y counts nowhere, and a large one scaled by the positive
    // rows' factor could overflow (0·∞ would then poison the tie's sum).
    sw = scratchF64(Slot.SortedWeight, n);
    for (let k = 0; k < n; k++) {
      const o = order[k]!;
      const w = ws[o]!;
      sw[k] = wScale * w * wScale2;
      sy[k] = w > 0 ? yScale * ys[o]! * yScale2 : 0;
    }
  }
  // Block stack of pool-adjacent-violators: summed weight, summed w·mean, first distinct x. The
  // summed weights live in the buffer of the fitted values, which is written only at the end
  // (in scratch memory when no fitted values are asked for).
  const fitted = withFitted ? new Float64Array(n) : NONE;
  const stackW = withFitted ? fitted : scratchF64(Slot.BlockWeight, n);
  const stackS = scratchF64(Slot.BlockSum, n);
  const stackStart = spareOrder;
  // First sorted row of each distinct x (and n at the end), and the pooled weight of each.
  const groupStart = scratchU32(Slot.GroupStart, n + 1);
  // The pooled weight of each distinct x; with weights it is compacted into the front of sw in place
  // (the weight of distinct x number m is written after its rows, at index m or later, are read).
  const weight = sw ?? scratchF64(Slot.SortedWeight, n);
  const unit = wScale * wScale2; // one unit weight, scaled (2^-32)
  const wBack = 2 ** wHalf;
  const wBack2 = 2 ** (wExp - wHalf);
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
        W += unit;
        S += unit * sy[k]!;
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
    weight[m] = W * wBack * wBack2;
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
  const back = sign * 2 ** yHalf;
  const back2 = 2 ** (scales.yExp - yHalf);
  const value = scratchF64(Slot.GroupValue, m);
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
    const v = Math.min(upper, Math.max(lower, back * level * back2));
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
  for (let g = 0; g < m && withFitted; g++) {
    const v = value[g]!;
    for (let r = groupStart[g]!, end = groupStart[g + 1]!; r < end; r++) fitted[order[r]!] = v;
  }
  // x, value and weight live in scratch memory: the caller gets copies, or nothing.
  if (!details) return { method: 'isotonic', direction, x: NONE, value: NONE, weight: NONE, fitted, levels, knotX, knotY };
  return { method: 'isotonic', direction, x: sx.slice(0, m), value: value.slice(0, m), weight: weight.slice(0, m), fitted, levels, knotX, knotY };
}

/**
 * The classic fit for weights spread over more than 2^600 (rescaled to their geometric middle by
 * the caller's scales): ties pooled by {@link poolTies} on y and w multiplied by powers of two,
 * then PAVA on block means ({@link pavaSortedWide}), which never multiplies two weights, so that
 * neither the heaviest nor the lightest row overflows or underflows; values and pooled weights are
 * scaled back to the caller's units. O(n log n) for the sort in poolTies, O(n) otherwise.
 */
function isotonicWide(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array,
  scales: ScaleExponents,
  direction: Direction,
  lower: number,
  upper: number,
): IsotonicFit {
  const yExp = scales.yExp;
  const pooled = poolTies(
    xs,
    ys.map((v, i) => (ws[i]! > 0 ? timesPowerOfTwo(v, -yExp) : 0)),
    ws.map((v) => timesPowerOfTwo(v, -scales.wExp)),
  );
  const m = pooled.x.length;
  const active: number[] = [];
  for (let j = 0; j < m; j++) if (pooled.w[j]! > 0) active.push(j);
  if (active.length < 2) {
    fail('TOO_FEW_POINTS', 'x', `needs at least 2 distinct values with positive weight; got ${active.length}`);
  }
  const sign = direction === 'up' ? 1 : -1;
  const ay = new Float64Array(active.length);
  const aw = new Float64Array(active.length);
  for (let k = 0; k < active.length; k++) {
    ay[k] = sign * pooled.y[active[k]!]!;
    aw[k] = pooled.w[active[k]!]!;
  }
  const { fitted: af, starts } = pavaSortedWide(ay, aw);
  const tx = new Float64Array(active.length);
  const tv = new Float64Array(active.length);
  for (let k = 0; k < active.length; k++) {
    tx[k] = pooled.x[active[k]!]!;
    tv[k] = Math.min(upper, Math.max(lower, timesPowerOfTwo(sign * af[k]!, yExp)));
  }
  // Levels: distinct values after clipping (clipping may merge blocks at a bound).
  let levels = starts.length > 0 ? 1 : 0;
  for (let b = 1; b < starts.length; b++) if (tv[starts[b]!] !== tv[starts[b - 1]!]) levels++;
  // Zero-weight distinct x: linear interpolation between the neighbouring positive-weight ones,
  // the end value beyond the outermost.
  const value = new Float64Array(m);
  let pending = 0;
  for (let k = 0; k < active.length; k++) {
    const g = active[k]!;
    if (pending < g) fillPending(value, pooled.x, pending, g, k > 0 ? tx[k - 1]! : NaN, k > 0 ? tv[k - 1]! : NaN, tx[k]!, tv[k]!);
    value[g] = tv[k]!;
    pending = g + 1;
  }
  const last = active.length - 1;
  if (pending < m) fillPending(value, pooled.x, pending, m, tx[last]!, tv[last]!, NaN, NaN);
  const fitted = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) fitted[i] = value[pooled.group[i]!]!;
  const [knotX, knotY] = minimalTable(tx, tv, tx.length);
  for (let j = 0; j < m; j++) pooled.w[j] = timesPowerOfTwo(pooled.w[j]!, scales.wExp);
  return { method: 'isotonic', direction, x: pooled.x, value, weight: pooled.w, fitted, levels, knotX, knotY };
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
