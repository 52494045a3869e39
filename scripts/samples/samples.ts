/**
 * The sample workbooks: invented scenarios with seeded, invented data, live RATCHET formulas, and
 * the values those formulas must produce.
 *
 * Expected values are computed here by calling the core directly (fitMonotone, predict,
 * invertAt, interpolate, quantileKnots, crossValidate, suggestKnots) — not by the runner or the
 * worksheet functions — so the sample tests compare two independent routes to the same numbers.
 * scripts/make-samples.ts writes the workbooks and samples/expected.json from these definitions.
 */
import {
  SplitMix64,
  crossValidate,
  crossValidateSurface,
  fitMonotone,
  fitSurface,
  interpolate,
  invertAt,
  predict,
  predictSurface,
  quantileKnots,
  suggestKnots,
  type DirectionOption,
  type MonotoneModel,
  type ModelOptions,
} from '../../src/core/index.js';

/** One expected cell: a number, text, logical, "" for a visibly empty cell, or an error code. */
export type ExpectedCell = number | string | boolean;

/** A formula placed in a sample, with the block of values it must produce. */
export interface SampleFormula {
  /** Top-left cell on the Data sheet, e.g. "D2". */
  readonly cell: string;
  /** Formula in the typed form, with "=" (written to the file in the stored form). */
  readonly formula: string;
  /** Expected result; one row of one cell for a scalar. */
  readonly expected: ExpectedCell[][];
  /** For an error result: a fragment the message must contain. */
  readonly message?: string;
}

/** Where a sample's data lie, for the demo (whole-sheet A1 ranges on the Data sheet). */
export interface SampleData {
  readonly ys: string;
  readonly xs: string;
  readonly weights?: string;
  /** 1, -1 or 0 as typed in a formula. */
  readonly direction: number;
  readonly xLabel: string;
  readonly yLabel: string;
  /** A surface sample: its second input (the demo then shows RATCHET.GRID, not a curve). */
  readonly x2s?: string;
  readonly x2Label?: string;
}

/** One sample workbook. */
export interface Sample {
  /** File name under samples/. */
  readonly file: string;
  readonly title: string;
  /** Lines of the About sheet (scenario, what each block shows, cautions). */
  readonly about: readonly string[];
  /** Column headers of the Data sheet, row 1, by column letter. */
  readonly headers: Readonly<Record<string, string>>;
  /** Input columns from row 2: column letter → values (null = blank cell). */
  readonly columns: Readonly<Record<string, readonly (number | null)[]>>;
  /** Single cells written as they are (text labels or numbers): cell → value. */
  readonly labels: Readonly<Record<string, string | number>>;
  readonly formulas: readonly SampleFormula[];
  readonly data: SampleData;
}

/** Uniform numbers in [0, 1) from SplitMix64 (53 random bits each). */
function uniforms(seed: number): () => number {
  const g = SplitMix64.fromSeed(seed);
  return () => {
    g.next();
    return ((g.hi >>> 5) * 67108864 + (g.lo >>> 6)) / 9007199254740992;
  };
}

/** Standard normal numbers by the Box–Muller transform of {@link uniforms}. */
function normals(seed: number): () => number {
  const u = uniforms(seed);
  return () => {
    const a = 1 - u();
    const b = u();
    return Math.sqrt(-2 * Math.log(a)) * Math.cos(2 * Math.PI * b);
  };
}

/** Rounds to `d` decimals (data are written as a person would record them). */
function round(v: number, d: number): number {
  const f = 10 ** d;
  return Math.round(v * f) / f;
}

const column = (values: ArrayLike<number>): number[][] => Array.from(values, (v) => [v]);
const table = (a: ArrayLike<number>, b: ArrayLike<number>): number[][] => Array.from(a, (v, i) => [v, b[i]!]);

const DIRECTION: Readonly<Record<number, DirectionOption>> = { 1: 'up', [-1]: 'down', 0: 'auto' };

