/**
 * sortOrder is a stable ascending sort of finite doubles (−0 equal to +0). Specification checked
 * against the definition: a stable comparison sort of the indices (common practice), for sizes on
 * both sides of the switch between 8-bit and 16-bit radix digits (65,536 elements).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { sortOrder } from '../../src/core/sort-order.js';

/** The definition: indices ordered by value, ties by index. */
function referenceOrder(v: ArrayLike<number>): number[] {
  return Array.from({ length: v.length }, (_, i) => i).sort((a, b) => v[a]! + 0 - (v[b]! + 0) || a - b);
}

function mixed(n: number, seed: number): Float64Array {
  let s = seed >>> 0;
  const r = () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const k = r();
    v[i] = k < 0.05 ? -0 : k < 0.1 ? 0 : k < 0.4 ? Math.floor(r() * 50) - 25 : (r() - 0.5) * 10 ** (Math.floor(r() * 600) - 300);
  }
  return v;
}

describe('sortOrder', () => {
  it('is the stable ascending order for random finite doubles of any size below the digit switch', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { maxLength: 300 }), (values) => {
        expect(Array.from(sortOrder(values))).toEqual(referenceOrder(values));
      }),
      { seed: 7, numRuns: 300 },
    );
  });

  it.each([63, 64, 1000, 65535, 65536, 150000])('matches the definition at n = %i (ties, ±0, negatives, extremes)', (n) => {
    const v = mixed(n, n);
    expect(Array.from(sortOrder(v))).toEqual(referenceOrder(v));
  });

  it('returns the identity for sorted input and treats −0 as +0', () => {
    expect(Array.from(sortOrder([1, 2, 2, 3]))).toEqual([0, 1, 2, 3]);
    expect(Array.from(sortOrder([0, -0, 0]))).toEqual([0, 1, 2]);
    expect(Array.from(sortOrder([3, 1, 2, 1]))).toEqual([1, 3, 2, 0]);
  });
});
