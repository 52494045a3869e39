/** Test helpers: build small workbooks in memory and evaluate them through the runner. */
import ExcelJS from 'exceljs';
import '../../src/runner/ratchet.js';
import { EvaluatedWorkbook, type JsonCell } from '../../src/runner/workbook.js';

/** A cell in a setup: a value, or a formula as { f: 'RATCHET.FIT(…)' } (typed or stored form). */
export type SetupCell = number | string | boolean | null | { f: string; array?: string };

/** Sheets → cells ("A1" → value). */
export type Setup = Record<string, Record<string, SetupCell>>;

/** An exceljs workbook holding the setup. */
export function excelOf(setup: Setup): ExcelJS.Workbook {
  const wb = new ExcelJS.Workbook();
  for (const [name, cells] of Object.entries(setup)) {
    const ws = wb.addWorksheet(name);
    for (const [addr, v] of Object.entries(cells)) {
      if (v !== null && typeof v === 'object') {
        ws.getCell(addr).value = (v.array ? { formula: v.f, shareType: 'array', ref: v.array } : { formula: v.f }) as ExcelJS.CellFormulaValue;
      } else ws.getCell(addr).value = v;
    }
  }
  return wb;
}

/** Evaluates the setup through the runner. */
export function evaluate(setup: Setup): EvaluatedWorkbook {
  return EvaluatedWorkbook.fromExcel(excelOf(setup));
}

/** Checks a block of runner values against expected values: numbers to `rel`, everything else exactly. */
export function closeBlock(got: readonly (readonly JsonCell[])[], want: readonly (readonly (number | string | boolean | null)[])[], rel = 1e-12): string | undefined {
  if (got.length !== want.length) return `rows: got ${got.length}, want ${want.length}: ${JSON.stringify(got)}`;
  for (let r = 0; r < want.length; r++) {
    if (got[r]!.length !== want[r]!.length) return `row ${r + 1} columns: got ${got[r]!.length}, want ${want[r]!.length}`;
    for (let c = 0; c < want[r]!.length; c++) {
      const a = got[r]![c]!;
      const e = want[r]![c]!;
      if (typeof e === 'number') {
        if (typeof a !== 'number' || !(Math.abs(a - e) <= Math.max(rel * Math.abs(e), rel))) return `[${r + 1},${c + 1}]: got ${JSON.stringify(a)}, want ${e}`;
      } else if (a !== e) return `[${r + 1},${c + 1}]: got ${JSON.stringify(a)}, want ${JSON.stringify(e)}`;
    }
  }
  return undefined;
}
