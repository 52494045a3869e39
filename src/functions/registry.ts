/**
 * The registry of RATCHET worksheet functions: the one source of truth for names, descriptions,
 * parameters and implementations. The Excel entry (functions.ts, whose JSDoc the metadata
 * generator reads — a test checks that it matches this table), the worker and the headless
 * runner all call `invoke` from here.
 */
import type { CellArg, CellResult, InvokeContext, ParamSpec, SheetFunction } from './types.js';
import * as impl from './implementations.js';
import { SURFACE_FUNCTIONS } from './surface-functions.js';

/** Namespace users type before each function name. */
export const NAMESPACE = 'RATCHET';

/**
 * Base of the help links: the README rendered as help.html and served with the add-in (same origin
 * as every URL in manifest.xml; replace it together with them when deploying). Each function's
 * anchor is its full name lower-cased without the dot, the anchor of its README heading.
 */
export const HELP_BASE = 'https://localhost:3000/help.html';

/** The help URL of a function: README section "RATCHET.FIT" → `…/help.html#ratchetfit`. */
export function helpUrlOf(name: string): string {
  return `${HELP_BASE}#${NAMESPACE.toLowerCase()}${name.toLowerCase()}`;
}

const P = {
  knownYs: { name: 'known_ys', optional: false, description: 'Observed values: one column or one row. Rows with a blank here, in known_xs or in weights are left out.' },
  knownXs: { name: 'known_xs', optional: false, description: 'Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.' },
  knots: {
    name: 'knots',
    optional: true,
    description: 'Omitted or 0: classic fit at every distinct x. A whole number K ≥ 2: K evenly spaced knots. A range of ≥ 2 increasing numbers: knot positions.',
  },
  direction: { name: 'direction', optional: true, description: '1 rising (default), -1 falling, 0 pick from the data (sign of the rank correlation).' },
  weights: { name: 'weights', optional: true, description: 'Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.' },
  newXs: { name: 'new_xs', optional: false, description: 'Inputs at which to read the curve: a cell or a range of any shape; blanks stay blank.' },
  knotTable: { name: 'knot_table', optional: false, description: 'Two columns: knot x (strictly increasing) and value, e.g. the result of RATCHET.KNOTS.' },
  targetYs: { name: 'target_ys', optional: false, description: 'Curve values to read back: a cell or a range; blanks stay blank.' },
  tie: { name: 'tie', optional: true, description: 'Where the curve is flat at the target: -1 lowest x, 0 middle (default), 1 highest x.' },
  count: { name: 'count', optional: false, description: 'Number of knots, a whole number ≥ 2.' },
  candidates: { name: 'candidates', optional: true, description: 'Knot counts to compare (0 = classic fit): a number or a range, e.g. SEQUENCE(19,1,2). Default 2 to min(20, distinct x).' },
  folds: { name: 'folds', optional: true, description: 'Number of folds, 2 to the number of rows. Default 5.' },
  repeats: { name: 'repeats', optional: true, description: 'Number of repeats with fresh shuffles, ≥ 1. Default 1.' },
  seed: { name: 'seed', optional: true, description: 'Whole number for the shuffle; 0 means no shuffle (blocks in row order). Default 1.' },
  rule: { name: 'rule', optional: true, description: '1 one-standard-error rule: fewest knots within one SE of the best (default); 0 the minimum.' },
} satisfies Record<string, ParamSpec>;

function fn(
  name: string,
  description: string,
  params: readonly ParamSpec[],
  returnsArray: boolean,
  invoke: (args: readonly CellArg[], context?: InvokeContext) => CellResult,
  longWork = false,
): SheetFunction {
  return Object.freeze({ name, description, params: Object.freeze(params.slice()), returnsArray, helpUrl: helpUrlOf(name), longWork, invoke });
}

/** Every RATCHET function, in the order of the reference. */
export const SHEET_FUNCTIONS: readonly SheetFunction[] = Object.freeze([
  fn(
    'FIT',
    'Monotone fitted value for every row of known_ys, same shape; rows left out (blank x, y or weight) stay empty.',
    [P.knownYs, P.knownXs, P.knots, P.direction, P.weights],
    true,
    impl.FIT,
  ),
  fn(
    'PREDICT',
    'Value of the monotone curve fitted to known_ys and known_xs at each new x (flat beyond the data).',
    [P.newXs, P.knownYs, P.knownXs, P.knots, P.direction, P.weights],
    true,
    impl.PREDICT,
  ),
  fn(
    'KNOTS',
    'The fitted model as a table: one row per knot, two columns (knot x, fitted value).',
    [P.knownYs, P.knownXs, P.knots, P.direction, P.weights],
    true,
    impl.KNOTS,
  ),
  fn('EVAL', 'Reads a knot table at each new x: straight lines between knots, flat beyond the ends. No refit.', [P.newXs, P.knotTable], true, impl.EVAL),
  fn('INVERT', 'The x at which the curve of a knot table reaches each target value.', [P.targetYs, P.knotTable, P.tie], true, impl.INVERT),
  fn('QKNOTS', 'count knot positions at quantiles of known_xs, as a column to pass as knots.', [P.knownXs, P.count], true, impl.QKNOTS),
  fn(
    'CV',
    'Cross-validation table: a header row, then per candidate knot count its cv_rmse, cv_se, cv_r2, cv_mae and train_rmse.',
    [P.knownYs, P.knownXs, P.candidates, P.folds, P.repeats, P.seed, P.direction, P.weights],
    true,
    impl.CV,
    true,
  ),
  fn(
    'BESTK',
    'The knot count suggested by cross-validation (one-standard-error rule by default).',
    [P.knownYs, P.knownXs, P.candidates, P.folds, P.repeats, P.seed, P.direction, P.weights, P.rule],
    false,
    impl.BESTK,
    true,
  ),
  fn(
    'STATS',
    'Fit statistics as label/value rows: n, dropped, knots, direction, r2, rmse, mae, sse, levels.',
    [P.knownYs, P.knownXs, P.knots, P.direction, P.weights],
    true,
    impl.STATS,
  ),
  ...SURFACE_FUNCTIONS.map((s) => fn(s.name, s.description, s.params, s.returnsArray, s.invoke, s.longWork)),
]);

const byName = new Map(SHEET_FUNCTIONS.map((f) => [f.name, f]));

/** The function called `name` (without namespace, any case), or undefined. */
export function functionByName(name: string): SheetFunction | undefined {
  return byName.get(name.toUpperCase().replace(/^RATCHET\./, ''));
}
