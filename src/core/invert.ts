/**
 * Inverse read-back: the x at which a monotone knot curve reaches a target value.
 */
import type { TieRule } from './types.js';
import { fail } from './errors.js';
import { checkKnotPositions } from './knots.js';
import { finiteArray, sameLength } from './validate.js';
import { lerp, share } from './interpolate.js';

/**
 * Checks a knot table for interpolation or inversion: positions finite and strictly increasing
 * (at least 1 for interpolation, 2 for inversion is the caller's choice via `minimum`), values
 * finite and of the same length. Returns validated copies.
 *
 * @throws RatchetError BAD_KNOTS, NON_FINITE, LENGTH_MISMATCH.
 */
export function checkKnotTable(
  knotX: ArrayLike<number>,
  knotY: ArrayLike<number>,
  name = 'knot_table',
): [Float64Array, Float64Array] {
  const tx = knotX.length === 1 ? finiteArray(name, knotX) : checkKnotPositions(knotX, name);
  sameLength(`${name} positions`, tx.length, `${name} values`, knotY);
  const ty = finiteArray(`${name} values`, knotY);
  return [tx, ty];
}

/**
 * The x in [t₁, t_K] where the interpolated knot curve equals `target`.
 *
 * The curve must be monotone (non-decreasing or non-increasing knot values). On a rising or
 * falling segment the answer is the linear read-back x = tⱼ + (y₀ − θⱼ)(tⱼ₊₁ − tⱼ)/(θⱼ₊₁ − θⱼ);
 * where the curve equals the target over a whole stretch, `tie` picks its lowest x, its middle,
 * or its highest x. The flat extensions beyond the end knots are not part of the read-back.
 *
 * Cost: O(K) (one scan for the stretch). Inputs are not modified.
 *
 * @param knotX strictly increasing knot positions (K ≥ 2).
 * @param knotY knot values, monotone, same length.
 * @param target the value to read back (finite).
 * @param tie `'middle'` (default), `'lowest'` or `'highest'`.
 * @throws RatchetError NOT_REACHABLE (target outside [min θ, max θ]), BAD_KNOTS (not monotone,
 *   fewer than 2 knots, positions not increasing), NON_FINITE, BAD_OPTION (tie).
 * @example invertAt([0, 1, 2, 3], [0, 1, 1, 2], 1) // → 1.5 (middle of the flat stretch [1, 2])
 */
export function invertAt(knotX: ArrayLike<number>, knotY: ArrayLike<number>, target: number, tie: TieRule = 'middle'): number {
  const [tx, ty] = checkKnotTable(knotX, knotY);
  if (tx.length < 2) fail('BAD_KNOTS', 'knot_table', 'needs at least 2 knots to read back x');
  if (!Number.isFinite(target)) fail('NON_FINITE', 'target', `needs a finite number; got ${String(target)}`);
  return invertChecked(tx, ty, target, tie);
}

/** {@link invertAt} on a checked table (strictly increasing tx, length ≥ 2). */
export function invertChecked(tx: Float64Array, ty: Float64Array, target: number, tie: TieRule): number {
  if (tie !== 'lowest' && tie !== 'middle' && tie !== 'highest') {
    fail('BAD_OPTION', 'tie', `needs 'lowest', 'middle' or 'highest'; got ${String(tie)}`);
  }
  const K = tx.length;
  let up = true;
  let down = true;
  for (let j = 1; j < K; j++) {
    if (ty[j]! < ty[j - 1]!) up = false;
    if (ty[j]! > ty[j - 1]!) down = false;
  }
  if (!up && !down) fail('BAD_KNOTS', 'knot_table', 'needs monotone values (all rising or all falling) to read back x');
  const s = up ? 1 : -1;
  const first = s * ty[0]!;
  const last = s * ty[K - 1]!;
  const y0 = s * target;
  if (y0 < first || y0 > last) {
    const lo = Math.min(ty[0]!, ty[K - 1]!);
    const hi = Math.max(ty[0]!, ty[K - 1]!);
    fail('NOT_REACHABLE', 'target', `${target} is outside the curve's range [${lo}, ${hi}]`);
  }
  // Lowest x: first segment whose upper end reaches the target.
  let xl = NaN;
  for (let j = 0; j < K; j++) {
    const v = s * ty[j]!;
    if (v >= y0) {
      if (j === 0 || v === y0) xl = tx[j]!;
      else {
        xl = lerp(tx[j - 1]!, tx[j]!, share(y0, s * ty[j - 1]!, v));
      }
      break;
    }
  }
  // Highest x: last segment whose lower end is at or below the target.
  let xh = NaN;
  for (let j = K - 1; j >= 0; j--) {
    const v = s * ty[j]!;
    if (v <= y0) {
      if (j === K - 1 || v === y0) xh = tx[j]!;
      else {
        xh = lerp(tx[j]!, tx[j + 1]!, share(y0, v, s * ty[j + 1]!));
      }
      break;
    }
  }
  if (xh < xl) xh = xl; // rounding on a steep segment
  if (tie === 'lowest') return xl;
  if (tie === 'highest') return xh;
  return xl === xh ? xl : lerp(xl, xh, 0.5);
}
