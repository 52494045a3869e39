/**
 * The surface worksheet functions, host-neutral, in the style of implementations.ts:
 * RATCHET.SURFACE, RATCHET.GRID and RATCHET.CVGRID. Each takes the cell arguments in the order
 * users type them and returns a cell result or throws (hosts map what is thrown with
 * src/adapter/errors.ts `mapError`). Parsing uses the shared cell readers of src/adapter/cells.ts;
 * fits are cached by content like the one-predictor functions (engine.ts), in a cache of their own.
 */
import {
  fail,
  fitSurface,
  crossValidateSurface,
  predictSurface,
  type AxisDirection,
  type SurfaceCrossValidationResult,
  type SurfaceModel,
  type SurfaceCrossValidationOptions,
} from '../core/index.js';
import { nonBlank, readChoice, readKnots, readScalar, readVector, toGrid, type Vector } from '../adapter/cells.js';
import { LruCache } from '../adapter/cache.js';
import { hashFloat64, sameBits } from '../adapter/hash.js';
import type { CellArg, CellOut, CellResult, InvokeContext, ParamSpec } from './types.js';
import { renamed } from './engine.js';

const AXIS_DIRECTIONS: ReadonlyMap<number, AxisDirection> = new Map<number, AxisDirection>([
  [1, 'up'],
  [-1, 'down'],
  [0, 'none'],
]);

/** Core argument names → worksheet parameter names. */
const NAMES: Readonly<Record<string, string>> = {
  x1: 'known_x1s',
  x2: 'known_x2s',
  y: 'known_ys',
  weights: 'weights',
  new_x1: 'new_x1s',
  new_x2: 'new_x2s',
};

function axisDirection(name: string, arg: CellArg): AxisDirection {
  return readChoice(name, arg, AXIS_DIRECTIONS, 'up', '1 (rising), -1 (falling) or 0 (no constraint)');
}

/** The data vectors of a surface call, as parsed from the cells. */
interface SurfaceData {
  readonly y: Vector;
  readonly x1: Vector;
  readonly x2: Vector;
  readonly w: Vector | undefined;
}

function surfaceData(ys: CellArg, x1s: CellArg, x2s: CellArg, ws: CellArg): SurfaceData {
  const y = readVector('known_ys', ys, 'line');
  const x1 = readVector('known_x1s', x1s, 'line');
  const x2 = readVector('known_x2s', x2s, 'line');
  const w = ws === undefined || ws === null || ws === '' ? undefined : readVector('weights', ws, 'line');
  return { y, x1, x2, w };
}

/** Rows where y, x1, x2 and (when given) the weight all hold numbers — the rule of pairRows. O(n). */
function pairRows(d: SurfaceData): { x1: Float64Array; x2: Float64Array; y: Float64Array; w: Float64Array | undefined; used: number } {
  const n = d.y.values.length;
  for (const [name, v] of [
    ['known_x1s', d.x1],
    ['known_x2s', d.x2],
    ['weights', d.w],
  ] as const) {
    if (v && v.values.length !== n) fail('LENGTH_MISMATCH', name, `needs one cell per cell of known_ys (${n}); got ${v.values.length}`);
  }
  const wv = d.w?.values;
  if (wv) for (let i = 0; i < n; i++) if (wv[i]! < 0) fail('BAD_WEIGHT', 'weights', `needs numbers ≥ 0; cell ${i + 1} is ${wv[i]}`);
  const keep: number[] = [];
  for (let i = 0; i < n; i++) {
    const a = d.y.values[i]!;
    const b = d.x1.values[i]!;
    const c = d.x2.values[i]!;
    if (a !== a || b !== b || c !== c || (wv && wv[i]! !== wv[i]!)) continue;
    keep.push(i);
  }
  if (keep.length < 2) {
    fail(
      'TOO_FEW_POINTS',
      'known_ys',
      `needs at least 2 rows where known_ys, known_x1s, known_x2s${wv ? ' and weights' : ''} all hold numbers; got ${keep.length}`,
    );
  }
  const pick = (v: Float64Array) => Float64Array.from(keep, (i) => v[i]!);
  return { x1: pick(d.x1.values), x2: pick(d.x2.values), y: pick(d.y.values), w: wv ? pick(wv) : undefined, used: keep.length };
}

