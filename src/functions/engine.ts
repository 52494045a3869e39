/**
 * The one result cache of the worksheet functions and the cached computations built on it: a
 * one-input fit, a one-input cross-validation, a surface fit and a surface cross-validation. Many
 * cells over the same data cost one computation; `clearCaches()` empties everything.
 *
 * Keys are content hashes of the parsed inputs (bit patterns, blanks included) and the options;
 * every entry keeps the inputs it was computed from, compared part by part on every hit, so a hit
 * always returns the result of exactly these inputs (a hash collision can only cost a
 * recomputation). Core errors are renamed to worksheet names by the machinery (define.ts).
 */
import {
  crossValidate,
  crossValidateSurface,
  fitMonotone,
  fitShapedBandModel,
  fitSurface,
  type BandModel,
  type Curvature,
  type Degree,
  type AxisDirectionOption,
  type CrossValidationOptions,
  type CrossValidationResult,
  type DirectionOption,
  type MonotoneModel,
  type SurfaceCrossValidationOptions,
  type SurfaceCrossValidationResult,
  type SurfaceModel,
} from '../core/index.js';
import { LruCache } from '../adapter/cache.js';
import { hashFloat64, sameBits } from '../adapter/hash.js';
import { Vector, clearParsed, sameVector } from '../adapter/cells.js';
import { pairData, type DataArgs } from './define.js';
import type { InvokeContext } from './types.js';

/**
 * Default bounds of the result cache: entries and bytes. The byte bound holds the four
 * computations a sheet typically makes over one million-row column pair (the classic fit, a knot
 * fit with its fitted values, a knot table and the rank correlation: about 92 MB at 1,048,576
 * rows, each entry counting its own copy of the inputs) twice over; with 64 MB they evicted each
 * other between two evaluations of the same workbook, and every formula fitted again.
 */
export const CACHE_LIMITS = { entries: 512, bytes: 256 * 1024 * 1024 };

/**
 * The result cache of every worksheet function (LRU by entries and bytes). Exported so that tests
 * and the benchmark can read its counters (`stats`) and bounds (`resize`); product code uses
 * {@link memo} and {@link clearCaches} only.
 */
export const resultCache = new LruCache<Entry>(CACHE_LIMITS.entries, CACHE_LIMITS.bytes);

/** One input or option of a cached computation: a parsed argument, an array of numbers, a number or text. */
type Part = Vector | Float64Array | number | string | undefined;

interface Entry {
  readonly kind: string;
  readonly parts: readonly Part[];
  readonly value: unknown;
}

/** The previous request and its value (the fast path when a host passes the same objects again). */
let last: (Entry & { generation: number }) | undefined;
/** Bumped whenever the cache is cleared, which invalidates {@link last} and callers' memos. */
let generation = 0;

/** Changes whenever the cache is cleared (memos of earlier calls are then void). */
export function cacheGeneration(): number {
  return generation;
}

/** Empties the one result cache and every memo: the last request and the remembered parsed arguments. O(entries). */
export function clearCaches(): void {
  resultCache.clear();
  clearParsed();
  last = undefined;
  generation++;
}

function partKey(p: Part): string {
  if (p instanceof Vector) return p.hash;
  if (p instanceof Float64Array) return `p${p.length}:${hashFloat64(p)}`;
  return p === undefined ? '-' : String(p);
}

function samePart(a: Part, b: Part): boolean {
  if (a === b) return true;
  if (a instanceof Vector || b instanceof Vector) return a instanceof Vector && b instanceof Vector && sameVector(a, b);
  if (a instanceof Float64Array && b instanceof Float64Array) return sameBits(a, b);
  return false;
}

function sameParts(a: readonly Part[], b: readonly Part[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!samePart(a[i], b[i])) return false;
  return true;
}

/** Same objects (or equal scalars and equal number arrays): the fast path, no hashing. */
function sameObjects(a: readonly Part[], b: readonly Part[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) {
    const x = a[i];
    const y = b[i];
    if (x === y) continue;
    if (x instanceof Float64Array && y instanceof Float64Array && sameBits(x, y)) continue;
    return false;
  }
  return true;
}

