/**
 * A1 addresses and structured (table-column) references, as the task pane writes them into
 * formulas. Pure functions, no host APIs.
 */

/** A rectangle of cells; rows and columns 1-based, inclusive. `sheet` is undefined when not given. */
export interface Area {
  readonly sheet: string | undefined;
  readonly r1: number;
  readonly c1: number;
  readonly r2: number;
  readonly c2: number;
}

import { MAX_COLS, MAX_ROWS, columnLetters, columnNumber } from '../src/adapter/a1.js';

export { MAX_COLS, MAX_ROWS, columnLetters, columnNumber };

/** True when a sheet name must be quoted in a reference (anything but letters, digits, _ and ., or a name that looks like a cell). */
export function needsQuotes(sheet: string): boolean {
  if (!/^[A-Za-z_][A-Za-z0-9_.]*$/.test(sheet)) return true;
  return /^[A-Za-z]{1,3}[0-9]+$/.test(sheet) || /^R[0-9]*C[0-9]*$/i.test(sheet);
}

/** A sheet name as written before "!": quoted with doubled apostrophes when needed. */
export function sheetPrefix(sheet: string): string {
  return needsQuotes(sheet) ? `'${sheet.replace(/'/g, "''")}'!` : `${sheet}!`;
}

const CELL = /^\$?([A-Za-z]{1,3})\$?([0-9]{1,7})$/;
const COLS = /^\$?([A-Za-z]{1,3})$/;
const ROWS = /^\$?([0-9]{1,7})$/;

/**
 * Parses "A2", "$A$2:$B$40", "Sheet1!A2:A9", "'My data'!A:A", "2:5". Whole columns/rows become
 * the full sheet extent.
 * @throws Error with a readable message for anything else.
 */
export function parseAddress(text: string): Area {
  const s = text.trim();
  let sheet: string | undefined;
  let rest = s;
  const bang = s.lastIndexOf('!');
  if (bang >= 0) {
    let name = s.slice(0, bang);
    rest = s.slice(bang + 1);
    if (name.startsWith("'")) {
      if (!name.endsWith("'") || name.length < 2) throw new Error(`"${text}" has an unbalanced quote in the sheet name`);
      name = name.slice(1, -1).replace(/''/g, "'");
    }
    if (name === '') throw new Error(`"${text}" has an empty sheet name`);
    sheet = name;
  }
  const parts = rest.split(':');
  if (parts.length < 1 || parts.length > 2 || parts.some((p) => p === '')) throw new Error(`"${text}" is not a cell or range address`);
  const a = parts[0]!;
  const b = parts[1] ?? a;
  const ca = CELL.exec(a);
  const cb = CELL.exec(b);
  let r1: number, c1: number, r2: number, c2: number;
  if (ca && cb) {
    c1 = columnNumber(ca[1]!);
    r1 = Number(ca[2]);
    c2 = columnNumber(cb[1]!);
    r2 = Number(cb[2]);
  } else if (parts.length === 2 && COLS.exec(a) && COLS.exec(b)) {
    c1 = columnNumber(COLS.exec(a)![1]!);
    c2 = columnNumber(COLS.exec(b)![1]!);
    r1 = 1;
    r2 = MAX_ROWS;
  } else if (parts.length === 2 && ROWS.exec(a) && ROWS.exec(b)) {
    r1 = Number(ROWS.exec(a)![1]);
    r2 = Number(ROWS.exec(b)![1]);
    c1 = 1;
    c2 = MAX_COLS;
  } else {
    throw new Error(`"${text}" is not a cell or range address`);
  }
  if (r1 < 1 || r2 < 1 || r1 > MAX_ROWS || r2 > MAX_ROWS || c1 > MAX_COLS || c2 > MAX_COLS) {
    throw new Error(`"${text}" is outside the worksheet`);
  }
  return { sheet, r1: Math.min(r1, r2), c1: Math.min(c1, c2), r2: Math.max(r1, r2), c2: Math.max(c1, c2) };
}

/** Rows × columns of an area. */
export function areaSize(a: Area): { rows: number; cols: number } {
  return { rows: a.r2 - a.r1 + 1, cols: a.c2 - a.c1 + 1 };
}

/**
 * The absolute A1 reference of an area, e.g. "$A$2:$A$40"; with the sheet name when
 * `withSheet` is true (quoted when needed). A single cell is written as one cell.
 */
export function absoluteRef(a: Area, withSheet = a.sheet !== undefined): string {
  const tl = `$${columnLetters(a.c1)}$${a.r1}`;
  const br = `$${columnLetters(a.c2)}$${a.r2}`;
  const body = a.r1 === a.r2 && a.c1 === a.c2 ? tl : `${tl}:${br}`;
  return withSheet && a.sheet !== undefined ? `${sheetPrefix(a.sheet)}${body}` : body;
}

/** A1 text without "$" and sheet, for Office.js getRange. */
export function plainRef(a: Area): string {
  const tl = `${columnLetters(a.c1)}${a.r1}`;
  return a.r1 === a.r2 && a.c1 === a.c2 ? tl : `${tl}:${columnLetters(a.c2)}${a.r2}`;
}

/** The area of `rows` × `cols` cells whose top-left cell is `anchor`'s top-left cell. */
export function spillArea(anchor: Area, rows: number, cols: number): Area {
  const r2 = anchor.r1 + rows - 1;
  const c2 = anchor.c1 + cols - 1;
  if (r2 > MAX_ROWS || c2 > MAX_COLS) throw new Error('the result would not fit on the worksheet below and right of that cell');
  return { sheet: anchor.sheet, r1: anchor.r1, c1: anchor.c1, r2, c2 };
}

/** True when two areas share a cell (sheet names compared case-insensitively; undefined matches any). */
export function intersects(a: Area, b: Area): boolean {
  if (a.sheet !== undefined && b.sheet !== undefined && a.sheet.toLowerCase() !== b.sheet.toLowerCase()) return false;
  return a.r1 <= b.r2 && b.r1 <= a.r2 && a.c1 <= b.c2 && b.c1 <= a.c2;
}

/**
 * A structured reference to a table column's data, e.g. `Trials[Temp]`. A column name with
 * anything but letters, digits and underscores gets the bracketed column-specifier form
 * (`Trials[[Temp °C]]`), and the characters [ ] # ' inside it are escaped with an apostrophe, as
 * Excel requires for structured references.
 * @example tableColumnRef('Trials', "Weight [kg]") // → "Trials[[Weight '[kg']]]"
 */
export function tableColumnRef(table: string, column: string): string {
  if (/^[A-Za-z0-9_]+$/.test(column)) return `${table}[${column}]`;
  return `${table}[[${column.replace(/['#[\]]/g, (m) => `'${m}`)}]]`;
}
