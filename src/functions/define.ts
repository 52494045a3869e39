/**
 * The worksheet-function machinery: a function is one {@link FunctionSpec} — its name, its named
 * parameters ({@link ParamSpec}: name, kind, default, allowed range, help text) and one `run` that
 * reads its arguments by name through {@link Args}. {@link defineFunction} turns the spec into the
 * {@link SheetFunction} every host calls (Excel entry, worker, headless runner, task pane). What the
 * machinery does for every function, so that no implementation repeats it:
 * - positions → names: `invoke(args)` takes the arguments in the order users type them;
 * - parsing by kind, with the parameter's own name in every message (src/adapter/cells.ts);
 * - the one row pairing with the blank-cell rule ({@link Args.rows}, src/adapter/rows.ts);
 * - core argument names renamed to worksheet names in errors (`x` → `known_xs`, from `coreName`);
 * - every number of a result must be finite, else a NUMERICAL error (`#NUM!`), never a wrong number.
 * Adding a function: DEVELOPERS.md, "Adding a worksheet function".
 */
import { RatchetError, fail, isRatchetError } from '../core/index.js';
import {
  DIRECT,
  cellName,
  describeCell,
  isNumberText,
  nonBlank,
  readChoice,
  readKnots,
  readScalar,
  readVector,
  toGrid,
  type CellSource,
  type Vector,
} from '../adapter/cells.js';
import { splitAddress } from '../adapter/blanks.js';
import { pairRows, type Column, type PairedRows } from '../adapter/rows.js';
import type { CellArg, CellResult } from '../adapter/cell-types.js';
import type { InvokeContext, ParamKind, ParamSpec, SheetFunction } from './types.js';

/** Namespace users type before each function name (`RATCHET.FIT`). Defined here only. */
export const NAMESPACE = 'RATCHET';

/**
 * Base of the help links: the README rendered as help.html and served with the add-in (same origin
 * as every URL in manifest.xml; replace it together with them when deploying). Each function's
 * anchor is its full name lower-cased without the dot, the anchor of its README heading.
 */
export const HELP_BASE = 'https://localhost:3000/help.html';

/**
 * The help URL of a function: README section "RATCHET.FIT" → `…/help.html#ratchetfit`. O(1).
 * @param name function name without the namespace, any case.
 * @example helpUrlOf('FIT') // → 'https://localhost:3000/help.html#ratchetfit'
 */
export function helpUrlOf(name: string): string {
  return `${HELP_BASE}#${NAMESPACE.toLowerCase()}${name.toLowerCase()}`;
}

/**
 * The syntax line of a function as the README shows it, optional parameters in brackets. O(params).
 * @param f a registered function.
 * @example signatureOf(functionByName('EVAL')!) // → 'RATCHET.EVAL(new_xs, knot_table)'
 */
export function signatureOf(f: Pick<SheetFunction, 'name' | 'params'>): string {
  return `${NAMESPACE}.${f.name}(${f.params.map((p) => (p.optional ? `[${p.name}]` : p.name)).join(', ')})`;
}

/** A function as written once: user-facing description, named parameters, and the implementation. */
export interface FunctionSpec<N extends string> {
  /** Name without the namespace, upper case (users type RATCHET.<name>). */
  readonly name: string;
  /** One sentence for Excel's function tooltip and the JSDoc summary. */
  readonly description: string;
  /** Parameters in the order users type them; new optional ones go at the end. */
  readonly params: readonly ParamSpec<N>[];
  /** True when the result is a 2-D array that spills. */
  readonly returnsArray: boolean;
  /** Long work (cross-validation): hosts run it off their main thread and may cancel it. Default false. */
  readonly longWork?: boolean;
  /** Computes the result from the arguments, read by name. Throws RatchetError / InputCellError. */
  run(args: Args<N>, context?: InvokeContext): CellResult;
}

/** The data arguments of a call, parsed and named, before pairing (the cache compares these). */
export interface DataArgs {
  /** known_ys first, then each input, in the order of the parameters. */
  readonly columns: readonly Column[];
  readonly weights: Column | undefined;
}

