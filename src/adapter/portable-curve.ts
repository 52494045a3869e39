/**
 * A portable curve: the formula text that reads a knot table with Excel's own built-in functions
 * only (IF, ISBLANK, ISNUMBER, INDEX, MATCH and arithmetic), so a colleague without the add-in
 * can predict from a fitted model. Nothing in the formula needs the add-in, dynamic arrays or LET;
 * it calculates in every Excel version since 2007 and in other spreadsheet programs that read
 * .xlsx files. Pure functions, no host APIs.
 */
import { checkKnotTable, fail } from '../core/index.js';
import { MAX_COLS, MAX_ROWS, columnLetters, columnNumber } from './a1.js';

/** Where a knot table sits: two columns (knot x, fitted value), one row per knot, no header. */
export interface KnotTablePlace {
  /** Sheet of the table; undefined = the sheet of the formula (no sheet prefix). */
  readonly sheet?: string | undefined;
  /** Top-left cell of the table (the first knot x), e.g. "D2" or "$D$2". */
  readonly topLeft: string;
  /** Number of knots (rows of the table), 1 … 1,048,576. */
  readonly rows: number;
}

/** A sheet name followed by "!", quoted with doubled apostrophes when Excel needs quotes. */
function sheetPart(sheet: string | undefined): string {
  if (sheet === undefined) return '';
  if (sheet === '') fail('BAD_OPTION', 'sheet', 'needs a sheet name or nothing; got an empty name');
  const plain = /^[A-Za-z_][A-Za-z0-9_.]*$/.test(sheet) && !/^[A-Za-z]{1,3}[0-9]+$/.test(sheet) && !/^R[0-9]*C[0-9]*$/i.test(sheet);
  return plain ? `${sheet}!` : `'${sheet.replace(/'/g, "''")}'!`;
}

/** Parses "D2" / "$D$2" into a 1-based row and column. */
function parseCell(text: string, argument: string): { row: number; col: number } {
  const m = /^\$?([A-Za-z]{1,3})\$?([1-9][0-9]{0,6})$/.exec(text.trim());
  const col = m ? columnNumber(m[1]!) : 0;
  const row = m ? Number(m[2]) : 0;
  if (!m || col > MAX_COLS || row > MAX_ROWS) fail('BAD_OPTION', argument, `needs one cell address such as D2 or $D$2; got "${text}"`);
  return { row, col };
}

