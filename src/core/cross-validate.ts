/**
 * Cross-validated scores of candidate knot counts: repeated K-fold and a single hold-out split.
 */
import type { Direction, DirectionOption } from './types.js';
import { boundsPair, finiteArray, sameLength, weightArray } from './validate.js';
import { resolveDirection } from './direction.js';
import { sortOrder, sortRows } from './sort-order.js';
import { checkShapeSpec, fitChecked, type KnotSpec, type ShapeSpec } from './model.js';
import { smoothTableAt } from './smooth-table.js';
import type { Curvature, Degree } from './shape-fit.js';
import { knotChecked } from './knot-fit.js';
import { isotonicChecked } from './isotonic.js';
import { fitStatistics } from './statistics.js';
import { checkFolds, holdoutAssignment, kFoldAssignment } from './folds.js';
import { checkSeed } from './prng.js';
import { fail } from './errors.js';
import { MAX_KNOTS, quantileKnotsSorted } from './knots.js';
import { scaleExponents, timesPowerOfTwo } from './scale.js';
import { foldStandardError, holdoutStandardError, pooledR2, pooledRmse } from './scores.js';

/** Where the knots of a candidate count K go inside each training set. */
export type KnotPlacement = 'even' | 'quantile';

/** Options of {@link crossValidate}. */
export interface CrossValidationOptions {
  /**
   * Knot counts to compare: whole numbers ≥ 2, or 0 for the classic fit; distinct, at least one.
   * Default {@link defaultCandidates}: 2 … min(20, number of distinct x).
   */
  candidates?: ArrayLike<number>;
  /** Number of folds F, a whole number 2 ≤ F ≤ n (n = rows with positive weight). Default 5. */
  folds?: number;
  /** Number of repeats R, a whole number ≥ 1 (must be 1 when seed is 0). Default 1. */
  repeats?: number;
  /** Whole number 0 … 2⁵³ − 1. Default 1. 0 = no shuffling (contiguous blocks in row order). */
  seed?: number;
  /** `'up'` (default), `'down'`, or `'auto'` — resolved on each training set separately. */
  direction?: DirectionOption;
  /** Non-negative weight per row (default all 1). Rows with weight 0 are left out entirely. */
  weights?: ArrayLike<number>;
  /** Bounds on fitted values, as in fitMonotone. */
  lower?: number;
  upper?: number;
  /**
   * Knot positions for counts K ≥ 2: `'even'` (default) — evenly spaced over the training x
   * range; `'quantile'` — at the training x quantiles (the rule of quantileKnots).
   */
  placement?: KnotPlacement;
  /**
   * Shape of every candidate knot fit, as in fitMonotone: curvature −1 concave, 0 any (default),
   * 1 convex; degree 1 piecewise linear (default), 2 smooth. With a shape, candidate 0 (the
   * classic fit, which has no shape) is RatchetError BAD_OPTION.
   */
  curvature?: Curvature;
  degree?: Degree;
  /** Cancellation: checked before every fit; when aborted, RatchetError CANCELLED. */
  signal?: AbortSignal;
  /** Called after every fit with the fraction of fits done, in (0, 1]; the last call is 1. */
  onProgress?: (fraction: number) => void;
}

/** Cross-validated scores of one candidate. */
export interface CandidateScore {
  /** Knot count (0 = classic fit). */
  knots: number;
  /** √(pooled weighted mean of held-out squared errors over all folds and repeats). */
  cvRmse: number;
  /**
   * Standard error of cvRmse: sd of the per-fold RMSEs (denominator F·R − 1) / √(F·R). Hold-out:
   * delta-method SE of the test RMSE (see {@link holdoutValidate}). The folds share training rows,
   * so the per-fold RMSEs are correlated and this SE is optimistic, more so with repeats (memory:
   * Bengio & Grandvalet 2004, JMLR 5).
   */
  cvSe: number;
  /** 1 − pooled held-out SSE / (R · Σ w (y − ȳ_w)² over all rows). */
  cvR2: number;
  /** Pooled weighted mean absolute held-out error. */
  cvMae: number;
  /** Mean over the F·R fits of the weighted training RMSE (compare with cvRmse for over-fit). */
  trainRmse: number;
  /** Held-out RMSE of every fit, repeat by repeat, fold by fold (length F·R; hold-out: 1). */
  foldRmse: number[];
}

