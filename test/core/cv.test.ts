/**
 * Cross-validation of knot counts as a specification (src/core/cross-validate.ts,
 * src/core/scores.ts): a worked example computed by hand, the one-SE rule, no leakage
 * from held-out rows, zero weights, agreement with a fold-by-fold computation through the public
 * fitting API, typed errors, cancellation and progress. The comparison with scikit-learn and
 * SciPy on R datasets is in cv-reference.test.ts.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { crossValidate, defaultCandidates, fitMonotone, kFoldAssignment, predict, quantileKnots, suggestKnots, RatchetError, type CrossValidationOptions, type DirectionOption } from '../../src/core/index.js';
import { evenKnots } from '../../src/core/knots.js';
import { holdoutValidate } from '../../src/core/cross-validate.js';
import { spearman } from '../../src/core/direction.js';

/** Runs `fn` and returns the RatchetError it throws (fails the test if it does not throw one). */
function caught(fn: () => unknown): RatchetError {
  try {
    fn();
  } catch (e) {
    if (e instanceof RatchetError) return e;
    throw e;
  }
  throw new Error('expected a RatchetError');
}

const sd = (v: number[]): number => {
  const m = v.reduce((a, b) => a + b, 0) / v.length;
  return Math.sqrt(v.reduce((a, b) => a + (b - m) ** 2, 0) / (v.length - 1));
};

describe('worked example by hand: x = 1…6, y = 1, 3, 2, 4, 6, 5; 3 folds, seed 0 (no shuffling)', () => {
  // Folds (contiguous): {x = 1, 2}, {x = 3, 4}, {x = 5, 6}.
  const x = [1, 2, 3, 4, 5, 6];
  const y = [1, 3, 2, 4, 6, 5];
  const result = crossValidate(x, y, { candidates: [0, 2], folds: 3, seed: 0 });
  const [classic, two] = result.scores as [NonNullable<(typeof result.scores)[0]>, NonNullable<(typeof result.scores)[0]>];

  // Classic fit (PAVA) on each training set, prediction by interpolation, flat beyond:
  //  fold 1: train y 2, 4, 6, 5 → 2, 4, 5.5, 5.5; x = 1, 2 lie below the training range → 2, 2;
  //          errors −1, 1 → SSE 2.
  //  fold 2: train (1,1), (2,3), (5,6), (6,5) → 1, 3, 5.5, 5.5; x = 3 → 3 + (1/3)·2.5 = 23/6,
  //          x = 4 → 3 + (2/3)·2.5 = 14/3; errors 2 − 23/6 = −11/6, 4 − 14/3 = −2/3 → SSE 137/36.
  //  fold 3: train y 1, 3, 2, 4 → 1, 2.5, 2.5, 4; x = 5, 6 beyond → 4, 4; errors 2, 1 → SSE 5.
  const sseClassic = [2, 137 / 36, 5];
  // K = 2 (one line over the training range, slope ≥ 0 here, so the least-squares line):
  //  fold 1: train x 3…6, y 2, 4, 6, 5: slope 5.5/5 = 1.1, value at x = 3 is 4.25 − 1.5·1.1 = 2.6,
  //          flat below → errors 1 − 2.6, 3 − 2.6 → SSE 2.56 + 0.16 = 2.72.
  //  fold 2: train x 1, 2, 5, 6, y 1, 3, 6, 5: slope 14.5/17 = 29/34, mean (3.5, 3.75); at x = 3, 4
  //          → 3.75 ∓ 29/68; errors −45/34, −3/17 → SSE 2025/1156 + 36/1156 = 2061/1156.
  //  fold 3: train x 1…4, y 1, 3, 2, 4: slope 0.8, value at x = 4 is 3.7, flat beyond → errors
  //          2.3, 1.3 → SSE 5.29 + 1.69 = 6.98.
  const sseTwo = [2.72, 2061 / 1156, 6.98];
  const sst = 17.5; // Σ (y − 3.5)²

  it('cvRmse = √(pooled SSE / 6): √(389/216) for the classic fit and √(11.48287…/6) for K = 2', () => {
    expect(classic.cvRmse).toBeCloseRel(Math.sqrt(389 / 216), 1e-14);
    expect(classic.cvRmse).toBeCloseRel(Math.sqrt(sseClassic.reduce((a, b) => a + b) / 6), 1e-14);
    expect(two.cvRmse).toBeCloseRel(Math.sqrt(sseTwo.reduce((a, b) => a + b) / 6), 1e-14);
  });

  it('per-fold RMSE = √(SSE/2), cvSe = sd (n − 1) of the 3 fold RMSEs / √3', () => {
    const rc = sseClassic.map((s) => Math.sqrt(s / 2));
    const r2 = sseTwo.map((s) => Math.sqrt(s / 2));
    expect(classic.foldRmse).toBeAllCloseRel(rc, 1e-14);
    expect(two.foldRmse).toBeAllCloseRel(r2, 1e-14);
    expect(classic.cvSe).toBeCloseRel(sd(rc) / Math.sqrt(3), 1e-13);
    expect(classic.cvSe).toBeCloseRel(0.170354134, 1e-8);
    expect(two.cvSe).toBeCloseRel(sd(r2) / Math.sqrt(3), 1e-13);
  });

  it('cvR2 = 1 − SSE/SST over all rows, cvMae = pooled mean |error|, trainRmse = mean training RMSE', () => {
    expect(classic.cvR2).toBeCloseRel(1 - 389 / 36 / sst, 1e-14);
    expect(two.cvR2).toBeCloseRel(1 - sseTwo.reduce((a, b) => a + b) / sst, 1e-14);
    // |errors|: 1, 1, 11/6, 2/3, 2, 1 → 7.5 / 6
    expect(classic.cvMae).toBeCloseRel(1.25, 1e-14);
    // Every classic training fit pools one pair of rows: SSE 0.5 over 4 rows in each fold.
    expect(classic.trainRmse).toBeCloseRel(Math.sqrt(0.5 / 4), 1e-14);
  });

  it('one-SE picks K = 2 (1.3834 ≤ 1.3420 + 0.1704); min picks the classic fit', () => {
    const s = suggestKnots(result.scores);
    expect(s).toEqual({ knots: 2, index: 1, rule: 'one-se', threshold: classic.cvRmse + classic.cvSe });
    expect(s.threshold).toBeCloseRel(1.51234, 1e-5);
    expect(suggestKnots(result.scores, 'min')).toEqual({ knots: 0, index: 0, rule: 'min', threshold: classic.cvRmse });
  });

  it('the result records the split', () => {
    expect(result).toMatchObject({ folds: 3, repeats: 1, seed: 0, n: 6, method: 'k-fold' });
  });
});

