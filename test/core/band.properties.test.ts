/**
 * Properties of the bands and read-back intervals (fast-check, fixed seed), their errors, and a
 * Monte Carlo coverage study (seeded SplitMix64 from src/core/prng.ts).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bandAt, fitBandModel, invertAt, knotRegression, normalDeviates, RatchetError, SplitMix64 } from '../../src/core/index.js';
import { checkDirection } from '../../src/core/direction-check.js';
import { inverseBand } from '../../src/core/band.js';
import { studentTQuantile } from '../../src/core/student-t.js';
import { type Direction } from '../../src/core/types.js';

fc.configureGlobal({ seed: Number(process.env.FC_SEED ?? 20261201), numRuns: Number(process.env.FC_RUNS ?? 200) });

interface Data {
  x: number[];
  y: number[];
  w: number[] | undefined;
  knots: number;
  direction: Direction;
}

const data: fc.Arbitrary<Data> = fc
  .record({
    n: fc.integer({ min: 6, max: 40 }),
    knots: fc.integer({ min: 2, max: 5 }),
    weighted: fc.boolean(),
    direction: fc.constantFrom<Direction>('up', 'down'),
    slope: fc.double({ min: -3, max: 3, noNaN: true }),
  })
  .chain(({ n, knots, weighted, direction, slope }) =>
    fc.record({
      x: fc.array(fc.integer({ min: 0, max: 200 }).map((v) => v / 20), { minLength: n, maxLength: n }),
      noise: fc.array(fc.integer({ min: -100, max: 100 }).map((v) => v / 50), { minLength: n, maxLength: n }),
      w: fc.array(fc.integer({ min: 1, max: 30 }).map((v) => v / 10), { minLength: n, maxLength: n }),
    }).map(({ x, noise, w }) => ({
      x,
      y: x.map((v, i) => slope * v + noise[i]!),
      w: weighted ? w : undefined,
      knots,
      direction,
    })),
  );

/** The band model, or null when the data cannot carry one (too few rows or distinct x); other errors fail the test. */
function modelOf(d: Data) {
  try {
    return fitBandModel(d.x, d.y, { knots: d.knots, weights: d.w, direction: d.direction });
  } catch (e) {
    if (e instanceof RatchetError && e.code === 'TOO_FEW_POINTS') return null;
    throw e;
  }
}

const grid = (lo: number, hi: number, k: number) => Array.from({ length: k }, (_, i) => lo - 0.5 + ((hi - lo + 1) * i) / (k - 1));

