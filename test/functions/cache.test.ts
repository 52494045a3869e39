/**
 * The result cache: content hash of inputs and options, bounded LRU (entries and bytes). 10,000
 * PREDICT cells over the same 10,000-row data fit once; a changed cell or option fits again;
 * CV and BESTK over the same data and options cross-validate once. Solver calls are counted
 * through the injectable solver hook of src/functions/engine.ts.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cacheStats, clearCaches, configureCache, resetSolvers, setSolvers, CACHE_LIMITS } from '../../src/functions/engine.js';
import { functionByName } from '../../src/functions/registry.js';
import { fitMonotone, crossValidate, interpolate } from '../../src/core/index.js';
import { LruCache } from '../../src/adapter/cache.js';
import { lcg } from '../../bench/harness.js';
import type { CellArg } from '../../src/functions/types.js';

const predict = functionByName('PREDICT')!;
let fits = 0;
let cvs = 0;

beforeEach(() => {
  fits = 0;
  cvs = 0;
  setSolvers({
    fit: (x, y, o) => {
      fits++;
      return fitMonotone(x, y, o);
    },
    crossValidate: (x, y, o) => {
      cvs++;
      return crossValidate(x, y, o);
    },
  });
});
afterEach(() => {
  resetSolvers();
  configureCache(CACHE_LIMITS.entries, CACHE_LIMITS.bytes);
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
    expect(fits).toBe(1);
    // Each cell is the curve at its x: the same as one fit plus interpolation.
    expect(out).toEqual(Array.from(interpolate(model.knotX, model.knotY, Array.from({ length: 10_000 }, (_, i) => i / 100))));
  });

  it('fit once when every call brings fresh copies of the ranges (content hash; 1,000 calls)', () => {
    for (let i = 0; i < 1_000; i++) {
      const yCopy = (ys as number[][]).map((r) => [r[0]!]);
      const xCopy = (xs as number[][]).map((r) => [r[0]!]);
      predict.invoke([[[i]], yCopy, xCopy]);
    }
    expect(fits).toBe(1);
    expect(cacheStats().entries).toBe(1);
  });

  it('FIT, KNOTS and STATS over the same data and options share that one fit', () => {
    for (const name of ['FIT', 'KNOTS', 'STATS', 'PREDICT']) functionByName(name)!.invoke(name === 'PREDICT' ? [5, ys, xs] : [ys, xs]);
    expect(fits).toBe(1);
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
    expect(fits).toBe(7);
    // …and asking again for any of them is a cache hit.
    predict.invoke([2, changed, xs]);
    predict.invoke([2, ys, xs, 5]);
    expect(fits).toBe(7);
  });
  it('a column and a row with the same numbers are different inputs', () => {
    functionByName('FIT')!.invoke([ys, xs]);
    functionByName('FIT')!.invoke([[(ys as number[][]).map((r) => r[0]!)], xs]);
    expect(fits).toBe(2);
  });
});

describe('CV and BESTK', () => {
  const { ys, xs } = dataset(120, 3);
  it('share one cross-validation per data and options; the rule does not refit', () => {
    functionByName('CV')!.invoke([ys, xs, null, 5, 1, 1]);
    functionByName('BESTK')!.invoke([ys, xs, null, 5, 1, 1, null, null, 1]);
    functionByName('BESTK')!.invoke([ys, xs, null, 5, 1, 1, null, null, 0]);
    expect(cvs).toBe(1);
    functionByName('BESTK')!.invoke([ys, xs, null, 5, 1, 2]);
    expect(cvs).toBe(2);
  });
});

describe('bounds', () => {
  it('evicts least recently used entries beyond the entry bound', () => {
    configureCache(3, 1e9);
    const sets = [1, 2, 3, 4].map((s) => dataset(50, s));
    for (const d of sets) predict.invoke([1, d.ys, d.xs]);
    expect(fits).toBe(4);
    expect(cacheStats().entries).toBe(3);
    predict.invoke([1, sets[3]!.ys, sets[3]!.xs]); // newest: hit
    expect(fits).toBe(4);
    predict.invoke([1, sets[0]!.ys, sets[0]!.xs]); // oldest was evicted: refit
    expect(fits).toBe(5);
  });
  it('keeps the total size under the byte bound', () => {
    configureCache(1000, 200_000);
    for (let s = 0; s < 20; s++) {
      const d = dataset(1000, 100 + s);
      predict.invoke([1, d.ys, d.xs]);
      expect(cacheStats().bytes).toBeLessThanOrEqual(200_000);
    }
    expect(cacheStats().entries).toBeLessThan(20);
    expect(cacheStats().evictions).toBeGreaterThan(0);
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
