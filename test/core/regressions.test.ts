/**
 * Regression tests, each named after what it guards. Every case is a counterexample that the
 * property or fuzz tests (properties.test.ts, bad-input.test.ts) found in the core as first
 * written; each failed before its fix and passes after it.
 */
import { describe, expect, it } from 'vitest';
import { fitMonotone, invertAt, knotRegression, predict, RatchetError } from '../../src/core/index.js';
import { isotonicRegression } from '../../src/core/isotonic.js';
import { lerp } from '../../src/core/interpolate.js';
import { bvlsRefs, hatRow, inputCase, rRefs } from './fixtures.js';


describe('monotone-qp: the active-set tolerance is in the units of the multipliers (w·y), not of H', () => {
  it('a knot fit of y measured in units of 1e-20 is the knot fit of the same y in units of 1, scaled', () => {
    // Before: the tolerance mixed |c| with the diagonal of H, so every multiplier of 1e-20-sized
    // data looked like zero and the method stopped at the single pooled level 4.85e-20.
    const x = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
    const y = [1, 3, 2, 4, 3.5, 6, 5, 7, 9, 8];
    const unit = knotRegression(x, y, { knots: 5 });
    for (const s of [1e-20, 1e-100, 1e100]) {
      const scaled = knotRegression(x, y.map((v) => v * s), { knots: 5 });
      expect(Array.from(scaled.knotY, (v) => v / s)).toBeAllCloseRel(unit.knotY, 1e-14);
      expect(scaled.levels).toBe(unit.levels);
    }
  });
});

describe('monotone-qp: the ratio test blocks a constraint the candidate breaks even when the ratio rounds to 1', () => {
  it('an upper bound of −5e-324 is respected (before: the candidate was taken, knot value 0 > upper)', () => {
    const x = Array<number>(36).fill(0);
    x[28] = 8;
    const y = Array<number>(36).fill(0);
    y[34] = -3.859885676914946e-10;
    const fit = knotRegression(x, y, { knots: 2, upper: -5e-324 });
    for (const v of fit.knotY) expect(v).toBeLessThanOrEqual(-5e-324);
  });
});

describe('monotone-qp: a bound whose multiplier is negative only by rounding is not dropped again and again', () => {
  // Found by properties.test.ts with FC_SEED=710320652 (shrunk). Before: the solver dropped the upper
  // bound (multiplier −6e-26 from the refinement of a neighbouring group whose value cancels to 0),
  // the next step re-added it without moving (the free step would cross it by 1e-32), and so on
  // until the iteration cap: NUMERICAL "the active-set method did not converge".
  const x = [0, 0, 0, 0, 0, 0, 3, 0, 2, 0, 4, 5, 0, 0];
  it.each([-4.455308626551164e-111, -1, -1e-300])('ten knots, upper bound 0, y = %s at x = 3 and 0 elsewhere', (low) => {
    const y = x.map((v) => (v === 3 ? low : 0));
    const fit = knotRegression(x, y, { knots: 10, direction: 'up', upper: 0 });
    // By hand (pool-adjacent-violators on the levels x = 0 (ten rows), 2, 3, 4, 5 with values 0, 0,
    // low, 0, 0): x = 0, 2, 3 pool to low / 12; x = 4 and 5 stay at 0 = the upper bound. Ten evenly
    // spaced knots on [0, 5] reproduce that step (x = 3 and x = 4 lie in different knot intervals).
    const expected = x.map((v) => (v <= 3 ? low / 12 : 0));
    expect(fit.fitted).toBeAllCloseRel(expected, 1e-12);
    for (const v of fit.knotY) expect(v).toBeLessThanOrEqual(0);
    const down = knotRegression(x, y.map((v) => -v), { knots: 10, direction: 'down', lower: 0 });
    expect(Array.from(down.fitted, (v) => -v + 0)).toBeAllCloseRel(expected, 1e-12);
  });
});

