/**
 * The knot table of a smooth fit: the curve's values at the knots and at the interval midpoints,
 * read back exactly by quadratic interpolation.
 *
 * Layout: 2K − 1 rows (x, y) with x strictly increasing; rows 0, 2, 4, … are the knots t₀ … t_{K−1},
 * the odd rows the midpoints (t_j + t_{j+1})/2, each with the curve's value. On every interval
 * [t_j, t_{j+1}] the smooth (quadratic B-spline) curve is one quadratic polynomial, so the
 * quadratic through the interval's three rows is the curve itself: evaluating or inverting the
 * table reproduces the fit to rounding, in any program that can fit a parabola through three
 * points. Beyond the end knots the curve is flat, as for the linear table.
 */
import type { TieRule } from './types.js';
import { fail } from './errors.js';
import { interpolateAt } from './interpolate.js';
import { checkKnotTable, invertChecked } from './invert.js';
import { finiteArray } from './validate.js';

/** `'linear'` (straight lines between rows) or `'quadratic'` (a parabola through each row triple). */
export type TableInterpolation = 'linear' | 'quadratic';

/**
 * Validates an interpolation option: `'linear'` or `'quadratic'`; absent → `'linear'`. Cost O(1).
 * @throws RatchetError BAD_OPTION for anything else.
 * @example checkInterpolation(undefined) // → 'linear'
 */
export function checkInterpolation(value: unknown, name = 'interpolation'): TableInterpolation {
  if (value === undefined || value === null || value === 'linear') return 'linear';
  if (value === 'quadratic') return 'quadratic';
  return fail('BAD_OPTION', name, `needs 'linear' or 'quadratic'; got ${String(value)}`);
}

/**
 * Value at x of a table read with `interpolation`, flat beyond its ends. Quadratic: on interval j
 * (rows 2j, 2j + 1, 2j + 2) the parabola through the three rows (Lagrange form); where that
 * parabola is monotone the value is kept between the interval's end values (rounding only).
 * Cost O(log K).
 * Preconditions (the public callers check them): positions strictly increasing, values finite,
 * odd length ≥ 3 for `'quadratic'`; x finite.
 *
 * @example smoothTableAt([0, 1, 2], [0, 0.75, 1], 'quadratic', 0.5) // → 0.4375
 */
export function smoothTableAt(tx: ArrayLike<number>, ty: ArrayLike<number>, interpolation: TableInterpolation, x: number): number {
  if (interpolation === 'linear') return interpolateAt(tx, ty, x);
  const P = tx.length;
  if (x <= tx[0]!) return ty[0]!;
  if (x >= tx[P - 1]!) return ty[P - 1]!;
  // Interval of knots: binary search over the even rows.
  let lo = 0;
  let hi = (P - 1) / 2 - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >>> 1;
    if (tx[2 * mid]! <= x) lo = mid;
    else hi = mid - 1;
  }
  const j = 2 * lo;
  const y0 = ty[j]!;
  const y2 = ty[j + 2]!;
  const v = parabola(tx[j]!, tx[j + 1]!, tx[j + 2]!, y0, ty[j + 1]!, y2, x);
  // A monotone piece stays between its end values; keep rounding from carrying it past them (so
  // that a predicted value can always be read back).
  if (!monotonePiece(tx, ty, j)) return v;
  const lo2 = Math.min(y0, y2);
  const hi2 = Math.max(y0, y2);
  return v < lo2 ? lo2 : v > hi2 ? hi2 : v;
}

/**
 * True when the parabola through rows j … j + 2 is monotone on [tx[j], tx[j + 2]]: its derivative
 * at both ends has the sign of y₂ − y₀ (or is 0), to 1e-9 of the rise plus 1e-14 of the values
 * over the width (the rounding of a fitted table).
 */
function monotonePiece(tx: ArrayLike<number>, ty: ArrayLike<number>, j: number): boolean {
  const x0 = tx[j]!;
  const x1 = tx[j + 1]!;
  const x2 = tx[j + 2]!;
  const s = ty[j + 2]! >= ty[j]! ? 1 : -1;
  const y0 = s * ty[j]!;
  const y1 = s * ty[j + 1]!;
  const y2 = s * ty[j + 2]!;
  const d01 = (y1 - y0) / (x1 - x0);
  const d12 = (y2 - y1) / (x2 - x1);
  const curv = (d12 - d01) / (x2 - x0);
  const left = d01 - curv * (x1 - x0);
  const right = d12 + curv * (x2 - x1);
  const tol = (1e-9 * (Math.abs(y2 - y0) + Math.abs(y1 - y0)) + 1e-14 * Math.max(Math.abs(y0), Math.abs(y1), Math.abs(y2))) / (x2 - x0);
  return left >= -tol && right >= -tol;
}

