/**
 * Cross-validated scores of (K1, K2) knot pairs for the monotone surface, with the folds, seeds and
 * rules of the one-predictor cross-validation (src/core/cross-validate.ts, folds.ts, scores.ts).
 */
import { checkFolds, kFoldAssignment } from './folds.js';
import { checkSeed } from './prng.js';
import { foldStandardError, pooledR2, pooledRmse, suggestKnots, type SuggestionRule } from './scores.js';
import { fail } from './errors.js';
import type { CandidateScore } from './cross-validate.js';
import { checkSurfaceInputs, resolveAxisDirection, surfaceChecked, type AxisDirectionOption } from './surface.js';
import { evaluateLattice, locate } from './surface-lattice.js';
import { scaleExponents, timesPowerOfTwo } from './scale.js';

/** Options of {@link crossValidateSurface}. */
export interface SurfaceCrossValidationOptions {
  /** Knot counts along x1: 0 (every distinct level) or whole numbers 2 … 200; distinct. Default 2 … min(6, distinct x1). */
  candidates1?: ArrayLike<number>;
  /** Knot counts along x2, as `candidates1`. */
  candidates2?: ArrayLike<number>;
  /** Folds F, a whole number 2 ≤ F ≤ n (rows with positive weight). Default 5. */
  folds?: number;
  /** Repeats R, a whole number 1 … 1000 (1 when seed is 0). Default 1. */
  repeats?: number;
  /** Whole number 0 … 2⁵³ − 1; default 1; 0 = contiguous folds in row order. */
  seed?: number;
  /**
   * `'up'` (default), `'down'`, `'auto'` or `'none'` along x1, as in fitSurface; `'auto'` is
   * resolved in every fold from that fold's training rows only.
   */
  direction1?: AxisDirectionOption;
  /** Direction along x2, as `direction1`. */
  direction2?: AxisDirectionOption;
  /** Non-negative weight per row (default 1). Rows with weight 0 are left out entirely. */
  weights?: ArrayLike<number>;
  /** Tolerance of the iterative solver for large lattices (see fitSurface); default 1e-9. */
  tolerance?: number;
  /** Checked before every fit; when aborted, RatchetError CANCELLED. */
  signal?: AbortSignal;
  /** Called after every fit with the fraction of fits done, in (0, 1]. */
  onProgress?: (fraction: number) => void;
}

/** Cross-validated scores of one (K1, K2) pair. */
export interface SurfaceCandidateScore extends Omit<CandidateScore, 'knots'> {
  /** Knot counts of the pair along x1 and x2 (0 = every distinct level). The other fields are as
   *  in the one-predictor {@link CandidateScore}, computed over the same folds. */
  knots1: number;
  knots2: number;
}

/** Result of {@link crossValidateSurface}. */
export interface SurfaceCrossValidationResult {
  /** One entry per pair: candidates1 in the outer order, candidates2 inner. */
  scores: SurfaceCandidateScore[];
  folds: number;
  repeats: number;
  seed: number;
  /** Rows used (positive weight). */
  n: number;
  method: 'k-fold';
}

function distinctCount(x: Float64Array): number {
  return new Set(Array.from(x, (v) => v + 0)).size;
}

function checkPairCandidates(c: ArrayLike<number>, name: string): number[] {
  if (c === null || typeof c !== 'object' || typeof c.length !== 'number') fail('BAD_OPTION', name, 'needs a list of knot counts');
  if (c.length === 0) fail('BAD_OPTION', name, 'needs at least one knot count; got none');
  const out: number[] = [];
  for (let i = 0; i < c.length; i++) {
    const k = c[i];
    if (typeof k !== 'number' || !Number.isInteger(k) || k < 0 || k === 1 || k > 200) {
      fail('BAD_OPTION', name, `needs knot counts that are 0 (every level) or whole numbers from 2 to 200; entry ${i + 1} is ${String(k)}`);
    }
    if (out.includes(k)) fail('BAD_OPTION', name, `needs distinct knot counts; ${k} appears more than once`);
    out.push(k);
  }
  return out;
}