describe('interpolation: a point between two values never lands outside them', () => {
  it('lerp from 9.45e-125 to −5.25e-141 at a share just below 1 stays ≥ the far end (before: −1.05e-140)', () => {
    const v = lerp(9.454560432753859e-125, -5.248340709036788e-141, 1 - 2 ** -53);
    expect(v).toBeGreaterThanOrEqual(-5.248340709036788e-141);
    expect(v).toBeLessThanOrEqual(9.454560432753859e-125);
  });

  it('a zero-weight row between levels of very different size keeps the classic down-fit monotone', () => {
    const x = [0, -3.5601181736115222e-307, -3.5601181736115222e-307, 0, 0, -1.7800590868057615e-307, 0, 0, 0, 0, 0, 0, 0, -5e-324, 0];
    const y = [0, 0, 0, 0, 0, 2.5116211210715754e-123, 0, 0, 0, 0, 0, 0, 0, 0, -5.279830753291009e-141];
    const w = [0, 0.2073720060270275, 0.04827980707794286, 0, 0.01, 0.010000000000000002, 0, 0.01, 0.01, 0.01, 0.01, 0.01, 0, 0, 9.999999999999927];
    const fit = isotonicRegression(x, y, { weights: w, direction: 'down' });
    for (let j = 1; j < fit.value.length; j++) expect(fit.value[j]!).toBeLessThanOrEqual(fit.value[j - 1]!);
  });

  it('lerp of ends of opposite sign near ±1.8e308 does not overflow', () => {
    expect(lerp(-1.7e308, 1.7e308, 0.5)).toBe(0);
    expect(Number.isFinite(lerp(-1.7e308, 1.7e308, 0.25))).toBe(true);
  });
});

describe('knot model: flat ends are exactly the end knot values', () => {
  it('a row beyond the last explicit knot gets the last knot value bit for bit (before: v0 + 1·(v1 − v0), off by an ulp)', () => {
    const x = [...Array<number>(25).fill(0), -49.99999999999994, 0, 0, 0, 3.180957430999441e-213, 49.99936134390116, 0, 0];
    const y = Array<number>(33).fill(0);
    y[10] = -5.513678686124572e-10;
    y[17] = 2.0510425954777166e-13;
    const lo = Math.min(...x);
    const hi = Math.max(...x);
    const knots = [lo + (hi - lo) * 0.25, lo + (hi - lo) * 0.5, lo + (hi - lo) * 0.75];
    const fit = knotRegression(x, y, { knots });
    expect(fit.fitted[30]! === fit.knotY[2]!).toBe(true);
    expect(fit.fitted[25]! === fit.knotY[0]!).toBe(true);
  });
});

describe('knot model: a row exactly on an evenly spaced knot identifies that knot only', () => {
  it('x on knot 3 of 6 does not make the empty knot 4 look identified (before: share 1e-16 from the scaled position)', () => {
    const fit = knotRegression([0, 0.001, 0.0006000000000000001], [0, 0, 0], { knots: 6 });
    expect(fit.knotX[3]).toBe(0.0006000000000000001);
    expect(Array.from(fit.identified)).toEqual([1, 0, 0, 1, 0, 1]);
  });
});

describe('knot model: jointly determined knots (the tie-break case) meet the optimality conditions exactly', () => {
  it('Puromycin with 8 knots (R datasets): KKT to 1e-12 and the bvls fit (SciPy 1.10.1, core_bvls.json) to 1e-10', () => {
    // Before: the roughness tie-break alone left a bias of about 1e-10 relative in the fit and in the
    // partial sums of g = BᵀW(y − fit); proximal refinement passes now remove it.
    const c = inputCase('Puromycin');
    const ref = rRefs.knots.find((k) => k.id === 'Puromycin_K8_empty')!;
    expect(ref.quadprog).toMatch(/singular/); // the reduced normal matrix is singular: the hard case
    const fit = knotRegression(c.x, c.y, { knots: 8 });
    const g = new Float64Array(8);
    let scale = 0;
    c.x.forEach((xv, i) => {
      const [j, a, b] = hatRow(fit.knotX, xv);
      const r = c.y[i]! - (a * fit.knotY[j]! + b * fit.knotY[j + 1]!);
      g[j] = g[j]! + a * r;
      g[j + 1] = g[j + 1]! + b * r;
      scale += Math.abs(c.y[i]!) + Math.abs(r);
    });
    let S = 0;
    for (let k = 0; k < 8; k++) {
      S += g[k]!;
      expect(S).toBeGreaterThanOrEqual(-1e-12 * scale);
      if (k + 1 < 8 && fit.knotY[k + 1]! > fit.knotY[k]!) expect(Math.abs(S)).toBeLessThanOrEqual(1e-12 * scale);
    }
    expect(Math.abs(S)).toBeLessThanOrEqual(1e-12 * scale);
    const bv = bvlsRefs.knots.find((k) => k.id === 'Puromycin_K8_empty')!;
    expect(fit.fitted).toBeAllCloseRel(bv.fitted!, 1e-10);
  });
});

