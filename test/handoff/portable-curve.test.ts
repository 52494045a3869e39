/**
 * The portable curve (src/adapter/portable-curve.ts): a formula of Excel built-ins only that must
 * give what RATCHET.EVAL gives for the same knot table. Both are evaluated by the headless runner
 * (HyperFormula) in one workbook, at more than 1,000 new x: every knot, the midpoints between
 * knots, both ends, values far outside the range and random values (fast-check, fixed seed).
 * Data: R's datasets `cars` and `pressure`, as exported into test/reference/fixtures/cv_datasets.json
 * by test/reference/gen_core.R / gen_cv.py (`npm run refs`).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { portableCurveBlock, portableCurveFormula } from '../../src/adapter/portable-curve.js';
import { cellName } from '../../src/runner/address.js';
import { isRatchetError } from '../../src/core/index.js';
import { evaluate, type Setup, type SetupCell } from '../runner/helpers.js';

interface DatasetCase {
  name: string;
  x: number[];
  y: number[];
}
const cases = (JSON.parse(readFileSync(new URL('../reference/fixtures/cv_datasets.json', import.meta.url), 'utf8')) as { cases: DatasetCase[] }).cases;
const cars = cases.find((c) => c.name.startsWith('cars'))!;
const pressure = cases.find((c) => c.name.startsWith('pressure'))!;

/** The knot table RATCHET.KNOTS returns for the data (evaluated by the runner). */
function knotTable(x: number[], y: number[], knots: number): number[][] {
  const data: Record<string, SetupCell> = {};
  x.forEach((v, i) => {
    data[`A${i + 2}`] = v;
    data[`B${i + 2}`] = y[i]!;
  });
  const n = x.length + 1;
  data.D2 = { f: `RATCHET.KNOTS(B2:B${n},A2:A${n},${knots})` };
  const rows = evaluate({ Data: data }).result('Data!D2');
  for (const r of rows) for (const v of r) if (typeof v !== 'number') throw new Error(`KNOTS gave ${JSON.stringify(rows)}`);
  return rows as number[][];
}

/**
 * New x for a table: the knots, midpoints, ends, far outside, and seeded random values around the
 * range (without magnitudes below 1e-300, which the add-in refuses and the formula reads).
 */
function probes(table: number[][]): number[] {
  const t = table.map((r) => r[0]!);
  const lo = t[0]!;
  const hi = t[t.length - 1]!;
  const span = hi - lo;
  const out = [...t, lo - span, lo - 1e-9 * span, hi + 1e-9 * span, hi + span, -1e6, 1e6, 0];
  for (let j = 0; j + 1 < t.length; j++) out.push((t[j]! + t[j + 1]!) / 2);
  const random = fc.sample(fc.double({ min: lo - 0.2 * span, max: hi + 0.2 * span, noNaN: true }).filter((v) => v === 0 || Math.abs(v) >= 1e-300), { seed: 20261201, numRuns: 1000 });
  return [...out, ...random];
}

/** Evaluates the portable formula and RATCHET.EVAL side by side for every probe. */
function compare(table: number[][], xs: readonly (number | string | null)[]) {
  const sheet: Record<string, SetupCell> = {};
  table.forEach((r, i) => {
    sheet[`D${i + 2}`] = r[0]!;
    sheet[`E${i + 2}`] = r[1]!;
  });
  xs.forEach((v, i) => {
    const row = i + 2;
    sheet[`G${row}`] = v;
    sheet[`H${row}`] = { f: portableCurveFormula({ topLeft: 'D2', rows: table.length }, `G${row}`).slice(1) };
    sheet[`I${row}`] = { f: `RATCHET.EVAL(G${row},$D$2:$E$${table.length + 1})` };
  });
  const setup: Setup = { Curve: sheet };
  const book = evaluate(setup);
  return xs.map((_v, i) => ({ x: xs[i], portable: book.value(`Curve!H${i + 2}`), add_in: book.value(`Curve!I${i + 2}`) }));
}

