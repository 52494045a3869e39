/**
 * Data sources of the browser preview: a CSV file or an .xlsx workbook turned into sheets of
 * named columns, with each column's position so the pane can write formulas that reference the
 * same cells once the data are in a workbook.
 */
import type { CellValueIn } from '../src/functions/types.js';
import { readCsv, type CsvFormat, type DecimalMark } from './csv.js';
import { serialOfDate } from './dates.js';
import { absoluteRef, columnLetters } from './refs.js';

/**
 * One column under a header (or, in a file without a header row, named by its column letter).
 * `col` is the worksheet column (1-based).
 */
export interface Column {
  readonly name: string;
  readonly col: number;
  /** Cells from the first data row down, null for blanks. */
  readonly cells: readonly CellValueIn[];
  /** Number of numeric cells (date cells count: they hold their serial day numbers). */
  readonly numbers: number;
  /**
   * "date" when every numeric cell was a date cell of an .xlsx file (its cells then hold Excel
   * serial day numbers — show them with formatSerial from dates.ts); "number" otherwise.
   */
  readonly kind: 'number' | 'date';
}

/** A sheet of data: header row, first data row, columns. */
export interface SheetData {
  readonly name: string;
  /** 1-based row of the header; the data start on the next row. 0 or the row above the data when the file has no header row. */
  readonly headerRow: number;
  /** False when no header row was found and the columns are named by their letters (A, B, …). */
  readonly hasHeader: boolean;
  readonly columns: readonly Column[];
  /** Number of data rows (the length of every column's cells). */
  readonly rows: number;
}

/** A file opened in the preview. */
export interface Source {
  readonly fileName: string;
  readonly kind: 'csv' | 'xlsx';
  /** Sheets that hold data (at least one numeric column). */
  readonly sheets: readonly SheetData[];
  /** For a CSV file: the separator and decimal mark it was read with (detected or given). */
  readonly format?: CsvFormat | undefined;
}

/** A file the preview cannot use; the message says in plain words what is wrong and what to do. */
export class PreviewFileError extends Error {
  override readonly name = 'PreviewFileError';
}

/**
 * Reads a CSV cell: blank → null; a number → number (optional sign and exponent; with `decimal`
 * "." a decimal point, with "," a decimal comma: "25,3" → 25.3, and then "25.3" stays text, as
 * in a spreadsheet set to that convention); anything else → the text as it is. No thousands
 * separators. O(length).
 * @param decimal the file's decimal mark; default ".".
 * @example csvCell('25,3', ',') // → 25.3
 */
