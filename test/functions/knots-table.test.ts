/**
 * RATCHET.KNOTS fits a plain knot model for its table only (README, "Performance"). The table is
 * defined to be the one the full fit gives, so the check is exact equality with the core's full
 * fit (knotRegression with fitted values, whose correctness knots.reference.test.ts checks
 * against R and SciPy) on random data, and errors equal to those FIT reports for the same
 * arguments (both read their arguments in one order and fit with the same core).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { knotRegression } from '../../src/core/knot-fit.js';
import { clearCaches } from '../../src/functions/engine.js';
import type { CellArg } from '../../src/functions/types.js';
import { cell, col } from './helpers.js';

const data = fc.array(
  fc.record({
    x: fc.integer({ min: -50, max: 50 }).map((v) => v / 4),
    y: fc.integer({ min: -80000, max: 80000 }).map((v) => v / 64),
    w: fc.oneof(fc.constant(0), fc.integer({ min: 1, max: 40 }).map((v) => v / 4)),
  }),
  { minLength: 2, maxLength: 60 },
);

describe('RATCHET.KNOTS on the table-only path', () => {
  it('gives bit for bit the knot table of the full fit (counts and positions, weights or none, both directions)', () => {
    fc.assert(
      fc.property(data, fc.integer({ min: 2, max: 9 }), fc.constantFrom<'up' | 'down'>('up', 'down'), fc.boolean(), fc.boolean(), (rows, K, direction, weighted, explicit) => {
        clearCaches();
        const x = rows.map((r) => r.x);
        const y = rows.map((r) => r.y);
        const w = rows.map((r) => r.w);
        const positive = x.filter((_, i) => !weighted || w[i]! > 0);
        if (new Set(positive).size < 2) return;
        const lo = Math.min(...positive);
        const hi = Math.max(...positive);
        const knots: number | number[] = explicit ? [lo, (2 * lo + hi) / 3, hi] : K;
        const full = knotRegression(x, y, { knots, direction, weights: weighted ? w : undefined });
        const knotsArg: CellArg = typeof knots === 'number' ? knots : [knots];
        const got = cell('KNOTS', col(...y), col(...x), knotsArg, direction === 'up' ? 1 : -1, weighted ? col(...w) : null);
        expect(got).toEqual(Array.from(full.knotX, (v, j) => [v, full.knotY[j]!]));
      }),
      { seed: 1616, numRuns: 200 },
    );
  });

  it('reports the errors FIT reports for the same arguments', () => {
    const cases: CellArg[][] = [
      [col(1, 2, 3), col(5, 5, 5), 3],
      [col(1, 2, 3), col(1, 2, 3), 1],
      [col(1, 2, 3), col(1, 2, 3), 2, 7],
      [col(1, 2, 3), col(1, 2, 3), 2, 1, col(0, 0, 1)],
      [col(1, 2, 3), col(1, 2), 2],
    ];
    for (const args of cases) {
      clearCaches();
      const knots = cell('KNOTS', ...args);
      clearCaches();
      const fit = cell('FIT', ...args);
      expect(knots).toHaveProperty('error');
      expect(knots).toEqual(fit);
    }
  });
});