describe('portableCurveFormula evaluated by the runner equals RATCHET.EVAL', () => {
  it.each([
    ['cars, classic fit', cars, 0],
    ['cars, 5 knots', cars, 5],
    ['pressure, 4 knots', pressure, 4],
  ] as const)('%s: at ≥ 1,000 x (knots, midpoints, ends, outside, random) to 1e-12 relative', (_name, data, knots) => {
    const table = knotTable(data.x, data.y, knots);
    expect(table.length).toBeGreaterThanOrEqual(knots === 0 ? 3 : knots);
    const xs = probes(table);
    expect(xs.length).toBeGreaterThanOrEqual(1000);
    const scale = Math.max(...table.map((r) => Math.abs(r[1]!)));
    const bad = compare(table, xs).filter((r) => typeof r.portable !== 'number' || typeof r.add_in !== 'number' || Math.abs(r.portable - r.add_in) > 1e-12 * scale);
    expect(bad.slice(0, 5)).toEqual([]);
  });

  it('beyond the ends both give the end values exactly, and at each knot its fitted value', () => {
    const table = knotTable(cars.x, cars.y, 5);
    const t = table.map((r) => r[0]!);
    const rows = compare(table, [t[0]! - 100, t[t.length - 1]! + 100, ...t]);
    expect(rows[0]!.portable).toBe(table[0]![1]);
    expect(rows[1]!.portable).toBe(table[table.length - 1]![1]);
    rows.slice(2).forEach((r, j) => expect(Math.abs((r.portable as number) - table[j]![1]!)).toBeLessThanOrEqual(1e-12 * Math.abs(table[j]![1]!)));
  });

  it('a blank new x gives an empty result and text gives #VALUE!, as RATCHET.EVAL does', () => {
    const table = knotTable(cars.x, cars.y, 3);
    const [blank, text] = compare(table, [null, 'n/a']);
    expect(blank!.portable === '' || blank!.portable === null).toBe(true);
    expect(blank!.add_in === '' || blank!.add_in === null).toBe(true);
    expect(text!.portable).toBe('#VALUE!');
    expect(text!.add_in).toBe('#VALUE!');
  });

  it('a one-knot table predicts its one value for every number', () => {
    const rows = compare([[5, 7.5]], [-3, 5, 99]);
    expect(rows.map((r) => r.portable)).toEqual([7.5, 7.5, 7.5]);
  });
});

