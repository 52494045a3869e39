/**
 * Shared machinery of the worksheet functions: the solver hook, pairing of data rows, and the
 * cached model / cross-validation lookups that make many cells over the same data cost one fit.
 *
 * Cache keys are content hashes of the parsed inputs (bit patterns, blanks included) and the
 * options; entries keep their input vectors and are compared with the request on every hit, so a
 * hit always returns the result of exactly these inputs.
 */
import {
  RatchetError,
  crossValidate,
  fitMonotone,
  isRatchetError,
  type CrossValidationOptions,
  type CrossValidationResult,
  type DirectionOption,
  type ModelOptions,
  type MonotoneModel,
} from '../core/index.js';
import { LruCache } from '../adapter/cache.js';
import { sameBits } from '../adapter/hash.js';
import { hashFloat64 } from '../adapter/hash.js';
import type { Vector } from '../adapter/cells.js';
import { fail } from '../core/index.js';

/** The solvers the functions call; replaceable so tests can count calls ({@link setSolvers}). */
export interface Solvers {
  fit(x: Float64Array, y: Float64Array, options: ModelOptions): MonotoneModel;
  crossValidate(x: Float64Array, y: Float64Array, options: CrossValidationOptions): CrossValidationResult;
}

const defaultSolvers: Solvers = {
  fit: (x, y, o) => fitMonotone(x, y, o),
  crossValidate: (x, y, o) => crossValidate(x, y, o),
};

let solvers: Solvers = defaultSolvers;

/** Replaces some solvers (tests: counting wrappers). Returns the previous set. Clears the caches. */
export function setSolvers(replacement: Partial<Solvers>): Solvers {
  const previous = solvers;
  solvers = { ...solvers, ...replacement };
  clearCaches();
  return previous;
}

/** Restores the core solvers and clears the caches. */
export function resetSolvers(): void {
  solvers = defaultSolvers;
  clearCaches();
}

/** Default bounds of the result cache: entries and bytes. */
export const CACHE_LIMITS = { entries: 512, bytes: 64 * 1024 * 1024 };

const cache = new LruCache<FitEntry | CvEntry>(CACHE_LIMITS.entries, CACHE_LIMITS.bytes);

/** Cache counters (hits, misses, evictions, entries, bytes). */
export function cacheStats(): Readonly<typeof cache.stats> {
  return cache.stats;
}

/** The previous fit request and its entry (the fast path of {@link cachedFit}). */
let lastFit: (FitEntry & { generation: number }) | undefined;
/** Bumped whenever the cache is cleared or resized, which invalidates {@link lastFit}. */
let generation = 0;

/** Changes whenever the caches are cleared or reconfigured (memos of earlier calls are then void). */
export function cacheGeneration(): number {
  return generation;
}

/** Empties the result cache. */
export function clearCaches(): void {
  cache.clear();
  lastFit = undefined;
  generation++;
}

/** Changes the cache bounds. */
export function configureCache(entries: number, bytes: number): void {
  cache.resize(entries, bytes);
  lastFit = undefined;
  generation++;
}

/** Paired data rows: the rows where y, x and (when given) the weight are all present. */
export interface Paired {
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly w: Float64Array | undefined;
  /** For each used row, its position in the range (reading order). */
  readonly used: Int32Array;
  /** Rows in the ranges. */
  readonly rows: number;
}

/** The data vectors of a fitting call, as parsed from the cells. */
export interface DataArgs {
  readonly y: Vector;
  readonly x: Vector;
  readonly w: Vector | undefined;
}

/**
 * Pairs rows of y, x and weights; a row with any blank is left out. O(n).
 * @throws RatchetError LENGTH_MISMATCH (different cell counts), TOO_FEW_POINTS (< 2 usable rows).
 */
