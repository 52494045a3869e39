/**
 * The worksheet adapter with Excel-shaped inputs: ranges as columns, rows and 2-D blocks; blanks as
 * null, "" and 0-with-blank-type; text, logicals, numbers stored as text, and error cells. Each case
 * states the exact result, or the exact error code and message a user sees.
 *
 * Expected fitted values are small hand computations of the pool-adjacent-violators rule
 * (common practice): a violating pair is replaced by its mean, e.g. y = 1, 3, 2, 4 → 1, 2.5, 2.5, 4.
 */
import { describe, expect, it } from 'vitest';
import { cell, col, err, row } from './helpers.js';
import { applyBlankTypes, hasZero, resolveBlanks, splitAddress } from '../../src/adapter/blanks.js';
import { fromExcelArg, toExcelError, toExcelResult } from '../../src/adapter/excel.js';
import { InputCellError, MappedCellError, mapError } from '../../src/adapter/errors.js';
import { RatchetError } from '../../src/core/index.js';
import { readKnots, readScalar, readVector } from '../../src/adapter/cells.js';
import { hashFloat64, sameBits } from '../../src/adapter/hash.js';

const XS = col(1, 2, 3, 4);
const YS = col(1, 3, 2, 4);

describe('range shapes', () => {
  it('a column of y gives a column of fitted values', () => {
    expect(cell('FIT', YS, XS)).toEqual([[1], [2.5], [2.5], [4]]);
  });
  it('a row of y gives a row of fitted values', () => {
    expect(cell('FIT', row(1, 3, 2, 4), row(1, 2, 3, 4))).toEqual([[1, 2.5, 2.5, 4]]);
  });
  it('y and x may differ in orientation; the result follows y', () => {
    expect(cell('FIT', row(1, 3, 2, 4), XS)).toEqual([[1, 2.5, 2.5, 4]]);
  });
  it('a 2-D block as known_ys is #VALUE! naming the argument', () => {
    expect(cell('FIT', [[1, 2], [3, 4]], XS)).toEqual(err('#VALUE!', 'known_ys: needs a single column or row; got 2 rows × 2 columns.'));
  });
  it('new_xs may be a 2-D block; the result has its shape and blanks stay blank', () => {
    // Knot table of the classic fit: (1, 1), (2, 2.5), (3, 2.5), (4, 4); flat beyond the ends.
    expect(cell('PREDICT', [[0, 1.5], [3.5, null]], YS, XS)).toEqual([[1, 1.75], [3.25, '']]);
  });
  it('a scalar new_x gives a 1×1 result', () => {
    expect(cell('PREDICT', 2.5, YS, XS)).toEqual([[2.5]]);
  });
  it('different cell counts of y and x are #VALUE!', () => {
    expect(cell('FIT', YS, col(1, 2, 3))).toEqual(err('#VALUE!', 'known_xs: needs one cell per cell of known_ys (4); got 3.'));
  });
  it('weights of the wrong size are #VALUE!', () => {
    expect(cell('FIT', YS, XS, null, null, col(1, 1))).toEqual(err('#VALUE!', 'weights: needs one cell per cell of known_ys (4); got 2.'));
  });
});