describe('suggestKnots', () => {
  // Worked example: the minimum is the classic fit at 1.00 with SE 0.06, so the threshold is 1.06;
  // K = 4 (1.05) and K = 6 (1.02) are within it, K = 3 (1.12) is not; the simplest within is 4.
  const table = [
    { knots: 0, cvRmse: 1.0, cvSe: 0.06 },
    { knots: 6, cvRmse: 1.02, cvSe: 0.05 },
    { knots: 2, cvRmse: 1.4, cvSe: 0.1 },
    { knots: 4, cvRmse: 1.05, cvSe: 0.07 },
    { knots: 3, cvRmse: 1.12, cvSe: 0.08 },
  ];

  it('one-SE: the simplest candidate with cvRmse ≤ min + SE of the minimiser (hand-checked table)', () => {
    expect(suggestKnots(table)).toEqual({ knots: 4, index: 3, rule: 'one-se', threshold: 1.06 });
  });

  it('min: the minimiser', () => {
    expect(suggestKnots(table, 'min')).toEqual({ knots: 0, index: 0, rule: 'min', threshold: 1.0 });
  });

  it('a candidate exactly at the threshold counts as within it (1 + 0.25 = 1.25 exactly)', () => {
    const s = suggestKnots([
      { knots: 9, cvRmse: 1, cvSe: 0.25 },
      { knots: 3, cvRmse: 1.25, cvSe: 0.1 },
    ]);
    expect(s.knots).toBe(3);
  });

  it('ties go to fewer knots, and the classic fit ranks after every knot count', () => {
    expect(suggestKnots([{ knots: 5, cvRmse: 1, cvSe: 0 }, { knots: 3, cvRmse: 1, cvSe: 0 }], 'min').knots).toBe(3);
    expect(suggestKnots([{ knots: 0, cvRmse: 1, cvSe: 0 }, { knots: 40, cvRmse: 1, cvSe: 0 }], 'min').knots).toBe(40);
    expect(suggestKnots([{ knots: 0, cvRmse: 1, cvSe: 0.5 }, { knots: 40, cvRmse: 1.4, cvSe: 0 }]).knots).toBe(40);
  });

  it('does not depend on the order of the scores', () => {
    const reversed = [...table].reverse();
    expect(suggestKnots(reversed).knots).toBe(4);
    expect(suggestKnots(reversed, 'min').knots).toBe(0);
  });

  it('a non-finite SE (hold-out with one test row) counts as 0, so one-SE falls back to the minimiser', () => {
    expect(suggestKnots([{ knots: 2, cvRmse: 1.1, cvSe: NaN }, { knots: 5, cvRmse: 1, cvSe: NaN }]).knots).toBe(5);
  });

  it('rejects an empty list, a non-finite cvRmse and an unknown rule with BAD_OPTION', () => {
    expect(caught(() => suggestKnots([])).message).toBe('scores: needs at least one candidate score; got none.');
    expect(caught(() => suggestKnots([{ knots: 2, cvRmse: NaN, cvSe: 0 }])).message).toBe(
      'scores: needs a finite cvRmse for every candidate; entry 1 has NaN.',
    );
    const e = caught(() => suggestKnots(table, 'smallest' as 'min'));
    expect(e.code).toBe('BAD_OPTION');
    expect(e.message).toBe("rule: needs 'one-se' or 'min'; got smallest.");
  });
});

