/**
 * Fuzz: 10,000 argument grids per entry point (fitBandModel + bandAt, fitBandModel + inverseBand, and the smooth fit through fitShapedBandModel + both)
 * with awkward values — NaN, ±Infinity, huge and tiny numbers, zero and negative weights, too few
 * rows, unsorted knot positions, levels and replicates out of range. Whatever comes in, the core
 * either throws a RatchetError or returns finite, ordered numbers (never a silent NaN).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bandAt, fitBandModel, fitShapedBandModel, RatchetError } from '../../src/core/index.js';
import { inverseBand } from '../../src/core/band.js';

const plain = fc.integer({ min: -50, max: 50 }).map((v) => v / 4);
const awkward = fc.oneof(
  { weight: 200, arbitrary: plain },
  { weight: 1, arbitrary: fc.constantFrom(NaN, Infinity, -Infinity, 1e300, -1e300, 1e-300, 0, -0, 5e-324) },
  { weight: 2, arbitrary: fc.double({ noNaN: false }) },
);
/** Mostly valid, sometimes awkward: the valid path must be reached often, not only the checks. */
const mostly = <T>(good: fc.Arbitrary<T>, bad: fc.Arbitrary<T>) => fc.oneof({ weight: 9, arbitrary: good }, { weight: 1, arbitrary: bad });
const knots = mostly<number | undefined | number[]>(
  fc.constantFrom(2, 3, 4, 6),
  fc.oneof(fc.constantFrom(0, undefined, 1, 2.5, -1, NaN), fc.array(awkward, { minLength: 0, maxLength: 5 })),
);
const args = fc.record({
  n: mostly(fc.integer({ min: 6, max: 12 }), fc.integer({ min: 0, max: 5 })),
  x: fc.array(awkward, { minLength: 12, maxLength: 12 }),
  y: fc.array(awkward, { minLength: 12, maxLength: 12 }),
  w: fc.option(fc.array(mostly(fc.integer({ min: 0, max: 8 }).map((v) => v / 2), awkward), { minLength: 12, maxLength: 12 })),
  knots,
  direction: mostly(fc.constantFrom<string>('up', 'down', 'auto'), fc.constant('sideways')),
  level: mostly(fc.constantFrom(0.95, 0.5, 0.999999, 1e-9), fc.oneof(fc.constantFrom(0, 1, NaN), fc.double({ noNaN: false }))),
  kind: mostly(fc.constantFrom('confidence', 'prediction'), fc.constant('other')),
  points: fc.array(awkward, { minLength: 0, maxLength: 4 }),
  targets: fc.array(plain, { minLength: 0, maxLength: 4 }),
  replicates: mostly(fc.constantFrom(1, 3, 2.5), fc.oneof(fc.constantFrom(0.5, 0, Infinity, NaN), fc.double({ noNaN: false }))),
});

/** Runs `f`; passes when it returns or throws a RatchetError, rethrows anything else. */
function onlyRatchetErrors(f: () => void): void {
  try {
    f();
  } catch (e) {
    if (!(e instanceof RatchetError)) throw e;
  }
}

let reached = 0;
describe('band fuzz (fixed seed)', () => {
  it('10,000 grids through fitBandModel + bandAt: a RatchetError or finite lower ≤ fit ≤ upper', () => {
    fc.assert(
      fc.property(args, (a) => {
        onlyRatchetErrors(() => {
          const m = fitBandModel(a.x.slice(0, a.n), a.y.slice(0, a.n), {
            knots: a.knots,
            weights: a.w === null ? undefined : a.w.slice(0, a.n),
            direction: a.direction as 'up',
          });
          const b = bandAt(m, a.points, a.level, a.kind as 'confidence');
          reached++;
          for (let i = 0; i < a.points.length; i++) {
            expect(Number.isFinite(b.lower[i]!) && Number.isFinite(b.upper[i]!)).toBe(true);
            expect(b.lower[i]! <= b.fit[i]! && b.fit[i]! <= b.upper[i]!).toBe(true);
          }
        });
      }),
      { numRuns: 10000, seed: 1402 },
    );
    expect(reached).toBeGreaterThan(2000); // the valid path was exercised, not only the checks
  });
  it('10,000 grids through fitBandModel + inverseBand: a RatchetError or finite lower ≤ x ≤ upper (error values allowed per place)', () => {
    fc.assert(
      fc.property(args, (a) => {
        onlyRatchetErrors(() => {
          const m = fitBandModel(a.x.slice(0, a.n), a.y.slice(0, a.n), {
            knots: a.knots,
            weights: a.w === null ? undefined : a.w.slice(0, a.n),
            direction: a.direction as 'up',
          });
          for (const r of inverseBand(m, a.targets, a.level, a.replicates)) {
            for (const v of [r.lower, r.x, r.upper]) {
              if (v instanceof RatchetError) expect(v.code).toBe('NOT_REACHABLE');
              else expect(Number.isFinite(v)).toBe(true);
            }
            if (typeof r.x === 'number') {
              if (typeof r.lower === 'number') expect(r.lower).toBeLessThanOrEqual(r.x);
              if (typeof r.upper === 'number') expect(r.upper).toBeGreaterThanOrEqual(r.x);
            }
          }
        });
      }),
      { numRuns: 10000, seed: 1403 },
    );
  });
  it('10,000 grids through the smooth fit (degree 2, any curvature) + bandAt and inverseBand: a RatchetError or finite, ordered values', () => {
    let smoothReached = 0;
    fc.assert(
      fc.property(args, mostly(fc.constantFrom<unknown>(-1, 0, 1), fc.constantFrom<unknown>(2, 0.5, NaN, 'x')), (a, curvature) => {
        onlyRatchetErrors(() => {
          const m = fitShapedBandModel(a.x.slice(0, a.n), a.y.slice(0, a.n), {
            knots: a.knots,
            weights: a.w === null ? undefined : a.w.slice(0, a.n),
            direction: a.direction as 'up',
            curvature: curvature as 0,
            degree: 2,
          });
          const b = bandAt(m, a.points, a.level, a.kind as 'confidence');
          smoothReached++;
          for (let i = 0; i < a.points.length; i++) {
            expect(Number.isFinite(b.lower[i]!) && Number.isFinite(b.upper[i]!)).toBe(true);
            expect(b.lower[i]! <= b.fit[i]! && b.fit[i]! <= b.upper[i]!).toBe(true);
          }
          for (const r of inverseBand(m, a.targets, a.level, a.replicates)) {
            for (const v of [r.lower, r.x, r.upper]) {
              if (v instanceof RatchetError) expect(v.code).toBe('NOT_REACHABLE');
              else expect(Number.isFinite(v)).toBe(true);
            }
            if (typeof r.x === 'number') {
              if (typeof r.lower === 'number') expect(r.lower).toBeLessThanOrEqual(r.x);
              if (typeof r.upper === 'number') expect(r.upper).toBeGreaterThanOrEqual(r.x);
            }
          }
        });
      }),
      { numRuns: 10000, seed: 1404 },
    );
    expect(smoothReached).toBeGreaterThan(1500); // the smooth band was computed, not only refused
  });
});
