/**
 * Reading worksheet arguments (host-neutral {@link CellArg}s) into numbers and options.
 *
 * Cell rules, the same for every function (documented for users in README.md, "How cells are read"):
 * - a number is used as is; it must be finite and 0 or of magnitude from {@link MIN_MAGNITUDE} (1e-300)
 *   to {@link MAX_MAGNITUDE} (1e100) — larger values would overflow sums of squares, smaller ones
 *   underflow knot spacings — else `#VALUE!`;
 * - a blank — `null`, `""`, or a cell the blank policy ({@link applyBlankTypes}) marks empty — is
 *   "no value": a data row with a blank x, y or weight is left out, never read as 0;
 * - text in a data range is `#VALUE!` (also numbers stored as text, with a hint to convert them);
 *   a logical (TRUE/FALSE) in a data range is `#VALUE!`;
 * - an error cell in a data range propagates as that error ({@link InputCellError});
 * - scalar options (knots count, direction, folds, …) accept a number, a number written as text
 *   (" 3 "), a one-cell range, and blank/omitted for the default; logicals are `#VALUE!`.
 *
 * Data vectors of 64 cells or more are parsed once per argument object: the result is memoised by
 * identity in a WeakMap, so a host that passes the same (never mutated) array to many calls pays
 * the O(n) parse and hash once. Cost of a first parse: O(cells); the hash is computed on first use.
 */
import { fail } from '../core/index.js';
import type { CellArg, CellValueIn } from './cell-types.js';
import { InputCellError } from './errors.js';
import { hashFloat64, sameBits } from './hash.js';

/** Largest accepted magnitude of a number in any argument (sums of squares of n ≤ 10⁶ such values stay finite). */
export const MAX_MAGNITUDE = 1e100;

/**
 * Smallest accepted non-zero magnitude. Excel itself holds no numbers below about 2.2e-308; values
 * this small (subnormal range) make knot spacings underflow, so they are refused rather than fitted.
 */
export const MIN_MAGNITUDE = 1e-300;

/** A rectangular grid of cells, row-major. */
export type Grid = readonly (readonly CellValueIn[])[];

/** A data argument read as numbers: `values[i]` is NaN where the cell is blank. */
export class Vector {
  private hashCache: string | undefined;
  constructor(
    /** Numbers in reading order (row by row), NaN for blanks. Never mutated. */
    readonly values: Float64Array,
    readonly rows: number,
    readonly cols: number,
    /** Number of blank cells. */
    readonly blanks: number,
  ) {}
  /** Content hash of `values` (bit pattern) and shape, computed on first use; see {@link hashFloat64}. */
  get hash(): string {
    this.hashCache ??= `${this.rows}x${this.cols}:${hashFloat64(this.values)}`;
    return this.hashCache;
  }
}

/**
 * True when two parsed arguments hold the same cells: same shape and the same bit patterns (blanks
 * included). Cost O(cells), O(1) for the same object.
 * @example sameVector(readVector('y', [[1], [2]]), readVector('y', [[1], [2]])) // → true
 */
export function sameVector(a: Vector | undefined, b: Vector | undefined): boolean {
  if (a === b) return true;
  if (a === undefined || b === undefined) return false;
  return a.rows === b.rows && a.cols === b.cols && sameBits(a.values, b.values);
}

/** Arguments with fewer cells are parsed on every call (cheaper than memoising them). */
const MEMO_MIN_CELLS = 64;

/** The canonical NaN used for blanks (one bit pattern, so bitwise comparison works). */
const BLANK = NaN;

const memoLine = new WeakMap<object, Vector>();
const memoAny = new WeakMap<object, Vector>();

/** True for a blank cell value: null, undefined or the empty string. */
export function isBlank(v: unknown): boolean {
  return v === null || v === undefined || v === '';
}

function isErrorCell(v: unknown): v is { kind: 'error'; code: string } {
  return typeof v === 'object' && v !== null && (v as { kind?: unknown }).kind === 'error';
}

