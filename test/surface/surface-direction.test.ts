/**
 * Direction of a surface along each input. One value means one thing in every function (README,
 * "Surfaces over two inputs"): 1 rising, −1 falling, 0 chosen from the data — the sign of
 * Spearman's rank correlation of that input with y over the rows the fit uses, rising when it is
 * 0 or undefined, the rule of RATCHET.FIT (README, "Direction") — and 2 no constraint.
 *
 * References: rank correlations by scipy 1.10.1 `scipy.stats.spearmanr` (Debian's
 * /usr/bin/python3), printed beside each check; the unconstrained lattices by quadprog 1.5.8
 * (fixture test/reference/fixtures/surface_r.json, see surface.reference.test.ts); the rest are
 * equalities between two routes (the chosen direction against the same direction given
 * explicitly), which fail if the choice picks the other sign. All data are invented.
 */
import { describe, expect, it } from 'vitest';
import { crossValidateSurface, fitSurface, kFoldAssignment, predictSurface, spearman } from '../../src/core/index.js';
import { cell, col } from '../functions/helpers.js';
import type { CellOut } from '../../src/functions/types.js';
import ref from '../reference/fixtures/surface_r.json' with { type: 'json' };

// Invented 4 × 4 grid: y ≈ 2·x1 − 0.1·x2 with a fixed perturbation — rising in x1, falling in x2.
const A1 = [1, 2, 3, 4, 1, 2, 3, 4, 1, 2, 3, 4, 1, 2, 3, 4];
const A2 = [10, 10, 10, 10, 20, 20, 20, 20, 30, 30, 30, 30, 40, 40, 40, 40];
const AY = [1.3, 2.8, 5.1, 7.0, -0.1, 2.25, 3.7, 6.05, -0.8, 0.85, 3.0, 5.1, -2.05, 0.3, 1.8, 4.15];

// Twenty invented extra rows beyond the grid, falling steeply: counted, they turn ρ(x1, y) negative
// (scipy 1.10.1 spearmanr of the 36 rows: −0.8379922006838977).
const EX1 = Array.from({ length: 20 }, (_, i) => 5 + i);
const EX2 = EX1.map((_, i) => (i % 2 === 0 ? 10 : 40));
const EY = EX1.map((_, i) => -10 - i);

function numbers(r: unknown): number[][] {
  return (r as CellOut[][]).map((row) => row.map((v) => (typeof v === 'number' ? v : NaN)));
}

describe("the core: 'auto' is the explicit direction the rank correlation picks", () => {
  it('rising in x1, falling in x2: auto/auto gives exactly the up/down fit, and the model says so', () => {
    // scipy 1.10.1 spearmanr: ρ(x1, y) = 0.9041102347845205, ρ(x2, y) = −0.41261406688152613.
    expect(spearman(A1, AY)).toBeCloseRel(0.9041102347845205, 1e-12);
    expect(spearman(A2, AY)).toBeCloseRel(-0.41261406688152613, 1e-12);
    for (const knots of [0, 3] as const) {
      const auto = fitSurface(A1, A2, AY, { knots1: knots, knots2: knots, direction1: 'auto', direction2: 'auto' });
      const explicit = fitSurface(A1, A2, AY, { knots1: knots, knots2: knots, direction1: 'up', direction2: 'down' });
      expect(auto.direction1).toBe('up');
      expect(auto.direction2).toBe('down');
      expect(Array.from(auto.values)).toEqual(Array.from(explicit.values));
      // The other choice would give another lattice: the equality above can fail.
      const wrong = fitSurface(A1, A2, AY, { knots1: knots, knots2: knots, direction1: 'up', direction2: 'up' });
      expect(Array.from(wrong.values)).not.toEqual(Array.from(explicit.values));
    }
  });

  it('a rank correlation of exactly 0, or an undefined one (constant y), gives rising — the one-input rule', () => {
    // x1 = 1…4 against y = 3, 1, 4, 2: Σd² = 10, ρ = 1 − 6·10/(4·15) = 0 (scipy 1.10.1: 0.0).
    const x1 = [1, 2, 3, 4];
    const x2 = [0, 1, 0, 1];
    const y = [3, 1, 4, 2];
    expect(spearman(x1, y)).toBe(0);
    expect(fitSurface(x1, x2, y, { direction1: 'auto', direction2: 'none' }).direction1).toBe('up');
    const flat = fitSurface(x1, x2, [5, 5, 5, 5], { direction1: 'auto', direction2: 'auto' });
    expect([flat.direction1, flat.direction2]).toEqual(['up', 'up']);
  });

  it('rows of weight 0 do not count in the choice', () => {
    const x1 = [...A1, ...EX1];
    const x2 = [...A2, ...EX2];
    const y = [...AY, ...EY];
    expect(spearman(x1, y)).toBeCloseRel(-0.8379922006838977, 1e-12);
    const w = [...A1.map(() => 1), ...EX1.map(() => 0)];
    const m = fitSurface(x1, x2, y, { knots1: [1, 4], knots2: [10, 40], direction1: 'auto', direction2: 'auto', weights: w });
    expect(m.direction1).toBe('up');
    expect(fitSurface(x1, x2, y, { knots1: [1, 4], knots2: [10, 40], direction1: 'auto', direction2: 'auto' }).direction1).toBe('down');
  });
});

