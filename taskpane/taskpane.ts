/**
 * Minimal task pane of the shared runtime: pick the y and x ranges, fit with the same
 * implementation as RATCHET.STATS, and insert a live STATS formula. The full pane (charts,
 * cross-validation, preview) is built on this page later; it holds no fitting logic of its own.
 */
/// <reference types="office-js" />
import { functionByName } from '../src/functions/registry.js';
import { mapError } from '../src/adapter/errors.js';
import { applyBlankTypes, type ValueTypeName } from '../src/adapter/blanks.js';
import { fromExcelArg } from '../src/adapter/excel.js';
import type { CellArg, CellResult } from '../src/functions/types.js';

function el<T extends HTMLElement>(id: string): T {
  return document.getElementById(id) as T;
}

function say(text: string, error = false): void {
  const s = el<HTMLDivElement>('status');
  s.textContent = text;
  s.className = error ? 'error' : '';
}

/** The formula for the chosen ranges and options (absolute addresses; options only when not default). */
export function statsFormula(ys: string, xs: string, knots: number, direction: number): string {
  const args = [ys, xs];
  if (knots !== 0 || direction !== 1) args.push(String(knots));
  if (direction !== 1) args.push(String(direction));
  return `=RATCHET.STATS(${args.join(', ')})`;
}

/** Renders label/value rows. */
export function renderTable(table: HTMLTableElement, result: CellResult): void {
  table.replaceChildren();
  const rows = Array.isArray(result) ? result : [[result]];
  for (const row of rows) {
    const tr = document.createElement('tr');
    for (const v of row) {
      const td = document.createElement('td');
      td.textContent = typeof v === 'number' ? String(Number(v.toPrecision(8))) : String(v);
      tr.appendChild(td);
    }
    table.appendChild(tr);
  }
}

async function readRange(address: string): Promise<CellArg> {
  return Excel.run(async (context) => {
    const bang = address.lastIndexOf('!');
    const sheet = bang > 0 ? context.workbook.worksheets.getItem(address.slice(0, bang).replace(/^'(.*)'$/, '$1').replace(/''/g, "'")) : context.workbook.worksheets.getActiveWorksheet();
    const range = sheet.getRange(bang > 0 ? address.slice(bang + 1) : address);
    range.load(['values', 'valueTypes']);
    await context.sync();
    return applyBlankTypes(fromExcelArg(range.values), range.valueTypes as ValueTypeName[][]);
  });
}

async function selectionAddress(): Promise<string> {
  return Excel.run(async (context) => {
    const r = context.workbook.getSelectedRange();
    r.load('address');
    await context.sync();
    return r.address;
  });
}

async function fit(): Promise<void> {
  const ys = el<HTMLInputElement>('ys').value.trim();
  const xs = el<HTMLInputElement>('xs').value.trim();
  const knots = Number(el<HTMLInputElement>('knots').value || 0);
  const direction = Number(el<HTMLSelectElement>('direction').value);
  try {
    const [y, x] = await Promise.all([readRange(ys), readRange(xs)]);
    const result = functionByName('STATS')!.invoke([y, x, knots, direction]);
    renderTable(el<HTMLTableElement>('stats'), result);
    say('Fitted.');
  } catch (e) {
    const m = mapError(e);
    say(`${m.code} ${m.message}`, true);
  }
}

async function insert(): Promise<void> {
  const formula = statsFormula(el<HTMLInputElement>('ys').value.trim(), el<HTMLInputElement>('xs').value.trim(), Number(el<HTMLInputElement>('knots').value || 0), Number(el<HTMLSelectElement>('direction').value));
  await Excel.run(async (context) => {
    const cell = context.workbook.getSelectedRange().getCell(0, 0);
    const spill = cell.getResizedRange(8, 1);
    spill.load(['values', 'formulas', 'address']);
    await context.sync();
    const busy = spill.values.some((row) => row.some((v) => v !== '' && v !== null));
    if (busy && !window.confirm(`The cells ${spill.address} are not empty. Overwrite them with the STATS table?`)) return;
    cell.formulas = [[formula]];
    await context.sync();
    say(`Inserted ${formula}`);
  });
}

function wire(): void {
  el<HTMLFormElement>('fit-form').addEventListener('submit', (e) => {
    e.preventDefault();
    void fit();
  });
  el<HTMLButtonElement>('ys-pick').addEventListener('click', () => void selectionAddress().then((a) => (el<HTMLInputElement>('ys').value = a)));
  el<HTMLButtonElement>('xs-pick').addEventListener('click', () => void selectionAddress().then((a) => (el<HTMLInputElement>('xs').value = a)));
  el<HTMLButtonElement>('insert').addEventListener('click', () => void insert().catch((e) => say(String(e), true)));
}

if (typeof Office !== 'undefined') {
  void Office.onReady((info) => {
    el<HTMLParagraphElement>('host').textContent = info.host ? `Running in ${info.host}. Type =RATCHET.FIT(known_ys, known_xs) in a cell, or fit here.` : 'Not running inside Office: open this add-in in Excel.';
    if (info.host) wire();
  });
}
