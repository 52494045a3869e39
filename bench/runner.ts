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

/** One read of a scale file by bench/runner-child.ts (see there). */
interface ScaleRead {
  readMs: number;
  evaluateMs: number;
  fitRows: number;
  ratchetCalls: number;
  maxRssMB: number;
}

/** Minimum and median of some numbers. */
function minMedian(v: number[]): { min: number; median: number } {
  const s = [...v].sort((p, q) => p - q);
  return { min: s[0]!, median: s[Math.floor(s.length / 2)]! };
}

/**
 * The scale case, as `npm run sheet` meets it: the workbook of bench/runner-child.ts written to an
 * .xlsx file at two sizes, each read and evaluated by `EvaluatedWorkbook.fromFile` in a fresh
 * process (peak memory per size), three times per size in alternating order (small, large,
 * small, …): a single read of the small file moves by ±25 % from one process to the next, which
 * moved the ratio between the sizes by as much. Reports for each size the minimum and median of
 * the evaluation (cells to evaluated engine) and of the reading (exceljs's parse), the ratios of
 * the minima and of the medians between the sizes, and the largest peak memory.
 */
async function runScale(emit: (r: BenchRecord) => void, quick: boolean): Promise<void> {
  const sizes = quick ? [10000, 100000] : [100000, 1048576];
  const rounds = 3;
  const dir = mkdtempSync(join(tmpdir(), 'ratchet-bench-'));
  try {
    const files = sizes.map((n) => join(dir, `scale-${n}.xlsx`));
    sizes.forEach((n, i) => child(['write', String(n), files[i]!]));
    const reads: ScaleRead[][] = sizes.map(() => []);
    for (let r = 0; r < rounds; r++) sizes.forEach((_, i) => reads[i]!.push(JSON.parse(child(['read', files[i]!])) as ScaleRead));
    const evaluate = reads.map((rs) => minMedian(rs.map((r) => r.evaluateMs)));
    const read = reads.map((rs) => minMedian(rs.map((r) => r.readMs)));
    sizes.forEach((n, i) => {
      const rs = reads[i]!;
      // ratchetCalls 4: each result was sized before the build and evaluated once (presize.ts).
      emit({
        case: 'runner: FIT+KNOTS+STATS+PREDICT, data read only by them (evaluate)',
        n,
        knots: '0/8',
        ms: evaluate[i]!.min,
        median_ms: evaluate[i]!.median,
        readMs: read[i]!.min,
        readMedianMs: read[i]!.median,
        fitRows: rs[0]!.fitRows,
        ratchetCalls: rs[0]!.ratchetCalls,
        maxRssMB: Math.max(...rs.map((r) => r.maxRssMB)),
        goalMs: quick ? '-' : 30000,
        goalMaxRssMB: quick ? '-' : 4096,
      });
    });
    const [small, large] = sizes as [number, number];
    const [es, el] = evaluate as [{ min: number; median: number }, { min: number; median: number }];
    const [rs, rl] = read as [{ min: number; median: number }, { min: number; median: number }];
    emit({ case: `runner: evaluate, ratio ${large} / ${small} rows`, n: large, knots: '0/8', ms: el.min - es.min, ratio: el.min / es.min, ratio_median: el.median / es.median, rowsRatio: large / small, goal: 12 });
    emit({ case: `runner: read .xlsx, ratio ${large} / ${small} rows`, n: large, knots: '-', ms: rl.min - rs.min, ratio: rl.min / rs.min, ratio_median: rl.median / rs.median, rowsRatio: large / small });
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
