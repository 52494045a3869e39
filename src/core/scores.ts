/**
 * The scoring of cross-validation, shared by the one-input (cross-validate.ts) and the surface
 * (surface-cv.ts) cross-validation: pooled held-out errors, their standard errors, and the choice
 * of a candidate by the one-standard-error rule or the minimum.
 */
import { fail } from './errors.js';

/**
 * Root of the pooled weighted mean squared error: √(Σ w e² / Σ w) over every held-out row of every
 * fold (pooled, not averaged per fold). O(1).
 * @param sse Σ w e², ≥ 0. @param sw Σ w, > 0.
 * @example pooledRmse(8, 2) // → 2
 */
export function pooledRmse(sse: number, sw: number): number {
  return Math.sqrt(sse / sw);
}

/**
 * Pooled R²: 1 − SSE / SST with SST the total sum of squares the folds' held-out rows are scored
 * against (summed over repeats); SST = 0 gives 1 for a perfect score and 0 otherwise. O(1).
 * @example pooledR2(1, 4) // → 0.75
 */
export function pooledR2(sse: number, sst: number): number {
  return sst > 0 ? 1 - sse / sst : sse === 0 ? 1 : 0;
}

/**
 * Standard error of the mean of the F·R per-fold RMSEs: their sample standard deviation / √(F·R)
 * (Hastie, Tibshirani & Friedman 2009, The Elements of Statistical Learning, §7.10). NaN for one
 * fold. O(F·R).
 * @param foldRmse the per-fold RMSEs, in any order (at least one).
 * @example foldStandardError([1, 3]) // → 1 (sd √2, divided by √2)
 */
export function foldStandardError(foldRmse: readonly number[]): number {
  const k = foldRmse.length;
  let mean = 0;
  for (const r of foldRmse) mean += r;
  mean /= k;
  let ss = 0;
  for (const r of foldRmse) ss += (r - mean) ** 2;
  return Math.sqrt(ss / (k - 1)) / Math.sqrt(k);
}

/**
 * Delta-method standard error of a hold-out RMSE: se(MSE) / (2·RMSE) with
 * se(MSE)² = m/(m − 1) · Σ w²(e² − MSE)² / (Σ w)² over the m test rows (common practice). NaN for
 * m = 1, 0 when every test error is 0. O(m).
 * @param sq squared errors e² per test row. @param w their weights. @param sse Σ w e². @param sw Σ w.
 * @param rmse √(sse / sw).
 * @example holdoutStandardError([0, 4], [1, 1], 4, 2, Math.SQRT2) // → 0.7071… (= 1/√2)
 */
export function holdoutStandardError(sq: ArrayLike<number>, w: ArrayLike<number>, sse: number, sw: number, rmse: number): number {
  const m = sq.length;
  const mse = sse / sw;
  let s = 0;
  for (let i = 0; i < m; i++) s += (w[i]! * (sq[i]! - mse)) ** 2;
  const seMse = m > 1 ? Math.sqrt((s * m) / (m - 1)) / sw : NaN;
  return rmse > 0 ? seMse / (2 * rmse) : m > 1 ? 0 : NaN;
}

/** `'one-se'`: simplest candidate within one SE of the best; `'min'`: the best. */
export type SuggestionRule = 'one-se' | 'min';

/** The part of a candidate's scores the rules read (see `CandidateScore` in cross-validate.ts). */
export interface ScoreForSuggestion {
  readonly knots: number;
  readonly cvRmse: number;
  readonly cvSe: number;
}

/** Result of {@link suggestKnots}. */
export interface Suggestion {
  /** Suggested knot count (0 = the classic fit). */
  knots: number;
  /** Index of the suggested candidate in the scores given. */
  index: number;
  /** Rule applied. */
  rule: SuggestionRule;
  /**
   * The cut-off the rule used: min cvRmse + cvSe of the minimiser for `'one-se'`, min cvRmse for
   * `'min'`.
   */
  threshold: number;
}