/** Human-readable description of a cell for messages. */
export function describeCell(v: unknown): string {
  if (typeof v === 'number') return Number.isNaN(v) ? 'NaN' : String(v);
  if (typeof v === 'boolean') return v ? 'the logical TRUE' : 'the logical FALSE';
  if (typeof v === 'string') return `the text "${v.length > 24 ? `${v.slice(0, 24)}…` : v}"`;
  if (isErrorCell(v)) return `the error ${v.code}`;
  if (isBlank(v)) return 'blank';
  return typeof v;
}

/** The argument as a grid: a scalar becomes 1×1; omitted (undefined) stays undefined. */
export function toGrid(arg: CellArg): Grid | undefined {
  if (arg === undefined) return undefined;
  if (Array.isArray(arg)) return arg as Grid;
  return [[arg as CellValueIn]];
}

/** Position text for messages: "cell 3" in a single row or column, "row 2, column 1" in a 2-D range. */
function where(rows: number, cols: number, r: number, c: number): string {
  if (rows === 1) return `cell ${c + 1}`;
  if (cols === 1) return `cell ${r + 1}`;
  return `row ${r + 1}, column ${c + 1}`;
}

function checkRectangular(name: string, grid: Grid): number {
  const cols = grid.length === 0 ? 0 : (grid[0]?.length ?? 0);
  for (const row of grid) {
    if (!Array.isArray(row) || row.length !== cols) fail('BAD_OPTION', name, 'needs a rectangular range');
  }
  return cols;
}

/**
 * A numeric cell value, or BLANK; throws for text, logicals, errors, non-finite and huge numbers.
 * Text that reads as a number gets a conversion hint.
 */
function dataCell(name: string, v: CellValueIn, pos: () => string): number {
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) fail('NON_FINITE', name, `needs finite numbers; ${pos()} is ${describeCell(v)}`);
    const a = Math.abs(v);
    if (a > MAX_MAGNITUDE || (a < MIN_MAGNITUDE && a !== 0)) {
      fail('NON_FINITE', name, `needs numbers of magnitude from 1e-300 to 1e100, or 0; ${pos()} is ${v}`);
    }
    return v === 0 ? 0 : v; // −0 → +0 so equal data hash equally
  }
  if (isBlank(v)) return BLANK;
  if (isErrorCell(v)) throw new InputCellError(String(v.code), name, pos());
  if (typeof v === 'string' && v.trim() !== '' && Number.isFinite(Number(v))) {
    fail('NON_FINITE', name, `needs numbers or blanks; ${pos()} is ${describeCell(v)} (a number stored as text: convert it with VALUE)`);
  }
  fail('NON_FINITE', name, `needs numbers or blanks; ${pos()} is ${describeCell(v)}`);
}

/** {@link dataCell} with the position computed only when a message needs it. */
function slowCell(name: string, v: CellValueIn, rows: number, cols: number, r: number, c: number): number {
  return dataCell(name, v, () => where(rows, cols, r, c));
}

/**
 * Reads a data argument as numbers (NaN for blanks), row by row. With `shape: 'line'` the range
 * must be a single column or row (or one cell); `'any'` accepts a 2-D range.
 *
 * @throws RatchetError (text, logicals, non-finite or huge numbers, not a line) and
 *   {@link InputCellError} (an error cell).
 * @example readVector('known_ys', [[1], [null], [3]]).values // → Float64Array [1, NaN, 3]
 */
export function readVector(name: string, arg: CellArg, shape: 'line' | 'any' = 'line'): Vector {
  const memo = shape === 'line' ? memoLine : memoAny;
  if (Array.isArray(arg)) {
    const hit = memo.get(arg);
    if (hit) return hit;
  }
  const grid = toGrid(arg);
  if (grid === undefined || grid.length === 0) fail('EMPTY_INPUT', name, 'needs at least one value; got none');
  const rows = grid.length;
  const cols = checkRectangular(name, grid);
  if (cols === 0) fail('EMPTY_INPUT', name, 'needs at least one value; got none');
  if (shape === 'line' && rows > 1 && cols > 1) {
    fail('BAD_OPTION', name, `needs a single column or row; got ${rows} rows × ${cols} columns`);
  }
  const values = new Float64Array(rows * cols);
  let blanks = 0;
  let k = 0;
  for (let r = 0; r < rows; r++) {
    const row = grid[r]!;
    for (let c = 0; c < cols; c++) {
      const cellValue = row[c];
      let v: number;
      if (typeof cellValue === 'number') {
        // Fast path for the common case; anything unusual goes through slowCell for its message.
        // (No closure in this loop: capturing r or c would allocate a context per cell.)
        const a = cellValue < 0 ? -cellValue : cellValue;
        v = a <= MAX_MAGNITUDE && (a >= MIN_MAGNITUDE || a === 0) ? cellValue + 0 : slowCell(name, cellValue, rows, cols, r, c);
      } else {
        v = slowCell(name, cellValue as CellValueIn, rows, cols, r, c);
        if (v !== v) blanks++;
      }
      values[k++] = v;
    }
  }
  const vec = new Vector(values, rows, cols, blanks);
  if (Array.isArray(arg) && rows * cols >= MEMO_MIN_CELLS) memo.set(arg, vec);
  return vec;
}