describe('portableCurveFormula text', () => {
  it('uses only built-in functions: no RATCHET call, no LET, no dynamic-array function, no spill reference', () => {
    const f = portableCurveFormula({ sheet: 'Knot table', topLeft: '$D$2', rows: 12 }, 'A2');
    const used = [...f.matchAll(/([A-Z][A-Z0-9.]*)\(/g)].map((m) => m[1]);
    expect(new Set(used)).toEqual(new Set(['IF', 'ISBLANK', 'ISNUMBER', 'INDEX', 'MATCH']));
    expect(f).not.toMatch(/#(?!VALUE!)/);
    expect(f).toContain("'Knot table'!$D$2:$D$13");
    expect(f).toContain("'Knot table'!$E$2:$E$13");
  });

  it('matches its documented example literally', () => {
    expect(portableCurveFormula({ topLeft: 'D2', rows: 3 }, 'G2')).toBe(
      '=IF(ISBLANK(G2),"",IF(ISNUMBER(G2),IF(G2<=INDEX($D$2:$D$4,1),INDEX($E$2:$E$4,1),IF(G2>=INDEX($D$2:$D$4,3),INDEX($E$2:$E$4,3),INDEX($E$2:$E$4,MATCH(G2,$D$2:$D$4,1))+(G2-INDEX($D$2:$D$4,MATCH(G2,$D$2:$D$4,1)))/(INDEX($D$2:$D$4,MATCH(G2,$D$2:$D$4,1)+1)-INDEX($D$2:$D$4,MATCH(G2,$D$2:$D$4,1)))*(INDEX($E$2:$E$4,MATCH(G2,$D$2:$D$4,1)+1)-INDEX($E$2:$E$4,MATCH(G2,$D$2:$D$4,1))))),#VALUE!))',
    );
  });

  it.each([
    [{ topLeft: 'D0', rows: 3 }, 'A2', 'topLeft: needs one cell address such as D2 or $D$2; got "D0".'],
    [{ topLeft: 'XFD2', rows: 3 }, 'A2', 'topLeft: needs room for two columns; XFD2 is in the last column.'],
    [{ topLeft: 'D2', rows: 0 }, 'A2', 'rows: needs a whole number of knots from 1 to 1048575 (the rows below D2); got 0.'],
    [{ topLeft: 'D2', rows: 2.5 }, 'A2', 'rows: needs a whole number of knots from 1 to 1048575 (the rows below D2); got 2.5.'],
    [{ topLeft: 'D2', rows: 3 }, 'A2:A9', `newX: needs the address of one cell such as A2 or 'Sheet 1'!$B$5; got "A2:A9".`],
    [{ sheet: '', topLeft: 'D2', rows: 3 }, 'A2', 'sheet: needs a sheet name or nothing; got an empty name.'],
  ])('rejects %j with new x %s: "%s"', (table, x, message) => {
    let thrown: unknown;
    try {
      portableCurveFormula(table, x);
    } catch (e) {
      thrown = e;
    }
    expect(isRatchetError(thrown, 'BAD_OPTION')).toBe(true);
    expect((thrown as Error).message).toBe(message);
  });
});

describe('portableCurveBlock', () => {
  it('written into a sheet and given new x, predicts what RATCHET.EVAL predicts from the same table', () => {
    const table = knotTable(pressure.x, pressure.y, 6) as [number, number][];
    const cells = portableCurveBlock(table, { row: 3, col: 2, sheet: 'Hand-off' }, 5);
    const sheet: Record<string, SetupCell> = {};
    for (const c of cells) sheet[cellName(2 + c.dr, 1 + c.dc)] = typeof c.value === 'string' && c.value.startsWith('=') ? { f: c.value.slice(1) } : c.value;
    const lo = table[0]![0];
    const hi = table[table.length - 1]![0];
    const xs = [lo - 50, lo, (lo + hi) / 3, hi, hi + 50];
    xs.forEach((x, i) => {
      sheet[`E${4 + i}`] = x;
      sheet[`H${4 + i}`] = { f: `RATCHET.EVAL(E${4 + i},$B$4:$C$${3 + table.length})` };
    });
    const book = evaluate({ 'Hand-off': sheet });
    expect(book.block("'Hand-off'!B3", 1, 5)).toEqual([['knot x', 'fitted value', null, 'new x', 'predicted']]);
    expect(book.block("'Hand-off'!B4", table.length, 2)).toEqual(table);
    xs.forEach((_x, i) => {
      const got = book.value(`'Hand-off'!F${4 + i}`) as number;
      const want = book.value(`'Hand-off'!H${4 + i}`) as number;
      expect(typeof got).toBe('number');
      expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-12 * Math.abs(want));
    });
  });

  it('refuses a table the formula could not read correctly, and a block that does not fit', () => {
    expect(() => portableCurveBlock([[2, 1], [1, 3]], { row: 1, col: 1 })).toThrow(/^knots/);
    expect(() => portableCurveBlock([[1, Number.NaN]], { row: 1, col: 1 })).toThrow(/^knots values/);
    expect(() => portableCurveBlock([[1, 2]], { row: 1, col: 16381 })).toThrow('at: needs a 1-based row and a column with 4 columns to its right; got row 1, column 16381.');
    expect(() => portableCurveBlock([[1, 2]], { row: 1, col: 1 }, 0)).toThrow('newXRows: needs a whole number ≥ 1 that fits below row 1; got 0.');
  });

  it('matches its documented example', () => {
    expect(portableCurveBlock([[1, 10], [3, 14]], { row: 1, col: 4 }, 1).slice(0, 4)).toEqual([
      { dr: 0, dc: 0, value: 'knot x' },
      { dr: 0, dc: 1, value: 'fitted value' },
      { dr: 0, dc: 3, value: 'new x' },
      { dr: 0, dc: 4, value: 'predicted' },
    ]);
  });
});

describe('portableCurveBlock and the smooth table', () => {
  it('refuses the table of a smooth fit (third column 2) with a message instead of reading it with straight lines', () => {
    expect(() => portableCurveBlock([[0, 0, 2], [1, 0.75, 2], [2, 1, 2]], { row: 1, col: 1 })).toThrow(/smooth \(degree 2\)/);
    expect(portableCurveBlock([[0, 0, 1], [2, 1, 1]], { row: 1, col: 1 }, 1).length).toBeGreaterThan(4);
  });
});
