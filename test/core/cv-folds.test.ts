/**
 * Fold and hold-out assignment (src/core/folds.ts). Checked against scikit-learn 1.2.1
 * (`KFold(shuffle=False)`, `train_test_split(shuffle=False)`) and the independent Python
 * SplitMix64 / Fisher–Yates of test/reference/gen_cv.py (fixture cv_prng.json,
 * `/usr/bin/python3 test/reference/gen_cv.py`).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { kFoldAssignment } from '../../src/core/index.js';
import { foldSizes, holdoutAssignment, holdoutSize, repeatState, seededPermutation } from '../../src/core/folds.js';
import prng from '../reference/fixtures/cv_prng.json' with { type: 'json' };

describe('fold sizes', () => {
  it('are ⌊n/F⌋ with the first n mod F folds one larger (scikit-learn KFold)', () => {
    expect(foldSizes(10, 3)).toEqual([4, 3, 3]);
    expect(foldSizes(7, 3)).toEqual([3, 2, 2]);
    expect(foldSizes(10, 5)).toEqual([2, 2, 2, 2, 2]);
    expect(foldSizes(5, 5)).toEqual([1, 1, 1, 1, 1]);
  });
});

describe('seed 0: contiguous blocks in row order', () => {
  it('fold f holds rows [start_f, start_f + size_f) (hand-checked: n = 10, F = 3 → 4, 3, 3 rows)', () => {
    expect(Array.from(kFoldAssignment(10, 3, 0))).toEqual([0, 0, 0, 0, 1, 1, 1, 2, 2, 2]);
  });

  it('matches sklearn KFold(n_splits=F, shuffle=False) on the fixture cases', () => {
    for (const c of prng.kfold.filter((k) => k.seed === 0)) {
      expect(Array.from(kFoldAssignment(c.n, c.folds, 0, c.repeat))).toEqual(c.fold);
    }
  });

  it('hold-out with seed 0 tests the last ⌈p·n⌉ rows, as train_test_split(shuffle=False)', () => {
    expect(Array.from(holdoutAssignment(10, 0.25, 0))).toEqual([0, 0, 0, 0, 0, 0, 0, 1, 1, 1]);
    for (const h of prng.holdout.filter((k) => k.seed === 0)) {
      const test = holdoutAssignment(h.n, h.testFraction, 0);
      expect(Array.from(test.keys()).filter((i) => test[i] === 1)).toEqual(h.test);
    }
  });

  it('uses the floating-point product in ⌈p·n⌉ as scikit-learn does (0.28 · 25 = 7.000000000000001 → 8 test rows)', () => {
    expect(0.28 * 25).toBeGreaterThan(7);
    expect(holdoutSize(25, 0.28)).toBe(8);
    expect(prng.holdout.find((h) => h.n === 25 && h.testFraction === 0.28)!.test.length).toBe(8);
  });
});

describe('seeded splits (SplitMix64 + Fisher–Yates)', () => {
  it('repeat r starts from output r + 1 of SplitMix64(seed) — equal to the Python implementation', () => {
    for (const [seed, states] of Object.entries(prng.repeatStates)) {
      states.forEach((s, r) => {
        const [hi, lo] = repeatState(Number(seed), r);
        expect(((BigInt(hi) << 32n) | BigInt(lo)).toString(), `seed ${seed} repeat ${r}`).toBe(s);
      });
    }
  });

  it('permutations equal the Python Fisher–Yates (n = 7 … 1000, several seeds and repeats)', () => {
    for (const c of prng.permutations) {
      expect(Array.from(seededPermutation(c.n, c.seed, c.repeat)), `n ${c.n} seed ${c.seed} repeat ${c.repeat}`).toEqual(c.perm);
    }
  });

  it('K-fold labels and hold-out test sets equal the Python ones', () => {
    for (const c of prng.kfold.filter((k) => k.seed !== 0)) {
      expect(Array.from(kFoldAssignment(c.n, c.folds, c.seed, c.repeat))).toEqual(c.fold);
    }
    for (const h of prng.holdout.filter((k) => k.seed !== 0)) {
      const test = holdoutAssignment(h.n, h.testFraction, h.seed);
      expect(Array.from(test.keys()).filter((i) => test[i] === 1)).toEqual(h.test);
    }
  });

  it('every permutation is a permutation, identical on a second run, and repeats differ', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 300 }), fc.integer({ min: 1, max: 2 ** 40 }), (n, seed) => {
        const p = seededPermutation(n, seed, 0);
        const again = seededPermutation(n, seed, 0);
        const sorted = Array.from(p).sort((a, b) => a - b);
        return sorted.every((v, i) => v === i) && p.every((v, i) => v === again[i]);
      }),
    );
    expect(Array.from(seededPermutation(50, 7, 0))).not.toEqual(Array.from(seededPermutation(50, 7, 1)));
  });

  it('every fold gets the KFold sizes, whatever the seed (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 200 }), fc.integer({ min: 2, max: 12 }), fc.nat(), fc.nat({ max: 5 }), (n, F, seed, r) => {
        fc.pre(F <= n);
        const fold = kFoldAssignment(n, F, seed, r);
        const counts = new Array(F).fill(0);
        for (const f of fold) counts[f]++;
        return counts.every((c, f) => c === foldSizes(n, F)[f]);
      }),
    );
  });
});

describe('bad split options', () => {
  it('folds outside 2 … n, or fractional, are BAD_OPTION naming folds', () => {
    expect(() => kFoldAssignment(10, 1, 0)).toThrow('folds: needs a whole number from 2 to the number of rows used (10); got 1.');
    expect(() => kFoldAssignment(10, 11, 0)).toThrow('folds: needs a whole number from 2 to the number of rows used (10); got 11.');
    expect(() => kFoldAssignment(10, 2.5, 0)).toThrow('folds: needs a whole number from 2 to the number of rows used (10); got 2.5.');
  });

  it('a test fraction outside (0, 1), or one that leaves no training row, is BAD_OPTION naming testFraction', () => {
    for (const p of [0, 1, -0.1, 1.5, NaN]) {
      expect(() => holdoutSize(10, p)).toThrow(`testFraction: needs a number strictly between 0 and 1; got ${p}.`);
    }
    expect(() => holdoutSize(2, 0.9)).toThrow('testFraction: needs to leave at least one training row of 2; got 0.9 (2 test rows).');
  });
});