describe('knots: an x range too narrow for K distinct even positions is a typed error', () => {
  it('40 knots on [1e9, 1e9 + 2e-7] throw BAD_KNOTS (before: NUMERICAL "the pooled normal equation is not positive")', () => {
    expect(() => knotRegression([1e9, 1e9 + 1e-7, 1e9 + 2e-7], [0, 1, 2], { knots: 40 })).toThrow(RatchetError);
    try {
      knotRegression([1e9, 1e9 + 1e-7, 1e9 + 2e-7], [0, 1, 2], { knots: 40 });
    } catch (e) {
      expect((e as RatchetError).code).toBe('BAD_KNOTS');
    }
  });

  it('7 knots on [1, 1 + 2^-52] throw BAD_KNOTS (before: repeated knot positions came back silently)', () => {
    expect(() => knotRegression([1, 1 + 2 ** -52, 1], [0, 1, 2], { knots: 7 })).toThrow(/too narrow/);
  });
});

describe('statistics: no underflow or overflow in the sums', () => {
  it('R² of data in units of 1e-170 equals R² of the same data in units of 1 (before: squares underflowed, R² = 1)', () => {
    const x = [1, 2, 3, 4, 5];
    const y = [1, 3, 2, 5, 4];
    const unit = fitMonotone(x, y).stats;
    const tiny = fitMonotone(x, y.map((v) => v * 1e-170)).stats;
    expect(tiny.r2).toBeCloseRel(unit.r2, 1e-14);
    expect(tiny.rmse).toBeCloseRel(unit.rmse * 1e-170, 1e-14, 0);
  });

  it('an awful bounded fit of near-constant y reports a finite R² (before: −Infinity)', () => {
    const m = fitMonotone([0, 0, 0, 0, 0, 0, -5e-324], [0, 0, 0, 0, 0, 0, -1.3790966407790326e-162], {
      weights: [0.01, 3.2988234671186385, 2.3128860969380707, 0, 0, 0, 3.194215971659322],
      upper: -1.0037282597472427e-8,
    });
    expect(Number.isFinite(m.stats.r2)).toBe(true);
  });
});

describe('classic fit: pruning collinear points of the knot table never drops a point off the line', () => {
  it('cross-multiplied slopes that underflow to 0 do not count as collinear (before: predict(1e-170) gave 5e-171)', () => {
    const model = fitMonotone([0, 1e-170, 3e-170], [0, 1e-170, 1.5e-170]);
    expect(predict(model, [1e-170])[0]).toBeCloseRel(1e-170, 1e-15, 0);
  });
});

describe('values near the largest double fit without overflow', () => {
  it('classic fit of y near 1e308 (before: Infinity fitted values from the pooled sums)', () => {
    const m = fitMonotone([0, -1e308, 0, 0, -0, 0, 5e-324], [0, 1e308, 1e308, -0, 0, 1, 0]);
    expect(m.fitted).toBeAllCloseRel(Array(7).fill((1e308 / 7) * 2 + 1 / 7), 1e-15);
  });

  it('knot fit with weights of 1e308 equals the unit-weight fit (before: NaN)', () => {
    const unit = fitMonotone([1, 2, 3], [1, 3, 2], { knots: 3 });
    const heavy = fitMonotone([1, 2, 3], [1, 3, 2], { knots: 3, weights: [1e308, 1e308, 1e308] });
    expect(heavy.fitted).toBeAllCloseRel(unit.fitted, 1e-15);
  });

  it('knot fit of x spanning ±1e308 (before: BAD_KNOTS "too narrow" from an overflowed range)', () => {
    const m = fitMonotone([-1e308, 0, 1e308], [1, 3, 2], { knots: 3 });
    expect(Array.from(m.knotX)).toEqual([-1e308, 0, 1e308]);
    expect(m.fitted).toBeAllCloseRel([1, 2.5, 2.5], 1e-15);
  });

  it('inverse read-back on a table of huge span stays inside the table (before: 2.95e20 outside [−2.5e36, 5e-324])', () => {
    const xr = invertAt([-2.5006410319663482e36, 5e-324], [2.470585619291917e268, 0], 5e-324, 'lowest');
    expect(xr).toBeGreaterThanOrEqual(-2.5006410319663482e36);
    expect(xr).toBeLessThanOrEqual(5e-324);
  });
});