export function pairRows(d: DataArgs, names = { y: 'known_ys', x: 'known_xs', w: 'weights' }): Paired {
  const n = d.y.values.length;
  if (d.x.values.length !== n) fail('LENGTH_MISMATCH', names.x, `needs one cell per cell of ${names.y} (${n}); got ${d.x.values.length}`);
  if (d.w && d.w.values.length !== n) fail('LENGTH_MISMATCH', names.w, `needs one cell per cell of ${names.y} (${n}); got ${d.w.values.length}`);
  const yv = d.y.values;
  const xv = d.x.values;
  const wv = d.w?.values;
  if (wv !== undefined) {
    for (let i = 0; i < n; i++) {
      if (wv[i]! < 0) fail('BAD_WEIGHT', names.w, `needs numbers ≥ 0; cell ${i + 1} is ${wv[i]}`);
    }
  }
  let m = 0;
  const used = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const a = yv[i]!;
    const b = xv[i]!;
    if (a !== a || b !== b) continue;
    if (wv !== undefined) {
      const c = wv[i]!;
      if (c !== c) continue;
    }
    used[m++] = i;
  }
  if (m < 2) {
    fail('TOO_FEW_POINTS', names.y, `needs at least 2 rows where ${wv ? `${names.y}, ${names.x} and ${names.w} all` : `${names.y} and ${names.x} both`} hold numbers; got ${m}`);
  }
  const x = new Float64Array(m);
  const y = new Float64Array(m);
  const w = wv ? new Float64Array(m) : undefined;
  for (let k = 0; k < m; k++) {
    const i = used[k]!;
    x[k] = xv[i]!;
    y[k] = yv[i]!;
    if (w) w[k] = wv![i]!;
  }
  return { x, y, w, used: used.slice(0, m), rows: n };
}

/** A cached fit: the model, the used rows, and the inputs it was computed from. */
export interface FitEntry {
  readonly kind: 'fit';
  readonly data: DataArgs;
  readonly knots: number | Float64Array;
  readonly direction: DirectionOption;
  readonly model: MonotoneModel;
  readonly used: Int32Array;
  readonly rows: number;
}

/** A cached cross-validation. */
export interface CvEntry {
  readonly kind: 'cv';
  readonly data: DataArgs;
  readonly candidates: Float64Array | undefined;
  readonly options: string;
  readonly result: CrossValidationResult;
  readonly used: number;
}

function sameVector(a: Vector | undefined, b: Vector | undefined): boolean {
  if (a === b) return true;
  if (a === undefined || b === undefined) return false;
  return a.rows === b.rows && a.cols === b.cols && sameBits(a.values, b.values);
}

function sameData(a: DataArgs, b: DataArgs): boolean {
  return sameVector(a.y, b.y) && sameVector(a.x, b.x) && sameVector(a.w, b.w);
}

function knotsKey(k: number | Float64Array): string {
  return typeof k === 'number' ? String(k) : `p${k.length}:${hashFloat64(k)}`;
}

function sameKnots(a: number | Float64Array, b: number | Float64Array): boolean {
  if (typeof a === 'number' || typeof b === 'number') return a === b;
  return sameBits(a, b);
}

function dataKey(d: DataArgs): string {
  return `${d.y.hash}|${d.x.hash}|${d.w?.hash ?? '-'}`;
}

function vectorBytes(d: DataArgs): number {
  return d.y.values.byteLength + d.x.values.byteLength + (d.w?.values.byteLength ?? 0) + 256;
}

/** Renames a core error's argument (e.g. "x" → "known_xs") keeping code and requirement text. */
export function renamed(e: unknown, names: Readonly<Record<string, string>>): unknown {
  if (!isRatchetError(e)) return e;
  const to = names[e.argument];
  if (to === undefined) return e;
  const requirement = e.message.startsWith(`${e.argument}: `) ? e.message.slice(e.argument.length + 2) : e.message;
  return new RatchetError(e.code, to, requirement);
}

/** Core argument names → worksheet parameter names for the fitting functions. */
export const FIT_NAMES: Readonly<Record<string, string>> = { x: 'known_xs', y: 'known_ys', weights: 'weights', knots: 'knots' };

