/**
 * Properties of the two exact solvers, as specifications (fast-check, fixed seed so a failure is
 * reproducible; fast-check prints the shrunk counterexample and the seed).
 *
 * The optimality (KKT) conditions are written out here rather than taken from the solver, so these
 * tests certify the optimum independently of how it was found:
 *
 * Classic fit, on the tie-pooled points with positive weight in x order (values f, weights w, pooled
 * means y, residuals r = y − f), for a non-decreasing fit with bounds lo ≤ f ≤ hi:
 *   S_k = Σ_{i≤k} w_i r_i, μ = −S_{k*} when the first level sits at lo (k* = its last point), else 0;
 *   λ_k = S_k + μ ≥ 0 for k < m, λ_k = 0 where f_{k+1} > f_k, and ν = S_m + μ ≥ 0 with ν = 0 unless
 *   f_m = hi. Without bounds this is: partial sums ≥ 0, zero at every block end and at m.
 * Knot model, with r = y − fit and g = BᵀWr (B the hat-function design), the same with g_j in place
 * of w_i r_i over the knots j = 1 … K (Karush–Kuhn–Tucker; Nocedal & Wright 2006, §12.3).
 * "Zero" and "≥ 0" are to 1e-9 relative to Σ w |y| + Σ w |r| (the size of the terms summed).
 * Generated data have no values below 1e-150 in size (they are set to 0), as real data never do.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { dataSets, real, type Data } from './arbitraries.js';
import { fitMonotone, interpolate, invertAt, knotRegression, predict } from '../../src/core/index.js';
import { evenKnots } from '../../src/core/knots.js';
import { isotonicRegression } from '../../src/core/isotonic.js';
import { poolTies } from '../../src/core/pool-ties.js';
import { solveMonotoneTridiagonal } from '../../src/core/monotone-qp.js';
import { sortOrder } from '../../src/core/sort-order.js';
import { type Direction } from '../../src/core/types.js';
import { hatRow } from './fixtures.js';

// Fixed seed for reproducible CI runs; FC_SEED / FC_RUNS explore further (e.g. FC_RUNS=20000).
fc.configureGlobal({ seed: Number(process.env.FC_SEED ?? 20240601), numRuns: Number(process.env.FC_RUNS ?? 300) });

const KKT_REL = 1e-9;

const dataArb: fc.Arbitrary<Data> = dataSets(2, 8)
  .filter((d) => {
    // At least two distinct x with positive weight, spread wider than a few ulps (a range that
    // cannot hold K distinct knots is a typed error, tested in bad-input.test.ts).
    const xs: number[] = [];
    d.x.forEach((v, i) => {
      if (d.w === undefined || d.w[i]! > 0) xs.push(v);
    });
    const lo = Math.min(...xs);
    const hi = Math.max(...xs);
    return hi - lo > 1e-9 * Math.max(1, Math.abs(lo), Math.abs(hi));
  });

const boundsArb = fc.option(
  fc.tuple(real(-1e3, 1e3), real(0, 1e3), fc.integer({ min: 0, max: 2 })),
  { nil: undefined },
);

/** lower/upper from a generated (start, width, which): which 0 = lower only, 1 = upper only, 2 = both. */
function boundsOf(b: [number, number, number] | undefined): { lower?: number; upper?: number } {
  if (b === undefined) return {};
  const [a, width, which] = b;
  if (which === 0) return { lower: a };
  if (which === 1) return { upper: a };
  return { lower: a, upper: a + width };
}

/**
 * Checks the chain-with-bounds KKT conditions spelled out at the top of this file for values f (up
 * direction) and per-position gradient terms g, with `scale` the size of the summed terms.
 */