export function csvCell(text: string, decimal: DecimalMark = '.'): CellValueIn {
  const t = text.trim();
  if (t === '') return null;
  if (decimal === '.' && /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return Number(t);
  if (decimal === ',' && /^[+-]?(\d+,?\d*|,\d+)([eE][+-]?\d+)?$/.test(t)) return Number(t.replace(',', '.'));
  return text;
}

/**
 * Finds the header row of a grid of cells (row-major, row 0 = worksheet row 1): the first row
 * with a text cell whose next row has a number below a text cell. Returns -1 when there is none.
 */
function findHeader(grid: readonly (readonly CellValueIn[])[]): number {
  const limit = Math.min(grid.length - 1, 200);
  for (let r = 0; r < limit; r++) {
    const row = grid[r]!;
    const next = grid[r + 1]!;
    for (let c = 0; c < row.length; c++) {
      if (typeof row[c] === 'string' && String(row[c]).trim() !== '' && typeof next[c] === 'number') return r;
    }
  }
  return -1;
}

/**
 * Turns a grid of cells into a sheet of columns: only columns with a header and at least one
 * number. Rows above the header (titles, blank lines) are skipped. Without a header row — the
 * first row holding a number comes before any text above a number — every column with a number
 * is taken, named by its letter (A, B, …), with the data from that first row on.
 * @param isDate per cell (same shape as `grid`), true for a number that was a date cell.
 * @returns undefined when the grid holds no number under a header or in a headerless table.
 */
export function sheetFromGrid(name: string, grid: readonly (readonly CellValueIn[])[], isDate?: readonly (readonly boolean[])[]): SheetData | undefined {
  const found = findHeader(grid);
  const firstNumber = grid.findIndex((r) => r.some((v) => typeof v === 'number'));
  if (firstNumber < 0) return undefined;
  const hasHeader = found >= 0 && found < firstNumber;
  const h = hasHeader ? found : firstNumber - 1;
  const width = grid.reduce((m, r) => Math.max(m, r.length), 0);
  const header: CellValueIn[] = hasHeader ? [...grid[h]!] : Array.from({ length: width }, (_v, c) => columnLetters(c + 1));
  // data run: from h+1 to the last row that holds a number in a headed column
  let last = h;
  for (let r = h + 1; r < grid.length; r++) {
    const row = grid[r]!;
    for (let c = 0; c < width; c++) {
      if (typeof row[c] === 'number' && typeof header[c] === 'string') {
        last = r;
        break;
      }
    }
  }
  const rows = last - h;
  const columns: Column[] = [];
  for (let c = 0; c < width; c++) {
    const title = header[c];
    if (typeof title !== 'string' || title.trim() === '') continue;
    const cells: CellValueIn[] = [];
    let numbers = 0;
    let dates = 0;
    for (let r = h + 1; r <= last; r++) {
      const v = grid[r]![c] ?? null;
      if (typeof v === 'number') {
        numbers++;
        if (isDate?.[r]?.[c] === true) dates++;
      }
      cells.push(v);
    }
    if (numbers > 0) columns.push({ name: title.trim(), col: c + 1, cells, numbers, kind: dates === numbers ? 'date' : 'number' });
  }
  if (columns.length === 0) return undefined;
  return { name, headerRow: h + 1, hasHeader, columns, rows };
}

/**
 * A CSV file as one sheet named after the file (as a spreadsheet names the sheet of an opened
 * CSV). Separator and decimal mark are detected (csv.ts, readCsv) unless `format` gives them; a
 * UTF-8 byte-order mark, title lines and blank lines above the table are skipped; a file without
 * a header row gets columns named A, B, …. Cost O(length of the text).
 * @throws CsvError for broken quoting; PreviewFileError when no column holds a number.
 * @example sourceFromCsv('wear.csv', 'Stunden;Verschleiß (µm)\n0;25,3\n10;27,9\n').sheets[0].columns[1].cells // → [25.3, 27.9]
 */
export function sourceFromCsv(fileName: string, text: string, format: Partial<CsvFormat> = {}): Source {
  const read = readCsv(text, format);
  const grid = read.records.map((rec) => rec.map((t) => csvCell(t, read.format.decimal)));
  const sheetName = fileName.replace(/\.[^.]*$/, '').slice(0, 31) || 'Sheet1';
  const sheet = sheetFromGrid(sheetName, grid);
  if (!sheet) {
    const sep = read.format.separator === '\t' ? 'tabs' : `"${read.format.separator}"`;
    throw new PreviewFileError(`${fileName}: no column holds a number (read with ${sep} between fields and "${read.format.decimal}" as the decimal mark; choose another separator or decimal mark if these are wrong).`);
  }
  return { fileName, kind: 'csv', sheets: [sheet], format: read.format };
}

/** Minimal view of an exceljs cell value (numbers, text, formulas with cached results, rich text, errors, dates). */
type XlValue = unknown;

/**
 * An exceljs cell value as a cell: a formula cell gives its cached result, an error cell an
 * error, a date cell its Excel serial day number (1900 date system, see dates.ts).
 */
export function xlsxCell(v: XlValue): CellValueIn {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number') return Number.isFinite(v) ? v : null;
  if (typeof v === 'string') return v;
  if (typeof v === 'boolean') return v;
  if (v instanceof Date) return serialOfDate(v);
  if (typeof v === 'object') {
    const o = v as { result?: unknown; richText?: { text: string }[]; error?: string; text?: string; formula?: string; sharedFormula?: string };
    if ('error' in o && typeof o.error === 'string') return { kind: 'error', code: o.error };
    if (Array.isArray(o.richText)) return o.richText.map((t) => t.text).join('');
    if ('formula' in o || 'sharedFormula' in o) return o.result === undefined ? null : xlsxCell(o.result);
    if (typeof o.text === 'string') return o.text; // hyperlink
  }
  return null;
}

/** Minimal shape of an exceljs worksheet that the reader uses. */
export interface XlWorksheet {
  readonly name: string;
  readonly rowCount: number;
  readonly columnCount: number;
  getRow(r: number): { getCell(c: number): { value: XlValue } };
}

/** True when an exceljs value is a date, or a formula whose cached result is a date. */
function isDateValue(v: XlValue): boolean {
  if (v instanceof Date) return true;
  return v !== null && typeof v === 'object' && 'result' in v && (v as { result?: unknown }).result instanceof Date;
}

/** Days between the 1900 and the 1904 date systems (1 January 1904 is serial 1462 in the first, 0 in the second). */
const DAYS_1904 = 1462;

/**
 * Sheets of an exceljs workbook that hold data (see {@link sheetFromGrid}); date cells become
 * numbers — the serial day numbers of the workbook's own date system, as its formulas see them —
 * and a column of date cells has kind "date".
 * @param date1904 true for a workbook in the 1904 date system (exceljs: `wb.properties.date1904`).
 * @throws PreviewFileError when no sheet holds a column of numbers.
 */
export function sourceFromWorksheets(fileName: string, sheets: readonly XlWorksheet[], date1904 = false): Source {
  const out: SheetData[] = [];
  for (const ws of sheets) {
    const rows = Math.min(ws.rowCount, 100000);
    const cols = Math.min(ws.columnCount, 200);
    const grid: CellValueIn[][] = [];
    const dates: boolean[][] = [];
    for (let r = 1; r <= rows; r++) {
      const row = ws.getRow(r);
      const cells: CellValueIn[] = [];
      const flags: boolean[] = [];
      for (let c = 1; c <= cols; c++) {
        const v = row.getCell(c).value;
        const date = isDateValue(v);
        const cell = xlsxCell(v);
        cells.push(date && date1904 && typeof cell === 'number' ? cell - DAYS_1904 : cell);
        flags.push(date);
      }
      grid.push(cells);
      dates.push(flags);
    }
    const s = sheetFromGrid(ws.name, grid, dates);
    if (s) out.push(s);
  }
  if (out.length === 0) throw new PreviewFileError(`${fileName}: no sheet holds a column of numbers.`);
  return { fileName, kind: 'xlsx', sheets: out };
}

/**
 * What is wrong with bytes that exceljs could not read as a workbook, in plain words — never the
 * zip library's own message: an empty file; an older .xls file or a password-protected workbook
 * (both are OLE compound files, signature D0 CF 11 E0); a damaged .xlsx (a zip package, "PK", that
 * cannot be read: often a download or copy cut short); or a file that is not a workbook at all.
 * Cost O(1).
 * @example describeUnreadableXlsx('a.xlsx', new Uint8Array(0)) // → 'a.xlsx is empty (0 bytes). Choose the workbook again, or save it again from Excel.'
 */
export function describeUnreadableXlsx(fileName: string, data: Uint8Array): string {
  if (data.length === 0) return `${fileName} is empty (0 bytes). Choose the workbook again, or save it again from Excel.`;
  const b = (i: number) => data[i] ?? -1;
  if (b(0) === 0xd0 && b(1) === 0xcf && b(2) === 0x11 && b(3) === 0xe0) {
    return `${fileName} is an older Excel file (.xls) or a password-protected workbook, which the preview cannot read. In Excel, remove the password if there is one and save it as "Excel Workbook (.xlsx)".`;
  }
  if (b(0) === 0x50 && b(1) === 0x4b) {
    return `${fileName} is damaged: it looks like an .xlsx workbook, but parts of it cannot be read (a download or copy may have been cut short). Open it in Excel, which can often repair it, and save it again; or choose the original file.`;
  }
  return `${fileName} is not an .xlsx workbook. If it holds text separated by commas, semicolons or tabs, open it as a .csv file.`;
}

/** The part of exceljs's API the reader uses. */
export interface ExcelJsLike {
  Workbook: new () => { xlsx: { load(b: ArrayBuffer): Promise<unknown> }; worksheets: XlWorksheet[]; properties?: { date1904?: boolean } };
}

/**
 * Reads .xlsx bytes with the given exceljs (the browser build in the pane, the package in tests).
 * @throws PreviewFileError with {@link describeUnreadableXlsx}'s message when exceljs cannot read
 *   them, or when no sheet holds a column of numbers.
 */
export async function sourceFromXlsxWith(excelJs: ExcelJsLike, fileName: string, data: ArrayBuffer): Promise<Source> {
  const wb = new excelJs.Workbook();
  try {
    await wb.xlsx.load(data);
  } catch (e) {
    throw new PreviewFileError(describeUnreadableXlsx(fileName, new Uint8Array(data)), { cause: e });
  }
  return sourceFromWorksheets(fileName, wb.worksheets, wb.properties?.date1904 === true);
}

/** Where the build puts exceljs's own minified browser build (copied as is, not re-bundled: it is large). */
export const EXCELJS_URL = 'vendor/exceljs.min.js';

type ExcelJsGlobal = ExcelJsLike;

let excelJs: Promise<ExcelJsGlobal> | undefined;

/** Loads exceljs's browser build once (a same-origin script that defines `window.ExcelJS`). */
function loadExcelJs(): Promise<ExcelJsGlobal> {
  excelJs ??= new Promise<ExcelJsGlobal>((resolve, reject) => {
    const s = document.createElement('script');
    s.src = EXCELJS_URL;
    s.onload = () => {
      const g = (window as unknown as { ExcelJS?: ExcelJsGlobal }).ExcelJS;
      if (g) resolve(g);
      else reject(new Error('the .xlsx reader did not start'));
    };
    s.onerror = () => {
      excelJs = undefined;
      reject(new Error('the .xlsx reader could not be loaded'));
    };
    document.head.append(s);
  });
  return excelJs;
}

/** Reads an .xlsx file with exceljs's browser build (loaded on first use). */
export async function sourceFromXlsx(fileName: string, data: ArrayBuffer): Promise<Source> {
  return sourceFromXlsxWith(await loadExcelJs(), fileName, data);
}

/**
 * The absolute reference of a column's data cells, with the sheet name, e.g.
 * `'Kiln trials'!$A$5:$A$40`. For a CSV this is where the cells land when the file is opened in a
 * spreadsheet (sheet named after the file).
 */
export function columnRef(sheet: SheetData, column: Column, withSheet = true): string {
  const r1 = sheet.headerRow + 1;
  const r2 = sheet.headerRow + Math.max(1, sheet.rows);
  return absoluteRef({ sheet: sheet.name, r1, r2, c1: column.col, c2: column.col }, withSheet);
}

/** Short label of a column for pickers: "Temp (°C) — column B, 36 numbers" ("36 dates" for a date column). */
export function columnLabel(c: Column): string {
  const what = c.kind === 'date' ? 'date' : 'number';
  return `${c.name} — column ${columnLetters(c.col)}, ${c.numbers} ${what}${c.numbers === 1 ? '' : 's'}`;
}
