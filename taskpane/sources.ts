/**
 * Data sources of the browser preview: a CSV file or an .xlsx workbook turned into sheets of
 * named columns, with each column's position so the pane can write formulas that reference the
 * same cells once the data are in a workbook.
 */
import type { CellValueIn } from '../src/functions/types.js';
import { parseCsv } from './csv.js';
import { absoluteRef, columnLetters } from './refs.js';

/** One column under a header. `col` is the worksheet column (1-based). */
export interface Column {
  readonly name: string;
  readonly col: number;
  /** Cells from the first data row down, null for blanks. */
  readonly cells: readonly CellValueIn[];
  /** Number of numeric cells. */
  readonly numbers: number;
}

/** A sheet of data: header row, first data row, columns. */
export interface SheetData {
  readonly name: string;
  /** 1-based row of the header; the data start on the next row. */
  readonly headerRow: number;
  readonly columns: readonly Column[];
  /** Number of data rows (the length of every column's cells). */
  readonly rows: number;
}

/** A file opened in the preview. */
export interface Source {
  readonly fileName: string;
  readonly kind: 'csv' | 'xlsx';
  /** Sheets that hold data (at least one numeric column under a header). */
  readonly sheets: readonly SheetData[];
}

/** Reads a CSV cell: blank → null, a number (dot decimal mark, optional exponent) → number, else text. */
export function csvCell(text: string): CellValueIn {
  const t = text.trim();
  if (t === '') return null;
  if (/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return Number(t);
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

/** Turns a grid of cells into a sheet of columns (only columns with a header and at least one number). */
export function sheetFromGrid(name: string, grid: readonly (readonly CellValueIn[])[]): SheetData | undefined {
  const h = findHeader(grid);
  if (h < 0) return undefined;
  const header = grid[h]!;
  const width = grid.reduce((m, r) => Math.max(m, r.length), 0);
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
    for (let r = h + 1; r <= last; r++) {
      const v = grid[r]![c] ?? null;
      if (typeof v === 'number') numbers++;
      cells.push(v);
    }
    if (numbers > 0) columns.push({ name: title.trim(), col: c + 1, cells, numbers });
  }
  if (columns.length === 0) return undefined;
  return { name, headerRow: h + 1, columns, rows };
}

/** A CSV file as one sheet named after the file (as a spreadsheet names the sheet of an opened CSV). */
export function sourceFromCsv(fileName: string, text: string): Source {
  const records = parseCsv(text);
  const grid = records.map((rec) => rec.map(csvCell));
  const sheetName = fileName.replace(/\.[^.]*$/, '').slice(0, 31) || 'Sheet1';
  const sheet = sheetFromGrid(sheetName, grid);
  if (!sheet) throw new Error(`${fileName}: no header row followed by numbers was found.`);
  return { fileName, kind: 'csv', sheets: [sheet] };
}

/** Minimal view of an exceljs cell value (numbers, text, formulas with cached results, rich text, errors, dates). */
type XlValue = unknown;

/** An exceljs cell value as a cell: a formula cell gives its cached result, an error cell an error. */
export function xlsxCell(v: XlValue): CellValueIn {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number') return Number.isFinite(v) ? v : null;
  if (typeof v === 'string') return v;
  if (typeof v === 'boolean') return v;
  if (v instanceof Date) return v.toISOString();
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

/** Sheets of an exceljs workbook that hold data. */
export function sourceFromWorksheets(fileName: string, sheets: readonly XlWorksheet[]): Source {
  const out: SheetData[] = [];
  for (const ws of sheets) {
    const rows = Math.min(ws.rowCount, 100000);
    const cols = Math.min(ws.columnCount, 200);
    const grid: CellValueIn[][] = [];
    for (let r = 1; r <= rows; r++) {
      const row = ws.getRow(r);
      const cells: CellValueIn[] = [];
      for (let c = 1; c <= cols; c++) cells.push(xlsxCell(row.getCell(c).value));
      grid.push(cells);
    }
    const s = sheetFromGrid(ws.name, grid);
    if (s) out.push(s);
  }
  if (out.length === 0) throw new Error(`${fileName}: no sheet has a header row followed by numbers.`);
  return { fileName, kind: 'xlsx', sheets: out };
}

/** Where the build puts exceljs's own minified browser build (copied as is, not re-bundled: it is large). */
export const EXCELJS_URL = 'vendor/exceljs.min.js';

interface ExcelJsGlobal {
  Workbook: new () => { xlsx: { load(b: ArrayBuffer): Promise<unknown> }; worksheets: XlWorksheet[] };
}

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
  const ExcelJS = await loadExcelJs();
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.load(data);
  } catch (e) {
    throw new Error(`${fileName}: not a readable .xlsx workbook (${e instanceof Error ? e.message : String(e)}).`, { cause: e });
  }
  return sourceFromWorksheets(fileName, wb.worksheets);
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

/** Short label of a column for pickers: "Temp (°C) — column B, 36 numbers". */
export function columnLabel(c: Column): string {
  return `${c.name} — column ${columnLetters(c.col)}, ${c.numbers} number${c.numbers === 1 ? '' : 's'}`;
}
