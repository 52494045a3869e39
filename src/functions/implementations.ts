/**
 * The one-input RATCHET worksheet functions, host-neutral: each is one spec (name, description,
 * named parameters from src/functions/params.ts) and one implementation that reads its arguments
 * by name (src/functions/define.ts). Hosts call them through the registry and map what they throw
 * with src/adapter/errors.ts `mapError` — the Excel entry, the worker and the headless runner alike.
 *
 * Argument order follows Excel's trend functions: known y's, then known x's. Optional arguments
 * may be omitted (undefined) or null. Cost per call: O(cells) to read the arguments (nothing for
 * arguments already seen by identity) plus the fit on a cache miss; see engine.ts.
 */
import {
  fail,
  interpolateAt,
  invertChecked,
  checkKnotTable,
  quantileKnots,
  suggestKnots,
  type CrossValidationResult,
  type DirectionOption,
  type TieRule,
} from '../core/index.js';
import { MAX_MAGNITUDE, MIN_MAGNITUDE, nonBlank, type Vector } from '../adapter/cells.js';
import type { CellArg, CellOut, InvokeContext } from './types.js';
import { defineFunction, positionsOf, type Args } from './define.js';
import { cachedCrossValidation, cachedFit, type FitEntry } from './engine.js';
import { PARAMS as P } from './params.js';

/** Parameters of the fitting functions after their leading ones: knots, direction, weights. */
const FIT_PARAMS = [P.knownYs, P.knownXs, P.knots, P.direction, P.weights] as const;
type FitName = (typeof FIT_PARAMS)[number]['name'];

/** The cached fit of known_ys, known_xs, knots, direction and weights. */
function fitOf(a: Args<FitName>): { ys: Vector; entry: FitEntry } {
  const data = a.rows(['known_ys', 'known_xs'], 'weights');
  const knots = a.knots('knots');
  return { ys: data.columns[0]!.vector, entry: cachedFit(data, knots, a.choice<DirectionOption>('direction')) };
}

/** A result grid of `v`'s shape filled by `cell(i)` in reading order. */
function shaped(v: Vector, cell: (i: number) => CellOut): CellOut[][] {
  const out: CellOut[][] = new Array(v.rows);
  let i = 0;
  for (let r = 0; r < v.rows; r++) {
    const row: CellOut[] = new Array(v.cols);
    for (let c = 0; c < v.cols; c++) row[c] = cell(i++);
    out[r] = row;
  }
  return out;
}

/** RATCHET.FIT(known_ys, known_xs, [knots], [direction], [weights]). */
export const FIT = defineFunction({
  name: 'FIT',
  description: 'Monotone fitted value for every row of known_ys, same shape; rows left out (blank x, y or weight) stay empty.',
  params: FIT_PARAMS,
  returnsArray: true,
  run(a) {
    const { ys, entry } = fitOf(a);
    const fitted = entry.model.fitted;
    const at = new Int32Array(ys.values.length).fill(-1);
    for (let k = 0; k < entry.used.length; k++) at[entry.used[k]!] = k;
    return shaped(ys, (i) => (at[i]! >= 0 ? fitted[at[i]!]! : ''));
  },
});

/** A single finite new x in the accepted range, or NaN (then the general path reads the argument). */
function singleNumber(arg: CellArg): number {
  let v: unknown = arg;
  if (Array.isArray(arg)) {
    if (arg.length !== 1) return NaN;
    const row: unknown = arg[0];
    if (!Array.isArray(row) || row.length !== 1) return NaN;
    v = row[0];
  }
  if (typeof v !== 'number') return NaN;
  const a = v < 0 ? -v : v;
  return a <= MAX_MAGNITUDE && (a >= MIN_MAGNITUDE || a === 0) ? v : NaN;
}

/**
 * RATCHET.PREDICT(new_xs, known_ys, known_xs, [knots], [direction], [weights]).
 * Per-cell calls (one new x each) over the same data cost one fit: the data arguments are
 * recognised by content (src/adapter/cells.ts) and the fit comes from the result cache, so a host
 * may pass fresh or mutated arrays on every call and still never gets a stale curve.
 */
