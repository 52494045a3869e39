/**
 * The pane's shape options (curvature, degree) and how it draws a shaped curve:
 * - formula text: `curvature` and `degree` are appended last, only when they are not the defaults
 *   (README, "Shapes: concave, convex and smooth fits": the argument order of each function);
 * - the pane's fit and cross-validation go through the worksheet functions with those arguments,
 *   so they equal the core called directly with the same shape;
 * - a smooth fit's curve is sampled densely through RATCHET.EVAL: at the sample positions that
 *   coincide with the x of the R fixture, it equals Σ cⱼ Bⱼ(x) with the quadratic B-spline values
 *   of R's `splines::splineDesign` (test/reference/fixtures/shapes_r.json, `basis`, written by
 *   `Rscript test/reference/gen_shapes.R`; R version recorded there);
 * - the refusals of the classic fit with a shape are the functions' own messages.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { computeFit, cvArgs, cvRows, fitArgs, knotTableCsv, knotTableRows, CellFailure } from '../../taskpane/analysis.js';
import { formulaFor, shapeArgs, spillSize, type CvSettings } from '../../taskpane/formulas.js';
import { curveDrawing, denseXs, samplesPerInterval, MAX_CURVE_POINTS, SAMPLES_PER_INTERVAL } from '../../src/view/curve-points.js';
import { functionByName } from '../../src/functions/registry.js';
import { crossValidate, evaluateTable, fitMonotone } from '../../src/core/index.js';
import { shapeWords } from '../../taskpane/panels/cv-panel.js';
import { fitSummary } from '../../taskpane/panels/fit-panel.js';
import '../runner/helpers.js';

const R = JSON.parse(readFileSync(new URL('../reference/fixtures/shapes_r.json', import.meta.url), 'utf8')) as {
  basis: { knots: number[]; x: number[]; rows: number[][] };
  versions: Record<string, string>;
};

// Invented data: a rising response that levels off, with a dip (x = 1 … 12).
const X = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
const Y = [2.1, 4.0, 5.2, 6.9, 7.1, 8.4, 8.2, 9.0, 9.4, 9.3, 9.8, 9.9];
const col = (v: readonly number[]) => v.map((q) => [q]);

describe('formula text with a shape', () => {
  const refs = { x: '$A$2:$A$13', y: '$B$2:$B$13' };
  const cv: CvSettings = { folds: 5, repeats: 1, seed: 1, rule: 1 };
  it('omits curvature and degree at their defaults, so a plain fit writes the formulas it always wrote', () => {
    expect(shapeArgs({ knots: 4, direction: 1 })).toEqual([undefined, undefined]);
    expect(shapeArgs({ knots: 4, direction: 1, curvature: 0, degree: 1 })).toEqual([undefined, undefined]);
    expect(formulaFor('KNOTS', refs, { knots: 4, direction: 1, curvature: 0, degree: 1 }, cv)).toBe('=RATCHET.KNOTS($B$2:$B$13,$A$2:$A$13,4,1)');
  });
  it('appends curvature and degree after weights (KNOTS, STATS, PREDICT), leaving weights empty when there are none', () => {
    const concave = { knots: 4, direction: 1 as const, curvature: -1 as const };
    expect(formulaFor('KNOTS', refs, concave, cv)).toBe('=RATCHET.KNOTS($B$2:$B$13,$A$2:$A$13,4,1,,-1)');
    expect(formulaFor('STATS', { ...refs, w: '$C$2:$C$13' }, { ...concave, degree: 2 }, cv)).toBe('=RATCHET.STATS($B$2:$B$13,$A$2:$A$13,4,1,$C$2:$C$13,-1,2)');
    expect(formulaFor('PREDICT', refs, { knots: 5, direction: -1, degree: 2 }, cv, '$E$2:$E$4')).toBe('=RATCHET.PREDICT($E$2:$E$4,$B$2:$B$13,$A$2:$A$13,5,-1,,,2)');
  });
  it('CV takes them after weights and BESTK after rule (rule left empty at its default)', () => {
    const convexSmooth = { knots: 4, direction: 1 as const, curvature: 1 as const, degree: 2 as const };
    expect(formulaFor('CV', refs, convexSmooth, cv)).toBe('=RATCHET.CV($B$2:$B$13,$A$2:$A$13,,5,1,1,1,,1,2)');
    expect(formulaFor('BESTK', refs, convexSmooth, cv)).toBe('=RATCHET.BESTK($B$2:$B$13,$A$2:$A$13,,5,1,1,1,,,1,2)');
    expect(formulaFor('BESTK', refs, { ...convexSmooth, degree: 1 }, { ...cv, rule: 0 })).toBe('=RATCHET.BESTK($B$2:$B$13,$A$2:$A$13,,5,1,1,1,,0,1)');
  });
  it('each shaped formula, typed into the functions, gives what the pane shows', () => {
    const fit = { knots: 4, direction: 1 as const, curvature: -1 as const, degree: 2 as const };
    const view = computeFit({ x: X, y: Y }, fit);
    // The formula's arguments after the ranges, as the functions read them.
    const text = formulaFor('KNOTS', refs, fit, cv);
    expect(text.endsWith(',4,1,,-1,2)')).toBe(true);
    expect(functionByName('KNOTS')!.invoke([col(Y), col(X), 4, 1, undefined, -1, 2])).toEqual(knotTableRows(view));
  });
  it('size a smooth fit’s KNOTS result as (2K − 1) rows × 3 columns', () => {
    const view = computeFit({ x: X, y: Y }, { knots: 4, direction: 1, degree: 2 });
    expect(view.knots.length).toBe(7);
    expect(spillSize('KNOTS', { knotRows: view.knots.length, knotCols: view.smooth ? 3 : 2, candidates: 0, newXs: { rows: 1, cols: 1 } })).toEqual({ rows: 7, cols: 3 });
  });
});

describe('the pane’s fit and cross-validation for a shape equal the core with that shape', () => {
  it.each([
    ['concave', -1, 1, 6],
    ['convex', 1, 1, 6],
    ['smooth', 0, 2, 7],
    ['concave smooth', -1, 2, 7],
  ] as const)('%s: knot table and fitted values equal fitMonotone with the same options', (_n, curvature, degree, argCount) => {
    const view = computeFit({ x: X, y: Y }, { knots: 5, direction: 1, curvature, degree });
    const m = fitMonotone(X, Y, { knots: 5, direction: 'up', curvature, degree });
    expect(view.smooth).toBe(degree === 2);
    expect(view.knots.map((k) => k[0])).toBeAllCloseRel(Array.from(m.knotX), 1e-12);
    expect(view.knots.map((k) => k[1])).toBeAllCloseRel(Array.from(m.knotY), 1e-12);
    expect(view.knotMarkers.map((k) => k.x)).toEqual(degree === 2 ? Array.from(m.knotX).filter((_, i) => i % 2 === 0) : Array.from(m.knotX));
    expect(fitArgs({ x: X, y: Y }, { knots: 5, direction: 1, curvature, degree })).toHaveLength(argCount);
    expect(fitArgs({ x: X, y: Y }, { knots: 5, direction: 1, curvature: 0, degree: 1 })).toHaveLength(4);
  });
  it('cross-validation over knot counts runs for the chosen shape (CV with curvature and degree, as crossValidate)', () => {
    const cv: CvSettings = { candidates: [2, 3, 4], folds: 3, repeats: 1, seed: 2, rule: 1 };
    const fit = { direction: 1 as const, curvature: -1 as const, degree: 2 as const };
    const rows = cvRows(functionByName('CV')!.invoke(cvArgs({ x: X, y: Y }, cv, fit, false)));
    const core = crossValidate(X, Y, { candidates: [2, 3, 4], folds: 3, seed: 2, direction: 'up', curvature: -1, degree: 2 });
    expect(rows.map((r) => r.cvRmse)).toBeAllCloseRel(core.scores.map((s) => s.cvRmse), 1e-12);
    const plain = crossValidate(X, Y, { candidates: [2, 3, 4], folds: 3, seed: 2, direction: 'up' });
    // control: the plain fit scores differently, so the shape did reach the cross-validation
    expect(rows.map((r) => r.cvRmse)).not.toEqual(plain.scores.map((s) => s.cvRmse));
    const bestArgs = cvArgs({ x: X, y: Y }, cv, fit, true);
    expect(bestArgs.slice(8)).toEqual([1, -1, 2]);
  });
  it('the classic fit with a shape is refused with the functions’ messages, naming the argument', () => {
    const err = (fit: Parameters<typeof computeFit>[1]): CellFailure => {
      try {
        computeFit({ x: X, y: Y }, fit);
      } catch (e) {
        return e as CellFailure;
      }
      throw new Error('no error');
    };
    expect(err({ knots: 0, direction: 1, curvature: 1 }).message).toBe('curvature: needs knots (K ≥ 2): the classic fit has no curvature option; got 1.');
    expect(err({ knots: 0, direction: 1, degree: 2 }).message).toBe('degree: needs knots (K ≥ 2): the classic fit has no smooth option; got 2.');
    expect(err({ knots: 0, direction: 1, degree: 2 }).code).toBe('#VALUE!');
  });
  it('the chart summary names the shape and counts the knots of a smooth fit, not its midpoint rows (documented example)', () => {
    const shape = { curvature: -1, degree: 2 } as const;
    const view = computeFit({ x: [1, 2, 3, 4, 5, 6], y: [10, 14, 12, 17, 16, 21] }, { knots: 3, direction: 1, ...shape });
    expect(view.knots).toHaveLength(5);
    expect(fitSummary(view, false, shape)).toBe('Fit chart: 6 points, 3 knots, rising, concave, smooth, r2 0.8188.');
    expect(fitSummary(computeFit({ x: X, y: Y }, { knots: 4, direction: 1 }))).toMatch(/^Fit chart: 12 points, 4 knots, rising, r2 /);
  });
  it('words the shape in the cross-validation summary', () => {
    expect(shapeWords({})).toBe('');
    expect(shapeWords({ curvature: -1, degree: 2 })).toBe(' for concave smooth fits');
    expect(shapeWords({ curvature: 1 })).toBe(' for convex piecewise-linear fits');
  });
});

describe('dense sampling of a smooth curve', () => {
  it('steps every knot interval evenly and keeps every knot exactly (documented example)', () => {
    expect(denseXs([0, 1, 3], 2)).toEqual([0, 0.5, 1, 2, 3]);
    const knots = [0.3, 1.1, 4, 4.05];
    const xs = denseXs(knots, 20);
    expect(xs).toHaveLength(3 * 20 + 1);
    knots.forEach((t, j) => expect(xs[20 * j]).toBe(t));
    for (let i = 1; i < xs.length; i++) expect(xs[i]!).toBeGreaterThan(xs[i - 1]!);
    expect(denseXs([5])).toEqual([5]);
    expect(denseXs([])).toEqual([]);
    expect(() => denseXs([0, 1], 0)).toThrow('perInterval: needs a whole number ≥ 1; got 0.');
  });
  it('takes 24 samples per interval, fewer (never below 4) beyond 1,000 intervals', () => {
    expect(samplesPerInterval(4)).toBe(SAMPLES_PER_INTERVAL);
    expect(samplesPerInterval(1000)).toBe(24);
    expect(samplesPerInterval(2000)).toBe(12);
    expect(samplesPerInterval(99_999)).toBe(4);
    expect(2000 * samplesPerInterval(2000)).toBeLessThanOrEqual(MAX_CURVE_POINTS);
  });
  it('matches its documented example (the README example of EVAL on a smooth table)', () => {
    expect(curveDrawing([[0, 0, 2], [1, 0.75, 2], [2, 1, 2]], 4).curve).toEqual([
      { x: 0, y: 0 },
      { x: 0.5, y: 0.4375 },
      { x: 1, y: 0.75 },
      { x: 1.5, y: 0.9375 },
      { x: 2, y: 1 },
    ]);
  });
  it(`a smooth fit's curve, sampled at 20 per interval, equals Σ cⱼ Bⱼ(x) from R splines::splineDesign (${R.versions['R'] ?? 'R'}, splines ${R.versions['splines'] ?? ''}) to 1e-9 where the samples meet the fixture's x`, () => {
    const { knots, x, rows } = R.basis;
    // Invented increasing coefficients: data on this curve are fitted exactly by the smooth fit
    // (the unconstrained least-squares solution is feasible; 14 x determine the 7 coefficients).
    const c = [1, 2, 2.5, 4, 4.2, 6, 6.1];
    const f = rows.map((r) => r.reduce((s, b, j) => s + b * c[j]!, 0));
    const table = functionByName('KNOTS')!.invoke([col(f), col(x), col(knots), 1, undefined, 0, 2]) as number[][];
    expect(table.map((r) => r[2])).toEqual(new Array(2 * knots.length - 1).fill(2));
    const d = curveDrawing(table, 20);
    expect(d.smooth).toBe(true);
    expect(d.curve).toHaveLength((knots.length - 1) * 20 + 1);
    expect(d.knots.map((k) => k.x)).toEqual(knots);
    let met = 0;
    x.forEach((xi, i) => {
      const p = d.curve.find((q) => Math.abs(q.x - xi) <= 1e-12 * Math.max(1, Math.abs(xi)));
      if (!p) return;
      met++;
      expect(p.y, `x = ${xi}`).toBeCloseRel(f[i]!, 1e-9);
    });
    expect(met).toBe(12); // every fixture x but 1 (a third of [0.5, 2]) and 6.99 lies on the 20-per-interval grid
    // Every sample equals the core's reading of the same table (one evaluation path).
    const tx = table.map((r) => r[0]!);
    const ty = table.map((r) => r[1]!);
    expect(d.curve.map((q) => q.y)).toEqual(Array.from(evaluateTable(tx, ty, 'quadratic', d.curve.map((q) => q.x))));
    // Control: straight lines through the table's rows miss the curve between them.
    const polygon = Array.from(evaluateTable(tx, ty, 'linear', d.curve.map((q) => q.x)));
    const gap = Math.max(...polygon.map((v, i) => Math.abs(v - d.curve[i]!.y)));
    expect(gap).toBeGreaterThan(1e-3);
  });
  it('a piecewise-linear table is drawn through its rows, with a marker on every row', () => {
    const table = functionByName('KNOTS')!.invoke([col(Y), col(X), 4, 1, undefined, -1]) as number[][];
    const d = curveDrawing(table);
    expect(d.smooth).toBe(false);
    expect(d.curve).toEqual(table.map(([x, y]) => ({ x, y })));
    expect(d.knots).toEqual(d.curve);
  });
});

describe('the knot table download of a smooth fit', () => {
  it('keeps the third column (degree 2) so the file is read as the smooth curve', () => {
    expect(knotTableCsv([[0, 0], [1, 0.75], [2, 1]], true)).toBe('knot_x,fitted_value,degree\r\n0,0,2\r\n1,0.75,2\r\n2,1,2\r\n');
    expect(knotTableCsv([[1, 10], [3, 14]])).toBe('knot_x,fitted_value\r\n1,10\r\n3,14\r\n');
  });
});
