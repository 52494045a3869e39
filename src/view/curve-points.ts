/**
 * The points a chart draws for a fitted curve, from the knot table RATCHET.KNOTS returns: for a
 * piecewise-linear table its rows (straight lines between them are the curve); for a smooth fit's
 * table (third column 2: knots and interval midpoints) the curve sampled densely by RATCHET.EVAL
 * itself, so that the drawn line is the worksheet's curve and not a polygon through the rows.
 * Shared by the task pane's fit chart and the demo pictures. DOM-free.
 */
import { functionByName } from '../functions/registry.js';
import type { CellOut } from '../functions/types.js';

/** A point of a chart. */
export interface CurvePoint {
  readonly x: number;
  readonly y: number;
}

/** Samples per knot interval of a smooth curve (at most {@link MAX_CURVE_POINTS} in all). */
export const SAMPLES_PER_INTERVAL = 24;

/** Most points drawn for one smooth curve; more knot intervals get fewer samples each. */
export const MAX_CURVE_POINTS = 24_000;

/**
 * Positions that sample every interval [t_j, t_{j+1}] of increasing knots at `perInterval` equal
 * steps: t_j + (t_{j+1} − t_j)·i/perInterval for i = 0 … perInterval − 1, then the last knot.
 * Every knot is among them exactly (i = 0), so a curve drawn through them passes through its
 * knots. Cost O(K · perInterval).
 *
 * @param knots knot positions, strictly increasing (not checked; a KNOTS result is); K ≥ 1.
 * @param perInterval steps per interval, a whole number ≥ 1; default {@link SAMPLES_PER_INTERVAL}.
 * @returns (K − 1)·perInterval + 1 positions, increasing; [t₀] for one knot; [] for none.
 * @throws RangeError when perInterval is not a whole number ≥ 1.
 * @example denseXs([0, 1, 3], 2) // → [0, 0.5, 1, 2, 3]
 */
export function denseXs(knots: readonly number[], perInterval: number = SAMPLES_PER_INTERVAL): number[] {
  if (!Number.isInteger(perInterval) || perInterval < 1) throw new RangeError(`perInterval: needs a whole number ≥ 1; got ${perInterval}.`);
  const out: number[] = [];
  for (let j = 0; j + 1 < knots.length; j++) {
    const a = knots[j]!;
    const h = knots[j + 1]! - a;
    for (let i = 0; i < perInterval; i++) out.push(i === 0 ? a : a + h * (i / perInterval));
  }
  if (knots.length > 0) out.push(knots[knots.length - 1]!);
  return out;
}

/**
 * Samples per interval for a smooth curve with `intervals` knot intervals:
 * {@link SAMPLES_PER_INTERVAL}, fewer (but at least 4) when that would exceed
 * {@link MAX_CURVE_POINTS} points — beyond 1,000 intervals an interval is narrower than a pixel
 * of a chart. Cost O(1).
 * @example samplesPerInterval(4) // → 24
 */
export function samplesPerInterval(intervals: number): number {
  if (intervals * SAMPLES_PER_INTERVAL <= MAX_CURVE_POINTS) return SAMPLES_PER_INTERVAL;
  return Math.max(4, Math.floor(MAX_CURVE_POINTS / Math.max(intervals, 1)));
}

/** A knot table read for drawing. */
export interface CurveDrawing {
  /** The table's rows (x, value) as RATCHET.KNOTS returns them. */
  readonly rows: [number, number][];
  /** True for a smooth fit's table (third column 2 in every row). */
  readonly smooth: boolean;
  /** The line to draw: the rows, or for a smooth table the curve sampled densely. */
  readonly curve: CurvePoint[];
  /** Where the knots are: every row, or for a smooth table the knot rows (0, 2, 4, …) only. */
  readonly knots: CurvePoint[];
}

/**
 * Reads a RATCHET.KNOTS result for a chart. A two-column table (or a third column of 1s) is drawn
 * through its rows. A smooth fit's table (third column 2: knots in rows 0, 2, 4, …, interval
 * midpoints between them) is drawn through RATCHET.EVAL's values of that very table at
 * {@link denseXs} of its knots ({@link samplesPerInterval} per interval, 24 unless there are more
 * than 1,000 intervals), and its knot markers sit on the knot rows only.
 *
 * Cost: O(K) for a linear table; one EVAL call over (K − 1)·24 + 1 positions, O(K log K), for a
 * smooth one.
 *
 * @param table the KNOTS result: rows of 2 or 3 cells, numbers in the first two.
 * @param perInterval samples per interval for a smooth table; default samplesPerInterval(K − 1).
 * @returns rows, smoothness, the line and the knot markers.
 * @throws what RATCHET.EVAL throws for a malformed table (a RatchetError naming knot_table).
 * @example curveDrawing([[0, 0, 2], [1, 0.75, 2], [2, 1, 2]], 4).curve
 * // → [{ x: 0, y: 0 }, { x: 0.5, y: 0.4375 }, { x: 1, y: 0.75 }, { x: 1.5, y: 0.9375 }, { x: 2, y: 1 }]
 */
export function curveDrawing(table: readonly (readonly CellOut[])[], perInterval?: number): CurveDrawing {
  const rows = table.map((r) => [r[0] as number, r[1] as number] as [number, number]);
  const smooth = table.length > 0 && table.every((r) => r.length > 2 && r[2] === 2);
  const vertices = rows.map(([x, y]) => ({ x, y }));
  if (!smooth) return { rows, smooth, curve: vertices, knots: vertices.map((v) => ({ ...v })) };
  const knots = vertices.filter((_, i) => i % 2 === 0);
  const xs = denseXs(
    knots.map((k) => k.x),
    perInterval ?? samplesPerInterval(knots.length - 1),
  );
  const values = functionByName('EVAL')!.invoke([
    xs.map((x) => [x]),
    table.map((r) => r.map((v) => (typeof v === 'number' ? v : null))),
  ]);
  const ys = (Array.isArray(values) ? values : [[values]]).map((r) => r[0]);
  const curve = xs.map((x, i) => {
    const y = ys[i];
    if (typeof y !== 'number') throw new Error(`RATCHET.EVAL gave no number at x = ${x}.`);
    return { x, y };
  });
  return { rows, smooth, curve, knots };
}