describe('blank cells never enter a fit as 0', () => {
  // With a real 0 in row 2 the fit pools rows 1–2: (1 + 0)/2 = 0.5. Left out, rows 1, 3, 4 are already rising.
  const ysZero = col(1, 0, 2, 4);
  it('null is a blank: its row is left out and its fitted cell is empty', () => {
    expect(cell('FIT', col(1, null, 2, 4), XS)).toEqual([[1], [''], [2], [4]]);
  });
  it('"" is a blank as well', () => {
    expect(cell('FIT', col(1, '', 2, 4), XS)).toEqual([[1], [''], [2], [4]]);
  });
  it('a blank x or a blank weight leaves the row out too', () => {
    expect(cell('FIT', ysZero, col(1, null, 3, 4))).toEqual([[1], [''], [2], [4]]);
    expect(cell('FIT', ysZero, XS, null, null, col(1, '', 1, 1))).toEqual([[1], [''], [2], [4]]);
  });
  it("policy 'values': a 0 without type information is the number 0", () => {
    expect(cell('FIT', ysZero, XS)).toEqual([[0.5], [0.5], [2], [4]]);
  });
  it("policy 'types': a 0 whose value type is Empty is a blank", () => {
    const types = [['Double'], ['Empty'], ['Double'], ['Double']];
    expect(cell('FIT', applyBlankTypes(ysZero, types), XS)).toEqual([[1], [''], [2], [4]]);
  });
  it("policy 'types': a typed 0 (value type Double) stays 0", () => {
    const types = [['Double'], ['Double'], ['Double'], ['Double']];
    expect(cell('FIT', applyBlankTypes(ysZero, types), XS)).toEqual([[0.5], [0.5], [2], [4]]);
  });
  it('STATS reports the rows left out', () => {
    const types = [['Double'], ['Empty'], ['Double'], ['Double']];
    const stats = cell('STATS', applyBlankTypes(ysZero, types), XS) as [string, number][];
    expect(stats[0]).toEqual(['n', 3]);
    expect(stats[1]).toEqual(['dropped', 1]);
  });
  it('type grids of another shape leave the argument unchanged (values policy)', () => {
    expect(applyBlankTypes(ysZero, [['Empty']])).toBe(ysZero);
    expect(applyBlankTypes(0, [['Empty']])).toBeNull();
  });
  it('only arguments holding a 0 need a type check', () => {
    expect(hasZero(col(1, 2))).toBe(false);
    expect(hasZero(col(1, 0))).toBe(true);
    expect(hasZero(0)).toBe(true);
    expect(hasZero(undefined)).toBe(false);
  });
  it('resolveBlanks reads each address once even for many concurrent calls, and only for zeros', async () => {
    let reads = 0;
    const read = async (sheet: string, range: string) => {
      reads++;
      expect([sheet, range]).toEqual(['Data', 'B1:B4']);
      return [['Double'], ['Empty'], ['Double'], ['Double']];
    };
    const inflight = new Map();
    const calls = Array.from({ length: 50 }, () => resolveBlanks([ysZero, XS], ['Data!B1:B4', 'Data!A1:A4'], read, inflight));
    const all = await Promise.all(calls);
    expect(reads).toBe(1); // XS has no zero: not read at all
    for (const args of all) expect(args[0]).toEqual(col(1, null, 2, 4));
  });
  it('a failed type read falls back to the values policy', async () => {
    const out = await resolveBlanks([ysZero], ['Data!B1:B4'], async () => Promise.reject(new Error('no access')), new Map());
    expect(out[0]).toBe(ysZero);
  });
  it('addresses: quoted sheet names, workbook prefixes, non-addresses', () => {
    expect(splitAddress("'It''s data'!$B$2:$B$9")).toEqual({ sheet: "It's data", range: '$B$2:$B$9' });
    expect(splitAddress('[Book1]Sheet1!A:A')).toEqual({ sheet: 'Sheet1', range: 'A:A' });
    expect(splitAddress('Sheet1!A1')).toEqual({ sheet: 'Sheet1', range: 'A1' });
    expect(splitAddress('')).toBeUndefined();
    expect(splitAddress('{1,2,3}')).toBeUndefined();
    expect(splitAddress(undefined)).toBeUndefined();
  });
});