/** Result of {@link crossValidate} and {@link holdoutValidate}. */
export interface CrossValidationResult {
  /** One entry per candidate, in the order given. */
  scores: CandidateScore[];
  /** F (hold-out: 1). */
  folds: number;
  /** R (hold-out: 1). */
  repeats: number;
  /** Seed used. */
  seed: number;
  /** Rows used (rows with positive weight). */
  n: number;
  /** `'k-fold'` or `'holdout'`. */
  method: 'k-fold' | 'holdout';
  /** Hold-out only: the test fraction and the number of test rows. */
  testFraction?: number;
  testRows?: number;
}

/** Options of {@link holdoutValidate}. */
export interface HoldoutOptions extends Omit<CrossValidationOptions, 'folds' | 'repeats'> {
  /** Share of rows held out, strictly between 0 and 1; test rows = ⌈testFraction · n⌉. Default 0.25. */
  testFraction?: number;
}

/**
 * Default candidate knot counts: 2, 3, …, min(20, number of distinct x). O(n) (radix order).
 *
 * @param x finite numbers.
 * @throws RatchetError EMPTY_INPUT, NON_FINITE, TOO_FEW_POINTS (fewer than 2 distinct x).
 * @example defaultCandidates([1, 2, 2, 3]) // → [2, 3]
 */
export function defaultCandidates(x: ArrayLike<number>): number[] {
  const xs = finiteArray('x', x);
  const order = sortOrder(xs);
  let distinct = 1;
  for (let k = 1; k < xs.length; k++) if (xs[order[k]!]! !== xs[order[k - 1]!]!) distinct++;
  if (distinct < 2) fail('TOO_FEW_POINTS', 'x', `needs at least 2 distinct values to compare knot counts; got ${distinct}`);
  const out: number[] = [];
  for (let k = 2; k <= Math.min(20, distinct); k++) out.push(k);
  return out;
}

/** Validated candidate list: distinct entries, each 0 or a whole number 2 … MAX_KNOTS. */
function checkCandidates(candidates: ArrayLike<number>, shape: ShapeSpec): number[] {
  if (candidates === null || typeof candidates !== 'object' || typeof candidates.length !== 'number') {
    fail('BAD_OPTION', 'candidates', 'needs a list of knot counts');
  }
  if (candidates.length === 0) fail('BAD_OPTION', 'candidates', 'needs at least one knot count; got none');
  const out: number[] = [];
  const seen = new Set<number>();
  for (let i = 0; i < candidates.length; i++) {
    const k = candidates[i];
    if (typeof k !== 'number' || !Number.isInteger(k) || k < 0 || k === 1 || k > MAX_KNOTS) {
      fail('BAD_OPTION', 'candidates', `needs knot counts that are 0 (classic fit) or whole numbers from 2 to ${MAX_KNOTS}; entry ${i + 1} is ${String(k)}`);
    }
    if (k === 0 && (shape.curvature !== 0 || shape.degree !== 1)) {
      fail('BAD_OPTION', 'candidates', `needs knot counts ≥ 2 with a curvature or degree option (the classic fit has no shape); entry ${i + 1} is 0`);
    }
    if (seen.has(k)) fail('BAD_OPTION', 'candidates', `needs distinct knot counts; ${k} appears more than once`);
    seen.add(k);
    out.push(k);
  }
  return out;
}

function checkRepeats(repeats: number): number {
  if (typeof repeats !== 'number' || !Number.isInteger(repeats) || repeats < 1 || repeats > 1000) {
    fail('BAD_OPTION', 'repeats', `needs a whole number from 1 to 1000; got ${String(repeats)}`);
  }
  return repeats;
}

function checkPlacement(placement: KnotPlacement | undefined): KnotPlacement {
  if (placement === undefined || placement === 'even') return 'even';
  if (placement === 'quantile') return 'quantile';
  return fail('BAD_OPTION', 'placement', `needs 'even' or 'quantile'; got ${String(placement)}`);
}

