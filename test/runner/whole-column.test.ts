/**
 * Whole-column references (`B:B`) in the runner behave as in Excel, which passes all 1,048,576
 * cells of the column (Excel's specifications: 1,048,576 rows × 16,384 columns) (common
 * practice): blank rows are left out and counted as dropped, however far the used area of the
 * sheet reaches (other results spilling further down do not change the count), and the results
 * equal those of the same data given as the exact range B1:B1048576, computed here through the
 * registry with the cells Excel would pass. The fit of y = 1 3 2 4 6 5 over x = 1…6 is
 * 1 2.5 2.5 4 5.5 5.5 with SSE 1 (hand: pool 3,2 and 6,5).
 */
import { describe, expect, it } from 'vitest';
import { functionByName } from '../../src/functions/registry.js';
import type { CellArg, CellValueIn } from '../../src/functions/types.js';
import { evaluate, type Setup } from './helpers.js';

const ROWS = 1048576;
const xs = [1, 2, 3, 4, 5, 6];
const ys = [1, 3, 2, 4, 6, 5];

/** A column of 1,048,576 cells holding `values` from row 1 and blanks below (what Excel passes for B:B). */
function wholeColumn(values: readonly number[]): CellValueIn[][] {
  const col: CellValueIn[][] = values.map((v) => [v]);
  while (col.length < ROWS) col.push([null]);
  return col;
}

function data(extra: Setup['Data'] = {}): Setup {
  const cells: Setup['Data'] = { ...extra };
  xs.forEach((x, i) => {
    cells[`A${i + 1}`] = x;
    cells[`B${i + 1}`] = ys[i]!;
  });
  return { Data: cells };
}

const invoke = (name: string, args: CellArg[]) => functionByName(name)!.invoke(args);

describe('whole-column references in the runner', () => {
  it('STATS(B:B,A:A) counts 1,048,570 dropped rows and equals STATS over the exact 1,048,576-row range', () => {
    const book = evaluate(data({ D1: { f: 'RATCHET.STATS(B:B,A:A)' } }));
    const want = invoke('STATS', [wholeColumn(ys), wholeColumn(xs)]);
    expect(book.result('Data!D1')).toEqual(want);
    expect(book.result('Data!D1').slice(0, 2)).toEqual([
      ['n', 6],
      ['dropped', ROWS - 6],
    ]);
    expect(book.result('Data!D1')[7]).toEqual(['sse', 1]);
  });

  it('the count does not depend on the used area: a result spilling to row 40 and the formula\'s own spill change nothing', () => {
    const book = evaluate(
      data({
        D1: { f: 'RATCHET.STATS(B:B,A:A)' },
        G1: { f: 'RATCHET.PREDICT(SEQUENCE(40),B1:B6,A1:A6)' },
        H30: 'far below',
      }),
    );
    expect(book.result('Data!G1')).toHaveLength(40);
    expect(book.result('Data!D1')).toEqual(invoke('STATS', [wholeColumn(ys), wholeColumn(xs)]));
  });

  it('KNOTS and PREDICT over whole columns equal the same calls over the exact range', () => {
    const book = evaluate(data({ D1: { f: 'RATCHET.KNOTS(B:B,A:A)' }, G1: { f: 'RATCHET.PREDICT(3.5,B:B,A:A)' } }));
    expect(book.result('Data!D1')).toEqual(invoke('KNOTS', [wholeColumn(ys), wholeColumn(xs)]));
    expect([[book.value('Data!G1')]]).toEqual(invoke('PREDICT', [3.5, wholeColumn(ys), wholeColumn(xs)]));
    // Classic fit interpolated between x = 3 (2.5) and x = 4 (4): 3.25 (hand).
    expect(book.value('Data!G1')).toBe(3.25);
  });
});
