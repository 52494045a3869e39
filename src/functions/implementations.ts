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
  RatchetError,
  fail,
  bandAt,
  evaluateTable,
  inverseBand,
  invertTable,
  spearman,
  interpolateAt,
  invertChecked,
  checkKnotTable,
  knotRegression,
  quantileKnots,
  suggestKnots,
  type BandKind,
  type CrossValidationResult,
  type Curvature,
  type Degree,
  type DirectionOption,
  type TableInterpolation,
  type TieRule,
} from '../core/index.js';
import { mapError, type CellErrorCode } from '../adapter/errors.js';
import { MAX_MAGNITUDE, MIN_MAGNITUDE, nonBlank, type Vector } from '../adapter/cells.js';
import type { CellArg, CellErrorOut, CellOut, InvokeContext } from './types.js';
import { defineFunction, pairData, positionsOf, type Args } from './define.js';
import { cachedBand, cachedCrossValidation, cachedFit, memo, type FitEntry, type Shape } from './engine.js';
import { PARAMS as P } from './params.js';

/** Parameters of the fitting functions after their leading ones: knots, direction, weights, curvature, degree. */
const FIT_PARAMS = [P.knownYs, P.knownXs, P.knots, P.direction, P.weights, P.curvature, P.degree] as const;
type FitName = (typeof FIT_PARAMS)[number]['name'];

const CURVATURE_OF: Readonly<Record<string, Curvature>> = { any: 0, concave: -1, convex: 1 };
const DEGREE_OF: Readonly<Record<string, Degree>> = { linear: 1, smooth: 2 };

/** The curvature and degree arguments as the core takes them (omitted: any, piecewise linear). */
function shapeOf(a: Args<'curvature' | 'degree'>): Shape {
  return { curvature: CURVATURE_OF[a.choice<string>('curvature')]!, degree: DEGREE_OF[a.choice<string>('degree')]! };
}

/** The cached fit of known_ys, known_xs, knots, direction, weights, curvature and degree. */
function fitOf(a: Args<FitName>): { ys: Vector; entry: FitEntry } {
  const data = a.rows(['known_ys', 'known_xs'], 'weights');
  const knots = a.knots('knots');
  const direction = a.choice<DirectionOption>('direction');
  return { ys: data.columns[0]!.vector, entry: cachedFit(data, knots, direction, shapeOf(a)) };
}

/** The value of a fitted knot table at x: linear, or quadratic for a smooth fit's table. O(log K). */
function tableAt(knotX: Float64Array, knotY: Float64Array, interpolation: TableInterpolation, x: number): number {
  return interpolation === 'linear' ? interpolateAt(knotX, knotY, x) : evaluateTable(knotX, knotY, interpolation, [x])[0]!;
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
    const model = fitOf(a).entry.model;
    const { knotX, knotY } = model;
    const interpolation: TableInterpolation = model.interpolation ?? 'linear';
    if (nx === undefined) return [[tableAt(knotX, knotY, interpolation, single)]];
    const v = nx.values;
    return shaped(nx, (i) => {
      const x = v[i]!;
      return x === x ? tableAt(knotX, knotY, interpolation, x) : '';
    });
  },
});

/**
 * RATCHET.KNOTS(known_ys, known_xs, [knots], [direction], [weights], [curvature], [degree]).
 * A smooth fit (degree 2) gives 2K − 1 rows (each knot and each interval midpoint with the curve's
 * value there) and a third column holding 2 in every row: the mark that tells EVAL and INVERT to
 * read the table quadratically (a parabola through each interval's three rows, which is the curve).
 */
export const KNOTS = defineFunction({
  name: 'KNOTS',
  description: 'The fitted model as a table: one row per knot, two columns (knot x, fitted value); a smooth fit adds midpoints and a third column of 2s.',
  params: FIT_PARAMS,
  returnsArray: true,
  run(a) {
    const { knotX, knotY, interpolation } = knotTableOf(a);
    const smooth = interpolation === 'quadratic';
    const out: CellOut[][] = new Array(knotX.length);
    for (let j = 0; j < knotX.length; j++) out[j] = smooth ? [knotX[j]!, knotY[j]!, 2] : [knotX[j]!, knotY[j]!];
    return out;
  },
});

