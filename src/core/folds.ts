/**
 * Splitting rows into cross-validation folds and hold-out sets, reproducibly.
 *
 * Every split is "an order of the rows, then contiguous blocks": with seed 0 the order is the row
 * order itself (no shuffling); with any other seed it is a seeded permutation (Fisher–Yates driven
 * by {@link SplitMix64}). Repeat r of a repeated K-fold run uses its own derived seed
 * ({@link repeatState}), so repeats differ from one another but every run with the same seed gives
 * the same folds on every platform.
 */
import { SplitMix64, checkSeed } from './prng.js';
import { fail } from './errors.js';

/**
 * Fold sizes for n rows in F folds: ⌊n/F⌋ each, and the first n mod F folds one row larger —
 * the rule of scikit-learn's `KFold`. O(F).
 *
 * @param n rows, ≥ F.
 * @param folds F, a whole number 2 ≤ F ≤ n (not checked here; {@link kFoldAssignment} checks).
 * @example foldSizes(7, 3) // → [3, 2, 2]
 */
export function foldSizes(n: number, folds: number): number[] {
  const base = Math.floor(n / folds);
  const extra = n % folds;
  const sizes: number[] = [];
  for (let f = 0; f < folds; f++) sizes.push(base + (f < extra ? 1 : 0));
  return sizes;
}

/**
 * The 64-bit generator state used for repeat r (0-based) of a run with the given seed: output
 * r + 1 of SplitMix64 started at state = seed. (Repeat 0 uses the first output, repeat 1 the
 * second, …; the permutation of a repeat is then drawn from SplitMix64 started at that state.)
 * Mixing the seed this way keeps neighbouring seeds and neighbouring repeats unrelated.
 *
 * Cost O(r). @throws RatchetError BAD_OPTION (seed not a whole number 0 … 2⁵³ − 1).
 * @example repeatState(1, 0) // → [0x910a2dec, 0x89025cc1] (the first SplitMix64 output of state 1)
 */
export function repeatState(seed: number, repeat: number): [number, number] {
  const g = SplitMix64.fromSeed(seed);
  for (let r = 0; r <= repeat; r++) g.next();
  return [g.hi, g.lo];
}

/**
 * A seeded permutation of 0 … n − 1 by the Fisher–Yates shuffle (Durstenfeld's in-place form,
 * Knuth TAOCP vol. 2, Algorithm 3.4.2P): start from the identity; for i = n − 1 down to 1 draw
 * j = `below(i + 1)` (uniform on 0 … i, see {@link SplitMix64.below}) and swap entries i and j.
 * The generator starts at {@link repeatState}(seed, repeat).
 *
 * Cost: O(n) time and one Uint32Array of n entries. n = 0 or 1 gives the identity.
 *
 * @param n number of rows, a whole number 0 ≤ n ≤ 2³².
 * @param seed a whole number 1 … 2⁵³ − 1 (0 is allowed and simply seeds the generator; the
 *   splitting functions treat seed 0 as "no shuffling" before calling this).
 * @param repeat whole number ≥ 0 (default 0).
 * @example Array.from(seededPermutation(5, 1)) // → [0, 4, 2, 1, 3] (on every machine)
 */
export function seededPermutation(n: number, seed: number, repeat = 0): Uint32Array {
  const [hi, lo] = repeatState(seed, repeat);
  const g = new SplitMix64(hi, lo);
  const p = new Uint32Array(n);
  for (let i = 0; i < n; i++) p[i] = i;
  for (let i = n - 1; i >= 1; i--) {
    const j = g.below(i + 1);
    const t = p[i]!;
    p[i] = p[j]!;
    p[j] = t;
  }
  return p;
}

/** Row order of a split: the identity for seed 0, else {@link seededPermutation}. */
function splitOrder(n: number, seed: number, repeat: number): Uint32Array {
  if (seed === 0) {
    const p = new Uint32Array(n);
    for (let i = 0; i < n; i++) p[i] = i;
    return p;
  }
  return seededPermutation(n, seed, repeat);
}