interface SurfaceEntry {
  readonly data: SurfaceData;
  readonly key: string;
  readonly model?: SurfaceModel;
  readonly cv?: SurfaceCrossValidationResult;
}

/** Results by content (bounded like the one-predictor cache). */
const cache = new LruCache<SurfaceEntry>(256, 32 * 1024 * 1024);

function vectorKey(v: Vector | undefined): string {
  return v ? v.hash : '-';
}

function specKey(k: number | Float64Array): string {
  return typeof k === 'number' ? String(k) : `p${k.length}:${hashFloat64(k)}`;
}

function sameVector(a: Vector | undefined, b: Vector | undefined): boolean {
  if (a === b) return true;
  if (!a || !b) return false;
  return a.rows === b.rows && a.cols === b.cols && sameBits(a.values, b.values);
}

function sameData(a: SurfaceData, b: SurfaceData): boolean {
  return sameVector(a.y, b.y) && sameVector(a.x1, b.x1) && sameVector(a.x2, b.x2) && sameVector(a.w, b.w);
}

function dataBytes(d: SurfaceData): number {
  return d.y.values.byteLength * 3 + (d.w?.values.byteLength ?? 0) + 256;
}

/** The surface fit of these cells, from the cache or computed once. */
function surfaceOf(args: readonly CellArg[], offset: number): SurfaceModel {
  const data = surfaceData(args[offset], args[offset + 1], args[offset + 2], args[offset + 7]);
  const knots1 = readKnots('knots1', args[offset + 3]);
  const knots2 = readKnots('knots2', args[offset + 4]);
  const d1 = axisDirection('direction1', args[offset + 5]);
  const d2 = axisDirection('direction2', args[offset + 6]);
  const key = `surface|${vectorKey(data.y)}|${vectorKey(data.x1)}|${vectorKey(data.x2)}|${vectorKey(data.w)}|${specKey(knots1)}|${specKey(knots2)}|${d1}|${d2}`;
  const hit = cache.get(key);
  if (hit?.model && hit.key === key && sameData(hit.data, data)) return hit.model;
  const p = pairRows(data);
  let model: SurfaceModel;
  try {
    model = fitSurface(p.x1, p.x2, p.y, { knots1, knots2, direction1: d1, direction2: d2, weights: p.w });
  } catch (e) {
    throw renamed(e, NAMES);
  }
  cache.set(key, { data, key, model }, dataBytes(data) + model.fitted.byteLength * 2 + model.values.byteLength * 2);
  return model;
}

/** Every number of a result must be finite: anything else would be a numerical failure (#NUM!). */
function finite(name: string, result: CellOut[][]): CellOut[][] {
  for (const row of result) {
    for (const v of row) if (typeof v === 'number' && !Number.isFinite(v)) fail('NUMERICAL', name, 'produced a non-finite number (a numerical failure)');
  }
  return result;
}

/**
 * RATCHET.SURFACE(new_x1s, new_x2s, known_ys, known_x1s, known_x2s, [knots1], [knots2],
 * [direction1], [direction2], [weights]): the fitted surface at each new (x1, x2) pair, in the shape
 * of new_x1s; a pair with a blank stays blank. Cost: the fit (cached) plus O(log K) per pair.
 */
export function SURFACE(args: readonly CellArg[]): CellResult {
  const n1 = readVector('new_x1s', args[0], 'any');
  const n2 = readVector('new_x2s', args[1], 'any');
  if (n2.values.length !== n1.values.length) {
    fail('LENGTH_MISMATCH', 'new_x2s', `needs one cell per cell of new_x1s (${n1.values.length}); got ${n2.values.length}`);
  }
  const model = surfaceOf(args, 2);
  const a = n1.values;
  const b = n2.values;
  const idx: number[] = [];
  for (let i = 0; i < a.length; i++) if (a[i] === a[i] && b[i] === b[i]) idx.push(i);
  const values = predictSurface(
    model,
    idx.map((i) => a[i]!),
    idx.map((i) => b[i]!),
  );
  const flat: CellOut[] = new Array<CellOut>(a.length).fill('');
  idx.forEach((i, k) => (flat[i] = values[k]!));
  const out: CellOut[][] = [];
  for (let r = 0; r < n1.rows; r++) out.push(flat.slice(r * n1.cols, (r + 1) * n1.cols));
  return finite('SURFACE', out);
}

