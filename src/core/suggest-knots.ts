/**
 * Choosing a knot count from cross-validation scores: the one-standard-error rule or the minimum.
 */
import { fail } from './errors.js';

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
