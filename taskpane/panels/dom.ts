/**
 * Small DOM helpers shared by the task pane's panels: element lookup, number formatting for
 * tables, and the text of an error as the pane shows it.
 */
import { MappedCellError } from '../../src/adapter/errors.js';
import { isRatchetError } from '../../src/core/index.js';
import { CellFailure } from '../analysis.js';
import { DEFAULT_DIGITS, formatNumber } from '../../src/view/number-format.js';

/** The element with this id. @throws Error when the page lacks it (a broken page). */
export function el<T extends HTMLElement>(id: string): T {
  const e = document.getElementById(id);
  if (!e) throw new Error(`missing element #${id}`);
  return e as T;
}

let digits = DEFAULT_DIGITS;

/** Significant digits the pane shows now (the "Digits shown" control; default 4). */
export function shownDigits(): number {
  return digits;
}

/** Sets the digits shown (1 … 17); the caller redraws. @throws RangeError outside 1 … 17. */
export function setShownDigits(d: number): void {
  formatNumber(0, d);
  digits = d;
}

/** A value as the pane shows it: numbers to the digits shown (formatNumber), other values as text. */
export function fmt(v: number | string | boolean): string {
  return formatNumber(v, digits);
}

/**
 * Shows (or clears, with undefined) the message of a field: in the element `${id}-msg` beside it,
 * with `aria-invalid` on the field for an error. A warning leaves the field valid.
 */
export function fieldMessage(id: string, text: string | undefined, kind: 'error' | 'warning' = 'error'): void {
  const f = el<HTMLElement>(id);
  const m = el<HTMLElement>(`${id}-msg`);
  m.textContent = text ?? '';
  m.classList.toggle('error', text !== undefined && kind === 'error');
  m.classList.toggle('warning', text !== undefined && kind === 'warning');
  if (text !== undefined && kind === 'error') f.setAttribute('aria-invalid', 'true');
  else f.removeAttribute('aria-invalid');
}

/** What the pane shows for an error: the cell error code and message where there is one. */
export function errorText(e: unknown): string {
  if (e instanceof CellFailure) return `${e.code} ${e.message}`;
  if (e instanceof MappedCellError) return `${e.mapped.code} ${e.mapped.message}`;
  if (isRatchetError(e)) return e.message;
  return e instanceof Error ? e.message : String(e);
}

/** Sets a status line's text and its error styling. */
export function setStatus(id: string, text: string, error = false): void {
  const s = el<HTMLDivElement>(id);
  s.textContent = text;
  s.classList.toggle('error', error);
}