/**
 * Cross-validation by hand through the public API: rows with positive weight in row order, folds
 * from kFoldAssignment, each training set fitted by fitMonotone (the rows in row order, so the fit
 * sorts them itself), held-out rows predicted by predict. Returns the pooled cvRmse.
 */
function manualCv(
  x: number[],
  y: number[],
  K: number,
  o: { folds: number; seed: number; repeats?: number; weights?: number[]; direction?: DirectionOption; lower?: number; upper?: number; knotsFor?: (tx: number[], K: number) => number | Float64Array },
): { cvRmse: number; foldRmse: number[]; trainRmse: number } {
  const keep = x.map((_, i) => (o.weights ? o.weights[i]! > 0 : true));
  const xs = x.filter((_, i) => keep[i]);
  const ys = y.filter((_, i) => keep[i]);
  const ws = o.weights ? o.weights.filter((_, i) => keep[i]) : xs.map(() => 1);
  let sse = 0;
  let sw = 0;
  const foldRmse: number[] = [];
  let trainRmse = 0;
  for (let r = 0; r < (o.repeats ?? 1); r++) {
    const fold = kFoldAssignment(xs.length, o.folds, o.seed, r);
    for (let f = 0; f < o.folds; f++) {
      const tr = xs.map((_, i) => i).filter((i) => fold[i] !== f);
      const te = xs.map((_, i) => i).filter((i) => fold[i] === f);
      const tx = tr.map((i) => xs[i]!);
      const knots = K === 0 ? 0 : o.knotsFor ? o.knotsFor(tx, K) : K;
      const model = fitMonotone(tx, tr.map((i) => ys[i]!), {
        knots,
        weights: tr.map((i) => ws[i]!),
        direction: o.direction,
        lower: o.lower,
        upper: o.upper,
      });
      trainRmse += model.stats.rmse;
      const pred = predict(model, te.map((i) => xs[i]!));
      let s = 0;
      let w = 0;
      te.forEach((i, k) => {
        s += ws[i]! * (ys[i]! - pred[k]!) ** 2;
        w += ws[i]!;
      });
      sse += s;
      sw += w;
      foldRmse.push(Math.sqrt(s / w));
    }
  }
  return { cvRmse: Math.sqrt(sse / sw), foldRmse, trainRmse: trainRmse / foldRmse.length };
}

