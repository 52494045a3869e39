/**
 * Bands and read-back intervals of the smooth fit (degree 2) against R (fixture
 * test/reference/fixtures/band_smooth_r.json, made by `Rscript test/reference/gen_band_smooth.R`,
 * which records the R and package versions; regenerate with `npm run refs`).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { bandAt, fitShapedBandModel, inverseBand } from '../../src/core/index.js';
import { shapeRegression } from '../../src/core/shape-fit.js';

interface BandRow {
  level: number;
  fit: number[];
  conf_lower: number[];
  conf_upper: number[];
  pred_lower: number[];
  pred_upper: number[];
}
interface InvertSet {
  level: number;
  replicates: number;
  intervals: { target: number; lower: number | null; x: number; upper: number | null }[];
}
interface SmoothCase {
  name: string;
  source: string;
  knot_x: number[];
  x: number[];
  y: number[];
  w?: number[] | null;
  coefficients: number[];
  groups?: number[];
  parameters: number;
  sigma: number;
  df_resid: number;
  new_x: number[];
  bands: BandRow[];
  invert: InvertSet[];
}
interface SmoothFixture {
  command: string;
  versions: Record<string, string>;
  free: SmoothCase[];
  active: SmoothCase[];
}

const fixture = JSON.parse(readFileSync(new URL('../reference/fixtures/band_smooth_r.json', import.meta.url), 'utf8')) as SmoothFixture;

/** The smooth fit's coefficients, parameters, σ̂ and every band row of a case against R at 1e-9 relative. */
function checkCase(c: SmoothCase): void {
  const options = { knots: c.knot_x, weights: c.w ?? undefined, degree: 2 as const };
  const fit = shapeRegression(c.x, c.y, options);
  expect(fit.coefficients).toBeAllCloseRel(c.coefficients, 1e-7);
  const model = fitShapedBandModel(c.x, c.y, options);
  expect(model.parameters).toBe(c.parameters);
  expect(model.dfResid).toBe(c.df_resid);
  expect(model.sigma).toBeCloseRel(c.sigma, 1e-9);
  for (const row of c.bands) {
    const conf = bandAt(model, c.new_x, row.level, 'confidence');
    const pred = bandAt(model, c.new_x, row.level, 'prediction');
    expect(conf.fit).toBeAllCloseRel(row.fit, 1e-9);
    expect(conf.lower).toBeAllCloseRel(row.conf_lower, 1e-9);
    expect(conf.upper).toBeAllCloseRel(row.conf_upper, 1e-9);
    expect(pred.lower).toBeAllCloseRel(row.pred_lower, 1e-9);
    expect(pred.upper).toBeAllCloseRel(row.pred_upper, 1e-9);
  }
}

/** INVERTBAND's three values against R's scan of |f − y0| ≤ t·se_pred (null there: not reached). */
function checkInvert(c: SmoothCase): void {
  const model = fitShapedBandModel(c.x, c.y, { knots: c.knot_x, weights: c.w ?? undefined, degree: 2 });
  for (const set of c.invert) {
    const got = inverseBand(model, set.intervals.map((r) => r.target), set.level, set.replicates);
    set.intervals.forEach((r, i) => {
      const g = got[i]!;
      expect(g.x as number).toBeCloseRel(r.x, 1e-9);
      for (const side of ['lower', 'upper'] as const) {
        const want = r[side];
        if (want === null) expect(g[side]).toMatchObject({ code: 'NOT_REACHABLE' });
        else expect(g[side] as number).toBeCloseRel(want, 1e-8);
      }
    });
  }
}

describe('smooth BAND with no active constraint equals R predict.lm on lm(y ~ splineDesign(knots_ext, x, ord = 3) - 1) (gen_band_smooth.R, R datasets package)', () => {
  it('the fixture records its command', () => {
    expect(fixture.command).toBe('Rscript test/reference/gen_band_smooth.R');
  });
  for (const c of fixture.free) {
    it(`${c.name} (${c.source}${c.w ? ', seeded weights' : ''}): knots ${JSON.stringify(c.knot_x)}, bands at levels 0.9 and 0.95 to 1e-9 relative, also beyond the end knots`, () => {
      checkCase(c);
    });
  }
});

describe('smooth BAND with an active constraint equals predict.lm on the reduced design of the groups of equal coefficients (quadprog::solve.QP + lm)', () => {
  for (const c of fixture.active) {
    it(`${c.name} (${c.source.slice(0, 40)}…): ${c.parameters} of ${c.knot_x.length + 1} parameters, bands to 1e-9 relative`, () => {
      expect(c.parameters).toBeLessThan(c.knot_x.length + 1);
      checkCase(c);
    });
  }
});

describe('smooth INVERTBAND equals the set {x : |f(x) − y0| ≤ t·se_pred(x)} scanned in R (uniroot on a grid of 4000 steps)', () => {
  for (const c of [...fixture.free, ...fixture.active]) {
    it(`${c.name}: read-back x to 1e-9, limits to 1e-8 relative; limits R does not find inside the data's x range are NOT_REACHABLE`, () => {
      checkInvert(c);
    });
  }
});