describe('text, logicals and numbers stored as text in data ranges', () => {
  it('text is #VALUE! naming the argument and the cell', () => {
    expect(cell('FIT', col(1, 'abc', 2, 4), XS)).toEqual(err('#VALUE!', 'known_ys: needs numbers or blanks; cell 2 is the text "abc".'));
  });
  it('a number stored as text is #VALUE! with a hint', () => {
    expect(cell('FIT', YS, col(1, '2', 3, 4))).toEqual(
      err('#VALUE!', 'known_xs: needs numbers or blanks; cell 2 is the text "2" (a number stored as text: convert it with VALUE).'),
    );
  });
  it('a logical is #VALUE!', () => {
    expect(cell('FIT', col(1, true, 2, 4), XS)).toEqual(err('#VALUE!', 'known_ys: needs numbers or blanks; cell 2 is the logical TRUE.'));
  });
  it('positions in a row are counted along the row, in a block by row and column', () => {
    expect(cell('FIT', row(1, 2, 'x'), row(1, 2, 3))).toEqual(err('#VALUE!', 'known_ys: needs numbers or blanks; cell 3 is the text "x".'));
    expect(cell('PREDICT', [[1, 2], [3, 'x']], YS, XS)).toEqual(err('#VALUE!', 'new_xs: needs numbers or blanks; row 2, column 2 is the text "x".'));
  });
  it('NaN, ±Infinity and magnitudes above 1e100 or (non-zero) below 1e-300 are #VALUE!', () => {
    expect(cell('FIT', col(1, NaN, 2, 4), XS)).toEqual(err('#VALUE!', 'known_ys: needs finite numbers; cell 2 is NaN.'));
    expect(cell('FIT', YS, col(1, 2, Infinity, 4))).toEqual(err('#VALUE!', 'known_xs: needs finite numbers; cell 3 is Infinity.'));
    expect(cell('FIT', col(1, 2, -1e101, 4), XS)).toEqual(err('#VALUE!', 'known_ys: needs numbers of magnitude from 1e-300 to 1e100, or 0; cell 3 is -1e+101.'));
    expect(cell('FIT', col(1, 2, 1e-310, 4), XS)).toEqual(err('#VALUE!', 'known_ys: needs numbers of magnitude from 1e-300 to 1e100, or 0; cell 3 is 1e-310.'));
    // The extremes that are accepted fit without overflow or underflow: (1e100 − 1e100)/2 = 0, and
    // data of magnitude 1e-300 pool like any other: (3e-300 + 2e-300)/2 = 2.5e-300.
    expect(cell('FIT', col(1e100, -1e100, 3e99, 1e100), XS)).toEqual([[0], [0], [3e99], [1e100]]);
    const tiny = (cell('FIT', col(1e-300, 3e-300, 2e-300, 4e-300), XS) as number[][]).map((r) => r[0]!);
    expect(tiny).toBeAllCloseRel([1e-300, 2.5e-300, 2.5e-300, 4e-300], 1e-12, 0);
  });
});

describe('error cells propagate', () => {
  it('#DIV/0! in known_ys comes out as #DIV/0!', () => {
    expect(cell('FIT', col(1, { kind: 'error', code: '#DIV/0!' }, 2, 4), XS)).toEqual(err('#DIV/0!', 'known_ys: cell 2 holds the error #DIV/0!.'));
  });
  it('#N/A in known_xs comes out as #N/A', () => {
    expect(cell('PREDICT', 2, YS, col(1, 2, { kind: 'error', code: '#N/A' }, 4))).toEqual(err('#N/A', 'known_xs: cell 3 holds the error #N/A.'));
  });
  it('#NUM! in a knot table comes out as #NUM!', () => {
    expect(cell('EVAL', 1, [[0, 0], [1, { kind: 'error', code: '#NUM!' } as never]])).toEqual(err('#NUM!', 'knot_table: row 2, column 2 holds the error #NUM!.'));
  });
  it('codes a custom function cannot return (#REF!, #NAME?, #SPILL!) become #VALUE! with the code in the message', () => {
    expect(cell('FIT', col(1, { kind: 'error', code: '#REF!' }, 2, 4), XS)).toEqual(err('#VALUE!', 'known_ys: cell 2 holds the error #REF!.'));
    expect(cell('FIT', YS, XS, null, null, col(1, 1, { kind: 'error', code: '#NAME?' }, 1))).toEqual(err('#VALUE!', 'weights: cell 3 holds the error #NAME?.'));
  });
  it('an error cell in a scalar option propagates too', () => {
    expect(cell('FIT', YS, XS, { kind: 'error', code: '#DIV/0!' })).toEqual(err('#DIV/0!', 'knots: the cell holds the error #DIV/0!.'));
  });
});

