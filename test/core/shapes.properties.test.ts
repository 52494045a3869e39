/**
 * Properties of the shaped knot fits (concave, convex, smooth) as specifications (fast-check,
 * fixed seed; FC_SEED / FC_RUNS explore further).
 *
 * The KKT certificate checked here, for min ½θᵀHθ − cᵀθ s.t. aᵢ·θ ≥ bᵢ with H = BᵀWB and c = BᵀWy
 * assembled in this file from the basis values: stationarity Hθ − c = Σ λᵢaᵢ, primal feasibility
 * aᵢ·θ ≥ bᵢ, dual feasibility λᵢ ≥ 0, complementarity λᵢ(aᵢ·θ − bᵢ) = 0 — each to a relative
 * tolerance in the units of its terms (Nocedal & Wright 2006, Numerical Optimization, Thm 12.1).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { dataSets, real, type Data } from './arbitraries.js';
import { crossValidate, fitMonotone, predict, type Curvature, type Degree, type MonotoneModel } from '../../src/core/index.js';
import { evaluateTable, invertTable } from '../../src/core/smooth-table.js';
import { nullSpaceBasis, rowDot } from '../../src/core/shape-qp.js';
import { quadraticBasisAt } from '../../src/core/shape-fit.js';
import { type Direction } from '../../src/core/types.js';

fc.configureGlobal({ seed: Number(process.env.FC_SEED ?? 20261201), numRuns: Number(process.env.FC_RUNS ?? 200) });

const dataArb: fc.Arbitrary<Data> = dataSets(3, 10)
  .filter((d) => {
    const xs = d.x.filter((_, i) => d.w === undefined || d.w[i]! > 0);
    const lo = Math.min(...xs);
    const hi = Math.max(...xs);
    return hi - lo > 1e-6 * Math.max(1, Math.abs(lo), Math.abs(hi));
  });

const shapeArb = fc.record({
  curvature: fc.constantFrom<Curvature>(-1, 0, 1),
  degree: fc.constantFrom<Degree>(1, 2),
  direction: fc.constantFrom<Direction>('up', 'down'),
  knots: fc.integer({ min: 2, max: 9 }),
}).filter((s) => s.curvature !== 0 || s.degree === 2);

const boundsArb = fc.option(fc.tuple(real(-1e3, 1e3), fc.double({ min: 0.1, max: 1e3, noNaN: true })), { nil: undefined });

type Shape = { curvature: Curvature; degree: Degree; direction: Direction; knots: number };

function fit(d: Data, s: Shape, bounds?: [number, number]): MonotoneModel {
  return fitMonotone(d.x, d.y, {
    weights: d.w,
    knots: s.knots,
    curvature: s.curvature,
    degree: s.degree,
    direction: s.direction,
    lower: bounds?.[0],
    upper: bounds === undefined ? undefined : bounds[0] + bounds[1],
  });
}

const maxAbs = (v: ArrayLike<number>) => Array.from(v).reduce((a, b) => Math.max(a, Math.abs(b)), 0);

/** Checks the KKT certificate of a shaped model (see the file comment); returns nothing, throws on failure. */
function checkKkt(d: Data, model: MonotoneModel): void {
  const sh = model.shape!;
  const t = sh.knots;
  const theta = sh.coefficients;
  const m = theta.length;
  const Htheta = new Float64Array(m);
  const c = new Float64Array(m);
  const out = new Float64Array(3);
  let scale = 0;
  d.x.forEach((xi, i) => {
    const w = d.w?.[i] ?? 1;
    const first = quadraticBasisAt(t, sh.degree, xi, out);
    let f = 0;
    for (let a = 0; a <= sh.degree; a++) f += out[a]! * theta[first + a]!;
    for (let a = 0; a <= sh.degree; a++) {
      Htheta[first + a] = Htheta[first + a]! + w * out[a]! * f;
      c[first + a] = c[first + a]! + w * out[a]! * d.y[i]!;
      scale = Math.max(scale, Math.abs(w * out[a]! * f), Math.abs(w * out[a]! * d.y[i]!));
    }
  });
  const grad = Array.from(Htheta, (v, j) => v - c[j]!);
  sh.constraints.forEach((row, r) => {
    const lam = sh.multipliers[r]!;
    expect(lam).toBeGreaterThanOrEqual(0); // dual feasibility
    for (let q = 0; q < row.cols.length; q++) grad[row.cols[q]!] = grad[row.cols[q]!]! - lam * row.coefs[q]!;
    const slack = rowDot(row, theta) - row.rhs;
    const unit = Math.max(maxAbs(theta), Math.abs(row.rhs), maxAbs(d.y), 1e-300);
    expect(slack).toBeGreaterThanOrEqual(-1e-12 * unit); // primal feasibility
    expect(Math.abs(lam * slack)).toBeLessThanOrEqual(1e-9 * Math.max(scale, 1e-300) * unit); // complementarity
  });
  // Stationarity: the tie-break for coefficients the data leave free adds a term of relative size
  // ~1e-8 at most (see shapeRegression), hence the tolerance.
  for (const g of grad) expect(Math.abs(g)).toBeLessThanOrEqual(1e-7 * Math.max(scale, 1e-300) * 4 * m);
}

