/**
 * Reading worksheet arguments (host-neutral {@link CellArg}s) into numbers and options.
 *
 * Cell rules, the same for every function (documented for users in README.md, "How cells are read"):
 * - a number is used as is; it must be finite and 0 or of magnitude from {@link MIN_MAGNITUDE} (1e-300)
 *   to {@link MAX_MAGNITUDE} (1e100) — larger values would overflow sums of squares, smaller ones
 *   underflow knot spacings — else `#VALUE!`;
 * - a blank — `null`, `""`, or a cell the blank policy ({@link applyBlankTypes}) marks empty — is
 *   "no value": a data row with a blank x, y or weight is left out, never read as 0;
 * - text or a logical (TRUE/FALSE) in a data argument that is a worksheet reference (the host gives
 *   its address) leaves its row out like a blank, and is listed ({@link Vector.leftOut}) — Excel's
 *   convention for its paired statistical functions (SLOPE, CORREL); the same cells given directly
 *   or in an array constant (no address) are `#VALUE!` (numbers stored as text get a hint);
 * - an error cell in a data range propagates as that error ({@link InputCellError});
 * - scalar options (knots count, direction, folds, …) accept a number, a number written as text
 *   (" 3 "), a one-cell range, and blank/omitted for the default; logicals are `#VALUE!`.
 * Messages name a cell by its worksheet address when the host gave the range's address
 * (`Data!B5`), else by position (`cell 4`), and show numbers to 6 significant digits.
 *
 * Parsed data of 64 cells or more is remembered by content, never by identity: a new argument is
 * compared cell by cell with the few most recently parsed ones ({@link RECENT_VECTORS}) and, when it
 * holds exactly the same cells, the earlier (immutable) {@link Vector} is returned with its hash. A
 * caller may therefore reuse or mutate its arrays freely — a changed cell is always seen. Cost per
 * read: O(cells) for the comparison (no allocation), plus O(cells) to parse when nothing matches.
 */
import { fail } from '../core/index.js';
import type { CellArg, CellValueIn } from './cell-types.js';
import { InputCellError, formatNumber } from './errors.js';

export { formatNumber };
import { hashFloat64, sameBits } from './hash.js';
import { MAX_COLS, MAX_ROWS, columnLetters, columnNumber } from './a1.js';
import { splitAddress } from './blanks.js';

/** Largest accepted magnitude of a number in any argument (sums of squares of n ≤ 10⁶ such values stay finite). */
export const MAX_MAGNITUDE = 1e100;

/**
 * Smallest accepted non-zero magnitude. Excel itself holds no numbers below about 2.2e-308; values
 * this small (subnormal range) make knot spacings underflow, so they are refused rather than fitted.
 */
export const MIN_MAGNITUDE = 1e-300;

/** A rectangular grid of cells, row-major. */
export type Grid = readonly (readonly CellValueIn[])[];

/** A text or logical cell of a referenced data range, left out of the fit (see {@link Vector.leftOut}). */
export interface LeftOutCell {
  /** Position in reading order (row by row), 0-based. */
  readonly index: number;
  /** The cell as the host passed it. */
  readonly value: string | boolean;
}

const NO_CELLS: readonly LeftOutCell[] = Object.freeze([]);

/** A data argument read as numbers: `values[i]` is NaN where the cell is blank (or left out). */
export class Vector {
  private hashCache: string | undefined;
  constructor(
    /** Numbers in reading order (row by row), NaN for blanks and left-out cells. Never mutated. */
    readonly values: Float64Array,
    readonly rows: number,
    readonly cols: number,
    /** Number of blank cells (left-out text and logical cells not included). */
    readonly blanks: number,
    /** Text and logical cells of a referenced range, left out like blanks; in reading order. */
    readonly leftOut: readonly LeftOutCell[] = NO_CELLS,
    /** True when read as a worksheet reference (text and logicals left out), false when given directly. */
    readonly reference = false,
  ) {}
  /** Content hash of `values` (bit pattern), the left-out positions and the shape, computed on first use; see {@link hashFloat64}. */
  get hash(): string {
    if (this.hashCache === undefined) {
      const base = `${this.rows}x${this.cols}:${hashFloat64(this.values)}`;
      this.hashCache = this.leftOut.length === 0 ? base : `${base}:t${hashFloat64(Float64Array.from(this.leftOut, (c) => c.index))}`;
    }
    return this.hashCache;
  }
}

/**
 * True when two parsed arguments hold the same cells: same shape, the same bit patterns (blanks
 * included) and the same left-out positions. Cost O(cells), O(1) for the same object.
 * @example sameVector(readVector('y', [[1], [2]]), readVector('y', [[1], [2]])) // → true
 */