/** Rows with x, y (and weight) all present, as the functions pair them. */
function paired(x: readonly (number | null)[], y: readonly (number | null)[], w?: readonly (number | null)[]) {
  const keep: number[] = [];
  for (let i = 0; i < y.length; i++) if (x[i] !== null && y[i] !== null && (w === undefined || w[i] !== null)) keep.push(i);
  return {
    keep,
    rows: y.length,
    x: keep.map((i) => x[i]!),
    y: keep.map((i) => y[i]!),
    w: w === undefined ? undefined : keep.map((i) => w[i]!),
  };
}

/** Average ranks (ties share the mean of their positions), 1-based. */
function ranks(v: readonly number[]): number[] {
  const order = v.map((_, i) => i).sort((a, b) => v[a]! - v[b]!);
  const r = new Array<number>(v.length);
  for (let i = 0; i < order.length; ) {
    let j = i;
    while (j + 1 < order.length && v[order[j + 1]!] === v[order[i]!]) j++;
    for (let k = i; k <= j; k++) r[order[k]!] = (i + j) / 2 + 1;
    i = j + 1;
  }
  return r;
}

/** STATS rows sigma, df_resid, spearman: σ̂ = √(SSE / (n_used − levels)), Pearson correlation of average ranks. */
function spreadRows(p: ReturnType<typeof paired>, m: MonotoneModel): ExpectedCell[][] {
  const used = p.keep.map((_, k) => k).filter((k) => p.w === undefined || p.w[k]! > 0);
  const df = used.length - m.levels;
  const rx = ranks(used.map((k) => p.x[k]!));
  const ry = ranks(used.map((k) => p.y[k]!));
  const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
  const mx = mean(rx);
  const my = mean(ry);
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < rx.length; i++) {
    sxy += (rx[i]! - mx) * (ry[i]! - my);
    sxx += (rx[i]! - mx) ** 2;
    syy += (ry[i]! - my) ** 2;
  }
  return [
    ['sigma', Math.sqrt(m.stats.sse / df)],
    ['df_resid', df],
    ['spearman', sxy / Math.sqrt(sxx * syy)],
  ];
}

function model(x: readonly (number | null)[], y: readonly (number | null)[], knots: ModelOptions['knots'], dir: number, w?: readonly (number | null)[]) {
  const p = paired(x, y, w);
  const m = fitMonotone(p.x, p.y, { knots, direction: DIRECTION[dir], weights: p.w });
  // Fitted values back in row order; left-out rows are "".
  const fitted: ExpectedCell[][] = Array.from({ length: p.rows }, () => ['']);
  p.keep.forEach((row, k) => (fitted[row] = [m.fitted[k]!]));
  const stats: ExpectedCell[][] = [
    ['n', p.keep.length],
    ['dropped', p.rows - p.keep.length],
    ['knots', m.knotX.length],
    ['direction', m.direction === 'up' ? 1 : -1],
    ['r2', m.stats.r2],
    ['rmse', m.stats.rmse],
    ['mae', m.stats.mae],
    ['sse', m.stats.sse],
    ['levels', m.levels],
    // No sample holds text in its data ranges (text_rows 0); sigma, df_resid and spearman are
    // written out here from their definitions (README, "STATS rows for uncertainty"), not taken
    // from the worksheet code.
    ['text_rows', 0],
    ...spreadRows(p, m),
  ];
  return { m, fitted, stats, knotTable: table(m.knotX, m.knotY) as ExpectedCell[][] };
}

const CV_HEADER = ['knots', 'cv_rmse', 'cv_se', 'cv_r2', 'cv_mae', 'train_rmse'];

function cvTable(x: readonly number[], y: readonly number[], candidates: number[], folds: number, repeats: number, seed: number, dir: number) {
  const r = crossValidate(x, y, { candidates, folds, repeats, seed, direction: DIRECTION[dir] });
  const rows: ExpectedCell[][] = [CV_HEADER, ...r.scores.map((s) => [s.knots, s.cvRmse, s.cvSe, s.cvR2, s.cvMae, s.trainRmse])];
  return { rows, oneSe: suggestKnots(r.scores, 'one-se').knots, min: suggestKnots(r.scores, 'min').knots, scores: r.scores };
}

const range = (from: number, to: number): number[] => Array.from({ length: to - from + 1 }, (_, i) => from + i);

