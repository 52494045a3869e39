/**
 * Stable ascending sort order of finite numbers by LSD radix sort on their IEEE-754 bits — over
 * the high 32 bits of each 64-bit key only, then each run of rows that share those bits put in
 * order by the low 32 bits, when those runs are short on average.
 */
import { Slot, scratchBuffer, scratchU32 } from './scratch.js';

/**
 * Returns the permutation that sorts `values` ascending: `values[order[0]] ≤ values[order[1]] ≤ …`.
 * The sort is stable (equal values keep their input order) and treats −0 as equal to +0.
 *
 * Cost: O(n) time for any input: one histogram pass, then scatter passes over 16-bit digits of
 * the 64-bit key (8-bit below 65,536 elements), each skipped when all elements share that digit.
 * When the high word's digit histograms allow at least n / 4 distinct high words, only its two
 * (four) digits are sorted and one more pass puts each run of equal high words in order by the
 * low word — insertion for runs of up to 32, radix passes for longer ones (for random data the
 * runs are mostly single rows); otherwise all four (eight) digits are, after one more pass that
 * counts the low word's digits. O(n) extra memory (about 24 bytes per element). A linear scan
 * first returns the identity at once when `values` is already sorted.
 *
 * @param values finite numbers (NaN is not allowed — callers validate first); not modified.
 * @returns a new Uint32Array of indices (empty for empty input).
 * @example sortOrder([3, 1, 2, 1]) // → Uint32Array [1, 3, 2, 0]
 */
export function sortOrder(values: ArrayLike<number>): Uint32Array {
  return sortRows(values, false).order.slice();
}

/**
 * Result of {@link sortRows}. Every array in it is scratch memory (src/core/scratch.ts): valid
 * until the next sortRows call, and never to be handed to a caller without a copy.
 */
export interface SortedRows {
  /** The stable ascending permutation (as {@link sortOrder}). */
  order: Uint32Array;
  /** `values` in ascending order with −0 turned into +0, or null when not asked for. */
  sorted: Float64Array | null;
  /** The sort's other two buffers (n doubles' worth, and n indices), free for the caller to use. */
  spare: Float64Array;
  spareOrder: Uint32Array;
}

/**
 * {@link sortOrder} that can also return the sorted values themselves, decoded from the radix
 * keys the sort already moved into place — so a caller needs no random gather through the
 * permutation to read x in order (at 10⁶ rows that gather costs about as much as a sort pass).
 *
 * Cost: as sortOrder; the sorted values reuse the key buffer (no extra memory). All four buffers
 * (keys and indices, twice) are scratch memory kept between calls (src/core/scratch.ts), so a
 * repeated sort of n rows allocates nothing; the result lives in them (see {@link SortedRows}).
 *
 * @param values finite numbers (callers validate first; not scratch memory); not modified.
 * @param withSorted true to return the sorted values too.
 * @example sortRows([3, -0, 2], true).sorted // → Float64Array [0, 2, 3]
 */