/** Rows with positive weight, sorted by x once (stable), with their row-order index. */
interface Prepared {
  n: number;
  /** x, y, w in ascending x order. */
  sx: Float64Array;
  sy: Float64Array;
  sw: Float64Array;
  /** False when no weights were given: the fits then take their unit-weight paths. */
  weighted: boolean;
  /** rowOf[k] = row-order index (among positive-weight rows) of sorted position k. */
  rowOf: Uint32Array;
  direction: DirectionOption;
  lower: number;
  upper: number;
  placement: KnotPlacement;
  shape: ShapeSpec;
  /** Σ w (y − ȳ_w)² over all used rows. */
  sst: number;
  /**
   * y (and the bounds) are held divided by 2^yExp and the weights by a power of two, so that no
   * sum underflows or overflows whatever the units (see src/core/scale.ts); scores in units of y
   * are multiplied back by 2^yExp ({@link inUnitsOfY}). 0 when no rescaling was needed.
   */
  yExp: number;
}

function prepare(x: ArrayLike<number>, y: ArrayLike<number>, options: CrossValidationOptions): Prepared {
  const xs = finiteArray('x', x);
  sameLength('x', xs.length, 'y', y);
  const ys = finiteArray('y', y);
  const ws = weightArray(xs.length, options.weights);
  let [lower, upper] = boundsPair(options.lower, options.upper);
  // Exact power-of-two rescaling of the copies (y near 1e-100 with weights near 1e-250 would
  // otherwise underflow in every w·r² of the scores).
  const scales = scaleExponents(ys, ws);
  const yExp = scales.needed ? scales.yExp : 0;
  if (scales.needed) {
    for (let i = 0; i < ys.length; i++) {
      ys[i] = timesPowerOfTwo(ys[i]!, -scales.yExp);
      ws[i] = timesPowerOfTwo(ws[i]!, -scales.wExp);
    }
    lower = timesPowerOfTwo(lower, -scales.yExp);
    upper = timesPowerOfTwo(upper, -scales.yExp);
  }
  const direction = options.direction ?? 'up';
  if (direction !== 'up' && direction !== 'down' && direction !== 'auto') {
    fail('BAD_OPTION', 'direction', `needs 'up', 'down' or 'auto'; got ${String(direction)}`);
  }
  const placement = checkPlacement(options.placement);
  const shape = checkShapeSpec(options.curvature, options.degree, 2);
  // Zero-weight rows neither train nor score: drop them before the split.
  let n = 0;
  for (let i = 0; i < xs.length; i++) if (ws[i]! > 0) n++;
  const px = new Float64Array(n);
  const py = new Float64Array(n);
  const pw = new Float64Array(n);
  for (let i = 0, k = 0; i < xs.length; i++) {
    if (ws[i]! > 0) {
      px[k] = xs[i]!;
      py[k] = ys[i]!;
      pw[k] = ws[i]!;
      k++;
    }
  }
  // The sort hands back the sorted x (−0 as +0) besides the order; both live in its scratch
  // memory, which the fits below reuse, so they are copied out (sequential copies, where reading x
  // through the order would be a random gather).
  const rows = sortRows(px, true);
  const order = rows.order.slice();
  const sx = rows.sorted!.slice();
  const sy = new Float64Array(n);
  const sw = new Float64Array(n);
  let sumW = 0;
  let sumWY = 0;
  const weighted = options.weights !== undefined && options.weights !== null;
  if (weighted) {
    for (let k = 0; k < n; k++) {
      const i = order[k]!;
      sy[k] = py[i]!;
      sw[k] = pw[i]!;
      sumW += sw[k]!;
      sumWY += sw[k]! * sy[k]!;
    }
  } else {
    // Unit weights (all equal, even after rescaling): no gather of the weights.
    const w = n > 0 ? pw[0]! : 1;
    sw.fill(w);
    for (let k = 0; k < n; k++) {
      sy[k] = py[order[k]!]!;
      sumW += w;
      sumWY += w * sy[k]!;
    }
  }
  if (n < 2 || !(sx[0]! < sx[n - 1]!)) {
    fail('TOO_FEW_POINTS', 'x', 'needs at least 2 distinct values with positive weight to cross-validate');
  }
  const mean = sumWY / sumW;
  let sst = 0;
  for (let k = 0; k < n; k++) sst += sw[k]! * (sy[k]! - mean) ** 2;
  return { n, sx, sy, sw, weighted, rowOf: order, direction, lower, upper, placement, shape, sst, yExp };
}

