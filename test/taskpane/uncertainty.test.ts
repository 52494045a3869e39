/**
 * What the pane shows about uncertainty (taskpane/uncertainty.ts, the BAND / INVERTBAND formula
 * text of taskpane/formulas.ts): the band it shades, the read-back it prints and the direction
 * warning it raises go through the worksheet functions with the pane's data and settings, so they
 * equal the outside references the functions are checked against. References: R's `predict.lm`
 * bands and the classical straight-line calibration interval (Eisenhart 1939) on R's datasets, in
 * test/reference/fixtures/band_r.json (written by test/reference/gen_band.R; R and package
 * versions recorded there); Spearman's ρ of R's `cor(method = "spearman")` in the same file; the
 * README's worked examples (the invented example data of "Function reference").
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { computeFit, knotTableRows } from '../../taskpane/analysis.js';
import { bandFormulas, spillSize } from '../../taskpane/formulas.js';
import {
  argumentOf,
  bandGrid,
  bandSentence,
  computeBand,
  flatHint,
  directionCheck,
  percent,
  readBack,
  residuals,
  residualSummary,
  usedRows,
} from '../../taskpane/uncertainty.js';
import { directionText } from '../../taskpane/panels/direction-panel.js';
import { functionByName } from '../../src/functions/registry.js';
import type { CellArg, CellOut } from '../../src/functions/types.js';
import { CellFailure } from '../../taskpane/analysis.js';

interface LineCase {
  name: string;
  x: number[];
  y: number[];
  w: number[] | null;
  new_x: number[];
  bands: { level: number; fit: number[]; conf_lower: number[]; conf_upper: number[]; pred_lower: number[]; pred_upper: number[] }[];
}
interface CalibrationCase {
  name: string;
  x: number[];
  y: number[];
  w: number[] | null;
  sets: { level: number; replicates: number; intervals: { target: number; lower: number; x: number; upper: number }[] }[];
}
const fixture = JSON.parse(readFileSync(new URL('../reference/fixtures/band_r.json', import.meta.url), 'utf8')) as {
  line: LineCase[];
  calibration: CalibrationCase[];
  spearman: { name: string; x: number[]; y: number[]; spearman: number }[];
};

/** |a − b| ≤ tol · max(1, |b|). */
function close(a: number, b: number, tol: number): boolean {
  return Math.abs(a - b) <= tol * Math.max(1, Math.abs(b));
}

/** The README's example data (invented): hours 1…6, hardness. */
const hours = [1, 2, 3, 4, 5, 6];
const hardness = [10, 14, 12, 17, 16, 21];
const readme = { x: hours, y: hardness };

