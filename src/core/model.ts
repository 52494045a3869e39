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
import { checkCurvature, checkDegree, shapeChecked, type Curvature, type Degree } from './shape-fit.js';
import type { SparseRow } from './shape-qp.js';
import { smoothTableAt, type TableInterpolation } from './smooth-table.js';
import { scaleExponents, timesPowerOfTwo } from './scale.js';

/**
 * shapeChecked on y and weights divided by powers of two when they are far from 1 (see
 * src/core/scale.ts): exact, so the same fit; knot values, coefficients and fitted values are scaled
 * back by 2^yExp, like the bounds in the constraint rows, the multipliers (units of weight × y) by
 * 2^(yExp + wExp). Without it, weights near
 * 1e100 or 1e-300, or y near 1e-100 with weights near 1e-250, made the shaped fit fail.
 */
function shapeScaled(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array | null,
  knots: number | Float64Array,
  direction: Direction,
  shape: ShapeSpec,
  lower: number,
  upper: number,
): ReturnType<typeof shapeChecked> {
  const scales = scaleExponents(ys, ws);
  if (!scales.needed) return shapeChecked(xs, ys, ws, knots, direction, shape.curvature, shape.degree, lower, upper);
  const { yExp, wExp } = scales;
  const sf = shapeChecked(
    xs,
    ys.map((v) => timesPowerOfTwo(v, -yExp)),
    ws === null ? null : ws.map((v) => timesPowerOfTwo(v, -wExp)),
    knots,
    direction,
    shape.curvature,
    shape.degree,
    timesPowerOfTwo(lower, -yExp),
    timesPowerOfTwo(upper, -yExp),
  );
  const back = (v: Float64Array, e: number) => v.map((u) => timesPowerOfTwo(u, e));
  return {
    ...sf,
    knotY: back(sf.knotY, yExp),
    fitted: back(sf.fitted, yExp),
    coefficients: back(sf.coefficients, yExp),
    multipliers: back(sf.multipliers, yExp + (ws === null ? 0 : wExp)),
    // Bound rows carry their bound as right-hand side, in units of y (shape rows have 0).
    constraints: sf.constraints.map((row) => (row.rhs === 0 ? row : { ...row, rhs: timesPowerOfTwo(row.rhs, yExp) })),
  };
}

/** Options of {@link fitMonotone}. */
export interface ModelOptions extends CommonFitOptions {
  /**
   * 0 or absent: classic isotonic fit at every distinct x. A whole number K ≥ 2: K evenly spaced
   * knots. A list of ≥ 2 strictly increasing numbers: explicit knot positions.
   */
  knots?: number | ArrayLike<number> | undefined;
  /**
   * Knot model only: −1 concave (slopes never increase), 0 any (default), 1 convex (slopes never
   * decrease); combined with the direction. See shapeRegression.
   */
  curvature?: Curvature | undefined;
  /** Knot model only: 1 piecewise linear (default), 2 smooth (quadratic B-spline). */
  degree?: Degree | undefined;
}

/** A validated shape: curvature and degree of a knot fit. */
export interface ShapeSpec {
  readonly curvature: Curvature;
  readonly degree: Degree;
}

/** The plain shape: any curvature, piecewise linear. */
export const PLAIN_SHAPE: ShapeSpec = Object.freeze({ curvature: 0, degree: 1 });

/**
 * Validates the curvature and degree options together with the knots: the classic fit (knots 0)
 * offers neither. Cost O(1).
 * @param curvature, degree the options as given (absent → 0 and 1).
 * @param spec the validated knots option (0 = classic).
 * @throws RatchetError BAD_OPTION (a value outside its set, or a shape with the classic fit).
 * @example checkShapeSpec(-1, 2, 5) // → { curvature: -1, degree: 2 }
 */
