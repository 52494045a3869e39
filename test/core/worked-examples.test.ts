/**
 * Worked examples with exact numbers, each with its source. Where a fixture holds the same example
 * computed by a library, the test checks both the literal numbers and the library's output.
 */
import { describe, expect, it } from 'vitest';
import { fitMonotone, knotRegression, predict } from '../../src/core/index.js';
import { isotonicRegression } from '../../src/core/isotonic.js';
import { pavaSorted } from '../../src/core/pava.js';
import { rRefs, skRefs } from './fixtures.js';

describe('pituitary-fissure sizes (Potthoff & Roy 1964, Biometrika 51:313–326; Robertson, Wright & Dykstra 1988, Order Restricted Statistical Inference)', () => {
  // The 11 measurements (mm) of girls at ages 8, 10, 12, 14 as laid out in the isotonic-regression
  // example (memory): age 8: 21, 23.5, 23; age 10: 24, 21, 25; age 12: 21.5, 22, 19; age 14: 23.5, 25.
  // Each value occurs among the girls of R's nlme::Orthodont (the same Potthoff & Roy study) at the
  // same age, and the published pooled fit below follows from them exactly; scikit-learn agrees
  // (core_sklearn.json, docs.pituitary, `IsotonicRegression().fit(age, size).predict(age)`).
  const age = [8, 8, 8, 10, 10, 10, 12, 12, 12, 14, 14];
  const size = [21, 23.5, 23, 24, 21, 25, 21.5, 22, 19, 23.5, 25];

  it('the classic fit pools the first nine points (ages 8–12) to 200/9 = 22.2222… and the last two (age 14) to 24.25 (published)', () => {
    const fit = isotonicRegression(age, size);
    expect(fit.fitted).toBeAllCloseRel([...Array(9).fill(200 / 9), 24.25, 24.25], 1e-12);
    expect(fit.levels).toBe(2);
  });

  it('tied ages are pooled first (age means 22.5, 23.33…, 20.83…, 24.25), then the first three means pool', () => {
    const fit = isotonicRegression(age, size);
    expect(Array.from(fit.x)).toEqual([8, 10, 12, 14]);
    expect(Array.from(fit.weight)).toEqual([3, 3, 3, 2]);
    expect(fit.value).toBeAllCloseRel([200 / 9, 200 / 9, 200 / 9, 24.25], 1e-12);
  });

  it('agrees with scikit-learn 1.2.1 on the same data (core_sklearn.json)', () => {
    expect(skRefs.docs.pituitary.y).toEqual(size);
    expect(isotonicRegression(age, size).fitted).toBeAllCloseRel(skRefs.docs.pituitary.fitted, 1e-12);
  });
});

describe("the example of R's ?isoreg help page (R 4.2.2; values from running it, core_r.json isoreg_help_example)", () => {
  const [ex1, ex3, ex4] = rRefs.isoreg_help_example;

  it('isoreg(c(1,0,4,3,3,5,4,2,0)): yf = 0.5, 0.5, then 3 seven times', () => {
    const y = [1, 0, 4, 3, 3, 5, 4, 2, 0];
    const x = y.map((_, i) => i + 1);
    expect(ex1!.y).toEqual(y);
    const fit = isotonicRegression(x, y);
    expect(Array.from(fit.fitted)).toEqual([0.5, 0.5, 3, 3, 3, 3, 3, 3, 3]);
    expect(fit.fitted).toBeAllCloseRel(ex1!.yf, 1e-12);
    // Block ends (1-based) are R's iKnots.
    const { starts } = pavaSorted(y, Array(9).fill(1));
    const ends = Array.from(starts).slice(1).concat([y.length]);
    expect(ends).toEqual(ex1!.iKnots);
  });

  it('isoreg(c(1,0,4,3,3,5,4,2,3)) (last "3", not "0"): yf = 0.5, 0.5, 10/3 three times, 3.5 four times', () => {
    const y = [1, 0, 4, 3, 3, 5, 4, 2, 3];
    const fit = isotonicRegression(y.map((_, i) => i + 1), y);
    expect(fit.fitted).toBeAllCloseRel([0.5, 0.5, 10 / 3, 10 / 3, 10 / 3, 3.5, 3.5, 3.5, 3.5], 1e-12);
    expect(fit.fitted).toBeAllCloseRel(ex3!.yf, 1e-12);
    expect(ex3!.iKnots).toEqual([2, 5, 9]);
    expect(fit.levels).toBe(3);
  });

  it('isoreg(1:10, c(5, 9, 1:2, 5:8, 3, 8)): yf = 4.25 ×4, 5, 6 ×4, 8, and R² = 1 − SSE/((n−1)var(y)) = 0.2056 (printed "R^2 = 0.21")', () => {
    const x = ex4!.x!;
    const y = [5, 9, 1, 2, 5, 6, 7, 8, 3, 8];
    expect(ex4!.y).toEqual(y);
    const model = fitMonotone(x, y);
    expect(model.fitted).toBeAllCloseRel([4.25, 4.25, 4.25, 4.25, 5, 6, 6, 6, 6, 8], 1e-12);
    expect(model.fitted).toBeAllCloseRel(ex4!.yf, 1e-12);
    expect(model.stats.r2).toBeCloseRel(ex4!.r_squared!, 1e-12);
    expect(model.stats.r2.toFixed(2)).toBe('0.21');
    // R keeps the level-6 point at x = 6 as its own knot (equal means are not merged), Ratchet pools
    // equal levels: each of Ratchet's level ends is one of R's iKnots, and there are 4 levels.
    expect(model.levels).toBe(4);
    for (const end of [4, 5, 9, 10]) expect(ex4!.iKnots).toContain(end);
  });
});