describe('options', () => {
  it('knots: 0, blank or omitted is the classic fit; a whole number K ≥ 2 gives K knots', () => {
    expect(cell('KNOTS', YS, XS)).toEqual([[1, 1], [2, 2.5], [3, 2.5], [4, 4]]);
    expect(cell('KNOTS', YS, XS, 0)).toEqual(cell('KNOTS', YS, XS));
    expect(cell('KNOTS', YS, XS, [[null]])).toEqual(cell('KNOTS', YS, XS));
    expect((cell('KNOTS', YS, XS, 3) as unknown[]).length).toBe(3);
  });
  it('knots 1 or fractional is #VALUE!', () => {
    const m = 'knots: needs 0 (classic fit), a whole number of knots ≥ 2, or a range of knot positions; got ';
    expect(cell('FIT', YS, XS, 1)).toEqual(err('#VALUE!', `${m}1.`));
    expect(cell('FIT', YS, XS, 2.5)).toEqual(err('#VALUE!', `${m}2.5.`));
    expect(cell('FIT', YS, XS, -2)).toEqual(err('#VALUE!', `${m}-2.`));
  });
  it('knots written as text is read as the number', () => {
    expect(cell('KNOTS', YS, XS, ' 2 ')).toEqual(cell('KNOTS', YS, XS, 2));
  });
  it('knot positions: a range of ≥ 2 strictly increasing numbers; blanks skipped', () => {
    // Two knots at the ends: the least-squares line through (1,1),(2,3),(3,2),(4,4): slope 0.8, intercept 0.5.
    const k = cell('KNOTS', YS, XS, col(1, null, 4)) as number[][];
    expect(k.map((r) => r[0])).toEqual([1, 4]);
    expect(k.map((r) => r[1])).toBeAllCloseRel([1.3, 3.7], 1e-12);
    expect(cell('FIT', YS, XS, col(1, 3, 2))).toEqual(err('#VALUE!', 'knots: needs strictly increasing positions; position 3 (2) is not above 3.'));
    expect(cell('FIT', YS, XS, col(1, null))).toEqual(err('#VALUE!', 'knots: needs at least 2 knot positions; got 1.'));
    expect(cell('FIT', YS, XS, col(1, 'a', 3))).toEqual(err('#VALUE!', 'knots: needs numbers or blanks; cell 2 is the text "a".'));
  });
  it('direction: 1, -1, 0; anything else is #VALUE!', () => {
    expect(cell('FIT', col(4, 2, 3, 1), XS, null, -1)).toEqual([[4], [2.5], [2.5], [1]]);
    expect(cell('FIT', col(4, 2, 3, 1), XS, null, 0)).toEqual([[4], [2.5], [2.5], [1]]);
    const m = 'direction: needs 1 (rising), -1 (falling) or 0 (pick from the data); got ';
    expect(cell('FIT', YS, XS, null, 2)).toEqual(err('#VALUE!', `${m}2.`));
    expect(cell('FIT', YS, XS, null, 0.5)).toEqual(err('#VALUE!', `${m}0.5.`));
    expect(cell('FIT', YS, XS, null, true)).toEqual(err('#VALUE!', 'direction: needs a number; got the logical TRUE.'));
    expect(cell('FIT', YS, XS, null, 'up')).toEqual(err('#VALUE!', 'direction: needs a number; got the text "up".'));
    expect(cell('FIT', YS, XS, null, col(1, 1))).toEqual(err('#VALUE!', 'direction: needs a single value; got a range of 2 cells.'));
  });
  it('weights: negative is #VALUE!; all zero is #VALUE!', () => {
    expect(cell('FIT', YS, XS, null, null, col(1, -1, 1, 1))).toEqual(err('#VALUE!', 'weights: needs numbers ≥ 0; cell 2 is -1.'));
    expect(cell('FIT', YS, XS, null, null, col(0, 0, 0, 0))).toEqual(err('#VALUE!', 'weights: needs at least one positive weight; all are 0.'));
  });
  it('fewer than 2 usable rows is #VALUE!', () => {
    expect(cell('FIT', col(1, null, null), col(1, 2, 3))).toEqual(err('#VALUE!', 'known_ys: needs at least 2 rows where known_ys and known_xs both hold numbers; got 1.'));
    expect(cell('FIT', col(1, 2), col(1, 2), null, null, col(1, null))).toEqual(
      err('#VALUE!', 'known_ys: needs at least 2 rows where known_ys, known_xs and weights all hold numbers; got 1.'),
    );
    expect(cell('FIT', col(1, 2), col(5, 5))).toEqual(err('#VALUE!', 'known_xs: needs at least 2 distinct values with positive weight; got 1.'));
  });
  it('an empty range is #VALUE!', () => {
    expect(cell('FIT', [], XS)).toEqual(err('#VALUE!', 'known_ys: needs at least one value; got none.'));
  });
});