describe('band properties', () => {
  it('the band contains the fit, prediction ⊇ confidence, and both widen with the level', () => {
    fc.assert(
      fc.property(data, (d) => {
        const m = modelOf(d);
        fc.pre(m !== null);
        const xs = grid(Math.min(...d.x), Math.max(...d.x), 15);
        let previous: { c: number[]; p: number[] } | null = null;
        for (const level of [0.5, 0.8, 0.95, 0.999]) {
          const c = bandAt(m!, xs, level, 'confidence');
          const p = bandAt(m!, xs, level, 'prediction');
          const cw: number[] = [];
          const pw: number[] = [];
          for (let i = 0; i < xs.length; i++) {
            expect(c.lower[i]!).toBeLessThanOrEqual(c.fit[i]!);
            expect(c.fit[i]!).toBeLessThanOrEqual(c.upper[i]!);
            expect(p.lower[i]!).toBeLessThanOrEqual(c.lower[i]!);
            expect(p.upper[i]!).toBeGreaterThanOrEqual(c.upper[i]!);
            expect(p.fit[i]).toBe(c.fit[i]);
            cw.push(c.upper[i]! - c.fit[i]!);
            pw.push(p.upper[i]! - p.fit[i]!);
            if (previous) {
              expect(cw[i]!).toBeGreaterThanOrEqual(previous.c[i]!);
              expect(pw[i]!).toBeGreaterThan(previous.p[i]!);
            }
          }
          previous = { c: cw, p: pw };
        }
      }),
    );
  });

  it('the fit inside the band is the knot fit itself (same curve as knotRegression)', () => {
    fc.assert(
      fc.property(data, (d) => {
        const m = modelOf(d);
        fc.pre(m !== null);
        const fit = knotRegression(d.x, d.y, { knots: d.knots, weights: d.w, direction: d.direction });
        expect(Array.from(m!.knotY)).toEqual(Array.from(fit.knotY));
      }),
    );
  });

  it("read-back intervals: the middle is invertAt's x, lower ≤ x ≤ upper, and each limit lies on a prediction-band edge at the target", () => {
    fc.assert(
      fc.property(data, fc.double({ min: 0.05, max: 0.95, noNaN: true }), (d, share) => {
        const m = modelOf(d);
        fc.pre(m !== null);
        const lo = Math.min(m!.knotY[0]!, m!.knotY[m!.knotY.length - 1]!);
        const hi = Math.max(m!.knotY[0]!, m!.knotY[m!.knotY.length - 1]!);
        fc.pre(hi > lo);
        const target = lo + share * (hi - lo);
        const [r] = inverseBand(m!, [target], 0.9, 1);
        expect(r!.x).toBe(invertAt(m!.knotX, m!.knotY, target));
        const x0 = r!.x as number;
        const scale = Math.abs(hi) + Math.abs(lo) + m!.sigma;
        const rising = m!.direction === 'up';
        for (const [limit, side] of [[r!.lower, -1], [r!.upper, 1]] as const) {
          if (limit instanceof RatchetError) {
            expect(limit.code).toBe('NOT_REACHABLE');
            expect(limit.message).toMatch(side < 0 ? /the lower x limit lies below/ : /the upper x limit lies above/);
            continue;
          }
          expect(side < 0 ? limit <= x0 : limit >= x0).toBe(true);
          const band = bandAt(m!, [limit], 0.9, 'prediction');
          // Rising: left limit on the upper edge, right limit on the lower edge; falling: mirrored.
          const edge = (side < 0) === rising ? band.upper[0]! : band.lower[0]!;
          expect(Math.abs(edge - target)).toBeLessThanOrEqual(1e-9 * scale);
        }
      }),
    );
  });

  it('more replicates give a read-back interval inside the one for fewer replicates', () => {
    fc.assert(
      fc.property(data, fc.double({ min: 0.1, max: 0.9, noNaN: true }), (d, share) => {
        const m = modelOf(d);
        fc.pre(m !== null);
        const a = m!.knotY[0]!;
        const b = m!.knotY[m!.knotY.length - 1]!;
        fc.pre(a !== b);
        const target = a + share * (b - a);
        const [one] = inverseBand(m!, [target], 0.95, 1);
        const [many] = inverseBand(m!, [target], 0.95, 4);
        if (typeof one!.lower === 'number') expect(many!.lower as number).toBeGreaterThanOrEqual(one!.lower - 1e-12 * Math.abs(one!.lower));
        if (typeof one!.upper === 'number') expect(many!.upper as number).toBeLessThanOrEqual(one!.upper + 1e-12 * Math.abs(one!.upper));
      }),
    );
  });

  it("negating y and the direction negates the band (lower ↔ upper) and leaves the read-back x's unchanged", () => {
    fc.assert(
      fc.property(data, (d) => {
        const m = modelOf(d);
        fc.pre(m !== null);
        const flipped = fitBandModel(d.x, d.y.map((v) => -v), { knots: d.knots, weights: d.w, direction: d.direction === 'up' ? 'down' : 'up' });
        const xs = grid(Math.min(...d.x), Math.max(...d.x), 7);
        const b = bandAt(m!, xs, 0.9, 'prediction');
        const f = bandAt(flipped, xs, 0.9, 'prediction');
        const tol = 1e-9 * (Math.max(...d.y.map(Math.abs)) + m!.sigma + 1);
        for (let i = 0; i < xs.length; i++) {
          expect(Math.abs(f.upper[i]! + b.lower[i]!)).toBeLessThanOrEqual(tol);
          expect(Math.abs(f.lower[i]! + b.upper[i]!)).toBeLessThanOrEqual(tol);
        }
      }),
    );
  });

  it('inputs are not modified (frozen arrays go through fitBandModel, bandAt and inverseBand)', () => {
    const x = Object.freeze([1, 2, 3, 4, 5, 6]);
    const y = Object.freeze([1, 3, 2, 5, 4, 6]);
    const m = fitBandModel(x, y, { knots: 3, weights: Object.freeze([1, 1, 2, 2, 1, 1]) });
    expect(() => bandAt(m, Object.freeze([2.5]), 0.9)).not.toThrow();
    expect(() => inverseBand(m, Object.freeze([3.5]), 0.9, 2)).not.toThrow();
  });
});