export function sortRows(values: ArrayLike<number>, withSorted: boolean): SortedRows {
  const n = values.length;
  let sorted = true;
  for (let i = 1; i < n; i++) {
    if (values[i - 1]! > values[i]!) {
      sorted = false;
      break;
    }
  }
  const keyA = new Uint32Array(scratchBuffer(Slot.KeyA, 8 * n), 0, 2 * n);
  const keyB = new Uint32Array(scratchBuffer(Slot.KeyB, 8 * n), 0, 2 * n);
  const indexA = scratchU32(Slot.IndexA, n);
  const indexB = scratchU32(Slot.IndexB, n);
  if (sorted || n < 64) {
    const order = identity(indexA);
    if (!sorted) insertionSort(values, order);
    return {
      order,
      sorted: withSorted ? gather(values, order, new Float64Array(keyA.buffer, 0, n)) : null,
      spare: new Float64Array(keyB.buffer, 0, n),
      spareOrder: indexB,
    };
  }
  // Digits of 16 bits for large inputs; of 8 bits below 65,536 elements, where clearing and
  // summing 65,536-bucket histograms would cost more than the extra passes.
  const bits = n >= 65536 ? 16 : 8;
  const buckets = 1 << bits;
  const mask = buckets - 1;
  const perWord = 32 / bits;
  const passes = 2 * perWord;
  // Map each double to a 64-bit unsigned key whose unsigned order is the numeric order, stored
  // as (low word, high word) pairs in one array so a scatter moves a key with one 8-byte stride.
  // The high word's digit histograms are counted in the same pass (they do not depend on the
  // order); the low word's only when its passes are needed (below).
  const f = values instanceof Float64Array ? values : Float64Array.from(values);
  const u = new Uint32Array(f.buffer, f.byteOffset, 2 * n);
  let key: Uint32Array = keyA;
  const counts = histogramBuffer(passes * buckets);
  for (let i = 0; i < n; i++) {
    let l = u[2 * i]!;
    let h = u[2 * i + 1]!;
    if (h & 0x80000000) {
      const negativeZero = h === 0x80000000 && l === 0;
      l = negativeZero ? 0 : ~l >>> 0;
      h = negativeZero ? 0x80000000 : ~h >>> 0;
    } else {
      h = (h | 0x80000000) >>> 0;
    }
    key[2 * i] = l;
    key[2 * i + 1] = h;
    for (let p = 0; p < perWord; p++) counts[(p + perWord) * buckets + ((h >>> (p * bits)) & mask)]!++;
  }
  // The product of the high word's non-empty buckets bounds the number of distinct high words.
  // When rows sharing a high word are few on average by that bound (at most SHORT_RUNS: random
  // data of 10⁵ rows, widely spread data of 10⁶), sort by the high word's digits only and then order each run
  // of equal high words by the low word (orderRuns): half the scatter passes. Otherwise the runs
  // would be long enough for per-run sorting to cost more than the low passes: all digits, the
  // low word's histograms counted in a pass of their own.
  let distinctHigh = 1;
  for (let p = perWord; p < passes; p++) distinctHigh = Math.min(n, distinctHigh * nonEmptyBuckets(counts, p * buckets, buckets));
  const byHighWord = n <= SHORT_RUNS * distinctHigh;
  if (!byHighWord) {
    for (let i = 0; i < n; i++) {
      const l = key[2 * i]!;
      for (let p = 0; p < perWord; p++) counts[p * buckets + ((l >>> (p * bits)) & mask)]!++;
    }
  }
  // Exclusive prefix sums; a pass whose digit is the same for every element is skipped.
  const run: number[] = [];
  for (let p = byHighWord ? perWord : 0; p < passes; p++) if (startsOf(counts, p * buckets, buckets, 0) > 1) run.push(p);
  // Stable scatter passes that carry the keys along with the indices, so every pass reads its
  // input sequentially (gathering keys through the permutation would miss the cache). The first
  // pass takes the indices from its loop counter; the last decodes the keys as it writes them
  // (when every digit was sorted: otherwise orderRuns still compares them).
  let idx: Uint32Array | null = null;
  let spareIdx: Uint32Array = indexA;
  let spareKey: Uint32Array = keyB;
  for (let q = 0; q < run.length; q++) {
    const pass = run[q]!;
    const decode = withSorted && !byHighWord && q === run.length - 1;
    scatter(key, idx, spareKey, spareIdx, counts, pass * buckets, pass < perWord ? 0 : 1, (pass % perWord) * bits, mask, decode);
    const nextSpare = idx ?? indexB;
    idx = spareIdx;
    spareIdx = nextSpare;
    [key, spareKey] = [spareKey, key];
  }
  if (idx === null) {
    // Every digit was shared: the values are all equal (then the input was sorted, handled above).
    idx = identity(spareIdx);
    spareIdx = indexB;
    if (withSorted) decodeInPlace(key);
  } else if (byHighWord) {
    orderRuns(key, idx, spareKey, spareIdx);
    if (withSorted) decodeInPlace(key);
  }
  const spare = new Float64Array(spareKey.buffer, spareKey.byteOffset, n);
  return { order: idx, sorted: withSorted ? new Float64Array(key.buffer, key.byteOffset, n) : null, spare, spareOrder: spareIdx };
}

