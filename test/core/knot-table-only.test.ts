/**
 * The knot-table-only path of the knot fit (`fitted: false`, used by cross-validation) and the
 * unit-weight path (weights absent) against the full path: the definition is that they compute
 * the same knot table, so the check is exact equality, on random data (fast-check, fixed seeds).
 * That the full path itself is right is checked against R and SciPy in knots.reference.test.ts.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { knotRegression } from '../../src/core/knot-fit.js';
import type { Direction } from '../../src/core/types.js';

const rows = fc.array(
  fc.record({
    x: fc.integer({ min: -400, max: 400 }).map((v) => v / 8),
    y: fc.double({ min: -1e3, max: 1e3, noNaN: true }),
    w: fc.oneof(fc.constant(0), fc.double({ min: 0.1, max: 10, noNaN: true })),
  }),
  { minLength: 3, maxLength: 80 },
);

describe('knot fit: the knot-table-only path and the unit-weight path equal the full path', () => {
  it('fitted: false gives bit-identical knotX, knotY, levels and identified, and an empty fitted array', () => {
    fc.assert(
      fc.property(
        rows,
        fc.integer({ min: 2, max: 12 }),
        fc.constantFrom<Direction>('up', 'down'),
        fc.boolean(),
        fc.constantFrom(1, 1e300, 1e-250),
        (r, K, direction, weighted, scale) => {
          const x = r.map((p) => p.x * scale);
          const y = r.map((p) => p.y * scale);
          const weights = weighted ? r.map((p) => p.w) : undefined;
          const positive = x.filter((_, i) => (weights ? weights[i]! > 0 : true));
          if (new Set(positive).size < 2) return;
          const full = knotRegression(x, y, { knots: K, direction, weights });
          const table = knotRegression(x, y, { knots: K, direction, weights, fitted: false });
          expect(table.fitted.length).toBe(0);
          expect(Array.from(table.knotX)).toEqual(Array.from(full.knotX));
          expect(Array.from(table.knotY)).toEqual(Array.from(full.knotY));
          expect(table.levels).toBe(full.levels);
          expect(Array.from(table.identified)).toEqual(Array.from(full.identified));
          // Explicit knot positions take the binary-search path.
          const t = Array.from(full.knotX);
          const fullT = knotRegression(x, y, { knots: t, direction, weights });
          const tableT = knotRegression(x, y, { knots: t, direction, weights, fitted: false });
          expect(Array.from(tableT.knotY)).toEqual(Array.from(fullT.knotY));
        },
      ),
      { seed: 1602, numRuns: 300 },
    );
  });

  it('absent weights give bit-identical knot values and fitted values to an array of ones', () => {
    fc.assert(
      fc.property(rows, fc.integer({ min: 2, max: 12 }), fc.constantFrom<Direction>('up', 'down'), (r, K, direction) => {
        const x = r.map((p) => p.x);
        const y = r.map((p) => p.y);
        if (new Set(x).size < 2) return;
        const none = knotRegression(x, y, { knots: K, direction });
        const ones = knotRegression(x, y, { knots: K, direction, weights: x.map(() => 1) });
        expect(Array.from(none.knotY)).toEqual(Array.from(ones.knotY));
        expect(Array.from(none.fitted)).toEqual(Array.from(ones.fitted));
      }),
      { seed: 1603, numRuns: 300 },
    );
  });
});

describe('knot fit without weights: y checked through the assembled sums', () => {
  it('a NaN or ±Infinity y in a Float64Array raises NON_FINITE naming its entry, at any row, with or without fitted values', () => {
    for (const bad of [NaN, Infinity, -Infinity]) {
      for (const at of [0, 3, 9]) {
        const x = Float64Array.from({ length: 10 }, (_, i) => i);
        const y = Float64Array.from({ length: 10 }, (_, i) => i % 3);
        y[at] = bad;
        for (const fitted of [true, false]) {
          expect(() => knotRegression(x, y, { knots: 4, fitted })).toThrow(`y: needs finite numbers; entry ${at + 1} is ${String(bad)}.`);
        }
      }
    }
  });

  it('finite y whose sums overflow (1.5e308 each) are fitted after rescaling: the fit of y · 2^-1000 scaled back by 2^1000', () => {
    const x = Float64Array.from({ length: 40 }, (_, i) => i);
    const y = Float64Array.from({ length: 40 }, (_, i) => 1.5e308 * (i < 20 ? 0.9 : 1));
    const fit = knotRegression(x, y, { knots: 3 });
    const small = knotRegression(x, y.map((v) => v * 2 ** -1000), { knots: 3 });
    expect(fit.knotY).toBeAllCloseRel(small.knotY.map((v) => v * 2 ** 500 * 2 ** 500), 1e-15, 0);
  });
});
