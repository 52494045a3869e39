/**
 * Shaped knot fits (concave, convex, smooth) against outside references on the same design:
 * - R 4.x quadprog::solve.QP and splines::splineDesign — fixture shapes_r.json, written by
 *   `Rscript test/reference/gen_shapes.R` (package versions recorded in the fixture);
 * - cvxopt.solvers.qp (Debian's python3, design from scipy.interpolate.BSpline.design_matrix,
 *   polished on the active set it identifies) — fixture shapes_cvxopt.json, written by
 *   `/usr/bin/python3 test/reference/gen_shapes.py`.
 * Datasets from R's datasets package (cars, pressure, Puromycin, mtcars, trees, women) and seeded
 * random cases; the knots are explicit in the fixture so both sides use the same positions.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitMonotone, predict, quadraticBasisAt, type Curvature, type Degree, type Direction } from '../../src/core/index.js';

interface RCase {
  name: string;
  source?: string;
  note: string;
  x: number[];
  y: number[];
  w?: number[];
  knots: number[];
  direction: Direction;
  curvature: Curvature;
  degree: Degree;
  lower?: number;
  upper?: number;
  quadprog_coefficients: number[];
  quadprog_fitted: number[];
  quadprog_sse: number;
}
interface CvxCase {
  name: string;
  polished: boolean;
  cvxopt_fitted: number[];
  cvxopt_coefficients: number[];
}
const load = <T>(name: string): T => JSON.parse(readFileSync(new URL(`../reference/fixtures/${name}`, import.meta.url), 'utf8')) as T;
const R = load<{ cases: RCase[]; basis: { knots: number[]; x: number[]; rows: number[][] }; versions: Record<string, string> }>('shapes_r.json');
const CVX = load<{ cases: CvxCase[] }>('shapes_cvxopt.json');

/** Relative to the largest |value| of the reference: fitted values near 0 are compared at that scale. */
function scaleOf(v: number[]): number {
  return Math.max(...v.map(Math.abs));
}

function fitCase(c: RCase) {
  return fitMonotone(c.x, c.y, {
    knots: c.knots,
    weights: c.w,
    direction: c.direction,
    curvature: c.curvature,
    degree: c.degree,
    lower: c.lower,
    upper: c.upper,
  });
}

describe('shaped fits against quadprog::solve.QP (R, gen_shapes.R)', () => {
  it('the fixture covers at least 3 datasets of R\'s datasets package, random cases and every shape', () => {
    const sources = new Set(R.cases.filter((c) => c.source !== undefined).map((c) => c.source!.split(' ')[1]));
    expect(sources.size).toBeGreaterThanOrEqual(3);
    expect(R.cases.some((c) => c.source === undefined)).toBe(true);
    for (const [curv, deg] of [[-1, 1], [1, 1], [0, 2], [-1, 2], [1, 2]]) {
      expect(R.cases.some((c) => c.curvature === curv && c.degree === deg)).toBe(true);
    }
  });
  for (const c of R.cases) {
    it(`${c.name}: fitted values and coefficients match quadprog to 1e-9 of their scale (curvature ${c.curvature}, degree ${c.degree}, ${c.direction})`, () => {
      const model = fitCase(c);
      const s = scaleOf(c.quadprog_fitted);
      expect(model.fitted).toBeAllCloseRel(c.quadprog_fitted, 1e-9, 1e-9 * s);
      expect(model.shape!.coefficients).toBeAllCloseRel(c.quadprog_coefficients, 1e-9, 1e-9 * scaleOf(c.quadprog_coefficients));
      expect(model.stats.sse).toBeCloseRel(c.quadprog_sse, 1e-9, 1e-12 * s * s);
    });
  }
});

describe('shaped fits against cvxopt.solvers.qp (gen_shapes.py)', () => {
  for (const c of R.cases) {
    const v = CVX.cases.find((k) => k.name === c.name)!;
    it(`${c.name}: fitted values match cvxopt (polished on its active set) to 1e-9 of their scale`, () => {
      expect(v.polished).toBe(true);
      const model = fitCase(c);
      expect(model.fitted).toBeAllCloseRel(v.cvxopt_fitted, 1e-9, 1e-9 * scaleOf(v.cvxopt_fitted));
    });
  }
});

describe('the knot table reproduces the curve', () => {
  for (const c of R.cases) {
    it(`${c.name}: predict from the table equals the fitted values to 1e-12 of their scale`, () => {
      const model = fitCase(c);
      expect(model.interpolation ?? 'linear').toBe(c.degree === 2 ? 'quadratic' : 'linear');
      expect(model.knotX.length).toBe(c.degree === 2 ? 2 * c.knots.length - 1 : c.knots.length);
      expect(predict(model, c.x)).toBeAllCloseRel(model.fitted, 1e-12, 1e-12 * scaleOf(c.quadprog_fitted));
    });
  }
});

describe('quadratic B-spline basis against splines::splineDesign (R, gen_shapes.R)', () => {
  it('basis values on uneven knots [0, 0.5, 2, 3.5, 4, 7] match splineDesign(ord = 3) with tripled end knots to 1e-14', () => {
    const { knots, x, rows } = R.basis;
    const out = new Float64Array(3);
    x.forEach((xi, i) => {
      const first = quadraticBasisAt(knots, 2, xi, out);
      const full = new Array<number>(knots.length + 1).fill(0);
      for (let a = 0; a < 3; a++) full[first + a] = out[a]!;
      expect(full).toBeAllCloseRel(rows[i]!, 1e-14, 1e-14);
    });
  });
});

describe('known special case: noise-free data from a concave function', () => {
  it('33 knots, data from min(3x, x + 4, x/4 + 7.75) (concave, breaks at knots): the concave fit returns the data to 1e-12 (SSE 0 is attainable and feasible) (common practice)', () => {
    const c = R.cases.find((k) => k.name === 'exact_concave_pl')!;
    const model = fitCase(c);
    expect(model.fitted).toBeAllCloseRel(c.y, 1e-12, 1e-12 * scaleOf(c.y));
    expect(model.knotY).toBeAllCloseRel(c.knots.map((t) => Math.min(3 * t, t + 4, 0.25 * t + 7.75)), 1e-12, 1e-11);
  });
  it('noise-free data from the concave quadratic 10 − (x − 9)²/8 on [0, 8]: the smooth concave fit with 9 knots returns it to 1e-12 (a quadratic is a quadratic spline) (common practice)', () => {
    const x = Array.from({ length: 81 }, (_, i) => i / 10);
    const f = (v: number) => 10 - (v - 9) ** 2 / 8;
    const model = fitMonotone(x, x.map(f), { knots: 9, curvature: -1, degree: 2 });
    expect(model.fitted).toBeAllCloseRel(x.map(f), 1e-12, 1e-11);
    expect(predict(model, [0.05, 3.33, 7.77])).toBeAllCloseRel([0.05, 3.33, 7.77].map(f), 1e-12, 1e-11);
  });
});
