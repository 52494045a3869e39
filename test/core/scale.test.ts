/**
 * Scale and heavy weights: fits that do not depend on the units of y or of the weights, and the
 * exact optimum for weight ratios up to 1e15 and for weights anywhere in the documented range.
 *
 * Reference values: test/reference/fixtures/scale.json, written by test/reference/gen_scale.py
 * (exact rational arithmetic with Python's fractions module on the exact binary values of the
 * inputs — KKT enumeration of working sets for the knot model, exact PAVA for the classic fit —
 * cross-checked against scipy.optimize.lsq_linear bvls on the unit-weight case; versions recorded
 * in the fixture; command `/usr/bin/python3 test/reference/gen_scale.py`).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitMonotone } from '../../src/core/index.js';

interface ScaleCase {
  name: string;
  x: number[];
  y: number[];
  w: number[];
  knots: number;
  knot_x: number[];
  knot_y: number[];
  fitted: number[];
  classic_fitted: number[];
}
const fixture = JSON.parse(
  readFileSync(new URL('../reference/fixtures/scale.json', import.meta.url), 'utf8'),
) as { cases: ScaleCase[] };
const byName = new Map(fixture.cases.map((c) => [c.name, c]));
function reference(name: string): ScaleCase {
  const c = byName.get(name);
  if (c === undefined) throw new Error(`fixture case ${name} missing`);
  return c;
}

describe('heavy rows: the exact optimum (exact rational reference, gen_scale.py)', () => {
  for (const name of [
    'first row weight 1e12',
    'first row weight 1e13',
    'first row weight 1e15',
    'last row weight 1e15',
    'first row weight 1e100, the others 1e-300',
    'y times 1e-100, all weights 1e-250',
    'unit weights',
  ]) {
    it(`knot fit with 3 even knots, ${name}: fitted values and knot values within 1e-9 relative`, () => {
      const c = reference(name);
      const m = fitMonotone(c.x, c.y, { knots: c.knots, weights: c.w });
      expect(m.fitted).toBeAllCloseRel(c.fitted, 1e-9, 0);
      expect(m.knotY).toBeAllCloseRel(c.knot_y, 1e-9, 0);
    });
    it(`classic fit, ${name}: fitted values within 1e-9 relative`, () => {
      const c = reference(name);
      const m = fitMonotone(c.x, c.y, { weights: c.w });
      expect(m.fitted).toBeAllCloseRel(c.classic_fitted, 1e-9, 0);
    });
  }

  it('first row weight 1e12 matches the values reported for it (10, 11.7846, 13.5692, 15.6, 17.8769, 20.1538, rounded)', () => {
    const m = fitMonotone([1, 2, 3, 4, 5, 6], [10, 14, 12, 17, 16, 21], { knots: 3, weights: [1e12, 1, 1, 1, 1, 1] });
    expect(m.fitted).toBeAllCloseRel([10, 11.7846, 13.5692, 15.6, 17.8769, 20.1538], 5e-6, 0);
  });
});

describe('a heavy row strictly between two knots', () => {
  it('third row weight 1e15 (between knots 1 and 3.5): NUMERICAL with a message, never a wrong fit', () => {
    const c = reference('third row weight 1e15');
    expect(() => fitMonotone(c.x, c.y, { knots: c.knots, weights: c.w })).toThrow(
      expect.objectContaining({ code: 'NUMERICAL', message: expect.stringMatching(/^knots: needs normal equations that determine every knot value to 1e-9; .*put a knot at the heavy rows' x/) }),
    );
  });
  it('third row weight 1e15, classic fit: exact (PAVA has no such coupling)', () => {
    const c = reference('third row weight 1e15');
    expect(fitMonotone(c.x, c.y, { weights: c.w }).fitted).toBeAllCloseRel(c.classic_fitted, 1e-9, 0);
  });
  it('third row weight 1e6 (within the documented limit for heavy rows between knots): the exact optimum to 1e-9', () => {
    const c = reference('third row weight 1e6');
    const m = fitMonotone(c.x, c.y, { knots: c.knots, weights: c.w });
    expect(m.fitted).toBeAllCloseRel(c.fitted, 1e-9, 0);
    expect(m.knotY).toBeAllCloseRel(c.knot_y, 1e-9, 0);
  });
});

describe('underflow: y × 1e-100 with all weights 1e-250 is the unscaled fit × 1e-100', () => {
  const x = [1, 2, 3, 4, 5, 6];
  const y = [10, 14, 12, 17, 16, 21];
  for (const knots of [0, 3]) {
    it(`${knots === 0 ? 'classic' : '3 knots'}: fitted values 1e-100 × the unit fit, and STATS r2, rmse and mae those of the unit fit (r2 not 1)`, () => {
      const base = fitMonotone(x, y, { knots });
      const tiny = fitMonotone(x, y.map((v) => v * 1e-100), { knots, weights: x.map(() => 1e-250) });
      expect(tiny.fitted).toBeAllCloseRel(Array.from(base.fitted, (v) => v * 1e-100), 1e-9, 0);
      expect(tiny.stats.r2).toBeCloseRel(base.stats.r2, 1e-9);
      expect(tiny.stats.r2).toBeLessThan(1);
      // SSE itself is about 1e-449, below the smallest double: 0 is its correctly rounded value.
      // RMSE and MAE, which carry the same information, stay accurate.
      expect(tiny.stats.sse).toBe(0);
      expect(tiny.stats.rmse).toBeGreaterThan(0);
      expect(tiny.stats.rmse).toBeCloseRel(base.stats.rmse * 1e-100, 1e-9, 0);
      expect(tiny.stats.mae).toBeCloseRel(base.stats.mae * 1e-100, 1e-9, 0);
    });
  }
});

describe('shaped knot fits (concave, convex, smooth) under rescaling', () => {
  const x = [1, 2, 3, 4, 5, 6, 7, 8];
  const y = [10, 14, 12, 17, 16, 21, 22, 22.5];
  const shapes = [{ curvature: -1 as const }, { curvature: 1 as const }, { degree: 2 as const }];
  const scalings: [number, number][] = [
    [1e-100, 1e-250],
    [1, 1e100],
    [1, 1e-300],
    [1e90, 1],
  ];
  for (const shape of shapes) {
    for (const [sy, sw] of scalings) {
      it(`${JSON.stringify(shape)}, y × ${sy}, weights ${sw}: fitted values and knot values × ${sy} of the unit fit to 1e-9, R² equal`, () => {
        const base = fitMonotone(x, y, { knots: 4, ...shape });
        const m = fitMonotone(x, y.map((v) => v * sy), { knots: 4, ...shape, weights: x.map(() => sw) });
        expect(m.fitted).toBeAllCloseRel(Array.from(base.fitted, (v) => v * sy), 1e-9, 0);
        expect(m.knotY).toBeAllCloseRel(Array.from(base.knotY, (v) => v * sy), 1e-9, 0);
        expect(m.stats.r2).toBeCloseRel(base.stats.r2, 1e-9);
      });
    }
  }
});