describe('no leakage: each fold learns only from its training rows', () => {
  // Seed 0 and rows in x order: fold 1 holds the 5 smallest x, so the training range is [5, 19].
  const x = Array.from({ length: 20 }, (_, i) => i);
  const y = x.map((v) => Math.sqrt(v) + 0.3 * Math.sin(3 * v));

  it('even knots span the TRAINING x range, not the range of all rows', () => {
    const cv = crossValidate(x, y, { candidates: [3], folds: 4, seed: 0 }).scores[0]!.cvRmse;
    const honest = manualCv(x, y, 3, { folds: 4, seed: 0 }).cvRmse;
    const leaky = manualCv(x, y, 3, { folds: 4, seed: 0, knotsFor: () => evenKnots(0, 19, 3) }).cvRmse;
    expect(cv).toBeCloseRel(honest, 1e-12);
    expect(Math.abs(leaky - honest) / honest).toBeGreaterThan(1e-3);
  });

  it("quantile knots ('quantile' placement) are quantiles of the training x only", () => {
    const xq = x.map((v) => v * v); // skewed, so quantiles differ from even spacing
    const cv = crossValidate(xq, y, { candidates: [4], folds: 4, seed: 0, placement: 'quantile' }).scores[0]!.cvRmse;
    const honest = manualCv(xq, y, 4, { folds: 4, seed: 0, knotsFor: (tx, K) => quantileKnots(tx, K) }).cvRmse;
    const leaky = manualCv(xq, y, 4, { folds: 4, seed: 0, knotsFor: (_tx, K) => quantileKnots(xq, K) }).cvRmse;
    expect(cv).toBeCloseRel(honest, 1e-12);
    expect(Math.abs(leaky - honest) / honest).toBeGreaterThan(1e-3);
    const even = crossValidate(xq, y, { candidates: [4], folds: 4, seed: 0 }).scores[0]!.cvRmse;
    expect(Math.abs(even - cv)).toBeGreaterThan(1e-6);
  });

  it("'auto' direction is decided on each training set: here rising overall, falling without fold 1", () => {
    const xa = [1, 2, 3, 4, 5, 6];
    const ya = [1, 2, 10, 9, 8, 7];
    expect(spearman(xa, ya)).toBeGreaterThan(0); // all rows: 'up'
    expect(spearman(xa.slice(2), ya.slice(2))).toBe(-1); // training rows of fold 1: 'down'
    const cv = crossValidate(xa, ya, { candidates: [0], folds: 3, seed: 0, direction: 'auto' }).scores[0]!.cvRmse;
    const honest = manualCv(xa, ya, 0, { folds: 3, seed: 0, direction: 'auto' }).cvRmse;
    const leaky = manualCv(xa, ya, 0, { folds: 3, seed: 0, direction: 'up' }).cvRmse;
    expect(cv).toBeCloseRel(honest, 1e-12);
    expect(Math.abs(leaky - honest) / honest).toBeGreaterThan(1e-3);
  });

  it('held-out rows beyond the training range get the flat end value of the curve', () => {
    // Fold 1 = x 0…4, all below the training range [5, 19]: the prediction is the first knot value.
    const cv = crossValidate(x, y, { candidates: [3], folds: 4, seed: 0 }).scores[0]!;
    const model = fitMonotone(x.slice(5), y.slice(5), { knots: 3 });
    const first = model.knotY[0]!;
    const sse = y.slice(0, 5).reduce((a, v) => a + (v - first) ** 2, 0);
    expect(cv.foldRmse[0]).toBeCloseRel(Math.sqrt(sse / 5), 1e-12);
  });
});

