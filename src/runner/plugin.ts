/**
 * The RATCHET worksheet functions as a HyperFormula function plugin.
 *
 * Every call goes to the one implementation in the registry (`SheetFunction.invoke`); what it
 * throws goes through the one error mapping of src/adapter. This module only translates
 * HyperFormula's values into the host-neutral `CellArg` shapes and back, and sizes array
 * results.
 *
 * Sizing. HyperFormula fixes the size of an array result when it parses a formula, before any
 * value is known, and fails when a result is larger than that size. The plugin therefore
 * remembers, per formula cell and call, the size the call last produced (learned by evaluating
 * the call on its arguments). A call that produces a different size than was reserved marks its
 * cell for rebuilding; a larger result is held back as a temporary error so the engine never sees
 * an oversized array. The engine (workbook.ts) then re-enters the marked formulas, HyperFormula
 * re-sizes them from what was learned, and repeats until nothing changes — so a result grows or
 * shrinks with its data, and a result that would overlap filled cells becomes #SPILL!.
 */
import {
  ArraySize,
  CellError,
  EmptyValue,
  ErrorType,
  FunctionArgumentType,
  FunctionPlugin,
  HyperFormula,
  SimpleRangeValue,
  type FunctionPluginDefinition,
  type ImplementedFunctions,
} from 'hyperformula';
import type { CellArg, CellErrorInput, CellOut, CellResult, CellValueIn, SheetFunction } from '../functions/types.js';
import type { MappedError } from '../adapter/errors.js';
import { NAMESPACE } from '../functions/registry.js';
import { RatchetError } from '../core/index.js';
import { columnLetters } from '../adapter/a1.js';

/** The adapter's mapping from anything thrown to a cell error (src/adapter/errors.ts `mapError`). */
export type ErrorMapper = (e: unknown) => MappedError;

/** Rows × columns of a value. */
export interface Dims {
  readonly rows: number;
  readonly cols: number;
}

/** Per-engine sizing memory; see the module comment. */
export interface SizingState {
  /** Learned result size per call key. */
  readonly learned: Map<string, Dims>;
  /** Size reserved at the last parse per call key. */
  readonly reserved: Map<string, Dims>;
  /** Formula cells ("sheet:row:col") whose reserved size differs from their result. */
  readonly dirty: Set<string>;
  /** Number of RATCHET calls evaluated (for tests and diagnostics). */
  calls: number;
  /**
   * Range arguments converted during the current recalculation, by range address. Within one
   * recalculation a range's cells are all computed before any formula reads it, so every call
   * reading the same range can share one converted (never mutated) argument — which lets the
   * functions' parse memo and result cache recognise it. Cleared before each recalculation
   * ({@link beginRecalculation}).
   */
  readonly ranges: Map<string, CellArg>;
  /**
   * Result sizes worked out before the engine was built (presize.ts), by formula cell
   * ("sheet:row:col"): the size reserved for a call not yet learned there, so that a result
   * enters the engine once with its final size. A wrong guess is only slower: the call then
   * marks its cell for re-sizing like any other.
   */
  readonly presized: Map<string, Dims>;
}

/** Sizes and converted ranges for the next engine built ({@link stageForNextEngine}). */
export interface Staged {
  readonly sizes: Map<string, Dims>;
  readonly ranges: Map<string, CellArg>;
}

let staged: Staged | undefined;

/**
 * Hands sizes and converted range arguments worked out before `HyperFormula.buildFromSheets` to
 * the sizing state of the engine built next (the state is created when the build first calls a
 * RATCHET function, or by {@link sizingStateOf} after it). Call immediately before the build and
 * with `undefined` right after it. O(1).
 * @param s the staged sizes ("sheet:row:col" → dims) and ranges ("sheet:r0:c0:r1:c1" → CellArg,
 * exactly what {@link toCellArg} gives for those cells), or undefined to drop what was staged.
 */
export function stageForNextEngine(s: Staged | undefined): void {
  staged = s;
}

const sizingByGraph = new WeakMap<object, SizingState>();

