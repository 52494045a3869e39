/**
 * Heavy rows in the shaped knot fits (concave, convex, smooth, smooth concave, smooth convex): one
 * row 1e13 or 1e15 times heavier than the others gives the exact optimum — not a constant, not an
 * internal error.
 *
 * Reference values: test/reference/fixtures/shape_heavy.json, written by
 * test/reference/gen_shape_heavy.py (exact rational arithmetic with Python's fractions module on
 * the exact binary values of the inputs: KKT enumeration over the active sets of the shape rows,
 * hat and quadratic B-spline bases by Cox–de Boor in exact arithmetic; the unit-weight version of
 * each problem is cross-checked against cvxopt.solvers.qp; versions recorded in the fixture;
 * command `/usr/bin/python3 test/reference/gen_shape_heavy.py`).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitMonotone } from '../../src/core/index.js';

interface HeavyCase {
  name: string;
  x: number[];
  y: number[];
  w: number[];
  knots: number[];
  degree: 1 | 2;
  curvature: -1 | 0 | 1;
  coefficients: number[];
  fitted: number[];
  unit_weight_fitted_cvxopt: number[];
}
const fixture = JSON.parse(
  readFileSync(new URL('../reference/fixtures/shape_heavy.json', import.meta.url), 'utf8'),
) as { cases: HeavyCase[] };

describe('shaped fits with one heavy row: the exact optimum (exact rational reference, gen_shape_heavy.py)', () => {
  for (const c of fixture.cases) {
    it(`${c.name} (degree ${c.degree}, curvature ${c.curvature}, knots ${c.knots.join(', ')}): fitted values and coefficients within 1e-9 relative`, () => {
      const m = fitMonotone(c.x, c.y, { knots: c.knots, weights: c.w, curvature: c.curvature, degree: c.degree });
      expect(m.fitted).toBeAllCloseRel(c.fitted, 1e-9, 0);
      expect(m.shape?.coefficients).toBeAllCloseRel(c.coefficients, 1e-9, 0);
    });
  }

  it('every case of the fixture was generated (5 shapes × 7 weightings)', () => {
    expect(fixture.cases.length).toBe(35);
  });

  it('the same problems with unit weights agree with cvxopt.solvers.qp (to 1e-7, interior-point accuracy)', () => {
    for (const c of fixture.cases) {
      const m = fitMonotone(c.x, c.y, { knots: c.knots, curvature: c.curvature, degree: c.degree });
      expect(m.fitted).toBeAllCloseRel(c.unit_weight_fitted_cvxopt, 1e-7, 0);
    }
  });
});

describe('the defects these replace (each failed before the shaped solver was made relative)', () => {
  const x = [1, 2, 3, 4, 5, 6];
  const y = [10, 14, 12, 17, 16, 21];
  const heavyFirst = [1e13, 1, 1, 1, 1, 1];

  it('degree 2, first row weight 1e13, 3 even knots: not flattened to a constant (the fit rises from 10 to 20.65)', () => {
    const m = fitMonotone(x, y, { knots: 3, degree: 2, weights: heavyFirst });
    const c = fixture.cases.find((k) => k.name === 'smooth, first row weight 1e+13')!;
    expect(m.fitted).toBeAllCloseRel(c.fitted, 1e-9, 0);
    expect(m.fitted[5]! - m.fitted[0]!).toBeGreaterThan(10);
    expect(m.stats.r2).toBeGreaterThan(0.5);
  });

  for (const [curvature, name] of [[-1, 'concave'], [1, 'convex']] as const) {
    for (const [pos, label] of [[0, 'first'], [5, 'last'], [2, 'third']] as const) {
      it(`${name}, ${label} row weight 1e15, 3 even knots: a fit (no "internal" error), the exact optimum to 1e-9`, () => {
        const w = [1, 1, 1, 1, 1, 1];
        w[pos] = 1e15;
        const m = fitMonotone(x, y, { knots: 3, curvature, weights: w });
        const c = fixture.cases.find((k) => k.name === `${name}, ${label} row weight 1e+15`)!;
        expect(m.fitted).toBeAllCloseRel(c.fitted, 1e-9, 0);
      });
    }
  }
});

describe('what cannot be solved is refused with a typed error, never an internal one', () => {
  it('smooth fit, heavy rows 1e15 with a knot that no row reaches: NUMERICAL naming what to change', () => {
    // Knots 1, 2, 3, 10, 11: the span (3, 10) has no rows, so with weights this far apart the
    // tie-break (sized to the heaviest rows) is not used and the fit is refused.
    const xs = [1, 1.5, 2, 2.5, 3, 10.5, 11];
    const ys = [1, 2, 3, 4, 5, 9, 10];
    const w = [1e15, 1, 1, 1, 1, 1, 1];
    let error: unknown;
    try {
      fitMonotone(xs, ys, { knots: [1, 2, 3, 6, 8, 10, 11], degree: 2, weights: w });
    } catch (e) {
      error = e;
    }
    expect(error).toEqual(expect.objectContaining({ code: 'NUMERICAL', message: expect.stringMatching(/^knots: needs .*(fewer knots|weights within)/) }));
    expect((error as Error).message).not.toMatch(/internal/);
  });
});