describe('knot tables (EVAL, INVERT)', () => {
  const table = [[0, 0], [1, 1], [2, 1], [3, 2]];
  it('EVAL interpolates and is flat beyond the ends', () => {
    expect(cell('EVAL', col(-1, 0.5, 1.5, 2.5, 9, null), table)).toEqual([[0], [0.5], [1], [1.5], [2], ['']]);
  });
  it('EVAL accepts a one-row table (a constant) and trailing blank rows', () => {
    expect(cell('EVAL', 7, [[1, 5]])).toEqual([[5]]);
    expect(cell('EVAL', 0.5, [...table, [null, null], ['', '']])).toEqual([[0.5]]);
  });
  it('malformed tables are #VALUE!', () => {
    expect(cell('EVAL', 1, [[0, 0, 0, 0], [1, 1, 1, 1]])).toEqual(err('#VALUE!', 'knot_table: needs two columns (knot x, value) or three (knot x, value, degree 1 or 2); got 4.'));
    expect(cell('EVAL', 1, [[0, 0, 0], [1, 1, 1]])).toEqual(err('#VALUE!', 'knot_table: needs the degree 1 or 2 in its third column; row 1 has 0.'));
    expect(cell('EVAL', 1, [[0, 0, 2], [1, 1, 1], [2, 2, 2]])).toEqual(err('#VALUE!', 'knot_table: needs the same degree in every row of its third column; row 2 has 1, earlier rows 2.'));
    expect(cell('EVAL', 1, [[0, 0, 2], [1, 1, 2]])).toEqual(err('#VALUE!', 'knot_table: needs an odd number of rows, at least 3 (knots and midpoints), when its third column says 2; got 2.'));
    expect(cell('EVAL', 1, [[0, 0], [0, 1]])).toEqual(err('#VALUE!', 'knot_table: needs strictly increasing positions; position 2 (0) is not above 0.'));
    expect(cell('EVAL', 1, [[0, 0], [1, null]])).toEqual(err('#VALUE!', 'knot_table: needs a position and a value in every row; row 2 has a blank.'));
    expect(cell('EVAL', 1, [[null, null]])).toEqual(err('#VALUE!', 'knot_table: needs at least 1 knot row; got 0.'));
    expect(cell('INVERT', 1, [[0, 0]])).toEqual(err('#VALUE!', 'knot_table: needs at least 2 knot rows; got 1.'));
    expect(cell('INVERT', 1, [[0, 0], [1, 2], [2, 1]])).toEqual(err('#VALUE!', 'knot_table: needs monotone values (all rising or all falling) to read back x.'));
  });
  it('INVERT reads back x; tie picks the lowest, middle or highest x of a flat stretch', () => {
    expect(cell('INVERT', col(0.5, 1.5, null), table)).toEqual([[0.5], [2.5], ['']]);
    expect(cell('INVERT', 1, table)).toEqual([[1.5]]);
    expect(cell('INVERT', 1, table, -1)).toEqual([[1]]);
    expect(cell('INVERT', 1, table, 1)).toEqual([[2]]);
    expect(cell('INVERT', 1, table, 2)).toEqual(err('#VALUE!', 'tie: needs -1 (lowest x), 0 (middle) or 1 (highest x); got 2.'));
  });
  it('INVERT outside the curve is #N/A with a message', () => {
    expect(cell('INVERT', 5, table)).toEqual(err('#N/A', "target_ys: 5 is outside the curve's range [0, 2]."));
  });
  it('INVERT on a falling table', () => {
    expect(cell('INVERT', 1.5, [[0, 2], [1, 1]])).toEqual([[0.5]]);
  });
});

