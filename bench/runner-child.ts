/**
 * Child process of the runner benchmark, so that each size is measured in a fresh Node process
 * (its peak memory its own, no garbage of the previous size).
 * - `tsx bench/runner-child.ts write <n> <file>` writes the scale workbook of n rows (see
 *   {@link scaleWorkbook}) to an .xlsx file.
 * - `tsx bench/runner-child.ts read <file>` evaluates that file as `npm run sheet` does
 *   (EvaluatedWorkbook.fromFile) and prints one JSON line: the read and evaluate times (ms), the
 *   rows of FIT's result, the RATCHET calls made and the peak resident memory (MB).
 */
import ExcelJS from 'exceljs';
import { risingData } from './harness.js';
import '../src/runner/ratchet.js';
import { EvaluatedWorkbook } from '../src/runner/workbook.js';

/**
 * A workbook of `n` data rows (x in A, y in B, from row 1) read only by spilling RATCHET formulas:
 * FIT (n rows), KNOTS with 8 knots, STATS, and PREDICT at 1,000 new x (N1:N1000).
 */
export function scaleWorkbook(n: number): ExcelJS.Workbook {
  const { x, y } = risingData(n);
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Data');
  for (let i = 0; i < n; i++) {
    const row = ws.getRow(i + 1);
    row.getCell(1).value = x[i]!;
    row.getCell(2).value = y[i]!;
  }
  for (let i = 0; i < 1000; i++) ws.getCell(i + 1, 14).value = (100 * i) / 1000;
  const Y = `B1:B${n}`;
  const X = `A1:A${n}`;
  const f = (a: string, formula: string) => (ws.getCell(a).value = { formula } as ExcelJS.CellFormulaValue);
  f('D1', `_xldudf_RATCHET_FIT(${Y},${X})`);
  f('F1', `_xldudf_RATCHET_KNOTS(${Y},${X},8)`);
  f('I1', `_xldudf_RATCHET_STATS(${Y},${X})`);
  f('O1', `_xldudf_RATCHET_PREDICT(N1:N1000,${Y},${X},8)`);
  return wb;
}

const [mode, a, b] = process.argv.slice(2);
if (mode === 'write') {
  await scaleWorkbook(Number(a)).xlsx.writeFile(b!);
} else if (mode === 'read') {
  const book = await EvaluatedWorkbook.fromFile(a!);
  const { readMs, evaluateMs } = book.timings;
  const fitRows = book.result('Data!D1').length;
  console.log(JSON.stringify({ readMs, evaluateMs, fitRows, ratchetCalls: book.ratchetCalls, maxRssMB: Math.round(process.resourceUsage().maxRSS / 1024) }));
}