function expectKkt(f: ArrayLike<number>, g: ArrayLike<number>, lo: number, hi: number, scale: number): void {
  const m = f.length;
  const tol = KKT_REL * scale + 1e-300; // the floor: below ~1e-300 doubles lose relative precision
  const S = new Float64Array(m);
  let acc = 0;
  for (let k = 0; k < m; k++) S[k] = acc += g[k]!;
  // μ (lower-bound multiplier): 0 unless the first level sits at lo. If that level ends before m,
  // λ = 0 at its end fixes μ = −S_{k*}. If it spans everything and lo < hi, ν = 0 fixes μ = −S_m.
  // If lo = hi (every value pinned), any μ ≥ max(0, −S_k for all k) works: take the smallest.
  let mu = 0;
  if (f[0] === lo) {
    let kStar = 0;
    while (kStar + 1 < m && f[kStar + 1] === f[0]) kStar++;
    if (kStar + 1 < m) mu = -S[kStar]!;
    else if (lo < hi) mu = -S[m - 1]!;
    else for (let k = 0; k < m; k++) mu = Math.max(mu, -S[k]!);
  }
  expect(mu).toBeGreaterThanOrEqual(-tol);
  for (let k = 0; k + 1 < m; k++) {
    const lambda = S[k]! + mu;
    expect(lambda, `λ_${k} ≥ 0`).toBeGreaterThanOrEqual(-tol);
    if (f[k + 1]! > f[k]!) expect(Math.abs(lambda), `λ_${k} = 0 where values rise`).toBeLessThanOrEqual(tol);
  }
  const nu = S[m - 1]! + mu;
  expect(nu, 'ν ≥ 0').toBeGreaterThanOrEqual(-tol);
  if (f[m - 1] !== hi) expect(Math.abs(nu), 'ν = 0 unless the last value sits at the upper bound').toBeLessThanOrEqual(tol);
  if (f[0] !== lo) expect(Math.abs(mu)).toBe(0);
}

/** Bounds of the up-problem that a fit in direction `dir` with bounds (lower, upper) solves for sign·y. */
function upBounds(dir: Direction, lower = -Infinity, upper = Infinity): [number, number] {
  return dir === 'up' ? [lower, upper] : [-upper, -lower];
}


function isNonDecreasing(v: ArrayLike<number>): boolean {
  for (let i = 1; i < v.length; i++) if (!(v[i]! >= v[i - 1]!)) return false;
  return true;
}

function inXOrder(x: number[], v: ArrayLike<number>): number[] {
  return Array.from(sortOrder(x), (i) => v[i]!);
}

