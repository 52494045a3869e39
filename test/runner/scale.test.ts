/**
 * The runner at 200,000 data rows read only by spilling RATCHET formulas (the case that used to
 * grow as n^1.7 because re-sizing a result made the engine walk the whole range): the results,
 * not the time, are checked. Data: x = 1…200,000 and y = x + 1 for odd x, x − 1 for even x, so
 * every pair (2k−1, 2k) falls and the rising fit pools each pair to its mean 2k − 0.5 (hand:
 * neighbouring pair means rise by 2); SSE = 200,000 × 0.5² = 50,000 and 100,000 levels (hand).
 * KNOTS with 8 knots and PREDICT at 8 knots equal the registry's own call on the same cells.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { CACHE_LIMITS, clearCaches, resultCache } from '../../src/functions/engine.js';
import { functionByName } from '../../src/functions/registry.js';
import type { CellValueIn } from '../../src/functions/types.js';
import { EvaluatedWorkbook } from '../../src/runner/workbook.js';
import '../../src/runner/ratchet.js';

const N = 200000;
const yOf = (x: number) => (x % 2 === 1 ? x + 1 : x - 1);
const fitOf = (x: number) => 2 * Math.ceil(x / 2) - 0.5;

/** The 200,000-row workbook, evaluated once for the tests below, with the cache misses and bytes of that evaluation. */
function evaluateScaleBook(): { book: EvaluatedWorkbook; newXs: number[]; misses: number; bytes: number } {
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Data');
  for (let i = 1; i <= N; i++) {
    const row = ws.getRow(i);
    row.getCell(1).value = i;
    row.getCell(2).value = yOf(i);
  }
  const newXs = [1, 2, 1000, 1001, 150000.5, 199999, 200000];
  newXs.forEach((x, i) => (ws.getCell(i + 1, 14).value = x));
  const f = (a: string, formula: string) => (ws.getCell(a).value = { formula } as ExcelJS.CellFormulaValue);
  f('D1', `_xldudf_RATCHET_FIT(B1:B${N},A1:A${N})`);
  f('F1', `_xldudf_RATCHET_KNOTS(B1:B${N},A1:A${N},8)`);
  f('I1', `_xldudf_RATCHET_STATS(B1:B${N},A1:A${N})`);
  f('L1', `_xldudf_RATCHET_PREDICT(N1:N7,B1:B${N},A1:A${N})`);
  f('O1', `_xldudf_RATCHET_PREDICT(N1:N7,B1:B${N},A1:A${N},8)`);
  clearCaches();
  const before = resultCache.stats.misses;
  const book = EvaluatedWorkbook.fromExcel(wb);
  return { book, newXs, misses: resultCache.stats.misses - before, bytes: resultCache.stats.bytes };
}

describe('runner at 200,000 rows', () => {
  let run: ReturnType<typeof evaluateScaleBook>;
  beforeAll(() => {
    run = evaluateScaleBook();
  }, 300000);

  it('the four computations (classic fit, knot table, knot fit, rank correlation) run once each, and 256 MB holds them twice over at 1,048,576 rows', () => {
    // The sizing pass before the engine and the engine's own evaluation share every result.
    expect(run.misses).toBe(4);
    // Entries grow linearly in rows: at 1,048,576 rows the same four must fit twice in the default
    // byte bound, or a million-row sheet evicts its own results between the two evaluations.
    expect(2 * run.bytes * (1048576 / N)).toBeLessThanOrEqual(CACHE_LIMITS.bytes);
    expect(run.book.timings.evaluateMs).toBeGreaterThan(0);
  });

  it('FIT, KNOTS, STATS and PREDICT over 200,000 rows give the pooled pair means and the registry\'s results', () => {
    const { book, newXs } = run;
    const fit = book.result('Data!D1');
    expect(fit).toHaveLength(N);
    let worst = 0;
    for (let i = 1; i <= N; i++) worst = Math.max(worst, Math.abs((fit[i - 1]![0] as number) - fitOf(i)));
    expect(worst).toBeLessThanOrEqual(1e-9);

    const stats = Object.fromEntries(book.result('Data!I1').map((r) => [r[0], r[1]]));
    expect(stats.n).toBe(N);
    expect(stats.dropped).toBe(0);
    expect(stats.levels).toBe(N / 2);
    expect(stats.sse as number).toBeCloseTo(50000, 6);

    // Between pair means: x = 150000.5 lies between 150000 (149999.5) and 150001 (150001.5) → 150000.5 (hand).
    expect(book.result('Data!L1').map((r) => r[0])).toEqual([1.5, 1.5, 999.5, 1001.5, 150000.5, 199999.5, 199999.5]);

    const ys: CellValueIn[][] = [];
    const xs: CellValueIn[][] = [];
    for (let i = 1; i <= N; i++) {
      ys.push([yOf(i)]);
      xs.push([i]);
    }
    expect(book.result('Data!F1')).toEqual(functionByName('KNOTS')!.invoke([ys, xs, 8]));
    expect(book.result('Data!O1')).toEqual(functionByName('PREDICT')!.invoke([newXs.map((x) => [x]), ys, xs, 8]));
  }, 300000);
});