/**
 * K-fold cross-validation of (K1, K2) knot pairs for {@link fitSurface}.
 *
 * The split is the one-predictor rule exactly: rows with positive weight are numbered in row order
 * (zero-weight rows neither train nor score) and assigned by kFoldAssignment(n, F, seed, r) for
 * repeat r — contiguous blocks for seed 0 (scikit-learn's `KFold(shuffle=False)`), the SplitMix64
 * Fisher–Yates permutation otherwise — once per repeat, shared by every pair. Each pair is fitted
 * on the training rows alone (even knots span the training range of each input; knots 0 uses the
 * training levels; an `'auto'` direction is the sign of the rank correlation of that input with y
 * over the training rows, so the held-out rows never influence it) and scored on the held-out
 * rows, which get the surface's value (flat beyond the lattice). Scores are pooled as in crossValidate: cvRmse = √(Σwe²/Σw), cvMae = Σw|e|/Σw,
 * cvR2 = 1 − Σwe² / (R·SST), cvSe = sd of the F·R fold RMSEs / √(F·R). Pick a pair with
 * {@link suggestSurfaceKnots}.
 *
 * Cost: F·R·C1·C2 surface fits (see fitSurface) plus O(n) per fold.
 *
 * Edge cases: a training set with fewer than 2 distinct values of either input is an error naming
 * the fold, raised before any fit. With seed 0, repeats must be 1.
 *
 * @param x1 first predictor, finite.
 * @param x2 second predictor, finite, same length.
 * @param y responses, finite, same length.
 * @param options see {@link SurfaceCrossValidationOptions}.
 * @throws RatchetError EMPTY_INPUT, LENGTH_MISMATCH, NON_FINITE, BAD_WEIGHT, BAD_OPTION
 *   (candidates1/2, folds, repeats, seed, direction1/2, tolerance), TOO_FEW_POINTS, BAD_KNOTS,
 *   CANCELLED, NUMERICAL (as fitSurface).
 * @example crossValidateSurface([0, 1, 0, 1, 0, 1], [0, 0, 1, 1, 2, 2], [1, 2, 3, 4, 5, 6],
 *   { candidates1: [2], candidates2: [2, 3], folds: 3, seed: 0 }).scores.map((s) => s.knots2) // → [2, 3]
 */