describe('classic fit: properties', () => {
  it('the fit is monotone in the direction used, at every row and in its knot table', () => {
    fc.assert(
      fc.property(dataArb, fc.constantFrom<Direction>('up', 'down'), boundsArb, (d, dir, b) => {
        const fit = isotonicRegression(d.x, d.y, { weights: d.w, direction: dir, ...boundsOf(b) });
        const s = dir === 'up' ? 1 : -1;
        expect(isNonDecreasing(inXOrder(d.x, fit.fitted).map((v) => s * v))).toBe(true);
        expect(isNonDecreasing(Array.from(fit.knotY, (v) => s * v))).toBe(true);
      }),
    );
  });

  it('satisfies the KKT conditions (partial sums of w·r ≥ 0, zero at block ends and at m; bounds via μ, ν) to 1e-9 relative', () => {
    fc.assert(
      fc.property(dataArb, fc.constantFrom<Direction>('up', 'down'), boundsArb, (d, dir, b) => {
        const bb = boundsOf(b);
        const fit = isotonicRegression(d.x, d.y, { weights: d.w, direction: dir, ...bb });
        const s = dir === 'up' ? 1 : -1;
        const pooled = poolTies(d.x, d.y, d.w ?? d.x.map(() => 1));
        const f: number[] = [];
        const g: number[] = [];
        let scale = 0;
        for (let j = 0; j < pooled.x.length; j++) {
          const w = pooled.w[j]!;
          if (!(w > 0)) continue;
          const yj = s * pooled.y[j]!;
          const fj = s * fit.value[j]!;
          f.push(fj);
          g.push(w * (yj - fj));
          scale += w * (Math.abs(yj) + Math.abs(yj - fj));
        }
        const [lo, hi] = upBounds(dir, bb.lower, bb.upper);
        expectKkt(f, g, lo, hi, scale);
      }),
    );
  });

  it('without bounds, the pooled weighted mean is preserved (Σ w f = Σ w y) and every level is the weighted mean of its rows', () => {
    fc.assert(
      fc.property(dataArb, (d) => {
        const fit = isotonicRegression(d.x, d.y, { weights: d.w });
        const w = d.w ?? d.x.map(() => 1);
        let sy = 0;
        let sf = 0;
        let sa = 0;
        for (let i = 0; i < d.x.length; i++) {
          sy += w[i]! * d.y[i]!;
          sf += w[i]! * fit.fitted[i]!;
          sa += w[i]! * Math.abs(d.y[i]!);
        }
        expect(Math.abs(sy - sf)).toBeLessThanOrEqual(1e-12 * sa + 1e-300);
        // A level is the set of rows sharing one fitted value; with positive weight, its value is
        // the weighted mean of those rows' y (zero-weight rows carry no weight into the mean).
        const levels = new Map<number, { sw: number; swy: number; swa: number }>();
        for (let i = 0; i < d.x.length; i++) {
          const l = levels.get(fit.fitted[i]!) ?? { sw: 0, swy: 0, swa: 0 };
          l.sw += w[i]!;
          l.swy += w[i]! * d.y[i]!;
          l.swa += w[i]! * Math.abs(d.y[i]!);
          levels.set(fit.fitted[i]!, l);
        }
        for (const [value, l] of levels) {
          if (l.sw > 0) expect(Math.abs(value - l.swy / l.sw)).toBeLessThanOrEqual(1e-12 * (l.swa / l.sw) + 1e-300);
        }
      }),
    );
  });

  it('permuting the rows changes nothing (fitted values follow their rows; curve identical to 1e-12)', () => {
    fc.assert(
      fc.property(dataArb.chain((d) => fc.tuple(fc.constant(d), fc.shuffledSubarray([...d.x.keys()], { minLength: d.x.length }))), ([d, perm]) => {
        const a = fitMonotone(d.x, d.y, { weights: d.w });
        const px = perm.map((i) => d.x[i]!);
        const py = perm.map((i) => d.y[i]!);
        const pw = d.w === undefined ? undefined : perm.map((i) => d.w![i]!);
        const b = fitMonotone(px, py, { weights: pw });
        expect(b.fitted).toBeAllCloseRel(perm.map((i) => a.fitted[i]!), 1e-12);
        expect(b.knotX).toEqual(a.knotX);
        expect(b.knotY).toBeAllCloseRel(a.knotY, 1e-12);
      }),
    );
  });

  it('fitting down equals the negated up-fit of −y (bounds mirrored)', () => {
    fc.assert(
      fc.property(dataArb, boundsArb, (d, b) => {
        const bb = boundsOf(b);
        const down = isotonicRegression(d.x, d.y, { weights: d.w, direction: 'down', ...bb });
        const up = isotonicRegression(d.x, d.y.map((v) => -v), {
          weights: d.w,
          direction: 'up',
          lower: bb.upper === undefined ? undefined : -bb.upper,
          upper: bb.lower === undefined ? undefined : -bb.lower,
        });
        // + 0 identifies −0 with 0 (equal as numbers; toEqual tells them apart).
        expect(Array.from(down.fitted, (v) => v + 0)).toEqual(Array.from(up.fitted, (v) => -v + 0));
      }),
    );
  });

  it('rows with weight 0 do not influence the fit and get the curve value at their x', () => {
    fc.assert(
      fc.property(dataArb, fc.double({ min: -1e3, max: 1e3, noNaN: true }), (d, yNew) => {
        const w = d.w ?? d.x.map(() => 1);
        const base = fitMonotone(d.x, d.y, { weights: w });
        // Add a zero-weight row anywhere in x with any y: the curve does not move.
        const xNew = (Math.min(...d.x) + Math.max(...d.x)) / 2;
        const more = fitMonotone([...d.x, xNew], [...d.y, yNew], { weights: [...w, 0] });
        expect(predict(more, [xNew, ...d.x])).toBeAllCloseRel(predict(base, [xNew, ...d.x]), 1e-12);
        expect(more.fitted[d.x.length]).toBeCloseRel(predict(base, [xNew])[0]!, 1e-12);
      }),
    );
  });
});

