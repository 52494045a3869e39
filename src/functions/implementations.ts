/**
 * The nine RATCHET worksheet functions, host-neutral: each takes the cell arguments in the order
 * users type them and returns a cell result, or throws (a RatchetError for argument problems, an
 * InputCellError for an error cell in a data range). Hosts map what is thrown with
 * src/adapter/errors.ts `mapError` — the Excel entry, the worker and the headless runner alike.
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
  type DirectionOption,
  type TieRule,
  type CrossValidationResult,
} from '../core/index.js';
import { MAX_MAGNITUDE, MIN_MAGNITUDE, nonBlank, readChoice, readKnots, readScalar, readVector, toGrid, type Vector } from '../adapter/cells.js';
import type { CellArg, CellOut, CellResult, InvokeContext } from './types.js';
import { cacheGeneration, cachedCrossValidation, cachedFit, renamed, type DataArgs, type FitEntry } from './engine.js';


const DIRECTIONS: ReadonlyMap<number, DirectionOption> = new Map<number, DirectionOption>([
  [1, 'up'],
  [-1, 'down'],
  [0, 'auto'],
]);
const TIES: ReadonlyMap<number, TieRule> = new Map<number, TieRule>([
  [-1, 'lowest'],
  [0, 'middle'],
  [1, 'highest'],
]);
const RULES: ReadonlyMap<number, 'one-se' | 'min'> = new Map<number, 'one-se' | 'min'>([
  [1, 'one-se'],
  [0, 'min'],
]);

function direction(arg: CellArg): DirectionOption {
  return readChoice('direction', arg, DIRECTIONS, 'up', '1 (rising), -1 (falling) or 0 (pick from the data)');
}

/** Weights: omitted, null, or a range that is entirely blank count as "no weights". */
function weights(arg: CellArg): Vector | undefined {
  if (arg === undefined || arg === null || arg === '') return undefined;
  return readVector('weights', arg, 'line');
}

function dataArgs(ys: CellArg, xs: CellArg, ws: CellArg): DataArgs {
  const y = readVector('known_ys', ys, 'line');
  const x = readVector('known_xs', xs, 'line');
  const w = weights(ws);
  return { y, x, w };
}