/**
 * RATCHET.GRID(known_ys, known_x1s, known_x2s, [knots1], [knots2], [direction1], [direction2],
 * [weights]): the fitted lattice as a table — first row the x1 knot positions (after an empty
 * corner cell), first column the x2 knot positions, body the lattice values (row = x2 knot,
 * column = x1 knot). Cost: the fit (cached) plus O(K1·K2).
 */
export function GRID(args: readonly CellArg[]): CellResult {
  const m = surfaceOf(args, 0);
  const k1 = m.knots1.length;
  const out: CellOut[][] = [['', ...Array.from(m.knots1)]];
  for (let b = 0; b < m.knots2.length; b++) out.push([m.knots2[b]!, ...Array.from(m.values.subarray(b * k1, (b + 1) * k1))]);
  return finite('GRID', out);
}

/** Column headers of the CVGRID table. */
export const CVGRID_HEADER: readonly string[] = ['knots1', 'knots2', 'cv_rmse', 'cv_se', 'cv_r2'];

function candidatesOf(name: string, arg: CellArg): Float64Array | undefined {
  if (toGrid(arg) === undefined) return undefined;
  const c = nonBlank(readVector(name, arg, 'line'));
  return c.length > 0 ? Float64Array.from(c) : undefined;
}

/**
 * RATCHET.CVGRID(known_ys, known_x1s, known_x2s, [candidates1], [candidates2], [folds], [repeats],
 * [seed], [direction1], [direction2], [weights]): a header row, then one row per (knots1, knots2)
 * pair — candidates1 outer — with cv_rmse, cv_se and cv_r2 from crossValidateSurface (the folds
 * and seeds of RATCHET.CV). Long work: cancelable through the context's signal.
 */
export function CVGRID(args: readonly CellArg[], ctx?: InvokeContext): CellResult {
  const data = surfaceData(args[0], args[1], args[2], args[10]);
  const c1 = candidatesOf('candidates1', args[3]);
  const c2 = candidatesOf('candidates2', args[4]);
  const folds = readScalar('folds', args[5]);
  const repeats = readScalar('repeats', args[6]);
  const seed = readScalar('seed', args[7]);
  const d1 = axisDirection('direction1', args[8]);
  const d2 = axisDirection('direction2', args[9]);
  const key = `cvgrid|${vectorKey(data.y)}|${vectorKey(data.x1)}|${vectorKey(data.x2)}|${vectorKey(data.w)}|${c1 ? specKey(c1) : '-'}|${c2 ? specKey(c2) : '-'}|${folds ?? '-'}|${repeats ?? '-'}|${seed ?? '-'}|${d1}|${d2}`;
  const hit = cache.get(key);
  let result = hit?.cv && hit.key === key && sameData(hit.data, data) ? hit.cv : undefined;
  if (!result) {
    const p = pairRows(data);
    const o: SurfaceCrossValidationOptions = { direction1: d1, direction2: d2 };
    if (c1) o.candidates1 = c1;
    if (c2) o.candidates2 = c2;
    if (folds !== undefined) o.folds = folds;
    if (repeats !== undefined) o.repeats = repeats;
    if (seed !== undefined) o.seed = seed;
    if (p.w) o.weights = p.w;
    if (ctx?.signal) o.signal = ctx.signal;
    if (ctx?.onProgress) o.onProgress = ctx.onProgress;
    try {
      result = crossValidateSurface(p.x1, p.x2, p.y, o);
    } catch (e) {
      throw renamed(e, NAMES);
    }
    cache.set(key, { data, key, cv: result }, dataBytes(data) + result.scores.length * 128);
  }
  const out: CellOut[][] = [CVGRID_HEADER.slice()];
  for (const s of result.scores) out.push([s.knots1, s.knots2, s.cvRmse, s.cvSe, s.cvR2]);
  return finite('CVGRID', out);
}