/** Scores back in the units of y after {@link prepare}'s rescaling (R² has no units). */
function inUnitsOfY(scores: CandidateScore[], yExp: number): CandidateScore[] {
  if (yExp === 0) return scores;
  const up = (v: number) => timesPowerOfTwo(v, yExp);
  return scores.map((s) => ({
    ...s,
    cvRmse: up(s.cvRmse),
    cvSe: up(s.cvSe),
    cvMae: up(s.cvMae),
    trainRmse: up(s.trainRmse),
    foldRmse: s.foldRmse.map(up),
  }));
}

/**
 * One evaluation task: held-out rows are those whose `label` (indexed by row-order position)
 * equals `fold`; every other row trains.
 */
interface Task {
  repeat: number;
  fold: number;
  label: Uint32Array | Uint8Array;
}

/** Throws TOO_FEW_POINTS unless the training rows of every task span at least 2 distinct x. */
function checkTrainingSets(p: Prepared, tasks: Task[], what: (t: Task) => string): void {
  const { n, sx, rowOf } = p;
  for (const t of tasks) {
    // Smallest and largest training x: first/last sorted position not in the held-out fold.
    let a = 0;
    while (a < n && t.label[rowOf[a]!] === t.fold) a++;
    let b = n - 1;
    while (b >= 0 && t.label[rowOf[b]!] === t.fold) b--;
    if (a > b || !(sx[a]! < sx[b]!)) {
      fail('TOO_FEW_POINTS', 'folds', `needs at least 2 distinct x values in every training set; the training rows of ${what(t)} ${a > b ? 'are empty' : `all have x = ${sx[a]}`}`);
    }
  }
}


/**
 * Curve of a knot table at ascending `xs` (linear between knots, flat beyond the ends) by one
 * merge walk — the same arithmetic as interpolateAt, in O(k + m) instead of O(k log m).
 */
function interpolateAscending(t: Float64Array, v: Float64Array, xs: Float64Array, out: Float64Array): void {
  const m = t.length;
  const first = t[0]!;
  const last = t[m - 1]!;
  let j = 0;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i]!;
    if (x <= first) out[i] = v[0]!;
    else if (x >= last) out[i] = v[m - 1]!;
    else {
      while (j + 1 <= m - 2 && t[j + 1]! <= x) j++;
      const v0 = v[j]!;
      const v1 = v[j + 1]!;
      out[i] = v0 === v1 ? v0 : v0 + ((x - t[j]!) / (t[j + 1]! - t[j]!)) * (v1 - v0);
    }
  }
}

/**
 * √(Σ w r² / Σ w) of the curve (t, v) at ascending `xs` against `ys` (w = 1 when `ws` is null), by
 * one merge walk with the arithmetic of {@link interpolateAscending}; NaN when the plain sums are
 * not trustworthy (overflow, or squares that may have underflowed), for the caller to recompute.
 */
function trainingRmse(t: Float64Array, v: Float64Array, xs: Float64Array, ys: Float64Array, ws: Float64Array | null): number {
  const m = t.length;
  const first = t[0]!;
  const last = t[m - 1]!;
  let j = 0;
  let sse = 0;
  let sw = 0;
  let nonZero = false;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i]!;
    let f: number;
    if (x <= first) f = v[0]!;
    else if (x >= last) f = v[m - 1]!;
    else {
      while (j + 1 <= m - 2 && t[j + 1]! <= x) j++;
      const v0 = v[j]!;
      const v1 = v[j + 1]!;
      f = v0 === v1 ? v0 : v0 + ((x - t[j]!) / (t[j + 1]! - t[j]!)) * (v1 - v0);
    }
    const r = ys[i]! - f;
    const w = ws === null ? 1 : ws[i]!;
    sse += w * r * r;
    sw += w;
    if (r !== 0) nonZero = true;
  }
  if (!Number.isFinite(sse) || !Number.isFinite(sw) || (nonZero && !(sse > 2 ** -800))) return NaN;
  return Math.sqrt(sse / sw);
}

