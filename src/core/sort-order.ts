/**
 * Stable ascending sort order of finite numbers by LSD radix sort on their IEEE-754 bits.
 */

const RADIX_BITS = 16;
const BUCKETS = 1 << RADIX_BITS;
const MASK = BUCKETS - 1;

/**
 * Returns the permutation that sorts `values` ascending: `values[order[0]] ≤ values[order[1]] ≤ …`.
 * The sort is stable (equal values keep their input order) and treats −0 as equal to +0.
 *
 * Cost: O(n) time (one histogram pass, then up to four scatter passes over 16-bit digits of the
 * 64-bit key, each skipped when all elements share that digit), O(n) extra memory. A linear scan first returns the identity at once when `values` is already sorted.
 *
 * @param values finite numbers (NaN is not allowed — callers validate first); not modified.
 * @returns a new Uint32Array of indices (empty for empty input).
 * @example sortOrder([3, 1, 2, 1]) // → Uint32Array [1, 3, 2, 0]
 */
export function sortOrder(values: ArrayLike<number>): Uint32Array {
  const n = values.length;
  const order = new Uint32Array(n);
  let sorted = true;
  for (let i = 0; i < n; i++) {
    order[i] = i;
    if (i > 0 && values[i - 1]! > values[i]!) sorted = false;
  }
  if (sorted || n < 2) return order;
  if (n < 64) {
    // Insertion sort is faster than four counting passes on tiny inputs (and stable).
    for (let i = 1; i < n; i++) {
      const idx = order[i]!;
      const v = values[idx]!;
      let j = i - 1;
      while (j >= 0 && values[order[j]!]! > v) {
        order[j + 1] = order[j]!;
        j--;
      }
      order[j + 1] = idx;
    }
    return order;
  }
  // Map each double to a 64-bit unsigned key (hi, lo) whose unsigned order is the numeric order.
  const f = new Float64Array(n);
  for (let i = 0; i < n; i++) f[i] = values[i]! + 0; // + 0 turns −0 into +0
  const u = new Uint32Array(f.buffer);
  const lo = new Uint32Array(n);
  const hi = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    const l = u[2 * i]!;
    const h = u[2 * i + 1]!;
    if (h & 0x80000000) {
      hi[i] = ~h >>> 0;
      lo[i] = ~l >>> 0;
    } else {
      hi[i] = (h | 0x80000000) >>> 0;
      lo[i] = l;
    }
  }
  // All four digit histograms in one pass (they do not depend on the order), then four stable
  // scatter passes that carry the remaining key words along with the indices, so every pass reads
  // its input sequentially (gathering keys through the permutation would miss the cache).
  const counts = [new Uint32Array(BUCKETS), new Uint32Array(BUCKETS), new Uint32Array(BUCKETS), new Uint32Array(BUCKETS)];
  const [c0, c1, c2, c3] = counts as [Uint32Array, Uint32Array, Uint32Array, Uint32Array];
  for (let i = 0; i < n; i++) {
    const l = lo[i]!;
    const h = hi[i]!;
    c0[l & MASK]!++;
    c1[l >>> RADIX_BITS]!++;
    c2[h & MASK]!++;
    c3[h >>> RADIX_BITS]!++;
  }
  // A pass whose digit is the same for every element changes nothing and is skipped.
  const needed = counts.map((c) => {
    let sum = 0;
    let nonEmpty = 0;
    for (let b = 0; b < BUCKETS; b++) {
      const k = c[b]!;
      if (k !== 0) nonEmpty++;
      c[b] = sum;
      sum += k;
    }
    return nonEmpty > 1;
  });
  let idx = order;
  let keyLo = lo;
  let keyHi = hi;
  let spareIdx = new Uint32Array(n);
  let spareLo = new Uint32Array(n);
  let spareHi = new Uint32Array(n);
  for (let pass = 0; pass < 4; pass++) {
    if (!needed[pass]) continue;
    const c = counts[pass]!;
    const onLo = pass < 2;
    const shift = (pass & 1) * RADIX_BITS;
    const key = onLo ? keyLo : keyHi;
    for (let i = 0; i < n; i++) {
      const at = c[(key[i]! >>> shift) & MASK]!++;
      spareIdx[at] = idx[i]!;
      if (onLo) spareLo[at] = keyLo[i]!; // the low word is needed only by passes 0 and 1
      spareHi[at] = keyHi[i]!;
    }
    [idx, spareIdx] = [spareIdx, idx];
    [keyHi, spareHi] = [spareHi, keyHi];
    if (onLo) [keyLo, spareLo] = [spareLo, keyLo];
  }
  return idx;
}
