/**
 * Scale invariance and heavy rows for the shaped knot fits (concave, convex, smooth, smooth
 * concave, smooth convex), as properties (fast-check, fixed seed; FC_SEED explores further) — the
 * shaped counterpart of test/core/scale.properties.test.ts. 1,100 generated cases in all, 0
 * failures allowed:
 * - multiplying y by 10^k and all weights by 10^j (inside the documented magnitudes 1e-300 …
 *   1e100) gives the fitted values × 10^k and the same R², to 1e-9 relative;
 * - one row 10^3 … 10^15 times heavier than the rest gives either a fit whose KKT certificate
 *   holds with relative tolerances (checked from the residuals with a B-spline basis evaluated
 *   here by the Cox–de Boor recursion, independent of the solver's own), or the typed NUMERICAL
 *   error whose message does not say "internal" — never a fit that violates the conditions;
 * - a heavy row 10^12 … 10^14 and the same row ten times heavier give fits that agree to 1e-8 of
 *   the data scale where neither is refused (the optimum moves by O(1/weight); a wrong active set
 *   would jump).
 * The optimality (KKT) conditions of min ½θᵀHθ − cᵀθ subject to Aθ ≥ b are the standard ones
 * (Nocedal & Wright 2006, Numerical Optimization, Theorem 12.1): Aθ ≥ b, λ ≥ 0, λ = 0 off the
 * active rows, and Bᵀ W (y − f) + Aᵀλ = 0.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fitMonotone, isRatchetError } from '../../src/core/index.js';

const SEED = Number(process.env.FC_SEED ?? 20261201);

/** Small data sets: x integers 0…12 (ties allowed), y integers −30…30 with a fraction, weights 0.5…2. */
const dataArb = fc
  .integer({ min: 5, max: 18 })
  .chain((n) =>
    fc.record({
      x: fc.array(fc.integer({ min: 0, max: 12 }), { minLength: n, maxLength: n }),
      y: fc.array(fc.integer({ min: -30, max: 30 }).map((v) => v + 0.25), { minLength: n, maxLength: n }),
      w: fc.array(fc.integer({ min: 1, max: 4 }).map((v) => v / 2), { minLength: n, maxLength: n }),
    }),
  )
  .filter((d) => new Set(d.x).size >= 3 && new Set(d.y).size >= 2);

const shapeArb = fc.constantFrom(
  { curvature: -1 as const, degree: 1 as const },
  { curvature: 1 as const, degree: 1 as const },
  { curvature: 0 as const, degree: 2 as const },
  { curvature: -1 as const, degree: 2 as const },
  { curvature: 1 as const, degree: 2 as const },
);

function maxAbs(v: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < v.length; i++) m = Math.max(m, Math.abs(v[i]!));
  return m;
}

/**
 * Values of the m = K + degree − 1 basis functions at x (clamped to the end knots) on the clamped
 * knot sequence t₀ (degree + 1 times), t₁, …, t_{K−1} (degree + 1 times): Cox–de Boor recursion,
 * written here independently of the solver (de Boor 2001, A Practical Guide to Splines, ch. IX).
 */
function basisRow(t: ArrayLike<number>, degree: number, x: number): number[] {
  const K = t.length;
  const tau: number[] = [];
  for (let i = 0; i < degree; i++) tau.push(t[0]!);
  for (let i = 0; i < K; i++) tau.push(t[i]!);
  for (let i = 0; i < degree; i++) tau.push(t[K - 1]!);
  const xc = Math.min(Math.max(x, t[0]!), t[K - 1]!);
  let b = new Array<number>(tau.length - 1).fill(0);
  let last = 0;
  for (let i = 0; i + 1 < tau.length; i++) if (tau[i]! < tau[i + 1]!) last = i;
  for (let i = 0; i + 1 < tau.length; i++) {
    if ((tau[i]! <= xc && xc < tau[i + 1]!) || (i === last && xc === tau[i + 1]!)) b[i] = 1;
  }
  for (let d = 1; d <= degree; d++) {
    const next: number[] = [];
    for (let i = 0; i + 1 < b.length; i++) {
      let v = 0;
      if (tau[i + d] !== tau[i]) v += ((xc - tau[i]!) / (tau[i + d]! - tau[i]!)) * b[i]!;
      if (tau[i + d + 1] !== tau[i + 1]) v += ((tau[i + d + 1]! - xc) / (tau[i + d + 1]! - tau[i + 1]!)) * b[i + 1]!;
      next.push(v);
    }
    b = next;
  }
  return b;
}

interface ShapeResult {
  knots: Float64Array;
  degree: number;
  coefficients: Float64Array;
  constraints: readonly { cols: Int32Array; coefs: Float64Array; rhs: number }[];
  active: Int32Array;
  multipliers: Float64Array;
}

/**
 * Worst violation of the KKT conditions in units of its tolerance (≤ 1: satisfied). Stationarity
 * row j, gⱼ + Σₖ aₖⱼλₖ with g = BᵀW(y − f), is compared with 1e-9 × the sum of the magnitudes of
 * its terms (Σᵢ wᵢ|Bᵢⱼ|(|yᵢ| + |fᵢ|) + Σₖ|aₖⱼλₖ|) plus 1e-20 × the largest such sum; feasibility aₖ·θ ≥ bₖ and complementarity with
 * 1e-9 × Σ|aₖⱼθⱼ| (+ |bₖ|); multipliers must be ≥ 0.
 */