export function sameVector(a: Vector | undefined, b: Vector | undefined): boolean {
  if (a === b) return true;
  if (a === undefined || b === undefined) return false;
  if (a.rows !== b.rows || a.cols !== b.cols || a.leftOut.length !== b.leftOut.length) return false;
  for (let i = 0; i < a.leftOut.length; i++) if (a.leftOut[i]!.index !== b.leftOut[i]!.index) return false;
  return sameBits(a.values, b.values);
}

/** Arguments with fewer cells are parsed on every call (cheaper than remembering them). */
const MEMO_MIN_CELLS = 64;

/** How many recently parsed data arguments a new argument is compared with. */
export const RECENT_VECTORS = 8;

/** The most recently parsed vectors, newest first (compared by content, see the file comment). */
let recent: Vector[] = [];

/** Forgets every remembered parse (called by the engine's clearCaches). O(1). */
export function clearParsed(): void {
  recent = [];
}

/** The canonical NaN used for blanks (one bit pattern, so bitwise comparison works). */
const BLANK = NaN;

/** True for a blank cell value: null, undefined or the empty string. */
export function isBlank(v: unknown): boolean {
  return v === null || v === undefined || v === '';
}

function isErrorCell(v: unknown): v is { kind: 'error'; code: string } {
  return typeof v === 'object' && v !== null && (v as { kind?: unknown }).kind === 'error';
}

/** Human-readable description of a cell for messages (numbers to 6 significant digits). */
export function describeCell(v: unknown): string {
  if (typeof v === 'number') return Number.isNaN(v) ? 'NaN' : formatNumber(v);
  if (typeof v === 'boolean') return v ? 'the logical TRUE' : 'the logical FALSE';
  if (typeof v === 'string') return `the text "${v.length > 24 ? `${v.slice(0, 24)}…` : v}"`;
  if (isErrorCell(v)) return `the error ${v.code}`;
  if (isBlank(v)) return 'blank';
  return typeof v;
}

/** True for text that reads as a number (" 47.6 "): such cells get a hint to convert them with VALUE. */
export function isNumberText(v: unknown): boolean {
  return typeof v === 'string' && v.trim() !== '' && Number.isFinite(Number(v));
}

/** The argument as a grid: a scalar becomes 1×1; omitted (undefined) stays undefined. */
export function toGrid(arg: CellArg): Grid | undefined {
  if (arg === undefined) return undefined;
  if (Array.isArray(arg)) return arg as Grid;
  return [[arg as CellValueIn]];
}

/** Sheet name as written in a formula: quoted (with '' for ') unless it is a plain name. */
function sheetPrefix(sheet: string): string {
  return /^[A-Za-z_][A-Za-z0-9_.]*$/.test(sheet) && !/^[A-Za-z]{1,3}\d+$/.test(sheet) ? sheet : `'${sheet.replace(/'/g, "''")}'`;
}

/** The top-left cell of a range address (`Data!$B$2:$B$40`, `Data!B:B`, `Data!2:2`) as sheet, row and column (1-based). */
export function rangeOrigin(address: string | undefined): { sheet: string; row: number; col: number } | undefined {
  const at = splitAddress(address);
  if (at === undefined) return undefined;
  const m = /^\$?([A-Za-z]{0,3})\$?(\d*)/.exec(at.range);
  if (m === null) return undefined;
  const letters = m[1] ?? '';
  const digits = m[2] ?? '';
  if (letters === '' && digits === '') return undefined;
  const col = letters === '' ? 1 : columnNumber(letters);
  const row = digits === '' ? 1 : Number(digits);
  if (!(col >= 1 && col <= MAX_COLS && row >= 1 && row <= MAX_ROWS)) return undefined;
  return { sheet: at.sheet, row, col };
}

/**
 * Name of one cell of an argument for messages: its worksheet address (`Data!B5`) when the host gave
 * the range's address, else its position — "cell 3" in a single row or column, "row 2, column 1"
 * in a 2-D range. O(1) plus the address parse.
 * @param address the argument's range address as the host gave it (`Data!B2:B40`), or undefined.
 * @param rows, cols the argument's shape; r, c the cell (0-based).
 * @example cellName('Data!B2:B40', 40, 1, 3, 0) // → 'Data!B5'
 */