/** The training and held-out rows of one fold, each in x order (see {@link splitFold}). */
interface FoldRows {
  tx: Float64Array;
  ty: Float64Array;
  tw: Float64Array;
  ex: Float64Array;
  ey: Float64Array;
  ew: Float64Array;
  /** Held-out rows. */
  m: number;
}

/**
 * Splits the rows (in x order) into those whose label is `fold` (held out) and the rest
 * (training), keeping the order. The loop has no data-dependent branch: each row is written to
 * both sides and only the side it belongs to advances (a branch on a random 1-in-F label is
 * mispredicted about as often as it is taken); each array has one spare slot at its end for the
 * writes that do not count. O(n).
 */
function splitFold(label: Uint32Array, fold: number, sx: Float64Array, sy: Float64Array, sw: Float64Array): FoldRows {
  const n = label.length;
  let m = 0;
  for (let k = 0; k < n; k++) m += label[k] === fold ? 1 : 0;
  const tx = new Float64Array(n - m + 1);
  const ty = new Float64Array(n - m + 1);
  const tw = new Float64Array(n - m + 1);
  const ex = new Float64Array(m + 1);
  const ey = new Float64Array(m + 1);
  const ew = new Float64Array(m + 1);
  for (let k = 0, a = 0, b = 0; k < n; k++) {
    const out = label[k] === fold ? 1 : 0;
    const x = sx[k]!;
    const y = sy[k]!;
    const w = sw[k]!;
    ex[b] = x;
    ey[b] = y;
    ew[b] = w;
    tx[a] = x;
    ty[a] = y;
    tw[a] = w;
    b += out;
    a += 1 - out;
  }
  const t = n - m;
  return { tx: tx.subarray(0, t), ty: ty.subarray(0, t), tw: tw.subarray(0, t), ex: ex.subarray(0, m), ey: ey.subarray(0, m), ew: ew.subarray(0, m), m };
}

/** Running sums of one candidate. */
interface Accumulator {
  sse: number;
  sae: number;
  sw: number;
  trainRmse: number;
  foldRmse: number[];
  /** Hold-out only: per-row weighted squared errors and weights, for the delta-method SE. */
  sq?: Float64Array;
  sqw?: Float64Array;
}

function cancelled(done: number, total: number): never {
  return fail('CANCELLED', 'signal', `cross-validation was cancelled; ${done} of ${total} fits were done`);
}

/**
 * Runs every task × candidate fit. Training and test rows of a task are gathered once, in
 * ascending x order (so the isotonic fit's radix order returns at once), the direction is
 * resolved once per task when auto, and then every candidate is fitted on the same arrays.
 */