/** The sizing state of a HyperFormula instance (created on first use). */
export function sizingStateOf(hf: HyperFormula): SizingState {
  return sizingFor(hf.dependencyGraph as unknown as object);
}

/** The sizing state kept for one dependency graph (one engine instance). */
function sizingFor(graph: object): SizingState {
  let s = sizingByGraph.get(graph);
  if (!s) {
    s = { learned: new Map(), reserved: new Map(), dirty: new Set(), calls: 0, ranges: staged?.ranges ?? new Map(), presized: staged?.sizes ?? new Map() };
    staged = undefined;
    sizingByGraph.set(graph, s);
  }
  return s;
}

/** Call before any engine operation that recalculates: forgets converted range arguments. */
export function beginRecalculation(hf: HyperFormula): void {
  sizingStateOf(hf).ranges.clear();
}

/** HyperFormula error type of an Excel error code. */
const TYPE_OF_CODE: Readonly<Record<string, ErrorType>> = {
  '#DIV/0!': ErrorType.DIV_BY_ZERO,
  '#N/A': ErrorType.NA,
  '#NAME?': ErrorType.NAME,
  '#NUM!': ErrorType.NUM,
  '#REF!': ErrorType.REF,
  '#VALUE!': ErrorType.VALUE,
  '#SPILL!': ErrorType.SPILL,
  '#CYCLE!': ErrorType.CYCLE,
};

/** Excel error code of a HyperFormula error type. */
export const CODE_OF_TYPE: Readonly<Record<string, string>> = {
  DIV_BY_ZERO: '#DIV/0!',
  NA: '#N/A',
  NAME: '#NAME?',
  NUM: '#NUM!',
  REF: '#REF!',
  VALUE: '#VALUE!',
  SPILL: '#SPILL!',
  CYCLE: '#CYCLE!',
  ERROR: '#ERROR!',
  LIC: '#LIC!',
};

/**
 * A HyperFormula error from a cell error of the adapter's mapping: same code and message. A code
 * HyperFormula has no type for (#NULL!) becomes its generic #ERROR! with the code at the front
 * of the message. O(1).
 * @example toHfError({ code: '#N/A', message: 'target_ys: 99 is outside …' }).type // → 'NA'
 */
export function toHfError(e: Pick<MappedError, 'code'> & { readonly message?: string | undefined }): CellError {
  const type = TYPE_OF_CODE[e.code];
  if (type !== undefined) return new CellError(type, e.message);
  return new CellError(ErrorType.ERROR, `${e.code}${e.message ? ` ${e.message}` : ''}`);
}

type Internal = unknown;

/** One scalar of HyperFormula's internal values → a host-neutral cell value. */
function scalarIn(v: Internal): CellValueIn {
  if (v === EmptyValue || v === undefined || v === null) return null;
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  if (v instanceof CellError) {
    const err: CellErrorInput = { kind: 'error', code: CODE_OF_TYPE[v.type] ?? '#ERROR!', ...(v.message ? { message: v.message } : {}) };
    return err;
  }
  // Rich numbers (dates, currency, percent) carry the plain number in `val`.
  if (typeof v === 'object' && 'val' in v && typeof (v as { val: unknown }).val === 'number') return (v as { val: number }).val;
  return String(v);
}

/**
 * An evaluated HyperFormula argument → CellArg (src/functions/types.ts). Ranges and arrays become
 * rows of cells; an empty cell is null (never 0); an error is `{ kind: 'error', code, message? }`
 * with its Excel code; a rich number (date, currency, percent) is its plain number; a single-cell
 * reference arrives as a scalar. O(cells).
 * @example toCellArg(SimpleRangeValue.onlyValues([[1, EmptyValue]])) // → [[1, null]]
 */
export function toCellArg(v: Internal): CellArg {
  if (v instanceof SimpleRangeValue) return v.data.map((row) => row.map(scalarIn));
  return scalarIn(v);
}

/** Rows and columns of an Excel worksheet (Excel's specifications and limits) (common practice). */
const SHEET_ROWS = 1048576;
const SHEET_COLS = 16384;

