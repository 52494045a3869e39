/**
 * The one table of worksheet parameters. A function's spec lists entries of this table in the
 * order users type them; the Excel JSDoc `@param` lines (checked by test/functions/metadata.test.ts),
 * the runner plugin's arity, the README syntax lines and every message read them from here. Two
 * entries with the same name differ only in help text (e.g. known_ys of a curve and of a surface).
 */
import type { Choice, ParamSpec } from './types.js';

const RISING_FALLING: readonly Choice[] = [
  { code: 1, value: 'up', label: 'rising' },
  { code: -1, value: 'down', label: 'falling' },
];

/** The choices of a direction: one value means one thing in every function (0 = from the data). */
const FROM_DATA: Choice = { code: 0, value: 'auto', label: 'pick from the data' };

/** A surface axis adds "no constraint along this input" as its own value, 2. */
const SURFACE_DIRECTIONS: readonly Choice[] = [...RISING_FALLING, FROM_DATA, { code: 2, value: 'none', label: 'no constraint' }];

/** Every parameter of the RATCHET functions. */
export const PARAMS = {
  knownYs: {
    name: 'known_ys',
    kind: 'data',
    optional: false,
    coreName: 'y',
    description: 'Observed values: one column or one row. Rows with a blank here, in known_xs or in weights are left out.',
  },
  knownXs: {
    name: 'known_xs',
    kind: 'data',
    optional: false,
    coreName: 'x',
    description: 'Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.',
  },
  knots: {
    name: 'knots',
    kind: 'knots',
    optional: true,
    default: '0 (classic fit)',
    range: '0, a whole number from 2 to 100000, or a range of at least 2 increasing positions',
    description: 'Omitted or 0: classic fit at every distinct x. A whole number K ≥ 2: K evenly spaced knots. A range of ≥ 2 increasing numbers: knot positions.',
  },
  direction: {
    name: 'direction',
    kind: 'choice',
    optional: true,
    default: 'up',
    choices: [...RISING_FALLING, FROM_DATA],
    description: '1 rising (default), -1 falling, 0 pick from the data (sign of the rank correlation).',
  },
  weights: {
    name: 'weights',
    kind: 'data',
    optional: true,
    default: 'every row weighs 1',
    range: 'numbers ≥ 0, one per known_ys cell',
    description: 'Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.',
  },
  newXs: { name: 'new_xs', kind: 'cells', optional: false, description: 'Inputs at which to read the curve: a cell or a range of any shape; blanks stay blank.' },
  knotTable: {
    name: 'knot_table',
    kind: 'table',
    optional: false,
    description: 'Two columns: knot x (strictly increasing) and value, e.g. the result of RATCHET.KNOTS.',
  },
  targetYs: { name: 'target_ys', kind: 'cells', optional: false, coreName: 'target', description: 'Curve values to read back: a cell or a range; blanks stay blank.' },
  tie: {
    name: 'tie',
    kind: 'choice',
    optional: true,
    default: 'middle',
    choices: [
      { code: -1, value: 'lowest', label: 'lowest x' },
      { code: 0, value: 'middle', label: 'middle' },
      { code: 1, value: 'highest', label: 'highest x' },
    ],
    description: 'Where the curve is flat at the target: -1 lowest x, 0 middle (default), 1 highest x.',
  },
  count: { name: 'count', kind: 'number', optional: false, range: 'a whole number ≥ 2', description: 'Number of knots, a whole number ≥ 2.' },
  candidates: {
    name: 'candidates',
    kind: 'list',
    optional: true,
    default: '2 to min(20, distinct x)',
    description: 'Knot counts to compare (0 = classic fit): a number or a range, e.g. SEQUENCE(19,1,2). Default 2 to min(20, distinct x).',
  },
  folds: { name: 'folds', kind: 'number', optional: true, default: '5', range: '2 to the number of rows', description: 'Number of folds, 2 to the number of rows. Default 5.' },
  repeats: { name: 'repeats', kind: 'number', optional: true, default: '1', range: 'a whole number ≥ 1', description: 'Number of repeats with fresh shuffles, ≥ 1. Default 1.' },
  seed: {
    name: 'seed',
    kind: 'number',
    optional: true,
    default: '1',
    range: 'a whole number; 0 for no shuffle',
    description: 'Whole number for the shuffle; 0 means no shuffle (blocks in row order). Default 1.',
  },
  rule: {
    name: 'rule',
    kind: 'choice',
    optional: true,
    default: 'one-se',
    choices: [
      { code: 1, value: 'one-se', label: 'one-standard-error rule' },
      { code: 0, value: 'min', label: 'minimum' },
    ],
    description: '1 one-standard-error rule: fewest knots within one SE of the best (default); 0 the minimum.',
  },
  curvature: {
    name: 'curvature',
    kind: 'choice',
    optional: true,
    default: 'any',
    choices: [
      { code: 0, value: 'any', label: 'any' },
      { code: -1, value: 'concave', label: 'concave' },
      { code: 1, value: 'convex', label: 'convex' },
    ],
    description: 'Knot model only: 0 any (default), -1 concave (slopes never increase), 1 convex (slopes never decrease).',
  },
  degree: {
    name: 'degree',
    kind: 'choice',
    optional: true,
    default: 'linear',
    choices: [
      { code: 1, value: 'linear', label: 'piecewise linear' },
      { code: 2, value: 'smooth', label: 'smooth (quadratic)' },
    ],
    description: 'Knot model only: 1 piecewise linear (default), 2 smooth monotone curve (quadratic B-spline).',
  },
  level: {
    name: 'level',
    kind: 'number',
    optional: true,
    default: '0.95',
    range: 'strictly between 0 and 1',
    description: 'Confidence level, strictly between 0 and 1. Default 0.95.',
  },
  bandKind: {
    name: 'kind',
    kind: 'choice',
    optional: true,
    default: 'confidence',
    choices: [
      { code: 1, value: 'confidence', label: 'confidence band for the curve' },
      { code: 2, value: 'prediction', label: 'prediction band for one new observation' },
    ],
    description: '1 confidence band for the curve (default), 2 prediction band for one new observation of weight 1.',
  },
  replicates: {
    name: 'replicates',
    kind: 'number',
    optional: true,
    default: '1',
    range: 'a number ≥ 1',
    description: 'Number of new measurements averaged into each target, ≥ 1. Default 1.',
  },
  // Surfaces (two inputs).
  newX1s: {
    name: 'new_x1s',
    kind: 'cells',
    optional: false,
    coreName: 'new_x1',
    description: 'First inputs at which to read the surface: a cell or a range of any shape; blanks stay blank.',
  },
  newX2s: { name: 'new_x2s', kind: 'cells', optional: false, coreName: 'new_x2', description: 'Second inputs, one per new_x1s cell (same number of cells).' },
  surfaceYs: {
    name: 'known_ys',
    kind: 'data',
    optional: false,
    coreName: 'y',
    description: 'Observed values: one column or one row. Rows with a blank here, in an input or in weights are left out.',
  },
  knownX1s: {
    name: 'known_x1s',
    kind: 'data',
    optional: false,
    coreName: 'x1',
    description: 'First input, one per known_ys cell (a column or a row). Blank cells leave their row out.',
  },
  knownX2s: {
    name: 'known_x2s',
    kind: 'data',
    optional: false,
    coreName: 'x2',
    description: 'Second input, one per known_ys cell (a column or a row). Blank cells leave their row out.',
  },
  knots1: {
    name: 'knots1',
    kind: 'knots',
    optional: true,
    default: '0 (every distinct value)',
    range: '0, a whole number from 2 to 200, or a range of positions',
    description: 'Knots along the first input. Omitted or 0: every distinct value. A whole number K from 2 to 200: K evenly spaced knots. A range: knot positions.',
  },
  knots2: {
    name: 'knots2',
    kind: 'knots',
    optional: true,
    default: '0 (every distinct value)',
    range: 'as knots1',
    description: 'Knots along the second input, as knots1. The surface has knots1 × knots2 values: keep it small.',
  },
  direction1: {
    name: 'direction1',
    kind: 'choice',
    optional: true,
    default: 'up',
    choices: SURFACE_DIRECTIONS,
    description: 'Along the first input: 1 rising (default), -1 falling, 0 pick from the data (sign of its rank correlation with y), 2 no constraint.',
  },
  direction2: {
    name: 'direction2',
    kind: 'choice',
    optional: true,
    default: 'up',
    choices: SURFACE_DIRECTIONS,
    description: 'Along the second input: 1 rising (default), -1 falling, 0 pick from the data (sign of its rank correlation with y), 2 no constraint.',
  },
  candidates1: {
    name: 'candidates1',
    kind: 'list',
    optional: true,
    default: '2 to 6',
    description: 'Knot counts to compare along the first input (0 = every level): a number or a range. Default 2 to 6.',
  },
  candidates2: {
    name: 'candidates2',
    kind: 'list',
    optional: true,
    default: '2 to 6',
    description: 'Knot counts to compare along the second input, as candidates1. Every pair is scored.',
  },
} as const satisfies Record<string, ParamSpec>;
