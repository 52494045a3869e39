/**
 * The formulas the task pane inserts or offers to copy: RATCHET.KNOTS, PREDICT, STATS, CV,
 * BESTK, BAND and INVERTBAND over the chosen ranges, and the size of the area each result spills
 * into.
 * Pure functions, no host APIs.
 */

/** Direction codes as the worksheet functions take them. */
export type DirectionCode = 1 | -1 | 0;

/** References to the data, as text ready for a formula: absolute A1 or a table column. */
export interface DataRefs {
  readonly y: string;
  readonly x: string;
  readonly w?: string | undefined;
}

/** Curvature codes as the worksheet functions take them: 0 any, −1 concave, 1 convex. */
export type CurvatureCode = 0 | -1 | 1;

/** Degree codes as the worksheet functions take them: 1 piecewise linear, 2 smooth. */
export type DegreeCode = 1 | 2;

/** Fit settings of the pane. */
export interface FitSettings {
  /** 0 = classic fit, or a knot count ≥ 2. */
  readonly knots: number;
  readonly direction: DirectionCode;
  /** The shape: 0 any (default), −1 concave, 1 convex (the functions' `curvature`). */
  readonly curvature?: CurvatureCode | undefined;
  /** 1 piecewise linear (default), 2 smooth (the functions' `degree`). */
  readonly degree?: DegreeCode | undefined;
}

/**
 * The `curvature` and `degree` arguments as formula text: both omitted at their defaults (0 and
 * 1), so the pane's formulas for a plain fit stay as they were; `degree` alone leaves
 * `curvature` empty. Cost O(1).
 * @example shapeArgs({ knots: 4, direction: 1, degree: 2 }) // → [undefined, '2']
 */
export function shapeArgs(fit: FitSettings): [string | undefined, string | undefined] {
  const c = fit.curvature ?? 0;
  const d = fit.degree ?? 1;
  return [c === 0 ? undefined : String(c), d === 1 ? undefined : String(d)];
}

/** Cross-validation settings of the pane; `candidates` undefined = the functions' default. */
export interface CvSettings {
  readonly candidates?: readonly number[] | undefined;
  readonly folds: number;
  readonly repeats: number;
  readonly seed: number;
  /** 1 one-standard-error rule, 0 minimum. */
  readonly rule: 1 | 0;
}

/** The kinds of formula written from the fit and cross-validation settings alone (formulaFor). */
export type FitFormulaKind = 'KNOTS' | 'PREDICT' | 'STATS' | 'CV' | 'BESTK';

/** The kinds of formula the pane inserts: those of formulaFor, and BAND and INVERTBAND (bandFormulas). */
export type FormulaKind = FitFormulaKind | 'BAND' | 'INVERTBAND';

/** The band controls of the pane as BAND and INVERTBAND take them (see bandFormulas). */
export interface BandFormulaSettings {
  /** 0 < level < 1. */
  readonly level: number;
  /** 1 confidence band for the curve, 2 prediction band for one new observation. */
  readonly kind: 1 | 2;
  /** Readings averaged into each target of INVERTBAND, ≥ 1. */
  readonly replicates: number;
  /** INVERTBAND's target_ys: a reference or a number as formula text; undefined = no INVERTBAND. */
  readonly targets?: string | undefined;
}

/**
 * The candidates argument as formula text: `SEQUENCE(n,1,a)` for a run a, a+1, …, otherwise an
 * array constant `{0;2;5}`.
 * @example candidatesText([2, 3, 4]) // → "SEQUENCE(3,1,2)"
 */
export function candidatesText(c: readonly number[]): string {
  if (c.length === 1) return String(c[0]);
  const run = c.length > 1 && c.every((v, i) => i === 0 || v === c[i - 1]! + 1) && c[0] !== 0;
  if (run) return `SEQUENCE(${c.length},1,${c[0]})`;
  return `{${c.join(';')}}`;
}