describe('the band the pane shades is RATCHET.BAND with the pane’s data and settings', () => {
  for (const c of fixture.line) {
    it(`${c.name}: knots 2 equals R's predict.lm confidence and prediction bands to 1e-9 (band_r.json)`, () => {
      const data = { x: c.x, y: c.y, w: c.w ?? undefined };
      for (const b of c.bands) {
        const conf = computeBand(data, { knots: 2, direction: 1 }, { level: b.level, kind: 1 }, c.new_x);
        const pred = computeBand(data, { knots: 2, direction: 1 }, { level: String(b.level), kind: 2 }, c.new_x);
        c.new_x.forEach((_x, i) => {
          expect(close(conf.lower[i]!, b.conf_lower[i]!, 1e-9), `${b.level} conf lower ${i}`).toBe(true);
          expect(close(conf.upper[i]!, b.conf_upper[i]!, 1e-9), `${b.level} conf upper ${i}`).toBe(true);
          expect(close(conf.fit[i]!, b.fit[i]!, 1e-9)).toBe(true);
          expect(close(pred.lower[i]!, b.pred_lower[i]!, 1e-9), `${b.level} pred lower ${i}`).toBe(true);
          expect(close(pred.upper[i]!, b.pred_upper[i]!, 1e-9), `${b.level} pred upper ${i}`).toBe(true);
        });
        expect([conf.level, conf.kind, pred.level, pred.kind]).toEqual([b.level, 1, b.level, 2]);
      }
    });
  }

  it('surrounds the curve drawn: its middle is the knot table read at each grid x, and prediction contains confidence', () => {
    const cars = fixture.line.find((c) => c.name === 'cars')!;
    const data = { x: cars.x, y: cars.y };
    const fit = { knots: 5, direction: 1 as const };
    const view = computeFit(data, fit);
    const grid = bandGrid(cars.x, view.knots.map(([x]) => x));
    const conf = computeBand(data, fit, { level: 0.95, kind: 1 }, grid);
    const pred = computeBand(data, fit, { level: 0.95, kind: 2 }, grid);
    const table = view.knots.map(([a, b]) => [a, b]);
    const curve = (functionByName('EVAL')!.invoke([grid.map((x) => [x]), table] as CellArg[]) as number[][]).map((r) => r[0]!);
    grid.forEach((_x, i) => {
      expect(close(conf.fit[i]!, curve[i]!, 1e-12)).toBe(true);
      expect(conf.lower[i]!).toBeLessThan(conf.fit[i]!);
      expect(conf.upper[i]!).toBeGreaterThan(conf.fit[i]!);
      expect(pred.lower[i]!).toBeLessThan(conf.lower[i]!);
      expect(pred.upper[i]!).toBeGreaterThan(conf.upper[i]!);
    });
  });

  it('refuses the classic fit and a level outside (0, 1) with BAND’s own messages, naming the argument', () => {
    let err: unknown;
    try {
      computeBand(readme, { knots: 0, direction: 1 }, { level: 0.95, kind: 1 }, [3.5]);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(CellFailure);
    expect((err as CellFailure).code).toBe('#VALUE!');
    expect((err as CellFailure).message).toMatch(/^knots: BAND needs the knot model/);
    expect(argumentOf(err)).toBe('knots');
    expect(() => computeBand(readme, { knots: 2, direction: 1 }, { level: '1.5', kind: 1 }, [3.5])).toThrow('level: needs a number strictly between 0 and 1; got 1.5.');
    expect(() => computeBand(readme, { knots: 2, direction: 1 }, { level: 'abc', kind: 1 }, [3.5])).toThrow('level: needs a number; got the text "abc".');
  });

  it('matches the README examples of RATCHET.BAND to their 6 digits', () => {
    const b = computeBand(readme, { knots: 2, direction: 1 }, { level: 0.95, kind: 1 }, [3.5]);
    expect([b.lower[0]!, b.fit[0]!, b.upper[0]!].map((v) => Number(v.toPrecision(6)))).toEqual([12.8968, 15, 17.1032]);
    const p = computeBand(readme, { knots: 2, direction: 1 }, { level: 0.9, kind: 2 }, [3.5]);
    expect([p.lower[0]!, p.upper[0]!].map((v) => Number(v.toPrecision(6)))).toEqual([10.7274, 19.2726]);
  });
});

describe('bandGrid', () => {
  it('matches its documented example and spans exactly the data’s x range', () => {
    expect(bandGrid([0, 1, 2], [0, 0.5, 2], 4)).toEqual([0, 0.5, 1, 1.5, 2]);
    const g = bandGrid([3, -1, 7], [-1, 2.25, 7]); // 2.25 lies between grid steps of 1/15
    expect([g[0], g[g.length - 1], g.length]).toEqual([-1, 7, 122]);
    expect(g.includes(2.25)).toBe(true);
    for (let i = 1; i < g.length; i++) expect(g[i]!).toBeGreaterThan(g[i - 1]!);
  });
  it('gives [] without data and one x when all x are equal', () => {
    expect(bandGrid([], [1, 2])).toEqual([]);
    expect(bandGrid([4, 4], [4])).toEqual([4]);
  });
});

describe('the residual plot', () => {
  it('shows y − FIT for the rows used, leaving blank rows out (the blank-cell rule)', () => {
    const rows = usedRows({ x: [1, 2, null, 4], y: [1, 3, 2, 2] }, { knots: 0, direction: 1 });
    // classic fit of (1, 1), (2, 3), (4, 2): PAVA pools 3 and 2 → 2.5 (hand computation)
    expect(rows.fitted).toEqual([1, 2.5, 2.5]);
    expect(residuals(rows)).toEqual([
      { x: 1, y: 0 },
      { x: 2, y: 0.5 },
      { x: 4, y: -0.5 },
    ]);
  });
  it('weighted residuals of a least-squares fit sum to zero (the hat functions add up to 1), on cars with invented weights', () => {
    const c = fixture.line.find((q) => q.name === 'cars_weighted')!;
    const rows = usedRows({ x: c.x, y: c.y, w: c.w! }, { knots: 4, direction: 1 });
    const r = residuals(rows);
    const sum = r.reduce((s, p, i) => s + rows.w[i]! * p.y, 0);
    const scale = r.reduce((s, p, i) => s + rows.w[i]! * Math.abs(p.y), 0);
    expect(Math.abs(sum)).toBeLessThan(1e-10 * scale);
    expect(rows.w).toEqual(c.w);
  });
  it('says what it shows in one sentence, numbers through the formatter', () => {
    expect(residualSummary([{ x: 1, y: -0.5 }, { x: 2, y: 0.25 }], String)).toBe('Residual plot: 2 residuals (y − fitted) against x, from -0.5 to 0.25; dashed zero line.');
    expect(residualSummary([], String)).toBe('Residual plot: no fit drawn.');
  });
});

describe('the read-back box is RATCHET.INVERTBAND (INVERT for the classic fit)', () => {
  for (const c of fixture.calibration) {
    it(`${c.name}: knots 2 equals the classical calibration interval computed in R to 1e-8 (band_r.json)`, () => {
      const data = { x: c.x, y: c.y, w: c.w ?? undefined };
      const fit = { knots: 2, direction: 1 as const };
      const view = computeFit(data, fit);
      for (const s of c.sets) {
        for (const q of s.intervals) {
          const r = readBack(data, fit, view.knots, String(q.target), String(s.level), String(s.replicates));
          expect(r.source).toBe('INVERTBAND');
          expect(close(r.lower as number, q.lower, 1e-8), `${q.target} lower`).toBe(true);
          expect(close(r.x as number, q.x, 1e-8)).toBe(true);
          expect(close(r.upper as number, q.upper, 1e-8), `${q.target} upper`).toBe(true);
        }
      }
    });
  }

  it('matches the README examples: an interval, a lower limit not reached, a target outside the curve', () => {
    const fit = { knots: 2, direction: 1 as const };
    const view = computeFit(readme, fit);
    const six = (v: unknown): unknown => (typeof v === 'number' ? Number(v.toPrecision(6)) : (v as { code: string }).code);
    const a = readBack(readme, fit, view.knots, 15, 0.8, 4);
    expect([a.lower, a.x, a.upper].map(six)).toEqual([2.45592, 3.5, 4.54408]);
    const b = readBack(readme, fit, view.knots, '12', '0.8', '4');
    expect([b.lower, b.x, b.upper].map(six)).toEqual(['#N/A', 1.90909, 2.90618]);
    expect((b.lower as { message: string }).message).toBe("target_ys: needs a band whose upper edge falls to 12 inside the data's x range; the lower x limit lies below 1.");
    const c = readBack(readme, fit, view.knots, 30, 0.95, 1);
    expect([c.lower, c.x, c.upper].map(six)).toEqual(['#N/A', '#N/A', '#N/A']);
  });

  it('the classic fit reads back with RATCHET.INVERT on its knot table (no interval)', () => {
    const fit = { knots: 0, direction: 1 as const };
    const view = computeFit(readme, fit);
    const r = readBack(readme, fit, view.knots, '15', 0.95, 1);
    const invert = functionByName('INVERT')!.invoke([[[15]], view.knots.map(([a, b]) => [a, b])] as CellArg[]);
    expect([r.source, r.lower, r.upper]).toEqual(['INVERT', undefined, undefined]);
    expect(r.x).toBe(Array.isArray(invert) ? invert[0]![0] : invert);
  });

  it('a target that is not a number, or too few readings, is refused by the function, naming the argument', () => {
    const fit = { knots: 2, direction: 1 as const };
    const view = computeFit(readme, fit);
    let err: unknown;
    try {
      readBack(readme, fit, view.knots, 'about 15', 0.95, 1);
    } catch (e) {
      err = e;
    }
    expect(argumentOf(err)).toBe('target_ys');
    expect(() => readBack(readme, fit, view.knots, 15, 0.95, '0.5')).toThrow('replicates: needs a number ≥ 1; got 0.5.');
  });
});

describe('the direction warning', () => {
  const mtcars = fixture.spearman.find((c) => c.name === 'mtcars')!;
  it("mtcars mpg ~ wt fitted rising warns with R's rho (-0.886) and suggests falling; fitted falling: none", () => {
    const data = { x: mtcars.x, y: mtcars.y };
    const rising = directionCheck(usedRows(data, { knots: 0, direction: 1 }), 1);
    expect(rising?.suggested).toBe('down');
    expect(close(rising!.spearman, mtcars.spearman, 1e-12)).toBe(true);
    expect(rising!.n).toBe(32);
    expect(directionCheck(usedRows(data, { knots: 0, direction: -1 }), -1)).toBeNull();
  });
  it('leaves rows of weight 0 out, as the rule says', () => {
    const x = [1, 2, 3, 4, 5, 6, 7, 8];
    const y = [8, 7, 6, 5, 4, 3, 2, 1];
    const rows = usedRows({ x, y, w: [1, 1, 1, 0, 0, 0, 0, 0] }, { knots: 0, direction: 1 });
    expect(rows.x.length).toBe(8);
    expect(directionCheck(rows, 1)).toBeNull(); // 3 rows with positive weight: fewer than 4
    expect(directionCheck(usedRows({ x, y }, { knots: 0, direction: 1 }), 1)?.n).toBe(8);
  });
  it('words the warning with the rank correlation to the digits shown (default 4)', () => {
    expect(directionText({ direction: 'up', suggested: 'down', spearman: -0.88571428, n: 32 })).toBe(
      'y falls as x rises (Spearman’s rank correlation -0.8857, 32 rows), but the fit is rising: a rising curve through falling data comes out flat. Fit it falling instead?',
    );
    expect(directionText({ direction: 'down', suggested: 'up', spearman: 0.5, n: 12 })).toBe(
      'y rises as x rises (Spearman’s rank correlation 0.5, 12 rows), but the fit is falling: a falling curve through rising data comes out flat. Fit it rising instead?',
    );
  });
});

describe('BAND and INVERTBAND formulas', () => {
  const refs = { x: 'Data!$A$2:$A$29', y: 'Data!$B$2:$B$29', w: 'Data!$C$2:$C$29' };
  it('follow the functions’ argument order, with level, kind and replicates written out', () => {
    const f = bandFormulas(refs, { knots: 5, direction: -1 }, { level: 0.9, kind: 2, replicates: 3, targets: 'Data!$E$2:$E$4' }, 'Data!$F$2:$F$9');
    expect(f.BAND).toBe('=RATCHET.BAND(Data!$F$2:$F$9,Data!$B$2:$B$29,Data!$A$2:$A$29,5,-1,Data!$C$2:$C$29,0.9,2)');
    expect(f.INVERTBAND).toBe('=RATCHET.INVERTBAND(Data!$E$2:$E$4,Data!$B$2:$B$29,Data!$A$2:$A$29,5,-1,Data!$C$2:$C$29,0.9,3)');
    expect(bandFormulas({ y: '$B$2:$B$7', x: '$A$2:$A$7' }, { knots: 2, direction: 1 }, { level: 0.9, kind: 2, replicates: 1, targets: '15' }).INVERTBAND).toBe(
      '=RATCHET.INVERTBAND(15,$B$2:$B$7,$A$2:$A$7,2,1,,0.9,1)',
    );
  });
  it('are not offered for the classic fit, and INVERTBAND not without a target', () => {
    expect(bandFormulas(refs, { knots: 0, direction: 1 }, { level: 0.95, kind: 1, replicates: 1, targets: '3' })).toEqual({});
    expect(Object.keys(bandFormulas(refs, { knots: 3, direction: 1 }, { level: 0.95, kind: 1, replicates: 1 }))).toEqual(['BAND']);
  });
  it('spill three values per new x or target: three columns for a column or one cell, three rows for a row', () => {
    const s = { knotRows: 4, candidates: 5, newXs: { rows: 28, cols: 1 } };
    expect(spillSize('BAND', s)).toEqual({ rows: 28, cols: 3 });
    expect(spillSize('BAND', { ...s, newXs: { rows: 1, cols: 6 } })).toEqual({ rows: 3, cols: 6 });
    expect(spillSize('INVERTBAND', s)).toEqual({ rows: 1, cols: 3 });
    expect(spillSize('INVERTBAND', { ...s, targets: { rows: 4, cols: 1 } })).toEqual({ rows: 4, cols: 3 });
    // the functions themselves: a row of new x gives three rows
    const row = functionByName('BAND')!.invoke([[[2, 3, 4]], hardness.map((v) => [v]), hours.map((v) => [v]), 2] as CellArg[]) as unknown[][];
    expect([row.length, row[0]!.length]).toEqual([3, 3]);
    const one = functionByName('INVERTBAND')!.invoke([[[15]], hardness.map((v) => [v]), hours.map((v) => [v]), 2, 1, undefined, 0.8, 4] as CellArg[]) as unknown[][];
    expect([one.length, one[0]!.length]).toEqual([1, 3]);
  });
});

describe('shapes: the band and the read-back follow the curvature and degree of the fit shown', () => {
  const cars = fixture.line.find((c) => c.name === 'cars')!;
  const data = { x: cars.x, y: cars.y };
  it('a concave band is RATCHET.BAND with curvature -1 (the argument after kind)', () => {
    const fit = { knots: 5, direction: 1 as const, curvature: -1 as const };
    const b = computeBand(data, fit, { level: 0.9, kind: 1 }, [5, 12.5, 25]);
    const ref = functionByName('BAND')!.invoke([[[5], [12.5], [25]], cars.y.map((v) => [v]), cars.x.map((v) => [v]), 5, 1, undefined, 0.9, 1, -1] as CellArg[]) as number[][];
    expect([b.lower, b.fit, b.upper]).toEqual([ref.map((r) => r[0]), ref.map((r) => r[1]), ref.map((r) => r[2])]);
    // and it differs from the unshaped band (the shape changes the reduced design)
    const plain = computeBand(data, { knots: 5, direction: 1 }, { level: 0.9, kind: 1 }, [5, 12.5, 25]);
    expect(plain.upper).not.toEqual(b.upper);
    expect(bandFormulas({ y: '$B$2:$B$51', x: '$A$2:$A$51' }, fit, { level: 0.9, kind: 1, replicates: 1, targets: '40' })).toEqual({
      BAND: '=RATCHET.BAND($A$2:$A$51,$B$2:$B$51,$A$2:$A$51,5,1,,0.9,1,-1)',
      INVERTBAND: '=RATCHET.INVERTBAND(40,$B$2:$B$51,$A$2:$A$51,5,1,,0.9,1,-1)',
    });
  });
  it('the smooth curve (degree 2) has a band and a read-back interval: the pane shows RATCHET.BAND and RATCHET.INVERTBAND with degree 2, and inserts both formulas', () => {
    const fit = { knots: 4, direction: 1 as const, degree: 2 as const };
    const band = computeBand(data, fit, { level: 0.95, kind: 1 }, [10]);
    const direct = functionByName('BAND')!.invoke([[[10]], data.y.map((v) => [v]), data.x.map((v) => [v]), 4, 1, undefined, 0.95, 1, undefined, 2] as CellArg[]) as CellOut[][];
    expect([band.lower[0], band.fit[0], band.upper[0]]).toEqual(direct[0]);
    expect(band.lower[0]!).toBeLessThan(band.fit[0]!);
    const formulas = bandFormulas({ y: 'B2:B51', x: 'A2:A51' }, fit, { level: 0.95, kind: 1, replicates: 1, targets: '40' });
    expect(formulas.BAND).toMatch(/^=RATCHET\.BAND\(.*,2\)$/);
    expect(formulas.INVERTBAND).toMatch(/^=RATCHET\.INVERTBAND\(.*,2\)$/);
    const view = computeFit(data, fit);
    const table = knotTableRows(view);
    const r = readBack(data, fit, table, 40, 0.95, 1);
    const invert = functionByName('INVERT')!.invoke([[[40]], table] as CellArg[]);
    expect(r.source).toBe('INVERTBAND');
    // The middle value is RATCHET.INVERT's on the smooth table.
    expect(r.x).toBeCloseTo(Number(Array.isArray(invert) ? invert[0]![0] : invert), 12);
  });
});

describe('the flat-stretch caution under a band', () => {
  it('appears when the fit joined knots (STATS levels < knots), and not for a strictly rising fit', () => {
    const x = [1, 2, 3, 4, 5, 6, 7, 8];
    const falling = { x, y: [9, 8, 8, 6, 5, 4, 2, 1] };
    expect(flatHint(computeFit(falling, { knots: 4, direction: 1 }))).toBe(
      'The curve has flat stretches (4 knots at 1 distinct value): the band treats them as known and is optimistic near them (README “Cautions for bands”).',
    );
    expect(flatHint(computeFit({ x, y: x.map((v) => 2 * v + 1) }, { knots: 4, direction: 1 }))).toBe('');
    expect(flatHint({ stats: [['knots', 5], ['levels', 3]] })).toMatch(/^The curve has flat stretches \(5 knots at 3 distinct values\)/);
  });
});

describe('words', () => {
  it('a level as a percentage, the band sentence of the chart’s text alternative', () => {
    expect([percent(0.95), percent(0.975), percent(0.5)]).toEqual(['95', '97.5', '50']);
    expect(bandSentence({ level: 0.95, kind: 1 })).toBe('95 % confidence band for the curve shaded.');
    expect(bandSentence({ level: 0.9, kind: 2 })).toBe('90 % prediction band for one new observation shaded.');
    expect(bandSentence(undefined, 'the classic fit.')).toBe('No band: the classic fit.');
  });
});