/** The curve on a fine grid over the knots (the table read as the model says). */
function grid(model: MonotoneModel, points = 400): { x: number[]; f: Float64Array } {
  const lo = model.knotX[0]!;
  const hi = model.knotX[model.knotX.length - 1]!;
  const x = Array.from({ length: points + 1 }, (_, i) => lo + ((hi - lo) * i) / points);
  return { x, f: predict(model, x) };
}

describe('shaped fits: the result satisfies the shape', () => {
  it('the curve is monotone in the direction used, and concave/convex when asked (checked on a 400-point grid to 1e-9 of the scale of the data)', () => {
    fc.assert(
      fc.property(dataArb, shapeArb, boundsArb, (d, s, b) => {
        const model = fit(d, s, b);
        const { f } = grid(model);
        // Rounding is in the units of the data (the curve may be tiny next to y).
        const range = Math.max(maxAbs(f), maxAbs(d.y), 1e-300);
        const sgn = s.direction === 'up' ? 1 : -1;
        for (let i = 1; i < f.length; i++) expect(sgn * (f[i]! - f[i - 1]!)).toBeGreaterThanOrEqual(-1e-12 * range);
        if (s.curvature !== 0) {
          // Second differences on an even grid: ≤ 0 for concave, ≥ 0 for convex.
          for (let i = 1; i + 1 < f.length; i++) {
            expect(s.curvature * (f[i + 1]! - 2 * f[i]! + f[i - 1]!)).toBeGreaterThanOrEqual(-1e-9 * range);
          }
        }
        if (b !== undefined) {
          for (const v of f) {
            expect(v).toBeGreaterThanOrEqual(b[0] - 1e-12 * Math.abs(b[0]));
            expect(v).toBeLessThanOrEqual(b[0] + b[1] + 1e-12 * Math.abs(b[0] + b[1]));
          }
        }
      }),
    );
  });
  it('degree 1 tables: knot slopes are non-increasing (concave) or non-decreasing (convex) to 1e-9 of the largest slope plus the rounding of the values (1e-11 of max |value| over the smallest knot gap)', () => {
    fc.assert(
      fc.property(dataArb, shapeArb, (d, s) => {
        fc.pre(s.degree === 1);
        const m = fit(d, s);
        const slopes = Array.from({ length: m.knotX.length - 1 }, (_, j) => (m.knotY[j + 1]! - m.knotY[j]!) / (m.knotX[j + 1]! - m.knotX[j]!));
        let gap = Infinity;
        for (let j = 0; j + 1 < m.knotX.length; j++) gap = Math.min(gap, m.knotX[j + 1]! - m.knotX[j]!);
        const tol = 1e-9 * maxAbs(slopes) + (1e-11 * Math.max(maxAbs(m.knotY), maxAbs(d.y))) / gap;
        for (let j = 0; j + 1 < slopes.length; j++) expect(s.curvature * (slopes[j + 1]! - slopes[j]!)).toBeGreaterThanOrEqual(-tol);
      }),
    );
  });
});

describe('shaped fits: KKT certificate', () => {
  it('stationarity, primal and dual feasibility and complementarity hold for every shape, direction and bound', () => {
    fc.assert(fc.property(dataArb, shapeArb, boundsArb, (d, s, b) => checkKkt(d, fit(d, s, b))));
  });
});

