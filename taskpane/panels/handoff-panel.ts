/**
 * Excel-mode actions that hand a workbook on: "Insert all" (the pane's formulas laid out so that
 * no result collides, layout.ts), "Portable curve" (the knot table as values with plain INDEX/MATCH
 * formulas beside it that predict without the add-in, src/adapter/portable-curve.ts) and "Frozen
 * values" (every RATCHET formula of the open workbook replaced by the values it shows, with a
 * note sheet, src/adapter/freeze-plan.ts).
 *
 * Office.js cannot make a copy of the open workbook, so "Frozen values" works on the workbook
 * itself, and only after the user confirmed a list of every formula it will replace (the
 * confirmation says to save a copy first, with Save As). The runner's `--freeze` writes a frozen
 * copy and leaves the original alone.
 *
 * Every write goes through the one overwrite guard of the pane (`insertFormula` in insert.ts): it
 * checks the whole area, asks before writing over anything and refuses to cover the data ranges.
 */
/// <reference types="office-js" />
import { insertFormula, type Confirm, type ExcelLike, type InsertOutcome } from '../insert.js';
import { parseAddress, plainRef, type Area } from '../refs.js';
import type { BlockLayout } from '../layout.js';
import { portableCurveBlock, type PortableCell } from '../../src/adapter/portable-curve.js';
import { callsAddIn, freezePlan, type FrozenValue, type LiveFormula } from '../../src/adapter/freeze-plan.js';

/** Cells to write at offsets from an anchor: text, numbers, or formulas (text starting with "="). */
interface OffsetCell {
  readonly dr: number;
  readonly dc: number;
  readonly value: string | number;
}

/**
 * Writes `cells` into the rows × cols area whose top-left cell is `target`, after the overwrite
 * guard: `insertFormula` checks the whole area (asks through `confirm` before writing over
 * anything, refuses to cover `inputs`) and writes the cell at offset (0, 0); the others follow in
 * one more batch. Cost: the guard's two round trips plus one.
 * @returns the guard's outcome (`written` false when the user kept the cells).
 * @throws Error from the guard (bad target, off the sheet, overlapping the data).
 */
export async function writeBlock(excel: ExcelLike, target: string, rows: number, cols: number, cells: readonly OffsetCell[], inputs: readonly Area[], confirm: Confirm): Promise<InsertOutcome> {
  const first = cells.find((c) => c.dr === 0 && c.dc === 0);
  const outcome = await insertFormula(excel, { formula: first === undefined ? '' : String(first.value), target, rows, cols, inputs }, confirm);
  if (!outcome.written) return outcome;
  const anchor = parseAddress(target);
  await excel.run(async (context) => {
    const sheet = anchor.sheet === undefined ? context.workbook.worksheets.getActiveWorksheet() : context.workbook.worksheets.getItem(anchor.sheet);
    for (const c of cells) {
      if (c === first) continue;
      const r = anchor.r1 + c.dr;
      const k = anchor.c1 + c.dc;
      sheet.getRange(plainRef({ sheet: undefined, r1: r, r2: r, c1: k, c2: k })).formulas = [[c.value]];
    }
    await context.sync();
  });
  return outcome;
}

/**
 * "Insert all": writes the laid-out block (labels and formulas) at `target`.
 * @example insertAll(Excel, layout, 'Trials!H2', [xArea, yArea], confirm) // → { written: true, area: 'Trials!H2:N40', … }
 */
export function insertAll(excel: ExcelLike, layout: BlockLayout, target: string, inputs: readonly Area[], confirm: Confirm): Promise<InsertOutcome> {
  return writeBlock(excel, target, layout.rows, layout.cols, layout.writes, inputs, confirm);
}

/** "new x" rows the portable curve prepares below its header. */
export const PORTABLE_NEW_X_ROWS = 10;

/**
 * "Portable curve": the knot table as values at `target` (header "knot x", "fitted value"), an
 * empty column, then a "new x" column with, beside each cell, the INDEX/MATCH formula that
 * predicts there (linear between knots, flat beyond the ends) — built-in functions only.
 * The area is (max(K, 10) + 1) rows × 5 columns.
 * @throws RatchetError from portableCurveBlock for a knot table the formulas could not read —
 *   among them a smooth fit's table (rows with a third column 2), which straight lines would not
 *   reproduce; Error from the guard.
 */
export function insertPortableCurve(excel: ExcelLike, knots: readonly (readonly [number, number] | readonly [number, number, number])[], target: string, inputs: readonly Area[], confirm: Confirm): Promise<InsertOutcome> {
  const anchor = parseAddress(target);
  const cells: PortableCell[] = portableCurveBlock(knots, { row: anchor.r1, col: anchor.c1 }, PORTABLE_NEW_X_ROWS);
  const rows = Math.max(knots.length, PORTABLE_NEW_X_ROWS) + 1;
  return writeBlock(excel, target, rows, 5, cells, inputs, confirm);
}