export function cellName(address: string | undefined, rows: number, cols: number, r: number, c: number): string {
  const o = address === undefined ? undefined : rangeOrigin(address);
  if (o !== undefined && o.row + r <= MAX_ROWS && o.col + c <= MAX_COLS) return `${sheetPrefix(o.sheet)}!${columnLetters(o.col + c)}${o.row + r}`;
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

/** Marks a text or logical cell left out of a referenced range (slowCell's answer besides numbers). */
const LEFT_OUT = -1;

/**
 * A numeric cell value, BLANK, or LEFT_OUT (text or a logical in a reference); throws for text and
 * logicals given directly, errors, non-finite and huge numbers. Text that reads as a number gets a
 * conversion hint.
 */
function dataCell(name: string, v: CellValueIn, reference: boolean, pos: () => string): number {
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) fail('NON_FINITE', name, `needs finite numbers; ${pos()} is ${describeCell(v)}`);
    const a = Math.abs(v);
    if (a > MAX_MAGNITUDE || (a < MIN_MAGNITUDE && a !== 0)) {
      fail('NON_FINITE', name, `needs numbers of magnitude from 1e-300 to 1e100, or 0; ${pos()} is ${formatNumber(v)}`);
    }
    return v === 0 ? 0 : v; // −0 → +0 so equal data hash equally
  }
  if (isBlank(v)) return BLANK;
  if (isErrorCell(v)) throw new InputCellError(String(v.code), name, pos());
  if (reference && (typeof v === 'string' || typeof v === 'boolean')) return LEFT_OUT;
  if (isNumberText(v)) {
    fail('NON_FINITE', name, `needs numbers or blanks; ${pos()} is ${describeCell(v)} (a number stored as text: convert it with VALUE)`);
  }
  fail('NON_FINITE', name, `needs numbers or blanks; ${pos()} is ${describeCell(v)}`);
}

/** {@link dataCell} with the cell's name computed only when a message needs it. */
function slowCell(name: string, v: CellValueIn, reference: boolean, address: string | undefined, rows: number, cols: number, r: number, c: number): number {
  return dataCell(name, v, reference, () => cellName(address, rows, cols, r, c));
}

/**
 * True when `grid` holds exactly the cells `vec` was parsed from: the same numbers (−0 as 0), blanks
 * where `vec` has blanks and the same text or logical where it left one out; also checks that every
 * row is an array of the right length. Stops at the first difference. O(cells), no allocation.
 */
function sameCells(vec: Vector, grid: Grid): boolean {
  const vals = vec.values;
  const cols = vec.cols;
  const lo = vec.leftOut;
  if (cols === 1 && lo.length === 0 && vec.blanks === 0) return sameNumberColumn(vals, grid);
  if (cols === 1 && lo.length === 0) {
    // The common case (one column, numbers and blanks): one comparison per number cell.
    for (let r = 0; r < grid.length; r++) {
      const row = grid[r]!;
      if (!Array.isArray(row) || row.length !== 1) return false;
      const v: unknown = row[0];
      if (v !== vals[r]) {
        // A blank matches a NaN slot; anything else (another number, text, an error) does not.
        if (!(v === null || v === undefined || v === '') || vals[r] === vals[r]) return false;
      }
    }
    return true;
  }
  let t = 0;
  let nextOut = lo.length > 0 ? lo[0]!.index : -1;
  let k = 0;
  for (let r = 0; r < grid.length; r++) {
    const row = grid[r]!;
    if (!Array.isArray(row) || row.length !== cols) return false;
    for (let c = 0; c < cols; c++, k++) {
      const v: unknown = row[c];
      if (typeof v === 'number') {
        if (v !== vals[k]) return false;
      } else if (v === null || v === undefined || v === '') {
        if (k === nextOut || vals[k] === vals[k]) return false;
      } else {
        if (k !== nextOut || lo[t]!.value !== v) return false;
        t++;
        nextOut = t < lo.length ? lo[t]!.index : -1;
      }
    }
  }
  return true;
}

/**
 * {@link sameCells} for a column parsed without a blank or a left-out cell (`vals` holds no NaN):
 * every row must be an array of one cell equal to `vals[r]`. A blank, text, a logical, an error
 * cell or another number is never `===` to a number that is not NaN, so one strict comparison
 * per cell decides (−0 equals +0, as the parse stores it); rows are read four at a time, which
 * lets the processor fetch four rows' cells at once. Stops at the first block with a difference.
 * O(rows), no allocation.
 */
function sameNumberColumn(vals: Float64Array, grid: Grid): boolean {
  const n = vals.length;
  if (grid.length !== n) return false;
  let r = 0;
  for (; r + 4 <= n; r += 4) {
    const a = grid[r]!;
    const b = grid[r + 1]!;
    const c = grid[r + 2]!;
    const d = grid[r + 3]!;
    if (!Array.isArray(a) || !Array.isArray(b) || !Array.isArray(c) || !Array.isArray(d)) return false;
    if (a.length !== 1 || b.length !== 1 || c.length !== 1 || d.length !== 1) return false;
    if (a[0] !== vals[r] || b[0] !== vals[r + 1] || c[0] !== vals[r + 2] || d[0] !== vals[r + 3]) return false;
  }
  for (; r < n; r++) {
    const row = grid[r]!;
    if (!Array.isArray(row) || row.length !== 1 || row[0] !== vals[r]) return false;
  }
  return true;
}

