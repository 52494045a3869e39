/**
 * Scale invariance and heavy rows, as properties (fast-check, fixed seed; FC_SEED explores
 * further). Over 1,000 generated cases in all, across the classic fit, the knot fit, the surface
 * fit, cross-validation of both, with 0 failures allowed:
 * - multiplying y by 10^k and all weights by 10^j (kept inside the documented magnitudes 1e-300 …
 *   1e100) gives the fitted values × 10^k and the same statistics (R² unchanged, RMSE and MAE
 *   × 10^k), to 1e-9 relative;
 * - one row up to 1e15 times heavier than the rest gives a fit that satisfies the optimality
 *   (KKT) conditions with relative tolerances, or — for the knot model with the heavy row strictly
 *   between two knots — the NUMERICAL error; never a fit that violates them.
 * The optimality conditions are the standard ones for these least-squares problems (Robertson,
 * Wright & Dykstra 1988, Order Restricted Statistical Inference, §1.3, for the classic fit; the
 * partial-sum conditions of the knot model are derived in DEVELOPERS.md, "How the solvers work"),
 * checked here from the residuals with an independent hat-function row (test/core/fixtures.ts).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { crossValidate, crossValidateSurface, fitMonotone, fitSurface, isRatchetError, kFoldAssignment } from '../../src/core/index.js';
import { hatRow } from './fixtures.js';

const SEED = Number(process.env.FC_SEED ?? 20261201);

/** Small data sets: x integers 0…12 (ties allowed), y integers −30…30 with a fraction, weights 0.5…2. */
const dataArb = fc
  .integer({ min: 4, max: 18 })
  .chain((n) =>
    fc.record({
      x: fc.array(fc.integer({ min: 0, max: 12 }), { minLength: n, maxLength: n }),
      y: fc.array(fc.integer({ min: -30, max: 30 }).map((v) => v + 0.25), { minLength: n, maxLength: n }),
      w: fc.array(fc.integer({ min: 1, max: 4 }).map((v) => v / 2), { minLength: n, maxLength: n }),
    }),
  )
  // Two distinct x, and y not constant: for constant y, R² is a convention (1 for an exact fit, 0
  // otherwise) that an ulp of rounding flips, whatever the scale; it is not what this file checks.
  .filter((d) => new Set(d.x).size >= 2 && new Set(d.y).size >= 2);

/** Largest |v|. */
function maxAbs(v: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < v.length; i++) m = Math.max(m, Math.abs(v[i]!));
  return m;
}

/** |a_i/s − e_i| ≤ 1e-9 · max|e| for every i (relative to the largest value, so zeros compare fairly). */
function sameUpToScale(a: ArrayLike<number>, e: ArrayLike<number>, s: number): boolean {
  const tol = 1e-9 * maxAbs(e);
  for (let i = 0; i < e.length; i++) if (!(Math.abs(a[i]! / s - e[i]!) <= tol)) return false;
  return true;
}

function close(a: number, e: number, rel: number): boolean {
  return Math.abs(a - e) <= rel * Math.max(Math.abs(e), 1e-300);
}

/** Powers of ten for y and for the weights, inside the documented magnitudes (|y| ≤ 31, w ≤ 2). */
const yPower = fc.integer({ min: -295, max: 98 });
const wPower = fc.integer({ min: -299, max: 99 });