/**
 * The value of `compute()` for these inputs: from the cache, or computed once and stored. Cost on a
 * hit O(1) when the parts are the previous call's objects, else O(parts' cells) to hash (once per
 * argument object) and verify; on a miss the computation.
 *
 * @param kind names the computation ("fit", "cv", …); values of different kinds never mix.
 * @param parts every input and option the result depends on.
 * @param compute the computation; returns the value and its size in bytes (for the byte bound).
 * @throws whatever `compute` throws (nothing is stored then).
 */
export function memo<T>(kind: string, parts: readonly Part[], compute: () => { value: T; bytes: number }): T {
  const l = last;
  if (l !== undefined && l.kind === kind && l.generation === generation && sameObjects(l.parts, parts)) {
    resultCache.stats.hits++;
    return l.value as T;
  }
  const key = `${kind}|${parts.map(partKey).join('|')}`;
  const hit = resultCache.get(key);
  if (hit !== undefined && hit.kind === kind && sameParts(hit.parts, parts)) {
    last = { kind, parts, value: hit.value, generation };
    return hit.value as T;
  }
  const { value, bytes } = compute();
  const bytesOfParts = parts.reduce((s: number, p) => s + (p instanceof Vector ? p.values.byteLength : p instanceof Float64Array ? p.byteLength : 8), 256);
  resultCache.set(key, { kind, parts, value }, bytes + bytesOfParts);
  last = { kind, parts, value, generation };
  return value;
}

function dataParts(d: DataArgs): Part[] {
  return [...d.columns.map((c) => c.vector), d.weights?.vector];
}

/** Curvature and degree of a knot fit, as the core takes them (0 and 1: the plain model). */
export interface Shape {
  readonly curvature: Curvature;
  readonly degree: Degree;
}

/** The plain shape: any curvature, piecewise linear. */
export const PLAIN: Shape = Object.freeze({ curvature: 0, degree: 1 });

/** A cached one-input fit: the model, the used rows, the number of cells and the rows left out for text. */
export interface FitEntry {
  readonly model: MonotoneModel;
  readonly used: Int32Array;
  readonly rows: number;
  /** Rows left out because a data argument holds text or a logical there (part of `rows - used.length`). */
  readonly textRows: number;
}

/**
 * The monotone fit of the data (known_ys, known_xs, optional weights) with these options, cached.
 * @param data the parsed data arguments, known_ys first, then known_xs.
 * @param knots 0 (classic fit), a knot count or knot positions, as the adapter parsed them.
 * @param direction 'up', 'down' or 'auto'.
 * @throws RatchetError from the pairing and the core (core argument names).
 */
export function cachedFit(data: DataArgs, knots: number | Float64Array, direction: DirectionOption, shape: Shape = PLAIN): FitEntry {
  return memo('fit', [...dataParts(data), knots, direction, shape.curvature, shape.degree], () => {
    const p = pairData(data);
    const model = fitMonotone(p.columns[1]!, p.columns[0]!, { knots, direction, weights: p.weights, curvature: shape.curvature, degree: shape.degree });
    const value: FitEntry = { model, used: p.used, rows: p.rows, textRows: p.textRows };
    return { value, bytes: model.fitted.byteLength + model.knotX.byteLength * 2 + p.used.byteLength };
  });
}

/**
 * The band model (σ̂, degrees of freedom and variance factors conditional on the active set) of the
 * knot fit of the data with these options, cached like {@link cachedFit}.
 * @throws RatchetError from the pairing and the core (knots 0, too few rows).
 */
export function cachedBand(data: DataArgs, knots: number | Float64Array, direction: DirectionOption, shape: Shape): BandModel {
  return memo('band', [...dataParts(data), knots, direction, shape.curvature, shape.degree], () => {
    const p = pairData(data);
    const model = fitShapedBandModel(p.columns[1]!, p.columns[0]!, { knots, direction, weights: p.weights, curvature: shape.curvature, degree: shape.degree });
    return { value: model, bytes: model.knotX.byteLength * 4 };
  });
}

