/**
 * SplitMix64: the small seeded pseudo-random generator behind every shuffled split in Ratchet.
 *
 * Why this generator: it is tiny, has a published reference sequence, passes common statistical
 * test batteries, and — implemented here with 32-bit integer arithmetic only (no floating-point
 * rounding, no BigInt) — yields the same numbers on every platform and JavaScript engine, so a
 * workbook gives the same folds everywhere.
 *
 * The algorithm (Steele, Lea & Flood 2014, "Fast splittable pseudorandom number generators",
 * OOPSLA '14; the `splitmix64.c` constants of S. Vigna): a 64-bit state s; each step
 *   s ← s + 0x9E3779B97F4A7C15 (mod 2⁶⁴)
 *   z ← s; z ← (z ⊕ (z ≫ 30)) · 0xBF58476D1CE4E5B9; z ← (z ⊕ (z ≫ 27)) · 0x94D049BB133111EB
 *   output z ⊕ (z ≫ 31)          (products mod 2⁶⁴)
 * With state 1234567 the first outputs are 6457827717110365317, 3203168211198807973, … (the
 * published sequence of the Rosetta Code task "Pseudo-random numbers/Splitmix64").
 */
import { fail } from './errors.js';

const TWO32 = 4294967296;

/**
 * Validates a seed: a whole number from 0 to 2⁵³ − 1 (Number.MAX_SAFE_INTEGER), so that it maps
 * to a 64-bit state exactly. Returns it unchanged.
 *
 * @throws RatchetError BAD_OPTION naming `name` (default `"seed"`).
 * @example checkSeed(42) // → 42
 */
export function checkSeed(seed: number, name = 'seed'): number {
  if (typeof seed !== 'number' || !Number.isSafeInteger(seed) || seed < 0) {
    fail('BAD_OPTION', name, `needs a whole number from 0 to ${Number.MAX_SAFE_INTEGER}; got ${String(seed)}`);
  }
  return seed;
}

/** (a · b) mod 2⁶⁴ for 64-bit numbers given as 32-bit halves; result in `out` as [hi, lo]. */
function mul64(ah: number, al: number, bh: number, bl: number, out: [number, number]): void {
  // al · bl exactly, through 16-bit pieces (every partial product < 2³², every sum < 2⁵³).
  const a0 = al & 0xffff;
  const a1 = al >>> 16;
  const b0 = bl & 0xffff;
  const b1 = bl >>> 16;
  const mid = a0 * b1 + a1 * b0; // < 2³³
  // mid mod 2¹⁶ and low ≥ 2³² by word operations and a comparison: the same numbers as % and
  // Math.floor on these whole doubles, without V8's slow floating-point remainder.
  const low = a0 * b0 + ((mid >>> 0) & 0xffff) * 65536; // < 2³³
  const carry = low >= TWO32 ? 1 : 0;
  const hi = a1 * b1 + Math.floor(mid / 65536) + carry + Math.imul(ah, bl) + Math.imul(al, bh);
  out[0] = hi >>> 0; // ToUint32 reduces any integer-valued double mod 2³² exactly
  out[1] = low >>> 0;
}

/**
 * A SplitMix64 generator. Construct with {@link SplitMix64.fromSeed} (a checked seed number) or
 * from the two 32-bit halves of a 64-bit state. Each call of {@link next} advances the state
 * once and leaves the 64-bit output in {@link hi} and {@link lo}.
 *
 * Cost: O(1) per output, a few dozen integer operations; no allocation.
 *
 * @example SplitMix64.fromSeed(1234567).nextBigInt() // → 6457827717110365317n
 */
export class SplitMix64 {
  private sHi: number;
  private sLo: number;
  /** High 32 bits of the last output (unsigned). */
  hi = 0;
  /** Low 32 bits of the last output (unsigned). */
  lo = 0;
  private readonly tmp: [number, number] = [0, 0];