describe('scale invariance: y × 10^k and weights × 10^j (fixed seed)', () => {
  it('classic and knot fits (K = 0, 2…6): fitted values × 10^k to 1e-9 of the largest, R² equal to 1e-9, RMSE and MAE × 10^k to 1e-9 — 500 cases', () => {
    fc.assert(
      fc.property(dataArb, fc.constantFrom(0, 2, 3, 4, 5, 6), yPower, wPower, (d, knots, k, j) => {
        const sy = 10 ** k;
        const sw = 10 ** j;
        const base = fitMonotone(d.x, d.y, { knots, weights: d.w });
        const m = fitMonotone(d.x, d.y.map((v) => v * sy), { knots, weights: d.w.map((v) => v * sw) });
        expect(sameUpToScale(m.fitted, base.fitted, sy)).toBe(true);
        expect(Math.abs(m.stats.r2 - base.stats.r2)).toBeLessThanOrEqual(1e-9);
        expect(close(m.stats.rmse / sy, base.stats.rmse, 1e-9) || base.stats.rmse < 1e-9 * maxAbs(base.fitted)).toBe(true);
        expect(close(m.stats.mae / sy, base.stats.mae, 1e-9) || base.stats.mae < 1e-9 * maxAbs(base.fitted)).toBe(true);
      }),
      { seed: SEED, numRuns: 500 },
    );
  });

  it('surface fits (2…3 knots per axis): fitted values × 10^k to 1e-9 of the largest, R² equal to 1e-9 — 150 cases', () => {
    fc.assert(
      fc.property(
        dataArb.chain((d) =>
          fc.record({ d: fc.constant(d), x2: fc.array(fc.integer({ min: 0, max: 5 }), { minLength: d.x.length, maxLength: d.x.length }) }),
        ).filter(({ x2 }) => new Set(x2).size >= 2),
        fc.constantFrom(2, 3),
        fc.constantFrom(2, 3),
        yPower,
        wPower,
        ({ d, x2 }, k1, k2, k, j) => {
          const sy = 10 ** k;
          const sw = 10 ** j;
          const opts = { knots1: k1, knots2: k2 };
          const base = fitSurface(d.x, x2, d.y, { ...opts, weights: d.w });
          const m = fitSurface(d.x, x2, d.y.map((v) => v * sy), { ...opts, weights: d.w.map((v) => v * sw) });
          expect(sameUpToScale(m.fitted, base.fitted, sy)).toBe(true);
          expect(Math.abs(m.stats.r2 - base.stats.r2)).toBeLessThanOrEqual(1e-9);
        },
      ),
      { seed: SEED, numRuns: 150 },
    );
  });

  it('cross-validation scores (candidates 0, 2, 3; 3 folds): cvRmse and cvMae × 10^k, cvR2 equal, to 1e-9 — 150 cases', () => {
    fc.assert(
      fc.property(dataArb.filter((d) => d.x.length >= 9 && new Set(d.x).size >= 5), yPower, wPower, (d, k, j) => {
        const sy = 10 ** k;
        const sw = 10 ** j;
        const opts = { candidates: [0, 2, 3], folds: 3, seed: 7 };
        let base;
        try {
          base = crossValidate(d.x, d.y, { ...opts, weights: d.w });
        } catch (e) {
          // A fold whose training rows hold one distinct x: then the scaled problem must say the same.
          expect(isRatchetError(e, 'TOO_FEW_POINTS')).toBe(true);
          expect(() => crossValidate(d.x, d.y.map((v) => v * sy), { ...opts, weights: d.w.map((v) => v * sw) })).toThrow(/training/);
          return;
        }
        const cv = crossValidate(d.x, d.y.map((v) => v * sy), { ...opts, weights: d.w.map((v) => v * sw) });
        const scale = maxAbs(d.y);
        cv.scores.forEach((s, i) => {
          const b = base.scores[i]!;
          expect(Math.abs(s.cvRmse / sy - b.cvRmse)).toBeLessThanOrEqual(1e-9 * Math.max(b.cvRmse, 1e-6 * scale));
          expect(Math.abs(s.cvMae / sy - b.cvMae)).toBeLessThanOrEqual(1e-9 * Math.max(b.cvMae, 1e-6 * scale));
          expect(Math.abs(s.cvR2 - b.cvR2)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(b.cvR2)));
        });
      }),
      { seed: SEED, numRuns: 150 },
    );
  });

  it('surface cross-validation scores (2 × 2 and 2 × 3 knots; 3 folds): cvRmse × 10^k, cvR2 equal, to 1e-9 — 30 cases', () => {
    fc.assert(
      fc.property(yPower, wPower, fc.integer({ min: 1, max: 1000 }), (k, j, s) => {
        const sy = 10 ** k;
        const sw = 10 ** j;
        // Seeded data on a 4 × 3 grid with noise, so that every training set has 2 distinct values per axis.
        const x1: number[] = [];
        const x2: number[] = [];
        const y: number[] = [];
        const w: number[] = [];
        for (let i = 0; i < 24; i++) {
          x1.push(i % 4);
          x2.push(Math.floor(i / 4) % 3);
          y.push((i % 4) + 2 * (Math.floor(i / 4) % 3) + (((i * 7919 + s) % 13) - 6) / 4);
          w.push(1 + ((i * s) % 3) / 2);
        }
        // Pairs whose lattice every training set determines: with 3 × 3 knots some folds leave nodes
        // to the tie-break, whose values are reproducible only to about 1e-6 under any rounding
        // change (docs/tolerances.md, "Scale and weights"), scaled or not. The 2 × 3 lattice is
        // determined when the training rows of every fold hold all three x2 levels (its knots sit on
        // them) with at least 2 distinct x1 at each level; some shuffles leave one row at a level
        // (FC_SEED=710320652 found seed 329: one training row at x2 = 0, whose two nodes the data
        // fix only jointly), and the property does not claim anything for those.
        const label = kFoldAssignment(24, 3, s, 0);
        for (let f = 0; f < 3; f++) {
          for (let level = 0; level < 3; level++) {
            const at = new Set(x1.filter((_, i) => label[i] !== f && x2[i] === level));
            fc.pre(at.size >= 2);
          }
        }
        const opts = { candidates1: [2], candidates2: [2, 3], folds: 3, seed: s };
        const base = crossValidateSurface(x1, x2, y, { ...opts, weights: w });
        const cv = crossValidateSurface(x1, x2, y.map((v) => v * sy), { ...opts, weights: w.map((v) => v * sw) });
        cv.scores.forEach((sc, i) => {
          const b = base.scores[i]!;
          expect(close(sc.cvRmse / sy, b.cvRmse, 1e-9)).toBe(true);
          expect(Math.abs(sc.cvR2 - b.cvR2)).toBeLessThanOrEqual(1e-9);
        });
      }),
      { seed: SEED, numRuns: 30 },
    );
  });
});

