/**
 * The monotone surface against outside references (fixture test/reference/fixtures/surface_r.json,
 * written by `Rscript --vanilla test/reference/gen_surface.R` with R 4.2.2, quadprog 1.5.8 and
 * Iso 0.0-18.1 — versions recorded in the file):
 *  - bilinear lattices: the same QP built in R (its own design matrix) and solved by
 *    quadprog::solve.QP — compared at 1e-8 relative (our roughness tie-break is 1e-12 relative);
 *  - classic grids: Iso::biviso (which stops at its own tolerance sqrt(.Machine$double.eps), so
 *    compared at 1e-6) and quadprog::solve.QP on the same weighted grid problem (1e-8);
 *  - sparse classic grids (many level combinations without data): quadprog on the observed cells
 *    with one constraint per comparable pair — the order in full, independent of our reduction;
 *  - the 3 × 3 example of docs/methods.md ("Surfaces").
 */
import { describe, expect, it } from 'vitest';
import { fitSurface, predictSurface, type AxisDirection } from '../../src/core/index.js';
import ref from '../reference/fixtures/surface_r.json' with { type: 'json' };

describe('bilinear lattice fits against quadprog::solve.QP (quadprog 1.5.8, R 4.2.2)', () => {
  for (const c of ref.lattice) {
    it(c.name, () => {
      const m = fitSurface(c.x1, c.x2, c.y, {
        knots1: c.knots1,
        knots2: c.knots2,
        direction1: c.direction1 as AxisDirection,
        direction2: c.direction2 as AxisDirection,
        weights: c.weights ?? undefined,
      });
      expect(m.method).toBe('lattice');
      expect(m.solver).toBe('active-set');
      expect(Array.from(m.knots1)).toBeAllCloseRel(c.t1, 1e-14);
      expect(Array.from(m.knots2)).toBeAllCloseRel(c.t2, 1e-14);
      const scale = Math.max(...c.values.map(Math.abs));
      expect(m.values).toBeAllCloseRel(c.values, 1e-8, 1e-8 * scale);
      expect(m.fitted).toBeAllCloseRel(c.fitted, 1e-8, 1e-8 * scale);
      expect(m.stats.sse).toBeCloseRel(c.sse, 1e-9);
      // The fixture's QP design is identified everywhere: every node is fitted, none filled.
      expect(Array.from(m.identified).every((v) => v === 1)).toBe(true);
    });
  }
});

describe('classic grids (knots1 = knots2 = 0) against Iso::biviso 0.0-18.1 and quadprog', () => {
  for (const c of ref.classic) {
    it(c.name, () => {
      const m = fitSurface(c.x1, c.x2, c.y, { weights: c.weights ?? undefined });
      expect(m.method).toBe('classic');
      expect(Array.from(m.knots1)).toEqual(c.levels1);
      expect(Array.from(m.knots2)).toEqual(c.levels2);
      expect(m.values).toBeAllCloseRel(c.quadprog, 1e-8);
      expect(m.values).toBeAllCloseRel(c.biviso, 1e-6);
      expect(m.stats.sse).toBeCloseRel(c.sse_quadprog, 1e-9);
    });
  }
});

describe('sparse classic grids against quadprog with every comparable pair constrained (quadprog 1.5.8)', () => {
  for (const c of ref.classic_sparse) {
    it(`${c.name} (${c.cells.length} observed level combinations, ${c.constraints} pair constraints)`, () => {
      const m = fitSurface(c.x1, c.x2, c.y, { weights: c.weights ?? undefined });
      expect(m.method).toBe('classic');
      const observed = c.cells.map((p) => m.values[p]!);
      expect(observed).toBeAllCloseRel(c.values, 1e-9);
      expect(m.fitted).toBeAllCloseRel(c.fitted, 1e-9);
      expect(m.stats.sse).toBeCloseRel(c.sse, 1e-9);
      // Exactly the observed combinations are identified; the rest of the grid is filled.
      expect(m.identified.reduce((s, v) => s + v, 0)).toBe(c.cells.length);
      for (const p of c.cells) expect(m.identified[p]).toBe(1);
    });
  }
});

describe('the 3 × 3 example of docs/methods.md (computed: Iso::biviso 0.0-18.1 in gen_surface.R)', () => {
  // Y = [[1,3,2],[0,2,5],[4,1,6]], unit weights → [[1/2,7/3,7/3],[1/2,7/3,5],[5/2,5/2,6]], SSE 17/3.
  // The fractions are pooled means: 1/2 = mean(1, 0), 7/3 = mean(3, 2, 2), 5/2 = mean(4, 1);
  // SSE = 2·(1/2)² + (2/3)² + 2·(1/3)² + 2·(3/2)² = 17/3 (computed by hand).
  const Y = [
    [1, 3, 2],
    [0, 2, 5],
    [4, 1, 6],
  ];
  const expected = [1 / 2, 7 / 3, 7 / 3, 1 / 2, 7 / 3, 5, 5 / 2, 5 / 2, 6];

  it('with matrix row r at x2 = r and column c at x1 = c, the lattice table (rows = x2) is the matrix fit', () => {
    const x1: number[] = [];
    const x2: number[] = [];
    const y: number[] = [];
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) {
        x1.push(c);
        x2.push(r);
        y.push(Y[r]![c]!);
      }
    }
    const m = fitSurface(x1, x2, y);
    expect(m.values).toBeAllCloseRel(expected, 1e-10);
    expect(m.values).toBeAllCloseRel(ref.example.biviso_rows.flat(), 1e-7);
    expect(m.stats.sse).toBeCloseRel(17 / 3, 1e-10);
    expect(m.levels).toBe(5);
  });

  it('with rows at x1 instead (the transposed orientation) the table is the transpose: both orientations hold', () => {
    const x1: number[] = [];
    const x2: number[] = [];
    const y: number[] = [];
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) {
        x1.push(r);
        x2.push(c);
        y.push(Y[r]![c]!);
      }
    }
    const m = fitSurface(x1, x2, y);
    const transposed = [0, 3, 6, 1, 4, 7, 2, 5, 8].map((k) => expected[k]!);
    expect(m.values).toBeAllCloseRel(transposed, 1e-10);
    expect(m.stats.sse).toBeCloseRel(17 / 3, 1e-10);
  });

  it('with 3 × 3 even knots on the same data the lattice sits on the levels, so the fit is the same', () => {
    const x1 = [0, 1, 2, 0, 1, 2, 0, 1, 2];
    const x2 = [0, 0, 0, 1, 1, 1, 2, 2, 2];
    const m = fitSurface(x1, x2, Y.flat(), { knots1: 3, knots2: 3 });
    expect(m.values).toBeAllCloseRel(expected, 1e-10);
    // Between knots the surface is bilinear: at (0.5, 0.5) the mean of the four corners.
    expect(predictSurface(m, [0.5], [0.5])[0]).toBeCloseRel((1 / 2 + 7 / 3 + 1 / 2 + 7 / 3) / 4, 1e-10);
  });
});