/** Lines every About sheet carries. */
const COMMON_CAUTIONS = [
  'Cautions:',
  '• The scenario, the numbers and the units in this workbook are invented to show how the functions work. They describe no real product, process, instrument or laboratory.',
  '• A monotone fit assumes the response can only rise (or only fall) with x. If that is not known to be true for your process, the fit hides real features of the data.',
  '• Beyond the smallest and largest x the curve is held flat: predictions there are not measurements. Do not extrapolate.',
  '• With few points, every estimate here (the fit, R², cross-validation scores, the suggested knot count) is uncertain.',
  '• Where a standard, a specification or a method statement governs your work, follow it; this workbook does not replace it.',
  '',
  'If the formulas show #NAME?: load the Ratchet add-in (Home ▸ Add-ins, or Insert ▸ My Add-ins), then recalculate with Ctrl+Alt+F9 (Mac: Formulas ▸ Calculate Now). If cells still show #NAME?, press Ctrl+Shift+Alt+F9, which checks every formula again and recalculates the whole workbook.',
  'Results that fill several cells are saved as dynamic arrays: when their data change they spill again to the size they need.',
  'Without Excel: `npm run sheet -- samples/<file>.xlsx` evaluates this workbook headlessly.',
];

function kiln(): Sample {
  const z = normals(20261);
  const u = uniforms(20262);
  const n = 28;
  const temp: number[] = [];
  const strength: number[] = [];
  for (let i = 0; i < n; i++) {
    // Firing temperatures from 880 °C to 1240 °C, recorded to the nearest 5 °C (some repeat).
    const t = 5 * Math.round((880 + (360 * i) / (n - 1) + 10 * (u() - 0.5)) / 5);
    const mean = 8 + 42 * (1 - Math.exp(-(t - 860) / 110));
    temp.push(t);
    strength.push(round(mean + 2.2 * z(), 1));
  }
  const last = n + 1;
  const Y = `B2:B${last}`;
  const X = `A2:A${last}`;
  const classic = model(temp, strength, 0, 1);
  const five = model(temp, strength, 5, 1);
  const newT = [900, 1000, 1100, 1300];
  return {
    file: 'kiln-strength.xlsx',
    title: 'Kiln firing temperature and fired-brick crushing strength',
    about: [
      'Ratchet sample: kiln firing temperature vs crushing strength of fired bricks (invented).',
      '',
      'Scenario (invented): a brickworks fires test bricks at temperatures from 880 °C to 1240 °C and crushes them. Strength rises with temperature and then levels off.',
      'Data sheet: column A firing temperature (°C), column B crushing strength (MPa); 28 invented test bricks from a seeded random generator.',
      'D: the classic monotone fit at every temperature; E: the fit with 5 evenly spaced knots — side by side.',
      'G:H the classic model as a knot table; J:K the 5-knot table; M:N and P:Q the fit statistics of each.',
      'S: new temperatures; T and U: both curves read there. 1300 °C lies beyond the data: the curve is held flat, which is not a measurement.',
      '',
      ...COMMON_CAUTIONS,
    ],
    headers: { A: 'temperature °C', B: 'strength MPa', D: 'classic fit', E: '5-knot fit', G: 'classic knots: x', H: 'value', J: '5 knots: x', K: 'value', M: 'classic', P: '5 knots', S: 'new temperature', T: 'classic', U: '5 knots' },
    columns: { A: temp, B: strength, S: newT },
    labels: {},
    formulas: [
      { cell: 'D2', formula: `=RATCHET.FIT(${Y},${X})`, expected: classic.fitted },
      { cell: 'E2', formula: `=RATCHET.FIT(${Y},${X},5)`, expected: five.fitted },
      { cell: 'G2', formula: `=RATCHET.KNOTS(${Y},${X})`, expected: classic.knotTable },
      { cell: 'J2', formula: `=RATCHET.KNOTS(${Y},${X},5)`, expected: five.knotTable },
      { cell: 'M2', formula: `=RATCHET.STATS(${Y},${X})`, expected: classic.stats },
      { cell: 'P2', formula: `=RATCHET.STATS(${Y},${X},5)`, expected: five.stats },
      { cell: 'T2', formula: `=RATCHET.PREDICT(S2:S5,${Y},${X})`, expected: column(predict(classic.m, newT)) },
      { cell: 'U2', formula: `=RATCHET.PREDICT(S2:S5,${Y},${X},5)`, expected: column(predict(five.m, newT)) },
    ],
    data: { ys: Y, xs: X, direction: 1, xLabel: 'firing temperature (°C)', yLabel: 'crushing strength (MPa)' },
  };
}