/**
 * Worst violation of the classic fit's optimality conditions, relative: with rows in x order and
 * r = y − f, the partial sums λ over distinct x of Σ w r are ≥ 0 and are 0 where f rises, and the
 * total is 0. Each λ is compared with 1e-9 × Σ w (|y| + |f|) over the smaller side of its cut (the
 * other side gives the same λ with the opposite sign), so a heavy row's rounding cannot hide or
 * fake a light row's violation.
 */
function classicViolation(x: number[], y: number[], w: number[], f: ArrayLike<number>): number {
  const order = x.map((_, i) => i).sort((a, b) => x[a]! - x[b]!);
  const xs = [...new Set(order.map((i) => x[i]!))];
  const g = xs.map(() => 0);
  const a = xs.map(() => 0);
  const fv = xs.map(() => 0);
  for (const i of order) {
    const k = xs.indexOf(x[i]!);
    g[k] = g[k]! + w[i]! * (y[i]! - f[i]!);
    a[k] = a[k]! + w[i]! * (Math.abs(y[i]!) + Math.abs(f[i]!));
    fv[k] = f[i]!;
  }
  return cutViolation(g, a, (k) => fv[k + 1]! > fv[k]!); // ≤ 1 means satisfied
}

/** The same for the knot model, with g = BᵀW r over the knots (hat rows from test/core/fixtures.ts). */
function knotViolation(x: number[], y: number[], w: number[], f: ArrayLike<number>, t: ArrayLike<number>, theta: ArrayLike<number>): number {
  const K = t.length;
  const g = new Array<number>(K).fill(0);
  const a = new Array<number>(K).fill(0);
  for (let i = 0; i < x.length; i++) {
    const [j, v, u] = hatRow(t, x[i]!);
    const r = w[i]! * (y[i]! - f[i]!);
    const m = w[i]! * (Math.abs(y[i]!) + Math.abs(f[i]!));
    g[j] = g[j]! + v * r;
    g[j + 1] = g[j + 1]! + u * r;
    a[j] = a[j]! + v * m;
    a[j + 1] = a[j + 1]! + u * m;
  }
  return cutViolation(g, a, (k) => theta[k + 1]! > theta[k]!);
}