function evaluate(p: Prepared, tasks: Task[], candidates: number[], options: CrossValidationOptions, keepRows: boolean): Accumulator[] {
  const { n, sx, sy, sw, rowOf } = p;
  const C = candidates.length;
  const total = tasks.length * C;
  const acc: Accumulator[] = candidates.map(() => ({ sse: 0, sae: 0, sw: 0, trainRmse: 0, foldRmse: [] }));
  const signal = options.signal;
  const onProgress = options.onProgress;
  let done = 0;
  if (signal?.aborted) cancelled(done, total);
  // The folds of one repeat share their labels: read them into x order once (one gather through
  // rowOf), so that each fold splits its rows in sequential passes.
  let labelOf: Task['label'] | null = null;
  let label = new Uint32Array(0);
  for (const task of tasks) {
    if (task.label !== labelOf) {
      labelOf = task.label;
      if (label.length !== n) label = new Uint32Array(n);
      for (let k = 0; k < n; k++) label[k] = labelOf[rowOf[k]!]!;
    }
    const fold = task.fold;
    // Plain candidates (the classic fit, and knot counts without a curvature or degree option) take
    // the table-only path.
    const plain = p.shape.curvature === 0 && p.shape.degree === 1;
    const { tx, ty, tw, ex, ey, ew, m } = splitFold(label, fold, sx, sy, sw);
    const direction: Direction = p.direction === 'auto' ? resolveDirection(tx, ty, undefined, 'auto') : p.direction;
    const trainW = p.weighted ? tw : null;
    const pred = new Float64Array(m);
    let spare: Float64Array | null = null;
    for (let c = 0; c < C; c++) {
      if (signal?.aborted) cancelled(done, total);
      const K = candidates[c]!;
      let knotX: Float64Array;
      let knotY: Float64Array;
      let trainRmse: number;
      if (!plain) {
        // A shaped knot fit (its own solver): the full model.
        const spec: KnotSpec = p.placement === 'quantile' ? quantileKnotsSorted(tx, K) : K;
        const model = fitChecked(tx, ty, tw, spec, direction, p.lower, p.upper, p.shape);
        knotX = model.knotX;
        knotY = model.knotY;
        trainRmse = model.stats.rmse;
        if (model.interpolation === 'quadratic') {
          for (let i = 0; i < m; i++) pred[i] = smoothTableAt(knotX, knotY, 'quadratic', ex[i]!);
        } else interpolateAscending(knotX, knotY, ex, pred);
      } else {
        // The knot table only (no fitted values, no statistics), for the classic fit as for the
        // knot fit. The training RMSE comes from one merge walk over the training rows, which are
        // in x order: the table's curve is the fitted curve (for the classic fit too — every
        // training row has positive weight, since prepare dropped the others, and the table keeps
        // the first and last x of every block, with no training x between two blocks). y and w are
        // already in prepare's rescaled units, so the walk's sums stay far from overflow and
        // underflow; should they not, the statistics of the full fitted values take over.
        if (K === 0) {
          const fit = isotonicChecked(tx, ty, trainW, direction, p.lower, p.upper, false, false);
          knotX = fit.knotX;
          knotY = fit.knotY;
        } else {
          const spec: KnotSpec = p.placement === 'quantile' ? quantileKnotsSorted(tx, K) : K;
          const fit = knotChecked(tx, ty, trainW, spec, direction, p.lower, p.upper, false, false, true);
          knotX = fit.knotX;
          knotY = fit.knotY;
        }
        trainRmse = trainingRmse(knotX, knotY, tx, ty, trainW);
        if (Number.isNaN(trainRmse)) {
          spare ??= new Float64Array(tx.length);
          interpolateAscending(knotX, knotY, tx, spare);
          trainRmse = fitStatistics(ty, spare, trainW ?? undefined).rmse;
        }
        interpolateAscending(knotX, knotY, ex, pred);
      }
      let sse = 0;
      let sae = 0;
      let sumW = 0;
      const a = acc[c]!;
      if (keepRows) {
        a.sq = new Float64Array(m);
        a.sqw = ew.slice();
      }
      for (let i = 0; i < m; i++) {
        const r = ey[i]! - pred[i]!;
        const w = ew[i]!;
        sse += w * r * r;
        sae += w * Math.abs(r);
        sumW += w;
        if (a.sq) a.sq[i] = r * r;
      }
      a.sse += sse;
      a.sae += sae;
      a.sw += sumW;
      a.trainRmse += trainRmse;
      a.foldRmse.push(Math.sqrt(sse / sumW));
      done++;
      onProgress?.(done / total);
    }
  }
  return acc;
}

function scoreOf(knots: number, a: Accumulator, sstTotal: number, fits: number, holdout: boolean): CandidateScore {
  const cvRmse = pooledRmse(a.sse, a.sw);
  const cvSe = holdout ? holdoutStandardError(a.sq!, a.sqw!, a.sse, a.sw, cvRmse) : foldStandardError(a.foldRmse);
  const cvR2 = pooledR2(a.sse, sstTotal);
  return { knots, cvRmse, cvSe, cvR2, cvMae: a.sae / a.sw, trainRmse: a.trainRmse / fits, foldRmse: a.foldRmse };
}

