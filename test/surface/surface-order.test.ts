/**
 * The lattice order helpers, by hand-worked examples: the order induced on the identified nodes
 * (which keeps relations that pass through unidentified nodes) and the envelope fill.
 */
import { describe, expect, it } from 'vitest';
import { inducedOrder, latticeEdges, orderEnvelopeMean } from '../../src/core/surface-solve.js';

/** Edges as sorted [lo, hi] pairs (the order of the list does not matter). */
function pairs(e: { lo: Int32Array; hi: Int32Array }): number[][] {
  return [...e.lo].map((l, k) => [l, e.hi[k]!]).sort((a, b) => a[0]! - b[0]! || a[1]! - b[1]!);
}

describe('inducedOrder (covering pairs among the listed nodes)', () => {
  // A 3 × 2 lattice (K1 = 3): nodes 0 = (0,0), 2 = (2,0), 4 = (1,1) are listed (compact 0, 1, 2).
  const nodes = Int32Array.from([0, 2, 4]);

  it('up/up: (0,0) lies below (2,0) and below (1,1); those two are not comparable', () => {
    const e = inducedOrder(3, 'up', 'up', nodes);
    expect(pairs(e)).toEqual([
      [0, 1],
      [0, 2],
    ]);
  });

  it("up/'none': only nodes in the same row (same x2 knot) are ordered", () => {
    const e = inducedOrder(3, 'up', 'none', nodes);
    expect(pairs(e)).toEqual([[0, 1]]);
  });

  it('down/up: (2,0) lies below (0,0) and below (1,1)', () => {
    const e = inducedOrder(3, 'down', 'up', nodes);
    expect(pairs(e)).toEqual([
      [1, 0],
      [1, 2],
    ]);
  });

  it('on a full lattice the covering pairs are exactly the neighbour edges', () => {
    const all = Int32Array.from({ length: 12 }, (_, p) => p);
    const e = inducedOrder(4, 'up', 'down', all);
    const l = latticeEdges(4, 3, 'up', 'down');
    const key = (a: ArrayLike<number>, b: ArrayLike<number>) => Array.from(a, (v, k) => `${v}>${b[k]}`).sort();
    expect(key(e.lo, e.hi)).toEqual(key(l.lo, l.hi));
  });
});

describe('orderEnvelopeMean', () => {
  it('repairs a small violation to the mean of the monotone majorant and minorant', () => {
    // 2 × 1 lattice rising along x1 with values 3, 1: majorant 3, 3; minorant 1, 1 → 2, 2.
    expect(Array.from(orderEnvelopeMean(Float64Array.from([3, 1]), 2, 1, 'up', 'none'))).toEqual([2, 2]);
  });

  it('fills masked-out nodes from the identified ones and leaves a monotone lattice unchanged', () => {
    const v = Float64Array.from([1, 2, 0, 3, 5, 0]);
    const mask = Uint8Array.from([1, 1, 0, 1, 1, 0]);
    expect(Array.from(orderEnvelopeMean(v, 3, 2, 'up', 'up', mask))).toEqual([1, 2, 3.5, 3, 5, 5]);
    expect(Array.from(orderEnvelopeMean(Float64Array.from([1, 2, 3, 4]), 2, 2, 'up', 'up'))).toEqual([1, 2, 3, 4]);
  });
});