/**
 * The parabola through (x0, y0), (x1, y1), (x2, y2) at x, Lagrange form in the share
 * u = (x − x0)/(x2 − x0) and p = (x1 − x0)/(x2 − x0), so that products of tiny widths (tables
 * spanning 1e-280) cannot underflow to 0/0.
 */
function parabola(x0: number, x1: number, x2: number, y0: number, y1: number, y2: number, x: number): number {
  if (y0 === y1 && y1 === y2) return y0;
  const h = x2 - x0;
  const u = (x - x0) / h;
  const p = (x1 - x0) / h;
  return (y0 * (u - p) * (u - 1)) / p + (y1 * u * (u - 1)) / (p * (p - 1)) + (y2 * u * (u - p)) / (1 - p);
}

/**
 * Checks a table for {@link evaluateTable} and {@link invertTable}: positions finite and strictly
 * increasing, values finite, same length; for `'quadratic'` an odd number of rows ≥ 3. Returns
 * validated copies and the interpolation. Cost O(K).
 * @param knotX, knotY the table. @param interpolation as {@link checkInterpolation}.
 * @param name argument name for messages (default `knot_table`).
 * @throws RatchetError BAD_KNOTS, NON_FINITE, LENGTH_MISMATCH, BAD_OPTION.
 * @example checkTable([0, 1, 2], [0, 1, 1], 'quadratic')[2] // → 'quadratic'
 */
export function checkTable(
  knotX: ArrayLike<number>,
  knotY: ArrayLike<number>,
  interpolation: unknown,
  name = 'knot_table',
): [Float64Array, Float64Array, TableInterpolation] {
  const kind = checkInterpolation(interpolation);
  const [tx, ty] = checkKnotTable(knotX, knotY, name);
  if (kind === 'quadratic' && (tx.length < 3 || tx.length % 2 === 0)) {
    fail('BAD_KNOTS', name, `needs an odd number of rows, at least 3 (knots and midpoints), for quadratic reading; got ${tx.length}`);
  }
  return [tx, ty, kind];
}

/**
 * The curve of a knot table at new x values: linear interpolation, or quadratic interpolation
 * through each interval's three rows for a smooth fit's table; flat beyond the ends.
 *
 * Cost O(k log K) for k new values. Inputs are not modified.
 *
 * @param knotX table positions, strictly increasing (≥ 1 row; ≥ 3 and odd for quadratic).
 * @param knotY table values, finite, same length.
 * @param interpolation `'linear'` (default) or `'quadratic'`.
 * @param newX finite values (may be empty).
 * @throws RatchetError BAD_KNOTS, NON_FINITE (new_x or the table), LENGTH_MISMATCH, BAD_OPTION.
 * @example evaluateTable([0, 1, 2], [0, 0.75, 1], 'quadratic', [0.5, 3]) // → Float64Array [0.4375, 1]
 */
export function evaluateTable(
  knotX: ArrayLike<number>,
  knotY: ArrayLike<number>,
  interpolation: TableInterpolation | undefined,
  newX: ArrayLike<number>,
): Float64Array {
  const [tx, ty, kind] = checkTable(knotX, knotY, interpolation);
  const xs = finiteArray('new_x', newX, true);
  const out = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) out[i] = smoothTableAt(tx, ty, kind, xs[i]!);
  return out;
}

/**
 * The x in [t₀, t_{K−1}] where a table's curve equals `target`. Linear tables: as
 * {@link invertAt}. Quadratic tables: each interval's parabola must be monotone in the table's
 * direction (its derivative at both interval ends of the right sign, to 1e-9 of the interval's
 * rise plus 1e-14 of its values, over its width: the rounding of a fitted table); the answer solves the quadratic on the interval that reaches the target
 * (numerically stable root formula, kept inside the interval). Where the curve equals the target
 * over a whole stretch (constant intervals), `tie` picks its lowest x, middle or highest x — the
 * rule of the linear table.
 *
 * Cost O(K). Inputs are not modified.
 *
 * @param knotX, knotY, interpolation as {@link evaluateTable} (≥ 2 rows for linear).
 * @param target finite value. @param tie `'middle'` (default), `'lowest'`, `'highest'`.
 * @throws RatchetError NOT_REACHABLE (target outside the curve's range), BAD_KNOTS (not monotone,
 *   too few rows), NON_FINITE, BAD_OPTION (tie, interpolation).
 * @example invertTable([0, 1, 2], [0, 0.75, 1], 'quadratic', 0.4375) // → 0.5
 */
