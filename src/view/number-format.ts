/**
 * How the task pane and the demo pictures show numbers: a fixed count of significant digits
 * (4 by default, chosen with the pane's "Digits shown" control). Only what is displayed is
 * rounded: CSV downloads, inserted formulas and the numbers behind every table keep full
 * precision. DOM-free.
 */

/** Digits shown when nothing else is chosen. */
export const DEFAULT_DIGITS = 4;

/** The choices of the pane's "Digits shown" control; 17 is enough to round-trip any double. */
export const DIGIT_CHOICES: readonly number[] = Object.freeze([3, 4, 6, 8, 17]);

/**
 * A number rounded to `digits` significant digits, as short as it can be written: no trailing
 * zeros, plain notation from 1e-6 up to 1e21 (JavaScript's `String` rule for the rounded value),
 * exponent notation outside. Whole numbers of up to `digits` digits are shown exactly; longer
 * whole numbers are rounded like any other (123456 → "123500" at 4 digits). Non-numbers are
 * shown as text; NaN and ±Infinity as "NaN", "Infinity", "-Infinity". Negative zero shows as "0".
 * A value that rounds up past the largest double keeps its exponent form (1.795e308 → "1.8e+308").
 * Cost: O(1).
 * @param v the value.
 * @param digits significant digits, a whole number 1 … 17; default {@link DEFAULT_DIGITS}.
 * @throws RangeError when `digits` is not a whole number in 1 … 17.
 * @example formatNumber(0.89305718) // → "0.8931"
 * @example formatNumber(28.679391, 6) // → "28.6794"
 */
export function formatNumber(v: number | string | boolean, digits: number = DEFAULT_DIGITS): string {
  if (!Number.isInteger(digits) || digits < 1 || digits > 17) throw new RangeError(`digits: needs a whole number from 1 to 17; got ${digits}`);
  if (typeof v !== 'number') return String(v);
  if (!Number.isFinite(v)) return String(v);
  if (v === 0) return '0';
  const text = v.toPrecision(digits);
  const rounded = Number(text);
  // Rounding up next to the largest double (1.795e308 at 3 digits) overflows: keep the text.
  if (!Number.isFinite(rounded)) return text.replace(/\.?0+e/, 'e');
  return String(rounded);
}