describe('knot model: properties', () => {
  const knotCountArb = fc.integer({ min: 2, max: 12 });

  it('knot values and fitted values are monotone in the direction used', () => {
    fc.assert(
      fc.property(dataArb, knotCountArb, fc.constantFrom<Direction>('up', 'down'), boundsArb, (d, K, dir, b) => {
        const fit = knotRegression(d.x, d.y, { knots: K, weights: d.w, direction: dir, ...boundsOf(b) });
        const s = dir === 'up' ? 1 : -1;
        expect(isNonDecreasing(Array.from(fit.knotY, (v) => s * v))).toBe(true);
        expect(isNonDecreasing(inXOrder(d.x, fit.fitted).map((v) => s * v))).toBe(true);
        const bb = boundsOf(b);
        for (const v of fit.knotY) {
          if (bb.lower !== undefined) expect(v).toBeGreaterThanOrEqual(bb.lower);
          if (bb.upper !== undefined) expect(v).toBeLessThanOrEqual(bb.upper);
        }
      }),
    );
  });

  it('satisfies the KKT conditions with g = BᵀWr (partial sums ≥ 0, total 0, zero where knot values rise; bounds via μ, ν) to 1e-9 relative', () => {
    fc.assert(
      fc.property(dataArb, knotCountArb, fc.constantFrom<Direction>('up', 'down'), boundsArb, (d, K, dir, b) => {
        const bb = boundsOf(b);
        const fit = knotRegression(d.x, d.y, { knots: K, weights: d.w, direction: dir, ...bb });
        const s = dir === 'up' ? 1 : -1;
        const t = fit.knotX;
        const g = new Float64Array(t.length);
        let scale = 0;
        for (let i = 0; i < d.x.length; i++) {
          const w = d.w === undefined ? 1 : d.w[i]!;
          if (!(w > 0)) continue;
          const [j, a, c] = hatRow(t, d.x[i]!);
          // r from the knot values through B (not the solver's own fitted values).
          const fi = a * s * fit.knotY[j]! + c * s * fit.knotY[j + 1]!;
          const r = s * d.y[i]! - fi;
          g[j] = g[j]! + w * a * r;
          g[j + 1] = g[j + 1]! + w * c * r;
          scale += w * (Math.abs(d.y[i]!) + Math.abs(r));
        }
        const [lo, hi] = upBounds(dir, bb.lower, bb.upper);
        expectKkt(Array.from(fit.knotY, (v) => s * v), g, lo, hi, scale);
      }),
    );
  });

  it('permuting the rows changes nothing: fitted values at rows with positive weight (unique) agree to 1e-9', () => {
    fc.assert(
      fc.property(
        dataArb.chain((d) => fc.tuple(fc.constant(d), fc.shuffledSubarray([...d.x.keys()], { minLength: d.x.length }))),
        knotCountArb,
        ([d, perm], K) => {
          const a = knotRegression(d.x, d.y, { knots: K, weights: d.w });
          const b = knotRegression(
            perm.map((i) => d.x[i]!),
            perm.map((i) => d.y[i]!),
            { knots: K, weights: d.w === undefined ? undefined : perm.map((i) => d.w![i]!) },
          );
          // Sums are taken in another order, so rounding differs. Only the fitted values at rows
          // with weight are unique; knot values the data leave free or barely touch (a row 1e-15
          // from a knot) — and with them the fitted values of weight-0 rows — are not, so they are
          // not compared here (the reference tests compare knot values where they are unique).
          const scale = Math.max(...d.y.map(Math.abs), 1);
          const keep = perm.map((i) => d.w === undefined || d.w[i]! > 0);
          const fa = perm.map((i) => a.fitted[i]!);
          expect(Array.from(b.fitted).filter((_, k) => keep[k])).toBeAllCloseRel(fa.filter((_, k) => keep[k]), 1e-9, 1e-9 * scale);
          expect(b.knotX).toEqual(a.knotX);
          expect(Array.from(b.identified)).toEqual(Array.from(a.identified));
        },
      ),
    );
  });

  it('fitting down equals the negated up-fit of −y (bounds mirrored)', () => {
    fc.assert(
      fc.property(dataArb, knotCountArb, boundsArb, (d, K, b) => {
        const bb = boundsOf(b);
        const down = knotRegression(d.x, d.y, { knots: K, weights: d.w, direction: 'down', ...bb });
        const up = knotRegression(d.x, d.y.map((v) => -v), {
          knots: K,
          weights: d.w,
          direction: 'up',
          lower: bb.upper === undefined ? undefined : -bb.upper,
          upper: bb.lower === undefined ? undefined : -bb.lower,
        });
        // + 0 identifies −0 with 0 (equal as numbers; toEqual tells them apart).
        expect(Array.from(down.knotY, (v) => v + 0)).toEqual(Array.from(up.knotY, (v) => -v + 0));
        expect(Array.from(down.fitted, (v) => v + 0)).toEqual(Array.from(up.fitted, (v) => -v + 0));
      }),
    );
  });

  it('a 2-knot up-fit is the weighted least-squares line (computed independently here) when its slope is ≥ 0, else the weighted mean', () => {
    fc.assert(
      fc.property(dataArb, (d) => {
        const w = d.w ?? d.x.map(() => 1);
        let sw = 0;
        let sx = 0;
        let sy = 0;
        let xmin = Infinity;
        let xmax = -Infinity;
        for (let i = 0; i < d.x.length; i++) {
          if (!(w[i]! > 0)) continue;
          sw += w[i]!;
          sx += w[i]! * d.x[i]!;
          sy += w[i]! * d.y[i]!;
          xmin = Math.min(xmin, d.x[i]!);
          xmax = Math.max(xmax, d.x[i]!);
        }
        const mx = sx / sw;
        const my = sy / sw;
        let sxx = 0;
        let sxy = 0;
        let syy = 0;
        for (let i = 0; i < d.x.length; i++) {
          sxx += w[i]! * (d.x[i]! - mx) ** 2;
          sxy += w[i]! * (d.x[i]! - mx) * (d.y[i]! - my);
          syy += w[i]! * (d.y[i]! - my) ** 2;
        }
        const slope = sxy / sxx;
        const fit = knotRegression(d.x, d.y, { knots: 2, weights: d.w });
        // Scale of the answer: the spread of y around its mean plus |mean|.
        const abs = 1e-9 * (Math.abs(my) + Math.sqrt(syy / sw) + 1e-300);
        if (slope >= 0) {
          expect(fit.knotY).toBeAllCloseRel([my + slope * (xmin - mx), my + slope * (xmax - mx)], 1e-9, abs);
        } else {
          expect(fit.knotY).toBeAllCloseRel([my, my], 1e-9, abs);
        }
      }),
    );
  });

  it('rows outside explicit knots are fitted by the flat end values', () => {
    fc.assert(
      fc.property(dataArb, (d) => {
        const lo = Math.min(...d.x);
        const hi = Math.max(...d.x);
        const knots = [lo + (hi - lo) * 0.25, lo + (hi - lo) * 0.5, lo + (hi - lo) * 0.75];
        fc.pre(knots[0]! < knots[1]! && knots[1]! < knots[2]!);
        const fit = knotRegression(d.x, d.y, { knots, weights: d.w });
        d.x.forEach((xv, i) => {
          if (xv <= knots[0]!) expect(fit.fitted[i]! === fit.knotY[0]!).toBe(true);
          if (xv >= knots[2]!) expect(fit.fitted[i]! === fit.knotY[2]!).toBe(true);
        });
      }),
    );
  });
});