/**
 * K-fold cross-validation of candidate knot counts (repeated when `repeats` > 1).
 *
 * Split: rows with positive weight are numbered in row order (zero-weight rows are left out
 * entirely: they neither train nor score, and take no place in a fold). For each repeat r the
 * rows are ordered — row order for seed 0, the SplitMix64 Fisher–Yates permutation of
 * seededPermutation(n, seed, r) otherwise — and cut into F contiguous blocks, the first n mod F
 * one row larger (seed 0: exactly scikit-learn's `KFold(n_splits=F, shuffle=False)`). The fold
 * assignment is computed once per repeat and shared by all candidates.
 *
 * No leakage: each candidate is fitted on the training rows of a fold alone — even knots span
 * the training x range, quantile knots are training quantiles, `'auto'` direction is Spearman's
 * sign on the training rows — and scored on the held-out rows, where x outside the training range
 * gets the flat end value of the curve (as predict does).
 *
 * Scores (weights w, sums over every held-out row of every fold and repeat):
 * cvRmse = √(Σ w e² / Σ w); cvMae = Σ w |e| / Σ w; cvR2 = 1 − Σ w e² / (R · SST) with
 * SST = Σ w (y − ȳ_w)² over all used rows (each row is held out once per repeat; SST = 0 gives 1
 * for a perfect score and 0 otherwise, as fitStatistics); cvSe = sd of the F·R per-fold RMSEs
 * (unweighted, denominator F·R − 1) / √(F·R); trainRmse = mean over the F·R fits of the
 * training RMSE. Pick a count with {@link suggestKnots}.
 *
 * Cost: F·R·C fits of O(n) each (C candidates) plus O(n) per fold for gathering and scoring; data
 * are validated and sorted by x once. Synchronous: run it in a worker to keep a UI responsive;
 * `onProgress` is called after each fit and `signal` is checked before each fit.
 *
 * Edge cases: ties in x are fine (the split is by row, not by x). A training set with fewer than
 * 2 distinct x values (possible with few distinct x) is an error naming the fold, raised before
 * any fit. A candidate K larger than the training rows support still fits (knots without data
 * are filled, see knotRegression). With seed 0 every repeat would repeat the same split, so
 * repeats must then be 1.
 *
 * @param x predictor values, finite.
 * @param y responses, finite, same length.
 * @param options see {@link CrossValidationOptions}.
 * @throws RatchetError EMPTY_INPUT, LENGTH_MISMATCH, NON_FINITE, BAD_WEIGHT, BAD_BOUNDS,
 *   BAD_OPTION (candidates, folds, repeats, seed, direction, placement, curvature, degree), TOO_FEW_POINTS (fewer
 *   than 2 distinct x, or a training set with fewer than 2 distinct x), CANCELLED.
 * @example crossValidate([1, 2, 3, 4, 5, 6], [1, 3, 2, 4, 6, 5], { candidates: [0], folds: 3, seed: 0 })
 *   .scores[0].cvRmse // → 1.3420… = √(389/216)
 * @see Hastie, Tibshirani & Friedman (2009), The Elements of Statistical Learning, 2nd ed., §7.10.
 */
export function crossValidate(x: ArrayLike<number>, y: ArrayLike<number>, options: CrossValidationOptions = {}): CrossValidationResult {
  const p = prepare(x, y, options);
  const candidates = options.candidates === undefined ? defaultCandidates(p.sx) : checkCandidates(options.candidates, p.shape);
  const folds = checkFolds(options.folds ?? 5, p.n);
  const repeats = checkRepeats(options.repeats ?? 1);
  const seed = checkSeed(options.seed ?? 1);
  if (seed === 0 && repeats > 1) {
    fail('BAD_OPTION', 'repeats', `needs 1 when seed is 0 (without shuffling every repeat has the same folds); got ${repeats}`);
  }
  const tasks: Task[] = [];
  for (let r = 0; r < repeats; r++) {
    const label = kFoldAssignment(p.n, folds, seed, r);
    for (let f = 0; f < folds; f++) tasks.push({ repeat: r, fold: f, label });
  }
  checkTrainingSets(p, tasks, (t) => `fold ${t.fold + 1} of repeat ${t.repeat + 1}`);
  const acc = evaluate(p, tasks, candidates, options, false);
  const scores = inUnitsOfY(candidates.map((k, c) => scoreOf(k, acc[c]!, repeats * p.sst, tasks.length, false)), p.yExp);
  return { scores, folds, repeats, seed, n: p.n, method: 'k-fold' };
}