const P = {
  newX1s: { name: 'new_x1s', optional: false, description: 'First inputs at which to read the surface: a cell or a range of any shape; blanks stay blank.' },
  newX2s: { name: 'new_x2s', optional: false, description: 'Second inputs, one per new_x1s cell (same number of cells).' },
  knownYs: { name: 'known_ys', optional: false, description: 'Observed values: one column or one row. Rows with a blank here, in an input or in weights are left out.' },
  knownX1s: { name: 'known_x1s', optional: false, description: 'First input, one per known_ys cell (a column or a row). Blank cells leave their row out.' },
  knownX2s: { name: 'known_x2s', optional: false, description: 'Second input, one per known_ys cell (a column or a row). Blank cells leave their row out.' },
  knots1: {
    name: 'knots1',
    optional: true,
    description: 'Knots along the first input. Omitted or 0: every distinct value. A whole number K from 2 to 200: K evenly spaced knots. A range: knot positions.',
  },
  knots2: { name: 'knots2', optional: true, description: 'Knots along the second input, as knots1. The surface has knots1 × knots2 values: keep it small.' },
  direction1: { name: 'direction1', optional: true, description: 'Along the first input: 1 rising (default), -1 falling, 0 no constraint.' },
  direction2: { name: 'direction2', optional: true, description: 'Along the second input: 1 rising (default), -1 falling, 0 no constraint.' },
  weights: { name: 'weights', optional: true, description: 'Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.' },
  candidates1: { name: 'candidates1', optional: true, description: 'Knot counts to compare along the first input (0 = every level): a number or a range. Default 2 to 6.' },
  candidates2: { name: 'candidates2', optional: true, description: 'Knot counts to compare along the second input, as candidates1. Every pair is scored.' },
  folds: { name: 'folds', optional: true, description: 'Number of folds, 2 to the number of rows. Default 5.' },
  repeats: { name: 'repeats', optional: true, description: 'Number of repeats with fresh shuffles, ≥ 1. Default 1.' },
  seed: { name: 'seed', optional: true, description: 'Whole number for the shuffle; 0 means no shuffle (blocks in row order). Default 1.' },
} satisfies Record<string, ParamSpec>;

/** A surface function as the registry lists it (the registry adds the help URL). */
export interface SurfaceFunctionSpec {
  readonly name: string;
  readonly description: string;
  readonly params: readonly ParamSpec[];
  readonly returnsArray: boolean;
  readonly invoke: (args: readonly CellArg[], context?: InvokeContext) => CellResult;
  readonly longWork: boolean;
}

/** RATCHET.SURFACE, RATCHET.GRID, RATCHET.CVGRID, in the order of the reference. */
export const SURFACE_FUNCTIONS: readonly SurfaceFunctionSpec[] = [
  {
    name: 'SURFACE',
    description: 'Value of the monotone surface fitted to known_ys over two inputs at each new (x1, x2) pair (flat beyond the knots).',
    params: [P.newX1s, P.newX2s, P.knownYs, P.knownX1s, P.knownX2s, P.knots1, P.knots2, P.direction1, P.direction2, P.weights],
    returnsArray: true,
    invoke: SURFACE,
    longWork: false,
  },
  {
    name: 'GRID',
    description: 'The fitted surface as a table: x1 knots across the first row, x2 knots down the first column, fitted values inside.',
    params: [P.knownYs, P.knownX1s, P.knownX2s, P.knots1, P.knots2, P.direction1, P.direction2, P.weights],
    returnsArray: true,
    invoke: GRID,
    longWork: false,
  },
  {
    name: 'CVGRID',
    description: 'Cross-validation of knot pairs for the surface: a header row, then knots1, knots2, cv_rmse, cv_se and cv_r2 per pair.',
    params: [P.knownYs, P.knownX1s, P.knownX2s, P.candidates1, P.candidates2, P.folds, P.repeats, P.seed, P.direction1, P.direction2, P.weights],
    returnsArray: true,
    invoke: CVGRID,
    longWork: true,
  },
];
