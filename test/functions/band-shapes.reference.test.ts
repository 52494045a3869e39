/**
 * RATCHET.BAND, RATCHET.INVERTBAND and the curvature and degree arguments through the worksheet
 * functions, against outside references:
 * - test/reference/fixtures/band_r.json, made by `Rscript test/reference/gen_band.R` (R's
 *   `predict.lm` on the straight line, on the degree-1 B-spline design and on the reduced design
 *   of the groups; the classical calibration interval; versions recorded in the fixture);
 * - test/reference/fixtures/shapes_r.json, made by `Rscript test/reference/gen_shapes.R`
 *   (`quadprog::solve.QP` on a `splines::splineDesign` design, datasets from R's datasets package
 *   and seeded cases).
 * Regenerate both with `npm run refs`.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { clearCaches } from '../../src/functions/engine.js';
import { bandAt, fitShapedBandModel, inverseBand, invertTable } from '../../src/core/index.js';
import { cell, col, row } from './helpers.js';
import type { CellArg, CellOut } from '../../src/functions/types.js';

interface BandCase {
  name: string;
  source: string;
  x: number[];
  y: number[];
  w?: number[] | null;
  knots?: number | number[];
  knot_x?: number[];
  new_x: number[];
  bands: { level: number; fit: number[]; conf_lower: number[]; conf_upper: number[]; pred_lower: number[]; pred_upper: number[] }[];
}
interface CalibrationCase {
  name: string;
  source: string;
  x: number[];
  y: number[];
  w?: number[] | null;
  sets: { level: number; replicates: number; intervals: { target: number; lower: number; x: number; upper: number }[] }[];
}
interface ShapeCase {
  name: string;
  source: string;
  x: number[];
  y: number[];
  knots: number | number[];
  direction: 'up' | 'down';
  curvature: -1 | 0 | 1;
  degree: 1 | 2;
  lower: number | null;
  upper: number | null;
  w: number[] | null;
  quadprog_fitted: number[];
}

const bands = JSON.parse(readFileSync(new URL('../reference/fixtures/band_r.json', import.meta.url), 'utf8')) as {
  line: BandCase[];
  hat: BandCase[];
  active: BandCase[];
  calibration: CalibrationCase[];
};
const shapes = JSON.parse(readFileSync(new URL('../reference/fixtures/shapes_r.json', import.meta.url), 'utf8')) as { cases: ShapeCase[] };

const column = (v: readonly number[]): CellArg => v.map((x) => [x]);
const knotsArg = (k: number | number[]): CellArg => (typeof k === 'number' ? k : column(k));

function expectClose(got: CellOut, want: number, rel: number): void {
  expect(typeof got).toBe('number');
  expect(Math.abs((got as number) - want)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(want)));
}

function checkBand(c: BandCase, knots: number | number[], extra: CellArg[] = []): void {
  clearCaches();
  for (const b of c.bands) {
    for (const [kind, lower, upper] of [
      [1, b.conf_lower, b.conf_upper],
      [2, b.pred_lower, b.pred_upper],
    ] as const) {
      const out = cell('BAND', column(c.new_x), column(c.y), column(c.x), knotsArg(knots), null, c.w ? column(c.w) : null, b.level, kind, ...extra) as CellOut[][];
      expect(out).toHaveLength(c.new_x.length);
      out.forEach((r, i) => {
        expectClose(r[0]!, lower[i]!, 1e-9);
        expectClose(r[1]!, b.fit[i]!, 1e-9);
        expectClose(r[2]!, upper[i]!, 1e-9);
      });
    }
  }
}

describe('RATCHET.BAND equals R predict.lm (band_r.json, gen_band.R)', () => {
  for (const c of bands.line) {
    it(`${c.name} (${c.source}): knots 2, confidence and prediction columns to 1e-9 relative`, () => checkBand(c, 2));
    it(`${c.name}: knots 2 with curvature -1 and 1 (two knots: no shape row) gives the same band`, () => {
      checkBand(c, 2, [-1]);
      checkBand(c, 2, [1, 1]);
    });
  }
  for (const c of bands.hat) {
    it(`${c.name} (${c.source}): knots ${JSON.stringify(c.knots)}, degree-1 B-spline design, to 1e-9 relative`, () => checkBand(c, c.knots!));
  }
  for (const c of bands.active) {
    it(`${c.name}: an active constraint, reduced design of the groups, to 1e-9 relative`, () => checkBand(c, c.knot_x!));
  }
});

describe('RATCHET.BAND result shapes and refusals', () => {
  const xs = col(1, 2, 3, 4, 5, 6);
  const ys = col(10, 14, 12, 17, 16, 21);
  it('a row of new x gives three rows (lower, fit, upper) with one column per x', () => {
    const out = cell('BAND', row(1, 6), ys, xs, 2) as CellOut[][];
    expect(out).toHaveLength(3);
    expect(out.map((r) => r.length)).toEqual([2, 2, 2]);
    const asColumn = cell('BAND', col(1, 6), ys, xs, 2) as CellOut[][];
    expect(out[0]).toEqual(asColumn.map((r) => r[0]));
    expect(out[2]).toEqual(asColumn.map((r) => r[2]));
  });
  it('degree 2 (smooth) gives the core smooth band (fitShapedBandModel + bandAt) and INVERTBAND the core read-back interval, cell for cell', () => {
    clearCaches();
    const model = fitShapedBandModel([1, 2, 3, 4, 5, 6], [10, 14, 12, 17, 16, 21], { knots: 3, degree: 2 });
    const b = bandAt(model, [3], 0.95, 'confidence');
    expect(cell('BAND', 3, ys, xs, 3, null, null, null, null, 0, 2)).toEqual([[b.lower[0], b.fit[0], b.upper[0]]]);
    const r = inverseBand(model, [15], 0.5, 10)[0]!;
    expect([typeof r.lower, typeof r.upper]).toEqual(['number', 'number']);
    // The middle value is RATCHET.INVERT's read-back on the smooth fit's quadratic table.
    expect(r.x).toBe(invertTable(model.knotX, model.knotY, 'quadratic', 15));
    expect(cell('INVERTBAND', 15, ys, xs, 3, null, null, 0.5, 10, 0, 2)).toEqual([[r.lower, r.x, r.upper]]);
  });
});

describe('RATCHET.INVERTBAND equals the classical calibration interval (band_r.json, gen_band.R) and its middle equals RATCHET.INVERT', () => {
  for (const c of bands.calibration) {
    for (const s of c.sets) {
      it(`${c.name} (${c.source}): level ${s.level}, ${s.replicates} replicate(s), to 1e-8 relative`, () => {
        clearCaches();
        const targets = s.intervals.map((i) => i.target);
        const out = cell('INVERTBAND', column(targets), column(c.y), column(c.x), 2, null, c.w ? column(c.w) : null, s.level, s.replicates) as CellOut[][];
        const table = cell('KNOTS', column(c.y), column(c.x), 2, null, c.w ? column(c.w) : null) as CellArg;
        const middle = cell('INVERT', column(targets), table) as CellOut[][];
        s.intervals.forEach((iv, k) => {
          const r = out[k]!;
          for (const [got, want] of [
            [r[0]!, iv.lower],
            [r[1]!, iv.x],
            [r[2]!, iv.upper],
          ] as const) {
            if (Number.isFinite(want)) expectClose(got, want, 1e-8);
            else expect(got).toMatchObject({ kind: 'error', code: '#N/A' });
          }
          expect(r[1]).toBe(middle[k]![0]);
        });
      });
    }
  }
  it('a limit the band does not reach is #N/A in that cell only, and its message names the side (README example)', () => {
    const out = cell('INVERTBAND', 12, col(10, 14, 12, 17, 16, 21), col(1, 2, 3, 4, 5, 6), 2, null, null, 0.8, 4) as CellOut[][];
    expect(out[0]![0]).toEqual({
      kind: 'error',
      code: '#N/A',
      message: "target_ys: needs a band whose upper edge falls to 12 inside the data's x range; the lower x limit lies below 1.",
    });
    expect(out[0]![1]).toBeCloseTo(1.90909, 5);
    expect(out[0]![2]).toBeCloseTo(2.90618, 5);
  });
});

describe('FIT with curvature and degree equals quadprog::solve.QP (shapes_r.json, gen_shapes.R)', () => {
  for (const c of shapes.cases.filter((s) => s.lower === null && s.upper === null)) {
    it(`${c.name} (${c.source}): curvature ${c.curvature}, degree ${c.degree}, fitted values to 1e-9 relative of their range`, () => {
      clearCaches();
      const out = cell('FIT', column(c.y), column(c.x), knotsArg(c.knots), c.direction === 'up' ? 1 : -1, c.w ? column(c.w) : null, c.curvature, c.degree) as CellOut[][];
      const range = Math.max(...c.quadprog_fitted) - Math.min(...c.quadprog_fitted);
      out.forEach((r, i) => expect(Math.abs((r[0] as number) - c.quadprog_fitted[i]!)).toBeLessThanOrEqual(1e-9 * Math.max(1, range)));
    });
  }
  const smooth = shapes.cases.filter((s) => s.degree === 2 && s.lower === null && s.upper === null);
  for (const c of smooth) {
    it(`${c.name}: the smooth KNOTS table (third column 2) read by EVAL reproduces PREDICT and quadprog's fitted values`, () => {
      clearCaches();
      const args = [column(c.y), column(c.x), knotsArg(c.knots), c.direction === 'up' ? 1 : -1, c.w ? column(c.w) : null, c.curvature, c.degree];
      const table = cell('KNOTS', ...args) as CellOut[][];
      expect(table.every((r) => r.length === 3 && r[2] === 2)).toBe(true);
      const viaTable = cell('EVAL', column(c.x), table as CellArg) as CellOut[][];
      const viaPredict = cell('PREDICT', column(c.x), ...args) as CellOut[][];
      const range = Math.max(...c.quadprog_fitted) - Math.min(...c.quadprog_fitted);
      viaTable.forEach((r, i) => {
        expect(Math.abs((r[0] as number) - (viaPredict[i]![0] as number))).toBeLessThanOrEqual(1e-12 * Math.max(1, range));
        expect(Math.abs((r[0] as number) - c.quadprog_fitted[i]!)).toBeLessThanOrEqual(1e-9 * Math.max(1, range));
      });
    });
  }
  it('the classic fit (knots 0) with curvature or degree is #VALUE! with a message', () => {
    const e = cell('FIT', col(1, 2, 3), col(1, 2, 3), 0, 1, null, -1) as { error: { code: string; message: string } };
    expect(e.error.code).toBe('#VALUE!');
    expect(e.error.message).toMatch(/^curvature: needs knots/);
    const d = cell('FIT', col(1, 2, 3), col(1, 2, 3), null, 1, null, 0, 2) as { error: { code: string; message: string } };
    expect(d.error.code).toBe('#VALUE!');
    expect(d.error.message).toMatch(/^degree: needs knots/);
  });
});