/**
 * Hold-out validation of candidate knot counts: one split, train on the rest, score the test rows.
 *
 * Split: rows with positive weight (zero-weight rows are left out, as in {@link crossValidate})
 * are ordered — row order for seed 0, seededPermutation(n, seed, 0) otherwise — and the last
 * ⌈testFraction · n⌉ form the test set (seed 0: exactly scikit-learn's
 * `train_test_split(shuffle=False)`). Knots, quantiles and an `'auto'` direction come from the
 * training rows only; test x outside the training range get the flat end values.
 *
 * Scores as in crossValidate with one fold, except: cvR2 = 1 − SSE / Σ w (y − ȳ)² over the TEST
 * rows with their own weighted mean (scikit-learn's `r2_score` on the test set; SST = 0 gives 1
 * for a perfect score and 0 otherwise), and cvSe is the delta-method standard error of the test
 * RMSE, se(MSE) / (2·RMSE) with se(MSE)² = m/(m − 1) · Σ w²(e² − MSE)² / (Σ w)² over the m test
 * rows (unit weights: the sample sd of e² / √m) (common practice). It is NaN for m = 1, and 0
 * when every test error is 0. foldRmse has the one test RMSE.
 *
 * Cost: C fits of O(n) plus O(n); data sorted once.
 *
 * @param x predictor values, finite.
 * @param y responses, finite, same length.
 * @param options as {@link CrossValidationOptions} without folds and repeats, plus testFraction
 *   (default 0.25, strictly between 0 and 1).
 * @throws RatchetError as crossValidate; BAD_OPTION testFraction (outside (0, 1), or no training row left).
 * @example holdoutValidate([1, 2, 3, 4], [1, 2, 3, 5], { candidates: [2], seed: 0 }).scores[0].cvRmse
 *   // → 2 (train on x 1…3: the line y = x, flat at 3 beyond; test row (4, 5))
 */
export function holdoutValidate(x: ArrayLike<number>, y: ArrayLike<number>, options: HoldoutOptions = {}): CrossValidationResult {
  const p = prepare(x, y, options);
  const candidates = options.candidates === undefined ? defaultCandidates(p.sx) : checkCandidates(options.candidates, p.shape);
  const seed = checkSeed(options.seed ?? 1);
  const testFraction = options.testFraction ?? 0.25;
  const label = holdoutAssignment(p.n, testFraction, seed);
  const tasks: Task[] = [{ repeat: 0, fold: 1, label }];
  checkTrainingSets(p, tasks, () => 'the hold-out split');
  const acc = evaluate(p, tasks, candidates, options, true);
  // SST over the test rows with their own weighted mean.
  let sw = 0;
  let swy = 0;
  for (let k = 0; k < p.n; k++) {
    if (label[p.rowOf[k]!] === 1) {
      sw += p.sw[k]!;
      swy += p.sw[k]! * p.sy[k]!;
    }
  }
  const mean = swy / sw;
  let sst = 0;
  let testRows = 0;
  for (let k = 0; k < p.n; k++) {
    if (label[p.rowOf[k]!] === 1) {
      sst += p.sw[k]! * (p.sy[k]! - mean) ** 2;
      testRows++;
    }
  }
  const scores = inUnitsOfY(candidates.map((k, c) => scoreOf(k, acc[c]!, sst, 1, true)), p.yExp);
  return { scores, folds: 1, repeats: 1, seed, n: p.n, method: 'holdout', testFraction, testRows };
}