describe('scikit-learn documentation examples', () => {
  it('IsotonicRegression().fit(X, y).predict([.1, .2]) on make_regression(n_samples=10, n_features=1, random_state=41) → [1.8628…, 3.7256…] (docstring of scikit-learn 1.2.1; X, y regenerated in core_sklearn.json)', () => {
    const ex = skRefs.docs.sklearn_IsotonicRegression;
    const model = fitMonotone(ex.x, ex.y);
    const p = predict(model, [0.1, 0.2]);
    expect(p[0]).toBeCloseRel(1.8628, 0, 1e-4);
    expect(p[1]).toBeCloseRel(3.7256, 0, 1e-4);
    expect(p).toBeAllCloseRel(ex.predict_y, 1e-9);
  });

  it('isotonic_regression([5, 3, 1, 2, 8, 10, 7, 9, 6, 4]) → 2.75 ×4, 7.33 ×6 (scikit-learn stable docs of sklearn.isotonic.isotonic_regression)', () => {
    const ex = skRefs.docs.sklearn_isotonic_regression;
    const fit = isotonicRegression(ex.y.map((_, i) => i), ex.y);
    expect(fit.fitted).toBeAllCloseRel([2.75, 2.75, 2.75, 2.75, 44 / 6, 44 / 6, 44 / 6, 44 / 6, 44 / 6, 44 / 6], 1e-12);
    expect(fit.fitted).toBeAllCloseRel(ex.fitted, 1e-12);
  });
});

describe('SciPy documentation example of scipy.optimize.isotonic_regression (SciPy ≥ 1.12 docs; the installed 1.10.1 lacks the function, scikit-learn recomputes it in core_sklearn.json)', () => {
  it('y = [1.5, 1, 4, 6, 5.7, 5, 7.8, 9, 7.5, 9.5, 9] → 1.25, 1.25, 4, 5.5667 ×3, 7.8, 8.25, 8.25, 9.25, 9.25', () => {
    const ex = skRefs.docs.scipy_isotonic_regression;
    const fit = isotonicRegression(ex.y.map((_, i) => i), ex.y);
    const m = 16.7 / 3; // (6 + 5.7 + 5) / 3, printed 5.56666667
    expect(fit.fitted).toBeAllCloseRel([1.25, 1.25, 4, m, m, m, 7.8, 8.25, 8.25, 9.25, 9.25], 1e-12);
    expect(fit.fitted).toBeAllCloseRel(ex.fitted, 1e-12);
  });
});

describe('the worked knot example of docs/methods.md (computed with quadprog, not published)', () => {
  const x = [0, 0.5, 1, 1.5, 2, 2.5, 3];
  const y = [0, 2, 1, 1.5, 1, 3, 2.8];

  it('knots [0, 1, 2, 3], unit weights → θ = [433/850, 247/170, 247/170, 2677/850], SSE = 4931/2125', () => {
    const fit = knotRegression(x, y, { knots: [0, 1, 2, 3] });
    expect(fit.knotY).toBeAllCloseRel([433 / 850, 247 / 170, 247 / 170, 2677 / 850], 1e-12);
    expect(fitMonotone(x, y, { knots: 4 }).stats.sse).toBeCloseRel(4931 / 2125, 1e-12);
    expect(fit.levels).toBe(3);
  });

  it('agrees with R quadprog::solve.QP recomputed by gen_core.R (core_r.json methods_knot_example)', () => {
    const ex = rRefs.methods_knot_example;
    expect(ex.x).toEqual(x);
    expect(knotRegression(x, y, { knots: ex.knot_x }).knotY).toBeAllCloseRel(ex.theta, 1e-9);
    expect(ex.sse).toBeCloseRel(4931 / 2125, 1e-12);
  });
});