const PREDICT_PARAMS = [P.newXs, ...FIT_PARAMS] as const;
/** Parameter positions of PREDICT (new_xs is read once per call). */
const AT = positionsOf(PREDICT_PARAMS);

export const PREDICT = defineFunction({
  name: 'PREDICT',
  description: 'Value of the monotone curve fitted to known_ys and known_xs at each new x (flat beyond the data).',
  params: PREDICT_PARAMS,
  returnsArray: true,
  run(a) {
    const single = singleNumber(a.raw[AT.new_xs]);
    // Read new_xs first so its errors come first.
    const nx = single === single ? undefined : a.cells('new_xs');
    const { knotX, knotY } = fitOf(a).entry.model;
    if (nx === undefined) return [[interpolateAt(knotX, knotY, single)]];
    const v = nx.values;
    return shaped(nx, (i) => {
      const x = v[i]!;
      return x === x ? interpolateAt(knotX, knotY, x) : '';
    });
  },
});

/** RATCHET.KNOTS(known_ys, known_xs, [knots], [direction], [weights]). */
export const KNOTS = defineFunction({
  name: 'KNOTS',
  description: 'The fitted model as a table: one row per knot, two columns (knot x, fitted value).',
  params: FIT_PARAMS,
  returnsArray: true,
  run(a) {
    const { knotX, knotY } = fitOf(a).entry.model;
    const out: CellOut[][] = new Array(knotX.length);
    for (let j = 0; j < knotX.length; j++) out[j] = [knotX[j]!, knotY[j]!];
    return out;
  },
});

const tables = new WeakMap<Vector, [Float64Array, Float64Array]>();

/**
 * Reads a two-column knot table (position, value); rows that are entirely blank are skipped
 * (so a range larger than a spilled KNOTS table works), a half-blank row is an error.
 */
function knotTable(v: Vector, minimum: number): [Float64Array, Float64Array] {
  const hit = tables.get(v);
  if (hit) return hit;
  if (v.cols !== 2) fail('BAD_KNOTS', 'knot_table', `needs exactly two columns (knot x, value); got ${v.cols}`);
  const tx: number[] = [];
  const ty: number[] = [];
  for (let r = 0; r < v.rows; r++) {
    const a = v.values[2 * r]!;
    const b = v.values[2 * r + 1]!;
    if (a !== a && b !== b) continue;
    if (a !== a || b !== b) fail('BAD_KNOTS', 'knot_table', `needs a position and a value in every row; row ${r + 1} has a blank`);
    tx.push(a);
    ty.push(b);
  }
  if (tx.length < minimum) fail('BAD_KNOTS', 'knot_table', `needs at least ${minimum} knot row${minimum > 1 ? 's' : ''}; got ${tx.length}`);
  const table = checkKnotTable(tx, ty, 'knot_table');
  tables.set(v, table);
  return table;
}

/** RATCHET.EVAL(new_xs, knot_table). */
export const EVAL = defineFunction({
  name: 'EVAL',
  description: 'Reads a knot table at each new x: straight lines between knots, flat beyond the ends. No refit.',
  params: [P.newXs, P.knotTable],
  returnsArray: true,
  run(a) {
    const nx = a.cells('new_xs');
    const [tx, ty] = knotTable(a.cells('knot_table'), 1);
    const v = nx.values;
    return shaped(nx, (i) => {
      const x = v[i]!;
      return x === x ? interpolateAt(tx, ty, x) : '';
    });
  },
});

/** RATCHET.INVERT(target_ys, knot_table, [tie]). */
export const INVERT = defineFunction({
  name: 'INVERT',
  description: 'The x at which the curve of a knot table reaches each target value.',
  params: [P.targetYs, P.knotTable, P.tie],
  returnsArray: true,
  run(a) {
    const targets = a.cells('target_ys');
    const [tx, ty] = knotTable(a.cells('knot_table'), 2);
    const tie = a.choice<TieRule>('tie');
    const v = targets.values;
    return shaped(targets, (i) => {
      const t = v[i]!;
      return t === t ? invertChecked(tx, ty, t, tie) : '';
    });
  },
});

