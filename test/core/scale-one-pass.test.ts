/**
 * The one-pass classic fit across its three scale regimes: no rescaling (y and weights within
 * 2^±100 of 1), rescaling by powers of two as y and w are gathered, and the pooled path with PAVA
 * on block means (weights spread beyond 2^600; see src/core/scale.ts). Multiplying y by 2^k and the
 * weights by 2^j is exact, so the fit must be the same numbers times 2^k bit for bit on whichever
 * path each scale lands — the invariance of least squares under a change of units (common
 * practice). Rows of weight 0 must not influence the fit whatever their y (the definition of the
 * weighted problem, README, "Zero weights, ties, and out-of-range x").
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { isotonicRegression } from '../../src/core/isotonic.js';

const SEED = 20261201;

/** y · 2^k, exact for the k used here (no overflow, no subnormal results). */
function times2(v: ArrayLike<number>, k: number): number[] {
  return Array.from(v, (a) => a * 2 ** k);
}

describe('one-pass classic fit, scale regimes', () => {
  it('y × 2^k for k from -140 to 140 (crossing the 2^±100 rescaling trigger) gives fitted values × 2^k exactly, weighted and unweighted', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 9 }), fc.integer({ min: -40, max: 40 }), fc.integer({ min: 1, max: 6 })), { minLength: 4, maxLength: 30 }),
        fc.integer({ min: -140, max: 140 }),
        fc.boolean(),
        (rows, k, weighted) => {
          fc.pre(new Set(rows.map((r) => r[0])).size >= 2);
          const x = rows.map((r) => r[0]);
          const y = rows.map((r) => r[1] + 0.375);
          const w = weighted ? rows.map((r) => r[2] / 4) : undefined;
          const base = isotonicRegression(x, y, { weights: w });
          const scaled = isotonicRegression(x, times2(y, k), { weights: w });
          expect(Array.from(scaled.fitted)).toEqual(times2(base.fitted, k));
          expect(Array.from(scaled.knotY)).toEqual(times2(base.knotY, k));
          expect(Array.from(scaled.weight)).toEqual(Array.from(base.weight));
          expect(scaled.levels).toBe(base.levels);
        },
      ),
      { seed: SEED, numRuns: 300 },
    );
  });

  it('weights × 2^j for j from -300 to 300 (crossing the trigger) leave the fitted values unchanged and multiply the pooled weights by 2^j exactly', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 9 }), fc.integer({ min: -40, max: 40 }), fc.integer({ min: 1, max: 6 })), { minLength: 4, maxLength: 30 }),
        fc.integer({ min: -300, max: 300 }),
        (rows, j) => {
          fc.pre(new Set(rows.map((r) => r[0])).size >= 2);
          const x = rows.map((r) => r[0]);
          const y = rows.map((r) => r[1] + 0.375);
          const w = rows.map((r) => r[2] / 4);
          const base = isotonicRegression(x, y, { weights: w });
          const scaled = isotonicRegression(x, y, { weights: times2(w, j) });
          expect(Array.from(scaled.fitted)).toEqual(Array.from(base.fitted));
          expect(Array.from(scaled.weight)).toEqual(times2(base.weight, j));
        },
      ),
      { seed: SEED, numRuns: 300 },
    );
  });

  it('a zero-weight row with y = 1e308 leaves the fit of the other rows exactly as without it, on the plain path and the rescaled one', () => {
    for (const unit of [1, 2 ** -110]) {
      const x = [1, 2, 3, 4, 5, 6];
      const y = [3, 1, 2, 7, 5, 6].map((v) => v * unit);
      const withRow = isotonicRegression([...x, 3.5], [...y, 1e308], { weights: [1, 1, 1, 2, 1, 1, 0] });
      const without = isotonicRegression(x, y, { weights: [1, 1, 1, 2, 1, 1] });
      expect(Array.from(withRow.fitted.subarray(0, 6))).toEqual(Array.from(without.fitted));
      // Its own value: halfway between the values at x = 3 and x = 4 (linear interpolation).
      expect(withRow.fitted[6]).toBe((without.fitted[2]! + without.fitted[3]!) / 2);
      expect(Array.from(withRow.fitted)).not.toContain(NaN);
    }
  });

  it('weights spread over 2^800 (the block-mean path) fit [1, 3, 2, 4] with weights [2^400, 2^-400, 2^-400, 1] as [1, 2.5, 2.5, 4] with the pooled weights returned exactly', () => {
    // Worked by hand: the light rows 2 and 3 violate the order and pool to their mean 2.5; row 1
    // (mean 1) and row 4 (mean 4) are in order with it, whatever the weights.
    const fit = isotonicRegression([1, 2, 3, 4], [1, 3, 2, 4], { weights: [2 ** 400, 2 ** -400, 2 ** -400, 1] });
    expect(Array.from(fit.fitted)).toEqual([1, 2.5, 2.5, 4]);
    expect(Array.from(fit.weight)).toEqual([2 ** 400, 2 ** -400, 2 ** -400, 1]);
  });
});