/** Pairs a call's data rows: {@link pairRows} on {@link DataArgs}. Cost O(n · columns). */
export function pairData(d: DataArgs): PairedRows {
  return pairRows(d.columns, d.weights);
}

/** How one parameter is read, prepared once per function. */
interface Slot {
  readonly index: number;
  readonly spec: ParamSpec;
  readonly choices: ReadonlyMap<number, string> | undefined;
  readonly needs: string;
}

function slotOf(spec: ParamSpec, index: number): Slot {
  if (spec.kind !== 'choice') return { index, spec, choices: undefined, needs: '' };
  const list = spec.choices ?? [];
  if (list.length < 2 || spec.default === undefined || !list.some((c) => c.value === spec.default)) {
    throw new Error(`parameter ${spec.name}: a choice needs at least two choices and a default among their values`);
  }
  const parts = list.map((c) => `${c.code} (${c.label})`);
  const needs = `${parts.slice(0, -1).join(', ')} or ${parts[parts.length - 1]}`;
  return { index, spec, choices: new Map(list.map((c) => [c.code, c.value])), needs };
}

/**
 * The arguments of one call, read by parameter name. Each reader parses according to the
 * parameter's kind and names the parameter in its errors; asking for a name the function does not
 * declare, or with the reader of another kind, is a programming error (plain Error).
 */
export class Args<N extends string = string> {
  constructor(
    private readonly slots: ReadonlyMap<string, Slot>,
    private readonly values: readonly CellArg[],
    private readonly addresses?: readonly (string | null | undefined)[],
  ) {}

  /** How argument `index` was passed: a reference with its address, or directly. */
  private source(index: number): CellSource {
    return sourceOf(this.addresses?.[index]);
  }

  /** The worksheet address of a reference argument, or undefined. */
  address(name: N): string | undefined {
    const s = this.slots.get(name);
    if (s === undefined) throw new Error(`no parameter ${name}`);
    return this.source(s.index).address;
  }

  private slot(name: N, kinds: readonly ParamKind[]): Slot {
    const s = this.slots.get(name);
    if (s === undefined || !kinds.includes(s.spec.kind)) throw new Error(`no ${kinds.join('/')} parameter ${name}`);
    return s;
  }

  /**
   * All arguments as the host passed them, in parameter order: for identity memos on hot paths,
   * indexed with {@link positionsOf} (so they are still addressed by name).
   */
  get raw(): readonly CellArg[] {
    return this.values;
  }

  /** The argument as the host passed it (undefined when omitted): for identity memos only. */
  cell(name: N): CellArg {
    const s = this.slots.get(name);
    if (s === undefined) throw new Error(`no parameter ${name}`);
    return this.values[s.index];
  }

  /**
   * A `data` argument: one column or row of numbers, NaN for blanks. In a reference, text and
   * logical cells are left out like blanks (listed in `leftOut`); given directly they are errors.
   */
  data(name: N): Vector {
    const i = this.slot(name, ['data']).index;
    return readVector(name, this.values[i], 'line', this.source(i));
  }

  /** An optional `data` argument (weights): undefined when omitted, blank or "". */
  optionalData(name: N): Vector | undefined {
    const i = this.slot(name, ['data']).index;
    const v = this.values[i];
    if (v === undefined || v === null || v === '') return undefined;
    return readVector(name, v, 'line', this.source(i));
  }

  /** A `cells` or `table` argument: a cell or a range of any shape, NaN for blanks (text is an error, named by address when known). */
  cells(name: N): Vector {
    const i = this.slot(name, ['cells', 'table']).index;
    const address = this.source(i).address;
    return readVector(name, this.values[i], 'any', address === undefined ? DIRECT : { reference: false, address });
  }

  /** A `knots` argument: 0 (classic fit), a knot count, or knot positions. */
  knots(name: N): number | Float64Array {
    return readKnots(name, this.values[this.slot(name, ['knots']).index]);
  }

  /** A `list` argument: its numbers (blanks skipped), or undefined when omitted or all blank. */
  list(name: N): Float64Array | undefined {
    const v = this.values[this.slot(name, ['list']).index];
    if (toGrid(v) === undefined) return undefined;
    const c = nonBlank(readVector(name, v, 'line'));
    return c.length > 0 ? Float64Array.from(c) : undefined;
  }

