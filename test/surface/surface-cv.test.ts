/**
 * Cross-validation of (K1, K2) pairs for the surface.
 * Outside reference: fixture test/reference/fixtures/surface_cv.json, written by
 * `/usr/bin/python3 test/reference/gen_surface.py` (cvxopt 1.3.0, scikit-learn 1.2.1, NumPy 1.24.2,
 * R 4.2.2 for the data — versions in the file): R's `trees` and `stackloss` data, folds by
 * sklearn KFold(shuffle=False) (our seed 0), each training fit by cvxopt.solvers.qp on a design
 * built in Python. Compared at 1e-7 relative (cvxopt's interior point stops at 1e-13 gaps).
 */
import { describe, expect, it } from 'vitest';
import {
  crossValidateSurface,
  fitSurface,
  kFoldAssignment,
  predictSurface,
  suggestSurfaceKnots,
  RatchetError,
} from '../../src/core/index.js';
import ref from '../reference/fixtures/surface_cv.json' with { type: 'json' };
import { uniform } from './helpers.js';

describe('against cvxopt fold by fold (seed 0 = sklearn KFold without shuffling)', () => {
  for (const c of ref.cases) {
    it(c.name, () => {
      const pairs = c.scores.map((s) => [s.knots1, s.knots2] as const);
      for (const [k1, k2] of pairs) {
        const res = crossValidateSurface(c.x1, c.x2, c.y, { candidates1: [k1], candidates2: [k2], folds: c.folds, seed: 0 });
        const got = res.scores[0]!;
        const want = c.scores.find((s) => s.knots1 === k1 && s.knots2 === k2)!;
        expect(got.cvRmse).toBeCloseRel(want.cvRmse, 1e-7);
        expect(got.cvSe).toBeCloseRel(want.cvSe, 1e-6);
        expect(got.cvR2).toBeCloseRel(want.cvR2, 1e-7);
        expect(got.cvMae).toBeCloseRel(want.cvMae, 1e-7);
        expect(got.trainRmse).toBeCloseRel(want.trainRmse, 1e-7);
        expect(got.foldRmse).toBeAllCloseRel(want.foldRmse, 1e-7);
        expect(res.n).toBe(c.y.length);
      }
    });
  }
});

function data(n: number, seed: number) {
  const r = uniform(seed);
  const x1: number[] = [];
  const x2: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < n; i++) {
    const a = Math.round(r() * 100) / 10;
    const b = Math.round(r() * 100) / 10;
    x1.push(a);
    x2.push(b);
    y.push(Math.sqrt(a) + 0.1 * b + (r() - 0.5));
  }
  return { x1, x2, y };
}

describe('the folds, seeds and rules of the one-predictor cross-validation', () => {
  it('fold f of repeat r holds the rows kFoldAssignment(n, F, seed, r) puts there; each fold is fitSurface on the rest', () => {
    const { x1, x2, y } = data(60, 3);
    const res = crossValidateSurface(x1, x2, y, { candidates1: [3], candidates2: [2], folds: 4, repeats: 2, seed: 11 });
    const manual: number[] = [];
    for (let r = 0; r < 2; r++) {
      const label = kFoldAssignment(60, 4, 11, r);
      for (let f = 0; f < 4; f++) {
        const tr = [...label.keys()].filter((i) => label[i] !== f);
        const te = [...label.keys()].filter((i) => label[i] === f);
        const m = fitSurface(
          tr.map((i) => x1[i]!),
          tr.map((i) => x2[i]!),
          tr.map((i) => y[i]!),
          { knots1: 3, knots2: 2 },
        );
        const p = predictSurface(m, te.map((i) => x1[i]!), te.map((i) => x2[i]!));
        manual.push(Math.sqrt(te.reduce((s, i, j) => s + (y[i]! - p[j]!) ** 2, 0) / te.length));
      }
    }
    expect(res.scores[0]!.foldRmse).toBeAllCloseRel(manual, 1e-12);
    expect(res.folds).toBe(4);
    expect(res.repeats).toBe(2);
    expect(res.seed).toBe(11);
  });

  it('scores every pair of the two candidate lists, candidates1 outer; default lists 2 … 6', () => {
    const { x1, x2, y } = data(50, 5);
    const res = crossValidateSurface(x1, x2, y, { candidates1: [2, 4], candidates2: [3, 2, 0], folds: 3 });
    expect(res.scores.map((s) => [s.knots1, s.knots2])).toEqual([
      [2, 3],
      [2, 2],
      [2, 0],
      [4, 3],
      [4, 2],
      [4, 0],
    ]);
    const all = crossValidateSurface(x1, x2, y, { folds: 3 });
    expect(all.scores.length).toBe(25);
  });

  it('zero-weight rows neither train nor score (same result as dropping them)', () => {
    const { x1, x2, y } = data(40, 8);
    const w = x1.map((_, i) => (i % 5 === 0 ? 0 : 1));
    const keep = [...w.keys()].filter((i) => w[i] === 1);
    const a = crossValidateSurface(x1, x2, y, { candidates1: [2], candidates2: [3], folds: 3, weights: w });
    const b = crossValidateSurface(keep.map((i) => x1[i]!), keep.map((i) => x2[i]!), keep.map((i) => y[i]!), {
      candidates1: [2],
      candidates2: [3],
      folds: 3,
    });
    expect(a.scores[0]!.cvRmse).toBe(b.scores[0]!.cvRmse);
    expect(a.n).toBe(32);
  });
});