/**
 * The partial-sum conditions on g with magnitudes a: for each cut k, λ_k = Σ_{i≤k} gᵢ (equal to
 * −Σ_{i>k} gᵢ, since the total is 0) is ≥ 0, and 0 where the fit rises across the cut; the total
 * is 0. λ_k is taken from the side with the smaller Σ a and compared with 1e-9 × that Σ a, so a
 * heavy row's rounding on the other side neither hides nor fakes a light row's violation. Returns
 * the worst violation in units of its tolerance (≤ 1: satisfied).
 */
function cutViolation(g: number[], a: number[], rises: (k: number) => boolean): number {
  const K = g.length;
  const total = a.reduce((s, v) => s + v, 0);
  const suffix = new Array<number>(K + 1).fill(0);
  const suffixA = new Array<number>(K + 1).fill(0);
  for (let k = K - 1; k >= 0; k--) {
    suffix[k] = suffix[k + 1]! + g[k]!;
    suffixA[k] = suffixA[k + 1]! + a[k]!;
  }
  let worst = Math.abs(suffix[0]!) / (1e-9 * total + 1e-300);
  let prefix = 0;
  let prefixA = 0;
  for (let k = 0; k + 1 < K; k++) {
    prefix += g[k]!;
    prefixA += a[k]!;
    const fromLeft = prefixA <= suffixA[k + 1]!;
    const lam = fromLeft ? prefix : -suffix[k + 1]!;
    const tol = 1e-9 * (fromLeft ? prefixA : suffixA[k + 1]!) + 1e-300;
    worst = Math.max(worst, rises(k) ? Math.abs(lam) / tol : -lam / tol);
  }
  return worst;
}

describe('heavy rows: one row 10^3 … 10^15 times heavier (fixed seed)', () => {
  it('classic and knot fits satisfy the optimality conditions with relative tolerances, or the knot fit refuses with NUMERICAL (never a wrong fit) — 400 cases', () => {
    let fitted = 0;
    let refused = 0;
    fc.assert(
      fc.property(dataArb, fc.constantFrom(0, 2, 3, 4, 5), fc.nat(), fc.integer({ min: 3, max: 15 }), (d, knots, pick, h) => {
        const heavy = pick % d.x.length;
        const w = d.w.map((v, i) => (i === heavy ? v * 10 ** h : v));
        let m;
        try {
          m = fitMonotone(d.x, d.y, { knots, weights: w });
        } catch (e) {
          expect(knots).toBeGreaterThan(0);
          expect(isRatchetError(e, 'NUMERICAL')).toBe(true);
          refused++;
          return;
        }
        fitted++;
        const worst = knots === 0 ? classicViolation(d.x, d.y, w, m.fitted) : knotViolation(d.x, d.y, w, m.fitted, m.knotX, m.knotY);
        expect(worst).toBeLessThanOrEqual(1);
      }),
      { seed: SEED, numRuns: 400 },
    );
    // The refusals are the documented exception, not the rule.
    expect(fitted).toBeGreaterThan(3 * refused);
  });
});
