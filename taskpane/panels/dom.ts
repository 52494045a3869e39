/**
 * Small DOM helpers shared by the task pane's panels: element lookup, number formatting for
 * tables, and the text of an error as the pane shows it.
 */
import { MappedCellError } from '../../src/adapter/errors.js';
import { isRatchetError } from '../../src/core/index.js';
import { CellFailure } from '../analysis.js';

/** The element with this id. @throws Error when the page lacks it (a broken page). */
export function el<T extends HTMLElement>(id: string): T {
  const e = document.getElementById(id);
  if (!e) throw new Error(`missing element #${id}`);
  return e as T;
}

/** A cell value for a table: whole numbers as they are, others to 8 significant digits. */
export function fmt(v: number | string | boolean): string {
  if (typeof v !== 'number') return String(v);
  if (Number.isInteger(v)) return String(v);
  return String(Number(v.toPrecision(8)));
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