function fitOf(args: readonly CellArg[], offset: number): { data: DataArgs; entry: FitEntry } {
  const data = dataArgs(args[offset], args[offset + 1], args[offset + 4]);
  const knots = readKnots('knots', args[offset + 2]);
  const dir = direction(args[offset + 3]);
  return { data, entry: cachedFit(data, knots, dir) };
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

/** Every number of a result must be finite: anything else would be a numerical failure (#NUM!). */
function finite(name: string, result: CellResult): CellResult {
  const bad = (v: CellOut): boolean => typeof v === 'number' && !Number.isFinite(v);
  if (Array.isArray(result)) {
    for (const row of result) for (const v of row) if (bad(v)) fail('NUMERICAL', name, 'produced a non-finite number (a numerical failure)');
  } else if (bad(result)) fail('NUMERICAL', name, 'produced a non-finite number (a numerical failure)');
  return result;
}

/** RATCHET.FIT(known_ys, known_xs, [knots], [direction], [weights]). */
export function FIT(args: readonly CellArg[]): CellResult {
  const { data, entry } = fitOf(args, 0);
  const fitted = entry.model.fitted;
  const at = new Int32Array(data.y.values.length).fill(-1);
  for (let k = 0; k < entry.used.length; k++) at[entry.used[k]!] = k;
  return finite('FIT', shaped(data.y, (i) => (at[i]! >= 0 ? fitted[at[i]!]! : '')));
}

/** The model behind the previous PREDICT call and the argument objects it came from. */
interface PredictMemo {
  readonly ys: CellArg;
  readonly xs: CellArg;
  readonly knots: CellArg;
  readonly direction: CellArg;
  readonly weights: CellArg;
  readonly generation: number;
  readonly knotX: Float64Array;
  readonly knotY: Float64Array;
}
let lastPredict: PredictMemo | undefined;

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
 * Fast path: when the data and option arguments are the very objects (or equal scalars) of the
 * previous call — a host reusing one value array per range — the model is reused without reading
 * them again (arguments are never mutated after they are passed; see SheetFunction.invoke).
 */
export function PREDICT(args: readonly CellArg[]): CellResult {
  let knotX: Float64Array;
  let knotY: Float64Array;
  const m = lastPredict;
  const single = singleNumber(args[0]);
  if (
    m !== undefined &&
    args[1] === m.ys &&
    args[2] === m.xs &&
    args[3] === m.knots &&
    args[4] === m.direction &&
    args[5] === m.weights &&
    m.generation === cacheGeneration()
  ) {
    knotX = m.knotX;
    knotY = m.knotY;
  } else {
    // Read new_xs first so its errors come first, as on the general path.
    if (single !== single) readVector('new_xs', args[0], 'any');
    const { entry } = fitOf(args, 1);
    knotX = entry.model.knotX;
    knotY = entry.model.knotY;
    lastPredict =
      Array.isArray(args[1]) && Array.isArray(args[2])
        ? { ys: args[1], xs: args[2], knots: args[3], direction: args[4], weights: args[5], generation: cacheGeneration(), knotX, knotY }
        : undefined;
  }
  if (single === single) return [[interpolateAt(knotX, knotY, single)]];
  const nx = readVector('new_xs', args[0], 'any');
  const v = nx.values;
  return finite(
    'PREDICT',
    shaped(nx, (i) => {
      const x = v[i]!;
      return x === x ? interpolateAt(knotX, knotY, x) : '';
    }),
  );
}

/** RATCHET.KNOTS(known_ys, known_xs, [knots], [direction], [weights]). */
export function KNOTS(args: readonly CellArg[]): CellResult {
  const { knotX, knotY } = fitOf(args, 0).entry.model;
  const out: CellOut[][] = new Array(knotX.length);
  for (let j = 0; j < knotX.length; j++) out[j] = [knotX[j]!, knotY[j]!];
  return finite('KNOTS', out);
}

const tables = new WeakMap<Vector, [Float64Array, Float64Array]>();

/**
 * Reads a two-column knot table (position, value); rows that are entirely blank are skipped
 * (so a range larger than a spilled KNOTS table works), a half-blank row is an error.
 */
function knotTable(arg: CellArg, minimum: number): [Float64Array, Float64Array] {
  const v = readVector('knot_table', arg, 'any');
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
export function EVAL(args: readonly CellArg[]): CellResult {
  const nx = readVector('new_xs', args[0], 'any');
  const [tx, ty] = knotTable(args[1], 1);
  const v = nx.values;
  return finite(
    'EVAL',
    shaped(nx, (i) => {
      const x = v[i]!;
      return x === x ? interpolateAt(tx, ty, x) : '';
    }),
  );
}

/** RATCHET.INVERT(target_ys, knot_table, [tie]). */
export function INVERT(args: readonly CellArg[]): CellResult {
  const targets = readVector('target_ys', args[0], 'any');
  const [tx, ty] = knotTable(args[1], 2);
  const tie = readChoice('tie', args[2], TIES, 'middle', '-1 (lowest x), 0 (middle) or 1 (highest x)');
  const v = targets.values;
  try {
    return finite(
      'INVERT',
      shaped(targets, (i) => {
        const t = v[i]!;
        return t === t ? invertChecked(tx, ty, t, tie) : '';
      }),
    );
  } catch (e) {
    throw renamed(e, { target: 'target_ys' });
  }
}

/** RATCHET.QKNOTS(known_xs, count). */
export function QKNOTS(args: readonly CellArg[]): CellResult {
  const xs = nonBlank(readVector('known_xs', args[0], 'line'));
  const count = readScalar('count', args[1]);
  if (count === undefined) fail('BAD_KNOTS', 'count', 'needs a whole number of knots ≥ 2; got nothing');
  if (xs.length === 0) fail('EMPTY_INPUT', 'known_xs', 'needs at least one number; got none');
  let t: Float64Array;
  try {
    t = quantileKnots(xs, count);
  } catch (e) {
    throw renamed(e, { x: 'known_xs' });
  }
  return finite('QKNOTS', Array.from(t, (v) => [v]));
}

function cvOf(args: readonly CellArg[], ctx: InvokeContext | undefined): CrossValidationResult {
  const data = dataArgs(args[0], args[1], args[7]);
  let candidates: Float64Array | undefined;
  const cg = toGrid(args[2]);
  if (cg !== undefined) {
    const c = nonBlank(readVector('candidates', args[2], 'line'));
    if (c.length > 0) candidates = Float64Array.from(c);
  }
  const folds = readScalar('folds', args[3]);
  const repeats = readScalar('repeats', args[4]);
  const seed = readScalar('seed', args[5]);
  const dir = direction(args[6]);
  return cachedCrossValidation(data, { candidates, folds, repeats, seed, direction: dir, signal: ctx?.signal, onProgress: ctx?.onProgress });
}

/** Column headers of the CV table. */
export const CV_HEADER: readonly string[] = ['knots', 'cv_rmse', 'cv_se', 'cv_r2', 'cv_mae', 'train_rmse'];

/** RATCHET.CV(known_ys, known_xs, [candidates], [folds], [repeats], [seed], [direction], [weights]). */
export function CV(args: readonly CellArg[], ctx?: InvokeContext): CellResult {
  const r = cvOf(args, ctx);
  const out: CellOut[][] = [CV_HEADER.slice()];
  for (const s of r.scores) out.push([s.knots, s.cvRmse, s.cvSe, s.cvR2, s.cvMae, s.trainRmse]);
  return finite('CV', out);
}

/** RATCHET.BESTK(known_ys, known_xs, [candidates], [folds], [repeats], [seed], [direction], [weights], [rule]). */
export function BESTK(args: readonly CellArg[], ctx?: InvokeContext): CellResult {
  const rule = readChoice('rule', args[8], RULES, 'one-se', '1 (one-standard-error rule) or 0 (minimum)');
  const r = cvOf(args, ctx);
  return finite('BESTK', suggestKnots(r.scores, rule).knots);
}

/** Row labels of the STATS table, in order. */
export const STATS_LABELS: readonly string[] = ['n', 'dropped', 'knots', 'direction', 'r2', 'rmse', 'mae', 'sse', 'levels'];

/** RATCHET.STATS(known_ys, known_xs, [knots], [direction], [weights]). */
export function STATS(args: readonly CellArg[]): CellResult {
  const { entry } = fitOf(args, 0);
  const m = entry.model;
  const values: number[] = [
    entry.used.length,
    entry.rows - entry.used.length,
    m.knotX.length,
    m.direction === 'up' ? 1 : -1,
    m.stats.r2,
    m.stats.rmse,
    m.stats.mae,
    m.stats.sse,
    m.levels,
  ];
  return finite(
    'STATS',
    STATS_LABELS.map((label, i) => [label, values[i]!]),
  );
}
