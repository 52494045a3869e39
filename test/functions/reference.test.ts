/**
 * The worksheet functions against references outside the project, through the same cell layer
 * Excel uses (ranges as columns of cells):
 * - FIT and PREDICT vs scikit-learn 1.2.1 IsotonicRegression(out_of_bounds='clip'), fitted values and
 *   predictions (test/reference/fixtures/core_sklearn.json, written by
 *   `/usr/bin/python3 test/reference/gen_core.py`; data from R's datasets package and seeded cases,
 *   core_inputs.json by `Rscript test/reference/gen_core.R`);
 * - QKNOTS vs numpy 1.24.2 `unique(quantile(x, arange(K)/(K−1), method='linear'))` (same file);
 * - CV vs scikit-learn / SciPy 1.10.1 fold by fold (test/reference/fixtures/cv_datasets.json, written
 *   by `/usr/bin/python3 test/reference/gen_cv.py`).
 * Tolerance 1e-9 relative (absolute 1e-9 near zero).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { functionByName } from '../../src/functions/registry.js';
import type { CellArg } from '../../src/functions/types.js';

const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../reference/fixtures/${name}`, import.meta.url), 'utf8'));
const inputs = fixture('core_inputs.json') as { datasets: Case[]; random: Case[] };
const sklearn = fixture('core_sklearn.json') as {
  classic: { case: string; increasing: boolean | 'auto'; command: string; fitted: number[]; predict_x: number[]; predict_y: number[] }[];
  quantile_knots: { case: string; K: number; knots: number[] }[];
};
const cv = fixture('cv_datasets.json') as {
  cases: { name: string; x: number[]; y: number[]; w: number[] | null; seed: number; direction: string; candidates: number[]; scores: Score[]; method: string; folds: number; repeats: number }[];
};
interface Case {
  name: string;
  x: number[];
  y: number[];
  w?: number[];
}
interface Score {
  knots: number;
  cvRmse: number;
  cvSe: number;
  cvR2: number;
  cvMae: number;
  trainRmse: number;
}
const byName = new Map([...inputs.datasets, ...inputs.random].map((c) => [c.name, c]));
const column = (v: readonly number[]): CellArg => v.map((n) => [n]);
const flat = (r: unknown) => (r as number[][]).map((row) => row[0]!);
const DIR: Record<string, number> = { true: 1, false: -1, auto: 0, up: 1, down: -1 };

describe('FIT and PREDICT vs scikit-learn IsotonicRegression', () => {
  const cases = sklearn.classic.filter((c) => c.command.includes('y_min=None, y_max=None'));
  it('covers the R datasets and the seeded cases in all three directions', () => {
    expect(cases.length).toBeGreaterThanOrEqual(30);
  });
  for (const c of cases) {
    it(`${c.case}, increasing=${String(c.increasing)}`, () => {
      const data = byName.get(c.case)!;
      const args = [column(data.y), column(data.x), undefined, DIR[String(c.increasing)], data.w ? column(data.w) : undefined];
      expect(flat(functionByName('FIT')!.invoke(args))).toBeAllCloseRel(c.fitted, 1e-9, 1e-9);
      expect(flat(functionByName('PREDICT')!.invoke([column(c.predict_x), ...args]))).toBeAllCloseRel(c.predict_y, 1e-9, 1e-9);
    });
  }
});

describe('QKNOTS vs numpy quantiles (type 7, duplicates merged)', () => {
  for (const q of sklearn.quantile_knots) {
    it(`${q.case}, K = ${q.K}`, () => {
      const data = byName.get(q.case)!;
      expect(flat(functionByName('QKNOTS')!.invoke([column(data.x), q.K]))).toBeAllCloseRel(q.knots, 1e-12);
    });
  }
});

describe('CV vs scikit-learn / SciPy fold by fold', () => {
  for (const c of cv.cases.filter((k) => k.method === 'k-fold')) {
    it(c.name, () => {
      const table = functionByName('CV')!.invoke([
        column(c.y),
        column(c.x),
        column(c.candidates),
        c.folds,
        c.repeats,
        c.seed,
        DIR[c.direction],
        c.w ? column(c.w) : undefined,
      ]) as (string | number)[][];
      expect(table[0]).toEqual(['knots', 'cv_rmse', 'cv_se', 'cv_r2', 'cv_mae', 'train_rmse']);
      const rows = table.slice(1) as number[][];
      expect(rows.map((r) => r[0])).toEqual(c.scores.map((s) => s.knots));
      for (const [j, key] of (['cvRmse', 'cvSe', 'cvR2', 'cvMae', 'trainRmse'] as const).entries()) {
        expect(rows.map((r) => r[j + 1]!)).toBeAllCloseRel(c.scores.map((s) => s[key]), 1e-9, 1e-9);
      }
    });
  }
});
