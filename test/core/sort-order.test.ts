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

  // When the high 32 bits of the keys (sign, exponent, 20 mantissa bits) take many values, the
  // radix passes order by them only and each run of equal high words is then ordered by the low
  // word: insertion up to 32 rows, radix passes beyond (8-bit digits below 65,536 rows, 16-bit
  // from there). Otherwise every digit is sorted. These inputs reach each path; every 97th row
  // repeats an earlier value (ties inside a run keep their input order), and each input is also
  // checked negated.
  const sharing = (n: number, spread: number, cluster = 0): Float64Array => {
    let s = n >>> 0;
    const v = new Float64Array(n + cluster);
    const r = (): number => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296;
    // Values in [1, 1 + spread): a high word covers 2⁻²⁰ ≈ 9.5e-7 of that range.
    for (let i = 0; i < n; i++) v[i] = i % 97 === 96 ? v[i - 50]! : 1 + spread * r();
    // A cluster of rows inside one high word ([3, 3 + 2⁻²²)), shuffled among the others.
    for (let i = n; i < n + cluster; i++) v[i] = i % 97 === 96 ? v[i - 50]! : 3 + 2 ** -22 * r();
    for (let i = v.length - 1; i > 0; i--) {
      const j = Math.floor(r() * (i + 1));
      [v[i], v[j]] = [v[j]!, v[i]!];
    }
    return v;
  };
  it.each([
    ['every digit sorted: values within 1e-9 of each other (one high word)', 1000, 1e-9, 0],
    ['every digit sorted, 16-bit digits, one high word', 70000, 1e-9, 0],
    ['every digit sorted: runs of about 40 rows sharing a high word', 20000, 5e-4, 0],
    ['by the high word, runs of a few rows ordered by insertion', 20000, 1e-1, 0],
    ['by the high word, and a run of 300 rows ordered by 8-bit radix passes', 20000, 1e-1, 300],
    ['by the high word, and a run of 70,000 rows ordered by 16-bit radix passes', 300000, 1, 70000],
  ])('matches the definition: %s (n = %i, spread %d, cluster %i)', (_name, n, spread, cluster) => {
    const v = sharing(n, spread, cluster);
    expect(Array.from(sortOrder(v))).toEqual(referenceOrder(v));
    const w = v.map((t) => -t);
    expect(Array.from(sortOrder(w))).toEqual(referenceOrder(w));
  });

  it('returns the identity for sorted input and treats −0 as +0', () => {
    expect(Array.from(sortOrder([1, 2, 2, 3]))).toEqual([0, 1, 2, 3]);
    expect(Array.from(sortOrder([0, -0, 0]))).toEqual([0, 1, 2]);
    expect(Array.from(sortOrder([3, 1, 2, 1]))).toEqual([1, 3, 2, 0]);
  });
});