describe('agreement with cross-validation by hand through fitMonotone and predict (property)', () => {
  const data = fc
    .record({
      n: fc.integer({ min: 8, max: 40 }),
      folds: fc.integer({ min: 2, max: 6 }),
      seed: fc.integer({ min: 0, max: 1000 }),
      repeats: fc.integer({ min: 1, max: 3 }),
      direction: fc.constantFrom<DirectionOption>('up', 'down', 'auto'),
      weighted: fc.boolean(),
      bounded: fc.boolean(),
      quantile: fc.boolean(),
      raw: fc.array(fc.tuple(fc.integer({ min: 0, max: 12 }), fc.double({ min: -5, max: 5, noNaN: true }), fc.integer({ min: 0, max: 3 })), { minLength: 40, maxLength: 40 }),
    })
    .map((r) => ({ ...r, repeats: r.seed === 0 ? 1 : r.repeats, rows: r.raw.slice(0, r.n) }));

  it('every candidate (classic and K = 2…6), every option: cvRmse, each fold\'s RMSE and the mean training RMSE', () => {
    fc.assert(
      fc.property(data, (d) => {
        const x = d.rows.map((r) => r[0] + 0.5 * (r[0] % 3));
        const y = d.rows.map((r, i) => r[0] / 3 + r[1] + (i % 2));
        const weights = d.weighted ? d.rows.map((r) => r[2] * 0.5) : undefined;
        const used = weights ? weights.filter((w) => w > 0).length : x.length;
        fc.pre(used >= d.folds && new Set(x.filter((_, i) => !weights || weights[i]! > 0)).size >= 3);
        const options: CrossValidationOptions = {
          candidates: [0, 2, 3, 6],
          folds: d.folds,
          seed: d.seed,
          repeats: d.repeats,
          direction: d.direction,
          ...(weights ? { weights } : {}),
          ...(d.bounded ? { lower: -1, upper: 4 } : {}),
          ...(d.quantile ? { placement: 'quantile' as const } : {}),
        };
        let result;
        try {
          result = crossValidate(x, y, options);
        } catch (e) {
          // Only a training set with < 2 distinct x may fail, and it is named as a fold problem.
          expect(e).toBeInstanceOf(RatchetError);
          expect((e as RatchetError).code).toBe('TOO_FEW_POINTS');
          expect((e as RatchetError).argument).toBe('folds');
          return;
        }
        for (const s of result.scores) {
          const m = manualCv(x, y, s.knots, {
            folds: d.folds,
            seed: d.seed,
            repeats: d.repeats,
            weights,
            direction: d.direction,
            lower: options.lower,
            upper: options.upper,
            ...(d.quantile ? { knotsFor: (tx: number[], K: number) => quantileKnots(tx, K) } : {}),
          });
          // Classic fits agree to rounding. Knot fits get their training rows in another order
          // (sorted by x here, row order by hand); where ties leave knot values only jointly
          // determined, knotRegression's 1e-10 roughness tie-break amplifies that rounding
          // (about 1e-16 / 1e-10): 3000 random cases differed by at most 1.2e-9, rare ones by ~1.5e-8.
          const rel = s.knots === 0 ? 1e-9 : 1e-7;
          expect(s.cvRmse).toBeCloseRel(m.cvRmse, rel);
          expect(s.foldRmse).toBeAllCloseRel(m.foldRmse, rel);
          // The scan scores the training rows from the knot table alone (no fitted values); it
          // must equal the mean RMSE of the fitted values of the full fits.
          expect(s.trainRmse).toBeCloseRel(m.trainRmse, rel);
        }
      }),
      { numRuns: 120 },
    );
  });
});

describe('rows with weight 0 neither train nor score', () => {
  const x = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
  const y = [2, 1, 4, 3, 6, 5, 8, 7, 9, 12, 10, 11];
  const w = [1, 0, 2, 1, 0, 1, 1, 3, 0, 1, 1, 1];
  const keep = w.map((v) => v > 0);

  it('give the same result as leaving the rows out (they take no place in any fold)', () => {
    const opts = { candidates: [0, 2, 4], folds: 3, seed: 5, repeats: 2 };
    const withZeros = crossValidate(x, y, { ...opts, weights: w });
    const without = crossValidate(
      x.filter((_, i) => keep[i]),
      y.filter((_, i) => keep[i]),
      { ...opts, weights: w.filter((v) => v > 0) },
    );
    expect(withZeros).toEqual(without);
    expect(withZeros.n).toBe(9);
  });

  it('their y values do not matter', () => {
    const y2 = y.map((v, i) => (w[i] === 0 ? 1000 : v));
    const opts = { candidates: [0, 3], folds: 4, seed: 0, weights: w };
    expect(crossValidate(x, y2, opts)).toEqual(crossValidate(x, y, opts));
  });
});