/** Options of a cross-validation as the user gave them (undefined: the core's default). */
export interface CvRequest {
  readonly candidates: Float64Array | undefined;
  readonly folds: number | undefined;
  readonly repeats: number | undefined;
  readonly seed: number | undefined;
}

/** The context's signal and progress callback, as core options. */
function progressOptions(ctx: InvokeContext | undefined): { signal?: AbortSignal; onProgress?: (fraction: number) => void } {
  const o: { signal?: AbortSignal; onProgress?: (fraction: number) => void } = {};
  if (ctx?.signal !== undefined) o.signal = ctx.signal;
  if (ctx?.onProgress !== undefined) o.onProgress = ctx.onProgress;
  return o;
}

/** The numeric options that were given, as core options. */
function givenOptions(req: CvRequest): { folds?: number; repeats?: number; seed?: number } {
  const o: { folds?: number; repeats?: number; seed?: number } = {};
  if (req.folds !== undefined) o.folds = req.folds;
  if (req.repeats !== undefined) o.repeats = req.repeats;
  if (req.seed !== undefined) o.seed = req.seed;
  return o;
}

/** Cross-validation of one-input data (known_ys, known_xs, weights), cached like {@link cachedFit}. */
export function cachedCrossValidation(data: DataArgs, req: CvRequest, direction: DirectionOption, ctx?: InvokeContext, shape: Shape = PLAIN): CrossValidationResult {
  return memo('cv', [...dataParts(data), req.candidates, req.folds, req.repeats, req.seed, direction, shape.curvature, shape.degree], () => {
    const p = pairData(data);
    const o: CrossValidationOptions = { direction, ...givenOptions(req), ...progressOptions(ctx), curvature: shape.curvature, degree: shape.degree };
    if (req.candidates !== undefined) o.candidates = req.candidates;
    if (p.weights !== undefined) o.weights = p.weights;
    const result = crossValidate(p.columns[1]!, p.columns[0]!, o);
    return { value: result, bytes: result.scores.length * (64 + 8 * (result.folds * result.repeats)) };
  });
}

/** Knots and directions of a surface, as parsed. */
export interface SurfaceRequest {
  readonly knots1: number | Float64Array;
  readonly knots2: number | Float64Array;
  readonly direction1: AxisDirectionOption;
  readonly direction2: AxisDirectionOption;
}

/** The surface fit of (known_ys, known_x1s, known_x2s, weights), cached. */
export function cachedSurface(data: DataArgs, req: SurfaceRequest): SurfaceModel {
  return memo('surface', [...dataParts(data), req.knots1, req.knots2, req.direction1, req.direction2], () => {
    const p = pairData(data);
    const model = fitSurface(p.columns[1]!, p.columns[2]!, p.columns[0]!, { ...req, weights: p.weights });
    return { value: model, bytes: model.fitted.byteLength * 2 + model.values.byteLength * 2 };
  });
}

/** Candidate knot counts of a surface cross-validation, as parsed. */
export interface SurfaceCvRequest extends CvRequest {
  readonly candidates2: Float64Array | undefined;
  readonly direction1: AxisDirectionOption;
  readonly direction2: AxisDirectionOption;
}

/** Cross-validation of surface knot pairs, cached. */
export function cachedSurfaceCrossValidation(data: DataArgs, req: SurfaceCvRequest, ctx?: InvokeContext): SurfaceCrossValidationResult {
  return memo('cvgrid', [...dataParts(data), req.candidates, req.candidates2, req.folds, req.repeats, req.seed, req.direction1, req.direction2], () => {
    const p = pairData(data);
    const o: SurfaceCrossValidationOptions = { direction1: req.direction1, direction2: req.direction2, ...givenOptions(req), ...progressOptions(ctx) };
    if (req.candidates !== undefined) o.candidates1 = req.candidates;
    if (req.candidates2 !== undefined) o.candidates2 = req.candidates2;
    if (p.weights !== undefined) o.weights = p.weights;
    const result = crossValidateSurface(p.columns[1]!, p.columns[2]!, p.columns[0]!, o);
    return { value: result, bytes: result.scores.length * 128 };
  });
}
