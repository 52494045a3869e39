/**
 * Cross-validation benchmark (README, "Performance"): a scan over candidates 2…20 with 5 folds
 * (seed 1, one repeat) on the standard rising data, against the sum of the individual fits it
 * stands for — the 95 calls fitMonotone(training x, training y, { knots: K }) on the same 80 %
 * training sets, as a user would make them one by one (training rows in row order, each call
 * validating its input and returning fitted values and statistics). Goal: scan / fits ≤ 1.0 (the
 * scan shares the sorted training rows and fits knot tables only). Then the same for the classic
 * fit (candidate 0). The two sides are timed in alternating rounds, after the same number of
 * untimed warm-up rounds of each (12 at 1e4, 4 at 1e5); min and median of the CPU time are
 * reported (ms), and the ratio of the wall-time minima.
 */
import { crossValidate, fitMonotone, kFoldAssignment } from '../src/core/index.js';
import { risingData, timeRounds, type BenchRecord } from './harness.js';

const FOLDS = 5;
const SEED = 1;

export function run(emit: (r: BenchRecord) => void, options: { quick: boolean }): void {
  const sizes = options.quick ? [1e4] : [1e4, 1e5];
  const candidates = Array.from({ length: 19 }, (_, i) => i + 2);
  for (const n of sizes) {
    const { x, y } = risingData(n);
    const rounds = n >= 1e5 ? 5 : 9;
    // Warm-up rounds of each side before the timed ones: V8 optimises the hot functions only after
    // dozens of calls, and both sides should be timed as optimised code.
    const warm = n >= 1e5 ? 4 : 12;
    let sink = 0;
    // The same training sets, built outside the timing.
    const fold = kFoldAssignment(n, FOLDS, SEED, 0);
    const sets: { tx: Float64Array; ty: Float64Array }[] = [];
    for (let f = 0; f < FOLDS; f++) {
      const idx: number[] = [];
      for (let i = 0; i < n; i++) if (fold[i] !== f) idx.push(i);
      sets.push({ tx: Float64Array.from(idx, (i) => x[i]!), ty: Float64Array.from(idx, (i) => y[i]!) });
    }
    const t = timeRounds(
      {
        scan: () => {
          sink += crossValidate(x, y, { candidates, folds: FOLDS, seed: SEED }).scores[0]!.cvRmse;
        },
        fits: () => {
          for (const { tx, ty } of sets) for (const K of candidates) sink += fitMonotone(tx, ty, { knots: K }).knotY[0]!;
        },
      },
      rounds,
      warm,
    );
    const fits = FOLDS * candidates.length;
    emit({ case: 'cv scan 2..20 knots, 5 folds', n, knots: '2..20', ms: t.scan!.min, median_ms: t.scan!.median, fits });
    emit({ case: `sum of its ${fits} individual fits`, n, knots: '2..20', ms: t.fits!.min, median_ms: t.fits!.median });
    emit({ case: 'ratio scan/fits', n, knots: '2..20', ms: t.scan!.min - t.fits!.min, ratio: t.scan!.min / t.fits!.min, ratio_median: t.scan!.median / t.fits!.median, wall_ratio: t.scan!.wallMin / t.fits!.wallMin, goal: 1 });

    // The classic fit sorts its input: the scan hands it training rows already in x order.
    const c = timeRounds(
      {
        scan: () => {
          sink += crossValidate(x, y, { candidates: [0], folds: FOLDS, seed: SEED }).scores[0]!.cvRmse;
        },
        fits: () => {
          for (const { tx, ty } of sets) sink += fitMonotone(tx, ty).knotY[0]!;
        },
      },
      rounds,
      warm,
    );
    emit({ case: 'cv scan classic fit, 5 folds', n, knots: 0, ms: c.scan!.min, median_ms: c.scan!.median, fits: FOLDS });
    emit({ case: `sum of its ${FOLDS} individual fits`, n, knots: 0, ms: c.fits!.min, median_ms: c.fits!.median, ratio: c.scan!.min / c.fits!.min, ratio_median: c.scan!.median / c.fits!.median, sink: Number.isFinite(sink) ? 1 : 0 });
  }
}
