/**
 * One entry point for both fitting methods, and the model as a knot table.
 */
import type { CommonFitOptions, Direction } from './types.js';
import { boundsPair, finiteArray, finiteView, sameLength, weightArray } from './validate.js';
import { checkKnotCount, checkKnotPositions } from './knots.js';
import { resolveDirection } from './direction.js';
import { isotonicChecked } from './isotonic.js';
import { knotChecked } from './knot-fit.js';
import { fitStatistics, type FitStatistics } from './statistics.js';
import { interpolate } from './interpolate.js';
import { fail } from './errors.js';

/** Options of {@link fitMonotone}. */
export interface ModelOptions extends CommonFitOptions {
  /**
   * 0 or absent: classic isotonic fit at every distinct x. A whole number K ≥ 2: K evenly spaced
   * knots. A list of ≥ 2 strictly increasing numbers: explicit knot positions.
   */
  knots?: number | ArrayLike<number> | undefined;
}

/** A fitted monotone model: everything the worksheet functions and the task pane show. */
export interface MonotoneModel {
  /** `'isotonic'` (classic) or `'knots'`. */
  readonly method: 'isotonic' | 'knots';
  /** Direction used. */
  readonly direction: Direction;
  /** The model as a table: positions (ascending) and values; interpolation of it is the curve. */
  readonly knotX: Float64Array;
  readonly knotY: Float64Array;
  /** Fitted value per input row, in input order. */
  readonly fitted: Float64Array;
  /** Distinct fitted levels (classic: PAVA blocks; knots: groups of equal knot values). */
  readonly levels: number;
  /** Fit statistics over rows with positive weight. */
  readonly stats: FitStatistics;
}

/** The validated form of {@link ModelOptions}.knots: 0 for classic, a count, or positions. */
export type KnotSpec = 0 | number | Float64Array;

/** Validates a knots option. @throws RatchetError BAD_KNOTS, NON_FINITE. */
export function checkKnotSpec(knots: number | ArrayLike<number> | undefined | null): KnotSpec {
  if (knots === undefined || knots === null || knots === 0) return 0;
  if (typeof knots === 'number') return checkKnotCount(knots);
  if (typeof knots.length !== 'number') fail('BAD_KNOTS', 'knots', 'needs 0, a knot count, or knot positions');
  return checkKnotPositions(knots);
}

/**
 * Fits a monotone model: classic isotonic regression (knots 0 or absent) or the knot model.
 * See {@link isotonicRegression} and {@link knotRegression} for the objective, costs and edge
 * cases; this function validates once, dispatches, and adds fit statistics.
 *
 * Cost: O(n) (plus O(n log K) for explicit knots). Inputs are not modified.
 *
 * @throws RatchetError as the two methods do.
 * @example fitMonotone([1, 2, 3, 4], [1, 3, 2, 4]).knotY // → Float64Array [1, 2.5, 2.5, 4]
 */
export function fitMonotone(x: ArrayLike<number>, y: ArrayLike<number>, options: ModelOptions = {}): MonotoneModel {
  const xs = finiteView('x', x);
  sameLength('x', xs.length, 'y', y);
  const ys = finiteView('y', y);
  const ws = options.weights === undefined ? null : weightArray(xs.length, options.weights);
  const [lower, upper] = boundsPair(options.lower, options.upper);
  const spec = checkKnotSpec(options.knots);
  const direction = resolveDirection(xs, ys, ws ?? undefined, options.direction);
  return fitChecked(xs, ys, ws, spec, direction, lower, upper);
}

/** {@link fitMonotone} on validated inputs (used by cross-validation); `ws` null means unit weights. */
export function fitChecked(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array | null,
  spec: KnotSpec,
  direction: Direction,
  lower = -Infinity,
  upper = Infinity,
): MonotoneModel {
  const fit =
    spec === 0
      ? isotonicChecked(xs, ys, ws, direction, lower, upper)
      : knotChecked(xs, ys, ws, spec, direction, lower, upper);
  return {
    method: fit.method,
    direction: fit.direction,
    knotX: fit.knotX,
    knotY: fit.knotY,
    fitted: fit.fitted,
    levels: fit.levels,
    stats: fitStatistics(ys, fit.fitted, ws ?? undefined),
  };
}

/**
 * The model's curve at new x values: linear interpolation of its knot table, flat beyond the ends.
 * Cost O(k log m). @throws RatchetError NON_FINITE for a non-finite new x.
 * @example predict(fitMonotone([1, 2, 3, 4], [1, 3, 2, 4]), [0, 1.5, 9]) // → Float64Array [1, 1.75, 4]
 */
export function predict(model: Pick<MonotoneModel, 'knotX' | 'knotY'>, newX: ArrayLike<number>): Float64Array {
  const xs = finiteArray('new_x', newX, true);
  return interpolate(model.knotX, model.knotY, xs);
}
