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
 * Cost: O(n) time (four counting passes over 16-bit digits of the 64-bit key), O(n) extra
 * memory. A linear scan first returns the identity at once when `values` is already sorted.
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
  const count = new Uint32Array(BUCKETS);
  let src = order;
  let dst = new Uint32Array(n);
  for (let pass = 0; pass < 4; pass++) {
    const key = pass < 2 ? lo : hi;
    const shift = (pass & 1) * RADIX_BITS;
    count.fill(0);
    for (let i = 0; i < n; i++) count[(key[src[i]!]! >>> shift) & MASK]!++;
    // Skip a pass whose digit is the same for every element (common for the high bits).
    let only = -1;
    for (let b = 0; b < BUCKETS; b++) {
      if (count[b] === n) {
        only = b;
        break;
      }
      if (count[b] !== 0) break;
    }
    if (only >= 0) continue;
    let sum = 0;
    for (let b = 0; b < BUCKETS; b++) {
      const c = count[b]!;
      count[b] = sum;
      sum += c;
    }
    for (let i = 0; i < n; i++) {
      const idx = src[i]!;
      const b = (key[idx]! >>> shift) & MASK;
      dst[count[b]!++] = idx;
    }
    const t = src;
    src = dst;
    dst = t;
  }
  return src;
}