describe('band errors', () => {
  const x = [1, 2, 3, 4, 5];
  const y = [1, 2, 2, 4, 5];
  it("knots 0 or absent (the classic fit) is refused with BAD_KNOTS 'BAND needs the knot model …'", () => {
    for (const knots of [0, undefined]) {
      expect(() => fitBandModel(x, y, { knots })).toThrow(/^knots: BAND needs the knot model \(a knot count ≥ 2 or knot positions\); the classic fit \(knots 0\) has no valid pointwise band/);
    }
  });
  it('n_used ≤ p is TOO_FEW_POINTS naming the counts', () => {
    expect(() => fitBandModel([1, 2, 3], [1, 2, 3], { knots: 3 })).toThrow('known_ys: needs more rows with positive weight (3) than fitted parameters (3) to estimate the scatter.');
    expect(() => fitBandModel([1, 2, 3, 4], [1, 2, 3, 4], { knots: 2, weights: [1, 0, 0, 1] })).toThrow('known_ys: needs more rows with positive weight (2) than fitted parameters (2) to estimate the scatter.');
  });
  it('level outside (0, 1), a bad kind, a new x that is not finite, replicates < 1', () => {
    const m = fitBandModel(x, y, { knots: 2 });
    for (const level of [0, 1, -0.5, 1.5, NaN]) expect(() => bandAt(m, [2], level)).toThrow(`level: needs a number strictly between 0 and 1; got ${level}.`);
    expect(() => bandAt(m, [2], 0.9, 'tolerance' as 'confidence')).toThrow("kind: needs 'confidence' or 'prediction'; got tolerance.");
    expect(() => bandAt(m, [NaN], 0.9)).toThrow(/^new_xs: /);
    for (const r of [0, 0.5, NaN, Infinity]) expect(() => inverseBand(m, [3], 0.9, r)).toThrow(`replicates: needs a number ≥ 1; got ${r}.`);
  });
  it('a target outside the curve gives NOT_REACHABLE in all three places, as invertAt does', () => {
    const m = fitBandModel(x, y, { knots: 2 });
    const [r] = inverseBand(m, [100]);
    for (const v of [r!.lower, r!.x, r!.upper]) {
      expect(v).toBeInstanceOf(RatchetError);
      expect((v as RatchetError).code).toBe('NOT_REACHABLE');
    }
    expect(() => invertAt(m.knotX, m.knotY, 100)).toThrow((r!.x as RatchetError).message.replace(/^target_ys: /, 'target: '));
    expect((r!.x as RatchetError).message).toMatch(/^target_ys: 100 is outside the curve's range \[/);
  });
});

describe('Monte Carlo coverage (2,000 seeded data sets, strictly increasing smooth truth, fixed knots)', () => {
  // Truth f(x) = 2x + sin(2πx)/(2π), f'(x) = 2 + cos(2πx) ≥ 1, on 40 evenly spaced x in [0, 1];
  // Gaussian noise sd 0.15; 5 even knots. The band's target is the best knot curve for f at these
  // x (the weighted least-squares projection, which is monotone, so the constraint is inactive at
  // the truth): knotRegression of the noiseless values.
  const n = 40;
  const x = Array.from({ length: n }, (_, i) => i / (n - 1));
  const truth = x.map((v) => 2 * v + Math.sin(2 * Math.PI * v) / (2 * Math.PI));
  const target = knotRegression(x, truth, { knots: 5 });
  const at = [0.3, 0.5, 0.7];
  it('the noiseless fit used as the target is strictly increasing (no active constraint at the truth)', () => {
    for (let j = 1; j < 5; j++) expect(target.knotY[j]!).toBeGreaterThan(target.knotY[j - 1]!);
  });
  it('95 % confidence and prediction bands cover within 1.5 points of 95 % at x = 0.3, 0.5, 0.7', () => {
    const normal = normalDeviates(SplitMix64.fromSeed(20261201));
    const sims = 2000;
    const coveredConf = [0, 0, 0];
    const coveredPred = [0, 0, 0];
    const proj = at.map((v) => {
      // The projection's value at v, by interpolating its knot values.
      const t = target.knotX;
      let j = 0;
      while (j < t.length - 2 && v > t[j + 1]!) j++;
      const u = (v - t[j]!) / (t[j + 1]! - t[j]!);
      return target.knotY[j]! * (1 - u) + target.knotY[j + 1]! * u;
    });
    for (let s = 0; s < sims; s++) {
      const y = truth.map((t) => t + 0.15 * normal());
      const m = fitBandModel(x, y, { knots: 5 });
      const c = bandAt(m, at, 0.95, 'confidence');
      const p = bandAt(m, at, 0.95, 'prediction');
      for (let k = 0; k < at.length; k++) {
        if (c.lower[k]! <= proj[k]! && proj[k]! <= c.upper[k]!) coveredConf[k]!++;
        const fresh = proj[k]! + 0.15 * normal();
        if (p.lower[k]! <= fresh && fresh <= p.upper[k]!) coveredPred[k]!++;
      }
    }
    for (let k = 0; k < at.length; k++) {
      expect(Math.abs((100 * coveredConf[k]!) / sims - 95)).toBeLessThanOrEqual(1.5);
      expect(Math.abs((100 * coveredPred[k]!) / sims - 95)).toBeLessThanOrEqual(1.5);
    }
  });
  it('the t quantile of a band is studentTQuantile((1 + level)/2, n_used − p): 35 df for 40 rows and 5 groups', () => {
    const m = fitBandModel(x, truth, { knots: 5 });
    expect(m.dfResid).toBe(35);
    expect(bandAt(m, [0.5], 0.95).t).toBe(studentTQuantile(0.975, 35));
  });
});

describe('direction check on pure noise (seeded SplitMix64)', () => {
  it('warns on at most 6 % of 2,000 data sets of 20 rows without association (the rule targets a 5 % one-sided test)', () => {
    const normal = normalDeviates(SplitMix64.fromSeed(77));
    const x = Array.from({ length: 20 }, (_, i) => i);
    let warnings = 0;
    for (let s = 0; s < 2000; s++) {
      const y = x.map(() => normal());
      if (checkDirection(x, y, 'up') !== null) warnings++;
    }
    expect(warnings / 2000).toBeLessThanOrEqual(0.06);
    expect(warnings).toBeGreaterThan(0); // the rule can fire on noise: it is a test, not a filter
  });
});