/**
 * A whole-column (`B:B`) or whole-row (`2:2`) argument as Excel passes it: every cell of the
 * sheet's height (width). HyperFormula stops such a range at the used area; the cells past it
 * are blank, so they are appended as blanks (one shared, never mutated row of blanks for the
 * rows; a RATCHET function never mutates its arguments). Blank rows are then left out by the
 * one blank-cell rule and counted as dropped, exactly as for the same data given as the exact
 * range B1:B1048576. O(sheet height) for columns, O(sheet width) for rows.
 */
function wholeLines(arg: CellArg, columns: boolean): CellArg {
  if (!Array.isArray(arg)) return arg;
  if (columns) {
    const width = arg[0]?.length ?? 1;
    if (arg.length >= SHEET_ROWS) return arg;
    const blank: CellValueIn[] = Array<CellValueIn>(width).fill(null);
    const out = arg.slice();
    for (let r = arg.length; r < SHEET_ROWS; r++) out.push(blank);
    return out;
  }
  return arg.map((row) => (row.length >= SHEET_COLS ? row : [...row, ...Array<CellValueIn>(SHEET_COLS - row.length).fill(null)]));
}

/**
 * Rows × columns of a function's result: 1 × 1 for a scalar, else its rows and its widest row.
 * O(rows).
 * @example dimsOf([[1, 2], [3]]) // → { rows: 2, cols: 2 }
 */
export function dimsOf(r: CellResult): Dims {
  if (!Array.isArray(r)) return { rows: 1, cols: 1 };
  return { rows: r.length, cols: r.reduce((m, row) => Math.max(m, row.length), 0) };
}

/** A (non-empty) result → HyperFormula value; ragged rows are padded with "". */
function fromResult(r: CellResult, scalarCell: boolean): Internal {
  if (!Array.isArray(r)) return typeof r === 'object' ? toHfError(r) : r;
  const d = dimsOf(r);
  const cell = (v: CellOut): number | string | boolean | CellError => (typeof v === 'object' ? toHfError(v) : v);
  if (scalarCell && d.rows === 1 && d.cols === 1) return cell(r[0]![0]!);
  return SimpleRangeValue.onlyValues(r.map((row) => (row.length === d.cols ? row.map(cell) : [...row.map(cell), ...Array<string>(d.cols - row.length).fill('')])));
}

/** A block of `d` filled with one value (an error held for one pass while a result is re-sized). */
function filled(d: Dims, v: CellError): Internal {
  if (d.rows === 1 && d.cols === 1) return v;
  return SimpleRangeValue.onlyValues(Array.from({ length: d.rows }, () => Array<CellError>(d.cols).fill(v)));
}

/** Message of the placeholder shown for one recalculation pass while a result is re-sized. */
export const RESIZING_MESSAGE = 'The result changed size; the runner re-sizes it.';

interface AstLike {
  type: string;
  procedureName?: string;
  args?: AstLike[];
}

const astKeys = new WeakMap<object, string>();
function astKey(ast: object): string {
  let k = astKeys.get(ast);
  if (k === undefined) {
    k = JSON.stringify(ast, (key, value: unknown) => (key === 'leadingWhitespace' || key === 'internalWhitespace' ? undefined : value));
    astKeys.set(ast, k);
  }
  return k;
}

interface StateLike {
  formulaAddress: { sheet: number; row: number; col: number };
  arraysFlag: boolean;
}

function cellKey(state: StateLike): string {
  const a = state.formulaAddress;
  return `${a.sheet}:${a.row}:${a.col}`;
}

/** The parts of HyperFormula's dependency graph and ASTs the address lookup reads. */
interface GraphLike {
  sheetMapping?: { getSheetName(id: number): string | undefined };
}
interface RangeLike {
  start: { sheet: number; row: number; col: number };
  end: { row: number; col: number };
}

/** TRUE or FALSE written bare (`=RATCHET.FIT(B1:B6,A1:A6,TRUE)`): HyperFormula parses it as a name. */
function bareLogical(a: AstLike): boolean | undefined {
  const name = (a as { expressionName?: unknown }).expressionName;
  if (a.type !== 'NAMED_EXPRESSION' || typeof name !== 'string') return undefined;
  const upper = name.toUpperCase();
  return upper === 'TRUE' ? true : upper === 'FALSE' ? false : undefined;
}

