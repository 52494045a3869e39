/**
 * RATCHET.SURFACE, RATCHET.GRID and RATCHET.CVGRID as a host calls them (through the registry,
 * errors through the one mapping). Literal results are the 3 × 3 example of docs/methods.md (computed with
 * Iso::biviso 0.0-18.1, see surface.reference.test.ts) and hand-computed bilinear values.
 */
import { describe, expect, it } from 'vitest';
import { cell, col, err } from '../functions/helpers.js';
import { crossValidateSurface, spearman } from '../../src/core/index.js';
import { functionByName } from '../../src/functions/registry.js';
import type { CellOut } from '../../src/functions/types.js';
import fc from 'fast-check';

// The 3 × 3 example: x1 = column 0…2, x2 = row 0…2 of Y = [[1,3,2],[0,2,5],[4,1,6]].
const X1 = col(0, 1, 2, 0, 1, 2, 0, 1, 2);
const X2 = col(0, 0, 0, 1, 1, 1, 2, 2, 2);
const Y = col(1, 3, 2, 0, 2, 5, 4, 1, 6);

function numbers(r: unknown): number[][] {
  return (r as CellOut[][]).map((row) => row.map((v) => (typeof v === 'number' ? v : NaN)));
}

describe('RATCHET.GRID', () => {
  it('the 3 × 3 example: x1 knots across, x2 knots down, the fitted lattice inside', () => {
    const r = cell('GRID', Y, X1, X2) as CellOut[][];
    expect(r[0]).toEqual(['', 0, 1, 2]);
    expect(r.map((row) => row[0])).toEqual(['', 0, 1, 2]);
    const body = numbers(r.slice(1).map((row) => row.slice(1)));
    const expected = [
      [1 / 2, 7 / 3, 7 / 3],
      [1 / 2, 7 / 3, 5],
      [5 / 2, 5 / 2, 6],
    ];
    for (let i = 0; i < 3; i++) expect(body[i]).toBeAllCloseRel(expected[i]!, 1e-12);
  });

  it('direction 2 leaves an input unconstrained; -1 makes it fall', () => {
    // Along x2 unconstrained, x1 rising: each row of Y separately (1,3,2 → 1,2.5,2.5; 0,2,5; 4,1,6 → 2.5,2.5,6).
    const r = numbers(cell('GRID', Y, X1, X2, 0, 0, 1, 2)).slice(1).map((row) => row.slice(1));
    expect(r[0]).toBeAllCloseRel([1, 2.5, 2.5], 1e-12);
    expect(r[1]).toBeAllCloseRel([0, 2, 5], 1e-12);
    expect(r[2]).toBeAllCloseRel([2.5, 2.5, 6], 1e-12);
    const down = numbers(cell('GRID', Y, X1, X2, 0, 0, -1, 2)).slice(1).map((row) => row.slice(1));
    expect(down[1]).toBeAllCloseRel([7 / 3, 7 / 3, 7 / 3], 1e-12);
  });

  it('knot counts place evenly spaced knots over the data range', () => {
    const r = cell('GRID', Y, X1, X2, 2, 3) as CellOut[][];
    expect(r[0]).toEqual(['', 0, 2]);
    expect(r.map((row) => row[0])).toEqual(['', 0, 1, 2]);
    expect(r.length).toBe(4);
    expect(r[1]!.length).toBe(3);
  });
});

describe('RATCHET.SURFACE', () => {
  it('reads the surface at new pairs: bilinear inside, flat outside, blanks stay blank, shape of new_x1s', () => {
    const r = cell('SURFACE', [[0.5, 5, null]], [[0.5, -3, 1]], Y, X1, X2) as CellOut[][];
    // (0.5, 0.5): mean of the corners 1/2, 7/3, 1/2, 7/3 = 17/12; (5, −3) clamps to (2, 0) → 7/3.
    expect(r.length).toBe(1);
    expect(r[0]![0]).toBeCloseRel(17 / 12, 1e-12);
    expect(r[0]![1]).toBeCloseRel(7 / 3, 1e-12);
    expect(r[0]![2]).toBe('');
  });

  it('a scalar pair gives a 1 × 1 result; rows with a blank input are left out of the fit', () => {
    const r = cell('SURFACE', 2, 2, col(1, 3, 2, 0, 2, 5, 4, 1, 6, 100), col(0, 1, 2, 0, 1, 2, 0, 1, 2, null), col(0, 0, 0, 1, 1, 1, 2, 2, 2, 5)) as CellOut[][];
    expect(r[0]![0]).toBeCloseRel(6, 1e-12);
  });

  it('weights: a row with weight 0 has no influence', () => {
    const w = col(1, 1, 1, 1, 1, 1, 1, 1, 0);
    const r = cell('SURFACE', 2, 2, Y, X1, X2, 0, 0, 1, 1, w) as CellOut[][];
    // Without the top-right row (6), node (2,2) is unseen; the fill takes the identified value below it, 5.
    expect(r[0]![0]).toBeCloseRel(5, 1e-12);
  });
});

