/**
 * The result cache: content hash of inputs and options, bounded LRU (entries and bytes). 10,000
 * PREDICT cells over the same 10,000-row data fit once; a changed cell or option fits again;
 * CV and BESTK over the same data and options cross-validate once. Solver calls are counted
 * with spies on the core's public functions, which src/functions/engine.ts calls.
 */
import { afterEach, beforeEach, describe, expect, it, vi, type MockInstance } from 'vitest';
import { clearCaches, resultCache, CACHE_LIMITS } from '../../src/functions/engine.js';
import { functionByName } from '../../src/functions/registry.js';
import * as core from '../../src/core/index.js';
import { fitMonotone, interpolate } from '../../src/core/index.js';
import { LruCache } from '../../src/adapter/cache.js';
import { lcg } from '../../bench/harness.js';
import type { CellArg } from '../../src/functions/types.js';

const predict = functionByName('PREDICT')!;
let fitSpy: MockInstance<typeof core.fitMonotone>;
let cvSpy: MockInstance<typeof core.crossValidate>;

beforeEach(() => {
  clearCaches();
  fitSpy = vi.spyOn(core, 'fitMonotone');
  cvSpy = vi.spyOn(core, 'crossValidate');
});
afterEach(() => {
  vi.restoreAllMocks();
  resultCache.resize(CACHE_LIMITS.entries, CACHE_LIMITS.bytes);
  clearCaches();
});

function dataset(n: number, seed = 7): { ys: CellArg; xs: CellArg; x: number[]; y: number[] } {
  const r = lcg(seed);
  const x = Array.from({ length: n }, () => Math.round(1000 * r()) / 10);
  const y = x.map((v) => Math.log1p(v) + (r() - 0.5));
  return { x, y, ys: y.map((v) => [v]), xs: x.map((v) => [v]) };
}

describe('10,000 PREDICT cells over one 10,000-row dataset', () => {
  const { ys, xs, x, y } = dataset(10_000);
  const model = fitMonotone(x, y);

  it('fit once when the host passes the same range objects', () => {
    const out: number[] = [];
    for (let i = 0; i < 10_000; i++) out.push((predict.invoke([[[i / 100]], ys, xs]) as number[][])[0]![0]!);
    expect(fitSpy).toHaveBeenCalledTimes(1);
    // Each cell is the curve at its x: the same as one fit plus interpolation.
    expect(out).toEqual(Array.from(interpolate(model.knotX, model.knotY, Array.from({ length: 10_000 }, (_, i) => i / 100))));
  });

  it('fit once when every call brings fresh copies of the ranges (content hash; 1,000 calls)', () => {
    for (let i = 0; i < 1_000; i++) {
      const yCopy = (ys as number[][]).map((r) => [r[0]!]);
      const xCopy = (xs as number[][]).map((r) => [r[0]!]);
      predict.invoke([[[i]], yCopy, xCopy]);
    }
    expect(fitSpy).toHaveBeenCalledTimes(1);
    expect(resultCache.stats.entries).toBe(1);
  });

  it('FIT, KNOTS and STATS over the same data and options share that one fit', () => {
    for (const name of ['FIT', 'KNOTS', 'STATS', 'PREDICT']) functionByName(name)!.invoke(name === 'PREDICT' ? [5, ys, xs] : [ys, xs]);
    expect(fitSpy).toHaveBeenCalledTimes(1);
  });
});

describe("STATS' rank correlation is cached with the data", () => {
  const { ys, xs } = dataset(2_000, 5);
  const stats = functionByName('STATS')!;
  const rhoOf = (r: unknown): unknown => (r as unknown[][]).find((row) => row[0] === 'spearman')![1];

  it('computed once for the same cells (fresh copies, other knots), again after one y cell changes, equal to the value from scratch', () => {
    const spy = vi.spyOn(core, 'spearman');
    const copyOf = (a: CellArg) => (a as number[][]).map((r) => [r[0]!]);
    const first = rhoOf(stats.invoke([ys, xs]));
    const second = rhoOf(stats.invoke([copyOf(ys), copyOf(xs), 6]));
    expect(spy).toHaveBeenCalledTimes(1);
    expect(second).toBe(first);
    const changed = copyOf(ys);
    changed[1_000]![0] = -1e6;
    const third = rhoOf(stats.invoke([changed, copyOf(xs)]));
    expect(spy).toHaveBeenCalledTimes(2);
    clearCaches();
    expect(rhoOf(stats.invoke([copyOf(changed), copyOf(xs)]))).toBe(third);
    expect(third).not.toBe(first);
  });
});

