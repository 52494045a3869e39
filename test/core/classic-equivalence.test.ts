/**
 * The one-pass classic fit (isotonicRegression) against the previous algorithm's output
 * (test/core/classic-previous.ts: sortOrder → poolTies → pavaSorted, the pipeline the scikit-learn
 * and R fixtures of isotonic.reference.test.ts were first checked with). The two use the same
 * arithmetic on differently power-of-two-scaled values, so away from the subnormal range they agree
 * to the last bit; the check allows 1e-14 relative.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { isotonicRegression } from '../../src/core/isotonic.js';
import type { Direction } from '../../src/core/types.js';
import { previousClassic } from './classic-previous.js';

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

function expectSame(x: Float64Array, y: Float64Array, w: Float64Array | undefined, direction: Direction, lower?: number, upper?: number): void {
  const fit = isotonicRegression(x, y, { weights: w, direction, lower, upper });
  const prev = previousClassic(x, y, w ?? new Float64Array(x.length).fill(1), direction, lower, upper);
  expect(fit.x.length).toBe(prev.x.length);
  expect(fit.x.every((v, j) => v === prev.x[j])).toBe(true);
  expect(fit.weight).toBeAllCloseRel(prev.weight, 1e-14, 0);
  expect(fit.value).toBeAllCloseRel(prev.value, 1e-14, 1e-300);
  expect(fit.fitted).toBeAllCloseRel(prev.fitted, 1e-14, 1e-300);
  expect(fit.levels).toBe(prev.levels);
  expect(fit.knotX).toBeAllCloseRel(prev.knotX, 1e-14, 1e-300);
  expect(fit.knotY).toBeAllCloseRel(prev.knotY, 1e-14, 1e-300);
}

describe('classic fit: one-pass pipeline equals the previous algorithm', () => {
  const row = fc.record({
    x: fc.integer({ min: -30, max: 30 }).map((v) => v / 4),
    y: fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true }),
    w: fc.oneof(fc.constant(0), fc.double({ min: 0.01, max: 100, noNaN: true })),
  });
  const data = fc
    .array(row, { minLength: 2, maxLength: 120 })
    .filter((rows) => new Set(rows.filter((r) => r.w > 0).map((r) => r.x)).size >= 2);

  it('on random small data with ties, zero weights, both directions and bounds (fast-check, seed 1616)', () => {
    fc.assert(
      fc.property(data, fc.boolean(), fc.constantFrom<Direction>('up', 'down'), fc.boolean(), (rows, weighted, dir, bounded) => {
        const x = Float64Array.from(rows, (r) => r.x);
        const y = Float64Array.from(rows, (r) => r.y);
        const w = weighted ? Float64Array.from(rows, (r) => r.w) : undefined;
        if (!weighted && new Set(rows.map((r) => r.x)).size < 2) return;
        expectSame(x, y, w, dir, bounded ? -1e5 : undefined, bounded ? 2e5 : undefined);
      }),
      { seed: 1616, numRuns: 300 },
    );
  });

  it('on 70,000 random rows (16-bit radix digits): distinct x, many ties, weights with zeros, y near 1e300', () => {
    const n = 70_000;
    const r = lcg(16);
    const x = new Float64Array(n);
    const ties = new Float64Array(n);
    const y = new Float64Array(n);
    const w = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      x[i] = 100 * r() - 30;
      ties[i] = Math.floor(1000 * r()) / 10;
      y[i] = Math.log1p(Math.abs(x[i]!)) + (r() - 0.5) * 2;
      w[i] = r() < 0.1 ? 0 : 2 * r();
    }
    expectSame(x, y, undefined, 'up');
    expectSame(ties, y, undefined, 'down');
    expectSame(ties, y, w, 'up', 0, 3);
    expectSame(x, y.map((v) => v * 1e300), w.map((v) => v * 1e300), 'up');
  });
});
