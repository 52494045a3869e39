/**
 * The formulas-and-expected table: one row per formula — the sheet it runs on, the formula, and
 * the value or error code it must give — covering every RATCHET function and every documented
 * error, evaluated through the headless runner (HyperFormula with the registry's functions).
 *
 * Sources of the expected values:
 * - "(hand)" rows are worked by hand in the comment beside them (pool-adjacent-violators by hand,
 *   straight lines through exact data, linear interpolation of a knot table);
 * - "(core)" rows compare with the core called directly (src/core), the same route the sample
 *   expectations take, so the runner and the worksheet layer are checked against the engine;
 * - error rows follow the error table of the worksheet functions (README.md, "Errors": argument problems are
 *   #VALUE! naming the argument; INVERT outside the range is #N/A; error cells propagate).
 */
import { describe, expect, it } from 'vitest';
import { bandAt, crossValidate, crossValidateSurface, fitBandModel, inverseBand, suggestKnots } from '../../src/core/index.js';
import { closeBlock, evaluate, type Setup, type SetupCell } from './helpers.js';

type Value = number | string | boolean | null;

interface Row {
  /** What the row checks. */
  readonly what: string;
  /** Cells of the sheet the formula runs on (the formula goes to H1). */
  readonly setup: Record<string, SetupCell>;
  /** The formula, typed or stored form. */
  readonly formula: string;
  /** Expected block (top-left first) — or an error code. */
  readonly expected: Value[][] | string;
  /** For errors: a fragment the message must contain. */
  readonly message?: string;
}

/** x = 1…6 in A1:A6, y in B1:B6. */
function xy(y: readonly (Value | { f: string })[], x: readonly Value[] = [1, 2, 3, 4, 5, 6]): Record<string, SetupCell> {
  const cells: Record<string, SetupCell> = {};
  x.forEach((v, i) => (cells[`A${i + 1}`] = v));
  y.forEach((v, i) => (cells[`B${i + 1}`] = v as SetupCell));
  return cells;
}

// Base data: y = 1 3 2 4 6 5 at x = 1…6. Rising PAVA (hand): (3,2) pool to 2.5, (6,5) pool to 5.5,
// so the fit is 1 2.5 2.5 4 5.5 5.5; residuals 0 .5 −.5 0 .5 −.5 → SSE 1, RMSE √(1/6), MAE 1/3;
// ȳ = 3.5, SST = 17.5, R² = 1 − 1/17.5; four levels (1, 2.5, 4, 5.5).
const BASE = xy([1, 3, 2, 4, 6, 5]);
// Exact line y = 2x + 1: any knot model with knots at the data ends reproduces it.
const LINE = xy([3, 5, 7, 9, 11, 13]);
// Falling data: y = 6 4 5 3 1 2; falling PAVA (hand): (4,5) → 4.5, (1,2) → 1.5.
const FALLING = xy([6, 4, 5, 3, 1, 2]);
// A knot table (x 0, 2, 4; value 0, 4, 4) for EVAL and INVERT.
const TABLE = { D1: 0, E1: 0, D2: 2, E2: 4, D3: 4, E3: 4 };

// Cross-validation with seed 0 (no shuffle), 2 folds over the base data (hand):
// fold 1 = rows 1–3, fold 2 = rows 4–6, held-out rows outside the training range read flat.
// Classic: train 4–6 → fit 4 5.5 5.5, rows 1–3 read 4: errors −3 −1 −2 (SSE 14);
//          train 1–3 → fit 1 2.5 2.5, rows 4–6 read 2.5: errors 1.5 3.5 2.5 (SSE 20.75).
// cv_rmse = √(34.75/6); per-fold RMSE √(14/3), √(20.75/3); cv_se = sd/√2 (sd with n − 1);
// cv_r2 = 1 − 34.75/17.5; cv_mae = 13.5/6; train RMSE √(0.5/3) in both folds.
const f1 = Math.sqrt(14 / 3);
const f2 = Math.sqrt(20.75 / 3);
const seHand = Math.abs(f1 - f2) / Math.SQRT2 / Math.SQRT2;
// Two knots: train 4–6 → least-squares line 4.5 … 5.5, rows 1–3 read 4.5 (SSE 20.75);
//            train 1–3 → line 1.5 … 2.5, rows 4–6 read 2.5 (SSE 20.75). cv_rmse = √(41.5/6);
//            absolute errors 3.5 1.5 2.5 and 1.5 3.5 2.5 → cv_mae 15/6; equal folds → cv_se 0;
//            training residuals −.5 1 −.5 in both folds → train RMSE √(1.5/3).
const cvK2 = Math.sqrt(41.5 / 6);

const BASE_X = [1, 2, 3, 4, 5, 6];
const BASE_Y = [1, 3, 2, 4, 6, 5];
const coreCv = crossValidate(BASE_X, BASE_Y, { candidates: [2, 3, 4], folds: 3, seed: 7 });
const coreBandModel = fitBandModel(BASE_X, BASE_Y, { knots: 2 });
const coreBand = bandAt(coreBandModel, [3.5], 0.9, 'prediction');
const coreInverse = inverseBand(coreBandModel, [3.5], 0.5, 4)[0]!;