/**
 * Complexity rank of a candidate: fewer knots are simpler; the classic fit (0), which has a level
 * at every distinct x, is the most flexible model and ranks after every knot count.
 */
function complexity(knots: number): number {
  return knots === 0 ? Infinity : knots;
}

/**
 * Suggests a knot count from cross-validation scores.
 *
 * - `'one-se'` (default): find the minimiser of cvRmse (ties: the simplest), take
 *   threshold = its cvRmse + its cvSe, and suggest the simplest candidate with cvRmse ≤ threshold
 *   — the one-standard-error rule (Breiman, Friedman, Olshen & Stone 1984, Classification and
 *   Regression Trees, §3.4.3 (section number from memory); Hastie, Tibshirani & Friedman, The Elements of Statistical
 *   Learning, 2nd ed. 2009, §7.10). It prefers a simpler curve whose error is statistically
 *   indistinguishable from the best.
 * - `'min'`: the minimiser itself (ties: the simplest); threshold = the minimum.
 *
 * "Simplest" means fewest knots, with the classic fit (knots 0) ranked after every knot count.
 * Caveat: with repeated K-fold the per-fold RMSEs are positively correlated (the training sets
 * overlap), so cvSe understates the true uncertainty and the one-SE rule is then somewhat less
 * conservative than it looks (memory: Bengio & Grandvalet 2004, "No unbiased estimator of the
 * variance of K-fold cross-validation", JMLR 5). A non-finite cvSe (a hold-out with a single test
 * row) is taken as 0, so the rule then falls back to `'min'`.
 *
 * Cost: O(C) for C candidates. Scores are not modified; their order does not matter.
 *
 * @param scores candidate scores, at least one, with finite cvRmse.
 * @param rule `'one-se'` (default) or `'min'`.
 * @throws RatchetError BAD_OPTION (no scores, a non-finite cvRmse, an unknown rule).
 * @example suggestKnots([{ knots: 2, cvRmse: 1.3, cvSe: 0.1 }, { knots: 5, cvRmse: 1.0, cvSe: 0.2 },
 *   { knots: 3, cvRmse: 1.15, cvSe: 0.1 }]) // → { knots: 3, index: 2, rule: 'one-se', threshold: 1.2 }
 */
export function suggestKnots(scores: readonly ScoreForSuggestion[], rule: SuggestionRule = 'one-se'): Suggestion {
  if (rule !== 'one-se' && rule !== 'min') fail('BAD_OPTION', 'rule', `needs 'one-se' or 'min'; got ${String(rule)}`);
  if (!scores || scores.length === 0) fail('BAD_OPTION', 'scores', 'needs at least one candidate score; got none');
  let best = -1;
  for (let i = 0; i < scores.length; i++) {
    const s = scores[i]!;
    if (typeof s.cvRmse !== 'number' || !Number.isFinite(s.cvRmse)) {
      fail('BAD_OPTION', 'scores', `needs a finite cvRmse for every candidate; entry ${i + 1} has ${String(s.cvRmse)}`);
    }
    if (best < 0) best = i;
    else {
      const b = scores[best]!;
      if (s.cvRmse < b.cvRmse || (s.cvRmse === b.cvRmse && complexity(s.knots) < complexity(b.knots))) best = i;
    }
  }
  const min = scores[best]!;
  if (rule === 'min') return { knots: min.knots, index: best, rule, threshold: min.cvRmse };
  const se = Number.isFinite(min.cvSe) ? min.cvSe : 0;
  const threshold = min.cvRmse + se;
  let pick = best;
  for (let i = 0; i < scores.length; i++) {
    const s = scores[i]!;
    if (s.cvRmse <= threshold && complexity(s.knots) < complexity(scores[pick]!.knots)) pick = i;
  }
  return { knots: scores[pick]!.knots, index: pick, rule, threshold };
}