/**
 * The fit of (y, x, w) with these options: from the cache, or computed once with
 * {@link Solvers.fit} and stored. Cost: O(1) + O(n) verification on a hit (nothing when the host
 * passed the same argument objects), O(n) pairing plus the fit on a miss.
 */
export function cachedFit(data: DataArgs, knots: number | Float64Array, direction: DirectionOption): FitEntry {
  // Fast path: the same argument objects as the previous call (no key to build or hash).
  const last = lastFit;
  if (
    last !== undefined &&
    last.data.y === data.y &&
    last.data.x === data.x &&
    last.data.w === data.w &&
    last.direction === direction &&
    sameKnots(last.knots, knots) &&
    last.generation === generation
  ) {
    cache.stats.hits++;
    return last;
  }
  const key = `fit|${dataKey(data)}|${knotsKey(knots)}|${direction}`;
  const hit = cache.get(key);
  if (hit !== undefined && hit.kind === 'fit' && sameData(hit.data, data) && sameKnots(hit.knots, knots) && hit.direction === direction) {
    lastFit = { ...hit, data, generation };
    return hit;
  }
  const p = pairRows(data);
  let model: MonotoneModel;
  try {
    model = solvers.fit(p.x, p.y, { knots, direction, weights: p.w });
  } catch (e) {
    throw renamed(e, FIT_NAMES);
  }
  const entry: FitEntry = { kind: 'fit', data, knots, direction, model, used: p.used, rows: p.rows };
  const bytes = vectorBytes(data) + model.fitted.byteLength + model.knotX.byteLength * 2 + p.used.byteLength;
  cache.set(key, entry, bytes);
  lastFit = { ...entry, generation };
  return entry;
}

/** Options of {@link cachedCrossValidation} (numbers as the user gave them; the core validates). */
export interface CvRequest {
  candidates: Float64Array | undefined;
  folds: number | undefined;
  repeats: number | undefined;
  seed: number | undefined;
  direction: DirectionOption;
  signal?: AbortSignal | undefined;
  onProgress?: ((fraction: number) => void) | undefined;
}

/** Core argument names → worksheet parameter names for CV and BESTK. */
export const CV_NAMES: Readonly<Record<string, string>> = { ...FIT_NAMES, candidates: 'candidates', folds: 'folds', repeats: 'repeats', seed: 'seed' };

/** Cross-validation of (y, x, w) with these options, cached like {@link cachedFit}. */
export function cachedCrossValidation(data: DataArgs, req: CvRequest): CrossValidationResult {
  const options = `${req.folds ?? '-'}|${req.repeats ?? '-'}|${req.seed ?? '-'}|${req.direction}`;
  const key = `cv|${dataKey(data)}|${req.candidates ? knotsKey(req.candidates) : '-'}|${options}`;
  const hit = cache.get(key);
  if (
    hit !== undefined &&
    hit.kind === 'cv' &&
    hit.options === options &&
    sameData(hit.data, data) &&
    (hit.candidates === req.candidates || (hit.candidates !== undefined && req.candidates !== undefined && sameBits(hit.candidates, req.candidates)))
  ) {
    return hit.result;
  }
  const p = pairRows(data);
  let result: CrossValidationResult;
  try {
    const o: CrossValidationOptions = { direction: req.direction };
    if (req.candidates !== undefined) o.candidates = req.candidates;
    if (req.folds !== undefined) o.folds = req.folds;
    if (req.repeats !== undefined) o.repeats = req.repeats;
    if (req.seed !== undefined) o.seed = req.seed;
    if (p.w !== undefined) o.weights = p.w;
    if (req.signal !== undefined) o.signal = req.signal;
    if (req.onProgress !== undefined) o.onProgress = req.onProgress;
    result = solvers.crossValidate(p.x, p.y, o);
  } catch (e) {
    throw renamed(e, CV_NAMES);
  }
  const entry: CvEntry = { kind: 'cv', data, candidates: req.candidates, options, result, used: p.used.length };
  cache.set(key, entry, vectorBytes(data) + result.scores.length * (64 + 8 * (result.folds * result.repeats)));
  return result;
}