describe('defaults and simple cases', () => {
  const x = Array.from({ length: 30 }, (_, i) => (i * 7) % 30);
  const y = x.map((v) => Math.log1p(v) + ((v * 13) % 5) / 10);

  it('default candidates are 2 … min(20, distinct x)', () => {
    expect(defaultCandidates([1, 2, 2, 3])).toEqual([2, 3]);
    expect(defaultCandidates(x)).toEqual(Array.from({ length: 19 }, (_, i) => i + 2));
    expect(caught(() => defaultCandidates([4, 4])).message).toBe('x: needs at least 2 distinct values to compare knot counts; got 1.');
  });

  it('default options: those candidates, 5 folds, 1 repeat, seed 1', () => {
    const r = crossValidate(x, y);
    expect(r).toMatchObject({ folds: 5, repeats: 1, seed: 1, n: 30, method: 'k-fold' });
    expect(r.scores.map((s) => s.knots)).toEqual(defaultCandidates(x));
    expect(r).toEqual(crossValidate(x, y, { candidates: defaultCandidates(x), folds: 5, repeats: 1, seed: 1 }));
  });

  it('identical results on a second run; another seed gives other folds', () => {
    const opts = { candidates: [0, 2, 5], folds: 4, seed: 77, repeats: 3 };
    expect(crossValidate(x, y, opts)).toEqual(crossValidate(x, y, opts));
    expect(crossValidate(x, y, opts).scores[1]!.foldRmse).not.toEqual(crossValidate(x, y, { ...opts, seed: 78 }).scores[1]!.foldRmse);
  });

  it('repeats pool every fold of every repeat: F·R fold RMSEs, cvR2 over R·SST', () => {
    const r = crossValidate(x, y, { candidates: [3], folds: 5, seed: 3, repeats: 4 }).scores[0]!;
    expect(r.foldRmse).toHaveLength(20);
    expect(r.cvSe).toBeCloseRel(sd(r.foldRmse) / Math.sqrt(20), 1e-12);
    // Repeat by repeat, fold by fold, as computed by hand from kFoldAssignment(n, 5, 3, r).
    expect(r.foldRmse).toBeAllCloseRel(manualCv(x, y, 3, { folds: 5, seed: 3, repeats: 4 }).foldRmse, 1e-9);
    const sst = y.reduce((a, v) => a + (v - y.reduce((p, q) => p + q) / 30) ** 2, 0);
    const sse = r.cvRmse ** 2 * 4 * 30; // pooled over 4 repeats × 30 held-out rows
    expect(r.cvR2).toBeCloseRel(1 - sse / (4 * sst), 1e-12);
  });

  it('constant y: every fit is exact, cvRmse 0, cvR2 1', () => {
    const s = crossValidate([1, 2, 3, 4, 5, 6], [2, 2, 2, 2, 2, 2], { candidates: [0, 2], folds: 2, seed: 0 }).scores;
    for (const c of s) expect(c).toMatchObject({ cvRmse: 0, cvSe: 0, cvR2: 1, cvMae: 0, trainRmse: 0 });
  });

  it('leave-one-out (F = n) is allowed', () => {
    const r = crossValidate([1, 2, 3, 4, 5], [1, 2, 2, 4, 5], { candidates: [2], folds: 5, seed: 0 });
    expect(r.scores[0]!.foldRmse).toHaveLength(5);
  });
});