describe('shaped fits: symmetries', () => {
  it('down with curvature c equals −(up on −y with curvature −c), exactly (concave ↔ convex under y → −y)', () => {
    fc.assert(
      fc.property(dataArb, shapeArb, (d, s) => {
        const a = fit(d, { ...s, direction: 'down' });
        const b = fit({ ...d, y: d.y.map((v) => -v) }, { ...s, direction: 'up', curvature: (-s.curvature) as Curvature });
        expect(Array.from(a.fitted)).toEqual(Array.from(b.fitted, (v) => -v + 0).map((v) => v));
        expect(Array.from(a.knotY, (v) => v + 0)).toEqual(Array.from(b.knotY, (v) => -v + 0));
      }),
    );
  });
  it('mirroring x → −x swaps up and down and keeps the curvature: fitted values at rows with positive weight agree to 1e-9 of the data scale', () => {
    fc.assert(
      fc.property(dataArb, shapeArb, (d, s) => {
        const a = fit(d, { ...s, direction: 'up' });
        const b = fit({ ...d, x: d.x.map((v) => -v) }, { ...s, direction: 'down' });
        const sc = Math.max(maxAbs(a.fitted), maxAbs(d.y), 1e-300);
        // Knots of the mirrored data are mirrored only to rounding. Rows with weight 0 follow knot
        // values the data may leave free, which only the tie-break fixes (see shapeRegression):
        // they are not compared.
        const pos = (v: ArrayLike<number>) => Array.from(v).filter((_, i) => d.w === undefined || d.w[i]! > 0);
        expect(pos(b.fitted)).toBeAllCloseRel(pos(a.fitted), 1e-9, 1e-9 * sc);
      }),
    );
  });
  it('permuting the rows permutes the fitted values (rows with positive weight to 1e-9 of the data scale) and leaves the table unchanged (to 1e-6: knots the data leave free follow the tie-break)', () => {
    fc.assert(
      fc.property(dataArb, shapeArb, fc.integer({ min: 1, max: 1000 }), (d, s, seed) => {
        const n = d.x.length;
        const perm = Array.from({ length: n }, (_, i) => i).sort((i, j) => ((i * seed) % 7919) - ((j * seed) % 7919) || i - j);
        const pd: Data = { x: perm.map((i) => d.x[i]!), y: perm.map((i) => d.y[i]!), w: d.w && perm.map((i) => d.w![i]!) };
        const a = fit(d, s);
        const b = fit(pd, s);
        const sc = Math.max(maxAbs(a.knotY), maxAbs(d.y), 1e-300);
        const pos = perm.filter((i) => d.w === undefined || d.w[i]! > 0);
        const posB = perm.map((i, k) => (d.w === undefined || d.w[i]! > 0 ? k : -1)).filter((k) => k >= 0);
        expect(posB.map((k) => b.fitted[k]!)).toBeAllCloseRel(pos.map((i) => a.fitted[i]!), 1e-9, 1e-9 * sc);
        // Knot values and weight-0 rows may depend on the tie-break (about 1e-8, see shapeRegression).
        expect(b.knotY).toBeAllCloseRel(a.knotY, 1e-6, 1e-6 * sc);
        expect(b.fitted).toBeAllCloseRel(perm.map((i) => a.fitted[i]!), 1e-6, 1e-6 * sc);
      }),
    );
  });
  it('inputs are not mutated (frozen arrays are accepted and unchanged)', () => {
    fc.assert(
      fc.property(dataArb, shapeArb, (d, s) => {
        const x = Object.freeze(d.x.slice());
        const y = Object.freeze(d.y.slice());
        const w = d.w && Object.freeze(d.w.slice());
        fitMonotone(x, y, { weights: w, knots: s.knots, curvature: s.curvature, degree: s.degree, direction: s.direction });
        expect(x).toEqual(d.x);
        expect(y).toEqual(d.y);
        expect(w).toEqual(d.w);
      }),
      { numRuns: 50 },
    );
  });
});

