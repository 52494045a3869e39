/**
 * The pane's list of cells left out because they hold text or a logical value
 * (taskpane/panels/left-out-panel.ts): addresses in A1 style with the sheet, quoted as Excel quotes
 * sheet names with spaces (common practice: Excel's A1 reference style), and the advice to use
 * VALUE only for a number stored as text (Excel's VALUE turns "47.6" into 47.6 (memory)).
 */
import { describe, expect, it } from 'vitest';
import { leftOutText, textCellsOf } from '../../taskpane/panels/left-out-panel.js';
import { cellInput } from '../../taskpane/panels/handoff-panel.js';

describe('cells left out for text or a logical value', () => {
  it('a column lists its text and logical cells with their row, skipping numbers, blanks and blank text', () => {
    expect(textCellsOf([1, '47.6', null, '  ', true, 'n/a'], { sheet: 'Data', r1: 4, r2: 9, c1: 2, c2: 2 })).toEqual([
      { address: 'Data!B5', value: '47.6' },
      { address: 'Data!B8', value: true },
      { address: 'Data!B9', value: 'n/a' },
    ]);
  });

  it('a row of cells runs across, and a sheet name with a space is quoted', () => {
    expect(textCellsOf([1, 'x', 3], { sheet: 'Wear test', r1: 2, r2: 2, c1: 26, c2: 28 })).toEqual([{ address: "'Wear test'!AA2", value: 'x' }]);
  });

  it('says to convert a number stored as text with VALUE, and that other text and logicals leave their row out', () => {
    expect(leftOutText({ address: 'Data!B5', value: '47.6' })).toBe('Data!B5 holds the text "47.6" — convert it with VALUE to use it');
    expect(leftOutText({ address: 'Data!B6', value: '<5' })).toBe('Data!B6 holds the text "<5" — its row is left out');
    expect(leftOutText({ address: 'Data!B7', value: false })).toBe('Data!B7 holds the logical value FALSE — its row is left out');
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