/** A remembered vector with exactly these cells (moved to the front), or undefined. */
function recall(grid: Grid, rows: number, cols: number, reference: boolean): Vector | undefined {
  for (let i = 0; i < recent.length; i++) {
    const vec = recent[i]!;
    if (vec.rows !== rows || vec.cols !== cols || vec.reference !== reference) continue;
    if (!sameCells(vec, grid)) continue;
    if (i > 0) {
      recent.splice(i, 1);
      recent.unshift(vec);
    }
    return vec;
  }
  return undefined;
}

function remember(vec: Vector): void {
  recent.unshift(vec);
  if (recent.length > RECENT_VECTORS) recent.length = RECENT_VECTORS;
}

/**
 * Reads a data argument as numbers (NaN for blanks), row by row. With `shape: 'line'` the range
 * must be a single column or row (or one cell); `'any'` accepts a 2-D range.
 *
 * Cost O(cells): a comparison with recently parsed arguments, and a parse when none matches.
 * @param name the parameter name, for messages.
 * @param arg the argument as the host passed it.
 * @param shape `'line'` (default) or `'any'`.
 * @param source how the host passed it: `reference: true` when it is a worksheet reference — text
 *   and logical cells are then left out ({@link Vector.leftOut}) instead of refused — and the
 *   range's `address` (`Data!B2:B40`) when known, for messages. Default: given directly, no address.
 * @throws RatchetError (text or logicals given directly, non-finite or huge numbers, not a line)
 *   and {@link InputCellError} (an error cell); messages name the cell by address when known.
 * @example readVector('known_ys', [[1], [null], [3]]).values // → Float64Array [1, NaN, 3]
 * @example readVector('known_ys', [[1], ['n/a'], [3]], 'line', { reference: true }).leftOut // → [{ index: 1, value: 'n/a' }]
 */
export function readVector(name: string, arg: CellArg, shape: 'line' | 'any' = 'line', source: CellSource = DIRECT): Vector {
  const grid = toGrid(arg);
  if (grid === undefined || grid.length === 0) fail('EMPTY_INPUT', name, 'needs at least one value; got none');
  const rows = grid.length;
  const reference = source.reference;
  // A remembered parse first: sameCells also checks that the grid is rectangular of this shape.
  const first: unknown = grid[0];
  const width = Array.isArray(first) ? first.length : 0;
  if (rows * width >= MEMO_MIN_CELLS && (shape === 'any' || rows === 1 || width === 1)) {
    const hit = recall(grid, rows, width, reference);
    if (hit) return hit;
  }
  const cols = checkRectangular(name, grid);
  if (cols === 0) fail('EMPTY_INPUT', name, 'needs at least one value; got none');
  if (shape === 'line' && rows > 1 && cols > 1) {
    fail('BAD_OPTION', name, `needs a single column or row; got ${rows} rows × ${cols} columns`);
  }
  const cells = rows * cols;
  const address = source.address;
  const values = new Float64Array(cells);
  let leftOut: LeftOutCell[] | undefined;
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
        v = a <= MAX_MAGNITUDE && (a >= MIN_MAGNITUDE || a === 0) ? cellValue + 0 : slowCell(name, cellValue, reference, address, rows, cols, r, c);
      } else {
        v = slowCell(name, cellValue as CellValueIn, reference, address, rows, cols, r, c);
        if (v === LEFT_OUT) {
          (leftOut ??= []).push({ index: k, value: cellValue as string | boolean });
          v = BLANK;
        } else if (v !== v) blanks++;
      }
      values[k++] = v;
    }
  }
  const vec = new Vector(values, rows, cols, blanks, leftOut ?? NO_CELLS, reference);
  if (cells >= MEMO_MIN_CELLS) remember(vec);
  return vec;
}

/** How a host passed an argument: a worksheet reference or not, and the range's address when known. */
export interface CellSource {
  /** True for a worksheet reference (text and logicals in data are left out). */
  readonly reference: boolean;
  /** The range's address (`Data!B2:B40`, `'Kiln data'!$B:$B`), when the host gives it. */
  readonly address?: string | undefined;
}

/** An argument given directly (a constant, an array constant, another formula's result). */
export const DIRECT: CellSource = Object.freeze({ reference: false });

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