/**
 * The knot table KNOTS shows. A plain knot fit (knots ≥ 2 or positions, curvature any, degree
 * linear) is fitted for its table only — the same table as the full fit, without the pass over
 * every row for fitted values and statistics (README, "Performance") — and cached on its own;
 * the classic fit and shaped fits share FIT's cached model. Arguments are read in fitOf's order.
 */
function knotTableOf(a: Args<FitName>): { knotX: Float64Array; knotY: Float64Array; interpolation?: TableInterpolation } {
  const data = a.rows(['known_ys', 'known_xs'], 'weights');
  const knots = a.knots('knots');
  const direction = a.choice<DirectionOption>('direction');
  const shape = shapeOf(a);
  if (knots === 0 || shape.curvature !== 0 || shape.degree !== 1) return cachedFit(data, knots, direction, shape).model;
  return memo('knot-table', [...data.columns.map((c) => c.vector), data.weights?.vector, knots, direction], () => {
    const p = pairData(data);
    const fit = knotRegression(p.columns[1]!, p.columns[0]!, { knots, direction, weights: p.weights, fitted: false });
    return { value: fit, bytes: fit.knotX.byteLength * 2 + fit.identified.byteLength };
  });
}

/** A checked knot table: positions, values and how it is read. */
type KnotTable = readonly [Float64Array, Float64Array, TableInterpolation];
const tables = new WeakMap<Vector, KnotTable>();

/**
 * Reads a knot table: two columns (position, value), read linearly, or three columns whose third
 * holds the degree in every row — 1 linear, 2 quadratic (the table of a smooth fit, as KNOTS gives
 * it). Rows that are entirely blank are skipped (so a range larger than a spilled KNOTS table
 * works), a half-blank row is an error.
 */
function knotTable(v: Vector, minimum: number): KnotTable {
  const hit = tables.get(v);
  if (hit) return hit;
  const w = v.cols;
  if (w !== 2 && w !== 3) fail('BAD_KNOTS', 'knot_table', `needs two columns (knot x, value) or three (knot x, value, degree 1 or 2); got ${w}`);
  const tx: number[] = [];
  const ty: number[] = [];
  let degree = 0;
  for (let r = 0; r < v.rows; r++) {
    const a = v.values[w * r]!;
    const b = v.values[w * r + 1]!;
    const d = w === 3 ? v.values[w * r + 2]! : a !== a && b !== b ? NaN : 1;
    if (a !== a && b !== b && d !== d) continue;
    if (a !== a || b !== b || d !== d) fail('BAD_KNOTS', 'knot_table', `needs a position and a value${w === 3 ? ' and a degree' : ''} in every row; row ${r + 1} has a blank`);
    if (d !== 1 && d !== 2) fail('BAD_KNOTS', 'knot_table', `needs the degree 1 or 2 in its third column; row ${r + 1} has ${d}`);
    if (degree !== 0 && d !== degree) fail('BAD_KNOTS', 'knot_table', `needs the same degree in every row of its third column; row ${r + 1} has ${d}, earlier rows ${degree}`);
    degree = d;
    tx.push(a);
    ty.push(b);
  }
  if (tx.length < minimum) fail('BAD_KNOTS', 'knot_table', `needs at least ${minimum} knot row${minimum > 1 ? 's' : ''}; got ${tx.length}`);
  const [cx, cy] = checkKnotTable(tx, ty, 'knot_table');
  if (degree === 2 && (cx.length < 3 || cx.length % 2 === 0)) {
    fail('BAD_KNOTS', 'knot_table', `needs an odd number of rows, at least 3 (knots and midpoints), when its third column says 2; got ${cx.length}`);
  }
  const table: KnotTable = [cx, cy, degree === 2 ? 'quadratic' : 'linear'];
  tables.set(v, table);
  return table;
}

