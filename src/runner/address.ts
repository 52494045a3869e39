/** A1-style addresses for the runner: "Sheet!B7", quoted sheet names, column letters. */
import { columnLetters as lettersOf, columnNumber as numberOf } from '../adapter/a1.js';

/** Column letters of a 0-based column index: 0 → "A", 26 → "AA". O(log col). */
export function columnLetters(col: number): string {
  return lettersOf(col + 1);
}

/** 0-based column index of column letters: "A" → 0, "AA" → 26. */
export function columnIndex(letters: string): number {
  return numberOf(letters) - 1;
}

/** "B7" of a 0-based row and column. */
export function cellName(row: number, col: number): string {
  return `${columnLetters(col)}${row + 1}`;
}

/** "Sheet!B7" (the sheet name as it is, unquoted: the key format of the runner's JSON). */
export function qualifiedName(sheet: string, row: number, col: number): string {
  return `${sheet}!${cellName(row, col)}`;
}

/** A parsed "Sheet!B7" reference; row and col are 0-based. */
export interface CellRef {
  readonly sheet: string;
  readonly row: number;
  readonly col: number;
}

/**
 * Parses "Sheet!B7" or "'My sheet'!B7" (absolute markers `$` allowed).
 * @throws Error with a message naming the reference when it is malformed.
 */
export function parseCellRef(text: string): CellRef {
  const bang = text.lastIndexOf('!');
  if (bang <= 0) throw new Error(`"${text}" is not a cell reference of the form Sheet!A1`);
  let sheet = text.slice(0, bang).trim();
  if (sheet.startsWith("'") && sheet.endsWith("'") && sheet.length >= 2) sheet = sheet.slice(1, -1).replace(/''/g, "'");
  const m = /^\$?([A-Za-z]{1,3})\$?([1-9][0-9]*)$/.exec(text.slice(bang + 1).trim());
  if (!m || sheet === '') throw new Error(`"${text}" is not a cell reference of the form Sheet!A1`);
  return { sheet, row: Number(m[2]) - 1, col: columnIndex(m[1]!) };
}

/** Parses a range "A1:C5" (no sheet) into 0-based corners. */
export function parseRange(text: string): { top: number; left: number; bottom: number; right: number } {
  const m = /^\$?([A-Za-z]{1,3})\$?([0-9]+)(?::\$?([A-Za-z]{1,3})\$?([0-9]+))?$/.exec(text.trim());
  if (!m) throw new Error(`"${text}" is not a range of the form A1:C5`);
  const top = Number(m[2]) - 1;
  const left = columnIndex(m[1]!);
  const bottom = m[4] === undefined ? top : Number(m[4]) - 1;
  const right = m[3] === undefined ? left : columnIndex(m[3]);
  return { top: Math.min(top, bottom), left: Math.min(left, right), bottom: Math.max(top, bottom), right: Math.max(left, right) };
}
