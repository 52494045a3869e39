/**
 * Recalculation in the runner: changing inputs in-process re-evaluates dependent fits, knot
 * tables and cross-validation rows, and array results grow, shrink, collide (#SPILL!) and recover
 * as they do in Excel. Expected values are worked by hand in the comments.
 */
import { describe, expect, it } from 'vitest';
import { closeBlock, evaluate } from './helpers.js';

// y = x at x = 1…6: the classic fit is the data, and the smallest knot table is its two ends.
function book() {
  return evaluate({
    D: {
      A1: 1, A2: 2, A3: 3, A4: 4, A5: 5, A6: 6,
      B1: 1, B2: 2, B3: 3, B4: 4, B5: 5, B6: 6,
      C1: 2,
      D1: { f: '_xldudf_RATCHET_KNOTS(B1:B6,A1:A6)' },
      G1: { f: 'RATCHET.EVAL(2.5,D1:E10)' },
      H1: { f: 'RATCHET.FIT(B1:B6,A1:A6)' },
      J1: { f: 'RATCHET.CV(B1:B6,A1:A6,SEQUENCE(C1,1,2),2,1,0)' },
      Q1: { f: 'SUM(H1:H6)' },
    },
  });
}

describe('recalculation in-process', () => {
  it('starts from the hand-worked values', () => {
    const b = book();
    expect(b.result('D!D1')).toEqual([[1, 1], [6, 6]]);
    expect(b.value('D!G1')).toBe(2.5);
    expect(b.result('D!H1')).toEqual([[1], [2], [3], [4], [5], [6]]);
    expect(b.result('D!J1').map((r) => r[0])).toEqual(['knots', 2, 3]);
    expect(b.value('D!Q1')).toBe(21);
  });

  it('a changed input re-fits, and the KNOTS table grows and shrinks with its data', () => {
    const b = book();
    // y3 = 10: PAVA pools 10, 4, 5, 6 to 6.25 → fit 1 2 6.25 6.25 6.25 6.25;
    // smallest table (1,1) (2,2) (3,6.25) (6,6.25); EVAL at 2.5 = 2 + 0.5·4.25 = 4.125.
    b.set({ 'D!B3': 10 });
    expect(b.result('D!D1')).toEqual([[1, 1], [2, 2], [3, 6.25], [6, 6.25]]);
    expect(b.value('D!G1')).toBe(4.125);
    expect(b.result('D!H1')).toEqual([[1], [2], [6.25], [6.25], [6.25], [6.25]]);
    expect(b.value('D!Q1')).toBe(28);
    // Back to y = x: two rows again, and the cells the larger table used are empty.
    b.set({ 'D!B3': 3 });
    expect(b.result('D!D1')).toEqual([[1, 1], [6, 6]]);
    expect(b.block('D!D3', 2, 2)).toEqual([[null, null], [null, null]]);
    expect(b.value('D!G1')).toBe(2.5);
  });

  it('cross-validation rows follow a changed candidate count and changed data', () => {
    const b = book();
    b.set({ 'D!C1': 4 });
    expect(b.result('D!J1').map((r) => r[0])).toEqual(['knots', 2, 3, 4, 5]);
    const before = b.result('D!J1')[1]![1];
    b.set({ 'D!B6': 12 });
    const after = b.result('D!J1')[1]![1];
    expect(typeof before).toBe('number');
    expect(after).not.toBe(before);
    b.set({ 'D!C1': 1 });
    expect(b.result('D!J1').map((r) => r[0])).toEqual(['knots', 2]);
  });

  it('a result that would cover a filled cell is #SPILL!, and recovers when there is room', () => {
    const b = book();
    b.set({ 'D!D4': 'note' });
    expect(b.result('D!D1')).toEqual([[1, 1], [6, 6]]);
    b.set({ 'D!B3': 10 }); // the table needs four rows now; D4 is taken
    expect(b.value('D!D1')).toBe('#SPILL!');
    b.set({ 'D!B3': 3 }); // two rows again: fits above D4
    expect(b.result('D!D1')).toEqual([[1, 1], [6, 6]]);
    b.set({ 'D!B3': 10, 'D!D4': null }); // four rows and the cell cleared
    expect(closeBlock(b.result('D!D1'), [[1, 1], [2, 2], [3, 6.25], [6, 6.25]])).toBeUndefined();
  });

  it('a spilled result that turns into an error shows it in one cell, also to formulas that refer to exactly its range', () => {
    const b = book();
    b.set({ 'D!T1': '=RATCHET.EVAL(2.5,D1:E2)', 'D!T2': '=RATCHET.EVAL(2.5,D1:E4)' });
    expect([b.value('D!T1'), b.value('D!T2')]).toEqual([2.5, 2.5]);
    b.set({ 'D!B3': 1e200 }); // a value beyond the documented magnitudes: KNOTS is #VALUE!, in D1 only
    expect(b.result('D!D1')).toEqual([['#VALUE!']]);
    expect(b.message('D!D1')).toContain('known_ys');
    expect(b.block('D!D2', 1, 2)).toEqual([[null, null]]);
    expect([b.value('D!T1'), b.value('D!T2')]).toEqual(['#VALUE!', '#VALUE!']);
    b.set({ 'D!B3': 10 }); // four rows again: the exact reference to D1:E4 reads the new table
    expect(b.result('D!D1')).toEqual([[1, 1], [2, 2], [3, 6.25], [6, 6.25]]);
    expect(b.value('D!T2')).toBe(4.125);
    b.set({ 'D!F4': 'note', 'D!B3': 3 }); // two rows, then a note where a wider result would go
    expect(b.result('D!D1')).toEqual([[1, 1], [6, 6]]);
    b.set({ 'D!E4': 'note', 'D!B3': 10 }); // four rows would cover E4: #SPILL!, seen by both references
    expect(b.value('D!D1')).toBe('#SPILL!');
    // A function may not return #SPILL!: the adapter reports the error cell as #VALUE! naming it.
    expect([b.value('D!T1'), b.value('D!T2')]).toEqual(['#VALUE!', '#VALUE!']);
    expect(b.message('D!T2')).toContain('#SPILL!');
  });

  it('built-ins around a RATCHET array follow its size (TRANSPOSE, arithmetic)', () => {
    const b = book();
    b.set({ 'D!A10': '=TRANSPOSE(RATCHET.KNOTS(B1:B6,A1:A6))', 'D!A13': '=RATCHET.KNOTS(B1:B6,A1:A6)*2' });
    expect(b.result('D!A10')).toEqual([[1, 6], [1, 6]]);
    expect(b.result('D!A13')).toEqual([[2, 2], [12, 12]]);
    b.set({ 'D!B3': 10 });
    expect(b.result('D!A10')).toEqual([[1, 2, 3, 6], [1, 2, 6.25, 6.25]]);
    expect(b.result('D!A13')).toEqual([[2, 2], [4, 4], [6, 12.5], [12, 12.5]]);
  });

  it('a formula set in-process is read in either form and evaluated', () => {
    const b = book();
    b.set({ 'D!S1': '=_xldudf_RATCHET_PREDICT(3.5,B1:B6,A1:A6)', 'D!S2': '=RATCHET.STATS(B1:B6,A1:A6)' });
    expect(b.value('D!S1')).toBe(3.5);
    expect(b.result('D!S2')[0]).toEqual(['n', 6]);
    expect(b.results().find((r) => r.cell === 'S1')?.formula).toBe('=RATCHET.PREDICT(3.5,B1:B6,A1:A6)');
  });

  it('a value typed into a spilled result blocks it (#SPILL!) until it is cleared, as in Excel', () => {
    const b = book();
    b.set({ 'D!E2': 5 });
    expect(b.value('D!D1')).toBe('#SPILL!');
    expect(b.value('D!E2')).toBe(5);
    b.set({ 'D!E2': null });
    expect(b.result('D!D1')).toEqual([[1, 1], [6, 6]]);
  });

  it('names a sheet it cannot find', () => {
    expect(() => book().set({ 'Nope!A1': 5 })).toThrow('there is no sheet named "Nope"');
  });
});

