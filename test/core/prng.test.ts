/**
 * SplitMix64 (src/core/prng.ts), the generator behind every shuffled split. Checked against:
 *  - the published sequence of the Rosetta Code task "Pseudo-random numbers/Splitmix64" (state
 *    1234567; also reproduced by the Python generator in cv_prng.json),
 *  - an independent Python implementation in test/reference/gen_cv.py (fixture cv_prng.json,
 *    `/usr/bin/python3 test/reference/gen_cv.py`),
 *  - a BigInt transcription of the algorithm (Steele, Lea & Flood 2014) written in this test, on
 *    random 64-bit states (fast-check).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { SplitMix64, RatchetError, normalDeviates } from '../../src/core/index.js';
import { checkSeed } from '../../src/core/prng.js';
import prng from '../reference/fixtures/cv_prng.json' with { type: 'json' };

const M64 = (1n << 64n) - 1n;

/** The algorithm in BigInt arithmetic, straight from its definition. */
function bigSplitMix(state: bigint): () => bigint {
  let s = state & M64;
  return () => {
    s = (s + 0x9e3779b97f4a7c15n) & M64;
    let z = s;
    z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & M64;
    z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & M64;
    return z ^ (z >> 31n);
  };
}

describe('SplitMix64 outputs', () => {
  it('state 1234567 gives the published first five outputs (Rosetta Code, "Pseudo-random numbers/Splitmix64")', () => {
    const g = SplitMix64.fromSeed(1234567);
    const got = Array.from({ length: 5 }, () => g.nextBigInt());
    expect(got).toEqual([6457827717110365317n, 3203168211198807973n, 9817491932198370423n, 4593380528125082431n, 16408922859458223821n]);
    expect(prng.published.outputs.map(BigInt)).toEqual(got); // the Python generator agrees
  });

  it('the first 8 outputs for seeds 0, 1, 42 and 2^53 − 1 equal the Python implementation (cv_prng.json)', () => {
    for (const [seed, outputs] of Object.entries(prng.sequences)) {
      const g = SplitMix64.fromSeed(Number(seed));
      expect(outputs.map(() => g.nextBigInt().toString()), `seed ${seed}`).toEqual(outputs);
    }
  });

  it('the 32-bit-halves arithmetic equals BigInt arithmetic on any 64-bit state (property)', () => {
    fc.assert(
      fc.property(fc.bigInt({ min: 0n, max: M64 }), (state) => {
        const g = new SplitMix64(Number(state >> 32n), Number(state & 0xffffffffn));
        const ref = bigSplitMix(state);
        for (let k = 0; k < 20; k++) {
          const v = g.nextBigInt();
          if (v !== ref()) return false;
          if ((BigInt(g.hi) << 32n) + BigInt(g.lo) !== v) return false;
        }
        return true;
      }),
      { numRuns: 300 },
    );
  });

  it('states whose low half overflows on the increment carry into the high half', () => {
    // 0xFFFFFFFF in the low half + 0x7F4A7C15 must carry.
    const state = (5n << 32n) | 0xffffffffn;
    const g = new SplitMix64(5, 0xffffffff);
    expect(g.nextBigInt()).toBe(bigSplitMix(state)());
  });
});

describe('SplitMix64.below (uniform whole numbers without bias)', () => {
  it('equals the rule "high 32 bits, reject below 2^32 mod m, then mod m" written out in BigInt', () => {
    for (const m of [1, 2, 3, 7, 10, 1000, 2 ** 31 + 1, 3_000_000_000, 2 ** 32]) {
      const g = SplitMix64.fromSeed(99);
      const ref = bigSplitMix(99n);
      const threshold = 2n ** 32n % BigInt(m);
      for (let k = 0; k < 50; k++) {
        let r: bigint;
        do r = ref() >> 32n;
        while (r < threshold);
        expect(g.below(m)).toBe(Number(r % BigInt(m)));
      }
    }
  });

  it('equals the same BigInt rule for any m from 1 to 2^32 and any seed (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 32 }), fc.integer({ min: 0, max: Number.MAX_SAFE_INTEGER }), (m, seed) => {
        const g = SplitMix64.fromSeed(seed);
        const ref = bigSplitMix(BigInt(seed));
        const threshold = 2n ** 32n % BigInt(m);
        for (let k = 0; k < 4; k++) {
          let r: bigint;
          do r = ref() >> 32n;
          while (r < threshold);
          expect(g.below(m)).toBe(Number(r % BigInt(m)));
        }
      }),
      { seed: 1616, numRuns: 2000 },
    );
  });

  it('for m = 3·2^30 about a quarter of the draws are rejected (2^32 mod m = 2^30), and results stay in range', () => {
    const m = 3 * 2 ** 30;
    const g = SplitMix64.fromSeed(5);
    const ref = bigSplitMix(5n);
    let rejected = 0;
    for (let k = 0; k < 2000; k++) {
      let r = ref() >> 32n;
      while (r < 2n ** 30n) {
        rejected++;
        r = ref() >> 32n;
      }
      const v = g.below(m);
      expect(v).toBe(Number(r % BigInt(m)));
      expect(v).toBeLessThan(m);
    }
    // Expected rejections: 2000 · (1/4)/(3/4) ≈ 667 (sd ≈ 30).
    expect(rejected).toBeGreaterThan(550);
    expect(rejected).toBeLessThan(800);
  });

  it('is roughly uniform: 60000 draws on 0…5 give each value 10000 ± 400 times (about 4.4 sd)', () => {
    const g = SplitMix64.fromSeed(2024);
    const counts = new Array(6).fill(0);
    for (let k = 0; k < 60000; k++) counts[g.below(6)]++;
    for (const c of counts) expect(Math.abs(c - 10000)).toBeLessThan(400);
  });
});