describe('both methods: determinism and inputs', () => {
  const specArb = fc.constantFrom<number | undefined>(undefined, 0, 2, 3, 7);

  it('the same input gives a bit-identical output', () => {
    fc.assert(
      fc.property(dataArb, specArb, fc.constantFrom<Direction | 'auto'>('up', 'down', 'auto'), (d, knots, dir) => {
        const a = fitMonotone(d.x, d.y, { weights: d.w, knots, direction: dir });
        const b = fitMonotone(d.x, d.y, { weights: d.w, knots, direction: dir });
        const bytes = (v: Float64Array) => Buffer.from(v.buffer, v.byteOffset, v.byteLength).toString('hex');
        expect(bytes(b.fitted)).toBe(bytes(a.fitted));
        expect(bytes(b.knotX)).toBe(bytes(a.knotX));
        expect(bytes(b.knotY)).toBe(bytes(a.knotY));
        expect(b.stats).toEqual(a.stats);
      }),
    );
  });

  it('inputs are not mutated (frozen arrays are accepted; typed-array inputs keep their contents)', () => {
    fc.assert(
      fc.property(dataArb, specArb, (d, knots) => {
        const x = Object.freeze([...d.x]);
        const y = Object.freeze([...d.y]);
        const w = d.w === undefined ? undefined : Object.freeze([...d.w]);
        fitMonotone(x, y, { weights: w, knots, direction: 'auto' });
        const tx = Float64Array.from(d.x);
        const ty = Float64Array.from(d.y);
        const tw = d.w === undefined ? undefined : Float64Array.from(d.w);
        const model = fitMonotone(tx, ty, { weights: tw, knots });
        expect(Array.from(tx)).toEqual(d.x);
        expect(Array.from(ty)).toEqual(d.y);
        if (tw !== undefined) expect(Array.from(tw)).toEqual(d.w);
        // The result does not alias the inputs: changing them afterwards leaves the model alone.
        const before = Array.from(model.fitted);
        tx.fill(0);
        ty.fill(0);
        expect(Array.from(model.fitted)).toEqual(before);
        expect(model.fitted.buffer).not.toBe(tx.buffer);
        expect(model.knotX.buffer).not.toBe(tx.buffer);
      }),
    );
  });

  it('no fit returns NaN or ±Infinity for finite input', () => {
    fc.assert(
      fc.property(dataArb, specArb, boundsArb, (d, knots, b) => {
        const m = fitMonotone(d.x, d.y, { weights: d.w, knots, ...boundsOf(b) });
        for (const v of [...m.fitted, ...m.knotX, ...m.knotY, m.stats.sse, m.stats.rmse, m.stats.mae, m.stats.r2]) {
          expect(Number.isFinite(v)).toBe(true);
        }
      }),
    );
  });
});

