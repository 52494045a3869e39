/**
 * Conversions between the values Excel's custom-function runtime passes and returns and the
 * host-neutral cell shapes of src/adapter/cell-types.ts. Pure: no host APIs (the Excel entry passes
 * the constructors it needs).
 */
import type { CellArg, CellErrorOut, CellOut, CellResult, CellValueIn } from './cell-types.js';
import { mapError, type MappedError } from './errors.js';

/** One Excel cell value as the runtime delivers it: number, string, boolean, null, or an error object. */
function fromExcelCell(v: unknown): CellValueIn {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  if (typeof v === 'object') {
    const o = v as { code?: unknown; message?: unknown; type?: unknown; basicValue?: unknown; errorType?: unknown };
    // An error cell arrives as an error object carrying its code ("#DIV/0!", …).
    if (typeof o.code === 'string' && o.code.startsWith('#')) {
      return typeof o.message === 'string' ? { kind: 'error', code: o.code, message: o.message } : { kind: 'error', code: o.code };
    }
    // A typed cell value (Excel.CellValue): an error, or a plain basic value.
    if (o.type === 'Error' && typeof o.basicValue === 'string') return { kind: 'error', code: o.basicValue };
    if (o.basicValue === null || ['number', 'string', 'boolean'].includes(typeof o.basicValue)) return fromExcelCell(o.basicValue);
  }
  return String(v);
}

/**
 * Converts one Excel argument: a 2-D array (matrix parameter), a scalar, or null/undefined when
 * omitted (→ undefined). Cost O(cells).
 * @example fromExcelArg([[1], [null], [{ code: '#DIV/0!' }]]) // → [[1], [null], [{ kind: 'error', code: '#DIV/0!' }]]
 */
export function fromExcelArg(v: unknown): CellArg {
  if (v === null || v === undefined) return undefined;
  if (Array.isArray(v)) {
    const out: CellValueIn[][] = new Array(v.length);
    for (let r = 0; r < v.length; r++) {
      const row: unknown = v[r];
      if (Array.isArray(row)) {
        const cells: CellValueIn[] = new Array(row.length);
        for (let c = 0; c < row.length; c++) cells[c] = fromExcelCell(row[c]);
        out[r] = cells;
      } else out[r] = [fromExcelCell(row)];
    }
    return out;
  }
  return fromExcelCell(v);
}

/** Converts a result for a matrix-typed (spilling) or scalar Excel result. */
export function toExcelResult(result: CellResult, matrix: boolean, ErrorClass?: ExcelErrorConstructor): unknown {
  const cell = (v: CellOut): unknown => (typeof v === 'object' ? errorObject(v, ErrorClass) : v);
  if (!matrix) return cell(Array.isArray(result) ? (result[0]?.[0] ?? '') : result);
  return Array.isArray(result) ? result.map((row) => row.map(cell)) : [[cell(result)]];
}

/** An error cell of a result as Excel's error object (the message for #VALUE! and #N/A only). */
function errorObject(v: CellErrorOut, ErrorClass: ExcelErrorConstructor | undefined): unknown {
  if (ErrorClass === undefined) return v;
  const withMessage = v.code === '#VALUE!' || v.code === '#N/A';
  return withMessage ? new ErrorClass(v.code as never, v.message) : new ErrorClass(v.code as never);
}

/** Constructor of CustomFunctions.Error (passed in so this module stays free of host globals). */
export type ExcelErrorConstructor = new (code: never, message?: string) => Error;

/**
 * The Excel error object for anything thrown, via the one mapping {@link mapError}. A message is
 * attached only for #VALUE! and #N/A (the codes for which Excel shows one).
 */
export function toExcelError(e: unknown, ErrorClass: ExcelErrorConstructor): Error {
  const m: MappedError = mapError(e);
  const withMessage = m.code === '#VALUE!' || m.code === '#N/A';
  return withMessage ? new ErrorClass(m.code as never, m.message) : new ErrorClass(m.code as never);
}

/** Number of cells of the largest argument (to decide whether work goes to the worker). O(args). */
export function largestArgument(args: readonly CellArg[]): number {
  let most = 0;
  for (const a of args) {
    if (Array.isArray(a)) {
      const cells = a.length * (Array.isArray(a[0]) ? a[0].length : 1);
      if (cells > most) most = cells;
    }
  }
  return most;
}