export function crossValidateSurface(
  x1: ArrayLike<number>,
  x2: ArrayLike<number>,
  y: ArrayLike<number>,
  options: SurfaceCrossValidationOptions = {},
): SurfaceCrossValidationResult {
  const { xs1: a1, xs2: a2, ys: ay, ws: aw, d1, d2, tol } = checkSurfaceInputs(x1, x2, y, options);
  // Rows with positive weight, in row order.
  const keep: number[] = [];
  for (let i = 0; i < a1.length; i++) if (aw[i]! > 0) keep.push(i);
  const n = keep.length;
  const px1 = Float64Array.from(keep, (i) => a1[i]!);
  const px2 = Float64Array.from(keep, (i) => a2[i]!);
  const py = Float64Array.from(keep, (i) => ay[i]!);
  const pw = Float64Array.from(keep, (i) => aw[i]!);
  // Exact power-of-two rescaling of these copies (see src/core/scale.ts): y near 1e-100 with weights
  // near 1e-250 would otherwise underflow in every w·e² of the scores. Scores in units of y are
  // scaled back at the end.
  const scales = scaleExponents(py, pw);
  const yExp = scales.needed ? scales.yExp : 0;
  if (scales.needed) {
    for (let i = 0; i < py.length; i++) {
      py[i] = timesPowerOfTwo(py[i]!, -scales.yExp);
      pw[i] = timesPowerOfTwo(pw[i]!, -scales.wExp);
    }
  }
  const up = (v: number): number => timesPowerOfTwo(v, yExp);
  const dist1 = distinctCount(px1);
  const dist2 = distinctCount(px2);
  if (dist1 < 2) fail('TOO_FEW_POINTS', 'x1', `needs at least 2 distinct values with positive weight to cross-validate; got ${dist1}`);
  if (dist2 < 2) fail('TOO_FEW_POINTS', 'x2', `needs at least 2 distinct values with positive weight to cross-validate; got ${dist2}`);
  const defaults = (d: number): number[] => Array.from({ length: Math.min(6, d) - 1 }, (_, k) => k + 2);
  const c1 = options.candidates1 === undefined ? defaults(dist1) : checkPairCandidates(options.candidates1, 'candidates1');
  const c2 = options.candidates2 === undefined ? defaults(dist2) : checkPairCandidates(options.candidates2, 'candidates2');
  const folds = checkFolds(options.folds ?? 5, n);
  const repeats = options.repeats ?? 1;
  if (typeof repeats !== 'number' || !Number.isInteger(repeats) || repeats < 1 || repeats > 1000) {
    fail('BAD_OPTION', 'repeats', `needs a whole number from 1 to 1000; got ${String(repeats)}`);
  }
  const seed = checkSeed(options.seed ?? 1);
  if (seed === 0 && repeats > 1) {
    fail('BAD_OPTION', 'repeats', `needs 1 when seed is 0 (without shuffling every repeat has the same folds); got ${repeats}`);
  }
  let mean = 0;
  let sumW = 0;
  for (let i = 0; i < n; i++) {
    mean += pw[i]! * py[i]!;
    sumW += pw[i]!;
  }
  mean /= sumW;
  let sst = 0;
  for (let i = 0; i < n; i++) sst += pw[i]! * (py[i]! - mean) ** 2;

  // Tasks, and the distinct-values check of every training set before any fit.
  const tasks: { repeat: number; fold: number; label: Uint32Array }[] = [];
  for (let r = 0; r < repeats; r++) {
    const label = kFoldAssignment(n, folds, seed, r);
    for (let f = 0; f < folds; f++) tasks.push({ repeat: r, fold: f, label });
  }
  for (const t of tasks) {
    const s1 = new Set<number>();
    const s2 = new Set<number>();
    for (let i = 0; i < n; i++) {
      if (t.label[i] !== t.fold) {
        s1.add(px1[i]! + 0);
        s2.add(px2[i]! + 0);
      }
    }
    if (s1.size < 2 || s2.size < 2) {
      fail('TOO_FEW_POINTS', 'folds', `needs at least 2 distinct values of each input in every training set; the training rows of fold ${t.fold + 1} of repeat ${t.repeat + 1} have ${s1.size} of x1 and ${s2.size} of x2`);
    }
  }

  const pairs: [number, number][] = [];
  for (const k1 of c1) for (const k2 of c2) pairs.push([k1, k2]);
  const acc = pairs.map(() => ({ sse: 0, sae: 0, sw: 0, train: 0, foldRmse: [] as number[] }));
  const total = tasks.length * pairs.length;
  let done = 0;
  const cancelled = (): never => fail('CANCELLED', 'signal', `cross-validation was cancelled; ${done} of ${total} fits were done`);
  for (const t of tasks) {
    const tr: number[] = [];
    const te: number[] = [];
    for (let i = 0; i < n; i++) (t.label[i] === t.fold ? te : tr).push(i);
    const pick = (src: Float64Array, idx: number[]) => Float64Array.from(idx, (i) => src[i]!);
    const tx1 = pick(px1, tr);
    const tx2 = pick(px2, tr);
    const ty = pick(py, tr);
    const tw = pick(pw, tr);
    const ex1 = pick(px1, te);
    const ex2 = pick(px2, te);
    // 'auto' directions from this fold's training rows only (no leakage), once for every pair.
    const fd1 = resolveAxisDirection(tx1, ty, tw, d1);
    const fd2 = resolveAxisDirection(tx2, ty, tw, d2);
    for (let c = 0; c < pairs.length; c++) {
      if (options.signal?.aborted) cancelled();
      const [k1, k2] = pairs[c]!;
      const model = surfaceChecked(tx1, tx2, ty, tw, k1, k2, fd1, fd2, tol);
      const pred = evaluateLattice(model.values, model.knots1.length, locate(model.knots1, model.knots2, ex1, ex2));
      let sse = 0;
      let sae = 0;
      let sw = 0;
      for (let j = 0; j < te.length; j++) {
        const e = py[te[j]!]! - pred[j]!;
        const w = pw[te[j]!]!;
        sse += w * e * e;
        sae += w * Math.abs(e);
        sw += w;
      }
      const a = acc[c]!;
      a.sse += sse;
      a.sae += sae;
      a.sw += sw;
      a.train += model.stats.rmse;
      a.foldRmse.push(Math.sqrt(sse / sw));
      done++;
      options.onProgress?.(done / total);
    }
  }
  const scores = pairs.map(([k1, k2], c): SurfaceCandidateScore => {
    const a = acc[c]!;
    const k = a.foldRmse.length;
    return {
      knots1: k1,
      knots2: k2,
      cvRmse: up(pooledRmse(a.sse, a.sw)),
      cvSe: up(foldStandardError(a.foldRmse)),
      cvR2: pooledR2(a.sse, repeats * sst),
      cvMae: up(a.sae / a.sw),
      trainRmse: up(a.train / k),
      foldRmse: a.foldRmse.map(up),
    };
  });
  return { scores, folds, repeats, seed, n, method: 'k-fold' };
}

