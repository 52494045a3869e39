/**
 * Sizing before the build (src/runner/presize.ts): a RATCHET call over plain cells gets its
 * result size from the cells before the workbook enters the engine, so it is evaluated once;
 * anything whose cells could still change is left to the engine's re-sizing. Data: y = 1, 3, 2, 4
 * at x = 1…4; the rising fit pools 3 and 2 to 2.5 (hand: pool adjacent violators).
 */
import { describe, expect, it } from 'vitest';
import type { RawCellContent } from 'hyperformula';
import { presize } from '../../src/runner/presize.js';
import { evaluate } from './helpers.js';

const rows = (f: RawCellContent): RawCellContent[][] => [[1, 1, f], [2, 3], [3, 2], [4, 4]];
const at = { sheet: 0, row: 0, col: 2 };

describe('sizing before the build', () => {
  it('sizes FIT over plain cells as 4 rows × 1 column and hands over the converted y range', () => {
    const s = presize([rows('=RATCHET.FIT(B1:B4,A1:A4)')], ['Data'], [at]);
    expect([...s.sizes]).toEqual([['0:0:2', { rows: 4, cols: 1 }]]);
    expect(s.ranges.get('0:0:1:3:1')).toEqual([[1], [3], [2], [4]]);
    expect(s.ranges.get('0:0:0:3:0')).toEqual([[1], [2], [3], [4]]);
  });

  it('reads numbers, omitted arguments and ranges on other sheets named in the reference', () => {
    const other: RawCellContent[][] = [[1], [3], [2], [4]];
    const s = presize([rows('=RATCHET.KNOTS(Ys!A1:A4,A1:A4,,-1)'), other], ['Data', 'Ys'], [at]);
    expect(s.ranges.get('1:0:0:3:0')).toEqual([[1], [3], [2], [4]]);
    expect(s.sizes.has('0:0:2')).toBe(true);
  });

  it('leaves to the engine a range holding a formula, an empty cell a formula could spill into, a nested call, a name and a whole column', () => {
    const formulaInRange: RawCellContent[][] = [[1, '=1', '=RATCHET.FIT(B1:B4,A1:A4)'], [2, 3], [3, 2], [4, 4]];
    expect(presize([formulaInRange], ['Data'], [at, { sheet: 0, row: 0, col: 1 }]).sizes.size).toBe(0);
    // The formula in A4 could spill into the blank B5 of B1:B5 (a result spills down and right).
    const blank: RawCellContent[][] = [[1, 1, '=RATCHET.FIT(B1:B5,C6:C10)'], [2, 3], [3, 2], ['=SEQUENCE(2,2)', 4], [5, null]];
    const s = presize([blank], ['Data'], [at, { sheet: 0, row: 3, col: 0 }]);
    expect(s.sizes.size).toBe(0);
    expect(s.ranges.has('0:0:1:4:1')).toBe(false);
    for (const f of ['=RATCHET.FIT(B1:B4,ABS(A1:A4))', '=RATCHET.FIT(Ys,A1:A4)', '=RATCHET.FIT(B:B,A:A)', '=SUM(RATCHET.FIT(B1:B4,A1:A4))']) {
      expect(presize([rows(f)], ['Data'], [at]).sizes.size, f).toBe(0);
    }
  });

  it('a blank no formula can spill into is read as a blank cell', () => {
    const s = presize([[[1, 1], [2, 3], [3, null, '=RATCHET.FIT(B1:B3,A1:A3)']]], ['Data'], [{ sheet: 0, row: 2, col: 2 }]);
    expect(s.ranges.get('0:0:1:2:1')).toEqual([[1], [3], [null]]);
  });

  it('a FIT whose size is known before the build is evaluated once and spills the pooled values 1, 2.5, 2.5, 4', () => {
    const b = evaluate({ D: { A1: 1, A2: 2, A3: 3, A4: 4, B1: 1, B2: 3, B3: 2, B4: 4, D1: { f: '_xldudf_RATCHET_FIT(B1:B4,A1:A4)' } } });
    expect(b.result('D!D1')).toEqual([[1], [2.5], [2.5], [4]]);
    expect(b.ratchetCalls).toBe(1);
  });

  it('a FIT over cells computed by formulas is re-sized by the engine (two evaluations) and spills the same values', () => {
    const b = evaluate({
      D: { A1: 1, A2: 2, A3: 3, A4: 4, B1: 1, B2: 3, B3: 2, B4: 4, C1: { f: 'B1*1' }, C2: { f: 'B2*1' }, C3: { f: 'B3*1' }, C4: { f: 'B4*1' }, D1: { f: 'RATCHET.FIT(C1:C4,A1:A4)' } },
    });
    expect(b.result('D!D1')).toEqual([[1], [2.5], [2.5], [4]]);
    expect(b.ratchetCalls).toBe(2);
  });
});