describe('QKNOTS', () => {
  it('quantile positions as a column, blanks skipped (type-7 quantiles, hand computed)', () => {
    expect(cell('QKNOTS', col(1, 2, null, 3, 4, 100), 3)).toEqual([[1], [3], [100]]);
  });
  it('count is required and must be a whole number ≥ 2', () => {
    expect(cell('QKNOTS', XS)).toEqual(err('#VALUE!', 'count: needs a whole number of knots ≥ 2; got nothing.'));
    expect(cell('QKNOTS', XS, 1)).toEqual(err('#VALUE!', 'count: needs a whole number of knots ≥ 2; got 1.'));
    expect(cell('QKNOTS', col(null, ''), 2)).toEqual(err('#VALUE!', 'known_xs: needs at least one number; got none.'));
    expect(cell('QKNOTS', col(3, 3), 2)).toEqual(err('#VALUE!', 'known_xs: needs at least 2 distinct values to place quantile knots.'));
  });
});

describe('STATS', () => {
  it('label/value rows in the documented order (hand computed)', () => {
    // Used rows y = 1, 3, 2, 4, 6 at x = 1, 2, 3, 4, 6; fit 1, 2.5, 2.5, 4, 6: SSE 0.5, MAE 1/5,
    // ȳ = 3.2, SST = 14.8, R² = 1 − 0.5/14.8.
    const out = cell('STATS', col(1, 3, 2, 4, null, 6), col(1, 2, 3, 4, 5, 6)) as [string, number][];
    expect(out.map((r) => r[0])).toEqual(['n', 'dropped', 'knots', 'direction', 'r2', 'rmse', 'mae', 'sse', 'levels', 'text_rows', 'sigma', 'df_resid', 'spearman']);
    expect(out.slice(0, 4)).toEqual([['n', 5], ['dropped', 1], ['knots', 5], ['direction', 1]]);
    expect(out[4]![1]).toBeCloseRel(1 - 0.5 / 14.8, 1e-14);
    expect(out[5]![1]).toBeCloseRel(Math.sqrt(0.1), 1e-14);
    expect(out[6]![1]).toBeCloseRel(0.2, 1e-14);
    expect(out[7]![1]).toBeCloseRel(0.5, 1e-14);
    expect(out[8]).toEqual(['levels', 4]);
    // σ̂ = √(SSE / (n − levels)) = √(0.5 / 1); Spearman: ranks of y 1, 3, 2, 4, 5 against 1 … 5,
    // Σd² = 2, ρ = 1 − 6·2/(5·24) = 0.9 (hand computed).
    expect(out[9]).toEqual(['text_rows', 0]);
    expect(out[10]![1]).toBeCloseRel(Math.sqrt(0.5), 1e-14);
    expect(out[11]).toEqual(['df_resid', 1]);
    expect(out[12]![1]).toBeCloseRel(0.9, 1e-14);
  });
  it('sigma is #N/A with a message when no degree of freedom is left; spearman #N/A for constant y', () => {
    const out = cell('STATS', col(1, 2), col(1, 2)) as [string, unknown][];
    expect(out[10]).toEqual(['sigma', { kind: 'error', code: '#N/A', message: 'known_ys: needs more rows with positive weight (2) than fitted levels (2) to estimate the scatter.' }]);
    expect(out[11]).toEqual(['df_resid', 0]);
    const flat = cell('STATS', col(1, 1, 1), col(1, 2, 3)) as [string, unknown][];
    expect(flat[12]).toEqual(['spearman', { kind: 'error', code: '#N/A', message: 'known_ys: needs x and y that both vary among the rows with positive weight for a rank correlation.' }]);
  });
  it('direction 0 reports the direction chosen', () => {
    const out = cell('STATS', col(4, 2, 3, 1), XS, null, 0) as [string, number][];
    expect(out[3]).toEqual(['direction', -1]);
  });
});