/**
 * Largest mean number of rows per distinct high word (bounded from the digit histograms) for
 * which sorting by the high word and then each run by the low word beats sorting all digits:
 * measured faster up to a mean of about 10 rows a run, and up to 2.2 × slower at 30–1000.
 */
const SHORT_RUNS = 4;

/** Runs up to this length are put in order by insertion; longer ones by radix passes. */
const INSERTION_RUN = 32;

/**
 * With the keys (and their indices) in order of the high word, puts each run of equal high words
 * in order of the low word, stably: then the keys are in order of the whole 64-bit key, stable —
 * the same permutation as radix passes over all four (or eight) digits, in fewer passes, since
 * for most data the runs are short (at 10⁶ random doubles, mostly single rows). A run already in
 * order (equal values, say) is left as it is; a short one is sorted by insertion, a long one by
 * {@link radixRunByLow} through the spare buffers. O(n) plus O(run²) for short runs.
 */
function orderRuns(key: Uint32Array, idx: Uint32Array, spareKey: Uint32Array, spareIdx: Uint32Array): void {
  const n = idx.length;
  let s = 0;
  let h = key[1]!;
  let ordered = true;
  for (let i = 1; i <= n; i++) {
    if (i < n) {
      const hi = key[2 * i + 1]!;
      if (hi === h) {
        if (key[2 * i]! < key[2 * i - 2]!) ordered = false;
        continue;
      }
      h = hi;
    }
    if (!ordered) {
      if (i - s <= INSERTION_RUN) insertionRunByLow(key, idx, s, i);
      else radixRunByLow(key, idx, s, i, spareKey, spareIdx);
      ordered = true;
    }
    s = i;
  }
}

/** Stable insertion sort of keys s … e − 1 (and their indices) by the low word; all share the high word. */
function insertionRunByLow(key: Uint32Array, idx: Uint32Array, s: number, e: number): void {
  for (let i = s + 1; i < e; i++) {
    const l = key[2 * i]!;
    const id = idx[i]!;
    let j = i - 1;
    while (j >= s && key[2 * j]! > l) {
      key[2 * j + 2] = key[2 * j]!;
      idx[j + 1] = idx[j]!;
      j--;
    }
    key[2 * j + 2] = l;
    idx[j + 1] = id;
  }
}

/** Histograms of {@link radixRunByLow} for runs shorter than 65,536: four 8-bit digits. */
const runCounts = new Uint32Array(4 * 256);

/**
 * Stable LSD radix sort of keys s … e − 1 (and their indices) by the low word — in 16-bit digits
 * from 65,536 keys on, 8-bit below — through the same range of the spare buffers; the result is
 * left in key and idx. All the keys share the high word. O(e − s).
 */
function radixRunByLow(key: Uint32Array, idx: Uint32Array, s: number, e: number, spareKey: Uint32Array, spareIdx: Uint32Array): void {
  const wide = e - s >= 65536;
  const bits = wide ? 16 : 8;
  const buckets = 1 << bits;
  const mask = buckets - 1;
  const passes = 32 / bits;
  const counts = wide ? histogramBuffer(2 * 65536) : runCounts.fill(0);
  for (let i = s; i < e; i++) {
    const l = key[2 * i]!;
    for (let p = 0; p < passes; p++) counts[p * buckets + ((l >>> (p * bits)) & mask)]!++;
  }
  const h = key[2 * s + 1]!;
  let fromKey = key;
  let fromIdx = idx;
  let toKey = spareKey;
  let toIdx = spareIdx;
  for (let p = 0; p < passes; p++) {
    if (startsOf(counts, p * buckets, buckets, s) < 2) continue;
    const base = p * buckets;
    const shift = p * bits;
    for (let i = s; i < e; i++) {
      const l = fromKey[2 * i]!;
      const at = counts[base + ((l >>> shift) & mask)]!++;
      toKey[2 * at] = l;
      toKey[2 * at + 1] = h;
      toIdx[at] = fromIdx[i]!;
    }
    [fromKey, toKey] = [toKey, fromKey];
    [fromIdx, toIdx] = [toIdx, fromIdx];
  }
  if (fromKey !== key) {
    key.set(fromKey.subarray(2 * s, 2 * e), 2 * s);
    idx.set(fromIdx.subarray(s, e), s);
  }
}

