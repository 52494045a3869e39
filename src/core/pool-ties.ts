/**
 * Sorting rows by x and pooling equal x into one weighted point.
 */
import { sortOrder } from './sort-order.js';

/** Rows grouped by distinct x, in ascending x order. */
export interface PooledData {
  /** Distinct x values, ascending (length m). */
  x: Float64Array;
  /** Weighted mean of y at each distinct x (Σwy / Σw; for total weight 0, the plain mean). */
  y: Float64Array;
  /** Summed weight at each distinct x (may be 0). */
  w: Float64Array;
  /** For every input row, the index of its distinct x. */
  group: Uint32Array;
}

/**
 * Sorts rows by x and pools ties: each distinct x becomes one point carrying the weighted mean
 * of its y values and the sum of their weights (the "secondary" treatment of ties, de Leeuw
 * 1977). Rows whose weights at one x are all zero keep the plain mean of their y.
 *
 * Cost: O(n) (radix sort order, then one pass). Inputs are not modified.
 *
 * @param x finite x values (n ≥ 1).
 * @param y finite y values, same length.
 * @param w finite weights ≥ 0, same length.
 * @example poolTies([2, 1, 2], [4, 1, 6], [1, 1, 3]) // → x [1, 2], y [1, 5.5], w [1, 4], group [1, 0, 1]
 */
export function poolTies(x: ArrayLike<number>, y: ArrayLike<number>, w: ArrayLike<number>): PooledData {
  const n = x.length;
  const order = sortOrder(x);
  const px = new Float64Array(n);
  const py = new Float64Array(n);
  const pw = new Float64Array(n);
  const plain = new Float64Array(n);
  const count = new Uint32Array(n);
  const group = new Uint32Array(n);
  let m = -1;
  let last = NaN;
  for (let k = 0; k < n; k++) {
    const i = order[k]!;
    const xi = x[i]! + 0;
    if (m < 0 || xi !== last) {
      m++;
      px[m] = xi;
      last = xi;
    }
    const wi = w[i]!;
    pw[m] = pw[m]! + wi;
    py[m] = py[m]! + wi * y[i]!;
    plain[m] = plain[m]! + y[i]!;
    count[m]!++;
    group[i] = m;
  }
  m++;
  for (let j = 0; j < m; j++) {
    py[j] = pw[j]! > 0 ? py[j]! / pw[j]! : plain[j]! / count[j]!;
  }
  return { x: px.slice(0, m), y: py.slice(0, m), w: pw.slice(0, m), group };
}