describe('suggesting a pair (one-SE rule of suggestKnots, size K1·K2)', () => {
  it('doc example: the simplest pair within one SE of the best', () => {
    const s = suggestSurfaceKnots([
      { knots1: 2, knots2: 2, cvRmse: 1.3, cvSe: 0.1 },
      { knots1: 4, knots2: 4, cvRmse: 1.0, cvSe: 0.2 },
      { knots1: 3, knots2: 2, cvRmse: 1.15, cvSe: 0.1 },
    ]);
    expect(s).toEqual({ knots1: 3, knots2: 2, index: 2, rule: 'one-se', threshold: 1.2 });
  });

  it('among pairs of equal size the lower cvRmse wins; classic (0) ranks last; "min" takes the minimiser', () => {
    const scores = [
      { knots1: 0, knots2: 0, cvRmse: 1.0, cvSe: 0.5 },
      { knots1: 2, knots2: 3, cvRmse: 1.4, cvSe: 0.1 },
      { knots1: 3, knots2: 2, cvRmse: 1.3, cvSe: 0.1 },
      { knots1: 5, knots2: 5, cvRmse: 1.1, cvSe: 0.1 },
    ];
    expect(suggestSurfaceKnots(scores).index).toBe(2);
    expect(suggestSurfaceKnots(scores, 'min').index).toBe(0);
  });
});

describe('errors', () => {
  const { x1, x2, y } = data(30, 2);
  it('bad candidates, folds and repeats', () => {
    expect(() => crossValidateSurface(x1, x2, y, { candidates1: [1] })).toThrow(
      'candidates1: needs knot counts that are 0 (every level) or whole numbers from 2 to 200; entry 1 is 1.',
    );
    expect(() => crossValidateSurface(x1, x2, y, { candidates2: [] })).toThrow('candidates2: needs at least one knot count; got none.');
    expect(() => crossValidateSurface(x1, x2, y, { candidates2: [3, 3] })).toThrow('candidates2: needs distinct knot counts; 3 appears more than once.');
    expect(() => crossValidateSurface(x1, x2, y, { folds: 1 })).toThrow('folds: needs a whole number from 2 to the number of rows used (30); got 1.');
    expect(() => crossValidateSurface(x1, x2, y, { tolerance: 1 })).toThrow('tolerance: needs a number in [1e-14, 1e-3]; got 1.');
    expect(() => crossValidateSurface(x1, x2, y, { seed: 0, repeats: 2 })).toThrow(
      'repeats: needs 1 when seed is 0 (without shuffling every repeat has the same folds); got 2.',
    );
  });

  it('a training set with a single level of an input names the fold', () => {
    // Seed 0, 2 folds: the first 3 rows are fold 1; the other training set has x2 = 5 only.
    expect(() =>
      crossValidateSurface([0, 1, 2, 3, 4, 5], [1, 2, 3, 5, 5, 5], [1, 2, 3, 4, 5, 6], { folds: 2, seed: 0, candidates1: [2], candidates2: [2] }),
    ).toThrow('folds: needs at least 2 distinct values of each input in every training set; the training rows of fold 1 of repeat 1 have 3 of x1 and 1 of x2.');
  });

  it('cancellation through an AbortSignal', () => {
    const ctl = new AbortController();
    let calls = 0;
    try {
      crossValidateSurface(x1, x2, y, {
        folds: 3,
        signal: ctl.signal,
        onProgress: () => {
          calls++;
          if (calls === 2) ctl.abort();
        },
      });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(RatchetError);
      expect((e as RatchetError).message).toBe('signal: cross-validation was cancelled; 2 of 75 fits were done.');
    }
  });
});