describe('CV and BESTK options', () => {
  const y = col(1, 3, 2, 4, 6, 5, 7, 8, 9, 10);
  const x = col(1, 2, 3, 4, 5, 6, 7, 8, 9, 10);
  it('the CV table has a header row and one row per candidate', () => {
    const t = cell('CV', y, x, col(0, 2, 3), 3, null, 0) as (string | number)[][];
    expect(t[0]).toEqual(['knots', 'cv_rmse', 'cv_se', 'cv_r2', 'cv_mae', 'train_rmse']);
    expect(t.map((r) => r[0])).toEqual(['knots', 0, 2, 3]);
  });
  it('folds out of range, repeats < 1, bad candidates and rules are #VALUE!', () => {
    expect(cell('CV', y, x, null, 1)).toEqual(err('#VALUE!', 'folds: needs a whole number from 2 to the number of rows used (10); got 1.'));
    expect(cell('CV', y, x, null, 11)).toEqual(err('#VALUE!', 'folds: needs a whole number from 2 to the number of rows used (10); got 11.'));
    expect(cell('CV', y, x, null, null, 0)).toEqual(err('#VALUE!', 'repeats: needs a whole number from 1 to 1000; got 0.'));
    expect(cell('CV', y, x, col(2, 2.5))).toEqual(
      err('#VALUE!', 'candidates: needs knot counts that are 0 (classic fit) or whole numbers from 2 to 100000; entry 2 is 2.5.'),
    );
    expect(cell('BESTK', y, x, null, null, null, null, null, null, 3)).toEqual(err('#VALUE!', 'rule: needs 1 (one-standard-error rule) or 0 (minimum); got 3.'));
    expect(cell('CV', y, x, null, 'five')).toEqual(err('#VALUE!', 'folds: needs a number; got the text "five".'));
  });
  it('BESTK returns a single number', () => {
    expect(typeof cell('BESTK', y, x, col(2, 3, 4), 5, 1, 0)).toBe('number');
  });
});

describe('the one error mapping', () => {
  it('maps codes of the core to cell errors', () => {
    expect(mapError(new RatchetError('BAD_KNOTS', 'knots', 'needs more'))).toEqual({ code: '#VALUE!', message: 'knots: needs more.' });
    expect(mapError(new RatchetError('NOT_REACHABLE', 'target', 'is out'))).toEqual({ code: '#N/A', message: 'target: is out.' });
    expect(mapError(new RatchetError('CANCELLED', 'calculation', 'was cancelled'))).toEqual({ code: '#N/A', message: 'calculation cancelled.' });
    expect(mapError(new RatchetError('NUMERICAL', 'FIT', 'failed'))).toEqual({ code: '#NUM!', message: 'FIT: failed.' });
    expect(mapError(new InputCellError('#NULL!', 'known_ys', 'cell 1'))).toEqual({ code: '#NULL!', message: 'known_ys: cell 1 holds the error #NULL!.' });
    expect(mapError(new MappedCellError({ code: '#N/A', message: 'm' }))).toEqual({ code: '#N/A', message: 'm' });
    expect(mapError(new TypeError('boom'))).toEqual({ code: '#NUM!', message: 'internal failure: boom' });
    expect(mapError('odd')).toEqual({ code: '#NUM!', message: 'internal failure: odd' });
  });
  it('Excel errors carry a message only for #VALUE! and #N/A', () => {
    class FakeError extends Error {
      constructor(
        readonly code: string,
        message?: string,
      ) {
        super(message);
      }
    }
    const v = toExcelError(new RatchetError('BAD_OPTION', 'tie', 'needs -1, 0 or 1'), FakeError as never) as FakeError;
    expect([v.code, v.message]).toEqual(['#VALUE!', 'tie: needs -1, 0 or 1.']);
    const d = toExcelError(new InputCellError('#DIV/0!', 'known_ys', 'cell 2'), FakeError as never) as FakeError;
    expect([d.code, d.message]).toEqual(['#DIV/0!', '']);
  });
});