describe('a change of any input or option fits again', () => {
  const { ys, xs } = dataset(500, 11);
  it('one changed y cell, a blanked cell, other knots, direction or weights', () => {
    predict.invoke([1, ys, xs]);
    const changed = (ys as number[][]).map((r) => [r[0]!]);
    changed[250]![0] = changed[250]![0]! + 1e-9;
    predict.invoke([1, changed, xs]);
    const blanked = (ys as (number | null)[][]).map((r) => [r[0]!]) as (number | null)[][];
    blanked[3]![0] = null;
    predict.invoke([1, blanked, xs]);
    predict.invoke([1, ys, xs, 5]);
    predict.invoke([1, ys, xs, 6]);
    predict.invoke([1, ys, xs, 5, -1]);
    predict.invoke([1, ys, xs, 5, -1, (ys as number[][]).map(() => [2])]);
    expect(fitSpy).toHaveBeenCalledTimes(7);
    // …and asking again for any of them is a cache hit.
    predict.invoke([2, changed, xs]);
    predict.invoke([2, ys, xs, 5]);
    expect(fitSpy).toHaveBeenCalledTimes(7);
  });
  it('a column and a row with the same numbers are different inputs', () => {
    functionByName('FIT')!.invoke([ys, xs]);
    functionByName('FIT')!.invoke([[(ys as number[][]).map((r) => r[0]!)], xs]);
    expect(fitSpy).toHaveBeenCalledTimes(2);
  });
});

describe('CV and BESTK', () => {
  const { ys, xs } = dataset(120, 3);
  it('share one cross-validation per data and options; the rule does not refit', () => {
    functionByName('CV')!.invoke([ys, xs, null, 5, 1, 1]);
    functionByName('BESTK')!.invoke([ys, xs, null, 5, 1, 1, null, null, 1]);
    functionByName('BESTK')!.invoke([ys, xs, null, 5, 1, 1, null, null, 0]);
    expect(cvSpy).toHaveBeenCalledTimes(1);
    functionByName('BESTK')!.invoke([ys, xs, null, 5, 1, 2]);
    expect(cvSpy).toHaveBeenCalledTimes(2);
  });
});

describe('bounds', () => {
  it('evicts least recently used entries beyond the entry bound', () => {
    resultCache.resize(3, 1e9);
    const sets = [1, 2, 3, 4].map((s) => dataset(50, s));
    for (const d of sets) predict.invoke([1, d.ys, d.xs]);
    expect(fitSpy).toHaveBeenCalledTimes(4);
    expect(resultCache.stats.entries).toBe(3);
    predict.invoke([1, sets[3]!.ys, sets[3]!.xs]); // newest: hit
    expect(fitSpy).toHaveBeenCalledTimes(4);
    predict.invoke([1, sets[0]!.ys, sets[0]!.xs]); // oldest was evicted: refit
    expect(fitSpy).toHaveBeenCalledTimes(5);
  });
  it('keeps the total size under the byte bound', () => {
    resultCache.resize(1000, 200_000);
    for (let s = 0; s < 20; s++) {
      const d = dataset(1000, 100 + s);
      predict.invoke([1, d.ys, d.xs]);
      expect(resultCache.stats.bytes).toBeLessThanOrEqual(200_000);
    }
    expect(resultCache.stats.entries).toBeLessThan(20);
    expect(resultCache.stats.evictions).toBeGreaterThan(0);
  });
  it('LruCache: recency order, replacement and oversized values', () => {
    const c = new LruCache<number>(2, 100);
    c.set('a', 1, 10);
    c.set('b', 2, 10);
    expect(c.get('a')).toBe(1); // a is now the newest
    c.set('c', 3, 10); // evicts b
    expect(c.get('b')).toBeUndefined();
    expect(c.get('a')).toBe(1);
    c.set('a', 4, 10);
    expect(c.get('a')).toBe(4);
    c.set('huge', 5, 101);
    expect(c.get('huge')).toBeUndefined();
    expect(c.stats.entries).toBe(2);
    clearCaches();
  });
});