/** Sheet name as written in a reference: quoted unless plain. */
function sheetRef(name: string): string {
  return /^[A-Za-z_][A-Za-z0-9_.]*$/.test(name) && !/^[A-Za-z]{1,3}\d+$/.test(name) ? name : `'${name.replace(/'/g, "''")}'`;
}

/**
 * The worksheet address (`Data!B2:B40`) of an argument that is a reference — a range (also `B:B`)
 * or a single cell — or undefined for anything else (constants, array constants, formula results).
 * O(1).
 */
function addressOf(graph: GraphLike, a: AstLike, range: RangeLike | undefined, state: StateLike): string | undefined {
  const sheetName = (id: number): string | undefined => graph.sheetMapping?.getSheetName(id);
  const cell = (row: number, col: number): string => `${columnLetters(col + 1)}${row + 1}`;
  if (range !== undefined && (a.type === 'CELL_RANGE' || a.type === 'COLUMN_RANGE' || a.type === 'ROW_RANGE')) {
    const sheet = sheetName(range.start.sheet);
    if (sheet === undefined) return undefined;
    return `${sheetRef(sheet)}!${cell(range.start.row, range.start.col)}:${cell(range.end.row, range.end.col)}`;
  }
  if (a.type === 'CELL_REFERENCE') {
    const ref = (a as { reference?: { toSimpleCellAddress?: (base: StateLike['formulaAddress']) => { sheet: number; row: number; col: number } } }).reference;
    const at = ref?.toSimpleCellAddress?.(state.formulaAddress);
    if (at === undefined || at.row < 0 || at.col < 0) return undefined;
    const sheet = sheetName(at.sheet);
    return sheet === undefined ? undefined : `${sheetRef(sheet)}!${cell(at.row, at.col)}`;
  }
  return undefined;
}

let registered: FunctionPluginDefinition | undefined;
let registeredNames: readonly string[] = [];
let registeredById: ReadonlyMap<string, SheetFunction> = new Map();

/**
 * Registers the given worksheet functions with HyperFormula (globally, replacing an earlier
 * registration) under `RATCHET.<name>`. Cost O(number of functions).
 * @param functions the registry's functions (SHEET_FUNCTIONS).
 * @param toCellError the adapter's one mapping from thrown errors to cell errors.
 */
