/**
 * Typed errors of the Ratchet core.
 *
 * Every problem the core detects is thrown as a {@link RatchetError} with a stable
 * machine-readable `code`, the name of the offending `argument`, and a message of one
 * fixed shape: `"<argument>: <what it needs>[; <what it got>]."` — lower case after the
 * colon, one sentence, ending with a full stop. Callers (the worksheet adapter, the
 * task pane) map codes to their own presentation in exactly one place.
 */

/** Stable error codes. Never renamed once released; new codes may be added. */
export type ErrorCode =
  /** An input holds no usable rows. */
  | 'EMPTY_INPUT'
  /** Fewer usable rows, or fewer distinct x values, than the method needs. */
  | 'TOO_FEW_POINTS'
  /** Two inputs that must pair up row by row have different lengths. */
  | 'LENGTH_MISMATCH'
  /** A NaN or ±Infinity where a finite number is required. */
  | 'NON_FINITE'
  /** A weight that is negative or non-finite, or all weights zero. */
  | 'BAD_WEIGHT'
  /** An option outside its documented range or set. */
  | 'BAD_OPTION'
  /** A knot count or knot positions that cannot define a model. */
  | 'BAD_KNOTS'
  /** Lower bound above upper bound, or a non-finite bound. */
  | 'BAD_BOUNDS'
  /** A target value the fitted curve never reaches. */
  | 'NOT_REACHABLE'
  /** Work stopped through an AbortSignal. */
  | 'CANCELLED'
  /**
   * A result that cannot be computed to tolerance (a knot fit whose normal equations lose more than
   * about 6 digits; see docs/tolerances.md), or an internal numerical failure (should not happen).
   */
  | 'NUMERICAL';

/** The one error type thrown by `src/core`. */
export class RatchetError extends Error {
  /** Stable code, see {@link ErrorCode}. */
  readonly code: ErrorCode;
  /** Name of the argument at fault, as the caller knows it (e.g. `"weights"`). */
  readonly argument: string;

  constructor(code: ErrorCode, argument: string, requirement: string) {
    super(`${argument}: ${requirement}${requirement.endsWith('.') ? '' : '.'}`);
    this.name = 'RatchetError';
    this.code = code;
    this.argument = argument;
  }
}

/** Throws a {@link RatchetError}; typed `never` so TypeScript narrows after it. */
export function fail(code: ErrorCode, argument: string, requirement: string): never {
  throw new RatchetError(code, argument, requirement);
}

/** True when `e` is a {@link RatchetError} (optionally with the given code). */
export function isRatchetError(e: unknown, code?: ErrorCode): e is RatchetError {
  return e instanceof RatchetError && (code === undefined || e.code === code);
}