describe('interpolation and inverse', () => {
  const tableArb = fc
    .array(fc.tuple(fc.double({ min: 1e-3, max: 10, noNaN: true }), fc.double({ min: 1e-3, max: 10, noNaN: true })), { minLength: 1, maxLength: 12 })
    .chain((steps) =>
      fc.record({
        t0: fc.double({ min: -100, max: 100, noNaN: true }),
        v0: fc.double({ min: -100, max: 100, noNaN: true }),
        steps: fc.constant(steps),
        down: fc.boolean(),
      }),
    )
    .map(({ t0, v0, steps, down }) => {
      const t = [t0];
      const v = [v0];
      for (const [dt, dv] of steps) {
        t.push(t[t.length - 1]! + dt);
        v.push(v[v.length - 1]! + (down ? -dv : dv));
      }
      return { t, v };
    });

  it('the curve is flat beyond its end knots', () => {
    fc.assert(
      fc.property(tableArb, fc.double({ min: 1e-6, max: 1e6, noNaN: true }), ({ t, v }, gap) => {
        const out = interpolate(t, v, [t[0]! - gap, t[t.length - 1]! + gap, t[0]!, t[t.length - 1]!]);
        expect(Array.from(out)).toEqual([v[0], v[v.length - 1], v[0], v[v.length - 1]]);
      }),
    );
  });

  it('invert(interpolate(x)) returns x on strictly monotone curves (to 1e-9 of the knot span)', () => {
    fc.assert(
      fc.property(tableArb, fc.double({ min: 0, max: 1, noNaN: true }), ({ t, v }, u) => {
        const span = t[t.length - 1]! - t[0]!;
        const x = t[0]! + u * span;
        const yv = interpolate(t, v, [x])[0]!;
        for (const tie of ['lowest', 'middle', 'highest'] as const) {
          expect(invertAt(t, v, yv, tie)).toBeCloseRel(x, 0, 1e-9 * (span + Math.abs(x)));
        }
      }),
    );
  });

  it('on a flat stretch the inverse returns its lowest, middle or highest x', () => {
    fc.assert(
      fc.property(tableArb, fc.integer({ min: 0, max: 100 }), ({ t, v }, pick) => {
        // Make the stretch between knots a and a + 1 flat by copying values.
        const a = pick % (t.length - 1);
        const vv = [...v];
        vv[a + 1] = vv[a]!;
        const up = vv[vv.length - 1]! >= vv[0]!;
        for (let j = a + 2; j < vv.length; j++) if (up ? vv[j]! < vv[j - 1]! : vv[j]! > vv[j - 1]!) vv[j] = vv[j - 1]!;
        // The preimage of vv[a] is the interval of knots with that value.
        let lo = a;
        while (lo > 0 && vv[lo - 1] === vv[a]) lo--;
        let hi = a + 1;
        while (hi + 1 < vv.length && vv[hi + 1] === vv[a]) hi++;
        expect(invertAt(t, vv, vv[a]!, 'lowest')).toBe(t[lo]);
        expect(invertAt(t, vv, vv[a]!, 'highest')).toBe(t[hi]);
        expect(invertAt(t, vv, vv[a]!, 'middle')).toBeCloseRel((t[lo]! + t[hi]!) / 2, 1e-15);
      }),
    );
  });
});