/**
 * The single value of a scalar option: `undefined` when omitted or blank. Accepts a number, a
 * number written as text, or a one-cell range.
 * @throws RatchetError BAD_OPTION (a range of several cells, text, a logical, non-finite);
 *   InputCellError for an error cell.
 */
export function readScalar(name: string, arg: CellArg): number | undefined {
  const grid = toGrid(arg);
  if (grid === undefined) return undefined;
  const cells = grid.length === 0 ? 0 : grid.reduce((s, r) => s + (Array.isArray(r) ? r.length : 1), 0);
  if (cells === 0) return undefined;
  if (cells !== 1) fail('BAD_OPTION', name, `needs a single value; got a range of ${cells} cells`);
  const v = grid[0]![0] as CellValueIn;
  if (isBlank(v)) return undefined;
  if (isErrorCell(v)) throw new InputCellError(String(v.code), name, 'the cell');
  let num: number;
  if (typeof v === 'number') num = v;
  else if (typeof v === 'string' && v.trim() !== '' && Number.isFinite(Number(v))) num = Number(v);
  else return fail('BAD_OPTION', name, `needs a number; got ${describeCell(v)}`);
  if (!Number.isFinite(num)) fail('BAD_OPTION', name, `needs a finite number; got ${describeCell(num)}`);
  return num;
}

/** One of the listed values, or `def` when omitted. @throws RatchetError BAD_OPTION. */
export function readChoice<T>(name: string, arg: CellArg, choices: ReadonlyMap<number, T>, def: T, needs: string): T {
  const v = readScalar(name, arg);
  if (v === undefined) return def;
  const c = choices.get(v);
  if (c === undefined) fail('BAD_OPTION', name, `needs ${needs}; got ${v}`);
  return c;
}

/** All non-blank numbers of a range, in reading order (blanks skipped). */
export function nonBlank(v: Vector): number[] {
  const out: number[] = [];
  for (let i = 0; i < v.values.length; i++) {
    const x = v.values[i]!;
    if (x === x) out.push(x);
  }
  return out;
}

/**
 * Parses the `knots` option: omitted, blank or 0 → 0 (classic fit); one cell → a knot count (a
 * whole number ≥ 2; its upper limit is the core's to check); a range of several cells → the
 * positions in reading order, blanks skipped (how many, and that they increase strictly, the core
 * checks at its public boundary — fitMonotone, fitSurface — with the same argument name).
 * @throws RatchetError BAD_KNOTS (one cell that is neither 0 nor a whole number ≥ 2) / BAD_OPTION;
 *   InputCellError.
 * @example readKnots('knots', [[1], [2.5], [4]]) // → Float64Array [1, 2.5, 4]
 */
export function readKnots(name: string, arg: CellArg): number | Float64Array {
  const grid = toGrid(arg);
  if (grid === undefined) return 0;
  const cells = grid.reduce((s, r) => s + (Array.isArray(r) ? r.length : 1), 0);
  if (cells <= 1) {
    const v = readScalar(name, arg);
    if (v === undefined || v === 0) return 0;
    if (!Number.isInteger(v) || v < 2) {
      fail('BAD_KNOTS', name, `needs 0 (classic fit), a whole number of knots ≥ 2, or a range of knot positions; got ${v}`);
    }
    return v;
  }
  return Float64Array.from(nonBlank(readVector(name, arg, 'line')));
}