function adhesive(): Sample {
  const z = normals(7351);
  const weeks = range(0, 25).map((i) => 2 * i);
  const tack: (number | null)[] = weeks.map((w) => round(2 + 12 * Math.exp(-w / 22) + 0.55 * z(), 2));
  tack[9] = null; // week 18: the measurement was missed, the cell is left blank
  const last = weeks.length + 1;
  const Y = `B2:B${last}`;
  const X = `A2:A${last}`;
  const down = model(weeks, tack, 0, -1);
  const auto = model(weeks, tack, 0, 0);
  const four = model(weeks, tack, 4, -1);
  const rising = model(weeks, tack, 0, 1);
  const later = [10, 25, 60];
  return {
    file: 'adhesive-tack.xlsx',
    title: 'Weeks in storage and remaining adhesive tack',
    about: [
      'Ratchet sample: weeks in storage vs remaining tack of an adhesive tape (invented).',
      '',
      'Scenario (invented): rolls of a pressure-sensitive tape are stored and a strip is peel-tested every two weeks. Tack can only fall with storage time.',
      'Data sheet: column A weeks in storage, column B tack (N per 25 mm); week 18 was not measured and is left blank — every function leaves that row out, and STATS counts it under "dropped".',
      'D: classic fit told to fall (direction −1); E: direction 0 lets the data choose (it picks falling); F: falling fit with 4 knots.',
      'H:I the 4-knot table; K:L statistics of the automatic fit (direction shows −1); N:O statistics of the 4-knot fit.',
      'Q: the same data forced to rise (direction 1, the default) — for comparison only: a wrong direction flattens the curve to a constant, and its R² of 0 says so.',
      'S: weeks at which to read the 4-knot curve; T: the readings. Week 60 lies beyond the data: the curve is held flat there, which is not a measurement.',
      '',
      ...COMMON_CAUTIONS,
    ],
    headers: { A: 'weeks', B: 'tack N/25mm', D: 'falling (-1)', E: 'auto (0)', F: '4 knots, falling', H: '4 knots: x', I: 'value', K: 'auto', N: '4 knots', Q: 'forced rising', S: 'week', T: '4-knot curve' },
    columns: { A: weeks, B: tack, S: later },
    labels: {},
    formulas: [
      { cell: 'D2', formula: `=RATCHET.FIT(${Y},${X},0,-1)`, expected: down.fitted },
      { cell: 'E2', formula: `=RATCHET.FIT(${Y},${X},0,0)`, expected: auto.fitted },
      { cell: 'F2', formula: `=RATCHET.FIT(${Y},${X},4,-1)`, expected: four.fitted },
      { cell: 'H2', formula: `=RATCHET.KNOTS(${Y},${X},4,-1)`, expected: four.knotTable },
      { cell: 'K2', formula: `=RATCHET.STATS(${Y},${X},0,0)`, expected: auto.stats },
      { cell: 'N2', formula: `=RATCHET.STATS(${Y},${X},4,-1)`, expected: four.stats },
      { cell: 'Q2', formula: `=RATCHET.FIT(${Y},${X})`, expected: rising.fitted },
      { cell: 'T2', formula: `=RATCHET.PREDICT(S2:S4,${Y},${X},4,-1)`, expected: column(predict(four.m, later)) },
    ],
    data: { ys: Y, xs: X, direction: -1, xLabel: 'weeks in storage', yLabel: 'tack (N/25 mm)' },
  };
}

