/**
 * Text and logical cells in referenced data ranges (README.md, "How cells are read"): they leave
 * their row out as blanks do — the convention of Excel's paired statistical functions SLOPE and
 * CORREL (Microsoft's function reference: "If an array or reference argument contains text,
 * logical values, or empty cells, those values are ignored") (memory) — are counted in STATS
 * `dropped` and `text_rows`, and are listed by address for the task pane; text given directly or
 * in an array constant stays #VALUE!; error cells propagate, named by address. Expected fits are
 * the same call on the data with those rows removed (the rule itself), and the PAVA values are
 * worked by hand in the comments.
 */
import { describe, expect, it } from 'vitest';
import { functionByName } from '../../src/functions/registry.js';
import { leftOutCellsOf } from '../../src/functions/define.js';
import { cellName, formatNumber } from '../../src/adapter/cells.js';
import { mapError } from '../../src/adapter/errors.js';
import { handleRequest, type WorkerResponse } from '../../src/functions/worker-protocol.js';
import type { CellArg, CellResult, CellValueIn } from '../../src/functions/types.js';

const col = (...v: CellValueIn[]): CellValueIn[][] => v.map((x) => [x]);
const ADDR = ['Data!B2:B7', 'Data!A2:A7'];

function run(name: string, args: readonly CellArg[], addresses?: readonly (string | undefined)[]): CellResult | { error: string } {
  try {
    return functionByName(name)!.invoke(args, addresses ? { addresses } : undefined);
  } catch (e) {
    const m = mapError(e);
    return { error: `${m.code} ${m.message}` };
  }
}

// y = 1 3 "n/a" 4 6 5 at x = 1…6; without row 3: 1 3 4 6 5 → PAVA (hand) 1 3 4 5.5 5.5.
const ys = col(1, 3, 'n/a', 4, 6, 5);
const xs = col(1, 2, 3, 4, 5, 6);

describe('text and logical cells in a referenced data range', () => {
  it('FIT leaves the text row out and shows it empty (hand: 1 3 _ 4 5.5 5.5)', () => {
    expect(run('FIT', [ys, xs], ADDR)).toEqual([[1], [3], [''], [4], [5.5], [5.5]]);
  });
  it('a logical in known_xs or in weights leaves its row out too, same fit as without the row', () => {
    const without = run('KNOTS', [col(1, 3, 4, 6, 5), col(1, 2, 4, 5, 6)]);
    expect(run('KNOTS', [col(1, 3, 2, 4, 6, 5), col(1, 2, true, 4, 5, 6)], ADDR)).toEqual(without);
    expect(run('KNOTS', [col(1, 3, 2, 4, 6, 5), xs, 0, 1, col(1, 1, false, 1, 1, 1)], [...ADDR, undefined, undefined, 'Data!C2:C7'])).toEqual(without);
  });
  it('STATS keeps dropped as the total and counts text_rows separately (1 text, 1 blank row)', () => {
    const out = run('STATS', [col(1, 3, 'n/a', 4, 6, null), xs], ADDR) as CellResult[][];
    const get = (label: string) => out.find((r) => r[0] === label)?.[1];
    expect(get('n')).toBe(4);
    expect(get('dropped')).toBe(2);
    expect(get('text_rows')).toBe(1);
    expect(out.map((r) => r[0]).slice(0, 9)).toEqual(['n', 'dropped', 'knots', 'direction', 'r2', 'rmse', 'mae', 'sse', 'levels']);
  });
  it('a row with text in two arguments counts once in text_rows', () => {
    const out = run('STATS', [col(1, 3, 'n/a', 4, 6, 5), col(1, 2, 'x', 4, 5, 6)], ADDR) as CellResult[][];
    expect(out.find((r) => r[0] === 'text_rows')?.[1]).toBe(1);
  });
  it('text given directly (no address) or in an array constant stays #VALUE!, named by position', () => {
    expect(run('FIT', [ys, xs])).toEqual({ error: '#VALUE! known_ys: needs numbers or blanks; cell 3 is the text "n/a".' });
    expect(run('FIT', [ys, xs], ['', 'Data!A2:A7'])).toEqual({ error: '#VALUE! known_ys: needs numbers or blanks; cell 3 is the text "n/a".' });
  });
  it('text in a referenced new_xs or knot table is still #VALUE!, named by its address', () => {
    expect(run('PREDICT', [col(1, 'a'), col(1, 3, 2, 4, 6, 5), xs], ['Data!D2:D3', ...ADDR])).toEqual({
      error: '#VALUE! new_xs: needs numbers or blanks; Data!D3 is the text "a".',
    });
  });
  it('an error cell still propagates, and its message names the cell by address', () => {
    expect(run('FIT', [col(1, 3, { kind: 'error', code: '#DIV/0!' }, 4, 6, 5), xs], ADDR)).toEqual({ error: '#DIV/0! known_ys: Data!B4 holds the error #DIV/0!.' });
  });
  it('too few rows left counts the text rows in the message', () => {
    expect(run('FIT', [col(1, 'a', 'b', 'c', 'd', 'e'), xs], ADDR)).toEqual({
      error: '#VALUE! known_ys: needs at least 2 rows where known_ys and known_xs both hold numbers; got 1 (5 rows left out for text or logical cells).',
    });
  });
  it('leftOutCellsOf lists each left-out cell by address with a hint for numbers stored as text', () => {
    const fit = functionByName('FIT')!;
    const got = leftOutCellsOf(fit, [col(1, '47.6', 'n/a', 4, 6, 5), col(1, 2, 3, true, 5, 6)], { addresses: ["'Wear data'!B2:B7", "'Wear data'!A2:A7"] });
    expect(got.map((e) => e.message)).toEqual([
      `'Wear data'!B3 holds the text "47.6" — convert it with VALUE to use it`,
      `'Wear data'!B4 holds the text "n/a" — its row is left out`,
      `'Wear data'!A5 holds the logical TRUE — its row is left out`,
    ]);
    expect(got[0]).toMatchObject({ argument: 'known_ys', cell: "'Wear data'!B3", value: '47.6' });
    expect(leftOutCellsOf(fit, [ys, xs])).toEqual([]);
  });
  it('the worker passes the addresses on, so long work reads text cells the same way', () => {
    const posted: WorkerResponse[] = [];
    handleRequest({ type: 'invoke', id: 1, name: 'FIT', args: [ys, xs], addresses: ADDR }, (r) => posted.push(r));
    expect(posted[0]).toEqual({ type: 'result', id: 1, ok: true, result: [[1], [3], [''], [4], [5.5], [5.5]] });
  });
});

