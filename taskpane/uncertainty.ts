/**
 * What the pane shows about the uncertainty of a fit — the band around the curve, the residuals,
 * the read-back interval and the direction check — computed by the worksheet functions
 * themselves (RATCHET.BAND, INVERTBAND, INVERT and FIT through the registry, analysis.ts) and the
 * core's documented direction rule. No fitting or band arithmetic lives here: only the grid of x
 * at which the band is drawn, conversions of cells, and the sentences the pane shows.
 * DOM-free (unit-tested in test/taskpane/uncertainty.test.ts).
 */
import { checkDirection, type DirectionWarning } from '../src/core/index.js';
import type { CellArg, CellOut, CellValueIn } from '../src/functions/types.js';
import { CellFailure, columnArg, fitArgs, run, type DataColumns, type FitView } from './analysis.js';
import type { FitSettings } from './formulas.js';

/** The band controls: level (as typed: the function checks it) and kind (1 confidence, 2 prediction). */
export interface BandControls {
  readonly level: string | number;
  readonly kind: 1 | 2;
}

/** A band as drawn: the x of the grid and RATCHET.BAND's lower, fitted and upper value at each. */
export interface BandView {
  readonly level: number;
  readonly kind: 1 | 2;
  readonly x: readonly number[];
  readonly lower: readonly number[];
  readonly fit: readonly number[];
  readonly upper: readonly number[];
}

/** The rows the fit used, in data order: x, y, weight (1 without weights) and RATCHET.FIT's value. */
export interface UsedRows {
  readonly x: readonly number[];
  readonly y: readonly number[];
  readonly w: readonly number[];
  readonly fitted: readonly number[];
}

/**
 * The x at which the band is drawn: `steps` + 1 evenly spaced x from the smallest to the largest
 * data x, merged with the knot positions (where the band's edges have corners), sorted, without
 * repeats. Beyond the data the band is that of the end value, so nothing outside is needed.
 * Cost O((steps + K) log(steps + K)).
 * @param xs the x of the rows used (at least one).
 * @param knotXs the knot positions (RATCHET.KNOTS' first column); may be empty.
 * @param steps intervals of the even grid, a whole number ≥ 1; default 120.
 * @returns [] when `xs` is empty; one x when all x are equal.
 * @example bandGrid([0, 1, 2], [0, 0.5, 2], 4) // → [0, 0.5, 1, 1.5, 2]
 */
export function bandGrid(xs: readonly number[], knotXs: readonly number[], steps = 120): number[] {
  if (xs.length === 0) return [];
  let lo = Infinity;
  let hi = -Infinity;
  for (const x of xs) {
    if (x < lo) lo = x;
    if (x > hi) hi = x;
  }
  const out = new Set<number>();
  for (let i = 0; i <= steps; i++) out.add(i === steps ? hi : lo + ((hi - lo) * i) / steps);
  for (const k of knotXs) if (k >= lo && k <= hi) out.add(k);
  return [...out].sort((a, b) => a - b);
}

/**
 * The BAND / INVERTBAND arguments after their first: known_ys, known_xs, knots, direction,
 * weights, level, `own` (kind or replicates), then curvature and degree when not the defaults.
 */
function bandArgs(first: CellArg, data: DataColumns, fit: FitSettings, level: string | number, own: CellArg): CellArg[] {
  const c = fit.curvature ?? 0;
  const d = fit.degree ?? 1;
  const args: CellArg[] = [first, columnArg(data.y), columnArg(data.x), fit.knots, fit.direction, data.w ? columnArg(data.w) : undefined, level, own, c === 0 ? undefined : c, d === 1 ? undefined : d];
  while (args[args.length - 1] === undefined) args.pop();
  return args;
}

/**
 * The band of the fit at the x of `grid`, by RATCHET.BAND with the same data and settings as the
 * fit shown. Cost: one BAND call (the functions' cache keeps the band model of the data).
 * @param grid the x to evaluate at (bandGrid), at least one.
 * @throws CellFailure with BAND's code and message: knots 0 (the classic fit has no band), too
 *   few rows for the fitted groups, a level outside
 *   (0, 1), any problem of the data.
 * @example computeBand({ x: [1, 2, 3, 4, 5, 6], y: [10, 12, 13, 16, 18, 21] }, { knots: 2, direction: 1 }, { level: 0.95, kind: 1 }, [3.5]).upper[0]
 * // → 15.690798077065656
 */