function calibration(): Sample {
  const z = normals(4242);
  const u = uniforms(4243);
  const conc = [0, 0.5, 1, 2, 3, 5, 8, 12, 16, 20, 25, 30];
  const reps: number[] = conc.map(() => 2 + Math.floor(4 * u()));
  const signal = conc.map((c, i) => round(0.015 + (0.92 * c) / (1 + 0.011 * c) + (0.06 * z()) / Math.sqrt(reps[i]!), 4));
  const last = conc.length + 1;
  const Y = `B2:B${last}`;
  const X = `A2:A${last}`;
  const W = `C2:C${last}`;
  const positions = [0, 2, 5, 12, 30];
  const knotted = model(conc, signal, positions, 1, reps);
  const weightedClassic = model(conc, signal, 0, 1, reps);
  const top = knotted.m.knotY[knotted.m.knotY.length - 1]!;
  // Unknown samples' signals spread over the calibrated range.
  const unknowns = [0.04, 0.19, 0.43, 0.68, 0.91].map((f) => round(f * top, 3));
  const back = unknowns.map((t) => invertAt(knotted.m.knotX, knotted.m.knotY, t, 'middle'));
  const tooHigh = round(top + 3, 1);
  const tableRef = 'J2:K6';
  return {
    file: 'lab-calibration.xlsx',
    title: 'Laboratory calibration: standard concentration and instrument signal',
    about: [
      'Ratchet sample: a calibration curve read backwards (invented).',
      '',
      'Scenario (invented): a laboratory runs twelve standards of known concentration (mg/L) through an instrument; each standard is measured 2 to 5 times and the mean signal is recorded with its replicate count. The signal rises with concentration and bends slightly at the top.',
      'Data sheet: column A standard concentration (mg/L), column B mean signal, column C replicate count, used as the weight of each mean.',
      'D: the weighted classic fit. H: chosen knot positions (0, 2, 5, 12, 30 mg/L); J:K the weighted knot model at those positions — the calibration curve.',
      'M: signals of unknown samples; N: RATCHET.INVERT reads their concentrations back from the curve; O: RATCHET.EVAL reads the curve at those concentrations, which returns the signals (a round-trip check).',
      'M8: a signal above the highest standard; N8 shows #N/A because no concentration on the curve gives it — a reading outside the calibrated range must not be reported.',
      'Q:R statistics of the weighted knot fit.',
      '',
      ...COMMON_CAUTIONS,
    ],
    headers: { A: 'conc mg/L', B: 'signal', C: 'replicates', D: 'weighted classic fit', H: 'knot positions', J: 'curve: conc', K: 'signal', M: 'unknown signal', N: 'conc read back', O: 'curve at conc', Q: 'weighted 5-knot fit' },
    columns: { A: conc, B: signal, C: reps, H: positions, M: unknowns },
    labels: { L8: 'above range:', M8: tooHigh },
    formulas: [
      { cell: 'D2', formula: `=RATCHET.FIT(${Y},${X},0,1,${W})`, expected: weightedClassic.fitted },
      { cell: 'J2', formula: `=RATCHET.KNOTS(${Y},${X},H2:H6,1,${W})`, expected: knotted.knotTable },
      { cell: 'N2', formula: `=RATCHET.INVERT(M2:M6,${tableRef})`, expected: column(back) },
      { cell: 'O2', formula: `=RATCHET.EVAL(N2:N6,${tableRef})`, expected: column(interpolate(knotted.m.knotX, knotted.m.knotY, back)) },
      { cell: 'N8', formula: `=RATCHET.INVERT(M8,${tableRef})`, expected: [['#N/A']], message: 'outside' },
      { cell: 'Q2', formula: `=RATCHET.STATS(${Y},${X},H2:H6,1,${W})`, expected: knotted.stats },
    ],
    data: { ys: Y, xs: X, weights: W, direction: 1, xLabel: 'concentration (mg/L)', yLabel: 'instrument signal' },
  };
}