  /** State from its high and low 32-bit halves (each an unsigned 32-bit whole number). */
  constructor(stateHi: number, stateLo: number) {
    this.sHi = stateHi >>> 0;
    this.sLo = stateLo >>> 0;
  }

  /** A generator whose 64-bit state is the seed (a whole number 0 … 2⁵³ − 1; see {@link checkSeed}). */
  static fromSeed(seed: number, name = 'seed'): SplitMix64 {
    checkSeed(seed, name);
    return new SplitMix64(Math.floor(seed / TWO32), seed % TWO32);
  }

  /** Advances once; the output is then in {@link hi}, {@link lo}. */
  next(): void {
    // s += golden gamma 0x9E3779B9_7F4A7C15
    const lo = this.sLo + 0x7f4a7c15;
    this.sLo = lo >>> 0;
    this.sHi = (this.sHi + 0x9e3779b9 + (lo >= TWO32 ? 1 : 0)) >>> 0;
    let zh = this.sHi;
    let zl = this.sLo;
    const t = this.tmp;
    // z ^= z >>> 30; z *= 0xBF58476D_1CE4E5B9
    zl = (zl ^ ((zl >>> 30) | (zh << 2))) >>> 0;
    zh = (zh ^ (zh >>> 30)) >>> 0;
    mul64(zh, zl, 0xbf58476d, 0x1ce4e5b9, t);
    zh = t[0];
    zl = t[1];
    // z ^= z >>> 27; z *= 0x94D049BB_133111EB
    zl = (zl ^ ((zl >>> 27) | (zh << 5))) >>> 0;
    zh = (zh ^ (zh >>> 27)) >>> 0;
    mul64(zh, zl, 0x94d049bb, 0x133111eb, t);
    zh = t[0];
    zl = t[1];
    // z ^= z >>> 31
    this.lo = (zl ^ ((zl >>> 31) | (zh << 1))) >>> 0;
    this.hi = (zh ^ (zh >>> 31)) >>> 0;
  }

  /** The next output as a BigInt in [0, 2⁶⁴) (for checks and display; the splits use {@link below}). */
  nextBigInt(): bigint {
    this.next();
    return (BigInt(this.hi) << 32n) | BigInt(this.lo);
  }

  /**
   * A uniform whole number in [0, m) for 1 ≤ m ≤ 2³², without bias: draws r = the high 32 bits
   * of the next output, rejects r < 2³² mod m (so the accepted range is a multiple of m), and
   * returns r mod m. Expected draws < 2 for every m. O(1) expected.
   */
  below(m: number): number {
    // Remainders as r − ⌊r/m⌋·m: exact here (r < 2⁵³, so the rounded quotient never crosses a
    // whole number), and far cheaper in V8 than the floating-point % operator.
    const threshold = TWO32 - Math.floor(TWO32 / m) * m;
    for (;;) {
      this.next();
      const r = this.hi;
      if (r >= threshold) return r - Math.floor(r / m) * m;
    }
  }
}

/**
 * Standard normal deviates, by the Box–Muller transform of pairs of 53-bit uniforms in (0, 1)
 * drawn from `rng` (Box & Muller 1958, Ann. Math. Statist. 29:610–611). Each pair of uniforms
 * gives two deviates; the second is kept for the next call. Used by the seeded simulation studies
 * (the band coverage study and its test), never by a fit. O(1) a call.
 *
 * @param rng the generator to draw from (advanced by each call that needs new uniforms).
 * @returns a function returning the next deviate.
 * @example const z = normalDeviates(SplitMix64.fromSeed(1)); [z(), z()].every(Number.isFinite) // → true
 */
export function normalDeviates(rng: SplitMix64): () => number {
  let spare: number | null = null;
  const uniform = (): number => {
    rng.next();
    return (rng.hi * 2 ** 21 + (rng.lo >>> 11) + 0.5) / 2 ** 53;
  };
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    const r = Math.sqrt(-2 * Math.log(uniform()));
    const a = 2 * Math.PI * uniform();
    spare = r * Math.sin(a);
    return r * Math.cos(a);
  };
}
