/**
 * Host-neutral shapes of worksheet function arguments and results. The Excel entry points
 * (src/functions/functions.ts), the worker, the headless runner and the task pane all convert their
 * host's values to these shapes and call the same implementations through the registry.
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

/**
 * An error in one cell of a result (e.g. a read-back limit the band does not reach: `#N/A` in that
 * cell only, the rest of the result stays readable). `code` is a worksheet error code the hosts can
 * return ('#VALUE!', '#N/A', '#NUM!', '#DIV/0!', '#NULL!'), `message` what the cell needs.
 */
export interface CellErrorOut {
  readonly kind: 'error';
  readonly code: '#VALUE!' | '#N/A' | '#NUM!' | '#DIV/0!' | '#NULL!';
  readonly message: string;
}

/** One cell of a result. Empty string "" stands for a cell left visibly empty. */
export type CellOut = number | string | boolean | CellErrorOut;

/** A function's result: a scalar or a 2-D array that spills. */
export type CellResult = CellOut | CellOut[][];
