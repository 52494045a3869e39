/**
 * The direction check: does the data's rank correlation contradict the fit's direction?
 */
import type { Direction } from './types.js';
import { spearman } from './direction.js';
import { studentTCdf } from './student-t.js';

/** Smallest |ρ| against the direction that {@link checkDirection} reports. */
export const DIRECTION_RHO_THRESHOLD = 0.3;
/** Largest one-sided p-value of ρ against the direction that {@link checkDirection} reports. */
export const DIRECTION_P_THRESHOLD = 0.05;

/** A structured warning from {@link checkDirection}. */
export interface DirectionWarning {
  /** Stable code of the warning. */
  readonly code: 'DIRECTION_CONTRADICTED';
  /** The direction that was fitted. */
  readonly direction: Direction;
  /** The direction the data point to. */
  readonly suggested: Direction;
  /** Spearman's ρ of the rows with positive weight. */
  readonly spearman: number;
  /** One-sided p-value of ρ against the fitted direction (t approximation, n_used − 2 df). */
  readonly pValue: number;
  /** Rows with positive weight. */
  readonly n: number;
  /** One sentence for the task pane. */
  readonly message: string;
}

/**
 * Checks whether the data contradict the direction of a fit. The rule: with ρ Spearman's rank
 * correlation of the rows with positive weight (n_used of them, at least 4), warn when ρ points
 * against the direction by at least 0.3 (ρ ≤ −0.3 for `'up'`, ρ ≥ 0.3 for `'down'`) AND that is
 * unlikely under no association: the one-sided p-value from t = ρ·√((n_used − 2)/(1 − ρ²)) with
 * n_used − 2 degrees of freedom is below 0.05 (the usual t approximation for ρ, common practice).
 * Both conditions keep the warning for data that really fall while the fit rises (which then
 * comes out flat or nearly so) — not for noise around a flat trend, nor for a weak tendency.
 *
 * Cost: O(n) (radix-sorted ranks). Inputs are not modified; preconditions: finite x and y of
 * equal length, weights ≥ 0 (the fitting functions guarantee them).
 *
 * @param x predictor values.
 * @param y responses, same length.
 * @param direction the direction that was fitted.
 * @param w weights (default all 1); rows with weight 0 are left out.
 * @returns a {@link DirectionWarning}, or null when there is nothing to report (also for fewer
 *   than 4 rows with positive weight, or constant x or y).
 * @example checkDirection([1, 2, 3, 4, 5, 6], [9, 8, 6, 5, 3, 1], 'up')?.suggested // → 'down'
 */
export function checkDirection(x: ArrayLike<number>, y: ArrayLike<number>, direction: Direction, w?: ArrayLike<number>): DirectionWarning | null {
  let n = 0;
  for (let i = 0; i < x.length; i++) if (w === undefined || w[i]! > 0) n++;
  if (n < 4) return null;
  const rho = spearman(x, y, w);
  if (Number.isNaN(rho)) return null;
  const against = direction === 'up' ? -rho : rho; // > 0 when ρ contradicts the direction
  if (against < DIRECTION_RHO_THRESHOLD) return null;
  const df = n - 2;
  const pValue = against >= 1 ? 0 : 1 - studentTCdf(against * Math.sqrt(df / (1 - against * against)), df);
  if (!(pValue < DIRECTION_P_THRESHOLD)) return null;
  const suggested: Direction = direction === 'up' ? 'down' : 'up';
  const word = direction === 'up' ? 'falls' : 'rises';
  return {
    code: 'DIRECTION_CONTRADICTED',
    direction,
    suggested,
    spearman: rho,
    pValue,
    n,
    message: `y ${word} as x rises (Spearman's rank correlation ${rho.toFixed(2)}, ${n} rows) but the fit is '${direction}'; try direction '${suggested}'.`,
  };
}
