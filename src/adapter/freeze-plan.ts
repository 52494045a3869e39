/**
 * A frozen copy, planned without a host: which cells to overwrite with which values so that a
 * workbook no longer needs the add-in, and the note sheet that records what was replaced. The
 * headless runner (`--freeze`) and the task pane apply the same plan to their own workbook
 * objects. Pure functions, no host APIs.
 */

import { columnLetters } from './a1.js';

/** A cell value as a host reports it; an error cell is `{ error: "#N/A" }`. */
export type FrozenValue = number | string | boolean | null | { readonly error: string };

/** A formula cell with its current result, as a host reports it. */
export interface LiveFormula {
  readonly sheet: string;
  /** 1-based row and column of the formula cell (the top-left cell of a spilled result). */
  readonly row: number;
  readonly col: number;
  /** Formula text with or without the leading "=", typed (`RATCHET.FIT(`) or stored (`_xldudf_RATCHET_FIT(`) form. */
  readonly formula: string;
  /** The result: one row of one value for a single cell, else the block it spills into (rows of equal length). */
  readonly values: readonly (readonly FrozenValue[])[];
}

/** One cell to overwrite with a plain value (1-based row and column). */
export interface FrozenWrite {
  readonly sheet: string;
  readonly row: number;
  readonly col: number;
  readonly value: FrozenValue;
}

/** What to write: the values, and the note sheet (a new sheet; rows of text, top-left at A1). */
export interface FreezePlan {
  /** Every cell of every result of a formula that calls the add-in, in the order of `cells`. */
  readonly writes: readonly FrozenWrite[];
  /** Name of the note sheet, unused by the workbook (compared without regard to case). */
  readonly noteSheet: string;
  /** Rows of the note sheet: a sentence, a blank row, a header, then one row per replaced formula. */
  readonly noteRows: readonly (readonly string[])[];
  /** Number of formulas replaced. */
  readonly replaced: number;
  /**
   * Cells whose result was an error that says the formula could not be evaluated where it stands
   * (#SPILL!, #CALC!, #NAME?, #BUSY!) rather than an answer: the copy keeps that error as a value,
   * and a caller should warn.
   */
  readonly unresolved: readonly string[];
}

/** Header of the table on the note sheet. */
export const NOTE_HEADER: readonly string[] = ['Sheet', 'Cells', 'Formula (replaced by its values)', 'Frozen on'];

/** Base name of the note sheet. */
export const NOTE_SHEET = 'Frozen values';

const UNRESOLVED = new Set(['#SPILL!', '#CALC!', '#NAME?', '#BUSY!']);

/**
 * True when a formula calls a function of the add-in, in the typed (`RATCHET.FIT(`) or the
 * stored (`_xldudf_RATCHET_FIT(`) form; text inside string literals does not count. O(length).
 * @example callsAddIn('=ROUND(RATCHET.EVAL(A2,D2:E5),2)') // → true
 * @example callsAddIn('=CONCAT("RATCHET.FIT(",A1)') // → false
 */
export function callsAddIn(formula: string): boolean {
  const code = formula
    .split('"')
    .filter((_p, i) => i % 2 === 0)
    .join(' ');
  return /(^|[^A-Za-z0-9_.])(RATCHET\.|_xldudf_RATCHET_)[A-Za-z]/i.test(code);
}

/** "B7" of a 1-based row and column. */
function a1(row: number, col: number): string {
  return `${columnLetters(col)}${row}`;
}

/** "2026-12-01 21:45 UTC" of a date. */
function stamp(d: Date): string {
  return `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

/**
 * Plans a frozen copy: for each formula that calls the add-in (see {@link callsAddIn}), every cell
 * of its current result becomes a plain value, and the note sheet lists the sheet, the cells
 * (`D2` or `D2:E7`), the formula (typed form, with "=") and the date. Other formulas are left
 * alone: they read the frozen values and so give the same results as before. The copy then shows
 * the same values in Excel without the add-in, and they no longer change with the data.
 *
 * Cost: O(formula cells + cells of their results).
 *
 * @param cells the workbook's formula cells with their current results (any order; each anchor once).
 * @param options `date`: when the copy is made (shown on the note sheet); `sheets`: the names of
 *   the workbook's sheets, so that the note sheet gets a free name (`Frozen values`, else
 *   `Frozen values 2`, 3, …).
 * @returns the writes and the note sheet; `replaced` 0 when no formula calls the add-in (the note
 *   sheet then says so).
 * @throws Error when a result is empty or ragged (a host bug: every formula has at least one value).
 * @example freezePlan([{ sheet: 'Data', row: 2, col: 4, formula: '=RATCHET.EVAL(3,{1,1;6,5})', values: [[2.6]] }], { date: new Date('2026-12-01T21:45:00Z'), sheets: ['Data'] })
 * // → { writes: [{ sheet: 'Data', row: 2, col: 4, value: 2.6 }], noteSheet: 'Frozen values', replaced: 1, unresolved: [],
 * //     noteRows: [[…sentence…], [], ['Sheet', 'Cells', 'Formula (replaced by its values)', 'Frozen on'], ['Data', 'D2', '=RATCHET.EVAL(3,{1,1;6,5})', '2026-12-01 21:45 UTC']] }
 */
export function freezePlan(cells: readonly LiveFormula[], options: { readonly date: Date; readonly sheets: readonly string[] }): FreezePlan {
  const writes: FrozenWrite[] = [];
  const listed: string[][] = [];
  const unresolved: string[] = [];
  const when = stamp(options.date);
  for (const cell of cells) {
    if (!callsAddIn(cell.formula)) continue;
    const width = cell.values[0]?.length ?? 0;
    if (width === 0 || cell.values.some((r) => r.length !== width)) throw new Error(`${cell.sheet}!${a1(cell.row, cell.col)}: the result to freeze is empty or ragged.`);
    cell.values.forEach((rowValues, r) =>
      rowValues.forEach((value, c) => {
        writes.push({ sheet: cell.sheet, row: cell.row + r, col: cell.col + c, value });
        if (value !== null && typeof value === 'object' && UNRESOLVED.has(value.error)) unresolved.push(`${cell.sheet}!${a1(cell.row + r, cell.col + c)}`);
      }),
    );
    const first = a1(cell.row, cell.col);
    const range = cell.values.length === 1 && width === 1 ? first : `${first}:${a1(cell.row + cell.values.length - 1, cell.col + width - 1)}`;
    const typed = cell.formula.replace(/^=/, '').replace(/_xldudf_RATCHET_([A-Za-z][A-Za-z0-9]*)/g, (_m, name: string) => `RATCHET.${name.toUpperCase()}`);
    listed.push([cell.sheet, range, `=${typed}`, when]);
  }
  const taken = new Set(options.sheets.map((s) => s.toLowerCase()));
  let noteSheet = NOTE_SHEET;
  for (let k = 2; taken.has(noteSheet.toLowerCase()); k++) noteSheet = `${NOTE_SHEET} ${k}`;
  const sentence =
    listed.length === 0
      ? `No cell held a formula of the Ratchet add-in on ${when}; nothing was frozen.`
      : `These cells held formulas of the Ratchet add-in. On ${when} each was replaced by the values it showed, so this copy opens without the add-in; the values no longer follow the data.`;
  return { writes, noteSheet, noteRows: [[sentence], [], [...NOTE_HEADER], ...listed], replaced: listed.length, unresolved };
}