function kktViolation(x: number[], y: number[], w: number[], f: ArrayLike<number>, s: ShapeResult): number {
  const m = s.coefficients.length;
  const g = new Array<number>(m).fill(0);
  const a = new Array<number>(m).fill(0);
  for (let i = 0; i < x.length; i++) {
    const row = basisRow(s.knots, s.degree, x[i]!);
    for (let j = 0; j < m; j++) {
      g[j] = g[j]! + w[i]! * row[j]! * (y[i]! - f[i]!);
      a[j] = a[j]! + w[i]! * Math.abs(row[j]!) * (Math.abs(y[i]!) + Math.abs(f[i]!));
    }
  }
  let worst = 0;
  s.constraints.forEach((r, k) => {
    const lam = s.multipliers[k]!;
    if (lam < 0) worst = Infinity;
    let dot = -r.rhs;
    let size = Math.abs(r.rhs);
    for (let q = 0; q < r.cols.length; q++) {
      const j = r.cols[q]!;
      g[j] = g[j]! + r.coefs[q]! * lam;
      a[j] = a[j]! + Math.abs(r.coefs[q]! * lam);
      dot += r.coefs[q]! * s.coefficients[j]!;
      size += Math.abs(r.coefs[q]! * s.coefficients[j]!);
    }
    const tol = 1e-9 * size + 1e-300;
    worst = Math.max(worst, -dot / tol); // feasibility
    if (lam > 0) worst = Math.max(worst, Math.abs(dot) / tol); // complementarity
  });
  // A coefficient that no row reaches has only multiplier terms in its row; multipliers that are 0
  // in exact arithmetic come out as about 1e-24 there, hence the floor 1e-20 × the largest row.
  const floor = 1e-20 * Math.max(...a);
  for (let j = 0; j < m; j++) worst = Math.max(worst, Math.abs(g[j]!) / (1e-9 * a[j]! + floor + 1e-300));
  return worst;
}

const yPower = fc.integer({ min: -295, max: 98 });
const wPower = fc.integer({ min: -299, max: 99 });

describe('shaped fits: y × 10^k and weights × 10^j (fixed seed)', () => {
  it('concave, convex, smooth, smooth concave and smooth convex fits (K = 2…5): fitted values × 10^k to 1e-9 of the largest, R² equal to 1e-9 — 500 cases', () => {
    fc.assert(
      fc.property(dataArb, shapeArb, fc.constantFrom(2, 3, 4, 5), yPower, wPower, (d, shape, knots, k, j) => {
        const sy = 10 ** k;
        const sw = 10 ** j;
        const base = fitMonotone(d.x, d.y, { knots, weights: d.w, direction: 'up', ...shape });
        const m = fitMonotone(d.x, d.y.map((v) => v * sy), { knots, weights: d.w.map((v) => v * sw), direction: 'up', ...shape });
        const tol = 1e-9 * maxAbs(base.fitted);
        for (let i = 0; i < d.x.length; i++) expect(Math.abs(m.fitted[i]! / sy - base.fitted[i]!)).toBeLessThanOrEqual(tol);
        expect(Math.abs(m.stats.r2 - base.stats.r2)).toBeLessThanOrEqual(1e-9);
      }),
      { seed: SEED, numRuns: 500 },
    );
  });
});

describe('shaped fits: one row 10^3 … 10^15 times heavier (fixed seed)', () => {
  it('the KKT certificate holds with relative tolerances, or the fit is refused with NUMERICAL (no "internal" message) — 400 cases', () => {
    let fitted = 0;
    let refused = 0;
    fc.assert(
      fc.property(dataArb, shapeArb, fc.constantFrom(2, 3, 4, 5), fc.nat(), fc.integer({ min: 3, max: 15 }), (d, shape, knots, pick, h) => {
        const heavy = pick % d.x.length;
        const w = d.w.map((v, i) => (i === heavy ? v * 10 ** h : v));
        let m;
        try {
          m = fitMonotone(d.x, d.y, { knots, weights: w, direction: 'up', ...shape });
        } catch (e) {
          expect(isRatchetError(e, 'NUMERICAL')).toBe(true);
          expect((e as Error).message).not.toMatch(/internal/);
          refused++;
          return;
        }
        fitted++;
        expect(kktViolation(d.x, d.y, w, m.fitted, m.shape as ShapeResult)).toBeLessThanOrEqual(1);
      }),
      { seed: SEED, numRuns: 400 },
    );
    // Refusals (knots that no row reaches, with weights far apart) are the exception.
    expect(fitted).toBeGreaterThan(3 * refused);
  });

  it('a heavy row 10^12 … 10^14 and the same row ten times heavier: fitted values agree to 1e-8 of max |y| where both are fitted — 200 cases', () => {
    fc.assert(
      fc.property(dataArb, shapeArb, fc.constantFrom(2, 3, 4, 5), fc.nat(), fc.integer({ min: 12, max: 14 }), (d, shape, knots, pick, h) => {
        const heavy = pick % d.x.length;
        const fit = (e: number) => {
          try {
            return fitMonotone(d.x, d.y, { knots, weights: d.w.map((v, i) => (i === heavy ? v * 10 ** e : v)), direction: 'up', ...shape }).fitted;
          } catch (err) {
            if (!isRatchetError(err, 'NUMERICAL')) throw err;
            return null;
          }
        };
        const a = fit(h);
        const b = fit(h + 1);
        // Either may be refused (NUMERICAL: the light rows' share of a soft direction fell below
        // the rounding of the heavy one); two fits must agree.
        if (a === null || b === null) return;
        const tol = 1e-8 * maxAbs(d.y);
        for (let i = 0; i < a.length; i++) expect(Math.abs(a[i]! - b[i]!)).toBeLessThanOrEqual(tol);
      }),
      { seed: SEED, numRuns: 200 },
    );
  });
});
