/**
 * Properties of the smooth fit's (degree 2) band and read-back interval, on seeded random data
 * (fast-check, the project's fixed seed).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bandAt, fitShapedBandModel, inverseBand } from '../../src/core/index.js';

const dataArb = fc
  .record({
    n: fc.integer({ min: 12, max: 40 }),
    K: fc.integer({ min: 2, max: 5 }),
    curvature: fc.constantFrom(-1 as const, 0 as const, 1 as const),
    seed: fc.integer({ min: 1, max: 1e6 }),
  })
  .map(({ n, K, curvature, seed }) => {
    let s = seed;
    const rnd = (): number => ((s = (s * 16807) % 2147483647) / 2147483647);
    const x = Array.from({ length: n }, (_, i) => i + rnd() * 0.5);
    const y = x.map((v) => 2 * Math.sqrt(v + 1) + (rnd() - 0.5) * 1.5);
    return { x, y, K, curvature };
  });

describe('smooth band (degree 2) properties', () => {
  it('contains the fit, widens with the level, and the prediction band contains the confidence band', () => {
    fc.assert(
      fc.property(dataArb, ({ x, y, K, curvature }) => {
        const model = fitShapedBandModel(x, y, { knots: K, degree: 2, curvature });
        const at = [x[0]! - 1, ...x, x[x.length - 1]! + 1];
        const c90 = bandAt(model, at, 0.9, 'confidence');
        const c99 = bandAt(model, at, 0.99, 'confidence');
        const p90 = bandAt(model, at, 0.9, 'prediction');
        at.forEach((_, i) => {
          expect(c90.lower[i]!).toBeLessThanOrEqual(c90.fit[i]!);
          expect(c90.upper[i]!).toBeGreaterThanOrEqual(c90.fit[i]!);
          expect(c99.upper[i]! - c99.lower[i]!).toBeGreaterThan(c90.upper[i]! - c90.lower[i]!);
          expect(p90.lower[i]!).toBeLessThan(c90.lower[i]!);
          expect(p90.upper[i]!).toBeGreaterThan(c90.upper[i]!);
        });
        // Beyond the end knots: the band of the end value.
        const ends = bandAt(model, [x[0]!, x[x.length - 1]!], 0.9, 'confidence');
        expect(c90.upper[0]).toBe(ends.upper[0]);
        expect(c90.upper[at.length - 1]).toBe(ends.upper[1]);
      }),
      { numRuns: 60 },
    );
  });

  it('INVERTBAND limits map back onto the prediction band edges for the mean of the readings', () => {
    let checked = 0;
    fc.assert(
      fc.property(dataArb, fc.double({ min: 0.2, max: 0.8, noNaN: true }), ({ x, y, K, curvature }, share) => {
        const model = fitShapedBandModel(x, y, { knots: K, degree: 2, curvature });
        const lo = model.knotY[0]!;
        const hi = model.knotY[model.knotY.length - 1]!;
        const target = lo + share * (hi - lo);
        const m = 3;
        const [r] = inverseBand(model, [target], 0.8, m);
        const t = bandAt(model, [0], 0.8).t;
        for (const [side, sign] of [['lower', 1], ['upper', -1]] as const) {
          const v = r![side];
          if (typeof v !== 'number') continue;
          checked++;
          const c = bandAt(model, [v], 0.8, 'confidence');
          const seMean = Math.sqrt(((c.upper[0]! - c.fit[0]!) / t) ** 2 + model.sigma ** 2 / m);
          // lower limit: upper edge (f + t·se) meets the target; upper limit: lower edge.
          expect(c.fit[0]! + sign * t * seMean).toBeCloseRel(target, 1e-9, 1e-9 * (Math.abs(target) + model.sigma));
        }
        if (typeof r!.lower === 'number') expect(r!.lower).toBeLessThanOrEqual(r!.x as number);
        if (typeof r!.upper === 'number') expect(r!.upper).toBeGreaterThanOrEqual(r!.x as number);
      }),
      { numRuns: 60 },
    );
    expect(checked).toBeGreaterThan(40); // most limits lie inside the data: the check is not vacuous
  });

  it('does not modify its inputs', () => {
    const x = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
    const y = [1, 2.2, 2.9, 4.4, 4.6, 6.1, 6.3, 8.2, 8.8, 10.1];
    const w = [1, 2, 1, 2, 1, 2, 1, 2, 1, 2];
    const [xc, yc, wc] = [[...x], [...y], [...w]];
    const model = fitShapedBandModel(x, y, { knots: 3, degree: 2, weights: w });
    const at = [2.5, 7];
    bandAt(model, at);
    inverseBand(model, [5]);
    expect([x, y, w, at]).toEqual([xc, yc, wc, [2.5, 7]]);
  });

  it('with K = 2 on data exactly on a rising line, degree 2 and degree 1 give the same curve and the same (zero-width) band', () => {
    // Checked: degree 2 with K = 2 is a quadratic with 3 parameters, degree 1 a line with 2, so on
    // noisy data their bands differ (σ̂ and the degrees of freedom differ); they coincide only where
    // both fits reproduce the data exactly, as here.
    const x = [0, 1, 2, 3, 4, 5];
    const y = x.map((v) => 1 + 2 * v);
    const smooth = bandAt(fitShapedBandModel(x, y, { knots: 2, degree: 2 }), [0.5, 2.5, 4.75]);
    const linear = bandAt(fitShapedBandModel(x, y, { knots: 2, degree: 1 }), [0.5, 2.5, 4.75]);
    expect(smooth.fit).toBeAllCloseRel(linear.fit, 1e-12);
    expect(smooth.lower).toBeAllCloseRel(linear.lower, 1e-9, 1e-9);
    expect(smooth.upper).toBeAllCloseRel(linear.upper, 1e-9, 1e-9);
    const noisy = [1.1, 2.9, 5.2, 6.8, 9.1, 11];
    const s2 = fitShapedBandModel(x, noisy, { knots: 2, degree: 2 });
    const s1 = fitShapedBandModel(x, noisy, { knots: 2, degree: 1 });
    expect([s2.parameters, s1.parameters]).toEqual([3, 2]);
  });
});