describe('Excel value conversion', () => {
  it('omitted optional arguments arrive as null and become undefined', () => {
    expect(fromExcelArg(null)).toBeUndefined();
    expect(fromExcelArg(undefined)).toBeUndefined();
  });
  it('error objects become error cells; typed cell values are unwrapped', () => {
    expect(fromExcelArg([[1], [{ code: '#DIV/0!' }], [{ code: '#N/A', message: 'lookup' }], [undefined]])).toEqual([
      [1],
      [{ kind: 'error', code: '#DIV/0!' }],
      [{ kind: 'error', code: '#N/A', message: 'lookup' }],
      [null],
    ]);
    expect(fromExcelArg([[{ type: 'Double', basicValue: 3 }, { type: 'Error', basicValue: '#REF!' }]])).toEqual([[3, { kind: 'error', code: '#REF!' }]]);
  });
  it('results: matrices stay 2-D, a scalar result of a matrix function is wrapped', () => {
    expect(toExcelResult(3, true)).toEqual([[3]]);
    expect(toExcelResult([[1, 2]], true)).toEqual([[1, 2]]);
    expect(toExcelResult(4, false)).toBe(4);
  });
});

describe('readers', () => {
  it('ranges of 64+ cells with the same cells give the remembered parse (content, not identity); small ones are parsed every time', () => {
    const big = col(...Array.from({ length: 64 }, (_, i) => (i === 5 ? null : i)));
    const a = readVector('known_ys', big);
    expect(readVector('known_xs', big)).toBe(a);
    expect(a.blanks).toBe(1);
    expect(a.values[5]).toBeNaN();
    const small = col(1, 2, null);
    const b = readVector('known_ys', small);
    expect(readVector('known_ys', small)).not.toBe(b);
    expect(Array.from(b.values)).toEqual([1, 2, NaN]);
    expect(b.blanks).toBe(1);
  });
  it('equal content in different objects hashes equally; -0 and 0 are the same number', () => {
    expect(readVector('known_ys', col(0, 1)).hash).toBe(readVector('known_ys', col(-0, 1)).hash);
    expect(readVector('known_ys', col(0, 1)).hash).not.toBe(readVector('known_ys', row(0, 1)).hash);
  });
  it('cache keys: equal data hash and compare equal, blanks included; any change differs', () => {
    const a = Float64Array.of(1, NaN, 3);
    expect(sameBits(a, Float64Array.of(1, NaN, 3))).toBe(true);
    expect(hashFloat64(a)).toBe(hashFloat64(Float64Array.of(1, NaN, 3)));
    expect(sameBits(a, Float64Array.of(1, 2, 3))).toBe(false);
    expect(sameBits(a, Float64Array.of(1, NaN))).toBe(false);
    expect(hashFloat64(a)).not.toBe(hashFloat64(Float64Array.of(1, NaN, 3 + 2 ** -51)));
    expect(hashFloat64(Float64Array.of(1, 2))).not.toBe(hashFloat64(Float64Array.of(2, 1)));
  });
  it('scalars and knots', () => {
    expect(readScalar('folds', [[' 7 ']])).toBe(7);
    expect(readScalar('folds', [['']])).toBeUndefined();
    expect(readKnots('knots', undefined)).toBe(0);
    expect(Array.from(readKnots('knots', row(1, 2, 5)) as Float64Array)).toEqual([1, 2, 5]);
  });
});
