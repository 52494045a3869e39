/**
 * Headless runner: evaluating a workbook in HyperFormula with the RATCHET plugin, and
 * recalculating after one input changes (array results re-sized). Times include the engine.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
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

/** Runs bench/runner-child.ts in a fresh Node process with these arguments; returns its stdout. */
function child(args: string[]): string {
  return execFileSync(process.execPath, [...process.execArgv, join(import.meta.dirname, 'runner-child.ts'), ...args], { encoding: 'utf8', maxBuffer: 1 << 20 }).trim();
}

/**
 * The scale case, as `npm run sheet` meets it: the workbook of bench/runner-child.ts written to an
 * .xlsx file at two sizes, each read and evaluated by `EvaluatedWorkbook.fromFile` in a fresh
 * process (peak memory per size). Reports the evaluation (cells to evaluated engine), the reading
 * (exceljs's parse), their ratios between the sizes, and the peak memory.
 */
async function runScale(emit: (r: BenchRecord) => void, quick: boolean): Promise<void> {
  const [small, large] = quick ? [10000, 100000] : [100000, 1048576];
  const dir = mkdtempSync(join(tmpdir(), 'ratchet-bench-'));
  try {
    const runs: { readMs: number; evaluateMs: number }[] = [];
    for (const n of [small, large]) {
      const file = join(dir, `scale-${n}.xlsx`);
      child(['write', String(n), file]);
      const r = JSON.parse(child(['read', file])) as { readMs: number; evaluateMs: number; fitRows: number; ratchetCalls: number; maxRssMB: number };
      runs.push(r);
      // ratchetCalls 4: each result was sized before the build and evaluated once (presize.ts).
      emit({ case: 'runner: FIT+KNOTS+STATS+PREDICT, data read only by them (evaluate)', n, knots: '0/8', ms: r.evaluateMs, readMs: r.readMs, fitRows: r.fitRows, ratchetCalls: r.ratchetCalls, maxRssMB: r.maxRssMB, goalMs: quick ? '-' : 30000, goalMaxRssMB: quick ? '-' : 4096 });
    }
    const [s, l] = runs as [(typeof runs)[0], (typeof runs)[0]];
    emit({ case: `runner: evaluate, ratio ${large} / ${small} rows`, n: large, knots: '0/8', ms: l.evaluateMs - s.evaluateMs, ratio: l.evaluateMs / s.evaluateMs, rowsRatio: large / small, goal: 12 });
    emit({ case: `runner: read .xlsx, ratio ${large} / ${small} rows`, n: large, knots: '-', ms: l.readMs - s.readMs, ratio: l.readMs / s.readMs, rowsRatio: large / small });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
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