describe('RATCHET.CVGRID', () => {
  it('a header row, then knots1, knots2, cv_rmse, cv_se, cv_r2 per pair: the core result', () => {
    const n = 40;
    const x1 = Array.from({ length: n }, (_, i) => (i * 7) % 10);
    const x2 = Array.from({ length: n }, (_, i) => (i * 3) % 8);
    const y = x1.map((a, i) => a + 0.5 * x2[i]! + ((i * 13) % 5) / 5);
    const r = cell('CVGRID', col(...y), col(...x1), col(...x2), col(2, 3), 2, 4, 1, 0) as CellOut[][];
    expect(r[0]).toEqual(['knots1', 'knots2', 'cv_rmse', 'cv_se', 'cv_r2']);
    const core = crossValidateSurface(x1, x2, y, { candidates1: [2, 3], candidates2: [2], folds: 4, seed: 0 });
    expect(r.slice(1)).toEqual(core.scores.map((s) => [s.knots1, s.knots2, s.cvRmse, s.cvSe, s.cvR2]));
    expect(functionByName('CVGRID')!.longWork).toBe(true);
  });
});

describe('errors map to cell errors with the argument named', () => {
  it('mismatched lengths', () => {
    expect(cell('GRID', Y, col(0, 1), X2)).toEqual(err('#VALUE!', 'known_x1s: needs one cell per cell of known_ys (9); got 2.'));
    expect(cell('SURFACE', col(1, 2), col(1), Y, X1, X2)).toEqual(err('#VALUE!', 'new_x2s: needs one cell per cell of new_x1s (2); got 1.'));
  });

  it('bad knots and directions', () => {
    expect(cell('GRID', Y, X1, X2, 1)).toEqual(err('#VALUE!', 'knots1: needs 0 (classic fit), a whole number of knots ≥ 2, or a range of knot positions; got 1.'));
    expect(cell('GRID', Y, X1, X2, 0, 300)).toEqual(err('#VALUE!', 'knots2: needs at most 200 knots; got 300.'));
    expect(cell('GRID', Y, X1, X2, 0, 0, 3)).toEqual(err('#VALUE!', 'direction1: needs 1 (rising), -1 (falling), 0 (pick from the data) or 2 (no constraint); got 3.'));
    expect(cell('SURFACE', 1, 1, Y, X1, X2, 0, 0, 1, 0.5)).toEqual(err('#VALUE!', 'direction2: needs 1 (rising), -1 (falling), 0 (pick from the data) or 2 (no constraint); got 0.5.'));
    expect(cell('CVGRID', Y, X1, X2, 2, 2, 3, 1, 0, -2)).toEqual(err('#VALUE!', 'direction1: needs 1 (rising), -1 (falling), 0 (pick from the data) or 2 (no constraint); got -2.'));
  });

  it('too few rows, a single level, text and error cells', () => {
    expect(cell('GRID', col(1, null), col(1, 2), col(1, 2))).toEqual(
      err('#VALUE!', 'known_ys: needs at least 2 rows where known_ys, known_x1s and known_x2s all hold numbers; got 1.'),
    );
    expect(cell('GRID', col(1, 2, 3), col(1, 1, 1), col(1, 2, 3))).toEqual(err('#VALUE!', 'known_x1s: needs at least 2 distinct values with positive weight; got 1.'));
    const e = cell('GRID', col(1, 2, 3), col(1, { kind: 'error', code: '#DIV/0!' }, 3), col(1, 2, 3)) as { error: { code: string } };
    expect(e.error.code).toBe('#DIV/0!');
    const t = cell('GRID', col(1, 'abc', 3), col(1, 2, 3), col(1, 2, 3)) as { error: { code: string } };
    expect(t.error.code).toBe('#VALUE!');
  });

  it('regression (found by the fuzz below): knot positions far outside the data and x2 levels spanning 1e-280 … 1e90', () => {
    const zeros = col(0, 0, 0, 0, 0, 0, 0, 0, 0);
    const r = cell('SURFACE', zeros, zeros, zeros, col(0, 0, 0, 0, -1e99, 0, 0, 0, 0), col(0, 0, 0, 0, 1, 0, -1e-280, -1e90, 0), col(-1e6, 1e99), undefined, 0);
    expect(r).toEqual(Array.from({ length: 9 }, () => [0]));
  });

  it('3,000 random argument grids (huge/tiny magnitudes, NaN, text, logicals, error cells) give a value or #VALUE!/#N/A/a propagated #DIV/0! — never #NUM!', () => {
    const scale = fc.constantFrom(1, 1e-3, 1e6, 1e-280, 1e90, 1e99);
    const wild = fc.constantFrom<number | string | null | boolean | { kind: 'error'; code: string }>(
      null, '', 'x', ' 3 ', true, NaN, Infinity, -0, 5e-324, 1e300, { kind: 'error', code: '#DIV/0!' }, { kind: 'error', code: '#REF!' },
    );
    const cellArb = scale.chain((m) =>
      fc.oneof(
        { weight: 12, arbitrary: fc.integer({ min: -5, max: 5 }).map((k) => k * m) as fc.Arbitrary<number | string | null | boolean | { kind: 'error'; code: string }> },
        { weight: 1, arbitrary: wild },
      ),
    );
    const columns = fc.integer({ min: 0, max: 12 }).chain((n) => fc.array(fc.array(cellArb, { minLength: n, maxLength: n }).map((v) => v.map((c) => [c])), { minLength: 5, maxLength: 5 }));
    const option = fc.oneof(fc.constant(undefined), fc.integer({ min: -2, max: 5 }), fc.array(cellArb, { minLength: 0, maxLength: 4 }).map((v) => v.map((c) => [c])));
    const seen = { values: 0, errors: 0 };
    fc.assert(
      fc.property(fc.constantFrom('SURFACE', 'GRID', 'CVGRID'), columns, option, option, option, option, (name, [a, b, c, d, e], o1, o2, o3, o4) => {
        // o3, o4 land on direction1, direction2 (every code -2 … 5: 1, -1, 0 and 2 valid); CVGRID keeps its fold defaults.
        const args = name === 'SURFACE' ? [a, b, c, d, e, o1, o2, o3, o4] : name === 'GRID' ? [c, d, e, o1, o2, o3, o4] : [c, d, e, o1, o2, undefined, undefined, undefined, o3, o4];
        const r = cell(name, ...(args as never[]));
        if (typeof r === 'object' && r !== null && 'error' in r) {
          expect(['#VALUE!', '#N/A', '#DIV/0!']).toContain(r.error.code);
          expect(r.error.message.length).toBeGreaterThan(0);
          seen.errors++;
        } else {
          for (const row of r as CellOut[][]) for (const v of row) if (typeof v === 'number') expect(Number.isFinite(v)).toBe(true);
          seen.values++;
        }
      }),
      { numRuns: 3000 },
    );
    expect(seen.values).toBeGreaterThan(30);
    expect(seen.errors).toBeGreaterThan(20);
  });
});

