/**
 * Pool-adjacent-violators on block means, for weights spread too widely for cross-multiplication.
 */
import type { PavaResult } from './pava.js';

/**
 * The same fit as {@link pavaSorted} — minimises Σ wᵢ (yᵢ − fᵢ)² subject to f₁ ≤ … ≤ fₙ — but
 * keeps each block's weight and mean instead of its weighted sum, and merges with
 * mean ← mean₁ + (mean₂ − mean₁)·W₂/(W₁ + W₂). No product of two weights or of a weight and a
 * sum is formed, so weights from 2^-700 to 2^700 in one problem (the classic fit's rescaled
 * weights spanning the documented 1e-300 to 1e100) neither overflow nor underflow, where the
 * cross-multiplied comparison of pavaSorted would. Each merge rounds the mean once; the result
 * agrees with exact PAVA to a few ulps per merge.
 *
 * Precondition in the name: positions in x order, one value each (ties pooled), weights finite
 * and > 0 with a finite total, |y| below about 1e307 so that differences of means cannot overflow
 * (the classic fit passes y scaled to at most 1).
 *
 * Cost: O(n) time and memory, like pavaSorted.
 *
 * @param y values in x order (length n ≥ 1); not modified.
 * @param w positive weights, same length; not modified.
 * @returns fitted values and block starts (blocks of strictly increasing means).
 * @example pavaSortedWide([1, 3, 2, 4], [1e300, 1e-300, 1e-300, 1]).fitted // → Float64Array [1, 2.5, 2.5, 4]
 * @see Robertson, Wright & Dykstra (1988), Order Restricted Statistical Inference, Wiley, §1.2.
 */
export function pavaSortedWide(y: ArrayLike<number>, w: ArrayLike<number>): PavaResult {
  const n = y.length;
  const blockW = new Float64Array(n);
  const blockMean = new Float64Array(n);
  const start = new Uint32Array(n);
  let top = -1;
  for (let i = 0; i < n; i++) {
    let W = w[i]!;
    let mean = y[i]!;
    let s = i;
    while (top >= 0 && blockMean[top]! >= mean) {
      const total = blockW[top]! + W;
      mean = blockMean[top]! + (mean - blockMean[top]!) * (W / total);
      W = total;
      s = start[top]!;
      top--;
    }
    top++;
    blockW[top] = W;
    blockMean[top] = mean;
    start[top] = s;
  }
  const fitted = new Float64Array(n);
  const blocks = top + 1;
  const starts = new Uint32Array(blocks);
  let previous = -Infinity;
  for (let b = 0; b < blocks; b++) {
    starts[b] = start[b]!;
    const end = b + 1 < blocks ? start[b + 1]! : n;
    const level = Math.max(blockMean[b]!, previous);
    fitted.fill(level, start[b]!, end);
    previous = level;
  }
  return { fitted, starts };
}
