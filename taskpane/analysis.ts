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
import type { CvSettings, DirectionCode, FitSettings } from './formulas.js';

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
  /** The knot table (RATCHET.KNOTS): the curve's vertices. */
  readonly knots: [number, number][];
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

/** The fit arguments (known_ys, known_xs, knots, direction, weights) as cells. */
export function fitArgs(data: DataColumns, fit: FitSettings): CellArg[] {
  const args: CellArg[] = [columnArg(data.y), columnArg(data.x), fit.knots, fit.direction];
  if (data.w) args.push(columnArg(data.w));
  return args;
}

/**
 * The fit of the data with these settings: points from RATCHET.FIT (a row is a point when FIT
 * gives it a value), the knot table from RATCHET.KNOTS, statistics from RATCHET.STATS.
 * @throws CellFailure when the functions return an error for these data.
 */
export function computeFit(data: DataColumns, fit: FitSettings): FitView {
  const args = fitArgs(data, fit);
  const fitted = grid(run('FIT', args));
  const points: { x: number; y: number }[] = [];
  for (let i = 0; i < fitted.length; i++) {
    if (typeof fitted[i]![0] === 'number') points.push({ x: data.x[i] as number, y: data.y[i] as number });
  }
  const knots = grid(run('KNOTS', args)).map((r) => [r[0] as number, r[1] as number] as [number, number]);
  const stats = grid(run('STATS', args)).map((r) => [String(r[0]), r[1]!] as [string, CellOut]);
  return { points, knots, stats };
}

/** The CV / BESTK arguments as cells, in the functions' order (BESTK adds `rule`). */
export function cvArgs(data: DataColumns, cv: CvSettings, direction: DirectionCode, withRule: boolean): CellArg[] {
  const args: CellArg[] = [
    columnArg(data.y),
    columnArg(data.x),
    cv.candidates === undefined ? undefined : cv.candidates.map((k) => [k]),
    cv.folds,
    cv.repeats,
    cv.seed,
    direction,
    data.w ? columnArg(data.w) : undefined,
  ];
  if (withRule) args.push(cv.rule);
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

/** The knot table as RFC 4180 CSV with a header line: `knot_x,fitted_value`, full precision. */
export function knotTableCsv(knots: readonly (readonly [number, number])[]): string {
  const lines = ['knot_x,fitted_value'];
  for (const [a, b] of knots) lines.push(`${String(a)},${String(b)}`);
  return `${lines.join('\r\n')}\r\n`;
}
