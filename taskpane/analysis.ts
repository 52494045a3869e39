/**
 * What the pane shows, computed by the worksheet functions themselves (through the registry) so
 * the chart, the statistics and the downloaded knot table are exactly what RATCHET.FIT, KNOTS and
 * STATS return in a cell. No fitting logic lives here: only conversions between columns of cells
 * and the functions' arguments and results.
 */
import { functionByName } from '../src/functions/registry.js';
import type { CellArg, CellOut, CellResult, CellValueIn } from '../src/functions/types.js';
import { mapError } from '../src/adapter/errors.js';
import { defaultCandidates } from '../src/core/index.js';
import { curveDrawing, type CurvePoint } from '../src/view/curve-points.js';
import type { CvSettings, FitSettings } from './formulas.js';

/** The chosen data as columns of cells (same length; null for a blank cell). */
export interface DataColumns {
  readonly x: readonly CellValueIn[];
  readonly y: readonly CellValueIn[];
  readonly w?: readonly CellValueIn[] | undefined;
}

/** A fit as the pane shows it. */
export interface FitView {
  /** Data points used by the fit (rows where x, y and the weight are all numbers). */
  readonly points: { x: number; y: number }[];
  /**
   * The knot table (RATCHET.KNOTS, its first two columns): the curve's vertices, or for a smooth
   * fit its knots and interval midpoints.
   */
  readonly knots: [number, number][];
  /** True for a smooth fit (degree 2): the table has a third column of 2s and is read by parabolas. */
  readonly smooth: boolean;
  /** The line the chart draws: the vertices, or the smooth curve sampled by RATCHET.EVAL (curve-points.ts). */
  readonly curve: CurvePoint[];
  /** The knot markers: every row, or for a smooth fit the knots (not the midpoints). */
  readonly knotMarkers: CurvePoint[];
  /** RATCHET.STATS label/value rows. */
  readonly stats: [string, CellOut][];
}

/** A scored candidate of the CV table. */
export interface CvRow {
  readonly knots: number;
  readonly cvRmse: number;
  readonly cvSe: number;
  readonly cvR2: number;
  readonly cvMae: number;
  readonly trainRmse: number;
}

/** An error the functions returned, as a cell would show it. */
export class CellFailure extends Error {
  readonly code: string;
  constructor(code: string, message: string) {
    super(message);
    this.name = 'CellFailure';
    this.code = code;
  }
}

/** A column as a one-column range argument. */
export function columnArg(cells: readonly CellValueIn[]): CellValueIn[][] {
  return cells.map((v) => [v]);
}

/** Runs a registry function; what it throws becomes a {@link CellFailure} with the mapped code and message. */
export function run(name: string, args: readonly CellArg[]): CellResult {
  const f = functionByName(name);
  if (!f) throw new Error(`unknown function ${name}`);
  try {
    return f.invoke(args);
  } catch (e) {
    const m = mapError(e);
    throw new CellFailure(m.code, m.message);
  }
}

function grid(r: CellResult): CellOut[][] {
  return Array.isArray(r) ? r : [[r]];
}

/**
 * The fit arguments (known_ys, known_xs, knots, direction, weights, curvature, degree) as cells;
 * weights, curvature and degree are omitted when absent or at their defaults.
 */
export function fitArgs(data: DataColumns, fit: FitSettings): CellArg[] {
  const args: CellArg[] = [columnArg(data.y), columnArg(data.x), fit.knots, fit.direction, data.w ? columnArg(data.w) : undefined, ...shapeCells(fit)];
  while (args.length > 4 && args[args.length - 1] === undefined) args.pop();
  return args;
}

/** `curvature` and `degree` as cells (undefined at the defaults 0 and 1). */
function shapeCells(fit: Pick<FitSettings, 'curvature' | 'degree'>): [CellArg, CellArg] {
  const c = fit.curvature ?? 0;
  const d = fit.degree ?? 1;
  return [c === 0 ? undefined : c, d === 1 ? undefined : d];
}

