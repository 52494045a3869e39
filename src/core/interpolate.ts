/**
 * Piecewise-linear interpolation of a knot table, flat beyond its ends.
 */

/**
 * Index j of the interval [t_j, t_{j+1}] that holds `x`, for strictly increasing `t` of length
 * m ≥ 2: the largest j ≤ m − 2 with t_j ≤ x (0 when x < t_0). O(log m).
 */
export function intervalIndex(t: ArrayLike<number>, x: number): number {
  let lo = 0;
  let hi = t.length - 2;
  if (hi <= 0 || x < t[1]!) return 0;
  if (x >= t[hi]!) return hi;
  // Invariant: t[lo] ≤ x < t[hi + 1]
  while (lo < hi) {
    const mid = (lo + hi + 1) >>> 1;
    if (t[mid]! <= x) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * Value at `x` of the curve through the points (t_j, v_j): linear between neighbouring knots,
 * equal to v_0 for x ≤ t_0 and to v_{m−1} for x ≥ t_{m−1} (flat extrapolation).
 *
 * Cost: O(log m). Preconditions (not checked here; the public callers validate): `t` strictly
 * increasing and finite, `v` finite, same length m ≥ 1; `x` finite.
 *
 * @example interpolateAt([0, 1, 3], [0, 2, 3], 2) // → 2.5
 */
export function interpolateAt(t: ArrayLike<number>, v: ArrayLike<number>, x: number): number {
  const m = t.length;
  if (x <= t[0]!) return v[0]!;
  if (x >= t[m - 1]!) return v[m - 1]!;
  const j = intervalIndex(t, x);
  const t0 = t[j]!;
  const t1 = t[j + 1]!;
  const v0 = v[j]!;
  const v1 = v[j + 1]!;
  if (v0 === v1) return v0;
  const u = (x - t0) / (t1 - t0);
  return v0 + u * (v1 - v0);
}

/**
 * {@link interpolateAt} for every entry of `xs`. Cost O(k log m) for k new points.
 *
 * @example interpolate([0, 1, 3], [0, 2, 3], [-1, 0.5, 9]) // → Float64Array [0, 1, 3]
 */
export function interpolate(t: ArrayLike<number>, v: ArrayLike<number>, xs: ArrayLike<number>): Float64Array {
  const out = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) out[i] = interpolateAt(t, v, xs[i]!);
  return out;
}