export function computeBand(data: DataColumns, fit: FitSettings, controls: BandControls, grid: readonly number[]): BandView {
  const out = run('BAND', bandArgs(columnArg(grid), data, fit, controls.level, controls.kind));
  const rows = Array.isArray(out) ? out : [[out]];
  const num = (v: CellOut | undefined): number => (typeof v === 'number' ? v : NaN);
  return {
    level: Number(controls.level),
    kind: controls.kind,
    x: [...grid],
    lower: rows.map((r) => num(r[0])),
    fit: rows.map((r) => num(r[1])),
    upper: rows.map((r) => num(r[2])),
  };
}

/**
 * The rows the fit used (those RATCHET.FIT gives a number), with their weights and fitted values.
 * Cost: one FIT call (cached by the functions when the pane has just fitted the same data).
 * @throws CellFailure when FIT returns an error for these data.
 * @example usedRows({ x: [1, 2, null, 4], y: [1, 3, 2, 2] }, { knots: 0, direction: 1 }).fitted // → [1, 2.5, 2.5]
 */
export function usedRows(data: DataColumns, fit: FitSettings): UsedRows {
  const out = run('FIT', fitArgs(data, fit));
  const rows = Array.isArray(out) ? out : [[out]];
  const x: number[] = [];
  const y: number[] = [];
  const w: number[] = [];
  const fitted: number[] = [];
  rows.forEach((r, i) => {
    const f = r[0];
    if (typeof f !== 'number') return;
    x.push(data.x[i] as number);
    y.push(data.y[i] as number);
    w.push(data.w ? (data.w[i] as number) : 1);
    fitted.push(f);
  });
  return { x, y, w, fitted };
}

/**
 * Residuals y − fitted of the rows used, against x, for the residual plot (rows of weight 0
 * included: they are data the curve passes by, and their residual is as informative).
 * Cost O(n).
 * @example residuals({ x: [1, 2], y: [3, 1], w: [1, 1], fitted: [2, 2] }) // → [{ x: 1, y: 1 }, { x: 2, y: -1 }]
 */
export function residuals(rows: UsedRows): { x: number; y: number }[] {
  return rows.x.map((x, i) => ({ x, y: rows.y[i]! - rows.fitted[i]! }));
}

/**
 * The direction check of the README ("Direction check"; `checkDirection` of the core) on the rows
 * the fit used, for the direction the fit has (STATS `direction`: 1 rising, −1 falling).
 * Cost O(n).
 * @returns the warning, or null when the data do not contradict the direction.
 * @example directionCheck({ x: [1, 2, 3, 4, 5, 6], y: [9, 8, 6, 5, 3, 1], w: [1, 1, 1, 1, 1, 1], fitted: [] }, 1)?.suggested // → 'down'
 */
export function directionCheck(rows: UsedRows, fittedDirection: 1 | -1): DirectionWarning | null {
  return checkDirection(rows.x, rows.y, fittedDirection === 1 ? 'up' : 'down', rows.w);
}

/** One value of a read-back: a number, or the error the function put in that cell. */
export type ReadBackValue = number | { readonly code: string; readonly message: string };

/** A read-back of one target y. */
export interface ReadBack {
  readonly target: number;
  /** Lower x, read-back x, upper x (INVERTBAND); for the classic fit only `x` (INVERT). */
  readonly lower: ReadBackValue | undefined;
  readonly x: ReadBackValue;
  readonly upper: ReadBackValue | undefined;
  /** Which function gave it. */
  readonly source: 'INVERTBAND' | 'INVERT';
}

function readBackValue(v: CellOut | undefined): ReadBackValue {
  if (typeof v === 'number') return v;
  if (v !== null && typeof v === 'object') return { code: v.code, message: v.message };
  return { code: '#N/A', message: 'no value' };
}

/**
 * Reads a target y back: RATCHET.INVERTBAND (lower x, x, upper x at `level` for the mean of
 * `replicates` readings) for the knot model, the smooth curve (degree 2) included; for the classic
 * fit (knots 0), which has no interval, the x of RATCHET.INVERT on the knot table (tie rule
 * "middle", the default).
 * Cost: one function call (the band model is cached).
 * @param target the target y: a number, or text as typed (text that reads as a number is that
 *   number; other text is refused by the function, naming target_ys).
 * @param knotTable the fit's knot table as RATCHET.KNOTS returns it (knotTableRows), used without an interval.
 * @throws CellFailure with the function's code and message for a bad target, level or replicates,
 *   or data the band cannot be computed for.
 * @example readBack({ x: [1, 2, 3, 4, 5, 6], y: [10, 14, 12, 17, 16, 21] }, { knots: 2, direction: 1 }, [], 15, 0.8, 4).lower
 * // → 2.4559220474129395
 */
