/**
 * The one mapping from what a worksheet function throws to the cell error a host shows.
 *
 * Policy (documented for users in README.md, "Errors"):
 * - every argument problem (a {@link RatchetError} with any code except the three below) → `#VALUE!`
 *   with the error's message, which names the argument and what it needs;
 * - `NOT_REACHABLE` (INVERT target outside the curve's range) → `#N/A` with its message;
 * - `CANCELLED` → `#N/A` "calculation cancelled" (Excel discards a cancelled result anyway);
 * - `NUMERICAL` (a fit that cannot be computed to tolerance, e.g. a knot fit whose normal equations
 *   are too ill-conditioned; see docs/tolerances.md) → `#NUM!` with its message;
 * - an error cell inside a data argument ({@link InputCellError}) → that same error code when a
 *   custom function may return it (`#DIV/0!`, `#N/A`, `#NUM!`, `#NULL!`, `#VALUE!`); codes Excel
 *   does not accept as a custom-function result (`#REF!`, `#NAME?`, `#SPILL!`, `#CALC!`, …) become
 *   `#VALUE!` with a message naming the argument, the cell and its error;
 * - anything else is an internal failure → `#NUM!` with message "internal failure: …" (the fuzz
 *   tests assert this never happens).
 * Only `#VALUE!` and `#N/A` carry messages in Excel; the message is kept for the other codes too so
 * the headless runner can print it.
 */
import { RatchetError, isRatchetError } from '../core/index.js';

/** Error codes a Ratchet function can return to a cell. */
export type CellErrorCode = '#VALUE!' | '#N/A' | '#NUM!' | '#DIV/0!' | '#NULL!';

/** A mapped error: the code a host shows and the message (empty when the host cannot show one). */
export interface MappedError {
  readonly code: CellErrorCode;
  readonly message: string;
}

/** Error codes that Excel accepts as a custom function's result, besides #VALUE! and #N/A. */
const RETURNABLE: ReadonlySet<string> = new Set(['#VALUE!', '#N/A', '#NUM!', '#DIV/0!', '#NULL!']);

/**
 * Thrown when a data argument holds an error cell; it propagates as that error. `argument` is the
 * parameter name, `where` a 1-based position ("cell 3" or "row 2, column 1").
 */
export class InputCellError extends Error {
  readonly code: string;
  readonly argument: string;
  constructor(code: string, argument: string, where: string) {
    super(`${argument}: ${where} holds the error ${code}.`);
    this.name = 'InputCellError';
    this.code = code;
    this.argument = argument;
  }
}

/**
 * Maps anything a worksheet function throws to the cell error to show. Total: never throws.
 * Cost O(1).
 * @example mapError(new RatchetError('BAD_KNOTS', 'knots', 'needs a whole number of knots ≥ 2; got 1'))
 *   // → { code: '#VALUE!', message: 'knots: needs a whole number of knots ≥ 2; got 1.' }
 */
/**
 * A number as messages show it: at most 6 significant digits (`27.694`, `1.5e+200`, `0.333333`).
 * O(1).
 * @example formatNumber(27.693950453842106) // → '27.694'
 */
export function formatNumber(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  return String(Number(v.toPrecision(6)));
}

/**
 * A message with every number of more than 6 significant digits rounded by {@link formatNumber}
 * (`[27.693950453842106, 149.79140378405756]` → `[27.694, 149.791]`); text inside double quotes
 * (a cell's own text) is left as it is. O(length).
 * @example roundNumbersIn('target_ys: needs a value in [27.693950453842106, 149.79140378405756].') // → 'target_ys: needs a value in [27.694, 149.791].'
 */
export function roundNumbersIn(message: string): string {
  return message
    .split(/("[^"]*")/)
    .map((part, i) => (i % 2 === 1 ? part : part.replace(/-?\d+\.\d+(?:e[-+]?\d+)?/gi, (m) => (m.replace(/[^0-9]/g, '').replace(/^0+/, '').length > 6 ? formatNumber(Number(m)) : m))))
    .join('');
}

export function mapError(e: unknown): MappedError {
  if (e instanceof MappedCellError) return e.mapped;
  if (e instanceof InputCellError) {
    if (RETURNABLE.has(e.code)) return { code: e.code as CellErrorCode, message: e.message };
    return { code: '#VALUE!', message: e.message };
  }
  if (isRatchetError(e)) {
    switch (e.code) {
      case 'NOT_REACHABLE':
        return { code: '#N/A', message: roundNumbersIn(e.message) };
      case 'CANCELLED':
        return { code: '#N/A', message: 'calculation cancelled.' };
      case 'NUMERICAL':
        return { code: '#NUM!', message: roundNumbersIn(e.message) };
      default:
        return { code: '#VALUE!', message: roundNumbersIn(e.message) };
    }
  }
  const text = e instanceof Error ? e.message : String(e);
  return { code: '#NUM!', message: `internal failure: ${text}` };
}

/** True when `e` is one of the two kinds of error the functions throw on purpose. */
export function isExpectedError(e: unknown): e is RatchetError | InputCellError {
  return e instanceof RatchetError || e instanceof InputCellError;
}

/**
 * An error already mapped elsewhere (in the worker, by {@link mapError}) and carried across a
 * message boundary; {@link mapError} passes it through unchanged.
 */
export class MappedCellError extends Error {
  readonly mapped: MappedError;
  constructor(mapped: MappedError) {
    super(mapped.message);
    this.name = 'MappedCellError';
    this.mapped = mapped;
  }
}