describe('cross-validation chooses the direction on the training rows only', () => {
  // Invented: the first 8 rows rise with x1 (scipy 1.10.1: ρ = 1.0), the last 8 fall (ρ = −0.9761904761904763),
  // all 16 rise (ρ = 0.32864985937197955). Seed 0, 2 folds: fold 1 holds rows 1–8, fold 2 rows 9–16.
  const x1 = [1, 2, 3, 4, 5, 6, 7, 8, 1, 2, 3, 4, 5, 6, 7, 8];
  const x2 = [0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1];
  const y = [1.0, 2.2, 2.9, 4.1, 5.0, 6.2, 6.8, 8.1, 6.0, 5.9, 5.5, 5.6, 5.2, 5.0, 4.9, 4.6];

  /** Fold RMSEs fitted by hand with the given direction along x1 per fold (x2 free). */
  function byHand(dirs: readonly ('up' | 'down')[]): number[] {
    const label = kFoldAssignment(16, 2, 0, 0);
    return [0, 1].map((f) => {
      const tr = [...label.keys()].filter((i) => label[i] !== f);
      const te = [...label.keys()].filter((i) => label[i] === f);
      const m = fitSurface(tr.map((i) => x1[i]!), tr.map((i) => x2[i]!), tr.map((i) => y[i]!), { knots1: 3, knots2: 2, direction1: dirs[f]!, direction2: 'none' });
      const p = predictSurface(m, te.map((i) => x1[i]!), te.map((i) => x2[i]!));
      return Math.sqrt(te.reduce((s, i, j) => s + (y[i]! - p[j]!) ** 2, 0) / te.length);
    });
  }

  it("fold 1 trains on the falling half and fits falling; fold 2 on the rising half and fits rising", () => {
    expect(spearman(x1, y)).toBeCloseRel(0.32864985937197955, 1e-12);
    expect(spearman(x1.slice(8), y.slice(8))).toBeCloseRel(-0.9761904761904763, 1e-12);
    const cv = crossValidateSurface(x1, x2, y, { candidates1: [3], candidates2: [2], folds: 2, seed: 0, direction1: 'auto', direction2: 'none' });
    const training = byHand(['down', 'up']);
    expect(cv.scores[0]!.foldRmse).toBeAllCloseRel(training, 1e-12);
    // With the direction of all rows (leakage) fold 1 would fit rising and score differently.
    const leaked = byHand(['up', 'up']);
    expect(Math.abs(leaked[0]! - training[0]!)).toBeGreaterThan(0.1);
  });
});

describe('the worksheet functions: 0 is chosen from the data, 2 is no constraint', () => {
  const Y = col(...AY);
  const X1 = col(...A1);
  const X2 = col(...A2);

  it('GRID with directions 0, 0 equals GRID with 1, −1 (the signs of the rank correlations); SURFACE too', () => {
    for (const k of [0, 3]) {
      const auto = cell('GRID', Y, X1, X2, k, k, 0, 0);
      expect(auto).toEqual(cell('GRID', Y, X1, X2, k, k, 1, -1));
      expect(auto).not.toEqual(cell('GRID', Y, X1, X2, k, k, 1, 1));
    }
    const nx1 = col(1.5, 2.5, 3.5);
    const nx2 = col(12, 25, 38);
    expect(cell('SURFACE', nx1, nx2, Y, X1, X2, 3, 3, 0, 0)).toEqual(cell('SURFACE', nx1, nx2, Y, X1, X2, 3, 3, 1, -1));
  });

  it('only the rows that enter the fit count: a row left out for a blank x2 cannot flip the choice', () => {
    // Counted, the extra rows would make ρ(x1, y) negative; a blank x2 leaves them out.
    const r = cell('GRID', col(...AY, ...EY), col(...A1, ...EX1), col(...A2, ...EX1.map(() => null)), 3, 3, 0, 0);
    expect(r).toEqual(cell('GRID', Y, X1, X2, 3, 3, 1, -1));
  });

  it('CVGRID with directions 0 is the core cross-validation with auto (chosen fold by fold)', () => {
    const r = cell('CVGRID', Y, X1, X2, col(2, 3), 2, 4, 1, 0, 0, 0) as CellOut[][];
    const core = crossValidateSurface(A1, A2, AY, { candidates1: [2, 3], candidates2: [2], folds: 4, seed: 0, direction1: 'auto', direction2: 'auto' });
    expect(r.slice(1)).toEqual(core.scores.map((s) => [s.knots1, s.knots2, s.cvRmse, s.cvSe, s.cvR2]));
  });

  it('direction 2 gives the unconstrained lattices of the quadprog references (quadprog 1.5.8, R 4.2.2)', () => {
    const code = { up: 1, down: -1, none: 2 } as const;
    const cases = ref.lattice.filter((c) => c.direction1 === 'none' || c.direction2 === 'none');
    expect(cases.length).toBeGreaterThan(0);
    for (const c of cases) {
      const knots = (k: number | number[]) => (typeof k === 'number' ? k : col(...k));
      const dir = (d: string) => code[d as keyof typeof code];
      const w = c.weights ? col(...c.weights) : undefined;
      const grid = numbers(cell('GRID', col(...c.y), col(...c.x1), col(...c.x2), knots(c.knots1), knots(c.knots2), dir(c.direction1), dir(c.direction2), w));
      const body = grid.slice(1).flatMap((row) => row.slice(1));
      const scale = Math.max(...c.values.map(Math.abs));
      expect(body).toBeAllCloseRel(c.values, 1e-8, 1e-8 * scale);
    }
  });
});