export function readBack(data: DataColumns, fit: FitSettings, knotTable: readonly (readonly number[])[], target: CellValueIn, level: string | number, replicates: string | number): ReadBack {
  // A typed number is a number cell; other text stays text, which the function refuses by name.
  if (typeof target === 'string' && target.trim() !== '' && Number.isFinite(Number(target))) target = Number(target);
  if (fit.knots === 0) {
    const out = run('INVERT', [[[target]], knotTable.map((r) => [...r])]);
    const v = Array.isArray(out) ? out[0]![0] : out;
    return { target: Number(target), lower: undefined, x: readBackValue(v), upper: undefined, source: 'INVERT' };
  }
  const out = run('INVERTBAND', bandArgs([[target]], data, fit, level, replicates));
  const r = Array.isArray(out) ? out[0]! : [out];
  return { target: Number(target), lower: readBackValue(r[0]), x: readBackValue(r[1]), upper: readBackValue(r[2]), source: 'INVERTBAND' };
}

/** The argument a function's message names first ("level: needs …" → "level"), or undefined. */
export function argumentOf(e: unknown): string | undefined {
  if (!(e instanceof CellFailure)) return undefined;
  return /^([a-z_]+):/.exec(e.message)?.[1];
}

/** The kind of band as words. @example bandKindWords(2) // → 'prediction band for one new observation' */
export function bandKindWords(kind: 1 | 2): string {
  return kind === 1 ? 'confidence band for the curve' : 'prediction band for one new observation';
}

/**
 * A level as a percentage, as typed (the level is the user's choice, not a result: no rounding to
 * the digits shown beyond the binary noise of × 100). @example percent(0.95) // → '95'
 */
export function percent(level: number): string {
  return String(Number((level * 100).toPrecision(12)));
}

/**
 * The band in words for the fit chart's text alternative.
 * @example bandSentence({ level: 0.95, kind: 1 }) // → '95 % confidence band for the curve shaded.'
 */
export function bandSentence(band: { level: number; kind: 1 | 2 } | undefined, reason?: string): string {
  if (band) return `${percent(band.level)} % ${bandKindWords(band.kind)} shaded.`;
  return reason === undefined ? 'No band.' : `No band: ${reason}`;
}

/**
 * The residual plot in one sentence, for its text alternative: count and range of the residuals,
 * numbers through `f` (the digits shown).
 * @example residualSummary([{ x: 1, y: -0.5 }, { x: 2, y: 0.25 }], String) // → 'Residual plot: 2 residuals (y − fitted) against x, from -0.5 to 0.25; dashed zero line.'
 */
export function residualSummary(points: readonly { x: number; y: number }[], f: (v: number) => string): string {
  if (points.length === 0) return 'Residual plot: no fit drawn.';
  let lo = Infinity;
  let hi = -Infinity;
  for (const p of points) {
    if (p.y < lo) lo = p.y;
    if (p.y > hi) hi = p.y;
  }
  return `Residual plot: ${points.length} residual${points.length === 1 ? '' : 's'} (y − fitted) against x, from ${f(lo)} to ${f(hi)}; dashed zero line.`;
}

/**
 * The caution shown under a band when the fit joined knots into flat stretches (STATS `levels`
 * below `knots`): the band treats them as known, so it is optimistic near them (README "Cautions
 * for bands"); '' otherwise. O(rows of STATS).
 * @example flatHint({ stats: [['knots', 5], ['levels', 3]] }) // → 'The curve has flat stretches (5 knots at 3 distinct values): the band treats them as known and is optimistic near them (README “Cautions for bands”).'
 */
export function flatHint(view: Pick<FitView, 'stats'>): string {
  const stat = (name: string): unknown => view.stats.find(([k]) => k === name)?.[1];
  const levels = stat('levels');
  const knots = stat('knots');
  if (typeof levels !== 'number' || typeof knots !== 'number' || levels >= knots) return '';
  return `The curve has flat stretches (${knots} knots at ${levels} distinct value${levels === 1 ? '' : 's'}): the band treats them as known and is optimistic near them (README “Cautions for bands”).`;
}