/** An Office.js value as a frozen value: error texts ("#N/A") become error values. */
function frozenOf(v: unknown, type: string | undefined): FrozenValue {
  if (type === 'Error') return { error: String(v) };
  if (v === '' || v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  return String(v);
}

/**
 * What to write into `values` so that Excel stores exactly `v`: an error as its text (`#N/A`,
 * which Excel stores as that error); a text that Excel would read as a number, a date, a formula
 * or an error (`47.6`, `=A1`, `#N/A`) behind an apostrophe, which keeps it text.
 */
export function cellInput(v: FrozenValue): string | number | boolean {
  if (v === null) return '';
  if (typeof v === 'object') return v.error;
  if (typeof v !== 'string') return v;
  return /^\s*[=+\-@#'0-9.,]/.test(v) ? `'${v}` : v;
}

/** What "Frozen values" did. */
export interface FreezeOutcome {
  readonly replaced: number;
  readonly noteSheet: string | undefined;
  readonly message: string;
}

/** How many formulas the confirmation lists by name before "and N more". */
const LISTED = 12;

/**
 * "Frozen values": finds every formula of the open workbook that calls the add-in
 * (`callsAddIn`), lists them in a confirmation, and on "yes" replaces each by the values it shows
 * now (its whole spilled result) and adds a note sheet listing each replaced cell, its formula and
 * the date (`freezePlan`). Nothing changes when the user declines or when there is none.
 * Cost: one pass over the used range of every sheet, one batch of writes.
 */
export async function freezeWorkbook(excel: ExcelLike, confirm: Confirm, now: Date = new Date()): Promise<FreezeOutcome> {
  return excel.run(async (context) => {
    const sheets = context.workbook.worksheets;
    sheets.load('items/name');
    await context.sync();
    const used = sheets.items.map((ws) => {
      const r = ws.getUsedRangeOrNullObject(true);
      r.load(['formulas', 'address', 'isNullObject']);
      return { ws, r };
    });
    await context.sync();
    const anchors: { ws: Excel.Worksheet; row: number; col: number; formula: string; spill: Excel.Range; cell: Excel.Range }[] = [];
    for (const { ws, r } of used) {
      if (r.isNullObject) continue;
      const a = parseAddress(r.address.slice(r.address.lastIndexOf('!') + 1));
      (r.formulas as unknown[][]).forEach((line, i) =>
        line.forEach((f, j) => {
          if (typeof f !== 'string' || !f.startsWith('=') || !callsAddIn(f)) return;
          const row = a.r1 + i;
          const col = a.c1 + j;
          const cell = ws.getRange(plainRef({ sheet: undefined, r1: row, r2: row, c1: col, c2: col }));
          const spill = cell.getSpillingToRangeOrNullObject();
          spill.load(['values', 'valueTypes', 'isNullObject']);
          cell.load(['values', 'valueTypes']);
          anchors.push({ ws, row, col, formula: f, spill, cell });
        }),
      );
    }
    if (anchors.length === 0) return { replaced: 0, noteSheet: undefined, message: 'No cell of this workbook holds a RATCHET formula: nothing to freeze.' };
    await context.sync();
    const live: LiveFormula[] = anchors.map((q) => {
      const src = q.spill.isNullObject ? q.cell : q.spill;
      const types = src.valueTypes as string[][];
      return { sheet: q.ws.name, row: q.row, col: q.col, formula: q.formula, values: (src.values as unknown[][]).map((line, i) => line.map((v, j) => frozenOf(v, types[i]?.[j]))) };
    });
    const plan = freezePlan(live, { date: now, sheets: sheets.items.map((s) => s.name) });
    const listed = plan.noteRows.slice(3);
    const names = listed.slice(0, LISTED).map((r) => `${r[0]}!${r[1]} ${r[2]}`);
    const more = listed.length > LISTED ? `; and ${listed.length - LISTED} more` : '';
    const question =
      `Replace ${plan.replaced} RATCHET formula${plan.replaced === 1 ? '' : 's'} of THIS workbook by the values ${plan.replaced === 1 ? 'it shows' : 'they show'} now, ` +
      `and add the sheet "${plan.noteSheet}" that lists them? Save a copy first (File › Save As) if you want to keep the live formulas: Excel cannot make the copy from the pane. ` +
      `Replaced: ${names.join('; ')}${more}.` +
      (plan.unresolved.length > 0 ? ` ${plan.unresolved.length} cell${plan.unresolved.length === 1 ? '' : 's'} show an error such as #SPILL! or #BUSY! that would be frozen as it is (${plan.unresolved.slice(0, 3).join(', ')}).` : '');
    if (!(await confirm(question))) return { replaced: 0, noteSheet: undefined, message: 'Nothing was frozen: the formulas were kept.' };
    for (const w of plan.writes) {
      const v = w.value;
      const cell = sheets.getItem(w.sheet).getRange(plainRef({ sheet: undefined, r1: w.row, r2: w.row, c1: w.col, c2: w.col }));
      cell.values = [[cellInput(v)]];
    }
    const note = sheets.add(plan.noteSheet);
    const width = Math.max(...plan.noteRows.map((r) => r.length));
    const rows = plan.noteRows.map((r) => Array.from({ length: width }, (_x, i) => r[i] ?? ''));
    note.getRange(plainRef({ sheet: undefined, r1: 1, r2: rows.length, c1: 1, c2: width })).values = rows;
    await context.sync();
    return { replaced: plan.replaced, noteSheet: plan.noteSheet, message: `Froze ${plan.replaced} formula${plan.replaced === 1 ? '' : 's'}: the values stay as they are without the add-in; the sheet "${plan.noteSheet}" lists what was replaced.` };
  });
}
