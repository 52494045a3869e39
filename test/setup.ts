/**
 * Test setup: registers the tolerance matchers used by every reference check.
 *
 * `toBeCloseRel(expected, rel, abs?)` passes when |a − e| ≤ max(rel·|e|, abs) (abs defaults to
 * rel, so values near zero are compared absolutely at the same level — pass abs = 0 where expected
 * values are tiny). An infinite expected value matches only the same infinity; NaN matches nothing.
 * `toBeAllCloseRel(expected, rel, abs?)` applies the same test entrywise to two arrays of equal
 * length and reports the worst entry.
 */
import { expect } from 'vitest';
import fc from 'fast-check';

// Property tests are reproducible: one fixed seed for every file that does not set its own
// (FC_SEED explores other seeds locally).
fc.configureGlobal({ seed: Number(process.env.FC_SEED ?? 20261201) });

function within(a: number, e: number, rel: number, abs: number): boolean {
  if (Number.isNaN(a) || Number.isNaN(e)) return false;
  // An infinite expected value is matched only by the same infinity (rel·∞ would accept anything).
  if (!Number.isFinite(e) || !Number.isFinite(a)) return a === e;
  return Math.abs(a - e) <= Math.max(rel * Math.abs(e), abs);
}

expect.extend({
  toBeCloseRel(received: number, expected: number, rel: number, abs?: number) {
    const ok = typeof received === 'number' && within(received, expected, rel, abs ?? rel);
    return {
      pass: ok,
      message: () => `expected ${received} ${ok ? 'not ' : ''}to be within rel ${rel} of ${expected}`,
    };
  },
  toBeAllCloseRel(received: ArrayLike<number>, expected: ArrayLike<number>, rel: number, abs?: number) {
    if (received.length !== expected.length) {
      return { pass: false, message: () => `length ${received.length} differs from expected ${expected.length}` };
    }
    let worst = -1;
    let worstErr = 0;
    for (let i = 0; i < expected.length; i++) {
      const a = received[i]!;
      const e = expected[i]!;
      const err = Math.abs(a - e) / Math.max(Math.abs(e), (abs ?? rel) / rel);
      if (!within(a, e, rel, abs ?? rel) && (worst < 0 || err > worstErr || Number.isNaN(a))) {
        worst = i;
        worstErr = err;
      }
    }
    const ok = worst < 0;
    return {
      pass: ok,
      message: () =>
        ok
          ? `expected arrays not to be within rel ${rel}`
          : `entry ${worst}: ${received[worst]} vs expected ${expected[worst]} (rel ${rel})`,
    };
  },
});

interface ToleranceMatchers<R = unknown> {
  toBeCloseRel(expected: number, rel: number, abs?: number): R;
  toBeAllCloseRel(expected: ArrayLike<number>, rel: number, abs?: number): R;
}

declare module 'vitest' {
  // eslint-disable-next-line @typescript-eslint/no-explicit-any, @typescript-eslint/no-empty-object-type
  interface Matchers<T = any> extends ToleranceMatchers<T> {}
}
