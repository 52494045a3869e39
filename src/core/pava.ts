/**
 * Weighted pool-adjacent-violators on data already sorted by x with ties pooled.
 */

/** Result of {@link pavaSorted}: the fitted level of every input position and the blocks. */
export interface PavaResult {
  /** Fitted (non-decreasing) value at every input position. */
  fitted: Float64Array;
  /** Start index of each block (constant stretch); blocks are `[starts[b], starts[b+1])`, the last ending at n. */
  starts: Uint32Array;
}

/**
 * Non-decreasing weighted least-squares fit to a sequence: minimises Σ wᵢ (yᵢ − fᵢ)² subject
 * to f₁ ≤ f₂ ≤ … ≤ fₙ, by pool-adjacent-violators (Ayer et al. 1955; Robertson, Wright &
 * Dykstra 1988, §1.2).
 *
 * Precondition in the name: the positions are in x order and carry one value each (ties already
 * pooled by the caller), and every weight is finite and > 0 — the caller removes zero weights.
 *
 * Blocks are merged while the lower block's mean is ≥ the upper block's (compared by
 * cross-multiplication, no division), so adjacent blocks always have strictly increasing means
 * and the block count equals the number of distinct fitted levels.
 *
 * Cost: O(n) time (each position enters and leaves the block stack at most once), O(n) memory.
 *
 * @param y values in x order (length n ≥ 1); not modified.
 * @param w positive weights, same length; not modified.
 * @returns fitted values and block starts.
 * @example pavaSorted([1, 3, 2, 4], [1, 1, 1, 1]).fitted // → Float64Array [1, 2.5, 2.5, 4]
 */
export function pavaSorted(y: ArrayLike<number>, w: ArrayLike<number>): PavaResult {
  const n = y.length;
  const sumW = new Float64Array(n);
  const sumWY = new Float64Array(n);
  const start = new Uint32Array(n);
  let top = -1;
  for (let i = 0; i < n; i++) {
    let W = w[i]!;
    let S = W * y[i]!;
    let s = i;
    // Merge while the block below has mean ≥ this block's mean: S_b / W_b ≥ S / W.
    while (top >= 0 && sumWY[top]! * W >= S * sumW[top]!) {
      W += sumW[top]!;
      S += sumWY[top]!;
      s = start[top]!;
      top--;
    }
    top++;
    sumW[top] = W;
    sumWY[top] = S;
    start[top] = s;
  }
  const fitted = new Float64Array(n);
  const blocks = top + 1;
  const starts = new Uint32Array(blocks);
  let previous = -Infinity;
  for (let b = 0; b < blocks; b++) {
    starts[b] = start[b]!;
    const end = b + 1 < blocks ? start[b + 1]! : n;
    // Division can round two nearly equal means out of order by an ulp; keep the output monotone.
    const level = Math.max(sumWY[b]! / sumW[b]!, previous);
    fitted.fill(level, start[b]!, end);
    previous = level;
  }
  return { fitted, starts };
}
