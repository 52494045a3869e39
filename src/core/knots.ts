/**
 * Knot positions for the knot model: evenly spaced, at data quantiles, or given explicitly.
 */
import { fail } from './errors.js';
import { finiteArray } from './validate.js';

/** Largest knot count of a one-input fit (and of a cross-validation candidate). */
export const MAX_KNOTS = 100000;

/**
 * The one check of a knot count: throws BAD_KNOTS unless `count` is a whole number from 2 to `max`
 * (default {@link MAX_KNOTS}; surfaces pass their own limit). O(1). Public entry points call it once;
 * functions behind them (`evenKnots`, `knotChecked`) trust the count.
 * @example checkKnotCount(5) // → 5
 */
export function checkKnotCount(count: number, name = 'knots', max = MAX_KNOTS): number {
  if (typeof count !== 'number' || !Number.isFinite(count) || !Number.isInteger(count) || count < 2) {
    fail('BAD_KNOTS', name, `needs a whole number of knots ≥ 2; got ${String(count)}`);
  }
  if (count > max) fail('BAD_KNOTS', name, `needs at most ${max} knots; got ${count}`);
  return count;
}

/**
 * `count` evenly spaced knots from `min` to `max` inclusive: t_j = min + j·(max − min)/(count − 1),
 * with the last set to `max` exactly. Cost O(count). `count` must already be checked
 * ({@link checkKnotCount}: a whole number ≥ 2); the callers are the fits, which check it once.
 *
 * @throws RatchetError BAD_KNOTS (min ≥ max, or a range so narrow — a few ulps — that `count`
 *   distinct doubles do not fit in it).
 * @example evenKnots(0, 3, 4) // → Float64Array [0, 1, 2, 3]
 */
export function evenKnots(min: number, max: number, count: number): Float64Array {
  if (!(min < max)) fail('BAD_KNOTS', 'x', `needs at least 2 distinct values to place knots; got range [${min}, ${max}]`);
  const t = new Float64Array(count);
  const step = (max - min) / (count - 1);
  for (let j = 0; j < count; j++) t[j] = min + j * step;
  t[count - 1] = max;
  // A range only a few ulps wide cannot hold `count` distinct doubles: refuse rather than return
  // repeated positions (which would make the hat functions divide by zero).
  for (let j = 1; j < count; j++) {
    if (!(t[j]! > t[j - 1]!)) {
      fail('BAD_KNOTS', 'knots', `needs an x range wide enough for ${count} distinct knot positions; [${min}, ${max}] is too narrow`);
    }
  }
  return t;
}

/**
 * Knots at the sample quantiles of `x` for probabilities p_j = j/(count − 1), j = 0 … count − 1,
 * using the linear-interpolation quantile definition (Hyndman & Fan 1996, type 7 — the default of
 * R's `quantile` and NumPy's `quantile`): with sorted values s_0 ≤ … ≤ s_{n−1}, h = (n − 1)·p,
 * Q(p) = s_⌊h⌋ + (h − ⌊h⌋)(s_⌊h⌋+1 − s_⌊h⌋). The first knot is min x and the last max x. Equal
 * positions (heavy ties) are collapsed, so fewer than `count` knots may come back.
 *
 * Cost: O(n log n) for the sort. `x` is not modified.
 *
 * @throws RatchetError EMPTY_INPUT, NON_FINITE, BAD_KNOTS (count not a whole number ≥ 2),
 *   TOO_FEW_POINTS (fewer than 2 distinct positions remain).
 * @example quantileKnots([1, 2, 3, 4, 100], 3) // → Float64Array [1, 3, 100]
 */
export function quantileKnots(x: ArrayLike<number>, count: number): Float64Array {
  const s = finiteArray('x', x).sort();
  checkKnotCount(count, 'count');
  const out = quantileKnotsSorted(s, count);
  if (out.length < 2) fail('TOO_FEW_POINTS', 'x', 'needs at least 2 distinct values to place quantile knots');
  return out;
}

/**
 * {@link quantileKnots} on values already sorted ascending (no sort, no checks; `count` ≥ 2 and
 * `s` non-empty are the caller's). Duplicates are collapsed, so fewer than `count` may return.
 * Cost O(count). Used by cross-validation on each training set, which is kept in x order.
 *
 * @example quantileKnotsSorted(Float64Array.of(1, 2, 3, 4, 100), 3) // → Float64Array [1, 3, 100]
 */
export function quantileKnotsSorted(s: Float64Array, count: number): Float64Array {
  const n = s.length;
  const out: number[] = [];
  for (let j = 0; j < count; j++) {
    const h = ((n - 1) * j) / (count - 1);
    const lo = Math.floor(h);
    const frac = h - lo;
    const q = lo + 1 < n && frac > 0 ? s[lo]! + frac * (s[lo + 1]! - s[lo]!) : s[lo]!;
    const v = Math.min(Math.max(q, s[0]!), s[n - 1]!);
    if (out.length === 0 || v > out[out.length - 1]!) out.push(v);
  }
  return Float64Array.from(out);
}

/**
 * Validates explicit knot positions: at least 2, finite, strictly increasing. Returns a copy.
 *
 * @throws RatchetError BAD_KNOTS, NON_FINITE.
 */
export function checkKnotPositions(knots: ArrayLike<number>, name = 'knots'): Float64Array {
  const t = finiteArray(name, knots, true);
  if (t.length < 2) fail('BAD_KNOTS', name, `needs at least 2 knot positions; got ${t.length}`);
  for (let j = 1; j < t.length; j++) {
    if (!(t[j]! > t[j - 1]!)) {
      fail('BAD_KNOTS', name, `needs strictly increasing positions; position ${j + 1} (${t[j]}) is not above ${t[j - 1]}`);
    }
  }
  return t;
}