describe('smooth fit with K = 2 and the line', () => {
  it('data exactly on a rising or falling line: degree 2 with K = 2 equals degree 1 with K = 2 (both the line) to 1e-10', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: -100, max: 100 }).map((v) => v / 10), { minLength: 3, maxLength: 30 }),
        fc.double({ min: -5, max: 5, noNaN: true }),
        fc.double({ min: -3, max: 3, noNaN: true }),
        (x, a, b) => {
          fc.pre(new Set(x).size >= 3);
          const y = x.map((v) => a + b * v);
          const direction = b >= 0 ? 'up' : 'down';
          const lin = fitMonotone(x, y, { knots: 2, direction });
          const smooth = fitMonotone(x, y, { knots: 2, degree: 2, direction });
          expect(smooth.fitted).toBeAllCloseRel(lin.fitted, 1e-10, 1e-10 * Math.max(maxAbs(y), 1));
          expect(smooth.fitted).toBeAllCloseRel(y, 1e-10, 1e-10 * Math.max(maxAbs(y), 1));
        },
      ),
    );
  });
});

describe('active constraints and the null-space basis (for bands conditional on the active set)', () => {
  it('without bounds, the coefficients lie in the null space Z of the active rows and equal the weighted least-squares fit on the design B·Z (to 1e-6 of the data scale)', () => {
    fc.assert(
      fc.property(dataArb, shapeArb, (d, s) => {
        const model = fit(d, s);
        const sh = model.shape!;
        const m = sh.coefficients.length;
        // Only fits whose every basis function meets a row with positive weight (no tie-break).
        const seen = new Uint8Array(m);
        const probe = new Float64Array(3);
        d.x.forEach((xi, i) => {
          if ((d.w?.[i] ?? 1) === 0) return;
          const first = quadraticBasisAt(sh.knots, sh.degree, xi, probe);
          for (let a = 0; a <= sh.degree; a++) if (probe[a]! > 0) seen[first + a] = 1;
        });
        fc.pre(seen.every((v) => v === 1));
        const rows = Array.from(sh.active, (r) => sh.constraints[r]!);
        const Z = nullSpaceBasis(m, rows);
        for (const z of Z) for (const row of rows) expect(Math.abs(rowDot(row, z))).toBeLessThanOrEqual(1e-12 * Math.max(maxAbs(z), 1));
        // Normal equations of y on B·Z.
        const p = Z.length;
        const G = Array.from({ length: p }, () => new Float64Array(p));
        const r = new Float64Array(p);
        const out = new Float64Array(3);
        d.x.forEach((xi, i) => {
          const w = d.w?.[i] ?? 1;
          if (w === 0) return;
          const first = quadraticBasisAt(sh.knots, sh.degree, xi, out);
          const bz = Z.map((z) => {
            let v = 0;
            for (let a = 0; a <= sh.degree; a++) v += out[a]! * z[first + a]!;
            return v;
          });
          for (let a = 0; a < p; a++) {
            r[a] = r[a]! + w * bz[a]! * d.y[i]!;
            for (let b = 0; b < p; b++) G[a]![b] = G[a]![b]! + w * bz[a]! * bz[b]!;
          }
        });
        // Only full-rank reduced designs define a unique least-squares fit (no empty knots).
        const beta = solveDense(G, r);
        fc.pre(beta !== null);
        const theta = new Float64Array(m);
        Z.forEach((z, k) => z.forEach((v, j) => (theta[j] = theta[j]! + beta![k]! * v)));
        // Tolerance 1e-6: the reduced normal equations square the condition of B·Z (rows a few ulps
        // apart are generated on purpose).
        expect(sh.coefficients).toBeAllCloseRel(theta, 1e-6, 1e-6 * Math.max(maxAbs(sh.coefficients), maxAbs(d.y)));
      }),
    );
  });
});

/** Gaussian elimination with partial pivoting; null when the matrix is numerically singular. */
function solveDense(G: Float64Array[], r: Float64Array): Float64Array | null {
  const p = r.length;
  const A = G.map((row, i) => [...row, r[i]!]);
  let norm = 0;
  for (const row of A) for (const v of row) norm = Math.max(norm, Math.abs(v));
  for (let k = 0; k < p; k++) {
    let piv = k;
    for (let i = k + 1; i < p; i++) if (Math.abs(A[i]![k]!) > Math.abs(A[piv]![k]!)) piv = i;
    if (!(Math.abs(A[piv]![k]!) > 1e-9 * norm)) return null;
    [A[k], A[piv]] = [A[piv]!, A[k]!];
    for (let i = k + 1; i < p; i++) {
      const f = A[i]![k]! / A[k]![k]!;
      for (let j = k; j <= p; j++) A[i]![j] = A[i]![j]! - f * A[k]![j]!;
    }
  }
  const x = new Float64Array(p);
  for (let k = p - 1; k >= 0; k--) {
    let s = A[k]![p]!;
    for (let j = k + 1; j < p; j++) s -= A[k]![j]! * x[j]!;
    x[k] = s / A[k]![k]!;
  }
  return x;
}

