/**
 * Scratch memory for the hot loops of the core: one ArrayBuffer per slot, kept between calls and
 * grown on demand, so that repeated fits (cross-validation, many formulas over the same data) do
 * not allocate, zero and collect the same n-sized arrays again and again.
 *
 * Rules (DEVELOPERS.md, "Hot loops of the core"): a slot belongs to one function for the length
 * of one synchronous call that never calls back into user code; two buffers used at the same time
 * take different slots; nothing handed to a caller may be, or view, a scratch buffer (copy it
 * out). Buffers are not zeroed: callers write every entry before they read it. Each worker thread
 * has its own module instance, so its own slots.
 */

/** Slots of the scratch memory: each names one buffer and the function that uses it. */
export const Slot = {
  /** sortRows: radix keys, first and second buffer (2n words each; also read as n doubles). */
  KeyA: 0,
  KeyB: 1,
  /** sortRows: row indices, first and second buffer (n words). */
  IndexA: 2,
  IndexB: 3,
  /** isotonicChecked: summed w·mean of the block stack (n doubles). */
  BlockSum: 4,
  /** isotonicChecked: first sorted row of each distinct x (n + 1 words). */
  GroupStart: 5,
  /** isotonicChecked: the weights in x order, then the pooled weight of each distinct x (n doubles). */
  SortedWeight: 6,
  /** isotonicChecked: the fitted value of each distinct x (n doubles). */
  GroupValue: 7,
  /** isotonicChecked without fitted values: summed weight of the block stack (n doubles). */
  BlockWeight: 8,
} as const;

/** One of the {@link Slot} numbers. */
export type SlotId = (typeof Slot)[keyof typeof Slot];

const SLOTS = 9;

/**
 * Largest buffer kept between calls (8 MiB: the radix keys of 1,048,576 rows); bigger requests
 * get a fresh buffer every time, so the memory held between calls stays below about 50 MB.
 */
const KEEP_BYTES = 8 * 1024 * 1024;

const buffers: (ArrayBuffer | null)[] = new Array<ArrayBuffer | null>(SLOTS).fill(null);

/**
 * A buffer of at least `bytes` bytes for `slot`: the kept one when it is large enough, otherwise
 * a new one (kept when it is at most 8 MiB, rounded up to whole 64 KiB). Its contents are
 * whatever the last user left. O(1), or O(bytes) when it allocates.
 *
 * @param slot which buffer (see {@link Slot}).
 * @param bytes the size needed, ≥ 0.
 * @example new Float64Array(scratchBuffer(Slot.BlockSum, 80), 0, 10).length // → 10
 */
export function scratchBuffer(slot: SlotId, bytes: number): ArrayBuffer {
  const kept = buffers[slot];
  if (kept !== null && kept !== undefined && kept.byteLength >= bytes) return kept;
  if (bytes > KEEP_BYTES) return new ArrayBuffer(bytes);
  const buffer = new ArrayBuffer(Math.min(KEEP_BYTES, Math.ceil(Math.max(bytes, 1) / 65536) * 65536));
  buffers[slot] = buffer;
  return buffer;
}

/** `n` doubles of scratch memory in `slot` (not zeroed). O(1) unless it allocates. */
export function scratchF64(slot: SlotId, n: number): Float64Array {
  return new Float64Array(scratchBuffer(slot, 8 * n), 0, n);
}

/** `n` unsigned 32-bit words of scratch memory in `slot` (not zeroed). O(1) unless it allocates. */
export function scratchU32(slot: SlotId, n: number): Uint32Array {
  return new Uint32Array(scratchBuffer(slot, 4 * n), 0, n);
}
