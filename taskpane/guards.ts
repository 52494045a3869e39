/**
 * The pane's input guards and defaults, DOM-free: which column y starts on, which column choices
 * are refused, and what the knot-count fields accept. Each check returns the message shown at the
 * field that caused it (never a thrown error), so the pane can keep the last good fit on screen
 * while the input is wrong.
 */

/** What the guards need to know about a column of a sheet. */
export interface ColumnInfo {
  readonly name: string;
  /** Number of numeric cells. */
  readonly numbers: number;
}

/**
 * The column y starts on: the column named `preferred` (a sample names its y) when it exists and
 * is neither x nor x2; otherwise the first column with numbers that is neither x nor x2; otherwise
 * the first column that is not x; otherwise x itself (a one-column sheet). Cost O(columns).
 * @param columns the sheet's columns, in order.
 * @param x index of the x column.
 * @param x2 index of the second input, or undefined.
 * @param preferred header of the y column a sample names; optional.
 * @returns an index into `columns` (0 for an empty list).
 * @example defaultY([{ name: 'oven temp °C', numbers: 48 }, { name: 'dwell min', numbers: 48 }, { name: 'hardness', numbers: 48 }], 0, 1) // → 2
 */
export function defaultY(columns: readonly ColumnInfo[], x: number, x2?: number, preferred?: string): number {
  const free = (i: number): boolean => i !== x && i !== x2;
  if (preferred !== undefined) {
    const p = columns.findIndex((c) => c.name === preferred);
    if (p >= 0 && free(p)) return p;
  }
  const numeric = columns.findIndex((c, i) => free(i) && c.numbers > 0);
  if (numeric >= 0) return numeric;
  const other = columns.findIndex((_, i) => i !== x);
  return other >= 0 ? other : Math.min(x, Math.max(columns.length - 1, 0));
}

/**
 * The refusal of a column choice, or undefined when the choice is allowed: y may not be x, and
 * the second input may be neither x nor y (a fit of a column on itself gives r2 = 1 and means
 * nothing). Cost O(1).
 * @param x index of the x column.
 * @param y index of the y column.
 * @param x2 index of the second input, or undefined for none.
 * @param names the columns' headers by index, as the pickers show them.
 * @example columnConflict(0, 0, undefined, ['weeks', 'tack']) // → 'The y column cannot be the x column (both are "weeks"): choose another y.'
 */
export function columnConflict(x: number, y: number, x2: number | undefined, names: readonly string[]): string | undefined {
  const n = (i: number): string => names[i] ?? `column ${i + 1}`;
  if (x === y) return `The y column cannot be the x column (both are "${n(x)}"): choose another y.`;
  if (x2 !== undefined && x2 === x) return `The second input cannot be the x column (both are "${n(x)}"): choose another x2, or none.`;
  if (x2 !== undefined && x2 === y) return `The second input cannot be the y column (both are "${n(y)}"): choose another x2, or none.`;
  return undefined;
}

/** What a knot-count field holds: the count to use, or the message shown at the field. */
export type KnotFieldResult = { readonly ok: true; readonly knots: number } | { readonly ok: false; readonly message: string };

/**
 * Reads a knot-count field the way the pane accepts it: blank → 0 (the classic fit); 0 or a
 * whole number ≥ 2 (at most 100,000). Anything else gets a message that says what the field takes
 * and why (1 knot would be one flat value; a fraction is not a count). Cost O(length).
 * @param text the field's text.
 * @param field the field's label as the message names it; default "Knot count".
 * @example readKnotField('2.5') // → { ok: false, message: 'Knot count: needs 0 (classic fit) or a whole number of knots ≥ 2; 2.5 is not a whole number.' }
 */
export function readKnotField(text: string, field = 'Knot count'): KnotFieldResult {
  const t = text.trim();
  if (t === '') return { ok: true, knots: 0 };
  const v = Number(t);
  const needs = `${field}: needs 0 (classic fit) or a whole number of knots ≥ 2`;
  if (!/^[+]?[0-9]+(\.[0-9]*)?([eE][+]?[0-9]+)?$/.test(t) || !Number.isFinite(v)) return { ok: false, message: `${needs}; got "${t}".` };
  if (!Number.isInteger(v)) return { ok: false, message: `${needs}; ${t} is not a whole number.` };
  if (v === 1) return { ok: false, message: `${needs}; 1 knot would make the curve one flat value — use 0 for the classic fit or 2 or more knots.` };
  if (v > 100000) return { ok: false, message: `${needs} up to 100000; got ${t}.` };
  return { ok: true, knots: v };
}

/**
 * The warning for more knots than distinct x values among the rows used (the knot markers then
 * merge and the extra knots carry no data of their own), or undefined. Cost O(1).
 * @param knots the knot count in use (0 = classic: never warned).
 * @param distinctX number of distinct x values among the rows the fit uses.
 * @example knotCountWarning(500, 39) // → 'Knot count 500 is more than the 39 distinct x values of the rows used: at most 39 knots can each sit on data.'
 */
export function knotCountWarning(knots: number, distinctX: number): string | undefined {
  if (knots <= distinctX || knots === 0) return undefined;
  return `Knot count ${knots} is more than the ${distinctX} distinct x values of the rows used: at most ${distinctX} knots can each sit on data.`;
}
