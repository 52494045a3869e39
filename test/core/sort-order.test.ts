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

  // The radix passes order by the keys' high 32 bits (sign, exponent, 20 mantissa bits); runs of
  // equal high words are then ordered by the low word: insertion up to 32 rows, radix passes
  // (8-bit digits below 65,536 rows, 16-bit from there) beyond. These inputs reach each path.
  it.each([
    ['one high word, 8-bit low passes', 1000, 1e-9],
    ['one high word, 16-bit low passes', 70000, 1e-9],
    ['runs of about 40 rows sharing a high word', 20000, 5e-4],
    ['runs of a few rows sharing a high word', 20000, 1e-2],
  ])('matches the definition when values share their high 32 bits: %s (n = %i, spread %d)', (_name, n, spread) => {
    let s = n >>> 0;
    const v = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      // Values in [1, 1 + spread): a high word covers 2⁻²⁰ ≈ 9.5e-7 of that range, and every
      // 97th row repeats an earlier value (ties inside a run keep their input order).
      v[i] = i % 97 === 96 ? v[i - 50]! : 1 + spread * (s / 4294967296);
    }
    expect(Array.from(sortOrder(v))).toEqual(referenceOrder(v));
    expect(Array.from(sortOrder(v.map((t) => -t)))).toEqual(referenceOrder(v.map((t) => -t)));
  });

  it('returns the identity for sorted input and treats −0 as +0', () => {
    expect(Array.from(sortOrder([1, 2, 2, 3]))).toEqual([0, 1, 2, 3]);
    expect(Array.from(sortOrder([0, -0, 0]))).toEqual([0, 1, 2]);
    expect(Array.from(sortOrder([3, 1, 2, 1]))).toEqual([1, 3, 2, 0]);
  });
});
