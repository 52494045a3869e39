/**
 * Spearman's rank correlation and the choice of fit direction.
 */
import type { Direction, DirectionOption } from './types.js';
import { sortOrder } from './sort-order.js';
import { fail } from './errors.js';

/** Average ranks (1-based) of `values`; tied values share the mean of their ranks. O(n). */
export function averageRanks(values: ArrayLike<number>): Float64Array {
  const n = values.length;
  const order = sortOrder(values);
  const ranks = new Float64Array(n);
  let k = 0;
  while (k < n) {
    let e = k + 1;
    const v = values[order[k]!]! + 0;
    while (e < n && values[order[e]!]! + 0 === v) e++;
    const r = (k + 1 + e) / 2; // mean of ranks k+1 … e
    for (let j = k; j < e; j++) ranks[order[j]!] = r;
    k = e;
  }
  return ranks;
}

/**
 * Spearman's rank correlation: Pearson's correlation of the average ranks of x and y, over the
 * rows with positive weight when weights are given (a row of weight 0 has no influence on any
 * result, this one included).
 *
 * Cost: O(n) (radix-sorted ranks), plus one O(n) copy when weights are given. Returns NaN when
 * either input is constant among the rows used (its ranks have zero variance), or when no row is
 * used — {@link resolveDirection} decides that case explicitly. Inputs are not modified.
 *
 * @param x finite numbers, n ≥ 1.
 * @param y finite numbers, same length.
 * @param w optional weights ≥ 0, same length; only rows with w > 0 count. Default: all rows.
 * @example spearman([1, 2, 3, 4], [10, 20, 15, 40]) // → 0.8
 * @example spearman([1, 2, 3, 4], [10, 20, 15, 40], [1, 1, 0, 1]) // → 1
 */
export function spearman(x: ArrayLike<number>, y: ArrayLike<number>, w?: ArrayLike<number>): number {
  if (w !== undefined) {
    const xs: number[] = [];
    const ys: number[] = [];
    for (let i = 0; i < x.length; i++) {
      if (w[i]! > 0) {
        xs.push(x[i]!);
        ys.push(y[i]!);
      }
    }
    return spearman(xs, ys);
  }
  const n = x.length;
  const rx = averageRanks(x);
  const ry = averageRanks(y);
  const mean = (n + 1) / 2;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const a = rx[i]! - mean;
    const b = ry[i]! - mean;
    sxy += a * b;
    sxx += a * a;
    syy += b * b;
  }
  return sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : NaN;
}

/**
 * Resolves a direction option. `'up'` and `'down'` pass through; `'auto'` is `'up'` when
 * Spearman's ρ of the rows with positive weight is ≥ 0 or undefined (constant x or y), and
 * `'down'` when ρ < 0 (scikit-learn's `increasing='auto'` rule, except that scikit-learn also
 * counts rows of weight 0, which here have no influence on anything, direction included).
 *
 * Cost: O(n) for `'auto'`, O(1) otherwise. Errors: BAD_OPTION for any other value.
 *
 * @example resolveDirection([1, 2, 3], [3, 2, 1], undefined, 'auto') // → 'down'
 */
export function resolveDirection(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  w: ArrayLike<number> | undefined,
  option: DirectionOption | undefined,
): Direction {
  if (option === undefined || option === 'up') return 'up';
  if (option === 'down') return 'down';
  if (option !== 'auto') fail('BAD_OPTION', 'direction', `needs 'up', 'down' or 'auto'; got ${String(option)}`);
  const rho = spearman(x, y, w);
  return rho < 0 ? 'down' : 'up';
}
