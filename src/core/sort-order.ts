/**
 * Stable ascending sort order of finite numbers by LSD radix sort on their IEEE-754 bits.
 */


/**
 * Returns the permutation that sorts `values` ascending: `values[order[0]] ≤ values[order[1]] ≤ …`.
 * The sort is stable (equal values keep their input order) and treats −0 as equal to +0.
 *
 * Cost: O(n) time (one histogram pass, then up to four scatter passes over 16-bit digits of the
 * 64-bit key — eight over 8-bit digits below 65,536 elements — each skipped when all elements
 * share that digit), O(n) extra memory. A linear scan first returns the identity at once when `values` is already sorted.
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
  // Digits of 16 bits (4 passes) for large inputs; of 8 bits (8 passes) below 65,536 elements,
  // where clearing and summing 65,536-bucket histograms would cost more than the passes.
  const bits = n >= 65536 ? 16 : 8;
  const buckets = 1 << bits;
  const mask = buckets - 1;
  const perWord = 32 / bits;
  const passes = 2 * perWord;
  // All digit histograms in one pass (they do not depend on the order).
  const counts = new Uint32Array(passes * buckets);
  for (let i = 0; i < n; i++) {
    const l = lo[i]!;
    const h = hi[i]!;
    for (let p = 0; p < perWord; p++) {
      counts[p * buckets + ((l >>> (p * bits)) & mask)]!++;
      counts[(p + perWord) * buckets + ((h >>> (p * bits)) & mask)]!++;
    }
  }
  // Exclusive prefix sums; a pass whose digit is the same for every element is skipped.
  const needed: boolean[] = [];
  for (let p = 0; p < passes; p++) {
    let sum = 0;
    let nonEmpty = 0;
    for (let b = p * buckets, end = b + buckets; b < end; b++) {
      const k = counts[b]!;
      if (k !== 0) nonEmpty++;
      counts[b] = sum;
      sum += k;
    }
    needed.push(nonEmpty > 1);
  }
  // Stable scatter passes that carry the key words along with the indices, so every pass reads
  // its input sequentially (gathering keys through the permutation would miss the cache).
  let idx = order;
  let keyLo = lo;
  let keyHi = hi;
  let spareIdx = new Uint32Array(n);
  let spareLo = new Uint32Array(n);
  let spareHi = new Uint32Array(n);
  for (let pass = 0; pass < passes; pass++) {
    if (!needed[pass]) continue;
    const base = pass * buckets;
    const onLo = pass < perWord;
    const shift = (pass % perWord) * bits;
    const key = onLo ? keyLo : keyHi;
    for (let i = 0; i < n; i++) {
      const at = counts[base + ((key[i]! >>> shift) & mask)]!++;
      spareIdx[at] = idx[i]!;
      if (onLo) spareLo[at] = keyLo[i]!; // the low word is needed only by the low-word passes
      spareHi[at] = keyHi[i]!;
    }
    [idx, spareIdx] = [spareIdx, idx];
    [keyHi, spareHi] = [spareHi, keyHi];
    if (onLo) [keyLo, spareLo] = [spareLo, keyLo];
  }
  return idx;
}
