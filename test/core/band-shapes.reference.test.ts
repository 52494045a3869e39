/**
 * Bands and read-back intervals of concave and convex knot fits (curvature −1 / +1; degree 1, hat
 * functions, and degree 2, quadratic B-splines) against R (fixture
 * test/reference/fixtures/band_shapes_r.json, made by `Rscript test/reference/gen_band_shapes.R`,
 * which records the R and package versions; regenerate with `npm run refs`). R's side: the shaped
 * optimum from quadprog::solve.QP on the splines::splineDesign basis, the active rows by relative
 * slack ≤ 1e-9 (equal to quadprog's own active set, strict complementarity checked), Z from the QR
 * decomposition of the transposed active rows, predict.lm on lm(y ~ 0 + BZ, weights = w), and a
 * uniroot scan of |f − y0| ≤ t·se_pred for the read-back limits. Data: R's datasets package (cars,
 * mtcars, Orange, pressure, DNase, Puromycin) and one invented seeded data set (the recipe is in
 * the fixture's `source`).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitShapedBandModel, type Curvature, type Degree } from '../../src/core/index.js';
import { shapeRegression } from '../../src/core/shape-fit.js';
import { type Direction } from '../../src/core/types.js';
import { expectBandRows, expectInvertSets, type ReducedDesignCase } from './band-fixture-checks.js';

interface ShapeBandCase extends ReducedDesignCase {
  invented: boolean;
  note: string;
  direction: Direction;
  curvature: Curvature;
  degree: Degree;
  constraint_rows: number;
  active: number[];
  active_shape: number;
  active_sign: boolean;
}
interface ShapeBandFixture {
  command: string;
  versions: Record<string, string>;
  cases: ShapeBandCase[];
}

const fixture = JSON.parse(readFileSync(new URL('../reference/fixtures/band_shapes_r.json', import.meta.url), 'utf8')) as ShapeBandFixture;

const optionsOf = (c: ShapeBandCase) => ({ knots: c.knot_x, weights: c.w ?? undefined, direction: c.direction, curvature: c.curvature, degree: c.degree });
const shapeName = (c: ShapeBandCase) => `${c.curvature < 0 ? 'concave' : 'convex'} ${c.direction === 'up' ? 'rising' : 'falling'}, degree ${c.degree}${c.w ? ', seeded weights' : ''}`;
const activeText = (c: ShapeBandCase) => (c.active.length === 0 ? 'no row active' : `active rows [${c.active.join(', ')}] of ${c.constraint_rows}${c.active_sign ? ' (the sign row among them)' : ''}`);

describe('band_shapes_r.json covers what gen_band_shapes.R says it does', () => {
  it('the fixture records its command and the R, stats, splines, quadprog and datasets versions', () => {
    expect(fixture.command).toBe('Rscript test/reference/gen_band_shapes.R');
    for (const k of ['R', 'stats', 'splines', 'quadprog', 'datasets']) expect(fixture.versions[k]).toBeTruthy();
  });
  it('cases: concave and convex, rising and falling, degree 1 and 2, with and without weights; shape rows active, and the sign (monotonicity) row active with a shape row', () => {
    const cs = fixture.cases;
    for (const curvature of [-1, 1]) for (const direction of ['up', 'down']) expect(cs.some((c) => c.curvature === curvature && c.direction === direction)).toBe(true);
    for (const degree of [1, 2]) {
      const d = cs.filter((c) => c.degree === degree);
      expect(d.some((c) => c.w) && d.some((c) => !c.w)).toBe(true);
      expect(d.some((c) => c.active_shape > 0)).toBe(true);
      expect(d.some((c) => c.active_sign && c.active_shape > 0)).toBe(true);
    }
  });
});

describe("concave and convex fits: the coefficients equal quadprog's and the active rows equal those R identifies (relative slack ≤ 1e-9)", () => {
  for (const c of fixture.cases) {
    it(`${c.name} (${shapeName(c)}): coefficients to 1e-7 relative, ${activeText(c)}`, () => {
      const fit = shapeRegression(c.x, c.y, optionsOf(c));
      expect(fit.coefficients).toBeAllCloseRel(c.coefficients, 1e-7);
      expect(fit.constraints.length).toBe(c.constraint_rows);
      expect(Array.from(fit.active).sort((a, b) => a - b)).toEqual(c.active);
    });
  }
});

describe('concave and convex BAND equals R predict.lm on the reduced design BZ of the active set (quadprog::solve.QP, Z from qr of the active rows, lm)', () => {
  for (const c of fixture.cases) {
    it(`${c.name} (${shapeName(c)}; ${c.invented ? 'invented, seeded' : c.source.slice(0, 40)}): ${c.parameters} of ${c.degree === 1 ? c.knot_x.length : c.knot_x.length + 1} parameters, df_resid, σ̂ and the confidence and prediction bands at levels 0.9 and 0.95 to 1e-9 relative, also beyond the end knots`, () => {
      const model = fitShapedBandModel(c.x, c.y, optionsOf(c));
      expect(model.parameters).toBe(c.parameters);
      expect(model.dfResid).toBe(c.df_resid);
      expect(model.sigma).toBeCloseRel(c.sigma, 1e-9);
      expectBandRows(model, c.new_x, c.bands);
    });
  }
});

describe('concave and convex INVERTBAND equals the set {x : |f(x) − y0| ≤ t·se_pred(x)} on the reduced design, scanned in R (uniroot on a grid of 4000 steps)', () => {
  for (const c of fixture.cases) {
    it(`${c.name} (${shapeName(c)}): level 0.95 with 1 replicate and 0.9 with 3, read-back x to 1e-9, limits to 1e-8 relative; limits R does not find inside the data's x range are NOT_REACHABLE`, () => {
      expectInvertSets(fitShapedBandModel(c.x, c.y, optionsOf(c)), c.invert);
    });
  }
});
