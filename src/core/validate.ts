/**
 * Boundary checks shared by the core solvers. Each function validates one kind of
 * argument, copies it into a fresh typed array (callers' arrays are never mutated or
 * retained), and throws a {@link RatchetError} naming the argument when it fails.
 */
import { fail } from './errors.js';

/** Anything indexable with numbers: plain arrays, typed arrays, frozen arrays. */
export type NumericInput = ArrayLike<number>;

function describe(v: unknown): string {
  if (typeof v === 'number') return Number.isNaN(v) ? 'NaN' : String(v);
  return typeof v;
}

/**
 * Copies `values` into a new Float64Array after checking every entry is a finite number.
 * Cost O(n). Errors: EMPTY_INPUT when `allowEmpty` is false and there are no values;
 * NON_FINITE naming the first offending (1-based) position.
 */
export function finiteArray(name: string, values: NumericInput, allowEmpty = false): Float64Array {
  if (values === null || values === undefined || typeof values.length !== 'number') {
    fail('BAD_OPTION', name, 'needs a list of numbers');
  }
  const n = values.length;
  if (n === 0 && !allowEmpty) fail('EMPTY_INPUT', name, 'needs at least one value; got none');
  if (values instanceof Float64Array) {
    // Fast path: one block copy, then one pass (v − v is 0 exactly when v is finite).
    const copy = values.slice();
    let acc = 0;
    for (let i = 0; i < n; i++) acc += copy[i]! - copy[i]!;
    if (acc === 0) return copy;
  }
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      fail('NON_FINITE', name, `needs finite numbers; entry ${i + 1} is ${describe(v)}`);
    }
    out[i] = v;
  }
  return out;
}

/**
 * Like {@link finiteArray}, but returns `values` itself (no copy) when it already is a
 * Float64Array of finite numbers. The result must be treated as read-only: the solvers that use
 * it never write into their inputs. Cost O(n) for the check.
 */
export function finiteView(name: string, values: NumericInput, allowEmpty = false): Float64Array {
  if (values instanceof Float64Array && (values.length > 0 || allowEmpty)) {
    let acc = 0;
    for (let i = 0; i < values.length; i++) acc += values[i]! - values[i]!;
    if (acc === 0) return values;
  }
  return finiteArray(name, values, allowEmpty);
}

/** Throws LENGTH_MISMATCH unless `b` has length `n` (the length of `aName`). */
export function sameLength(aName: string, n: number, bName: string, b: NumericInput): void {
  if (b.length !== n) {
    fail('LENGTH_MISMATCH', bName, `needs one value per entry of ${aName} (${n}); got ${b.length}`);
  }
}

/**
 * Validates optional weights for `n` rows: absent means all ones. Weights must be finite
 * and ≥ 0 with a positive total. Cost O(n). Errors: LENGTH_MISMATCH, BAD_WEIGHT.
 */
export function weightArray(n: number, weights: NumericInput | undefined, name = 'weights'): Float64Array {
  const out = new Float64Array(n);
  if (weights === undefined || weights === null) {
    out.fill(1);
    return out;
  }
  sameLength('y', n, name, weights);
  let total = 0;
  for (let i = 0; i < n; i++) {
    const v = weights[i];
    if (typeof v !== 'number' || !Number.isFinite(v) || v < 0) {
      fail('BAD_WEIGHT', name, `needs finite numbers ≥ 0; entry ${i + 1} is ${describe(v)}`);
    }
    out[i] = v;
    total += v;
  }
  if (!(total > 0)) fail('BAD_WEIGHT', name, 'needs at least one positive weight; all are 0');
  return out;
}

/**
 * Validates optional bounds on fitted values. Returns [lower, upper] with −∞/+∞ for
 * absent bounds. Errors: BAD_BOUNDS when a given bound is NaN or lower > upper.
 */
export function boundsPair(lower: number | undefined, upper: number | undefined): [number, number] {
  const lo = lower ?? -Infinity;
  const hi = upper ?? Infinity;
  if (typeof lo !== 'number' || Number.isNaN(lo) || lo === Infinity) {
    fail('BAD_BOUNDS', 'lower', `needs a number below +Infinity; got ${describe(lo)}`);
  }
  if (typeof hi !== 'number' || Number.isNaN(hi) || hi === -Infinity) {
    fail('BAD_BOUNDS', 'upper', `needs a number above -Infinity; got ${describe(hi)}`);
  }
  if (lo > hi) fail('BAD_BOUNDS', 'lower', `needs to be ≤ upper (${hi}); got ${lo}`);
  return [lo, hi];
}
