/** Shared option and result types of the Ratchet core. */

/** Direction of a monotone fit. */
export type Direction = 'up' | 'down';

/** Direction as an option: `'auto'` picks the sign of Spearman's rank correlation. */
export type DirectionOption = Direction | 'auto';

/** Which point of a flat stretch an inverse read-back returns. */
export type TieRule = 'lowest' | 'middle' | 'highest';

/** Options common to both fitting methods. */
export interface CommonFitOptions {
  /** Non-negative finite weight per row; default all 1. Weight 0 rows get a fitted value but have no influence. */
  weights?: ArrayLike<number> | undefined;
  /** `'up'` (default), `'down'` or `'auto'`. */
  direction?: DirectionOption | undefined;
  /** Lower bound on fitted values (default −∞). */
  lower?: number | undefined;
  /** Upper bound on fitted values (default +∞). */
  upper?: number | undefined;
}