  /** A `choice` argument: the value of the code given, or the parameter's default when omitted. */
  choice<T extends string>(name: N): T {
    const s = this.slot(name, ['choice']);
    return readChoice(name, this.values[s.index], s.choices!, s.spec.default!, s.needs) as T;
  }

  /** A `number` argument, or undefined when omitted or blank (the core applies its default). */
  number(name: N): number | undefined {
    return readScalar(name, this.values[this.slot(name, ['number']).index]);
  }

  /**
   * The data arguments `columns` (known_ys first) and optional `weights`, parsed in that order
   * (so the first bad argument is the one reported), ready for the cache and {@link pairData}.
   */
  rows(columns: readonly N[], weights?: N): DataArgs {
    const cols = columns.map((name) => ({ name, vector: this.data(name), address: this.address(name) }));
    const w = weights === undefined ? undefined : this.optionalData(weights);
    return { columns: cols, weights: w === undefined ? undefined : { name: weights!, vector: w, address: this.address(weights!) } };
  }
}

/**
 * How a host passed an argument, from its entry in {@link InvokeContext.addresses}: a worksheet
 * reference when the entry is a sheet address (`Data!B2:B40`), else given directly. O(length).
 * @example sourceOf('Data!B2:B9') // → { reference: true, address: 'Data!B2:B9' }
 * @example sourceOf('') // → { reference: false }
 */
export function sourceOf(address: string | null | undefined): CellSource {
  if (typeof address !== 'string' || address === '' || splitAddress(address) === undefined) return DIRECT;
  return { reference: true, address };
}

/** One text or logical cell left out of a call's data, for the task pane's list. */
export interface LeftOutEntry {
  /** The parameter (`known_ys`). */
  readonly argument: string;
  /** The cell's address (`Data!B5`) when the host gave the range's address, else its position (`cell 4`). */
  readonly cell: string;
  /** The cell as the host passed it. */
  readonly value: string | boolean;
  /** A sentence for users: `Data!B5 holds the text "47.6" — convert it with VALUE to use it`. */
  readonly message: string;
}

/**
 * The text and logical cells that a call of `f` leaves out of its data arguments (every `data`
 * parameter given as a reference), in parameter order then reading order — what the task pane
 * lists under a fit. Reads the arguments as the call does (same messages if one is invalid).
 * Cost O(cells of the data arguments).
 * @param f a registered function.
 * @param args the arguments by position, as for `invoke`.
 * @param context the addresses of reference arguments (InvokeContext.addresses); without them
 *   nothing is left out (text given directly is an error) and the list is empty.
 * @throws RatchetError / InputCellError as the call would for an invalid data argument.
 * @example leftOutCellsOf(functionByName('FIT')!, [[[1], ['47.6'], [3]], [[1], [2], [3]]], { addresses: ['Data!B2:B4', 'Data!A2:A4'] })
 *   // → [{ argument: 'known_ys', cell: 'Data!B3', value: '47.6', message: 'Data!B3 holds the text "47.6" — convert it with VALUE to use it' }]
 */
export function leftOutCellsOf(f: Pick<SheetFunction, 'params'>, args: readonly CellArg[], context?: InvokeContext): LeftOutEntry[] {
  const out: LeftOutEntry[] = [];
  f.params.forEach((p, i) => {
    if (p.kind !== 'data') return;
    const source = sourceOf(context?.addresses?.[i]);
    const arg = args[i];
    if (!source.reference || arg === undefined || arg === null || arg === '') return;
    const v = readVector(p.name, arg, 'line', source);
    for (const c of v.leftOut) {
      const r = v.cols === 1 ? c.index : 0;
      const col = v.cols === 1 ? 0 : c.index;
      const cell = cellName(source.address, v.rows, v.cols, r, col);
      const hint = isNumberText(c.value) ? ' — convert it with VALUE to use it' : ' — its row is left out';
      out.push({ argument: p.name, cell, value: c.value, message: `${cell} holds ${describeCell(c.value)}${hint}` });
    }
  });
  return out;
}