/**
 * The formula text (with a leading "=") that predicts at the value of the cell `newX` from the
 * knot table at `table`: straight lines between neighbouring knots, the first knot's value at
 * and below the first knot x, the last knot's value at and above the last knot x — the same
 * curve RATCHET.EVAL reads from that table.
 *
 * With X the knot x column and Y the value column (absolute references), the formula is
 * `IF(ISBLANK(x),"",IF(ISNUMBER(x),IF(x<=INDEX(X,1),INDEX(Y,1),IF(x>=INDEX(X,K),INDEX(Y,K),
 * INDEX(Y,i)+(x-INDEX(X,i))/(INDEX(X,i+1)-INDEX(X,i))*(INDEX(Y,i+1)-INDEX(Y,i)))),#VALUE!))`
 * where i = MATCH(x,X,1), the last knot x ≤ x (MATCH's sorted lookup). The arithmetic is the one
 * the add-in uses between two knots (v₀ + share·(v₁ − v₀)), so the two agree to rounding.
 * A blank new-x cell gives an empty text ""; text or a logical in it gives #VALUE!, as
 * RATCHET.EVAL does. With one knot the formula returns that knot's value for every number.
 * Unlike the add-in, which refuses numbers of magnitude below 1e-300 or above 1e100 (README,
 * "How cells are read"), the formula reads such an x like any other.
 *
 * Cost: O(1) to build, O(length of the text); in the sheet, MATCH on sorted data is a binary
 * search, O(log K) per cell.
 *
 * @param table where the table sits; its knot x must be strictly increasing (as RATCHET.KNOTS
 *   writes them) — the formula cannot check that, so pass only tables RATCHET.KNOTS produced or
 *   RATCHET.EVAL accepts. `rows` is a whole number from 1 to the rows left below `topLeft`;
 *   the table needs two columns, so `topLeft` may not be in the last column.
 * @param newX the cell holding the new x, as it should appear in the formula ("A2", "$A$2",
 *   "'Other sheet'!B5"); it is written as given, so a relative address fills down correctly.
 * @returns the formula text, e.g. for use with Range.formulas or as text pasted into a cell.
 * @throws RatchetError BAD_OPTION naming `topLeft`, `rows`, `sheet` or `newX` when one is malformed.
 * @example portableCurveFormula({ topLeft: 'D2', rows: 3 }, 'G2')
 * // → '=IF(ISBLANK(G2),"",IF(ISNUMBER(G2),IF(G2<=INDEX($D$2:$D$4,1),INDEX($E$2:$E$4,1),IF(G2>=INDEX($D$2:$D$4,3),INDEX($E$2:$E$4,3),INDEX($E$2:$E$4,MATCH(G2,$D$2:$D$4,1))+(G2-INDEX($D$2:$D$4,MATCH(G2,$D$2:$D$4,1)))/(INDEX($D$2:$D$4,MATCH(G2,$D$2:$D$4,1)+1)-INDEX($D$2:$D$4,MATCH(G2,$D$2:$D$4,1)))*(INDEX($E$2:$E$4,MATCH(G2,$D$2:$D$4,1)+1)-INDEX($E$2:$E$4,MATCH(G2,$D$2:$D$4,1))))),#VALUE!))'
 * @see README, "Sharing with your team" (the hand-off options).
 */