/** A 2 × 2 grid for the surface rows: x1 in A1:A4, y in B1:B4, x2 in C1:C4. */
function lattice(y: readonly number[], x1: readonly number[] = [0, 1, 0, 1], x2: readonly number[] = [0, 0, 1, 1]): Record<string, SetupCell> {
  const cells: Record<string, SetupCell> = {};
  y.forEach((v, i) => {
    cells[`A${i + 1}`] = x1[i]!;
    cells[`B${i + 1}`] = v;
    cells[`C${i + 1}`] = x2[i]!;
  });
  return cells;
}
// Falling along both inputs: y = 4 3 2 1 at (0,0) (1,0) (0,1) (1,1). Rank correlations (hand, average
// ranks): x1 ranks 1.5 3.5 1.5 3.5 and x2 ranks 1.5 1.5 3.5 3.5 against y ranks 4 3 2 1 give
// Σ(rx − 2.5)(ry − 2.5) = −2 and −4: both negative, so directions 0, 0 fit falling along both and
// reproduce the data; rising along both pools all four to their mean 2.5.
const GRID_FALLING = lattice([4, 3, 2, 1]);
// An invented 4 × 4 grid for CVGRID (y ≈ 2·x1 − 0.1·x2 plus a fixed perturbation).
const CV_X1 = [1, 2, 3, 4, 1, 2, 3, 4, 1, 2, 3, 4, 1, 2, 3, 4];
const CV_X2 = [10, 10, 10, 10, 20, 20, 20, 20, 30, 30, 30, 30, 40, 40, 40, 40];
const CV_Y = [1.3, 2.8, 5.1, 7.0, -0.1, 2.25, 3.7, 6.05, -0.8, 0.85, 3.0, 5.1, -2.05, 0.3, 1.8, 4.15];
const coreCvGrid = crossValidateSurface(CV_X1, CV_X2, CV_Y, { candidates1: [2, 3], candidates2: [2], folds: 4, seed: 0, direction1: 'auto', direction2: 'auto' });

