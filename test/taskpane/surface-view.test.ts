/**
 * The pane's surface heat-map, without a browser: the cells it passes to RATCHET.GRID (through
 * the registry), the view it draws from GRID's table, the formula it offers, and the colour scale.
 *
 * Reference values: the 3 × 3 example of docs/methods.md, Y = [[1,3,2],[0,2,5],[4,1,6]] with unit weights
 * → [[1/2,7/3,7/3],[1/2,7/3,5],[5/2,5/2,6]] (Iso::biviso 0.0-18.1, r-cran-iso; see
 * test/surface/surface.reference.test.ts), and the core's fitSurface called directly (a route that
 * does not pass through the worksheet functions' cell parsing). Contrast ratios and relative
 * luminance follow W3C WCAG 2.1 (definitions "contrast ratio", "relative luminance"); 4.5 : 1 is
 * its level-AA minimum for normal text.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fitSurface } from '../../src/core/index.js';
import { buildSamples } from '../../scripts/samples/samples.js';
import { CellFailure } from '../../taskpane/analysis.js';
import { computeSurface, directionWords, gridArgs, gridFormula, gridSpill, knotField, latticeTrend, type SurfaceSettings } from '../../taskpane/surface-view.js';
import { cellText, contrast, heatColour, heatmapFromGrid, hex, luminance, oklchToRgb, textColourOn } from '../../src/view/heat-scale.js';
import type { CellValueIn } from '../../src/functions/types.js';

const CLASSIC: SurfaceSettings = { knots1: 0, knots2: 0, direction1: 1, direction2: 1 };

// The 3 × 3 worked example of docs/methods.md ("Surfaces") as three columns of cells: x1 = column index, x2 = row index of Y.
const X1: CellValueIn[] = [0, 1, 2, 0, 1, 2, 0, 1, 2];
const X2: CellValueIn[] = [0, 0, 0, 1, 1, 1, 2, 2, 2];
const Y: CellValueIn[] = [1, 3, 2, 0, 2, 5, 4, 1, 6];
const EXPECTED = [
  [1 / 2, 7 / 3, 7 / 3],
  [1 / 2, 7 / 3, 5],
  [5 / 2, 5 / 2, 6],
];

describe('surface data wiring (RATCHET.GRID through the registry)', () => {
  it('passes known_ys, x, x2, knots1, knots2, direction1, direction2 and weights as one-column ranges, in that order', () => {
    const s: SurfaceSettings = { knots1: 4, knots2: 3, direction1: -1, direction2: 2 };
    expect(gridArgs({ x: [1, 2], y: [3, 4] }, [5, 6], s)).toEqual([[[3], [4]], [[1], [2]], [[5], [6]], 4, 3, -1, 2]);
    expect(gridArgs({ x: [1, 2], y: [3, 4], w: [1, 2] }, [5, 6], s)).toEqual([[[3], [4]], [[1], [2]], [[5], [6]], 4, 3, -1, 2, [[1], [2]]]);
  });

  it('the 3 × 3 example: knots across and down, the biviso lattice inside', () => {
    const v = computeSurface({ x: X1, y: Y }, X2, CLASSIC);
    expect(v.knots1).toEqual([0, 1, 2]);
    expect(v.knots2).toEqual([0, 1, 2]);
    v.values.forEach((row, b) => expect(row).toBeAllCloseRel(EXPECTED[b]!, 1e-12));
    expect(v.min).toBeCloseRel(0.5, 1e-12);
    expect(v.max).toBeCloseRel(6, 1e-12);
    expect(v.cells.length).toBe(3);
    expect(v.cells.every((r) => r.length === 3)).toBe(true);
    expect(v.cells[0]![1]!.text).toBe('2.333'); // 4 significant digits, the pane's default
  });

  it('leaves out a row whose x2 is blank and refuses text in x2, as the worksheet function does', () => {
    // An extra row with a blank x2 may not change the lattice.
    const v = computeSurface({ x: [...X1, 1], y: [...Y, 100] }, [...X2, null], CLASSIC);
    v.values.forEach((row, b) => expect(row).toBeAllCloseRel(EXPECTED[b]!, 1e-12));
    expect(() => computeSurface({ x: [...X1, 1], y: [...Y, 100] }, [...X2, 'n/a'], CLASSIC)).toThrow('known_x2s: needs numbers or blanks; cell 10 is the text "n/a".');
  });

  it('uses the weight column', () => {
    const w: CellValueIn[] = [1, 1, 1, 1, 1, 1, 1, 1, 1];
    const heavy = w.slice();
    heavy[4] = 1000; // the centre value 2 dominates its pool
    const even = computeSurface({ x: X1, y: Y, w }, X2, CLASSIC);
    const weighted = computeSurface({ x: X1, y: Y, w: heavy }, X2, CLASSIC);
    even.values.forEach((row, b) => expect(row).toBeAllCloseRel(EXPECTED[b]!, 1e-12));
    expect(weighted.values[1]![1]).not.toBeCloseRel(7 / 3, 1e-3);
    const core = fitSurface(X1 as number[], X2 as number[], Y as number[], { weights: heavy as number[] });
    expect(weighted.values.flat()).toBeAllCloseRel(Array.from(core.values), 1e-12);
  });

  it('on the coating-cure sample equals fitSurface called directly, for a knot lattice and the classic case', () => {
    const s = buildSamples().find((q) => q.file === 'coating-cure.xlsx')!;
    const [x1, x2, y] = [s.columns.A!, s.columns.B!, s.columns.C!] as number[][];
    for (const [k1, k2] of [
      [4, 3],
      [0, 0],
      [2, 5],
    ] as const) {
      const v = computeSurface({ x: x1!, y: y! }, x2!, { knots1: k1, knots2: k2, direction1: 1, direction2: 1 });
      const m = fitSurface(x1!, x2!, y!, { knots1: k1, knots2: k2 });
      expect(v.knots1).toBeAllCloseRel(Array.from(m.knots1), 1e-12);
      expect(v.knots2).toBeAllCloseRel(Array.from(m.knots2), 1e-12);
      expect(v.values.flat()).toBeAllCloseRel(Array.from(m.values), 1e-12);
      expect(v.cells.flat().length).toBe(m.knots1.length * m.knots2.length);
      // monotone along both inputs, as the model promises
      for (const row of v.values) for (let a = 1; a < row.length; a++) expect(row[a]!).toBeGreaterThanOrEqual(row[a - 1]!);
      for (let b = 1; b < v.values.length; b++) v.values[b]!.forEach((val, a) => expect(val).toBeGreaterThanOrEqual(v.values[b - 1]![a]!));
    }
  });

  it('reports what a cell would show when the data do not fit', () => {
    expect(() => computeSurface({ x: X1, y: Y }, X2.slice(0, 8), CLASSIC)).toThrow(CellFailure);
    expect(() => computeSurface({ x: X1, y: Y }, X2.slice(0, 8), CLASSIC)).toThrow('known_x2s: needs one cell per cell of known_ys (9); got 8.');
    expect(() => computeSurface({ x: X1, y: Y }, X2, { ...CLASSIC, knots1: 1 })).toThrow(/^knots1: /);
  });

  it('offers the GRID formula over the chosen references, and knows the area it fills', () => {
    const s: SurfaceSettings = { knots1: 4, knots2: 3, direction1: 1, direction2: -1 };
    expect(gridFormula({ y: 'Data!$C$2:$C$49', x: 'Data!$A$2:$A$49' }, 'Data!$B$2:$B$49', s)).toBe('=RATCHET.GRID(Data!$C$2:$C$49,Data!$A$2:$A$49,Data!$B$2:$B$49,4,3,1,-1)');
    expect(gridFormula({ y: 'T[y]', x: 'T[x]', w: 'T[w]' }, 'T[x2]', CLASSIC)).toBe('=RATCHET.GRID(T[y],T[x],T[x2],0,0,1,1,T[w])');
    expect(gridSpill({ knots1: [1, 2, 3, 4], knots2: [1, 2, 3] })).toEqual({ rows: 4, cols: 5 });
    expect([knotField(''), knotField(' 4 '), knotField('0')]).toEqual([0, 4, 0]);
  });

  it('the status words name each direction; for 0 they say which way the fitted lattice runs (the choice made)', () => {
    // Invented data falling along x2 and rising along x: the 2 × 2 lattice reproduces them.
    const data = { x: [0, 1, 0, 1], y: [3, 4, 1, 2] };
    const x2 = [0, 0, 1, 1];
    const auto = computeSurface(data, x2, { knots1: 0, knots2: 0, direction1: 0, direction2: 0 });
    expect(auto.values).toEqual([[3, 4], [1, 2]]);
    expect([latticeTrend(auto, 1), latticeTrend(auto, 2)]).toEqual(['rising', 'falling']);
    expect([directionWords(0, latticeTrend(auto, 1)), directionWords(0, latticeTrend(auto, 2))]).toEqual(['picked from the data: rising', 'picked from the data: falling']);
    // Forced to rise along x2 as well, the lattice is flat along it.
    const forced = computeSurface(data, x2, { knots1: 0, knots2: 0, direction1: 1, direction2: 1 });
    expect(latticeTrend(forced, 2)).toBe('flat');
    expect(latticeTrend({ values: [[1, 3, 2]] }, 1)).toBe('both');
    expect([directionWords(1, 'flat'), directionWords(-1, 'flat'), directionWords(2, 'both'), directionWords(0, 'both')]).toEqual(['rising', 'falling', 'no constraint', 'picked from the data']);
  });
});

describe('heat-map view of a GRID table', () => {
  it('maps the lowest value to the start of the scale and the highest to its end', () => {
    const v = heatmapFromGrid([
      ['', 10, 20],
      [1, 0, 5],
      [2, 5, 10],
    ]);
    expect(v.cells.flat().map((c) => c.t)).toEqual([0, 0.5, 0.5, 1]);
    expect(v.cells[0]![0]!.background).toBe(hex(heatColour(0)));
    expect(v.cells[1]![1]!.background).toBe(hex(heatColour(1)));
    expect(v.cells.flat().map((c) => c.text)).toEqual(['0', '5', '5', '10']);
  });

  it('draws a flat surface in one colour', () => {
    const v = heatmapFromGrid([
      ['', 1, 2],
      [1, 3.5, 3.5],
    ]);
    expect(new Set(v.cells.flat().map((c) => c.background)).size).toBe(1);
    expect(v.cells[0]!.map((c) => c.t)).toEqual([0, 0]);
  });

  it('refuses a table not shaped like GRID', () => {
    expect(() => heatmapFromGrid([['', 1, 2]])).toThrow('not a GRID table: needs a header row and at least one row of values');
    expect(() => heatmapFromGrid([['', 1, 2], [1, 3]])).toThrow('not a GRID table: row 2 has 2 cells, the header 3');
    expect(() => heatmapFromGrid([['', 1, 2], [1, 3, '#NUM!']])).toThrow('not a GRID table: value 1,2 is "#NUM!"');
    expect(() => heatmapFromGrid(7)).toThrow('not a GRID table');
  });

  it('shows numbers to 4 significant digits by default and to the digits asked for otherwise', () => {
    expect([cellText(3), cellText(7 / 3), cellText(-0.000123456789), cellText(1e21), cellText(28.679391)]).toEqual(['3', '2.333', '-0.0001235', '1e+21', '28.68']);
    expect([cellText(7 / 3, 8), cellText(28.679391, 6), cellText(7 / 3, 17)]).toEqual(['2.3333333', '28.6794', '2.3333333333333335']);
  });
});

describe('colour scale', () => {
  it('OKLab lightness 1 is white and 0 is black', () => {
    expect(oklchToRgb(1, 0, 0)).toEqual({ r: 255, g: 255, b: 255 });
    expect(oklchToRgb(0, 0, 0)).toEqual({ r: 0, g: 0, b: 0 });
  });

  it('gets darker with every step from the lowest to the highest value (order readable in grey)', () => {
    const steps = Array.from({ length: 101 }, (_, i) => luminance(heatColour(i / 100)));
    for (let i = 1; i < steps.length; i++) expect(steps[i]!).toBeLessThan(steps[i - 1]!);
    expect(steps[0]! / steps[100]!).toBeGreaterThan(20); // a wide lightness range
  });

  it('clamps t outside [0, 1] and treats NaN as 0', () => {
    expect(heatColour(-3)).toEqual(heatColour(0));
    expect(heatColour(7)).toEqual(heatColour(1));
    expect(heatColour(NaN)).toEqual(heatColour(0));
  });

  it('every cell text contrasts at least 4.5 : 1 with its background (WCAG 2.1 AA), whatever the theme', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true }), (t) => {
        const bg = heatColour(t);
        expect(contrast(bg, textColourOn(bg))).toBeGreaterThanOrEqual(4.5);
      }),
    );
    expect(contrast({ r: 0, g: 0, b: 0 }, { r: 255, g: 255, b: 255 })).toBeCloseRel(21, 1e-12);
  });

  it('writes colours as #rrggbb', () => {
    expect(hex({ r: 0, g: 15, b: 255 })).toBe('#000fff');
    expect(hex(heatColour(0))).toMatch(/^#[0-9a-f]{6}$/);
  });
});
