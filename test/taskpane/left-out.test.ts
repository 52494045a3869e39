/**
 * The pane's list of cells left out because they hold text or a logical value
 * (taskpane/panels/left-out-panel.ts, built by the worksheet layer's leftOutCellsOf): addresses in
 * A1 style with the sheet, quoted as Excel quotes sheet names with spaces (common practice: Excel's
 * A1 reference style), and the advice to use VALUE only for a number stored as text (Excel's VALUE
 * turns "47.6" into 47.6 (memory)).
 */
import { describe, expect, it } from 'vitest';
import { leftOutOf } from '../../taskpane/panels/left-out-panel.js';
import { cellInput } from '../../taskpane/panels/handoff-panel.js';

describe('cells left out for text or a logical value', () => {
  it('a column lists its text and logical cells with their row, skipping numbers and blanks', () => {
    const got = leftOutOf([{ cells: [1, '47.6', null, '', true, 'n/a'], area: { sheet: 'Data', r1: 4, r2: 9, c1: 2, c2: 2 } }]);
    expect(got.map((e) => e.cell)).toEqual(['Data!B5', 'Data!B8', 'Data!B9']);
    expect(got.map((e) => e.message)).toEqual([
      'Data!B5 holds the text "47.6" — convert it with VALUE to use it',
      'Data!B8 holds the logical TRUE — its row is left out',
      'Data!B9 holds the text "n/a" — its row is left out',
    ]);
  });

  it('a row of cells runs across, and a sheet name with a space is quoted', () => {
    expect(leftOutOf([{ cells: [1, 'x', 3], area: { sheet: 'Wear test', r1: 2, r2: 2, c1: 26, c2: 28 } }]).map((e) => e.cell)).toEqual(["'Wear test'!AA2"]);
  });

  it('lists x, y, weights, second x in that order, each under its own argument, and says what a formula on the same ranges would leave out', () => {
    const area = (c: number) => ({ sheet: 'Data', r1: 2, r2: 4, c1: c, c2: c });
    const got = leftOutOf([
      { cells: [1, 2, 'x?'], area: area(1) },
      { cells: ['<5', 3, 4], area: area(2) },
      undefined,
      { cells: [false, 1, 2], area: area(4) },
    ]);
    expect(got.map((e) => [e.argument, e.cell, e.value])).toEqual([
      ['known_xs', 'Data!A4', 'x?'],
      ['known_ys', 'Data!B2', '<5'],
      ['known_x2s', 'Data!D2', false],
    ]);
    expect(got[1]!.message).toBe('Data!B2 holds the text "<5" — its row is left out');
  });

  it('a range the worksheet layer refuses (an error cell) or without a sheet lists nothing; the others still list theirs', () => {
    const got = leftOutOf([
      { cells: [1, { kind: 'error', code: '#DIV/0!' }, 'a'], area: { sheet: 'Data', r1: 2, r2: 4, c1: 1, c2: 1 } },
      { cells: ['b', 2, 3], area: { sheet: undefined, r1: 2, r2: 4, c1: 2, c2: 2 } },
      { cells: [1, 'c', 3], area: { sheet: 'Data', r1: 2, r2: 4, c1: 3, c2: 3 } },
    ]);
    expect(got.map((e) => e.cell)).toEqual(['Data!C3']);
  });
});

describe('frozen values written back', () => {
  it('keeps text that Excel would read as a number, formula or error as text (leading apostrophe); errors and numbers as they are', () => {
    expect([cellInput('47.6'), cellInput('=A1'), cellInput('#N/A'), cellInput('knots'), cellInput({ error: '#N/A' }), cellInput(2.5), cellInput(null), cellInput(true)]).toEqual([
      "'47.6",
      "'=A1",
      "'#N/A",
      'knots',
      '#N/A',
      2.5,
      '',
      true,
    ]);
  });
});
