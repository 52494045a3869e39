/**
 * `npm run sheet -- <workbook.xlsx> --freeze <frozen.xlsx>`: a copy of an evaluated workbook in
 * which every formula that calls the add-in is replaced by its current values, plus a note sheet
 * listing each replaced cell, its formula and the date — a workbook for colleagues without the
 * add-in. The plan (which cells, which values, the note) is src/adapter/freeze-plan.ts, shared
 * with the task pane; this module applies it to an exceljs copy.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { freezePlan, type FreezePlan, type FrozenValue, type LiveFormula } from '../adapter/freeze-plan.js';
import { parseCellRef, qualifiedName } from './address.js';
import { markDynamicArrays } from './dynamic-arrays.js';
import { writeOutputSafely } from './safe-write.js';
import { quoteSheet, type EvaluatedWorkbook, type JsonCell } from './workbook.js';

/** Error codes a workbook file can hold (Excel 2007 and the dynamic-array versions). */
const FILE_ERRORS = new Set(['#NULL!', '#DIV/0!', '#VALUE!', '#REF!', '#NAME?', '#NUM!', '#N/A', '#SPILL!', '#CALC!', '#GETTING_DATA', '#BUSY!']);

/**
 * A runner value as a frozen value: error codes become error values; the engine's own codes that
 * no workbook file holds (#CYCLE!, #ERROR!) become #VALUE!, and their cell is added to `odd`.
 */
function frozenOf(v: JsonCell, odd: string[], at: string): FrozenValue {
  if (typeof v !== 'string' || !/^#[A-Z/0-9_]+[!?A]$/.test(v)) return v;
  if (FILE_ERRORS.has(v)) return { error: v };
  odd.push(at);
  return { error: '#VALUE!' };
}

/** What a freeze did. */
export interface FreezeSummary {
  readonly replaced: number;
  readonly noteSheet: string;
  /** Cells frozen as an error that is not an answer (#SPILL!, #CALC!, #NAME?, or an engine-only error written as #VALUE!). */
  readonly unresolved: readonly string[];
}

/**
 * Writes a frozen copy of `book` to `path`: the copy `writeCopy` would write (current inputs,
 * computed values), then every cell of every add-in result overwritten by its value and the note
 * sheet added (see `freezePlan`). Remaining array formulas keep their dynamic-array mark. The
 * source file is not touched. Cost: writing the copy twice (O(size of the workbook)).
 * @param book an evaluated workbook. @param path the file to write (.xlsx).
 * @param date the date shown on the note sheet; default now.
 * @param safety files the copy must never replace (`inputs`, default none) and whether an existing
 * file may be replaced (`force`, default false); see safe-write.ts.
 * @throws OutputRefusedError when `path` is one of `inputs` (any name or link) or exists without `force`.
 * @returns the number of formulas replaced, the note sheet's name and the unresolved cells.
 * @example await writeFrozenCopy(book, 'kiln-frozen.xlsx') // → { replaced: 12, noteSheet: 'Frozen values', unresolved: [] }
 */
export async function writeFrozenCopy(
  book: EvaluatedWorkbook,
  path: string,
  date: Date = new Date(),
  safety: { inputs?: readonly string[]; force?: boolean } = {},
): Promise<FreezeSummary> {
  const dir = mkdtempSync(join(tmpdir(), 'ratchet-freeze-'));
  let bytes: Buffer;
  try {
    const copy = join(dir, 'copy.xlsx');
    await book.writeCopy(copy);
    bytes = readFileSync(copy);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(bytes as unknown as ArrayBuffer);
  const odd: string[] = [];
  const cells: LiveFormula[] = book.results().map((r) => {
    const a = parseCellRef(`${quoteSheet(r.sheet)}!${r.cell}`);
    return {
      sheet: r.sheet,
      row: a.row + 1,
      col: a.col + 1,
      formula: r.formula,
      values: r.values.map((row, i) => row.map((v, j) => frozenOf(v, odd, qualifiedName(r.sheet, a.row + i, a.col + j)))),
    };
  });
  const plan: FreezePlan = freezePlan(cells, { date, sheets: wb.worksheets.map((w) => w.name) });
  for (const w of plan.writes) {
    const cell = wb.getWorksheet(w.sheet)!.getCell(w.row, w.col);
    cell.value = (w.value !== null && typeof w.value === 'object' ? { error: w.value.error } : w.value) as ExcelJS.CellValue;
  }
  const note = wb.addWorksheet(plan.noteSheet);
  for (const row of plan.noteRows) note.addRow([...row]);
  note.getColumn(3).width = 60;
  note.getColumn(4).width = 22;
  const { bytes: marked } = await markDynamicArrays(new Uint8Array((await wb.xlsx.writeBuffer()) as ArrayBuffer));
  writeOutputSafely(path, marked, safety.inputs ?? [], safety.force ?? false);
  return { replaced: plan.replaced, noteSheet: plan.noteSheet, unresolved: [...plan.unresolved, ...odd] };
}
