/**
 * The surface's documented edge cases and errors: literal examples from the doc comments, the fill
 * of nodes the data cannot see, and the messages of bad input.
 */
import { describe, expect, it } from 'vitest';
import { fitSurface, predictSurface, RatchetError } from '../../src/core/index.js';
import { coneConditions, dataGradient, orderPairs, upperSet } from './helpers.js';

function codeOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    if (e instanceof RatchetError) return e.code;
    throw e;
  }
  return 'no error';
}

describe('doc-comment examples (values computed by hand)', () => {
  it('four rows on the corners of a 2 × 2 lattice are reproduced exactly', () => {
    const m = fitSurface([0, 1, 0, 1], [0, 0, 1, 1], [1, 2, 3, 4]);
    expect(Array.from(m.values)).toEqual([1, 2, 3, 4]);
    expect(m.stats.sse).toBe(0);
    // Bilinear inside: (1 + 2 + 3 + 4)/4 at the centre; clamped outside: (9, −1) → corner (1, 0).
    expect(Array.from(predictSurface(m, [0.5, 9], [0.5, -1]))).toEqual([2.5, 2]);
  });

  it('a violating pair is pooled: rows (0,0)=2 and (1,0)=1 rising along x1 both become 1.5', () => {
    const m = fitSurface([0, 1, 0, 1], [0, 0, 1, 1], [2, 1, 3, 4]);
    expect(m.values).toBeAllCloseRel([1.5, 1.5, 3, 4], 1e-12);
    expect(m.stats.sse).toBeCloseRel(0.5, 1e-12);
  });

  it("direction 'down' along x2 and 'none' along x1", () => {
    // Column x1 = 0: x2 = 0 → 1, x2 = 1 → 3 must fall along x2: pooled to 2. Column x1 = 1: 4 ≥ 2, kept.
    const m = fitSurface([0, 1, 0, 1], [0, 0, 1, 1], [1, 4, 3, 2], { direction1: 'none', direction2: 'down' });
    expect(m.values).toBeAllCloseRel([2, 4, 2, 2], 1e-12);
  });

  it('constant y gives a constant surface', () => {
    const m = fitSurface([1, 2, 3, 1, 2, 3], [1, 1, 1, 2, 2, 2], [5, 5, 5, 5, 5, 5], { knots1: 3, knots2: 2 });
    expect(m.values).toBeAllCloseRel(new Array(6).fill(5), 1e-12);
    expect(m.levels).toBe(1);
  });

  it('rows with weight 0 get a value but no influence', () => {
    const a = fitSurface([0, 1, 0, 1, 0.5], [0, 0, 1, 1, 0.5], [1, 2, 3, 4, 100], { weights: [1, 1, 1, 1, 0] });
    expect(Array.from(a.values)).toEqual([1, 2, 3, 4]);
    expect(a.fitted[4]).toBe(2.5);
    expect(a.stats.n).toBe(4);
  });
});

describe('nodes the data cannot see get the documented unique fill', () => {
  it('knots [0,1,2] × [0,1] with rows only on the first two columns: fill = mean of the envelopes', () => {
    // Identified: (0,0)=1, (1,0)=2, (0,1)=3, (1,1)=5. Node (2,0): largest identified value below it 2,
    // none above → the largest identified value 5 → (2 + 5)/2 = 3.5. Node (2,1): below 5, above 5 → 5.
    const m = fitSurface([0, 1, 0, 1], [0, 0, 1, 1], [1, 2, 3, 5], { knots1: [0, 1, 2], knots2: [0, 1] });
    expect(Array.from(m.identified)).toEqual([1, 1, 0, 1, 1, 0]);
    expect(Array.from(m.values)).toEqual([1, 2, 3.5, 3, 5, 5]);
    expect(Array.from(m.fitted)).toEqual([1, 2, 3, 5]);
  });

  it('a 12 × 12 lattice over 6 rows: fitted values stay optimal, the lattice stays monotone', () => {
    const x1 = [0, 3, 7, 10, 2, 8];
    const x2 = [0, 8, 2, 10, 5, 5];
    const y = [1, 4, 3, 9, 2, 6];
    const m = fitSurface(x1, x2, y, { knots1: 12, knots2: 12 });
    expect(m.identified.reduce((s, v) => s + v, 0)).toBeLessThan(30);
    const pairs = orderPairs(12, 12, 'up', 'up');
    for (const [lo, hi] of pairs) expect(m.values[hi]! - m.values[lo]!).toBeGreaterThanOrEqual(0);
    const g = dataGradient(m.knots1, m.knots2, x1, x2, y, null, m.values);
    const sets = Array.from({ length: 144 }, (_, p) => upperSet(144, pairs, [p]));
    const cone = coneConditions(g, m.values, pairs, sets);
    expect(cone.component).toBeLessThanOrEqual(1e-9);
    expect(cone.upper).toBeGreaterThanOrEqual(-1e-9);
    // These rows are monotone in both inputs already, so the fit interpolates them.
    expect(m.fitted).toBeAllCloseRel(y, 1e-9);
  });
});