export function portableCurveFormula(table: KnotTablePlace, newX: string): string {
  const { row, col } = parseCell(table.topLeft, 'topLeft');
  if (col >= MAX_COLS) fail('BAD_OPTION', 'topLeft', `needs room for two columns; ${table.topLeft} is in the last column`);
  const k = table.rows;
  if (!Number.isInteger(k) || k < 1 || row + k - 1 > MAX_ROWS) {
    fail('BAD_OPTION', 'rows', `needs a whole number of knots from 1 to ${MAX_ROWS - row + 1} (the rows below ${table.topLeft}); got ${String(k)}`);
  }
  const x = newX.trim();
  if (x === '' || /[(),;:"{}#]/.test(x) || !/!?\$?[A-Za-z]{1,3}\$?[0-9]+$/.test(x)) {
    fail('BAD_OPTION', 'newX', `needs the address of one cell such as A2 or 'Sheet 1'!$B$5; got "${newX}"`);
  }
  const p = sheetPart(table.sheet);
  const xc = columnLetters(col);
  const yc = columnLetters(col + 1);
  const last = row + k - 1;
  const X = `${p}$${xc}$${row}:$${xc}$${last}`;
  const Y = `${p}$${yc}$${row}:$${yc}$${last}`;
  const numberCase =
    k === 1
      ? `INDEX(${Y},1)`
      : (() => {
          const i = `MATCH(${x},${X},1)`;
          const x0 = `INDEX(${X},${i})`;
          const x1 = `INDEX(${X},${i}+1)`;
          const y0 = `INDEX(${Y},${i})`;
          const y1 = `INDEX(${Y},${i}+1)`;
          const inner = `${y0}+(${x}-${x0})/(${x1}-${x0})*(${y1}-${y0})`;
          return `IF(${x}<=INDEX(${X},1),INDEX(${Y},1),IF(${x}>=INDEX(${X},${k}),INDEX(${Y},${k}),${inner}))`;
        })();
  return `=IF(ISBLANK(${x}),"",IF(ISNUMBER(${x}),${numberCase},#VALUE!))`;
}

/** One cell of a portable-curve block, at an offset from its top-left cell. */
export interface PortableCell {
  /** Rows below and columns right of the block's top-left cell, from 0. */
  readonly dr: number;
  readonly dc: number;
  /** A number (knot table), a label, or a formula (text starting with "="). */
  readonly value: number | string;
}

/** Labels of the block's header row. */
export const PORTABLE_HEADER: readonly string[] = ['knot x', 'fitted value', '', 'new x', 'predicted'];

/**
 * The cells of a self-contained portable curve, to write from a top-left cell at (row, col) of a
 * sheet: a header row ({@link PORTABLE_HEADER}); below it the knot table as plain values in the
 * first two columns; an empty column; then `newXRows` empty "new x" cells with, beside each, the
 * {@link portableCurveFormula} that predicts at it. Typing x values into the "new x" column gives
 * predictions without the add-in. Cost O(K + newXRows).
 *
 * @param knots the knot table (knot x strictly increasing, finite values), e.g. a RATCHET.KNOTS
 *   result; 1 to 1,048,575 rows.
 * @param at the block's top-left cell: 1-based `row` and `col`, and the `sheet` the formulas live
 *   on (undefined: no sheet prefix, same sheet). Column `col` + 4 must exist.
 * @param newXRows how many "new x" rows to prepare, a whole number ≥ 1; default 10.
 * @throws RatchetError BAD_KNOTS / NON_FINITE naming `knots` for a table the formula could not read
 *   correctly — among them the table of a smooth fit (rows with a third column 2, as RATCHET.KNOTS
 *   gives it for degree 2): the portable formula draws straight lines between rows and would not
 *   reproduce that curve, so it is refused rather than approximated; BAD_OPTION naming `at` or
 *   `newXRows`.
 * @example portableCurveBlock([[1, 10], [3, 14]], { row: 1, col: 4 }, 1).slice(0, 4)
 * // → [{ dr: 0, dc: 0, value: 'knot x' }, { dr: 0, dc: 1, value: 'fitted value' }, { dr: 0, dc: 3, value: 'new x' }, { dr: 0, dc: 4, value: 'predicted' }]
 */
export function portableCurveBlock(
  knots: readonly (readonly [number, number] | readonly [number, number, number])[],
  at: { readonly row: number; readonly col: number; readonly sheet?: string | undefined },
  newXRows = 10,
): PortableCell[] {
  if (knots.some((k) => k.length > 2 && k[2] !== 1)) {
    fail(
      'BAD_KNOTS',
      'knots',
      'needs a piecewise-linear table (two columns, or a third column of 1s): the portable formula reads straight lines between rows and does not reproduce a smooth (degree 2) curve; hand off a degree 1 fit, or read the smooth table with RATCHET.EVAL',
    );
  }
  checkKnotTable(
    knots.map((k) => k[0]),
    knots.map((k) => k[1]),
    'knots',
  );
  if (!Number.isInteger(at.row) || !Number.isInteger(at.col) || at.row < 1 || at.col < 1 || at.col + 4 > MAX_COLS) {
    fail('BAD_OPTION', 'at', `needs a 1-based row and a column with 4 columns to its right; got row ${at.row}, column ${at.col}`);
  }
  const height = Math.max(knots.length, newXRows) + 1;
  if (!Number.isInteger(newXRows) || newXRows < 1 || at.row + height - 1 > MAX_ROWS) {
    fail('BAD_OPTION', 'newXRows', `needs a whole number ≥ 1 that fits below row ${at.row}; got ${String(newXRows)}`);
  }
  const cells: PortableCell[] = [];
  PORTABLE_HEADER.forEach((label, dc) => {
    if (label !== '') cells.push({ dr: 0, dc, value: label });
  });
  knots.forEach(([x, y], i) => cells.push({ dr: i + 1, dc: 0, value: x }, { dr: i + 1, dc: 1, value: y }));
  const table: KnotTablePlace = { sheet: at.sheet, topLeft: `${columnLetters(at.col)}${at.row + 1}`, rows: knots.length };
  const newXColumn = columnLetters(at.col + 3);
  for (let i = 0; i < newXRows; i++) cells.push({ dr: i + 1, dc: 4, value: portableCurveFormula(table, `${newXColumn}${at.row + 1 + i}`) });
  return cells;
}