/**
 * Turns the counts `counts[base … base + size − 1]` into exclusive prefix sums starting at
 * `first` (each bucket's first position), in place; returns how many counts were non-zero.
 */
function startsOf(counts: Uint32Array, base: number, size: number, first: number): number {
  let sum = first;
  let nonEmpty = 0;
  for (let b = base, end = base + size; b < end; b++) {
    const k = counts[b]!;
    if (k !== 0) nonEmpty++;
    counts[b] = sum;
    sum += k;
  }
  return nonEmpty;
}

/** The number of non-zero counts among `counts[base … base + size − 1]`. */
function nonEmptyBuckets(counts: Uint32Array, base: number, size: number): number {
  let k = 0;
  for (let b = base; b < base + size; b++) if (counts[b] !== 0) k++;
  return k;
}

/** The histogram buffer, kept between calls (1 MB at most): allocating it anew each time costs more. */
let histograms: Uint32Array | null = null;

/** A zeroed histogram buffer of `size` counts (reused; the sort is never re-entered while it runs). */
function histogramBuffer(size: number): Uint32Array {
  if (histograms === null || histograms.length < size) histograms = new Uint32Array(Math.max(size, 4 * 65536));
  const h = histograms.subarray(0, size);
  h.fill(0);
  return h;
}

/** Writes 0, 1, …, n − 1 into `order` and returns it. */
function identity(order: Uint32Array): Uint32Array {
  for (let i = 0; i < order.length; i++) order[i] = i;
  return order;
}

/** Stable insertion sort of `order` by `values` (faster than counting passes below 64 elements). */
function insertionSort(values: ArrayLike<number>, order: Uint32Array): void {
  for (let i = 1; i < order.length; i++) {
    const idx = order[i]!;
    const v = values[idx]!;
    let j = i - 1;
    while (j >= 0 && values[order[j]!]! > v) {
      order[j + 1] = order[j]!;
      j--;
    }
    order[j + 1] = idx;
  }
}

/** Turns sort keys back into the doubles' bit patterns, in place. */
function decodeInPlace(key: Uint32Array): void {
  for (let i = 0; i < key.length; i += 2) {
    const l = key[i]!;
    const h = key[i + 1]!;
    key[i] = h & 0x80000000 ? l : ~l >>> 0;
    key[i + 1] = h & 0x80000000 ? (h & 0x7fffffff) >>> 0 : ~h >>> 0;
  }
}

/**
 * One stable counting-sort pass on the digit `(key word >>> shift) & mask`, moving keys and
 * indices (`idx` null: the identity); with `decode`, the keys are written back as the doubles'
 * bit patterns.
 */
function scatter(
  key: Uint32Array,
  idx: Uint32Array | null,
  outKey: Uint32Array,
  outIdx: Uint32Array,
  counts: Uint32Array,
  base: number,
  word: number,
  shift: number,
  mask: number,
  decode: boolean,
): void {
  const n = outIdx.length;
  for (let i = 0; i < n; i++) {
    const l = key[2 * i]!;
    const h = key[2 * i + 1]!;
    const at = counts[base + (((word === 0 ? l : h) >>> shift) & mask)]!++;
    outIdx[at] = idx === null ? i : idx[i]!;
    if (decode) {
      outKey[2 * at] = h & 0x80000000 ? l : ~l >>> 0;
      outKey[2 * at + 1] = h & 0x80000000 ? (h & 0x7fffffff) >>> 0 : ~h >>> 0;
    } else {
      outKey[2 * at] = l;
      outKey[2 * at + 1] = h;
    }
  }
}

/** `values` gathered through `order` into `out`, −0 turned into +0. */
function gather(values: ArrayLike<number>, order: Uint32Array, out: Float64Array): Float64Array {
  for (let k = 0; k < order.length; k++) out[k] = values[order[k]!]! + 0;
  return out;
}