describe('defined names', () => {
  it('a named range works as a RATCHET argument and follows its cells', async () => {
    const { excelOf } = await import('./helpers.js');
    const { EvaluatedWorkbook } = await import('../../src/runner/workbook.js');
    const wb = excelOf({
      'Lab data': { A1: 1, A2: 2, A3: 3, B1: 1, B2: 3, B3: 2, D1: { f: 'RATCHET.FIT(Signal,Conc)' } },
    });
    wb.definedNames.add("'Lab data'!$A$1:$A$3", 'Conc');
    wb.definedNames.add("'Lab data'!$B$1:$B$3", 'Signal');
    const b = EvaluatedWorkbook.fromExcel(wb);
    expect(b.result('Lab data!D1')).toEqual([[1], [2.5], [2.5]]); // (3, 2) pool to 2.5 (hand)
    b.set({ "'Lab data'!B2": 1.5 });
    expect(b.result('Lab data!D1')).toEqual([[1], [1.5], [2]]);
  });
});

describe('dates', () => {
  it('date cells read as Excel serial days and agree with DATE() (2026-01-01 is day 46023 of the 1900 system, memory: 2025-01-01 is 45658)', async () => {
    const { excelOf } = await import('./helpers.js');
    const { EvaluatedWorkbook } = await import('../../src/runner/workbook.js');
    const wb = excelOf({ S: { A1: { f: 'DATE(2026,1,1)' }, A2: { f: 'DATE(1900,3,1)' }, C1: { f: 'B1-A1' } } });
    wb.getWorksheet('S')!.getCell('B1').value = new Date(Date.UTC(2026, 0, 31));
    const b = EvaluatedWorkbook.fromExcel(wb);
    expect([b.value('S!A1'), b.value('S!A2'), b.value('S!C1')]).toEqual([46023, 61, 30]);
  });
});

describe('merged cells', () => {
  it('only the first cell of a merged range holds its value', async () => {
    const { excelOf } = await import('./helpers.js');
    const { EvaluatedWorkbook } = await import('../../src/runner/workbook.js');
    const wb = excelOf({ S: { A1: 'Title over three columns', A2: 1, B2: 2, C2: 3, D1: { f: 'COUNTA(A1:C1)' } } });
    wb.getWorksheet('S')!.mergeCells('A1:C1');
    const b = EvaluatedWorkbook.fromExcel(wb);
    expect(b.value('S!D1')).toBe(1);
  });
});