const ROWS: Row[] = [
  // ---- FIT ----
  { what: 'FIT classic rising (hand)', setup: BASE, formula: '=RATCHET.FIT(B1:B6,A1:A6)', expected: [[1], [2.5], [2.5], [4], [5.5], [5.5]] },
  { what: 'FIT stored form reads the same (hand)', setup: BASE, formula: '_xldudf_RATCHET_FIT(B1:B6,A1:A6)', expected: [[1], [2.5], [2.5], [4], [5.5], [5.5]] },
  { what: 'FIT falling, direction -1 (hand)', setup: FALLING, formula: '=RATCHET.FIT(B1:B6,A1:A6,0,-1)', expected: [[6], [4.5], [4.5], [3], [1.5], [1.5]] },
  { what: 'FIT direction 0 picks falling (hand)', setup: FALLING, formula: '=RATCHET.FIT(B1:B6,A1:A6,0,0)', expected: [[6], [4.5], [4.5], [3], [1.5], [1.5]] },
  // Weights 1, 3 pool 3 and 2 to (3 + 6)/4 = 2.25 (hand).
  { what: 'FIT weighted (hand)', setup: { A1: 1, A2: 2, A3: 3, B1: 1, B2: 3, B3: 2, C1: 1, C2: 1, C3: 3 }, formula: '=RATCHET.FIT(B1:B3,A1:A3,0,1,C1:C3)', expected: [[1], [2.25], [2.25]] },
  { what: 'FIT with 2 knots reproduces an exact line (hand)', setup: LINE, formula: '=RATCHET.FIT(B1:B6,A1:A6,2)', expected: [[3], [5], [7], [9], [11], [13]] },
  { what: 'FIT with knot positions from an array constant (hand)', setup: LINE, formula: '=RATCHET.FIT(B1:B6,A1:A6,{1;3;6})', expected: [[3], [5], [7], [9], [11], [13]] },
  // Row 3 has a blank x: left out, its fitted cell is "", the rest pool as 1, (3) , (6,5) → 5.5 … (hand)
  { what: 'FIT leaves a row with a blank x out and shows it empty (hand)', setup: xy([1, 3, 2, 4, 6, 5], [1, 2, null, 4, 5, 6]), formula: '=RATCHET.FIT(B1:B6,A1:A6)', expected: [[1], [3], [''], [4], [5.5], [5.5]] },
  { what: 'FIT over a row of data keeps the row shape (hand)', setup: { A1: 1, B1: 2, C1: 3, A2: 2, B2: 1, C2: 3 }, formula: '=RATCHET.FIT(A2:C2,A1:C1)', expected: [[1.5, 1.5, 3]] },
  { what: 'FIT with ROUND around it vectorises (hand)', setup: BASE, formula: '=ROUND(RATCHET.FIT(B1:B6,A1:A6)/3,2)', expected: [[0.33], [0.83], [0.83], [1.33], [1.83], [1.83]] },
  // ---- PREDICT ----
  { what: 'PREDICT, flat beyond the data (hand)', setup: LINE, formula: '=RATCHET.PREDICT({0;3.5;10},B1:B6,A1:A6,2)', expected: [[3], [8], [13]] },
  { what: 'PREDICT classic between data points interpolates (hand)', setup: BASE, formula: '=RATCHET.PREDICT(3.5,B1:B6,A1:A6)', expected: [[3.25]] },
  { what: 'PREDICT at SEQUENCE inputs (hand)', setup: LINE, formula: '=RATCHET.PREDICT(SEQUENCE(1,3,2,2),B1:B6,A1:A6,2)', expected: [[5, 9, 13]] },
  // ---- KNOTS ----
  // The classic table is the smallest that reproduces PREDICT: (4, 4) lies on the line from
  // (3, 2.5) to (5, 5.5) and is not needed (hand).
  { what: 'KNOTS classic: the smallest reproducing table (hand)', setup: BASE, formula: '=RATCHET.KNOTS(B1:B6,A1:A6)', expected: [[1, 1], [2, 2.5], [3, 2.5], [5, 5.5], [6, 5.5]] },
  { what: 'KNOTS with 2 knots (hand)', setup: LINE, formula: '=RATCHET.KNOTS(B1:B6,A1:A6,2)', expected: [[1, 3], [6, 13]] },
  { what: 'KNOTS with 3 explicit positions (hand)', setup: LINE, formula: '=RATCHET.KNOTS(B1:B6,A1:A6,{1;3;6})', expected: [[1, 3], [3, 7], [6, 13]] },
  // ---- EVAL ----
  { what: 'EVAL interpolates a knot table, flat beyond (hand)', setup: TABLE, formula: '=RATCHET.EVAL({-1;1.5;9},D1:E3)', expected: [[0], [3], [4]] },
  { what: 'EVAL of an array-constant table (hand)', setup: {}, formula: '=RATCHET.EVAL(2,{1,1;6,5})', expected: [[1.8]] },
  // ---- INVERT ----
  { what: 'INVERT, tie middle by default (hand)', setup: TABLE, formula: '=RATCHET.INVERT({2;4},D1:E3)', expected: [[1], [3]] },
  { what: 'INVERT over a range larger than the table skips its empty rows (hand)', setup: TABLE, formula: '=RATCHET.INVERT(2,D1:E6)', expected: [[1]] },
  { what: 'INVERT, tie -1 lowest x of the flat stretch (hand)', setup: TABLE, formula: '=RATCHET.INVERT(4,D1:E3,-1)', expected: [[2]] },
  { what: 'INVERT, tie 1 highest x of the flat stretch (hand)', setup: TABLE, formula: '=RATCHET.INVERT(4,D1:E3,1)', expected: [[4]] },
  // ---- QKNOTS ----
  // Type-7 quantiles of 1 2 3 4 100 at p = 0, .5, 1: 1, 3, 100 (hand).
  { what: 'QKNOTS at quantiles (hand)', setup: { A1: 1, A2: 2, A3: 3, A4: 4, A5: 100 }, formula: '=RATCHET.QKNOTS(A1:A5,3)', expected: [[1], [3], [100]] },
  // ---- STATS ----
  {
    what: 'STATS of the classic fit (hand)',
    setup: BASE,
    formula: '=RATCHET.STATS(B1:B6,A1:A6)',
    expected: [['n', 6], ['dropped', 0], ['knots', 5], ['direction', 1], ['r2', 1 - 1 / 17.5], ['rmse', Math.sqrt(1 / 6)], ['mae', 1 / 3], ['sse', 1], ['levels', 4], ['text_rows', 0], ['sigma', Math.sqrt(1 / 2)], ['df_resid', 2], ['spearman', 1 - (6 * 4) / (6 * 35)]],
  },
  {
    what: 'STATS counts a dropped row and reports the direction chosen (hand)',
    setup: xy([6, 4, 5, 3, 1, null]),
    formula: '=RATCHET.STATS(B1:B6,A1:A6,0,0)',
    // Rows 1–5: 6, (4,5) → 4.5, 3, 1: SSE 0.5, RMSE √(0.5/5), MAE 1/5; ȳ = 3.8, SST = 14.8;
    // σ̂ = √(0.5/(5 − 4)); Spearman: y ranks 5 3 4 2 1 against 1…5, Σd² = 38, ρ = 1 − 6·38/120.
    expected: [['n', 5], ['dropped', 1], ['knots', 5], ['direction', -1], ['r2', 1 - 0.5 / 14.8], ['rmse', Math.sqrt(0.1)], ['mae', 0.2], ['sse', 0.5], ['levels', 4], ['text_rows', 0], ['sigma', Math.sqrt(0.5)], ['df_resid', 1], ['spearman', 1 - (6 * 38) / 120]],
  },
  // ---- CV ----
  {
    what: 'CV, seed 0, 2 folds, classic and 2 knots (hand)',
    setup: BASE,
    formula: '=RATCHET.CV(B1:B6,A1:A6,{0;2},2,1,0)',
    expected: [
      ['knots', 'cv_rmse', 'cv_se', 'cv_r2', 'cv_mae', 'train_rmse'],
      [0, Math.sqrt(34.75 / 6), seHand, 1 - 34.75 / 17.5, 13.5 / 6, Math.sqrt(0.5 / 3)],
      [2, cvK2, 0, 1 - 41.5 / 17.5, 15 / 6, Math.sqrt(1.5 / 3)],
    ],
  },
  {
    what: 'CV, shuffled, against the core (core)',
    setup: BASE,
    formula: '=RATCHET.CV(B1:B6,A1:A6,SEQUENCE(3,1,2),3,1,7)',
    expected: [['knots', 'cv_rmse', 'cv_se', 'cv_r2', 'cv_mae', 'train_rmse'], ...coreCv.scores.map((s) => [s.knots, s.cvRmse, s.cvSe, s.cvR2, s.cvMae, s.trainRmse])],
  },
  // ---- BESTK ----
  { what: 'BESTK minimum rule picks the smaller cv_rmse (hand)', setup: BASE, formula: '=RATCHET.BESTK(B1:B6,A1:A6,{0;2},2,1,0,1,,0)', expected: [[0]] },
  { what: 'BESTK one-SE rule, against the core (core)', setup: BASE, formula: '=RATCHET.BESTK(B1:B6,A1:A6,SEQUENCE(3,1,2),3,1,7)', expected: [[suggestKnots(coreCv.scores, 'one-se').knots]] },
  { what: 'BESTK minimum rule, against the core (core)', setup: BASE, formula: '=RATCHET.BESTK(B1:B6,A1:A6,SEQUENCE(3,1,2),3,1,7,1,,0)', expected: [[suggestKnots(coreCv.scores, 'min').knots]] },
  // ---- errors: argument problems are #VALUE! naming the argument ----
  // Text and logical cells in a referenced data range leave their row out, as blanks do (Excel's
  // convention for SLOPE and CORREL) (common practice). Rows 1, 2, 4, 5, 6: y 1 3 4 6 5 → PAVA
  // (hand) pools (6,5) to 5.5: 1 3 4 5.5 5.5, the text row empty.
  { what: 'text in a referenced data range leaves its row out (hand)', setup: xy([1, 3, 'abc', 4, 6, 5]), formula: '=RATCHET.FIT(B1:B6,A1:A6)', expected: [[1], [3], [''], [4], [5.5], [5.5]] },
  { what: 'a number stored as text in a referenced range leaves its row out (hand)', setup: xy([1, 3, '2', 4, 6, 5]), formula: '=RATCHET.FIT(B1:B6,A1:A6)', expected: [[1], [3], [''], [4], [5.5], [5.5]] },
  { what: 'a logical in a referenced x range leaves its row out (hand)', setup: xy([1, 3, 2, 4, 6, 5], [1, 2, true, 4, 5, 6]), formula: '=RATCHET.FIT(B1:B6,A1:A6)', expected: [[1], [3], [''], [4], [5.5], [5.5]] },
  {
    what: 'STATS counts text rows in dropped and in text_rows (hand)',
    setup: { ...xy([1, 3, 'n/a', 4, 6, null]), C1: 1, C2: 1, C3: 1, C4: true, C5: 1, C6: 1 },
    formula: '=RATCHET.STATS(B1:B6,A1:A6,0,1,C1:C6)',
    // Rows 1, 2, 5 used (row 3 text y, row 4 logical weight, row 6 blank y): y 1 3 6 rising, exact: SSE 0;
    // no degree of freedom is left for sigma (#N/A); x and y ranks agree: spearman 1.
    expected: [['n', 3], ['dropped', 3], ['knots', 3], ['direction', 1], ['r2', 1], ['rmse', 0], ['mae', 0], ['sse', 0], ['levels', 3], ['text_rows', 2], ['sigma', '#N/A'], ['df_resid', 0], ['spearman', 1]],
  },
  { what: 'text in an array constant stays an error', setup: BASE, formula: '=RATCHET.FIT({1;3;"abc";4;6;5},A1:A6)', expected: '#VALUE!', message: 'known_ys: needs numbers or blanks; cell 3 is the text "abc"' },
  { what: 'a bare TRUE argument is named as a logical', setup: BASE, formula: '=RATCHET.FIT(B1:B6,A1:A6,TRUE)', expected: '#VALUE!', message: 'knots: needs a number; got the logical TRUE' },
  { what: 'a bare FALSE as data is named as a logical', setup: BASE, formula: '=RATCHET.FIT(B1:B6,A1:A6,0,1,FALSE)', expected: '#VALUE!', message: 'the logical FALSE' },
  { what: 'a negative weight is named by its address', setup: { ...BASE, C1: 1, C2: 1, C3: -0.123456789, C4: 1, C5: 1, C6: 1 }, formula: '=RATCHET.FIT(B1:B6,A1:A6,0,1,C1:C6)', expected: '#VALUE!', message: "weights: needs numbers ≥ 0; 'T__SHEET__'!C3 is -0.123457" },
  { what: 'an error cell is named by its address', setup: xy([1, 3, { f: '1/0' }, 4, 6, 5]), formula: '=RATCHET.FIT(B1:B6,A1:A6)', expected: '#DIV/0!', message: "known_ys: 'T__SHEET__'!B3 holds the error #DIV/0!" },
  { what: 'mismatched sizes', setup: BASE, formula: '=RATCHET.FIT(B1:B6,A1:A5)', expected: '#VALUE!', message: 'known_xs' },
  { what: 'knots 1', setup: BASE, formula: '=RATCHET.FIT(B1:B6,A1:A6,1)', expected: '#VALUE!', message: 'knots' },
  { what: 'fractional knots', setup: BASE, formula: '=RATCHET.KNOTS(B1:B6,A1:A6,2.5)', expected: '#VALUE!', message: 'knots' },
  { what: 'knot positions not increasing', setup: BASE, formula: '=RATCHET.FIT(B1:B6,A1:A6,{1;4;3})', expected: '#VALUE!', message: 'knots' },
  { what: 'a negative weight', setup: { ...BASE, C1: 1, C2: -1, C3: 1, C4: 1, C5: 1, C6: 1 }, formula: '=RATCHET.FIT(B1:B6,A1:A6,0,1,C1:C6)', expected: '#VALUE!', message: 'weights' },
  { what: 'direction outside {-1, 0, 1}', setup: BASE, formula: '=RATCHET.FIT(B1:B6,A1:A6,0,2)', expected: '#VALUE!', message: 'direction' },
  { what: 'fewer than 2 usable rows', setup: xy([1, null, null, null, null, null]), formula: '=RATCHET.FIT(B1:B6,A1:A6)', expected: '#VALUE!', message: 'known_ys' },
  { what: 'folds 1', setup: BASE, formula: '=RATCHET.CV(B1:B6,A1:A6,2,1)', expected: '#VALUE!', message: 'folds' },
  { what: 'folds above n', setup: BASE, formula: '=RATCHET.BESTK(B1:B6,A1:A6,2,7)', expected: '#VALUE!', message: 'folds' },
  { what: 'repeats 0', setup: BASE, formula: '=RATCHET.CV(B1:B6,A1:A6,2,2,0)', expected: '#VALUE!', message: 'repeats' },
  { what: 'a negative seed', setup: BASE, formula: '=RATCHET.CV(B1:B6,A1:A6,2,2,1,-1)', expected: '#VALUE!', message: 'seed' },
  { what: 'candidate knot count 1', setup: BASE, formula: '=RATCHET.CV(B1:B6,A1:A6,{1;2})', expected: '#VALUE!', message: 'candidates' },
  { what: 'BESTK rule outside {0, 1}', setup: BASE, formula: '=RATCHET.BESTK(B1:B6,A1:A6,{2;3},2,1,0,1,,2)', expected: '#VALUE!', message: 'rule' },
  { what: 'QKNOTS count 1', setup: BASE, formula: '=RATCHET.QKNOTS(A1:A6,1)', expected: '#VALUE!', message: 'count' },
  { what: 'malformed knot table: x not increasing', setup: {}, formula: '=RATCHET.EVAL(1,{1,2;1,3})', expected: '#VALUE!', message: 'knot_table' },
  { what: 'malformed knot table: three columns', setup: {}, formula: '=RATCHET.INVERT(1,{1,2,3;4,5,6})', expected: '#VALUE!', message: 'knot_table' },
  { what: 'INVERT tie outside {-1, 0, 1}', setup: TABLE, formula: '=RATCHET.INVERT(2,D1:E3,3)', expected: '#VALUE!', message: 'tie' },
  { what: 'known_ys with two columns', setup: { ...BASE, C1: 1, C2: 2, C3: 3, C4: 4, C5: 5, C6: 6 }, formula: '=RATCHET.FIT(B1:C6,A1:A6)', expected: '#VALUE!', message: 'known_ys' },
  { what: 'all weights 0', setup: { ...BASE, C1: 0, C2: 0, C3: 0, C4: 0, C5: 0, C6: 0 }, formula: '=RATCHET.FIT(B1:B6,A1:A6,0,1,C1:C6)', expected: '#VALUE!', message: 'weights' },
  { what: 'a number too large for sums of squares', setup: xy([1, 3, 1e200, 4, 6, 5]), formula: '=RATCHET.FIT(B1:B6,A1:A6)', expected: '#VALUE!', message: 'known_ys' },
  { what: 'fewer than 2 distinct x', setup: xy([1, 2, 3], [5, 5, 5]), formula: '=RATCHET.FIT(B1:B3,A1:A3,2)', expected: '#VALUE!' },
  { what: 'text in new_xs', setup: BASE, formula: '=RATCHET.PREDICT("soon",B1:B6,A1:A6)', expected: '#VALUE!', message: 'new_xs' },
  { what: 'knot table row with one cell filled', setup: { D1: 0, E1: 0, D2: 2, D3: 4, E3: 4 }, formula: '=RATCHET.EVAL(1,D1:E3)', expected: '#VALUE!', message: 'knot_table' },
  { what: 'INVERT of a one-row table', setup: {}, formula: '=RATCHET.INVERT(1,{0,1})', expected: '#VALUE!', message: 'knot_table' },
  { what: 'INVERT of a table whose values are not monotone', setup: {}, formula: '=RATCHET.INVERT(1,{0,0;1,2;2,1})', expected: '#VALUE!', message: 'knot_table' },
  { what: 'INVERT target below the curve', setup: TABLE, formula: '=RATCHET.INVERT(-1,D1:E3)', expected: '#N/A', message: 'outside' },
  { what: 'QKNOTS count fractional', setup: BASE, formula: '=RATCHET.QKNOTS(A1:A6,2.5)', expected: '#VALUE!', message: 'count' },
  { what: 'QKNOTS count missing', setup: BASE, formula: '=RATCHET.QKNOTS(A1:A6)', expected: '#VALUE!', message: 'count' },
  { what: 'QKNOTS of one distinct x', setup: { A1: 3, A2: 3, A3: 3 }, formula: '=RATCHET.QKNOTS(A1:A3,2)', expected: '#VALUE!' },
  { what: 'repeated candidates', setup: BASE, formula: '=RATCHET.CV(B1:B6,A1:A6,{2;2})', expected: '#VALUE!', message: 'candidates' },
  { what: 'fractional candidates', setup: BASE, formula: '=RATCHET.CV(B1:B6,A1:A6,{2;2.5})', expected: '#VALUE!', message: 'candidates' },
  { what: 'repeats above 1 with seed 0', setup: BASE, formula: '=RATCHET.CV(B1:B6,A1:A6,2,2,2,0)', expected: '#VALUE!', message: 'repeats' },
  { what: 'a fractional seed', setup: BASE, formula: '=RATCHET.BESTK(B1:B6,A1:A6,2,2,1,1.5)', expected: '#VALUE!', message: 'seed' },
  // ---- BAND, INVERTBAND ----
  // An exact line has σ̂ = 0: the band collapses onto the line (hand).
  { what: 'BAND of an exact line collapses onto it: lower = fit = upper (hand)', setup: LINE, formula: '=RATCHET.BAND(3.5,B1:B6,A1:A6,2)', expected: [[8, 8, 8]] },
  { what: 'BAND over a row of new x spills three rows (hand)', setup: LINE, formula: '=RATCHET.BAND({2,4},B1:B6,A1:A6,2)', expected: [[5, 9], [5, 9], [5, 9]] },
  { what: 'BAND, 90 % prediction band, against the core (core)', setup: BASE, formula: '=RATCHET.BAND(3.5,B1:B6,A1:A6,2,1,,0.9,2)', expected: [[coreBand.lower[0]!, coreBand.fit[0]!, coreBand.upper[0]!]] },
  { what: 'INVERTBAND, against the core (core)', setup: BASE, formula: '=RATCHET.INVERTBAND(3.5,B1:B6,A1:A6,2,1,,0.5,4)', expected: [[coreInverse.lower as number, coreInverse.x as number, coreInverse.upper as number]] },
  { what: 'FIT convex with 3 knots on an exact line reproduces it (hand)', setup: LINE, formula: '=RATCHET.FIT(B1:B6,A1:A6,3,1,,1)', expected: [[3], [5], [7], [9], [11], [13]] },
  { what: 'KNOTS smooth with 2 knots on an exact line: knots and midpoint, third column 2 (hand)', setup: LINE, formula: '=RATCHET.KNOTS(B1:B6,A1:A6,2,1,,0,2)', expected: [[1, 3, 2], [3.5, 8, 2], [6, 13, 2]] },
  { what: 'EVAL reads a smooth table quadratically (hand: parabola through (0,0), (1,0.75), (2,1) at 0.5 is 0.4375)', setup: {}, formula: '=RATCHET.EVAL(0.5,{0,0,2;1,0.75,2;2,1,2})', expected: [[0.4375]] },
  // ---- errors of the new arguments ----
  { what: 'BAND of the classic fit (knots 0)', setup: BASE, formula: '=RATCHET.BAND(3,B1:B6,A1:A6)', expected: '#VALUE!', message: 'BAND needs the knot model' },
  { what: 'BAND level 1', setup: BASE, formula: '=RATCHET.BAND(3,B1:B6,A1:A6,2,1,,1)', expected: '#VALUE!', message: 'level' },
  { what: 'BAND level 0', setup: BASE, formula: '=RATCHET.BAND(3,B1:B6,A1:A6,2,1,,0)', expected: '#VALUE!', message: 'level' },
  { what: 'BAND kind 3', setup: BASE, formula: '=RATCHET.BAND(3,B1:B6,A1:A6,2,1,,0.95,3)', expected: '#VALUE!', message: 'kind' },
  { what: 'BAND with no more rows than parameters (6 rising rows, 6 knots)', setup: LINE, formula: '=RATCHET.BAND(3,B1:B6,A1:A6,6)', expected: '#VALUE!', message: 'known_ys' },
  { what: 'BAND new_xs of two rows and two columns', setup: BASE, formula: '=RATCHET.BAND({1,2;3,4},B1:B6,A1:A6,2)', expected: '#VALUE!', message: 'new_xs' },
  { what: 'BAND curvature 2', setup: BASE, formula: '=RATCHET.BAND(3,B1:B6,A1:A6,2,1,,0.95,1,2)', expected: '#VALUE!', message: 'curvature' },
  { what: 'BAND degree 2 of an exact line collapses onto it (hand: σ̂ = 0)', setup: LINE, formula: '=RATCHET.BAND(3.5,B1:B6,A1:A6,2,1,,0.95,1,0,2)', expected: [[8, 8, 8]] },
  { what: 'BAND degree 2 of the classic fit (knots 0)', setup: BASE, formula: '=RATCHET.BAND(3,B1:B6,A1:A6,0,1,,0.95,1,0,2)', expected: '#VALUE!', message: 'BAND needs the knot model' },
  { what: 'BAND degree 2 with no more rows than coefficients (6 rows, 5 knots: 6 B-splines)', setup: LINE, formula: '=RATCHET.BAND(3,B1:B6,A1:A6,5,1,,0.95,1,0,2)', expected: '#VALUE!', message: 'known_ys' },
  { what: 'BAND degree 2 level 1', setup: BASE, formula: '=RATCHET.BAND(3,B1:B6,A1:A6,2,1,,1,1,0,2)', expected: '#VALUE!', message: 'level' },
  { what: 'INVERTBAND degree 2 replicates 0', setup: BASE, formula: '=RATCHET.INVERTBAND(3,B1:B6,A1:A6,2,1,,0.95,0,0,2)', expected: '#VALUE!', message: 'replicates' },
  { what: 'INVERTBAND of the classic fit (knots 0)', setup: BASE, formula: '=RATCHET.INVERTBAND(3,B1:B6,A1:A6)', expected: '#VALUE!', message: 'knots' },
  { what: 'INVERTBAND replicates 0.5', setup: BASE, formula: '=RATCHET.INVERTBAND(3,B1:B6,A1:A6,2,1,,0.95,0.5)', expected: '#VALUE!', message: 'replicates' },
  { what: 'INVERTBAND level 1.5', setup: BASE, formula: '=RATCHET.INVERTBAND(3,B1:B6,A1:A6,2,1,,1.5)', expected: '#VALUE!', message: 'level' },
  { what: 'INVERTBAND degree 3', setup: BASE, formula: '=RATCHET.INVERTBAND(3,B1:B6,A1:A6,2,1,,0.95,1,0,3)', expected: '#VALUE!', message: 'degree' },
  { what: 'INVERTBAND lower limit out of reach is #N/A in that cell', setup: BASE, formula: '=RATCHET.INVERTBAND(3.5,B1:B6,A1:A6,2)', expected: '#N/A', message: 'lower x limit' },
  { what: 'FIT curvature 2', setup: BASE, formula: '=RATCHET.FIT(B1:B6,A1:A6,3,1,,2)', expected: '#VALUE!', message: 'curvature' },
  { what: 'FIT curvature -1 with the classic fit', setup: BASE, formula: '=RATCHET.FIT(B1:B6,A1:A6,0,1,,-1)', expected: '#VALUE!', message: 'curvature: needs knots' },
  { what: 'FIT degree 2 with the classic fit', setup: BASE, formula: '=RATCHET.FIT(B1:B6,A1:A6,0,1,,0,2)', expected: '#VALUE!', message: 'degree: needs knots' },
  { what: 'PREDICT degree 3', setup: BASE, formula: '=RATCHET.PREDICT(3,B1:B6,A1:A6,3,1,,0,3)', expected: '#VALUE!', message: 'degree' },
  { what: 'PREDICT curvature text', setup: BASE, formula: '=RATCHET.PREDICT(3,B1:B6,A1:A6,3,1,,"concave")', expected: '#VALUE!', message: 'curvature' },
  { what: 'KNOTS curvature 0.5', setup: BASE, formula: '=RATCHET.KNOTS(B1:B6,A1:A6,3,1,,0.5)', expected: '#VALUE!', message: 'curvature' },
  { what: 'KNOTS degree 0', setup: BASE, formula: '=RATCHET.KNOTS(B1:B6,A1:A6,3,1,,0,0)', expected: '#VALUE!', message: 'degree' },
  { what: 'STATS curvature -2', setup: BASE, formula: '=RATCHET.STATS(B1:B6,A1:A6,3,1,,-2)', expected: '#VALUE!', message: 'curvature' },
  { what: 'STATS degree 2 with the classic fit', setup: BASE, formula: '=RATCHET.STATS(B1:B6,A1:A6,0,1,,0,2)', expected: '#VALUE!', message: 'degree' },
  { what: 'CV curvature 3', setup: BASE, formula: '=RATCHET.CV(B1:B6,A1:A6,{2;3},2,1,0,1,,3)', expected: '#VALUE!', message: 'curvature' },
  { what: 'CV with a shape and the classic fit among the candidates', setup: BASE, formula: '=RATCHET.CV(B1:B6,A1:A6,{0;2},2,1,0,1,,-1)', expected: '#VALUE!', message: 'candidates' },
  { what: 'BESTK degree 5', setup: BASE, formula: '=RATCHET.BESTK(B1:B6,A1:A6,{2;3},2,1,0,1,,1,0,5)', expected: '#VALUE!', message: 'degree' },
  { what: 'EVAL of a table whose third column is not a degree', setup: {}, formula: '=RATCHET.EVAL(1,{0,0,3;1,1,3;2,2,3})', expected: '#VALUE!', message: 'third column' },
  { what: 'EVAL of a smooth table with an even number of rows', setup: {}, formula: '=RATCHET.EVAL(1,{0,0,2;1,1,2})', expected: '#VALUE!', message: 'odd number of rows' },
  // ---- SURFACE, GRID, CVGRID: directions 1 rising, -1 falling, 0 from the data, 2 no constraint ----
  { what: 'GRID rising along both reproduces rising data on a 2 × 2 grid (hand)', setup: lattice([1, 2, 3, 4]), formula: '=RATCHET.GRID(B1:B4,A1:A4,C1:C4)', expected: [['', 0, 1], [0, 1, 2], [1, 3, 4]] },
  { what: 'GRID directions 0, 0 pick falling along both inputs (hand)', setup: GRID_FALLING, formula: '=RATCHET.GRID(B1:B4,A1:A4,C1:C4,0,0,0,0)', expected: [['', 0, 1], [0, 4, 3], [1, 2, 1]] },
  { what: 'GRID directions 1, 1 on the same data pool all four (hand)', setup: GRID_FALLING, formula: '=RATCHET.GRID(B1:B4,A1:A4,C1:C4,0,0,1,1)', expected: [['', 0, 1], [0, 2.5, 2.5], [1, 2.5, 2.5]] },
  { what: 'GRID directions 2, 2 (no constraint) reproduce data that rise and fall (hand)', setup: lattice([1, 4, 3, 2]), formula: '=RATCHET.GRID(B1:B4,A1:A4,C1:C4,0,0,2,2)', expected: [['', 0, 1], [0, 1, 4], [1, 3, 2]] },
  // Falling fit: at (0.25, 0) the surface is 0.75·4 + 0.25·3 = 3.75 (hand).
  { what: 'SURFACE with directions 0, 0 reads the falling lattice (hand)', setup: GRID_FALLING, formula: '=RATCHET.SURFACE(0.25,0,B1:B4,A1:A4,C1:C4,0,0,0,0)', expected: [[3.75]] },
  {
    what: 'CVGRID with directions 0, 0 against the core (core)',
    setup: lattice(CV_Y, CV_X1, CV_X2),
    formula: '=RATCHET.CVGRID(B1:B16,A1:A16,C1:C16,{2;3},2,4,1,0,0,0)',
    expected: [['knots1', 'knots2', 'cv_rmse', 'cv_se', 'cv_r2'], ...coreCvGrid.scores.map((c) => [c.knots1, c.knots2, c.cvRmse, c.cvSe, c.cvR2])],
  },
  { what: 'GRID direction1 3', setup: GRID_FALLING, formula: '=RATCHET.GRID(B1:B4,A1:A4,C1:C4,0,0,3)', expected: '#VALUE!', message: 'direction1: needs 1 (rising), -1 (falling), 0 (pick from the data) or 2 (no constraint); got 3' },
  { what: 'SURFACE direction2 -2', setup: GRID_FALLING, formula: '=RATCHET.SURFACE(0,0,B1:B4,A1:A4,C1:C4,0,0,1,-2)', expected: '#VALUE!', message: 'direction2: needs 1 (rising), -1 (falling), 0 (pick from the data) or 2 (no constraint); got -2' },
  { what: 'CVGRID direction1 0.5', setup: lattice(CV_Y, CV_X1, CV_X2), formula: '=RATCHET.CVGRID(B1:B16,A1:A16,C1:C16,2,2,4,1,0,0.5)', expected: '#VALUE!', message: 'direction1: needs 1 (rising)' },
  { what: 'GRID direction1 as text', setup: GRID_FALLING, formula: '=RATCHET.GRID(B1:B4,A1:A4,C1:C4,0,0,"auto")', expected: '#VALUE!', message: 'direction1' },
  // ---- errors: #N/A for an unreachable target; error cells propagate ----
  { what: 'INVERT target outside the curve', setup: TABLE, formula: '=RATCHET.INVERT(5,D1:E3)', expected: '#N/A', message: 'outside' },
  { what: 'a #DIV/0! cell inside a data range propagates', setup: xy([1, 3, { f: '1/0' }, 4, 6, 5]), formula: '=RATCHET.FIT(B1:B6,A1:A6)', expected: '#DIV/0!' },
  { what: 'a #N/A cell inside a data range propagates', setup: xy([1, 3, { f: 'NA()' }, 4, 6, 5]), formula: '=RATCHET.STATS(B1:B6,A1:A6)', expected: '#N/A' },
  { what: 'a #NUM! cell inside a data range propagates', setup: xy([1, 3, { f: 'SQRT(-1)' }, 4, 6, 5]), formula: '=RATCHET.KNOTS(B1:B6,A1:A6)', expected: '#NUM!' },
  { what: 'an error cell inside new_xs propagates', setup: { ...BASE, C1: { f: '1/0' } }, formula: '=RATCHET.PREDICT(C1:C1,B1:B6,A1:A6)', expected: '#DIV/0!' },
  { what: 'more arguments than the function takes is #VALUE! with a message (runner)', setup: TABLE, formula: '=RATCHET.EVAL(1,D1:E3,1)', expected: '#VALUE!', message: 'RATCHET.EVAL: takes at most 2 arguments; got 3' },
];