export function invertTable(
  knotX: ArrayLike<number>,
  knotY: ArrayLike<number>,
  interpolation: TableInterpolation | undefined,
  target: number,
  tie: TieRule = 'middle',
): number {
  const [tx, ty, kind] = checkTable(knotX, knotY, interpolation);
  if (tx.length < 2) fail('BAD_KNOTS', 'knot_table', 'needs at least 2 knots to read back x');
  if (!Number.isFinite(target)) fail('NON_FINITE', 'target', `needs a finite number; got ${String(target)}`);
  if (kind === 'linear') return invertChecked(tx, ty, target, tie);
  return invertQuadraticChecked(tx, ty, target, tie);
}

/**
 * {@link invertTable} for a checked quadratic table (odd length ≥ 3, strictly increasing
 * positions, finite values, finite target): same rule, errors and cost.
 * @example invertQuadraticChecked(Float64Array.of(0, 1, 2), Float64Array.of(0, 0.75, 1), 1, 'middle') // → 2
 */
export function invertQuadraticChecked(tx: Float64Array, ty: Float64Array, target: number, tie: TieRule): number {
  if (tie !== 'lowest' && tie !== 'middle' && tie !== 'highest') {
    fail('BAD_OPTION', 'tie', `needs 'lowest', 'middle' or 'highest'; got ${String(tie)}`);
  }
  const P = tx.length;
  const J = (P - 1) / 2;
  const s = ty[P - 1]! >= ty[0]! ? 1 : -1;
  for (let j = 0; j < J; j++) {
    const i = 2 * j;
    if (!monotonePiece(tx, ty, i) || s * ty[i + 2]! < s * ty[i]!) {
      fail('BAD_KNOTS', 'knot_table', `needs a monotone curve to read back x; the parabola on [${tx[i]}, ${tx[i + 2]}] turns`);
    }
  }
  const y = s * target;
  const first = s * ty[0]!;
  const last = s * ty[P - 1]!;
  if (y < first || y > last) {
    const lo = Math.min(ty[0]!, ty[P - 1]!);
    const hi = Math.max(ty[0]!, ty[P - 1]!);
    fail('NOT_REACHABLE', 'target', `${target} is outside the curve's range [${lo}, ${hi}]`);
  }
  // Lowest x: first interval whose right end reaches the target.
  let xl = NaN;
  for (let j = 0; j < J; j++) {
    const i = 2 * j;
    if (s * ty[i + 2]! >= y) {
      xl = s * ty[i]! >= y ? tx[i]! : root(tx, ty, i, s, y);
      break;
    }
  }
  // Highest x: last interval whose left end is at or below the target.
  let xh = NaN;
  for (let j = J - 1; j >= 0; j--) {
    const i = 2 * j;
    if (s * ty[i]! <= y) {
      xh = s * ty[i + 2]! <= y ? tx[i + 2]! : root(tx, ty, i, s, y);
      break;
    }
  }
  if (xh < xl) xh = xl;
  if (tie === 'lowest') return xl;
  if (tie === 'highest') return xh;
  return xl === xh ? xl : xl + (xh - xl) / 2;
}

/**
 * The x in [tx[i], tx[i + 2]] where the parabola through rows i … i + 2 equals s·y (rising frame
 * s·ty), by the numerically stable quadratic formula on u = (x − x0)/(x2 − x0).
 */
function root(tx: Float64Array, ty: Float64Array, i: number, s: number, y: number): number {
  const x0 = tx[i]!;
  const x2 = tx[i + 2]!;
  const r = (tx[i + 1]! - x0) / (x2 - x0);
  const a = s * ty[i]!;
  const m = s * ty[i + 1]!;
  const b = s * ty[i + 2]!;
  // q(u) = a + B u + A u² with q(r) = m, q(1) = b.
  const A = (m - a - r * (b - a)) / (r * (r - 1));
  const B = b - a - A;
  const C = a - y;
  let u: number;
  if (Math.abs(A) <= 1e-14 * Math.abs(B)) u = -C / B;
  else {
    const disc = Math.max(0, B * B - 4 * A * C);
    const q = -0.5 * (B + (B >= 0 ? 1 : -1) * Math.sqrt(disc));
    const u1 = q / A;
    const u2 = q !== 0 ? C / q : u1;
    // The root inside [0, 1] (the monotone piece has exactly one there); the nearer one to it otherwise.
    const dist = (v: number) => (v < 0 ? -v : v > 1 ? v - 1 : 0);
    u = dist(u1) <= dist(u2) ? u1 : u2;
  }
  if (!(u >= 0)) u = 0;
  if (u > 1) u = 1;
  return x0 + u * (x2 - x0);
}
