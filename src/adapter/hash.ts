/**
 * Content hashing of numeric data for the result cache.
 */

/**
 * A 64-bit content hash of the bit patterns of `a` (two independent 32-bit lanes: FNV-1a style
 * multiply-xor and a Murmur3-style mix), returned as two unsigned decimals "h1.h2". Equal arrays (bit for bit,
 * so NaN blanks and +0 compare equal) give equal hashes; the cache still verifies equality on a
 * hit, so a collision can never return a wrong result. Cost O(n).
 * @example hashFloat64(new Float64Array([1, 2])) === hashFloat64(Float64Array.of(1, 2)) // → true
 */
export function hashFloat64(a: Float64Array): string {
  const u = new Uint32Array(a.buffer, a.byteOffset, a.length * 2);
  let h1 = 0x811c9dc5 ^ a.length;
  let h2 = 0x9747b28c ^ Math.imul(a.length, 0x85ebca6b);
  for (let i = 0; i < u.length; i++) {
    const w = u[i]!;
    h1 = Math.imul(h1 ^ w, 0x01000193);
    let k = Math.imul(w, 0xcc9e2d51);
    k = (k << 15) | (k >>> 17);
    h2 ^= Math.imul(k, 0x1b873593);
    h2 = (h2 << 13) | (h2 >>> 19);
    h2 = (Math.imul(h2, 5) + 0xe6546b64) | 0;
  }
  h1 ^= h1 >>> 16;
  h1 = Math.imul(h1, 0x85ebca6b);
  h1 ^= h1 >>> 13;
  h2 ^= h2 >>> 16;
  h2 = Math.imul(h2, 0xc2b2ae35);
  h2 ^= h2 >>> 16;
  return `${h1 >>> 0}.${h2 >>> 0}`;
}

/**
 * True when two Float64Arrays hold the same numbers, NaN equal to NaN (blanks) — for the arrays the
 * adapter builds (one NaN pattern, −0 stored as +0) the same as equal bit patterns. O(n).
 */
export function sameBits(a: Float64Array, b: Float64Array): boolean {
  if (a === b) return true;
  const n = a.length;
  if (n !== b.length) return false;
  for (let i = 0; i < n; i++) {
    const x = a[i]!;
    const y = b[i]!;
    if (x !== y && (x === x || y === y)) return false;
  }
  return true;
}