/** Result of {@link suggestSurfaceKnots}. */
export interface SurfaceSuggestion {
  knots1: number;
  knots2: number;
  /** Index of the suggested pair in the scores given. */
  index: number;
  rule: SuggestionRule;
  threshold: number;
}

/**
 * Suggests a (K1, K2) pair from cross-validation scores with the one-predictor rules
 * (suggestKnots): `'one-se'` (default) — the simplest pair with cvRmse ≤ min cvRmse + its cvSe;
 * `'min'` — the minimiser. "Simplest" means the fewest lattice values K1·K2; a pair using every
 * level on an axis (0) ranks after every pair of counts; among pairs of equal size the lower cvRmse
 * wins. Cost O(C log C).
 *
 * @throws RatchetError BAD_OPTION (no scores, a non-finite cvRmse, an unknown rule).
 * @example suggestSurfaceKnots([{ knots1: 2, knots2: 2, cvRmse: 1.3, cvSe: 0.1 },
 *   { knots1: 4, knots2: 4, cvRmse: 1.0, cvSe: 0.2 }, { knots1: 3, knots2: 2, cvRmse: 1.15, cvSe: 0.1 }])
 *   // → { knots1: 3, knots2: 2, index: 2, rule: 'one-se', threshold: 1.2 }
 */
export function suggestSurfaceKnots(
  scores: readonly Pick<SurfaceCandidateScore, 'knots1' | 'knots2' | 'cvRmse' | 'cvSe'>[],
  rule: SuggestionRule = 'one-se',
): SurfaceSuggestion {
  if (!scores || scores.length === 0) fail('BAD_OPTION', 'scores', 'needs at least one candidate score; got none');
  const size = (s: { knots1: number; knots2: number }): number => (s.knots1 === 0 || s.knots2 === 0 ? 0 : s.knots1 * s.knots2);
  const rank = (v: number): number => (v === 0 ? Infinity : v);
  // Sorted by size, then cvRmse, so suggestKnots' "first simplest" is the best of its size.
  const order = scores.map((_, i) => i);
  order.sort((i, j) => rank(size(scores[i]!)) - rank(size(scores[j]!)) || scores[i]!.cvRmse - scores[j]!.cvRmse || i - j);
  const s = suggestKnots(
    order.map((i) => ({ knots: size(scores[i]!), cvRmse: scores[i]!.cvRmse, cvSe: scores[i]!.cvSe })),
    rule,
  );
  const index = order[s.index]!;
  return { knots1: scores[index]!.knots1, knots2: scores[index]!.knots2, index, rule: s.rule, threshold: s.threshold };
}