function knotStudy(): Sample {
  const z = normals(99);
  const u = uniforms(100);
  const n = 40;
  // Unsorted x in [0, 100] (rows in the order they were "measured").
  const x = range(1, n).map(() => round(100 * u(), 1));
  const y = x.map((v) => round(10 + 30 / (1 + Math.exp(-(v - 50) / 9)) + 2.5 * z(), 2));
  const last = n + 1;
  const Y = `B2:B${last}`;
  const X = `A2:A${last}`;
  const cands = range(2, 20);
  const cv = cvTable(x, y, cands, 5, 1, 1, 1);
  const best = model(x, y, cv.oneSe, 1);
  const q = quantileKnots(x, cv.oneSe);
  const qFit = model(x, y, q, 1);
  // Few points: the first 12 rows only, three shuffles, both rules.
  const fewX = x.slice(0, 12);
  const fewY = y.slice(0, 12);
  const few = [1, 2, 3].map((seed) => cvTable(fewX, fewY, range(2, 6), 5, 1, seed, 1));
  const seq = 'SEQUENCE(19,1,2)';
  return {
    file: 'knot-count-study.xlsx',
    title: 'How many knots? A cross-validation study',
    about: [
      'Ratchet sample: choosing the knot count by cross-validation (invented).',
      '',
      'Scenario (invented): a response that rises in an S shape over a setting from 0 to 100, measured 40 times in random order with noise. The data come from a seeded random generator.',
      'Data sheet: column A setting, column B response.',
      'D:I RATCHET.CV over 2 to 20 knots (candidates SEQUENCE(19,1,2)), 5 folds, seed 1: cv_rmse, its standard error, cv_r2, cv_mae and the training RMSE. Training RMSE keeps falling as knots are added; cv_rmse does not — the gap is over-fitting.',
      'L:M RATCHET.BESTK under the one-standard-error rule (rule 1: the fewest knots whose cv_rmse is within one standard error of the best) and under the minimum rule (rule 0).',
      'O: knots at that many data quantiles (RATCHET.QKNOTS); P:Q the model with the suggested count of evenly spaced knots; S: the fit with the quantile knots.',
      'L6:N10: the same suggestion from the first 12 rows only, with three different shuffles (seeds 1, 2, 3), under both rules. Cross-validation on few points is noisy: the suggestion can change with the shuffle alone (here the minimum rule does). Prefer more data, more repeats, and judgement over a single number.',
      '',
      ...COMMON_CAUTIONS,
    ],
    headers: { A: 'setting', B: 'response', D: 'cross-validation', L: 'suggestion', O: 'quantile knots', P: 'suggested: x', Q: 'value', S: 'fit at quantile knots' },
    columns: { A: x, B: y },
    labels: { L2: 'one-SE rule', L3: 'minimum rule', L6: 'first 12 rows only, 2 to 6 knots:', M7: 'one-SE', N7: 'minimum', L8: 'seed 1', L9: 'seed 2', L10: 'seed 3' },
    formulas: [
      { cell: 'D2', formula: `=RATCHET.CV(${Y},${X},${seq},5,1,1)`, expected: cv.rows },
      { cell: 'M2', formula: `=RATCHET.BESTK(${Y},${X},${seq},5,1,1,1,,1)`, expected: [[cv.oneSe]] },
      { cell: 'M3', formula: `=RATCHET.BESTK(${Y},${X},${seq},5,1,1,1,,0)`, expected: [[cv.min]] },
      { cell: 'O2', formula: `=RATCHET.QKNOTS(${X},M2)`, expected: column(q) },
      { cell: 'P2', formula: `=RATCHET.KNOTS(${Y},${X},M2)`, expected: best.knotTable },
      { cell: 'S2', formula: `=RATCHET.FIT(${Y},${X},RATCHET.QKNOTS(${X},M2))`, expected: qFit.fitted },
      ...few.flatMap((c, i) => [
        { cell: `M${8 + i}`, formula: `=RATCHET.BESTK(B2:B13,A2:A13,SEQUENCE(5,1,2),5,1,${i + 1},1,,1)`, expected: [[c.oneSe]] },
        { cell: `N${8 + i}`, formula: `=RATCHET.BESTK(B2:B13,A2:A13,SEQUENCE(5,1,2),5,1,${i + 1},1,,0)`, expected: [[c.min]] },
      ]),
    ],
    data: { ys: Y, xs: X, direction: 1, xLabel: 'setting', yLabel: 'response' },
  };
}