describe('the surface examples of the README (invented oven data; values as printed there, 6 significant digits)', () => {
  const temp = col(160, 160, 160, 180, 180, 180, 200, 200, 200, 170, 190, 190);
  const time = col(10, 20, 30, 10, 20, 30, 10, 20, 30, 25, 15, 25);
  const hard = col(41, 47, 45, 44, 46, 52, 50, 48, 58, 46, 49, 53);
  const flat = (r: unknown) => numbers(r).flat().filter((v) => v === v);

  it('SURFACE with 2 × 2 knots and with every level', () => {
    expect(flat(cell('SURFACE', col(175, 200, 150), col(12, 40, 20), hard, temp, time, 2, 2))).toBeAllCloseRel([44.5632, 56.4064, 43.8641], 5e-6);
    expect(flat(cell('SURFACE', col(175, 200, 150), col(12, 40, 20), hard, temp, time))).toBeAllCloseRel([43.65, 58, 46], 1e-12);
  });

  it('SURFACE with directions chosen from the data (0, 0) and left free along dwell time (1, 2)', () => {
    // Rank correlations as printed, scipy 1.10.1 spearmanr: 0.7134266410328863 (temperature), 0.43558460746480243 (dwell).
    const values = (c: typeof temp) => (c as number[][]).map((r) => r[0]!);
    expect(spearman(values(temp), values(hard))).toBeCloseRel(0.713, 5e-4);
    expect(spearman(values(time), values(hard))).toBeCloseRel(0.436, 5e-4);
    expect(flat(cell('SURFACE', col(175, 200, 150), col(12, 40, 20), hard, temp, time, 0, 0, 0, 0))).toBeAllCloseRel([43.65, 58, 46], 1e-12);
    expect(flat(cell('SURFACE', col(175, 200, 150), col(12, 40, 20), hard, temp, time, 0, 0, 1, 2))).toBeAllCloseRel([43.95, 58, 46.5], 1e-12);
  });

  it('GRID with 2 × 2 knots and with every level', () => {
    expect(flat(cell('GRID', hard, temp, time, 2, 2))).toBeAllCloseRel([160, 200, 10, 41.7109, 47.7316, 30, 46.0174, 56.4064], 5e-6);
    expect(flat(cell('GRID', hard, temp, time))).toBeAllCloseRel(
      [160, 170, 180, 190, 200, 10, 41, 42.5, 44, 46.5, 49, 15, 43.5, 43.5, 45, 49, 49, 20, 46, 46, 46, 49, 49, 25, 46, 46, 49, 53, 55.5, 30, 46, 49, 52, 55.5, 58],
      1e-12,
    );
  });

  it('CVGRID with candidates {2;3} × {2;3}, 4 folds, seed 0', () => {
    const r = cell('CVGRID', hard, temp, time, col(2, 3), col(2, 3), 4, 1, 0) as CellOut[][];
    expect(flat(r.slice(1))).toBeAllCloseRel(
      [2, 2, 2.30976, 0.483665, 0.719519, 2, 3, 1.93166, 0.290178, 0.80383, 3, 2, 3.03711, 0.628447, 0.515056, 3, 3, 3.5715, 1.11215, 0.329387],
      5e-6,
    );
  });
});
