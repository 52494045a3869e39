/**
 * Bad input for the shape options (curvature, degree), the smooth table and the shaped solvers:
 * each row is a typed RatchetError with a stable code and the exact message.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  RatchetError,
  crossValidate,
  evaluateTable,
  fitMonotone,
  invertTable,
  shapeRegression,
  type Curvature,
  type Degree,
} from '../../src/core/index.js';

const x = [0, 1, 2, 3, 4];
const y = [0, 1, 1.5, 1.8, 2];

interface Row {
  name: string;
  run: () => unknown;
  code: string;
  message: string;
}

const rows: Row[] = [
  { name: 'curvature 2', run: () => fitMonotone(x, y, { knots: 3, curvature: 2 as Curvature }), code: 'BAD_OPTION', message: 'curvature: needs -1 (concave), 0 (any) or 1 (convex); got 2.' },
  { name: 'curvature 0.5', run: () => fitMonotone(x, y, { knots: 3, curvature: 0.5 as Curvature }), code: 'BAD_OPTION', message: 'curvature: needs -1 (concave), 0 (any) or 1 (convex); got 0.5.' },
  { name: 'curvature NaN', run: () => fitMonotone(x, y, { knots: 3, curvature: NaN as Curvature }), code: 'BAD_OPTION', message: 'curvature: needs -1 (concave), 0 (any) or 1 (convex); got NaN.' },
  { name: 'curvature as text', run: () => fitMonotone(x, y, { knots: 3, curvature: 'concave' as unknown as Curvature }), code: 'BAD_OPTION', message: 'curvature: needs -1 (concave), 0 (any) or 1 (convex); got string.' },
  { name: 'degree 3', run: () => fitMonotone(x, y, { knots: 3, degree: 3 as Degree }), code: 'BAD_OPTION', message: 'degree: needs 1 (piecewise linear) or 2 (smooth); got 3.' },
  { name: 'degree 0', run: () => fitMonotone(x, y, { knots: 3, degree: 0 as Degree }), code: 'BAD_OPTION', message: 'degree: needs 1 (piecewise linear) or 2 (smooth); got 0.' },
  { name: 'classic fit with curvature', run: () => fitMonotone(x, y, { curvature: -1 }), code: 'BAD_OPTION', message: 'curvature: needs knots (K ≥ 2): the classic fit has no curvature option; got -1.' },
  { name: 'classic fit (knots 0) with degree 2', run: () => fitMonotone(x, y, { knots: 0, degree: 2 }), code: 'BAD_OPTION', message: 'degree: needs knots (K ≥ 2): the classic fit has no smooth option; got 2.' },
  { name: 'cross-validation: candidate 0 with a shape', run: () => crossValidate(x, y, { candidates: [2, 0], folds: 2, curvature: 1 }), code: 'BAD_OPTION', message: 'candidates: needs knot counts ≥ 2 with a curvature or degree option (the classic fit has no shape); entry 2 is 0.' },
  { name: 'cross-validation: degree 5', run: () => crossValidate(x, y, { candidates: [2], folds: 2, degree: 5 as Degree }), code: 'BAD_OPTION', message: 'degree: needs 1 (piecewise linear) or 2 (smooth); got 5.' },
  { name: 'shapeRegression without knots', run: () => shapeRegression(x, y, { knots: undefined as unknown as number, curvature: 1 }), code: 'BAD_KNOTS', message: 'knots: needs a knot count or a list of knot positions.' },
  { name: 'shapeRegression: one distinct x', run: () => shapeRegression([1, 1, 1], [1, 2, 3], { knots: 2, degree: 2 }), code: 'TOO_FEW_POINTS', message: 'x: needs at least 2 distinct values with positive weight; got 1.' },
  { name: 'quadratic table with an even row count', run: () => evaluateTable([0, 1, 2, 3], [0, 1, 2, 3], 'quadratic', [1]), code: 'BAD_KNOTS', message: 'knot_table: needs an odd number of rows, at least 3 (knots and midpoints), for quadratic reading; got 4.' },
  { name: 'unknown interpolation', run: () => evaluateTable([0, 1, 2], [0, 1, 2], 'cubic' as 'linear', [1]), code: 'BAD_OPTION', message: "interpolation: needs 'linear' or 'quadratic'; got cubic." },
  { name: 'read-back on a turning parabola', run: () => invertTable([0, 0.5, 1], [0, 0.9, 1], 'quadratic', 0.5), code: 'BAD_KNOTS', message: 'knot_table: needs a monotone curve to read back x; the parabola on [0, 1] turns.' },
  { name: 'read-back beyond the smooth curve', run: () => invertTable([0, 1, 2], [0, 0.75, 1], 'quadratic', 1.5), code: 'NOT_REACHABLE', message: "target: 1.5 is outside the curve's range [0, 1]." },
  { name: 'read-back of a non-finite target', run: () => invertTable([0, 1, 2], [0, 0.75, 1], 'quadratic', Infinity), code: 'NON_FINITE', message: 'target: needs a finite number; got Infinity.' },
  { name: 'read-back with an unknown tie rule', run: () => invertTable([0, 1, 2], [0, 0.75, 1], 'quadratic', 0.5, 'any' as 'middle'), code: 'BAD_OPTION', message: "tie: needs 'lowest', 'middle' or 'highest'; got any." },
];

describe('shape options: bad input is a typed RatchetError with the exact message', () => {
  for (const row of rows) {
    it(`${row.name} → ${row.code}`, () => {
      let caught: unknown;
      try {
        row.run();
      } catch (e) {
        caught = e;
      }
      expect(caught).toBeInstanceOf(RatchetError);
      expect((caught as RatchetError).code).toBe(row.code);
      expect((caught as RatchetError).message).toBe(row.message);
    });
  }
});

describe('shape options: arbitrary arguments never escape as untyped errors or silent NaN', () => {
  it('fitMonotone with arbitrary curvature, degree, knots, bounds and data returns finite numbers or throws a RatchetError', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.double(), fc.integer({ min: -3, max: 3 })), { minLength: 0, maxLength: 12 }),
        fc.array(fc.oneof(fc.double(), fc.integer({ min: -3, max: 3 })), { minLength: 0, maxLength: 12 }),
        fc.oneof(fc.constantFrom(-1, 0, 1, 2, 0.5, NaN), fc.integer()),
        fc.oneof(fc.constantFrom(1, 2, 3, 0, NaN), fc.integer()),
        fc.oneof(fc.constantFrom(0, 1, 2, 3, 5, 2.5, -1), fc.array(fc.double(), { maxLength: 5 })),
        fc.option(fc.double(), { nil: undefined }),
        fc.option(fc.double(), { nil: undefined }),
        (xs, ys, curvature, degree, knots, lower, upper) => {
          try {
            const m = fitMonotone(xs, ys, { knots, curvature: curvature as Curvature, degree: degree as Degree, lower, upper });
            for (const v of m.knotY) expect(Number.isFinite(v)).toBe(true);
            for (const v of m.fitted) expect(Number.isFinite(v)).toBe(true);
          } catch (e) {
            expect(e).toBeInstanceOf(RatchetError);
          }
        },
      ),
      { seed: 20261202, numRuns: 2000 },
    );
  });
});
