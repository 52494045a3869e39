/**
 * Scratch memory (src/core/scratch.ts) is reused from one fit to the next; what a fit returns must
 * never be, or view, that memory. The check: keep the results of one fit, run other fits on other
 * data (which overwrite the scratch buffers), and the kept results must be unchanged — compared
 * with copies taken right after the first fit. Sizes cover the short path (under 64 rows), 8-bit
 * and 16-bit radix digits, already sorted x, distinct x, and weights.
 */
import { describe, expect, it } from 'vitest';
import { fitMonotone, knotRegression } from '../../src/core/index.js';
import { sortOrder } from '../../src/core/sort-order.js';
import { isotonicRegression } from '../../src/core/isotonic.js';
import { scratchF64, Slot } from '../../src/core/scratch.js';

function data(n: number, seed: number, sorted = false): { x: Float64Array; y: Float64Array; w: Float64Array } {
  let s = seed >>> 0;
  const r = { nextDouble: (): number => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296) };
  const x = Float64Array.from({ length: n }, () => Math.floor(r.nextDouble() * n * 0.7) / 7);
  if (sorted) x.sort();
  const y = Float64Array.from(x, (v) => Math.sqrt(v) + r.nextDouble());
  const w = Float64Array.from({ length: n }, () => (r.nextDouble() < 0.1 ? 0 : 1 + r.nextDouble()));
  return { x, y, w };
}

/** Every typed array of a result, copied. */
function snapshot(result: object): Record<string, number[]> {
  const out: Record<string, number[]> = {};
  for (const [k, v] of Object.entries(result)) if (ArrayBuffer.isView(v)) out[k] = Array.from(v as Float64Array);
  return out;
}

describe('scratch memory never leaks into results', () => {
  it.each([40, 5000, 70000])('classic and knot fits on %i rows keep their results through later fits', (n) => {
    const first = data(n, 1);
    const kept = [
      fitMonotone(first.x, first.y),
      fitMonotone(first.x, first.y, { weights: first.w }),
      fitMonotone(first.x.slice().sort(), first.y),
      isotonicRegression(first.y, first.x), // distinct x: the sorted x fill the whole key buffer
      isotonicRegression(first.x, first.y, { weights: first.w }),
      knotRegression(first.x, first.y, { knots: 7 }),
    ];
    const copies = kept.map(snapshot);
    const order = sortOrder(first.x);
    const orderCopy = Array.from(order);
    for (const seed of [2, 3]) {
      const other = data(n + 17, seed, seed === 3);
      fitMonotone(other.x, other.y, { weights: other.w });
      fitMonotone(other.x, other.y);
      knotRegression(other.x, other.y, { knots: 5, weights: other.w });
      sortOrder(other.x);
      scratchF64(Slot.BlockSum, n + 17).fill(NaN);
    }
    kept.forEach((result, i) => expect(snapshot(result)).toEqual(copies[i]));
    expect(Array.from(order)).toEqual(orderCopy);
  });
});