describe('normalDeviates (Box–Muller on SplitMix64 uniforms)', () => {
  // Moments and tail fractions of the standard normal: E z = 0, E z² = 1, P(z < 1.959964) = 0.975,
  // P(|z| < 1) = 0.682689 (Abramowitz & Stegun 1964, table 26.1). With 200,000 draws the sampling
  // sd of each estimate is at most 0.0033 (variance: sqrt(2/n)), so 5 sd bounds are used.
  it('200,000 deviates have mean 0, variance 1 and the normal tail fractions, within 5 sampling sd', () => {
    const z = normalDeviates(SplitMix64.fromSeed(2026));
    const n = 200_000;
    let s = 0;
    let ss = 0;
    let below = 0;
    let inner = 0;
    for (let i = 0; i < n; i++) {
      const v = z();
      s += v;
      ss += v * v;
      if (v < 1.959964) below++;
      if (Math.abs(v) < 1) inner++;
    }
    expect(Math.abs(s / n)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(ss / n - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    expect(Math.abs(below / n - 0.975)).toBeLessThan(5 * Math.sqrt((0.975 * 0.025) / n));
    expect(Math.abs(inner / n - 0.682689)).toBeLessThan(5 * Math.sqrt((0.682689 * 0.317311) / n));
  });

  it('is reproducible: the same seed gives the same deviates, and draws two per pair of uniforms', () => {
    const a = normalDeviates(SplitMix64.fromSeed(5));
    const b = normalDeviates(SplitMix64.fromSeed(5));
    const rng = SplitMix64.fromSeed(5);
    const c = normalDeviates(rng);
    const first = [a(), a(), a(), a()];
    expect([b(), b(), b(), b()]).toEqual(first);
    c();
    c();
    // Two deviates used two uniforms: the generator has advanced exactly twice.
    const probe = SplitMix64.fromSeed(5);
    probe.next();
    probe.next();
    probe.next();
    rng.next();
    expect([rng.hi, rng.lo]).toEqual([probe.hi, probe.lo]);
  });
});

describe('seeds', () => {
  it('accept whole numbers 0 … 2^53 − 1 and map them to the 64-bit state exactly', () => {
    expect(checkSeed(0)).toBe(0);
    expect(checkSeed(Number.MAX_SAFE_INTEGER)).toBe(Number.MAX_SAFE_INTEGER);
    const g = SplitMix64.fromSeed(Number.MAX_SAFE_INTEGER);
    expect(g.nextBigInt()).toBe(bigSplitMix(2n ** 53n - 1n)());
  });

  it('reject negative, fractional, unsafe and non-numbers with BAD_OPTION naming the seed', () => {
    for (const bad of [-1, 1.5, 2 ** 53, NaN, Infinity, '3' as unknown as number]) {
      expect(() => checkSeed(bad)).toThrow(RatchetError);
      expect(() => SplitMix64.fromSeed(bad)).toThrow(/^seed: needs a whole number from 0 to 9007199254740991; got /);
    }
    try {
      checkSeed(-1);
    } catch (e) {
      expect((e as RatchetError).code).toBe('BAD_OPTION');
      expect((e as RatchetError).message).toBe('seed: needs a whole number from 0 to 9007199254740991; got -1.');
    }
  });
});