describe('scale: the solvers make no decision that depends on the units of x, y or w', () => {
  // Multiplying by a power of two is exact in binary floating point, so an algorithm whose tests
  // are all relative gives exactly the scaled answer. (A tolerance in absolute units would not.)
  const powerArb = fc.integer({ min: -400, max: 400 }).map((k) => 2 ** k);
  const specArb = fc.constantFrom<number | undefined>(undefined, 2, 3, 5, 9);

  it('scaling y (and the bounds) by 2^k scales fitted values and knot values by 2^k, SSE by 4^k, leaves R² alone', () => {
    fc.assert(
      fc.property(dataArb, specArb, powerArb, boundsArb, (d, knots, s, b) => {
        // Only where no scaled y comes near underflow or overflow (products with shares < 1 follow).
        fc.pre(d.y.every((v) => v === 0 || (Math.abs(v * s) > 1e-100 && Math.abs(v * s) < 1e100)));
        const bb = boundsOf(b);
        const a = fitMonotone(d.x, d.y, { weights: d.w, knots, ...bb });
        const scaled = fitMonotone(d.x, d.y.map((v) => v * s), {
          weights: d.w,
          knots,
          lower: bb.lower === undefined ? undefined : bb.lower * s,
          upper: bb.upper === undefined ? undefined : bb.upper * s,
        });
        expect(Array.from(scaled.fitted)).toEqual(Array.from(a.fitted, (v) => v * s));
        expect(Array.from(scaled.knotY)).toEqual(Array.from(a.knotY, (v) => v * s));
        // (SSE itself can underflow or overflow for the most extreme draws; compare where it cannot.)
        const sse = a.stats.sse * s * s;
        if (a.stats.sse > 1e-250 && sse > 1e-250 && sse < 1e250) expect(scaled.stats.sse).toBeCloseRel(sse, 1e-12, 0);
        expect(scaled.stats.r2).toBeCloseRel(a.stats.r2, 1e-12);
      }),
    );
  });

  it('scaling the weights by 2^k changes nothing in the fit', () => {
    fc.assert(
      fc.property(dataArb, specArb, fc.integer({ min: -60, max: 60 }).map((k) => 2 ** k), (d, knots, s) => {
        const w = d.w ?? d.x.map(() => 1);
        const a = fitMonotone(d.x, d.y, { weights: w, knots });
        const b = fitMonotone(d.x, d.y, { weights: w.map((v) => v * s), knots });
        expect(Array.from(b.fitted)).toEqual(Array.from(a.fitted));
        expect(Array.from(b.knotY)).toEqual(Array.from(a.knotY));
      }),
    );
  });

  it('scaling x by 2^k scales the knot positions by 2^k and leaves the fitted values alone', () => {
    fc.assert(
      fc.property(dataArb, specArb, powerArb, (d, knots, s) => {
        // Only where the scaled x neither underflow nor overflow.
        fc.pre(d.x.every((v) => v === 0 || (Math.abs(v * s) > 1e-290 && Math.abs(v * s) < 1e290)));
        const a = fitMonotone(d.x, d.y, { weights: d.w, knots });
        const b = fitMonotone(d.x.map((v) => v * s), d.y, { weights: d.w, knots });
        expect(Array.from(b.fitted)).toEqual(Array.from(a.fitted));
        expect(Array.from(b.knotX)).toEqual(Array.from(a.knotX, (v) => v * s));
      }),
    );
  });
});