describe('smooth table: evaluation and inversion', () => {
  it('reading back a smooth fit at its own predictions lands on that value (to 1e-9), and on the x itself where the curve is strictly monotone (to 1e-6 of the x range)', () => {
    fc.assert(
      fc.property(dataArb, fc.constantFrom<Curvature>(-1, 0, 1), fc.constantFrom<Direction>('up', 'down'), fc.integer({ min: 2, max: 8 }), (d, curvature, direction, knots) => {
        const model = fit(d, { curvature, degree: 2, direction, knots });
        const { x, f } = grid(model, 50);
        const span = x[x.length - 1]! - x[0]!;
        const scale = Math.max(maxAbs(f), 1e-300);
        for (let i = 0; i < x.length; i++) {
          const v = f[i]!;
          // Only where the curve is strictly rising or falling around x (not flat to rounding).
          const strict = i > 0 && i + 1 < x.length && Math.abs(f[i + 1]! - f[i]!) > 1e-9 * scale && Math.abs(f[i]! - f[i - 1]!) > 1e-9 * scale;
          const back = invertTable(model.knotX, model.knotY, 'quadratic', v, 'middle');
          // The read-back lands where the curve takes the value v (exact on flat stretches too).
          expect(evaluateTable(model.knotX, model.knotY, 'quadratic', [back])[0]!).toBeCloseRel(v, 1e-9, 1e-9 * Math.max(maxAbs(f), 1e-300));
          const lo = invertTable(model.knotX, model.knotY, 'quadratic', v, 'lowest');
          const hi = invertTable(model.knotX, model.knotY, 'quadratic', v, 'highest');
          if (strict) {
            expect(lo).toBeCloseRel(x[i]!, 1e-6, 1e-6 * span);
            expect(hi).toBeCloseRel(x[i]!, 1e-6, 1e-6 * span);
          }
          expect(lo).toBeLessThanOrEqual(hi);
        }
      }),
      { numRuns: 100 },
    );
  });
});

describe('cross-validation over knot counts for a shape', () => {
  it('crossValidate with curvature and degree scores every candidate with the shaped fit (held-out errors equal a by-hand refit of the first fold)', () => {
    const x = Array.from({ length: 30 }, (_, i) => i / 3);
    const y = x.map((v, i) => Math.sqrt(v) + ((i * 7) % 5) / 10);
    const cv = crossValidate(x, y, { candidates: [2, 4], folds: 3, seed: 0, curvature: -1, degree: 2 });
    // Fold 1 of seed 0 is the first 10 rows (contiguous blocks); refit on the rest for K = 4.
    const train = { x: x.slice(10), y: y.slice(10) };
    const model = fitMonotone(train.x, train.y, { knots: 4, curvature: -1, degree: 2 });
    const pred = predict(model, x.slice(0, 10));
    const rmse = Math.sqrt(pred.reduce((s, p, i) => s + (y[i]! - p) ** 2, 0) / 10);
    expect(cv.scores[1]!.foldRmse[0]!).toBeCloseRel(rmse, 1e-12);
  });
});

describe('knots with no data nearby', () => {
  it('concave fit, 11 knots, data only near both ends: the empty knots 2 … 8 lie on the line between knots 1 and 9 (to 1e-6), and the fit repeats exactly', () => {
    const xs = [0, 0.2, 0.5, 0.8, 1, 9, 9.3, 9.6, 10];
    const ys = [0, 0.5, 1.1, 1.4, 1.8, 4, 4.1, 4.15, 4.2];
    const a = fitMonotone(xs, ys, { knots: 11, curvature: -1 });
    const b = fitMonotone(xs, ys, { knots: 11, curvature: -1 });
    expect(Array.from(a.knotY)).toEqual(Array.from(b.knotY));
    const t = a.knotX;
    const v = a.knotY;
    for (let j = 2; j <= 8; j++) {
      const line = v[1]! + ((v[9]! - v[1]!) * (t[j]! - t[1]!)) / (t[9]! - t[1]!);
      expect(v[j]!).toBeCloseRel(line, 1e-6);
    }
  });
});