/**
 * The fit of the data with these settings: points from RATCHET.FIT (a row is a point when FIT
 * gives it a value), the knot table from RATCHET.KNOTS, statistics from RATCHET.STATS, and the
 * line to draw from that table (for a smooth fit sampled by RATCHET.EVAL, curve-points.ts).
 * @throws CellFailure when the functions return an error for these data or settings (e.g.
 *   "#VALUE! curvature: needs knots (K ≥ 2): …" for the classic fit with a curvature).
 */
export function computeFit(data: DataColumns, fit: FitSettings): FitView {
  const args = fitArgs(data, fit);
  const fitted = grid(run('FIT', args));
  const points: { x: number; y: number }[] = [];
  for (let i = 0; i < fitted.length; i++) {
    if (typeof fitted[i]![0] === 'number') points.push({ x: data.x[i] as number, y: data.y[i] as number });
  }
  const table = grid(run('KNOTS', args));
  let drawing: ReturnType<typeof curveDrawing>;
  try {
    drawing = curveDrawing(table);
  } catch (e) {
    const m = mapError(e);
    throw new CellFailure(m.code, m.message);
  }
  const stats = grid(run('STATS', args)).map((r) => [String(r[0]), r[1]!] as [string, CellOut]);
  return { points, knots: drawing.rows, smooth: drawing.smooth, curve: drawing.curve, knotMarkers: drawing.knots, stats };
}

/**
 * The knot table as RATCHET.KNOTS returns it: (x, value) rows, with the third column 2 of a
 * smooth fit's table (so that whatever reads it knows to read parabolas, not straight lines).
 */
export function knotTableRows(view: FitView): ([number, number] | [number, number, number])[] {
  return view.knots.map(([x, y]) => (view.smooth ? [x, y, 2] : [x, y]));
}

/**
 * The CV / BESTK arguments as cells, in the functions' order (BESTK adds `rule`), with the fit's
 * direction and shape (`curvature`, `degree` last), so the candidates are scored for that shape.
 */
export function cvArgs(data: DataColumns, cv: CvSettings, fit: Pick<FitSettings, 'direction' | 'curvature' | 'degree'>, withRule: boolean): CellArg[] {
  const args: CellArg[] = [
    columnArg(data.y),
    columnArg(data.x),
    cv.candidates === undefined ? undefined : cv.candidates.map((k) => [k]),
    cv.folds,
    cv.repeats,
    cv.seed,
    fit.direction,
    data.w ? columnArg(data.w) : undefined,
  ];
  if (withRule) args.push(cv.rule);
  args.push(...shapeCells(fit));
  while (args[args.length - 1] === undefined) args.pop();
  return args;
}

/** Reads the RATCHET.CV table (header row first) into rows. */
export function cvRows(table: CellResult): CvRow[] {
  const g = grid(table);
  return g.slice(1).map((r) => ({
    knots: r[0] as number,
    cvRmse: r[1] as number,
    cvSe: r[2] as number,
    cvR2: r[3] as number,
    cvMae: r[4] as number,
    trainRmse: r[5] as number,
  }));
}

/**
 * Number of candidates CV compares: the given list, or the functions' default for these data
 * (the core's defaultCandidates over the x values of the rows used).
 */
export function candidateCount(view: FitView, cv: CvSettings): number {
  if (cv.candidates !== undefined) return cv.candidates.length;
  return defaultCandidates(view.points.map((p) => p.x)).length;
}

/**
 * The knot table as RFC 4180 CSV with a header line: `knot_x,fitted_value`, full precision; a
 * smooth fit's table (`smooth`) keeps its third column as `degree` (2 in every row), so that the
 * file, pasted into a sheet, is read by RATCHET.EVAL as the smooth curve and not as a polygon.
 * @example knotTableCsv([[1, 10], [3, 14]]) // → 'knot_x,fitted_value\r\n1,10\r\n3,14\r\n'
 */
export function knotTableCsv(knots: readonly (readonly [number, number])[], smooth = false): string {
  const lines = [smooth ? 'knot_x,fitted_value,degree' : 'knot_x,fitted_value'];
  for (const [a, b] of knots) lines.push(smooth ? `${String(a)},${String(b)},2` : `${String(a)},${String(b)}`);
  return `${lines.join('\r\n')}\r\n`;
}