/**
 * Position of each parameter by name, for {@link Args.raw} on hot paths. O(params), once per function.
 * @example positionsOf([P.newXs, P.knownYs]).known_ys // → 1
 */
export function positionsOf<const N extends string>(params: readonly ParamSpec<N>[]): Readonly<Record<N, number>> {
  const out = {} as Record<N, number>;
  params.forEach((p, i) => (out[p.name] = i));
  return out;
}

/** Every number of a result must be finite: anything else is a numerical failure (#NUM!). O(cells). */
function finite(name: string, result: CellResult): CellResult {
  // Indexed loops and no closure: this runs on every call, also on the one-cell fast paths.
  if (Array.isArray(result)) {
    for (let r = 0; r < result.length; r++) {
      const row = result[r]!;
      for (let c = 0; c < row.length; c++) {
        const v = row[c];
        if (typeof v === 'number' && v - v !== 0) fail('NUMERICAL', name, 'produced a non-finite number (a numerical failure)');
      }
    }
  } else if (typeof result === 'number' && result - result !== 0) fail('NUMERICAL', name, 'produced a non-finite number (a numerical failure)');
  return result;
}

/** A core error with its argument renamed (e.g. "x" → "known_xs"), keeping code and requirement text. */
function renamed(e: unknown, names: ReadonlyMap<string, string>): unknown {
  if (!isRatchetError(e)) return e;
  const to = names.get(e.argument);
  if (to === undefined) return e;
  const requirement = e.message.startsWith(`${e.argument}: `) ? e.message.slice(e.argument.length + 2) : e.message;
  return new RatchetError(e.code, to, requirement);
}

/**
 * Turns a spec into the function hosts call. O(params) once; per call O(1) plus the reading the
 * implementation asks for and an O(cells) finiteness check of the result.
 *
 * @param spec the function: name, description, named parameters, returnsArray, longWork, run.
 * @returns a frozen {@link SheetFunction} whose `invoke` takes arguments by position.
 * @throws Error at definition time for a malformed spec (duplicate parameter names, a required
 *   parameter after an optional one, a choice without choices or default). `invoke` throws
 *   RatchetError BAD_OPTION (`#VALUE!`) for more arguments than parameters (an omitted required
 *   argument is reported by its own reader), and whatever `run` throws, with
 *   core argument names renamed; NUMERICAL when the result holds a non-finite number.
 * @example defineFunction({ name: 'TWICE', description: 'Twice x.', returnsArray: false,
 *   params: [{ name: 'x', kind: 'number', optional: false, description: 'A number.' }],
 *   run: (a) => 2 * (a.number('x') ?? 0) }).invoke([21]) // → 42
 */
export function defineFunction<const N extends string>(spec: FunctionSpec<N>): SheetFunction {
  const slots = new Map<string, Slot>();
  const core = new Map<string, string>();
  let optionalSeen = false;
  spec.params.forEach((p, i) => {
    if (slots.has(p.name)) throw new Error(`${spec.name}: parameter ${p.name} declared twice`);
    if (optionalSeen && !p.optional) throw new Error(`${spec.name}: required parameter ${p.name} after an optional one`);
    optionalSeen ||= p.optional;
    slots.set(p.name, slotOf(p, i));
    if (p.coreName !== undefined) core.set(p.coreName, p.name);
  });
  const arity = spec.params.length;
  const fullName = `${NAMESPACE}.${spec.name}`;
  const invoke = (args: readonly CellArg[], context?: InvokeContext): CellResult => {
    if (args.length > arity) fail('BAD_OPTION', fullName, `takes at most ${arity} arguments; got ${args.length}`);
    let result: CellResult;
    try {
      result = spec.run(new Args<N>(slots, args, context?.addresses), context);
    } catch (e) {
      throw renamed(e, core);
    }
    return finite(spec.name, result);
  };
  return Object.freeze({
    name: spec.name,
    description: spec.description,
    params: Object.freeze(spec.params.slice()),
    returnsArray: spec.returnsArray,
    helpUrl: helpUrlOf(spec.name),
    longWork: spec.longWork ?? false,
    invoke,
  });
}