describe('formulas and expected values, evaluated by the runner', () => {
  // One workbook, one sheet per row, so every formula runs in the same engine.
  const setup: Setup = {};
  ROWS.forEach((row, i) => (setup[`T${i + 1}`] = { ...row.setup, H1: { f: row.formula.replace(/^=/, '') } }));
  const book = evaluate(setup);

  it('covers every RATCHET function', () => {
    const used = new Set(ROWS.flatMap((r) => [...r.formula.matchAll(/RATCHET[._]([A-Z]+)\(/g)].map((m) => m[1])));
    expect([...used].sort()).toEqual(['BAND', 'BESTK', 'CV', 'CVGRID', 'EVAL', 'FIT', 'GRID', 'INVERT', 'INVERTBAND', 'KNOTS', 'PREDICT', 'QKNOTS', 'STATS', 'SURFACE']);
  });

  it.each(ROWS.map((r, i) => [r.what, r, i] as const))('%s', (_what, row, i) => {
    const at = `T${i + 1}!H1`;
    if (typeof row.expected === 'string') {
      expect(book.value(at)).toBe(row.expected);
      // __SHEET__ stands for the row's sheet number (messages name cells as 'T7'!B3: quoted, as T7 alone reads as a cell).
      if (row.message !== undefined) expect(book.message(at) ?? '').toContain(row.message.replace('__SHEET__', String(i + 1)));
    } else {
      expect(closeBlock(book.result(at), row.expected)).toBeUndefined();
    }
  });
});
