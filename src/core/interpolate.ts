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
 * The point at share `u` ∈ [0, 1] of the way from `v0` to `v1`: v0 + u(v1 − v0), kept inside
 * [min(v0, v1), max(v0, v1)]. Without that clamp, rounding can carry the result past `v1` when
 * |v0| ≫ |v1| (by up to an ulp of v0), which would break the monotonicity of a fitted curve; and
 * v0 + 1·(v1 − v0) need not be v1, so u ≥ 1 returns `v1` exactly (the flat end beyond the last
 * knot then equals the last knot value). u ≤ 0 and equal ends return `v0` exactly. Cost O(1).
 *
 * @param v0 value at u = 0 (finite). @param v1 value at u = 1 (finite). @param u share, 0 … 1.
 * @example lerp(2, 4, 0.25) // → 2.5
 */
export function lerp(v0: number, v1: number, u: number): number {
  if (v0 === v1 || u <= 0) return v0;
  if (u >= 1) return v1;
  const d = v1 - v0;
  // (1 − u)v0 + u·v1 when the difference overflows (ends near ±1.8e308 of opposite signs).
  const v = Number.isFinite(d) ? v0 + u * d : (1 - u) * v0 + u * v1;
  return v0 < v1 ? (v < v0 ? v0 : v > v1 ? v1 : v) : v > v0 ? v0 : v < v1 ? v1 : v;
}

/**
 * The share (x − a)/(b − a) of the way from a to b at which x lies, for a ≠ b, computed without
 * overflow when b − a or x − a exceeds the largest double (halving all three first, which is
 * exact). Cost O(1). Returns a value in [0, 1] for x between a and b.
 *
 * @example share(3, 2, 6) // → 0.25
 */
export function share(x: number, a: number, b: number): number {
  const num = x - a;
  const den = b - a;
  if (Number.isFinite(num) && Number.isFinite(den)) return num / den;
  return (x / 2 - a / 2) / (b / 2 - a / 2);
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
  return lerp(v[j]!, v[j + 1]!, share(x, t0, t1));
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