describe('cell names and numbers in messages', () => {
  it('cellName: ranges, whole columns and rows, quoted sheets, and positions without an address', () => {
    expect(cellName('Data!$B$2:$B$40', 39, 1, 3, 0)).toBe('Data!B5');
    expect(cellName('Data!B:B', 1048576, 1, 4, 0)).toBe('Data!B5');
    expect(cellName('Data!2:2', 1, 16384, 0, 27)).toBe('Data!AB2');
    expect(cellName("'It''s'!C3:D9", 7, 2, 1, 1)).toBe("'It''s'!D4");
    expect(cellName('Q1!A1:A9', 9, 1, 0, 0)).toBe("'Q1'!A1");
    expect(cellName(undefined, 9, 1, 3, 0)).toBe('cell 4');
    expect(cellName(undefined, 3, 3, 1, 2)).toBe('row 2, column 3');
  });
  it('numbers are shown to 6 significant digits (a huge y, a negative weight)', () => {
    expect(formatNumber(27.693950453842106)).toBe('27.694');
    expect(formatNumber(149.79140378405756)).toBe('149.791');
    expect(run('FIT', [col(1, 3, 1.234567891e200, 4, 6, 5), xs], ADDR)).toEqual({
      error: '#VALUE! known_ys: needs numbers of magnitude from 1e-300 to 1e100, or 0; Data!B4 is 1.23457e+200.',
    });
    expect(run('FIT', [col(1, 3, 2, 4, 6, 5), xs, 0, 1, col(1, 1, -0.3333333333, 1, 1, 1)], [...ADDR, undefined, undefined, 'Data!C2:C7'])).toEqual({
      error: '#VALUE! weights: needs numbers ≥ 0; Data!C4 is -0.333333.',
    });
  });
});

describe('whole columns in the add-in path (Excel passes 1,048,576 cells)', () => {
  const ROWS = 1048576;
  const whole = (values: readonly CellValueIn[]): CellValueIn[][] => {
    const c = values.map((v) => [v]);
    while (c.length < ROWS) c.push([null]);
    return c;
  };
  it('STATS over B:B with a text cell equals STATS over the data alone, with the blank rows in dropped', () => {
    const got = run('STATS', [whole([1, 3, 'n/a', 4, 6, 5]), whole([1, 2, 3, 4, 5, 6])], ['Data!B:B', 'Data!A:A']) as CellResult[][];
    const exact = run('STATS', [col(1, 3, 4, 6, 5), col(1, 2, 4, 5, 6)]) as CellResult[][];
    const get = (t: CellResult[][], label: string) => t.find((r) => r[0] === label)?.[1];
    expect(get(got, 'dropped')).toBe(ROWS - 5);
    expect(get(got, 'text_rows')).toBe(1);
    for (const label of ['n', 'knots', 'r2', 'rmse', 'sse', 'levels']) expect(get(got, label)).toBe(get(exact, label));
  });
});