describe('hold-out', () => {
  it('doc example: train on x 1…3 (the line y = x), the test row (4, 5) gets the flat end value 3', () => {
    const r = holdoutValidate([1, 2, 3, 4], [1, 2, 3, 5], { candidates: [2], seed: 0 });
    expect(r).toMatchObject({ method: 'holdout', folds: 1, repeats: 1, n: 4, testFraction: 0.25, testRows: 1 });
    expect(r.scores[0]!.cvRmse).toBeCloseRel(2, 1e-14);
    expect(r.scores[0]!.cvSe).toBeNaN(); // one test row: no spread
  });

  it('cvSe is the delta-method SE: sd(e²)/√m / (2·RMSE) with unit weights', () => {
    const x = Array.from({ length: 40 }, (_, i) => i);
    const y = x.map((v) => v / 10 + Math.sin(v));
    const r = holdoutValidate(x, y, { candidates: [3], seed: 0 }).scores[0]!;
    // Test rows are the last 10 (x 30…39); the model trained on x 0…29 is flat beyond 29.
    const model = fitMonotone(x.slice(0, 30), y.slice(0, 30), { knots: 3 });
    const e2 = Array.from(predict(model, x.slice(30))).map((p, k) => (y[30 + k]! - p) ** 2);
    const rmse = Math.sqrt(e2.reduce((a, b) => a + b) / 10);
    expect(r.cvRmse).toBeCloseRel(rmse, 1e-12);
    expect(r.cvSe).toBeCloseRel(sd(e2) / Math.sqrt(10) / (2 * rmse), 1e-12);
  });

  it('is reproducible and uses the seeded permutation for seed ≠ 0', () => {
    const x = Array.from({ length: 25 }, (_, i) => i);
    const y = x.map((v) => Math.sqrt(v) + ((v * 7) % 3) / 4);
    const a = holdoutValidate(x, y, { candidates: [0, 2, 4], seed: 12, testFraction: 0.4 });
    expect(a).toEqual(holdoutValidate(x, y, { candidates: [0, 2, 4], seed: 12, testFraction: 0.4 }));
    expect(a.testRows).toBe(10);
    expect(a.scores[0]!.cvRmse).not.toBe(holdoutValidate(x, y, { candidates: [0], seed: 0, testFraction: 0.4 }).scores[0]!.cvRmse);
  });
});

describe('bad input: typed errors naming the argument', () => {
  const x = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
  const y = [1, 3, 2, 5, 4, 6, 8, 7, 9, 10];
  const cases: [string, CrossValidationOptions, string][] = [
    ['folds 1', { folds: 1 }, 'folds: needs a whole number from 2 to the number of rows used (10); got 1.'],
    ['folds > n', { folds: 11 }, 'folds: needs a whole number from 2 to the number of rows used (10); got 11.'],
    ['fractional folds', { folds: 2.5 }, 'folds: needs a whole number from 2 to the number of rows used (10); got 2.5.'],
    ['repeats 0', { repeats: 0 }, 'repeats: needs a whole number from 1 to 1000; got 0.'],
    ['fractional repeats', { repeats: 1.5 }, 'repeats: needs a whole number from 1 to 1000; got 1.5.'],
    ['repeats with seed 0', { repeats: 2, seed: 0 }, 'repeats: needs 1 when seed is 0 (without shuffling every repeat has the same folds); got 2.'],
    ['negative seed', { seed: -3 }, 'seed: needs a whole number from 0 to 9007199254740991; got -3.'],
    ['empty candidates', { candidates: [] }, 'candidates: needs at least one knot count; got none.'],
    ['candidate 1', { candidates: [2, 1] }, 'candidates: needs knot counts that are 0 (classic fit) or whole numbers from 2 to 100000; entry 2 is 1.'],
    ['negative candidate', { candidates: [-2] }, 'candidates: needs knot counts that are 0 (classic fit) or whole numbers from 2 to 100000; entry 1 is -2.'],
    ['fractional candidate', { candidates: [3.5] }, 'candidates: needs knot counts that are 0 (classic fit) or whole numbers from 2 to 100000; entry 1 is 3.5.'],
    ['duplicate candidate', { candidates: [3, 0, 3] }, 'candidates: needs distinct knot counts; 3 appears more than once.'],
    ['candidates not a list', { candidates: 5 as unknown as number[] }, 'candidates: needs a list of knot counts.'],
    ['unknown direction', { direction: 'sideways' as DirectionOption }, "direction: needs 'up', 'down' or 'auto'; got sideways."],
    ['unknown placement', { placement: 'random' as 'even' }, "placement: needs 'even' or 'quantile'; got random."],
  ];
  for (const [label, options, message] of cases) {
    it(`${label} → BAD_OPTION: "${message}"`, () => {
      const e = caught(() => crossValidate(x, y, options));
      expect(e.code).toBe('BAD_OPTION');
      expect(e.message).toBe(message);
    });
  }

  it('test fraction outside (0, 1) → BAD_OPTION naming testFraction', () => {
    for (const p of [0, 1, 1.2, -0.5]) {
      const e = caught(() => holdoutValidate(x, y, { testFraction: p }));
      expect(e.code).toBe('BAD_OPTION');
      expect(e.message).toBe(`testFraction: needs a number strictly between 0 and 1; got ${p}.`);
    }
  });

  it('folds are counted among the rows with positive weight', () => {
    const w = [1, 1, 1, 0, 0, 0, 0, 0, 0, 0];
    expect(caught(() => crossValidate(x, y, { weights: w, folds: 4 })).message).toBe(
      'folds: needs a whole number from 2 to the number of rows used (3); got 4.',
    );
  });

  it('fewer than 2 distinct x overall → TOO_FEW_POINTS naming x', () => {
    const e = caught(() => crossValidate([3, 3, 3, 3], [1, 2, 3, 4], { folds: 2 }));
    expect(e.code).toBe('TOO_FEW_POINTS');
    expect(e.message).toBe('x: needs at least 2 distinct values with positive weight to cross-validate.');
  });

  it('a training set with fewer than 2 distinct x → TOO_FEW_POINTS naming the fold, before any fit', () => {
    let fits = 0;
    const e = caught(() =>
      crossValidate([1, 1, 1, 1, 2], [1, 2, 3, 4, 5], { candidates: [0], folds: 5, seed: 0, onProgress: () => fits++ }),
    );
    expect(e.code).toBe('TOO_FEW_POINTS');
    expect(e.message).toBe('folds: needs at least 2 distinct x values in every training set; the training rows of fold 5 of repeat 1 all have x = 1.');
    expect(fits).toBe(0);
  });

  it('length mismatch and non-finite data keep the core messages', () => {
    expect(caught(() => crossValidate([1, 2, 3], [1, 2])).message).toBe('y: needs one value per entry of x (3); got 2.');
    expect(caught(() => crossValidate([1, NaN, 3], [1, 2, 3])).message).toBe('x: needs finite numbers; entry 2 is NaN.');
  });
});