export function registerRatchetPlugin(functions: readonly SheetFunction[], toCellError: ErrorMapper): void {
  if (registered) HyperFormula.unregisterFunctionPlugin(registered);

  const implemented: ImplementedFunctions = {};
  const byId = new Map<string, SheetFunction>();
  for (const f of functions) {
    const id = `${NAMESPACE}.${f.name.toUpperCase()}`;
    byId.set(id, f);
    implemented[id] = {
      method: 'callRatchet',
      sizeOfResultArrayMethod: 'sizeRatchet',
      vectorizationForbidden: true,
      parameters: f.params.map(() => ({ argumentType: FunctionArgumentType.ANY, optionalArg: true })),
    };
  }

  class RatchetPlugin extends FunctionPlugin {
    static override implementedFunctions = implemented;

    /** Evaluates the call: arguments → CellArg, the registry implementation, result or mapped error. */
    callRatchet(ast: AstLike, state: StateLike): Internal {
      const fn = byId.get((ast.procedureName ?? '').toUpperCase());
      if (!fn) return new CellError(ErrorType.NAME, `Unknown function ${ast.procedureName}.`);
      const sizing = sizingFor(this.dependencyGraph as unknown as object);
      sizing.calls++;
      const key = `${cellKey(state)}|${astKey(ast)}`;
      const reserved = sizing.reserved.get(key);
      // An error fills one cell, as in Excel. Where an array was reserved, HyperFormula must not
      // receive a bare error (an array holding an error breaks formulas that refer to exactly its
      // range), so the reserved block is filled with the error for this pass and the cell is
      // re-sized to one cell.
      const errorOut = (err: CellError): Internal => {
        sizing.learned.set(key, { rows: 1, cols: 1 });
        if (reserved === undefined || (reserved.rows === 1 && reserved.cols === 1)) return err;
        sizing.dirty.add(cellKey(state));
        return filled(reserved, err);
      };
      const asts = ast.args ?? [];
      if (asts.length > fn.params.length) {
        // The one mapping: too many arguments is an argument problem (#VALUE! with a message).
        return errorOut(toHfError(toCellError(new RatchetError('BAD_OPTION', `${NAMESPACE}.${fn.name}`, `takes at most ${fn.params.length} arguments; got ${asts.length}`))));
      }
      const argState = { ...state, arraysFlag: true };
      // Addresses of reference arguments ("Data!B2:B40"): text and logicals in data ranges are
      // then left out, and messages name cells by address (InvokeContext.addresses).
      const addresses: (string | undefined)[] = [];
      const args: CellArg[] = fn.params.map((_p, i) => {
        const a = asts[i];
        if (a === undefined || a.type === 'EMPTY') return undefined;
        // A bare TRUE / FALSE is a logical, as in Excel (HyperFormula reads it as an unknown name).
        const logical = bareLogical(a);
        if (logical !== undefined) return logical;
        const v = this.evaluateAst(a as never, argState as never) as Internal;
        const range = v instanceof SimpleRangeValue ? v.range : undefined;
        addresses[i] = addressOf(this.dependencyGraph as unknown as GraphLike, a, range, state);
        if (range === undefined) return toCellArg(v);
        const rk = `${range.start.sheet}:${range.start.row}:${range.start.col}:${range.end.row}:${range.end.col}`;
        let arg = sizing.ranges.get(rk);
        if (arg === undefined) {
          arg = a.type === 'COLUMN_RANGE' || a.type === 'ROW_RANGE' ? wholeLines(toCellArg(v), a.type === 'COLUMN_RANGE') : toCellArg(v);
          sizing.ranges.set(rk, arg);
        }
        return arg;
      });
      let result: CellResult;
      try {
        result = fn.invoke(args, { addresses });
      } catch (e) {
        return errorOut(toHfError(toCellError(e)));
      }
      const got = dimsOf(result);
      if (got.rows === 0 || got.cols === 0) return errorOut(new CellError(ErrorType.VALUE, `${NAMESPACE}.${fn.name} returned no cells.`));
      sizing.learned.set(key, got);
      if (reserved !== undefined && (reserved.rows !== got.rows || reserved.cols !== got.cols)) {
        sizing.dirty.add(cellKey(state));
        if (got.rows > reserved.rows || got.cols > reserved.cols) return filled(reserved, new CellError(ErrorType.ERROR, RESIZING_MESSAGE));
      }
      return fromResult(result, reserved !== undefined && reserved.rows === 1 && reserved.cols === 1);
    }

    /** Reserves the size this call produced last time here, or one cell when unknown. */
    sizeRatchet(ast: AstLike, state: StateLike): ArraySize {
      const sizing = sizingFor(this.dependencyGraph as unknown as object);
      const key = `${cellKey(state)}|${astKey(ast)}`;
      const d = sizing.learned.get(key) ?? sizing.presized.get(cellKey(state)) ?? { rows: 1, cols: 1 };
      sizing.reserved.set(key, d);
      return d.rows === 1 && d.cols === 1 ? ArraySize.scalar() : new ArraySize(d.cols, d.rows);
    }
  }

  const translations: Record<string, string> = {};
  for (const id of byId.keys()) translations[id] = id;
  HyperFormula.registerFunctionPlugin(RatchetPlugin as unknown as FunctionPluginDefinition, { enGB: translations, enUS: translations });
  registered = RatchetPlugin as unknown as FunctionPluginDefinition;
  registeredNames = [...byId.keys()];
  registeredById = byId;
}

/** The registered function called `name` ("RATCHET.FIT", any case), or undefined. O(1). */
export function registeredFunction(name: string): SheetFunction | undefined {
  return registeredById.get(name.toUpperCase());
}

/** Names currently registered (e.g. "RATCHET.FIT"). */
export function registeredFunctionNames(): readonly string[] {
  return registeredNames;
}