/** Trailing optional arguments that are omitted are dropped; inner omitted ones stay empty. */
function argList(args: readonly (string | undefined)[]): string {
  let end = args.length;
  while (end > 0 && args[end - 1] === undefined) end--;
  return args
    .slice(0, end)
    .map((a) => a ?? '')
    .join(',');
}

/**
 * The formula text of one kind, e.g. `=RATCHET.KNOTS($B$2:$B$31,$A$2:$A$31,5,1)`.
 * `newXs` is the reference PREDICT reads (default: the x data).
 */
export function formulaFor(kind: FitFormulaKind, refs: DataRefs, fit: FitSettings, cv: CvSettings, newXs?: string): string {
  const w = refs.w;
  const k = String(fit.knots);
  const d = String(fit.direction);
  // curvature and degree come last in every one of these functions (README, "Shapes").
  const shape = shapeArgs(fit);
  switch (kind) {
    case 'KNOTS':
      return `=RATCHET.KNOTS(${argList([refs.y, refs.x, k, d, w, ...shape])})`;
    case 'STATS':
      return `=RATCHET.STATS(${argList([refs.y, refs.x, k, d, w, ...shape])})`;
    case 'PREDICT':
      return `=RATCHET.PREDICT(${argList([newXs ?? refs.x, refs.y, refs.x, k, d, w, ...shape])})`;
    case 'CV':
    case 'BESTK': {
      const cand = cv.candidates === undefined ? undefined : candidatesText(cv.candidates);
      const base = [refs.y, refs.x, cand, String(cv.folds), String(cv.repeats), String(cv.seed), d, w];
      if (kind === 'CV') return `=RATCHET.CV(${argList([...base, ...shape])})`;
      // BESTK has `rule` after weights; write it only when it is not the default (1) or a shape follows.
      return `=RATCHET.BESTK(${argList([...base, cv.rule === 1 ? undefined : '0', ...shape])})`;
    }
  }
}

/**
 * RATCHET.BAND and RATCHET.INVERTBAND for the pane's fit and band controls, with level, kind and
 * replicates written out (also when they are the defaults), so the formula says what it shows.
 * Both need the knot model with straight segments: for the classic fit (knots 0) and the smooth
 * curve (degree 2) the result is empty. INVERTBAND only when `band.targets` is given. A shape is
 * written last, as in the other formulas (shapeArgs). Cost O(1).
 * @param refs the data references; `newXs` BAND's new_xs (default: the x data).
 * @example bandFormulas({ y: '$B$2:$B$7', x: '$A$2:$A$7' }, { knots: 2, direction: 1 }, { level: 0.9, kind: 2, replicates: 1, targets: '15' }).INVERTBAND
 * // → '=RATCHET.INVERTBAND(15,$B$2:$B$7,$A$2:$A$7,2,1,,0.9,1)'
 */
export function bandFormulas(refs: DataRefs, fit: FitSettings, band: BandFormulaSettings, newXs?: string): Partial<Record<'BAND' | 'INVERTBAND', string>> {
  if (fit.knots === 0) return {};
  const head = [refs.y, refs.x, String(fit.knots), String(fit.direction), refs.w, String(band.level)];
  const shape = shapeArgs(fit);
  const out: Partial<Record<'BAND' | 'INVERTBAND', string>> = { BAND: `=RATCHET.BAND(${argList([newXs ?? refs.x, ...head, String(band.kind), ...shape])})` };
  if (band.targets !== undefined) out.INVERTBAND = `=RATCHET.INVERTBAND(${argList([band.targets, ...head, String(band.replicates), ...shape])})`;
  return out;
}

/** Every formula the pane offers, in display order. */
export function allFormulas(refs: DataRefs, fit: FitSettings, cv: CvSettings, newXs?: string): Record<FitFormulaKind, string> {
  return {
    KNOTS: formulaFor('KNOTS', refs, fit, cv),
    PREDICT: formulaFor('PREDICT', refs, fit, cv, newXs),
    STATS: formulaFor('STATS', refs, fit, cv),
    CV: formulaFor('CV', refs, fit, cv),
    BESTK: formulaFor('BESTK', refs, fit, cv),
  };
}