/**
 * Fold of every row for one repeat of K-fold cross-validation. The rows are put in order (row
 * order for seed 0, the seeded permutation of `repeat` otherwise) and cut into F contiguous
 * blocks of {@link foldSizes}: fold f holds order positions [start_f, start_f + size_f). With
 * seed 0 this is exactly scikit-learn's `KFold(n_splits=F, shuffle=False)`.
 *
 * Cost: O(n). Returns a Uint32Array `fold` with `fold[row]` in 0 … F − 1.
 *
 * @param n rows (≥ 2).
 * @param folds F, a whole number 2 ≤ F ≤ n.
 * @param seed whole number 0 … 2⁵³ − 1; 0 = no shuffling.
 * @param repeat whole number ≥ 0 (default 0); ignored for seed 0.
 * @throws RatchetError BAD_OPTION (folds out of range, bad seed).
 * @example Array.from(kFoldAssignment(5, 2, 0)) // → [0, 0, 0, 1, 1]; with seed 1 → [0, 1, 0, 1, 0]
 */
export function kFoldAssignment(n: number, folds: number, seed: number, repeat = 0): Uint32Array {
  checkFolds(folds, n);
  checkSeed(seed);
  const order = splitOrder(n, seed, repeat);
  const fold = new Uint32Array(n);
  const sizes = foldSizes(n, folds);
  let p = 0;
  for (let f = 0; f < folds; f++) {
    for (let k = 0; k < sizes[f]!; k++) fold[order[p++]!] = f;
  }
  return fold;
}

/**
 * Throws BAD_OPTION unless `folds` is a whole number from 2 to n.
 * @example checkFolds(5, 50) // → 5
 */
export function checkFolds(folds: number, n: number): number {
  if (typeof folds !== 'number' || !Number.isInteger(folds) || folds < 2 || folds > n) {
    fail('BAD_OPTION', 'folds', `needs a whole number from 2 to the number of rows used (${n}); got ${String(folds)}`);
  }
  return folds;
}

/**
 * Test-set size of a hold-out split: ⌈p·n⌉ (scikit-learn's `train_test_split` rule for a
 * fractional `test_size`, including its floating-point product). O(1).
 *
 * @throws RatchetError BAD_OPTION when p is not a number strictly between 0 and 1, or when the
 *   split would leave no training row or no test row.
 * @example holdoutSize(10, 0.25) // → 3
 */
export function holdoutSize(n: number, testFraction: number): number {
  if (typeof testFraction !== 'number' || !(testFraction > 0 && testFraction < 1)) {
    fail('BAD_OPTION', 'testFraction', `needs a number strictly between 0 and 1; got ${String(testFraction)}`);
  }
  const m = Math.ceil(testFraction * n);
  if (m >= n) {
    fail('BAD_OPTION', 'testFraction', `needs to leave at least one training row of ${n}; got ${testFraction} (${m} test rows)`);
  }
  return m;
}

/**
 * One hold-out split: 1 for test rows, 0 for training rows. The rows are put in order (row order
 * for seed 0, {@link seededPermutation}(n, seed, 0) otherwise) and the LAST ⌈p·n⌉ positions are
 * the test set — with seed 0 exactly scikit-learn's `train_test_split(shuffle=False)`.
 *
 * Cost: O(n).
 *
 * @param n rows (≥ 2).
 * @param testFraction p in (0, 1) (default 0.25).
 * @param seed whole number 0 … 2⁵³ − 1 (default 1); 0 = no shuffling.
 * @throws RatchetError BAD_OPTION (see {@link holdoutSize}, {@link checkSeed}).
 * @example Array.from(holdoutAssignment(4, 0.25, 0)) // → [0, 0, 0, 1]
 */
export function holdoutAssignment(n: number, testFraction = 0.25, seed = 1): Uint8Array {
  const m = holdoutSize(n, testFraction);
  checkSeed(seed);
  const order = splitOrder(n, seed, 0);
  const test = new Uint8Array(n);
  for (let p = n - m; p < n; p++) test[order[p]!] = 1;
  return test;
}