describe('bad input: codes and messages', () => {
  const x1 = [0, 1, 0, 1];
  const x2 = [0, 0, 1, 1];
  const y = [1, 2, 3, 4];

  it('mismatched lengths name the argument and both lengths', () => {
    expect(() => fitSurface(x1, [0, 0, 1], y)).toThrow('x2: needs one value per entry of x1 (4); got 3.');
    expect(() => fitSurface(x1, x2, [1, 2])).toThrow('y: needs one value per entry of x1 (4); got 2.');
    expect(() => fitSurface(x1, x2, y, { weights: [1, 1] })).toThrow('weights: needs one value per entry of y (4); got 2.');
    expect(() => predictSurface(fitSurface(x1, x2, y), [1, 2], [1])).toThrow('new_x2: needs one value per entry of new_x1 (2); got 1.');
  });

  it('empty, non-finite and bad weights', () => {
    expect(() => fitSurface([], [], [])).toThrow('x1: needs at least one value; got none.');
    expect(() => fitSurface(x1, [0, NaN, 1, 1], y)).toThrow('x2: needs finite numbers; entry 2 is NaN.');
    expect(() => fitSurface(x1, x2, y, { weights: [0, 0, 0, 0] })).toThrow('weights: needs at least one positive weight; all are 0.');
  });

  it('knots: counts below 2 or above 200, unordered positions', () => {
    expect(() => fitSurface(x1, x2, y, { knots1: 1 })).toThrow('knots1: needs a whole number of knots ≥ 2; got 1.');
    expect(() => fitSurface(x1, x2, y, { knots2: 2.5 })).toThrow('knots2: needs a whole number of knots ≥ 2; got 2.5.');
    expect(() => fitSurface(x1, x2, y, { knots1: 201 })).toThrow('knots1: needs at most 200 knots; got 201.');
    expect(() => fitSurface(x1, x2, y, { knots2: [0, 2, 1] })).toThrow('knots2: needs strictly increasing positions; position 3 (1) is not above 2.');
  });

  it('directions and tolerance', () => {
    expect(() => fitSurface(x1, x2, y, { direction1: 'sideways' as never })).toThrow("direction1: needs 'up', 'down', 'auto' or 'none'; got sideways.");
    expect(() => fitSurface(x1, x2, y, { direction2: 0 as never })).toThrow("direction2: needs 'up', 'down', 'auto' or 'none'; got 0.");
    expect(() => fitSurface(x1, x2, y, { tolerance: 0 })).toThrow('tolerance: needs a number in [1e-14, 1e-3]; got 0.');
  });

  it('an axis with a single level cannot place knots or levels', () => {
    expect(() => fitSurface([1, 1, 1], [0, 1, 2], [1, 2, 3])).toThrow('x1: needs at least 2 distinct values with positive weight; got 1.');
    expect(() => fitSurface([0, 1, 2], [5, 5, 5], [1, 2, 3], { knots2: 3 })).toThrow(
      'x2: needs at least 2 distinct values with positive weight to place knots.',
    );
  });

  it('a knot the data touch only through a tiny share (a lever to a value beyond 1e10 × max |y|) is refused', () => {
    // x2 knots −1 and 1e90: rows at x2 = 0 sit a share 1e-90 of the way up, so the upper nodes would
    // need values near 1e189 to fit them (the exact least-squares lattice, but no model).
    const x1 = [0, 0, 0, 0, 0, 0, 0, -1e99, -1];
    const x2 = [0, 0, 0, 0, 0, 0, -1, 1e90, 0];
    const y = [-1e99, 0, 0, 0, 0, 0, -3e99, 0, 0];
    expect(() => fitSurface(x1, x2, y, { knots1: 2, knots2: 2 })).toThrow(
      'knots1: with knots2, needs a lattice the data reach: a lattice value would be 2.86e+189, over 1e10 times the largest |y|, because some knots see the data only through tiny interpolation shares; use fewer knots or knot positions inside the data.',
    );
  });

  it('over 3,600 nodes with more than 400 touched by data is refused (the iterative route would take too long)', () => {
    const a = Array.from({ length: 600 }, (_, i) => i % 70);
    const b = Array.from({ length: 600 }, (_, i) => Math.floor(i / 7) % 70);
    const touched = new Set(a.map((v, i) => `${v},${b[i]}`)).size;
    expect(touched).toBeGreaterThan(400);
    expect(() => fitSurface(a, b, a)).toThrow(
      `knots1: with knots2, needs a lattice of at most 3600 nodes unless the data touch and determine at most 400 of them; got 70×70 = 4900 with ${touched} touched by the data — use fewer knots (or knot counts instead of every level).`,
    );
    // Few touched nodes in a big lattice are fine: the exact route works on them alone.
    const c = Array.from({ length: 300 }, (_, i) => i % 75);
    const d = Array.from({ length: 300 }, (_, i) => Math.floor(i / 4));
    const m = fitSurface(c, d, c);
    expect(m.knots1.length * m.knots2.length).toBeGreaterThan(3600);
    expect(m.solver).toBe('active-set');
  });

  it('a lattice over 40,000 nodes is refused with the size in the message', () => {
    const n = 250;
    const a = Array.from({ length: n }, (_, i) => i);
    const b = Array.from({ length: n }, (_, i) => (i * 7) % n);
    expect(() => fitSurface(a, b, a)).toThrow('knots1: needs a lattice of at most 40000 nodes (K1·K2); got 250×250 = 62500.');
    expect(codeOf(() => fitSurface(a, b, a, { knots1: 200, knots2: 201 }))).toBe('BAD_KNOTS');
  });
});