/** A surface fit's lattice as RATCHET.GRID lays it out: corner "", x1 knots across, x2 knots down. */
function gridTable(m: { knots1: Float64Array; knots2: Float64Array; values: Float64Array }): ExpectedCell[][] {
  const k1 = m.knots1.length;
  const out: ExpectedCell[][] = [['', ...Array.from(m.knots1)]];
  for (let b = 0; b < m.knots2.length; b++) out.push([m.knots2[b]!, ...Array.from(m.values.subarray(b * k1, (b + 1) * k1))]);
  return out;
}

function curing(): Sample {
  const z = normals(5150);
  const u = uniforms(5151);
  const temps = [140, 150, 160, 170, 180, 190, 200];
  const dwells = [5, 10, 15, 20, 25, 30];
  const temp: number[] = [];
  const dwell: number[] = [];
  const hardness: number[] = [];
  for (const t of temps) {
    for (const d of dwells) {
      // One panel per setting, a second one at about a quarter of them.
      const copies = u() < 0.25 ? 2 : 1;
      for (let c = 0; c < copies; c++) {
        const mean = 18 + 62 * (1 - Math.exp(-(t - 128) / 30)) * (1 - Math.exp(-d / 9));
        temp.push(t);
        dwell.push(d);
        hardness.push(round(mean + 3 * z(), 1));
      }
    }
  }
  const n = temp.length;
  const last = n + 1;
  const Y = `C2:C${last}`;
  const X1 = `A2:A${last}`;
  const X2 = `B2:B${last}`;
  const classic = fitSurface(temp, dwell, hardness);
  const lattice = fitSurface(temp, dwell, hardness, { knots1: 4, knots2: 3 });
  // Directions 0, 0: each chosen from the data (the sign of its rank correlation with hardness).
  const chosen = fitSurface(temp, dwell, hardness, { knots1: 4, knots2: 3, direction1: 'auto', direction2: 'auto' });
  // Directions 1, 2: rising in temperature, no constraint along dwell time.
  const freeDwell = fitSurface(temp, dwell, hardness, { knots1: 4, knots2: 3, direction1: 'up', direction2: 'none' });
  // New settings to read; the last lies beyond both data ranges (flat extrapolation).
  const newT = [145, 165, 175, 195, 230];
  const newD = [8, 12, 22, 28, 45];
  const cands = [2, 3, 4];
  const cv = crossValidateSurface(temp, dwell, hardness, { candidates1: cands, candidates2: cands, folds: 5, repeats: 1, seed: 1 });
  const cvRows: ExpectedCell[][] = [['knots1', 'knots2', 'cv_rmse', 'cv_se', 'cv_r2'], ...cv.scores.map((s) => [s.knots1, s.knots2, s.cvRmse, s.cvSe, s.cvR2])];
  const classicRows = classic.knots2.length + 1;
  const latticeAt = classicRows + 4; // row of the 4 × 3 GRID, below the classic one and its label
  const chosenAt = latticeAt + 6; // the same lattice with directions 0, 0, below it and its label
  const freeAt = chosenAt + 6; // and with directions 1, 2
  const seq = 'SEQUENCE(3,1,2)';
  return {
    file: 'coating-cure.xlsx',
    title: 'Curing-oven temperature and dwell time vs coating hardness (a monotone surface)',
    about: [
      'Ratchet sample: a surface monotone in two inputs — oven temperature and dwell time vs hardness of a cured coating (invented).',
      '',
      `Scenario (invented): steel test panels are painted and cured in an oven at 140 to 200 °C for 5 to 30 minutes, then scratch-tested. The hardness index (an invented 0–100 scale) rises with temperature and with time and levels off. ${n} invented panels from a seeded random generator; about a quarter of the settings were tested twice.`,
      'Data sheet: column A oven temperature (°C), column B dwell time (min), column C hardness index.',
      `E:L RATCHET.GRID with knots 0, 0 — the classic case: one value at every temperature × every dwell time (${temps.length} × ${dwells.length} = ${temps.length * dwells.length} values). The first row holds the temperatures, the first column the dwell times.`,
      `E${latticeAt}:I${latticeAt + 3} RATCHET.GRID with 4 × 3 evenly spaced knots (12 values): the same data with far fewer numbers; between knots the surface is bilinear.`,
      `E${chosenAt}:I${chosenAt + 3} the same 4 × 3 lattice with directions 0, 0: each direction chosen from the data by the sign of the rank correlation of that input with hardness. Hardness rises with both here, so the table equals the one above.`,
      `E${freeAt}:I${freeAt + 3} the same lattice with directions 1, 2: rising in temperature, no constraint along dwell time (direction 2) — for comparison: where the two tables differ, the free fit lets hardness fall with longer dwell, which the rising fit rules out.`,
      'N:O new settings; P the 4 × 3 surface read there (RATCHET.SURFACE); Q the classic surface. The last setting, 230 °C for 45 min, lies beyond both data ranges: the surface is held flat there — that value is the corner of the lattice, not a measurement.',
      'S:W RATCHET.CVGRID: 5-fold cross-validation (seed 1) of every pair of 2, 3 or 4 knots per input. Compare cv_rmse with cv_se before preferring a larger lattice.',
      '',
      'Cautions:',
      '• The scenario, the numbers and the units in this workbook are invented to show how the functions work. They describe no real coating, oven, test method or laboratory.',
      '• A monotone surface assumes the response can only rise (or only fall) with each input separately, the other held fixed. If that is not known to be true for your process in both inputs, the fit hides real features of the data (a peak, an over-cure).',
      '• The number of fitted values grows as knots1 × knots2. A lattice with nearly as many values as data points follows the noise (over-fit); the classic case here has almost one value per panel. Prefer the smallest lattice that cross-validation cannot tell apart from the best.',
      '• Beyond the smallest and largest value of each input the surface is held flat: predictions there are not measurements. Do not extrapolate.',
      '• With few points per setting, every estimate here (the lattice, the cross-validation scores) is uncertain.',
      '• Where a standard, a specification or a method statement governs your work, follow it; this workbook does not replace it.',
      ...COMMON_CAUTIONS.slice(COMMON_CAUTIONS.indexOf('')),
    ],
    headers: { A: 'oven temp °C', B: 'dwell min', C: 'hardness', E: 'classic lattice (GRID, knots 0, 0)', N: 'new temp °C', O: 'new dwell min', P: '4 × 3 surface', Q: 'classic surface', S: 'cross-validation (CVGRID)' },
    columns: { A: temp, B: dwell, C: hardness, N: newT, O: newD },
    labels: { [`E${latticeAt - 1}`]: '4 × 3 knots (GRID)', [`E${chosenAt - 1}`]: '4 × 3, directions 0, 0 (from the data)', [`E${freeAt - 1}`]: '4 × 3, directions 1, 2 (dwell free)' },
    formulas: [
      { cell: 'E2', formula: `=RATCHET.GRID(${Y},${X1},${X2},0,0)`, expected: gridTable(classic) },
      { cell: `E${latticeAt}`, formula: `=RATCHET.GRID(${Y},${X1},${X2},4,3)`, expected: gridTable(lattice) },
      { cell: `E${chosenAt}`, formula: `=RATCHET.GRID(${Y},${X1},${X2},4,3,0,0)`, expected: gridTable(chosen) },
      { cell: `E${freeAt}`, formula: `=RATCHET.GRID(${Y},${X1},${X2},4,3,1,2)`, expected: gridTable(freeDwell) },
      { cell: 'P2', formula: `=RATCHET.SURFACE(N2:N6,O2:O6,${Y},${X1},${X2},4,3)`, expected: column(predictSurface(lattice, newT, newD)) },
      { cell: 'Q2', formula: `=RATCHET.SURFACE(N2:N6,O2:O6,${Y},${X1},${X2})`, expected: column(predictSurface(classic, newT, newD)) },
      { cell: 'S2', formula: `=RATCHET.CVGRID(${Y},${X1},${X2},${seq},${seq},5,1,1)`, expected: cvRows },
    ],
    data: { ys: Y, xs: X1, x2s: X2, direction: 1, xLabel: 'oven temperature (°C)', x2Label: 'dwell time (min)', yLabel: 'hardness index' },
  };
}

/** All samples, in the order the demo shows them. */
export function buildSamples(): Sample[] {
  return [kiln(), adhesive(), calibration(), knotStudy(), curing()];
}