export function checkShapeSpec(curvature: unknown, degree: unknown, spec: KnotSpec): ShapeSpec {
  const c = checkCurvature(curvature);
  const d = checkDegree(degree);
  if (spec === 0 && c !== 0) fail('BAD_OPTION', 'curvature', `needs knots (K ≥ 2): the classic fit has no curvature option; got ${c}`);
  if (spec === 0 && d !== 1) fail('BAD_OPTION', 'degree', `needs knots (K ≥ 2): the classic fit has no smooth option; got ${d}`);
  return c === 0 && d === 1 ? PLAIN_SHAPE : { curvature: c, degree: d };
}

/**
 * What a shaped fit (curvature ≠ 0 or degree 2) adds to a model: the coefficients and the
 * constraint bookkeeping (see ShapeFit in shape-fit.ts).
 */
export interface ShapeDetails {
  readonly curvature: Curvature;
  readonly degree: Degree;
  readonly knots: Float64Array;
  readonly coefficients: Float64Array;
  readonly constraints: readonly SparseRow[];
  readonly active: Int32Array;
  readonly multipliers: Float64Array;
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
  /**
   * How the table is read: absent or `'linear'` — linear interpolation; `'quadratic'` — a smooth
   * fit's table (knots and midpoints), read by a parabola through each interval's three rows.
   */
  readonly interpolation?: TableInterpolation;
  /** Present for shaped fits (curvature ≠ 0 or degree 2). */
  readonly shape?: ShapeDetails;
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
 * cases; this function validates once, dispatches, and adds fit statistics. With `curvature` ≠ 0
 * or `degree` 2 the knot model is fitted by shapeRegression (concave/convex or smooth; the table
 * of a smooth fit has `interpolation` `'quadratic'`, see smooth-table.ts); the classic fit with
 * either option is RatchetError BAD_OPTION.
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
  const shape = checkShapeSpec(options.curvature, options.degree, spec);
  const direction = resolveDirection(xs, ys, ws ?? undefined, options.direction);
  return fitChecked(xs, ys, ws, spec, direction, lower, upper, shape);
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
  shape: ShapeSpec = PLAIN_SHAPE,
): MonotoneModel {
  if (shape.curvature !== 0 || shape.degree !== 1) {
    if (spec === 0) checkShapeSpec(shape.curvature, shape.degree, spec); // throws BAD_OPTION
    const sf = shapeScaled(xs, ys, ws, spec as number | Float64Array, direction, shape, lower, upper);
    return {
      method: 'knots',
      direction: sf.direction,
      knotX: sf.knotX,
      knotY: sf.knotY,
      fitted: sf.fitted,
      levels: sf.levels,
      stats: fitStatistics(ys, sf.fitted, ws ?? undefined),
      interpolation: sf.interpolation,
      shape: {
        curvature: sf.curvature,
        degree: sf.degree,
        knots: sf.knots,
        coefficients: sf.coefficients,
        constraints: sf.constraints,
        active: sf.active,
        multipliers: sf.multipliers,
      },
    };
  }
  const fit =
    spec === 0
      ? isotonicChecked(xs, ys, ws, direction, lower, upper, false)
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
 * The model's curve at new x values: interpolation of its knot table (linear, or quadratic for a
 * smooth fit's table), flat beyond the ends.
 * Cost O(k log m). @throws RatchetError NON_FINITE for a non-finite new x.
 * @example predict(fitMonotone([1, 2, 3, 4], [1, 3, 2, 4]), [0, 1.5, 9]) // → Float64Array [1, 1.75, 4]
 */
export function predict(model: Pick<MonotoneModel, 'knotX' | 'knotY' | 'interpolation'>, newX: ArrayLike<number>): Float64Array {
  const xs = finiteArray('new_x', newX, true);
  if (model.interpolation !== 'quadratic') return interpolate(model.knotX, model.knotY, xs);
  const out = new Float64Array(xs.length);
  for (let i = 0; i < xs.length; i++) out[i] = smoothTableAt(model.knotX, model.knotY, 'quadratic', xs[i]!);
  return out;
}
