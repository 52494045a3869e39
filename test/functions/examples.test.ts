/**
 * The examples of the README's function reference, evaluated: every number the reference prints (6 significant
 * digits) is what the function returns on the invented example data, and every example error is the
 * one stated. Hand checks where simple: PAVA pools 14, 12 → 13 and 17, 16 → 16.5 (common practice).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { cell, col } from './helpers.js';

const doc = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
const hours = col(1, 2, 3, 4, 5, 6);
const hardness = col(10, 14, 12, 17, 16, 21);
const sig6 = (v: unknown) => (typeof v === 'number' ? Number(v.toPrecision(6)) : v);
const round = (r: unknown) => (Array.isArray(r) ? r.map((row) => (row as unknown[]).map(sig6)) : sig6(r));

/** Asserts the doc mentions `text` (so this test and the reference cannot drift apart silently). */
const documented = (text: string) => expect(doc).toContain(text);

describe('function reference examples (README.md)', () => {
  it('FIT', () => {
    documented('`=RATCHET.FIT(B2:B7, A2:A7)` → 10, 13, 13, 16.5, 16.5, 21');
    expect(cell('FIT', hardness, hours)).toEqual([[10], [13], [13], [16.5], [16.5], [21]]);
    documented('10.2857, 12.1714, 14.0571, 15.9429, 17.8286, 19.7143');
    expect(round(cell('FIT', hardness, hours, 2))).toEqual([[10.2857], [12.1714], [14.0571], [15.9429], [17.8286], [19.7143]]);
  });
  it('PREDICT', () => {
    documented('`=RATCHET.PREDICT({0;2.5;7}, B2:B7, A2:A7)` → 10, 13, 21');
    expect(cell('PREDICT', col(0, 2.5, 7), hardness, hours)).toEqual([[10], [13], [21]]);
    documented('`=RATCHET.PREDICT(3.5, B2:B7, A2:A7, 3)` → 14.25');
    expect(round(cell('PREDICT', 3.5, hardness, hours, 3))).toEqual([[14.25]]);
  });
  it('KNOTS', () => {
    expect(cell('KNOTS', hardness, hours)).toEqual([[1, 10], [2, 13], [3, 13], [4, 16.5], [5, 16.5], [6, 21]]);
    documented('(1, 10.7857), (3.5, 14.25), (6, 20.2143)');
    expect(round(cell('KNOTS', hardness, hours, 3))).toEqual([[1, 10.7857], [3.5, 14.25], [6, 20.2143]]);
  });
  const table = [[1, 10], [2, 13], [3, 13], [4, 16.5], [5, 16.5], [6, 21]];
  it('EVAL', () => {
    documented('`=RATCHET.EVAL({3.5;8}, D2:E7)` → 14.75, 21');
    expect(cell('EVAL', col(3.5, 8), table)).toEqual([[14.75], [21]]);
  });
  it('INVERT', () => {
    documented('`=RATCHET.INVERT({15;13}, D2:E7)` → 3.57143, 2.5');
    expect(round(cell('INVERT', col(15, 13), table))).toEqual([[3.57143], [2.5]]);
    expect(cell('INVERT', 13, table, -1)).toEqual([[2]]);
    expect(cell('INVERT', 13, table, 1)).toEqual([[3]]);
    documented('"target_ys: 25 is outside the curve\'s range [10, 21]."');
    expect(cell('INVERT', 25, table)).toEqual({ error: { code: '#N/A', message: "target_ys: 25 is outside the curve's range [10, 21]." } });
  });
  it('QKNOTS', () => {
    documented('`=RATCHET.QKNOTS(A2:A7, 3)` → 1, 3.5, 6');
    expect(cell('QKNOTS', hours, 3)).toEqual([[1], [3.5], [6]]);
  });
  it('CV', () => {
    documented('| 0 | 2.41139 | 0.275558 | 0.540936 | 2.22222 | 0.353553 |');
    documented('| 2 | 2.54964 | 0.520396 | 0.486792 | 2.03431 | 1.41108 |');
    documented('| 3 | 2.43597 | 0.503804 | 0.531528 | 2.03431 | 1.39655 |');
    expect(round(cell('CV', hardness, hours, col(0, 2, 3), 3, 1, 0))).toEqual([
      ['knots', 'cv_rmse', 'cv_se', 'cv_r2', 'cv_mae', 'train_rmse'],
      [0, 2.41139, 0.275558, 0.540936, 2.22222, 0.353553],
      [2, 2.54964, 0.520396, 0.486792, 2.03431, 1.41108],
      [3, 2.43597, 0.503804, 0.531528, 2.03431, 1.39655],
    ]);
  });
  it('BESTK', () => {
    documented('`=RATCHET.BESTK(B2:B7, A2:A7, {0;2;3}, 3, 1, 0)` → 2');
    expect(cell('BESTK', hardness, hours, col(0, 2, 3), 3, 1, 0)).toBe(2);
    expect(cell('BESTK', hardness, hours, col(0, 2, 3), 3, 1, 0, undefined, undefined, 0)).toBe(0);
  });
  it('STATS', () => {
    for (const line of ['| n | 6 |', '| dropped | 0 |', '| knots | 6 |', '| direction | 1 |', '| r2 | 0.967105 |', '| rmse | 0.645497 |', '| mae | 0.5 |', '| sse | 2.5 |', '| levels | 4 |', '| text_rows | 0 |', '| sigma | 1.11803 |', '| df_resid | 2 |', '| spearman | 0.885714 |']) {
      documented(line);
    }
    // Hand check: residuals 0, 1, −1, 0.5, −0.5, 0 → SSE 2.5, MAE 3/6; ȳ = 15, SST = 76, R² = 1 − 2.5/76.
    expect(round(cell('STATS', hardness, hours))).toEqual([
      ['n', 6],
      ['dropped', 0],
      ['knots', 6],
      ['direction', 1],
      ['r2', Number((1 - 2.5 / 76).toPrecision(6))],
      ['rmse', Number(Math.sqrt(2.5 / 6).toPrecision(6))],
      ['mae', 0.5],
      ['sse', 2.5],
      ['levels', 4],
      ['text_rows', 0],
      // σ̂ = √(2.5 / (6 − 4)); Spearman of x 1 … 6 against y ranks (hand computed from the table).
      ['sigma', Number(Math.sqrt(2.5 / 2).toPrecision(6))],
      ['df_resid', 2],
      ['spearman', 0.885714],
    ]);
  });
  it('the error-message example of the Errors table', () => {
    documented('`knots: needs 0 (classic fit), a whole number of knots ≥ 2, or a range of knot positions; got 1.`');
    expect(cell('FIT', hardness, hours, 1)).toEqual({
      error: { code: '#VALUE!', message: 'knots: needs 0 (classic fit), a whole number of knots ≥ 2, or a range of knot positions; got 1.' },
    });
  });
});
