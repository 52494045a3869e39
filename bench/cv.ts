/**
 * Cross-validation benchmark: a scan over candidates 2…40 with 10 folds (seed 1, one
 * repeat) on the standard rising data, against the sum of the individual fits it performs — the
 * 390 calls fitMonotone(training x, training y, { knots: K }) on the same training sets, as a user
 * would make them one by one (training rows in row order, each call validating its input).
 * Goal: scan / fits ≤ 1.5 (no per-candidate overhead beyond the fits). The two are timed alternately
 * (median of several runs each) so that other load on the machine hits both alike.
 */
import { crossValidate, fitMonotone, kFoldAssignment } from '../src/core/index.js';
import { risingData, timePair, type BenchRecord } from './harness.js';


const FOLDS = 10;
const SEED = 1;

export function run(emit: (r: BenchRecord) => void, options: { quick: boolean }): void {
  const sizes = options.quick ? [1e4] : [1e4, 1e5];
  const candidates = Array.from({ length: 39 }, (_, i) => i + 2);
  for (const n of sizes) {
    const { x, y } = risingData(n);
    const runs = n >= 1e5 ? 5 : 9;
    let sink = 0;
    // The same training sets, built outside the timing.
    const fold = kFoldAssignment(n, FOLDS, SEED, 0);
    const sets: { tx: Float64Array; ty: Float64Array }[] = [];
    for (let f = 0; f < FOLDS; f++) {
      const idx: number[] = [];
      for (let i = 0; i < n; i++) if (fold[i] !== f) idx.push(i);
      sets.push({ tx: Float64Array.from(idx, (i) => x[i]!), ty: Float64Array.from(idx, (i) => y[i]!) });
    }
    const [scanMs, fitsMs] = timePair(
      () => {
        sink += crossValidate(x, y, { candidates, folds: FOLDS, seed: SEED }).scores[0]!.cvRmse;
      },
      () => {
        for (const { tx, ty } of sets) {
          for (const K of candidates) sink += fitMonotone(tx, ty, { knots: K }).knotY[0]!;
        }
      },
      runs,
    );
    const fits = FOLDS * candidates.length;
    emit({ case: 'cv scan 2..40 knots, 10 folds', n, knots: '2..40', ms: scanMs, fits, perFitMs: scanMs / fits });
    emit({ case: 'sum of its 390 individual fits', n, knots: '2..40', ms: fitsMs, perFitMs: fitsMs / fits });
    emit({ case: 'ratio scan/fits (ms = difference)', n, knots: '2..40', ms: scanMs - fitsMs, ratio: scanMs / fitsMs, goal: 1.5 });

    // The classic fit sorts its input: the scan hands it training rows already in x order.
    const [classicMs, classicFitsMs] = timePair(
      () => {
        sink += crossValidate(x, y, { candidates: [0], folds: FOLDS, seed: SEED }).scores[0]!.cvRmse;
      },
      () => {
        for (const { tx, ty } of sets) sink += fitMonotone(tx, ty).knotY[0]!;
      },
      runs,
    );
    emit({ case: 'cv scan classic fit, 10 folds', n, knots: 0, ms: classicMs, fits: FOLDS });
    emit({ case: 'sum of its 10 individual fits', n, knots: 0, ms: classicFitsMs, ratio: classicMs / classicFitsMs, sink: Number.isFinite(sink) ? 1 : 0 });
  }
}