/** RATCHET.QKNOTS(known_xs, count). */
export const QKNOTS = defineFunction({
  name: 'QKNOTS',
  description: 'count knot positions at quantiles of known_xs, as a column to pass as knots.',
  params: [P.knownXs, P.count],
  returnsArray: true,
  run(a) {
    const xs = nonBlank(a.data('known_xs'));
    const count = a.number('count');
    if (count === undefined) fail('BAD_KNOTS', 'count', 'needs a whole number of knots ≥ 2; got nothing');
    if (xs.length === 0) fail('EMPTY_INPUT', 'known_xs', 'needs at least one number; got none');
    return Array.from(quantileKnots(xs, count), (v) => [v]);
  },
});

/** Parameters of CV; BESTK appends `rule`. */
const CV_PARAMS = [P.knownYs, P.knownXs, P.candidates, P.folds, P.repeats, P.seed, P.direction, P.weights] as const;
type CvName = (typeof CV_PARAMS)[number]['name'];

function cvOf(a: Args<CvName>, ctx: InvokeContext | undefined): CrossValidationResult {
  const data = a.rows(['known_ys', 'known_xs'], 'weights');
  const req = { candidates: a.list('candidates'), folds: a.number('folds'), repeats: a.number('repeats'), seed: a.number('seed') };
  return cachedCrossValidation(data, req, a.choice<DirectionOption>('direction'), ctx);
}

/** Column headers of the CV table. */
export const CV_HEADER: readonly string[] = ['knots', 'cv_rmse', 'cv_se', 'cv_r2', 'cv_mae', 'train_rmse'];

/** RATCHET.CV(known_ys, known_xs, [candidates], [folds], [repeats], [seed], [direction], [weights]). */
export const CV = defineFunction({
  name: 'CV',
  description: 'Cross-validation table: a header row, then per candidate knot count its cv_rmse, cv_se, cv_r2, cv_mae and train_rmse.',
  params: CV_PARAMS,
  returnsArray: true,
  longWork: true,
  run(a, ctx) {
    const r = cvOf(a, ctx);
    const out: CellOut[][] = [CV_HEADER.slice()];
    for (const s of r.scores) out.push([s.knots, s.cvRmse, s.cvSe, s.cvR2, s.cvMae, s.trainRmse]);
    return out;
  },
});

/** RATCHET.BESTK(known_ys, known_xs, [candidates], [folds], [repeats], [seed], [direction], [weights], [rule]). */
export const BESTK = defineFunction({
  name: 'BESTK',
  description: 'The knot count suggested by cross-validation (one-standard-error rule by default).',
  params: [...CV_PARAMS, P.rule],
  returnsArray: false,
  longWork: true,
  run(a, ctx) {
    const rule = a.choice<'one-se' | 'min'>('rule');
    return suggestKnots(cvOf(a, ctx).scores, rule).knots;
  },
});

/**
 * Rows of the STATS table, in order: label and value. New rows are appended at the end (users
 * read them by position).
 */
const STATS_ROWS: readonly (readonly [string, (e: FitEntry) => number])[] = [
  ['n', (e) => e.used.length],
  ['dropped', (e) => e.rows - e.used.length],
  ['knots', (e) => e.model.knotX.length],
  ['direction', (e) => (e.model.direction === 'up' ? 1 : -1)],
  ['r2', (e) => e.model.stats.r2],
  ['rmse', (e) => e.model.stats.rmse],
  ['mae', (e) => e.model.stats.mae],
  ['sse', (e) => e.model.stats.sse],
  ['levels', (e) => e.model.levels],
  ['text_rows', (e) => e.textRows],
];

/** Row labels of the STATS table, in order. */
export const STATS_LABELS: readonly string[] = STATS_ROWS.map(([label]) => label);

/** RATCHET.STATS(known_ys, known_xs, [knots], [direction], [weights]). */
export const STATS = defineFunction({
  name: 'STATS',
  description: 'Fit statistics as label/value rows: n, dropped, knots, direction, r2, rmse, mae, sse, levels, text_rows.',
  params: FIT_PARAMS,
  returnsArray: true,
  run(a) {
    const { entry } = fitOf(a);
    return STATS_ROWS.map(([label, value]) => [label, value(entry)]);
  },
});
