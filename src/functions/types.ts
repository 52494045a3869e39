/**
 * Host-neutral shapes of worksheet function arguments and results. The Excel entry points
 * (src/functions/functions.ts) and the headless runner both convert their host's values to these
 * shapes and call the same implementations through the registry.
 */

/** A plain cell value as a host passes it: number, text, logical, or blank (null). */
export type CellScalar = number | string | boolean | null;

/** An error cell arriving inside an argument (e.g. a #DIV/0! in a data range). */
export interface CellErrorInput {
  readonly kind: 'error';
  /** The worksheet error code, e.g. "#DIV/0!". */
  readonly code: string;
  readonly message?: string;
}

/** One cell of an argument. */
export type CellValueIn = CellScalar | CellErrorInput;

/** One argument: a scalar, a 2-D range (rows of cells), or undefined when omitted. */
export type CellArg = CellValueIn | CellValueIn[][] | undefined;

/** One cell of a result. Empty string "" stands for a cell left visibly empty. */
export type CellOut = number | string | boolean;

/** A function's result: a scalar or a 2-D array that spills. */
export type CellResult = CellOut | CellOut[][];

/** One parameter of a worksheet function, as users see it. */
export interface ParamSpec {
  readonly name: string;
  readonly optional: boolean;
  readonly description: string;
}

/** A worksheet function: its user-facing description and its one implementation. */
export interface SheetFunction {
  /** Name without the namespace, e.g. "FIT" (users type RATCHET.FIT). */
  readonly name: string;
  readonly description: string;
  readonly params: readonly ParamSpec[];
  /** True when the result is a 2-D array that spills. */
  readonly returnsArray: boolean;
  /** Absolute URL of the function's section in the README (also in functions.json). */
  readonly helpUrl?: string;
  /** True for long work that hosts should run off their main thread and may cancel (CV, BESTK). */
  readonly longWork?: boolean;
  /**
   * Computes the result. Throws on any problem; hosts turn what it throws into a cell error
   * through the one mapping in src/adapter/errors.ts `mapError` (never anywhere else).
   * Argument arrays must not be mutated after they are passed: parsing is memoised by identity,
   * so a host that passes the same array objects to many calls reads them once.
   * `context` carries an optional AbortSignal and progress callback for long work.
   */
  invoke(args: readonly CellArg[], context?: InvokeContext): CellResult;
}

/** Optional context of a call: cancellation and progress (used by CV and BESTK). */
export interface InvokeContext {
  readonly signal?: AbortSignal | undefined;
  readonly onProgress?: ((fraction: number) => void) | undefined;
}