/** What the spill size of a result depends on, as computed by the core / functions. */
export interface SpillInputs {
  /** Rows of the knot table the functions return for these data and settings (RATCHET.KNOTS). */
  readonly knotRows: number;
  /** Columns of that table: 2, or 3 for a smooth fit's table (its third column of 2s); default 2. */
  readonly knotCols?: number | undefined;
  /** Number of candidates CV compares (the default list when none are given). */
  readonly candidates: number;
  /** Shape of PREDICT's and BAND's new_xs. */
  readonly newXs: { rows: number; cols: number };
  /** Shape of INVERTBAND's target_ys (default one cell). */
  readonly targets?: { rows: number; cols: number } | undefined;
}

/** Three values per cell of a line, as BAND and INVERTBAND spill them: a row → 3 rows, a column or one cell → 3 columns. */
function threeWide(shape: { rows: number; cols: number }): { rows: number; cols: number } {
  return shape.rows === 1 && shape.cols > 1 ? { rows: 3, cols: shape.cols } : { rows: shape.rows, cols: 3 };
}

/** Rows of the STATS table (n, dropped, knots, direction, r2, rmse, mae, sse, levels, text_rows, sigma, df_resid, spearman). */
export const STATS_ROWS = 13;
/** Columns of the CV table (knots, cv_rmse, cv_se, cv_r2, cv_mae, train_rmse). */
export const CV_COLS = 6;

/**
 * Rows × columns a result occupies from its anchor cell: KNOTS knotRows × 2 (× 3 for a smooth
 * fit), STATS 13 × 2, CV (candidates + 1 header row) × 6, PREDICT the shape of new_xs, BESTK
 * 1 × 1, BAND three values per new x and INVERTBAND three per target (three columns for a column
 * or one cell, three rows for a row).
 */
export function spillSize(kind: FormulaKind, s: SpillInputs): { rows: number; cols: number } {
  switch (kind) {
    case 'KNOTS':
      return { rows: s.knotRows, cols: s.knotCols ?? 2 };
    case 'STATS':
      return { rows: STATS_ROWS, cols: 2 };
    case 'CV':
      return { rows: s.candidates + 1, cols: CV_COLS };
    case 'PREDICT':
      return { rows: s.newXs.rows, cols: s.newXs.cols };
    case 'BESTK':
      return { rows: 1, cols: 1 };
    case 'BAND':
      return threeWide(s.newXs);
    case 'INVERTBAND':
      return threeWide(s.targets ?? { rows: 1, cols: 1 });
  }
}

/**
 * Parses the candidates field: blank → undefined (the default list); "2-12" or "2..12" a run;
 * "0, 2, 3, 5" a list (commas, semicolons or spaces). Each must be 0 or a whole number ≥ 2.
 * @throws Error with a message for the field.
 */
export function parseCandidates(text: string): number[] | undefined {
  const s = text.trim();
  if (s === '') return undefined;
  const run = /^(\d+)\s*(?:-|\.\.|…|to)\s*(\d+)$/.exec(s);
  let out: number[];
  if (run) {
    const a = Number(run[1]);
    const b = Number(run[2]);
    if (b < a) throw new Error(`Candidates: the run ${s} goes down; write the smaller count first.`);
    if (b - a > 999) throw new Error('Candidates: at most 1000 knot counts.');
    out = [];
    for (let k = a; k <= b; k++) out.push(k);
  } else {
    out = s.split(/[\s,;]+/).map((t) => Number(t));
  }
  for (const k of out) {
    if (!Number.isInteger(k) || k < 0 || k === 1) throw new Error(`Candidates: each must be 0 (classic) or a whole number ≥ 2; got "${s}".`);
  }
  if (new Set(out).size !== out.length) throw new Error('Candidates: each knot count may appear once.');
  return out;
}
