/**
 * The shape of a worksheet function as every host sees it: its named parameters and its one
 * `invoke`. A function is written once as a {@link FunctionSpec} (src/functions/define.ts turns it
 * into a {@link SheetFunction}); the Excel JSDoc check, the runner plugin, the worker, the help page
 * and the error messages all read the same spec. The cell shapes live in the adapter
 * (src/adapter/cell-types.ts) and are re-exported here for hosts.
 */
import type { CellArg, CellResult } from '../adapter/cell-types.js';

export type { CellScalar, CellErrorInput, CellErrorOut, CellValueIn, CellArg, CellOut, CellResult } from '../adapter/cell-types.js';

/**
 * How an argument is read (src/functions/define.ts, `Args`):
 * - `data`: a single column or row of numbers; blanks leave their row out (see src/adapter/rows.ts);
 * - `cells`: a cell or a range of any shape of numbers; blanks stay blank in the result;
 * - `table`: a range of any shape that the implementation reads as a table (e.g. a knot table);
 * - `knots`: omitted/0 (classic fit), a whole number ≥ 2 (a knot count), or a range of positions;
 * - `list`: a number or a range of numbers, blanks skipped (e.g. candidate knot counts);
 * - `choice`: one of the listed codes (`choices`);
 * - `number`: one number (the core checks its range at its public boundary).
 */
export type ParamKind = 'data' | 'cells' | 'table' | 'knots' | 'list' | 'choice' | 'number';

/** One allowed value of a `choice` parameter: the number users type, what it means to the core, and its label. */
export interface Choice {
  readonly code: number;
  readonly value: string;
  /** Words shown in messages: "1 (rising)". */
  readonly label: string;
}

/** One named parameter of a worksheet function. */
export interface ParamSpec<N extends string = string> {
  /** The name users see (Excel's argument tooltip, JSDoc `@param`, messages): `known_ys`. */
  readonly name: N;
  readonly kind: ParamKind;
  /** True when the argument may be omitted (shown as `[name]`). */
  readonly optional: boolean;
  /** What an omitted argument means, in users' words (`"1"`, `"5"`, `"every distinct x"`); a `choice` default is one of its values. */
  readonly default?: string;
  /** Allowed values, in users' words (`"2 to the number of rows"`); the core enforces them. */
  readonly range?: string;
  /** Allowed codes of a `choice` parameter, in the order messages list them. */
  readonly choices?: readonly Choice[];
  /** Name of this argument in core errors (`x` for known_xs), renamed to `name` in messages. */
  readonly coreName?: string;
  /** Help text (Excel's argument description and the JSDoc `@param` text). */
  readonly description: string;
}

/** Optional context of a call: cancellation and progress (used by CV and BESTK), and where the arguments come from. */
export interface InvokeContext {
  readonly signal?: AbortSignal | undefined;
  readonly onProgress?: ((fraction: number) => void) | undefined;
  /**
   * Per argument position, the worksheet address of an argument that is a reference
   * (`Data!B2:B40`, `'Kiln data'!$B:$B`); undefined, null or "" for one given directly (a constant,
   * an array constant, another formula's result). A data argument with an address leaves its text
   * and logical cells out (README.md, "How cells are read"); messages name cells by address.
   * Excel passes `invocation.parameterAddresses`, the runner the ranges it evaluated.
   */
  readonly addresses?: readonly (string | null | undefined)[] | undefined;
}

/** A worksheet function as hosts call it: derived from a spec by src/functions/define.ts. */
export interface SheetFunction {
  /** Name without the namespace, e.g. "FIT" (users type RATCHET.FIT). */
  readonly name: string;
  readonly description: string;
  readonly params: readonly ParamSpec[];
  /** True when the result is a 2-D array that spills. */
  readonly returnsArray: boolean;
  /** Absolute URL of the function's section in the README (also in functions.json). */
  readonly helpUrl: string;
  /** True for long work that hosts should run off their main thread and may cancel (CV, BESTK). */
  readonly longWork: boolean;
  /**
   * Computes the result from the arguments in the order users type them (missing trailing
   * arguments may be left out). Throws on any problem; hosts turn what it throws into a cell
   * error through the one mapping in src/adapter/errors.ts `mapError` (never anywhere else).
   * Arguments are remembered by content only (src/adapter/cells.ts), so a host may reuse or
   * mutate its arrays between calls. `context` carries an optional AbortSignal and progress
   * callback for long work, and the addresses of reference arguments.
   */
  invoke(args: readonly CellArg[], context?: InvokeContext): CellResult;
}
