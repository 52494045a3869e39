/**
 * The surface sample coating-cure.xlsx evaluated by the runner against values computed outside
 * the project: the classic lattice (RATCHET.GRID with knots 0, 0) by R's Iso::biviso 0.0-18.1
 * (r-cran-iso) on the cell means weighted by replicate counts, the 4 × 3 lattice by the monotone
 * bilinear least-squares QP in cvxopt 1.3.0 (python3-cvxopt), and both surfaces at the new
 * settings (RATCHET.SURFACE) by bilinear interpolation of those lattices, flat beyond the knots,
 * the 4 × 3 lattice with directions 1, 2 (rising in temperature, free in dwell time) by the same
 * QP without the dwell constraints, and the signs of scipy 1.10.1 spearmanr that directions 0, 0
 * follow —
 * fixture test/runner/fixtures/surface_sample.json, written by
 * `/usr/bin/python3 test/runner/reference/gen_surface_sample.py` (see its header).
 * Measured worst relative difference: 2.0e-16 for the classic case, 6.1e-13 for the 4 × 3 lattice
 * (tolerance 1e-10, above the QP solver's stopping rule, far below any change of a result).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { EvaluatedWorkbook } from '../../src/runner/workbook.js';
import './helpers.js';

const ROOT = join(import.meta.dirname, '..', '..');
interface Lattice {
  knots1: number[];
  knots2: number[];
  values: number[][];
  at_new: number[];
}
const ref = JSON.parse(readFileSync(join(import.meta.dirname, 'fixtures', 'surface_sample.json'), 'utf8')) as {
  versions: Record<string, string>;
  classic: Lattice;
  lattice_4x3: Lattice;
  lattice_4x3_free_x2: Lattice;
  spearman: { x1: number; x2: number };
};

const REL = 1e-10;
const ABS = 1e-10;

describe(`coating-cure.xlsx against Iso::biviso ${ref.versions.Iso} and cvxopt ${ref.versions.cvxopt}`, async () => {
  const book = await EvaluatedWorkbook.fromFile(join(ROOT, 'samples', 'coating-cure.xlsx'));
  const numbers = (rows: unknown[][]): number[] => rows.flat().map((v) => (typeof v === 'number' ? v : NaN));

  it.each([
    ['E2', 'Q2', 'classic'],
    ['E11', 'P2', 'lattice_4x3'],
  ] as const)('GRID at %s and SURFACE at %s equal the %s reference', (gridCell, surfaceCell, key) => {
    const r = ref[key];
    const grid = book.result(`Data!${gridCell}`);
    expect(grid[0]![0]).toBe('');
    expect(numbers([grid[0]!.slice(1)])).toBeAllCloseRel(r.knots1, 1e-15);
    expect(numbers(grid.slice(1).map((row) => [row[0]]))).toBeAllCloseRel(r.knots2, 1e-15);
    expect(numbers(grid.slice(1).map((row) => row.slice(1)))).toBeAllCloseRel(r.values.flat(), REL, ABS);
    expect(numbers(book.result(`Data!${surfaceCell}`))).toBeAllCloseRel(r.at_new, REL, ABS);
  });

  const body = (at: string): number[] => numbers(book.result(`Data!${at}`).slice(1).map((row) => row.slice(1)));

  it('GRID at E17 (directions 0, 0) follows the signs of the rank correlations: both rise, so it is the rising 4 × 3 reference', () => {
    expect(ref.spearman.x1).toBeGreaterThan(0);
    expect(ref.spearman.x2).toBeGreaterThan(0);
    expect(body('E17')).toBeAllCloseRel(ref.lattice_4x3.values.flat(), REL, ABS);
  });

  it('GRID at E23 (directions 1, 2) equals the reference rising in temperature and free in dwell time', () => {
    expect(body('E23')).toBeAllCloseRel(ref.lattice_4x3_free_x2.values.flat(), REL, ABS);
    // Unconstrained along dwell, the lattice is not the rising one (the check above can fail).
    expect(Math.max(...ref.lattice_4x3_free_x2.values.flat().map((v, i) => Math.abs(v - ref.lattice_4x3.values.flat()[i]!)))).toBeGreaterThan(0.1);
  });
});
