/**
 * The classic (isotonic) fit against outside references, on open datasets from R's datasets package
 * (cars, pressure, BOD, women, Puromycin, mtcars — exported by test/reference/gen_core.R into
 * core_inputs.json) and on seeded random cases with ties and zero weights:
 *  - scikit-learn 1.2.1 `IsotonicRegression` (fixture core_sklearn.json, written by
 *    `/usr/bin/python3 test/reference/gen_core.py`; each entry records its exact call),
 *  - R 4.2.2 `stats::isoreg` and `Iso::pava` (Iso 0.0-18.1) (fixture core_r.json, written by
 *    `Rscript test/reference/gen_core.R`).
 * Tolerance: 1e-9 relative (absolute 1e-9 near zero), as docs/tolerances.md explains for classic fits.
 */
import { describe, expect, it } from 'vitest';
import { fitMonotone, predict, type DirectionOption } from '../../src/core/index.js';
import { isotonicRegression } from '../../src/core/isotonic.js';
import { inputCase, rRefs, skRefs } from './fixtures.js';

const REL = 1e-9;

function direction(increasing: boolean | 'auto'): DirectionOption {
  return increasing === 'auto' ? 'auto' : increasing ? 'up' : 'down';
}

describe('classic fit = scikit-learn IsotonicRegression (scikit-learn 1.2.1, core_sklearn.json)', () => {
  for (const ref of skRefs.classic) {
    const bounds = `${ref.y_min !== undefined ? ` y_min=${ref.y_min}` : ''}${ref.y_max !== undefined ? ` y_max=${ref.y_max}` : ''}`;
    const label = `${ref.case}, increasing=${String(ref.increasing)}${bounds}`;
    const c = inputCase(ref.case);
    const options = { weights: c.w, direction: direction(ref.increasing), lower: ref.y_min, upper: ref.y_max };

    it(`${label}: fitted value of every row equals sklearn's predict(x)`, () => {
      expect(isotonicRegression(c.x, c.y, options).fitted).toBeAllCloseRel(ref.fitted, REL);
    });

    it(`${label}: prediction at new x (inside, at and beyond the ends) equals predict with out_of_bounds='clip'`, () => {
      const model = fitMonotone(c.x, c.y, options);
      expect(predict(model, ref.predict_x)).toBeAllCloseRel(ref.predict_y, REL);
      // sklearn's own thresholds lie on the same curve.
      expect(predict(model, ref.X_thresholds)).toBeAllCloseRel(ref.y_thresholds, REL);
    });

    if (ref.increasing === 'auto') {
      it(`${label}: 'auto' picks the direction sklearn picks from Spearman's rho`, () => {
        expect(isotonicRegression(c.x, c.y, options).direction).toBe(ref.increasing_used ? 'up' : 'down');
      });
    }
  }
});

describe('classic fit = R stats::isoreg and Iso::pava (R 4.2.2, Iso 0.0-18.1, core_r.json)', () => {
  for (const ref of rRefs.classic) {
    const c = inputCase(ref.case);
    if (ref.isoreg_up_fitted !== undefined) {
      const expected = ref.isoreg_up_fitted;
      it(`${ref.case}: fitted values equal isoreg(x, y)$yf mapped back to the rows`, () => {
        expect(isotonicRegression(c.x, c.y).fitted).toBeAllCloseRel(expected, REL);
      });
    }
    for (const dir of ['up', 'down'] as const) {
      const expected = dir === 'up' ? ref.pava_up : ref.pava_down;
      it(`${ref.case}: ${dir}-fit at the distinct x with positive weight equals Iso::pava(pooled y, summed w${dir === 'down' ? ', decreasing = TRUE' : ''})`, () => {
        const fit = isotonicRegression(c.x, c.y, { weights: c.w, direction: dir });
        const at = new Map<number, number>();
        fit.x.forEach((xv, j) => at.set(xv, fit.value[j]!));
        expect(fit.weight.filter((w) => w > 0).length).toBe(ref.pooled_x.length);
        expect(ref.pooled_x.map((xv) => at.get(xv) ?? NaN)).toBeAllCloseRel(expected, REL);
      });
    }
  }
});

describe("direction 'auto' and rows of weight 0 (a deliberate difference from scikit-learn)", () => {
  it("Spearman's rho is taken over rows with positive weight only: rows 4 and 5 fall, so 'auto' is down", () => {
    // scikit-learn 1.2.1 counts the weight-0 rows too: IsotonicRegression(increasing='auto')
    // .fit([1, 2, 3, 4, 5], [1, 2, 3, 4, 0], sample_weight=[0, 0, 0, 1, 1]).increasing_ → True
    // (run by hand with /usr/bin/python3). In Ratchet a weight-0 row influences nothing.
    const fit = isotonicRegression([1, 2, 3, 4, 5], [1, 2, 3, 4, 0], { weights: [0, 0, 0, 1, 1], direction: 'auto' });
    expect(fit.direction).toBe('down');
  });
});