describe('long work: progress and cancellation', () => {
  const x = Array.from({ length: 50 }, (_, i) => (i * 17) % 50);
  const y = x.map((v) => Math.sqrt(v) + ((v * 3) % 7) / 7);

  it('onProgress is called after every fit with increasing fractions ending at 1', () => {
    const seen: number[] = [];
    crossValidate(x, y, { candidates: [0, 2, 3, 4], folds: 5, repeats: 2, onProgress: (f) => seen.push(f) });
    expect(seen).toHaveLength(40); // 4 candidates × 5 folds × 2 repeats
    expect(seen.map((f) => f * 40)).toBeAllCloseRel(Array.from({ length: 40 }, (_, i) => i + 1), 1e-12);
    expect(seen[39]).toBe(1);
  });

  it('an abort during the run stops before the next fit with CANCELLED', () => {
    const controller = new AbortController();
    let calls = 0;
    const e = caught(() =>
      crossValidate(x, y, {
        candidates: [0, 2, 3, 4],
        folds: 5,
        signal: controller.signal,
        onProgress: () => {
          calls++;
          if (calls === 3) controller.abort();
        },
      }),
    );
    expect(e.code).toBe('CANCELLED');
    expect(e.message).toBe('signal: cross-validation was cancelled; 3 of 20 fits were done.');
    expect(calls).toBe(3);
  });

  it('an already aborted signal stops before the first fit (K-fold and hold-out)', () => {
    const controller = new AbortController();
    controller.abort();
    expect(caught(() => crossValidate(x, y, { signal: controller.signal })).message).toBe(
      'signal: cross-validation was cancelled; 0 of 95 fits were done.',
    );
    expect(caught(() => holdoutValidate(x, y, { candidates: [2], signal: controller.signal })).code).toBe('CANCELLED');
  });
});