describe('knot model: identification and hard layouts', () => {
  /** Rows placed exactly on (a subset of) the even knot grid, plus the two ends; many knots empty. */
  const onGridArb = fc
    .record({
      lo: real(-100, 100),
      width: real(1e-3, 1e3),
      K: fc.integer({ min: 3, max: 30 }),
      picks: fc.array(fc.nat(), { minLength: 0, maxLength: 6 }),
      ys: fc.array(real(-10, 10), { minLength: 8, maxLength: 8 }),
    })
    .map(({ lo, width, K, picks, ys }) => {
      const t = evenKnots(lo, lo + width, K);
      const js = [0, K - 1, ...picks.map((p) => p % K)];
      return { K, t, x: js.map((j) => t[j]!), y: js.map((_, i) => ys[i % ys.length]!) };
    });

  it('with rows exactly on knots, a knot is identified iff a row sits on it (its open neighbourhood holds no row)', () => {
    fc.assert(
      fc.property(onGridArb, ({ K, t, x, y }) => {
        const fit = knotRegression(x, y, { knots: K });
        expect(Array.from(fit.knotX)).toEqual(Array.from(t));
        const expected = Array.from(t, (tj) => (x.includes(tj) ? 1 : 0));
        expect(Array.from(fit.identified)).toEqual(expected);
        // Each row is fitted by its own knot's value alone.
        x.forEach((xv, i) => expect(fit.fitted[i]! === fit.knotY[t.indexOf(xv)]!).toBe(true));
      }),
    );
  });

  /** Few distinct x, many knots: chains of intervals that each hold a single interior x (the jointly unidentified case). */
  const sparseArb = fc
    .record({
      xs: fc.uniqueArray(real(-20, 20), { minLength: 2, maxLength: 6 }),
      reps: fc.integer({ min: 1, max: 4 }),
      K: fc.integer({ min: 5, max: 40 }),
      ys: fc.array(real(-100, 100), { minLength: 24, maxLength: 24 }),
      dir: fc.constantFrom<Direction>('up', 'down'),
      b: boundsArb,
    })
    .filter(({ xs }) => Math.max(...xs) - Math.min(...xs) > 1e-9 * Math.max(1, ...xs.map(Math.abs)));

  it('few distinct x with many knots (knot values only jointly determined): never throws, monotone, KKT to 1e-9', () => {
    fc.assert(
      fc.property(sparseArb, ({ xs, reps, K, ys, dir, b }) => {
        const x: number[] = [];
        const y: number[] = [];
        xs.forEach((xv) => {
          for (let r = 0; r < reps; r++) {
            x.push(xv);
            y.push(ys[x.length % ys.length]!);
          }
        });
        const bb = boundsOf(b);
        const fit = knotRegression(x, y, { knots: K, direction: dir, ...bb });
        const s = dir === 'up' ? 1 : -1;
        expect(isNonDecreasing(Array.from(fit.knotY, (v) => s * v))).toBe(true);
        const g = new Float64Array(K);
        let scale = 0;
        x.forEach((xv, i) => {
          const [j, a, c] = hatRow(fit.knotX, xv);
          const r = s * y[i]! - (a * s * fit.knotY[j]! + c * s * fit.knotY[j + 1]!);
          g[j] = g[j]! + a * r;
          g[j + 1] = g[j + 1]! + c * r;
          scale += Math.abs(y[i]!) + Math.abs(r);
        });
        const [lo, hi] = upBounds(dir, bb.lower, bb.upper);
        expectKkt(Array.from(fit.knotY, (v) => s * v), g, lo, hi, scale);
      }),
    );
  });
});

describe('solveMonotoneTridiagonal: random positive definite tridiagonal QPs', () => {
  // H = RᵀR with R upper bidiagonal (diagonal a, superdiagonal b = ρ·min(a_i, a_{i+1}), |ρ| ≤ 0.9):
  // H_ii = a_i² + b_{i−1}², H_{i,i+1} = a_i·b_i — positive definite, off-diagonals of either sign,
  // condition numbers up to ~1e7 when some a_i are small (|ρ| < 1 keeps R⁻¹ bounded; larger ρ
  // would give conditions like (ρ)^m beyond what any double-precision solver can certify).
  const qpArb = fc.integer({ min: 1, max: 30 }).chain((m) =>
    fc.record({
      a: fc.array(fc.oneof(real(0.5, 3), real(1e-3, 1e-2)), { minLength: m, maxLength: m }),
      b: fc.array(real(-0.9, 0.9), { minLength: m, maxLength: m }),
      c: fc.array(fc.oneof(real(-100, 100), fc.integer({ min: -2, max: 2 })), { minLength: m, maxLength: m }),
      bounds: boundsArb,
    }),
  );

  it('never throws, returns a feasible θ and satisfies the KKT conditions with g = c − Hθ to 1e-9', () => {
    fc.assert(
      fc.property(qpArb, ({ a, b, c, bounds }) => {
        const m = a.length;
        const sup = a.map((ai, i) => b[i]! * Math.min(ai, a[i + 1] ?? ai));
        const d = a.map((ai, i) => ai * ai + (i > 0 ? sup[i - 1]! ** 2 : 0));
        const e = a.slice(0, m - 1).map((ai, i) => ai * sup[i]!);
        const { lower = -Infinity, upper = Infinity } = boundsOf(bounds);
        const { theta } = solveMonotoneTridiagonal(d, e, c, lower, upper);
        expect(isNonDecreasing(theta)).toBe(true);
        for (const v of theta) {
          expect(v).toBeGreaterThanOrEqual(lower);
          expect(v).toBeLessThanOrEqual(upper);
        }
        const g: number[] = [];
        let scale = 0;
        for (let i = 0; i < m; i++) {
          const h = d[i]! * theta[i]! + (i > 0 ? e[i - 1]! * theta[i - 1]! : 0) + (i + 1 < m ? e[i]! * theta[i + 1]! : 0);
          g.push(c[i]! - h);
          scale += Math.abs(c[i]!) + Math.abs(h);
        }
        expectKkt(theta, g, lower, upper, scale);
      }),
    );
  });
});