/** RATCHET.EVAL(new_xs, knot_table). */
export const EVAL = defineFunction({
  name: 'EVAL',
  description: 'Reads a knot table at each new x: straight lines between knots (a parabola per interval for a smooth table), flat beyond the ends. No refit.',
  params: [P.newXs, P.knotTable],
  returnsArray: true,
  run(a) {
    const nx = a.cells('new_xs');
    const [tx, ty, interpolation] = knotTable(a.cells('knot_table'), 1);
    const v = nx.values;
    return shaped(nx, (i) => {
      const x = v[i]!;
      return x === x ? tableAt(tx, ty, interpolation, x) : '';
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
    const [tx, ty, interpolation] = knotTable(a.cells('knot_table'), 2);
    const tie = a.choice<TieRule>('tie');
    const v = targets.values;
    return shaped(targets, (i) => {
      const t = v[i]!;
      if (t !== t) return '';
      return interpolation === 'linear' ? invertChecked(tx, ty, t, tie) : invertTable(tx, ty, interpolation, t, tie);
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

/** Leading parameters of CV and BESTK; CV appends curvature and degree, BESTK rule, curvature and degree. */
const CV_BASE = [P.knownYs, P.knownXs, P.candidates, P.folds, P.repeats, P.seed, P.direction, P.weights] as const;
const CV_PARAMS = [...CV_BASE, P.curvature, P.degree] as const;
type CvName = (typeof CV_PARAMS)[number]['name'];

function cvOf(a: Args<CvName>, ctx: InvokeContext | undefined): CrossValidationResult {
  const data = a.rows(['known_ys', 'known_xs'], 'weights');
  const req = { candidates: a.list('candidates'), folds: a.number('folds'), repeats: a.number('repeats'), seed: a.number('seed') };
  const direction = a.choice<DirectionOption>('direction');
  return cachedCrossValidation(data, req, direction, ctx, shapeOf(a));
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
  params: [...CV_BASE, P.rule, P.curvature, P.degree],
  returnsArray: false,
  longWork: true,
  run(a, ctx) {
    const rule = a.choice<'one-se' | 'min'>('rule');
    return suggestKnots(cvOf(a, ctx).scores, rule).knots;
  },
});

/** An error cell of a result: the one mapping of src/adapter/errors.ts applied to `e`. */
function errorCell(e: RatchetError): CellErrorOut {
  const m = mapError(e);
  return { kind: 'error', code: m.code satisfies CellErrorCode, message: m.message };
}

/** A `#N/A` cell with a message: a statistic these data do not define. */
function naCell(message: string): CellErrorOut {
  return { kind: 'error', code: '#N/A', message };
}

/** σ̂ = √(sse / (n_used − levels)), or an error cell when no degree of freedom is left. */
function sigmaOf(e: FitEntry): number | CellErrorOut {
  const df = e.model.stats.n - e.model.levels;
  if (df < 1) return naCell(`known_ys: needs more rows with positive weight (${e.model.stats.n}) than fitted levels (${e.model.levels}) to estimate the scatter.`);
  return Math.sqrt(e.model.stats.sse / df);
}

/**
 * Rows of the STATS table, in order: label and value. New rows are appended at the end (users
 * read them by position). `rho` is Spearman's rank correlation of the rows with positive weight.
 */
const STATS_ROWS: readonly (readonly [string, (e: FitEntry, rho: number) => number | CellErrorOut])[] = [
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
  ['sigma', sigmaOf],
  ['df_resid', (e) => e.model.stats.n - e.model.levels],
  [
    'spearman',
    (_e, rho) => (rho === rho ? rho : naCell('known_ys: needs x and y that both vary among the rows with positive weight for a rank correlation.')),
  ],
];

/** Row labels of the STATS table, in order. */
export const STATS_LABELS: readonly string[] = STATS_ROWS.map(([label]) => label);

/** Spearman's ρ of (known_xs, known_ys) over the rows with positive weight; NaN when x or y is constant. O(n log n). */
function rankCorrelation(data: ReturnType<Args<FitName>['rows']>): number {
  const p = pairData(data);
  const y = p.columns[0]!;
  const x = p.columns[1]!;
  return spearman(x, y, p.weights);
}

/** RATCHET.STATS(known_ys, known_xs, [knots], [direction], [weights], [curvature], [degree]). */
export const STATS = defineFunction({
  name: 'STATS',
  description: 'Fit statistics as label/value rows: n, dropped, knots, direction, r2, rmse, mae, sse, levels, text_rows, sigma, df_resid, spearman.',
  params: FIT_PARAMS,
  returnsArray: true,
  run(a) {
    const data = a.rows(['known_ys', 'known_xs'], 'weights');
    const entry = cachedFit(data, a.knots('knots'), a.choice<DirectionOption>('direction'), shapeOf(a));
    // ρ depends on the data only (O(n log n): two rankings); cached like the fit.
    const parts = [...data.columns.map((c) => c.vector), data.weights?.vector];
    const rho = memo('spearman', parts, () => ({ value: rankCorrelation(data), bytes: 8 }));
    return STATS_ROWS.map(([label, value]) => [label, value(entry, rho)]);
  },
});

/** BAND and INVERTBAND: the data, the knot model's options, then their own. */
const BAND_PARAMS = [P.newXs, P.knownYs, P.knownXs, P.knots, P.direction, P.weights, P.level, P.bandKind, P.curvature, P.degree] as const;
const INVERTBAND_PARAMS = [P.targetYs, P.knownYs, P.knownXs, P.knots, P.direction, P.weights, P.level, P.replicates, P.curvature, P.degree] as const;

/**
 * Three values per cell of `v`, laid out as the functions promise: a column or one cell → three
 * columns (one row per cell); a row → three rows (one column per cell). Other shapes are refused.
 */
function threeWide(v: Vector, name: string, values: (i: number) => readonly [CellOut, CellOut, CellOut]): CellOut[][] {
  const n = v.values.length;
  if (v.rows > 1 && v.cols > 1) fail('BAD_OPTION', name, `needs one cell, one column or one row; got ${v.rows} rows × ${v.cols} columns`);
  const triples = Array.from({ length: n }, (_, i) => values(i));
  if (v.rows === 1 && v.cols > 1) return [0, 1, 2].map((k) => triples.map((t) => t[k]!));
  return triples.map((t) => [t[0], t[1], t[2]]);
}

/** The knot model's band of the data with the arguments given (knots 0 refused). */
function bandModelOf(a: Args<'known_ys' | 'known_xs' | 'knots' | 'direction' | 'weights' | 'curvature' | 'degree'>) {
  const data = a.rows(['known_ys', 'known_xs'], 'weights');
  const knots = a.knots('knots');
  const direction = a.choice<DirectionOption>('direction');
  return cachedBand(data, knots, direction, shapeOf(a));
}

/** RATCHET.BAND(new_xs, known_ys, known_xs, [knots], [direction], [weights], [level], [kind], [curvature], [degree]). */
export const BAND = defineFunction({
  name: 'BAND',
  description: 'Lower edge, fitted value and upper edge of the knot model’s confidence or prediction band at each new x.',
  params: BAND_PARAMS,
  returnsArray: true,
  run(a) {
    const nx = a.cells('new_xs');
    const model = bandModelOf(a);
    const level = a.number('level') ?? 0.95;
    const kind = a.choice<BandKind>('kind');
    const at: number[] = [];
    for (const x of nx.values) if (x === x) at.push(x);
    const b = bandAt(model, at, level, kind);
    let k = 0;
    return threeWide(nx, 'new_xs', (i) => {
      if (nx.values[i] !== nx.values[i]) return ['', '', ''];
      const r = [b.lower[k]!, b.fit[k]!, b.upper[k]!] as const;
      k++;
      return r;
    });
  },
});

/** RATCHET.INVERTBAND(target_ys, known_ys, known_xs, [knots], [direction], [weights], [level], [replicates], [curvature], [degree]). */
export const INVERTBAND = defineFunction({
  name: 'INVERTBAND',
  description: 'Lower x, read-back x and upper x of the calibration interval for each target y (the x whose prediction band contains it).',
  params: INVERTBAND_PARAMS,
  returnsArray: true,
  run(a) {
    const targets = a.cells('target_ys');
    const model = bandModelOf(a);
    const level = a.number('level') ?? 0.95;
    const replicates = a.number('replicates') ?? 1;
    const at: number[] = [];
    for (const t of targets.values) if (t === t) at.push(t);
    const rows = inverseBand(model, at, level, replicates);
    const cell = (v: number | RatchetError): CellOut => (typeof v === 'number' ? v : errorCell(v));
    let k = 0;
    return threeWide(targets, 'target_ys', (i) => {
      if (targets.values[i] !== targets.values[i]) return ['', '', ''];
      const r = rows[k++]!;
      return [cell(r.lower), cell(r.x), cell(r.upper)] as const;
    });
  },
});
