/**
 * Cross-validation scores against an outside reference computed fold by fold (fixture
 * test/reference/fixtures/cv_datasets.json, written by `/usr/bin/python3 test/reference/gen_cv.py`
 * with scikit-learn 1.2.1, SciPy 1.10.1, NumPy 1.24.2 and R 4.2.2 — versions recorded in the file):
 *  - data: R's datasets package — `cars` (speed → dist), `pressure` (temperature → pressure),
 *    `airquality` (Temp → Ozone, complete cases), exported by Rscript inside the generator;
 *  - folds: seed 0 from `sklearn.model_selection.KFold(n_splits=F, shuffle=False)` and
 *    `train_test_split(shuffle=False)`; seeded cases from the generator's own Python SplitMix64 and
 *    Fisher–Yates (an implementation independent of src/core/prng.ts);
 *  - candidate 0: `sklearn.isotonic.IsotonicRegression(out_of_bounds="clip")` on each training set;
 *  - K ≥ 2: the knot model solved by `scipy.optimize.lsq_linear(method="bvls")` on the
 *    cumulative-step form, K knots evenly spaced over each training x range (numpy.linspace),
 *    predictions by numpy.interp (flat beyond the ends); hold-out R² by sklearn.metrics.r2_score;
 *  - direction 'auto' (mtcars qsec → drat, ρ = 0.09): sklearn's `increasing='auto'` and the sign
 *    of `scipy.stats.spearmanr` on each training set — the fixture records that the direction
 *    differs from fold to fold.
 * Tolerance: 1e-9 relative (absolute 1e-9 near zero), as docs/tolerances.md explains for cross-validation scores.
 */
import { describe, expect, it } from 'vitest';
import { crossValidate, type CrossValidationResult, type DirectionOption } from '../../src/core/index.js';
import { holdoutValidate } from '../../src/core/cross-validate.js';
import fixture from '../reference/fixtures/cv_datasets.json' with { type: 'json' };

const REL = 1e-9;

interface RefScore {
  knots: number;
  cvRmse: number;
  cvSe: number;
  cvR2: number;
  cvMae: number;
  trainRmse: number;
  foldRmse: number[];
  foldDirections: ('up' | 'down')[];
}
interface RefCase {
  name: string;
  method: 'k-fold' | 'holdout';
  x: number[];
  y: number[];
  w: number[] | null;
  seed: number;
  direction: DirectionOption;
  folds?: number;
  repeats?: number;
  testFraction?: number;
  testRows?: number;
  candidates: number[];
  skipped: number[];
  scores: RefScore[];
}

const cases = (fixture as unknown as { cases: RefCase[] }).cases;

function runCase(c: RefCase): CrossValidationResult {
  const common = { candidates: c.candidates, seed: c.seed, direction: c.direction, ...(c.w ? { weights: c.w } : {}) };
  return c.method === 'k-fold'
    ? crossValidate(c.x, c.y, { ...common, folds: c.folds!, repeats: c.repeats! })
    : holdoutValidate(c.x, c.y, { ...common, testFraction: c.testFraction! });
}

describe('cross-validation = scikit-learn / SciPy fold by fold (cv_datasets.json)', () => {
  it('on a K-fold case with seed 0, one with zero weights, seeded repeats, a hold-out, a falling fit and an auto fit whose folds disagree on the direction, our cv_rmse equals the reference', () => {
    const auto = cases.find((c) => c.direction === 'auto' && c.scores.every((s) => new Set(s.foldDirections).size === 2));
    const picks = [
      cases.find((c) => c.method === 'k-fold' && c.seed === 0),
      cases.find((c) => c.w?.includes(0)),
      cases.find((c) => (c.repeats ?? 1) > 1 && c.seed !== 0),
      cases.find((c) => c.method === 'holdout'),
      cases.find((c) => c.direction === 'down'),
      auto,
    ];
    for (const c of picks) {
      expect(c, 'the fixture lacks one of the kinds of case').toBeDefined();
      expect(runCase(c!).scores.map((s) => s.cvRmse)).toBeAllCloseRel(c!.scores.map((s) => s.cvRmse), REL);
    }
  });

  for (const c of cases) {
    const label = `${c.name} (${c.method}, seed ${c.seed}, candidates ${c.candidates.join(',')})`;
    it(`${label}: cvRmse, cvSe, cvR2, cvMae, trainRmse and every fold's RMSE match`, () => {
      const r = runCase(c);
      expect(r.method).toBe(c.method);
      expect(r.n).toBe(c.w ? c.w.filter((v) => v > 0).length : c.x.length);
      if (c.method === 'holdout') expect(r.testRows).toBe(c.testRows);
      expect(r.scores.map((s) => s.knots)).toEqual(c.candidates);
      r.scores.forEach((s, i) => {
        const e = c.scores[i]!;
        expect(s.cvRmse, `K=${s.knots} cvRmse`).toBeCloseRel(e.cvRmse, REL);
        expect(s.cvSe, `K=${s.knots} cvSe`).toBeCloseRel(e.cvSe, REL);
        expect(s.cvR2, `K=${s.knots} cvR2`).toBeCloseRel(e.cvR2, REL);
        expect(s.cvMae, `K=${s.knots} cvMae`).toBeCloseRel(e.cvMae, REL);
        expect(s.trainRmse, `K=${s.knots} trainRmse`).toBeCloseRel(e.trainRmse, REL);
        expect(s.foldRmse, `K=${s.knots} foldRmse`).toBeAllCloseRel(e.foldRmse, REL);
      });
    });
  }
});
