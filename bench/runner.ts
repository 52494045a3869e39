/**
 * Headless runner: evaluating a workbook in HyperFormula with the RATCHET plugin, and
 * recalculating after one input changes (array results re-sized). Times include the engine.
 */
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import type { BenchRecord } from './harness.js';
import { risingData } from './harness.js';
import '../src/runner/ratchet.js';
import { EvaluatedWorkbook } from '../src/runner/workbook.js';

function workbook(n: number, predicts: number): ExcelJS.Workbook {
  const { x, y } = risingData(n);
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Data');
  for (let i = 0; i < n; i++) {
    ws.getCell(i + 1, 1).value = x[i]!;
    ws.getCell(i + 1, 2).value = y[i]!;
  }
  const Y = `B1:B${n}`;
  const X = `A1:A${n}`;
  const f = (a: string, formula: string) => (ws.getCell(a).value = { formula } as ExcelJS.CellFormulaValue);
  f('D1', `_xldudf_RATCHET_FIT(${Y},${X})`);
  f('E1', `_xldudf_RATCHET_KNOTS(${Y},${X},8)`);
  f('H1', `_xldudf_RATCHET_KNOTS(${Y},${X})`);
  f('K1', `_xldudf_RATCHET_STATS(${Y},${X})`);
  for (let i = 0; i < predicts; i++) {
    ws.getCell(i + 1, 14).value = (100 * i) / predicts;
    f(`O${i + 1}`, `_xldudf_RATCHET_PREDICT(N${i + 1},${Y},${X},8)`);
  }
  return wb;
}

/**
 * A workbook of `n` data rows (x in A, y in B, from row 1) read only by spilling RATCHET formulas:
 * FIT (n rows), KNOTS with 8 knots, STATS, and PREDICT at 1,000 new x (N1:N1000).
 */
function scaleWorkbook(n: number): ExcelJS.Workbook {
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

/** Evaluation time of {@link scaleWorkbook} at two sizes, and their ratio, measured in this run. */
async function runScale(emit: (r: BenchRecord) => void, quick: boolean): Promise<void> {
  const [small, large] = quick ? [10000, 100000] : [100000, 1048576];
  const times: number[] = [];
  for (const n of [small, large]) {
    const wb = scaleWorkbook(n);
    const t0 = performance.now();
    const book = EvaluatedWorkbook.fromExcel(wb);
    const ms = performance.now() - t0;
    times.push(ms);
    const rows = book.result('Data!D1').length;
    // ratchetCalls 4: each result was sized before the build and evaluated once (presize.ts).
    emit({ case: 'runner: FIT+KNOTS+STATS+PREDICT, data read only by them', n, knots: '0/8', ms, fitRows: rows, ratchetCalls: book.ratchetCalls, maxRssMB: Math.round(process.resourceUsage().maxRSS / 1024), goalMs: quick ? '-' : 30000, goalMaxRssMB: quick ? '-' : 4096 });
  }
  emit({ case: `runner: ratio ${large} / ${small} rows`, n: large, knots: '0/8', ms: times[1]! - times[0]!, ratio: times[1]! / times[0]!, rowsRatio: large / small, goal: 12 });
}

export async function run(emit: (r: BenchRecord) => void, { quick }: { quick: boolean }): Promise<void> {
  await runScale(emit, quick);
  for (const n of quick ? [2000] : [2000, 10000]) {
    const predicts = 1000;
    const wb = workbook(n, predicts);
    let t0 = performance.now();
    const book = EvaluatedWorkbook.fromExcel(wb);
    emit({ case: 'runner: evaluate workbook', n, knots: '0/8', ms: performance.now() - t0, predictCells: predicts, ratchetCalls: book.ratchetCalls });
    const calls = book.ratchetCalls;
    t0 = performance.now();
    book.set({ 'Data!B2': 1000 }); // one input: every fit and 1000 PREDICT cells recalculate
    emit({ case: 'runner: recalculate after one input', n, knots: '0/8', ms: performance.now() - t0, ratchetCalls: book.ratchetCalls - calls });
  }
  const dir = join(import.meta.dirname, '..', 'samples');
  const t0 = performance.now();
  for (const f of ['kiln-strength.xlsx', 'adhesive-tack.xlsx', 'lab-calibration.xlsx', 'knot-count-study.xlsx']) await EvaluatedWorkbook.fromFile(join(dir, f));
  emit({ case: 'runner: read + evaluate 4 samples', n: 4, knots: '-', ms: performance.now() - t0 });
}
