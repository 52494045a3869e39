/**
 * The pane's surface over two inputs: when a second x column (x2) is chosen, the fitted lattice is
 * RATCHET.GRID itself, called through the registry like FIT, KNOTS and STATS (analysis.ts), and
 * drawn as a heat-map table — one cell per knot pair, its value as text, its background from the
 * sequential scale of heat-scale.ts. No fitting logic here: only the arguments as cells, the
 * formula text, and the drawing.
 */
import type { CellArg, CellValueIn } from '../src/functions/types.js';
import { columnArg, run } from './analysis.js';
import type { DataColumns } from './analysis.js';
import type { DataRefs } from './formulas.js';
import { heatColour, heatmapFromGrid, hex, type HeatmapView } from '../src/view/heat-scale.js';
import { DEFAULT_DIGITS, formatNumber } from '../src/view/number-format.js';

/** The second input as the pane holds it. */
export interface SecondInput {
  /** Cells in row order, one per cell of y (null = blank). */
  readonly cells: readonly CellValueIn[];
  /** How a formula refers to it. */
  readonly ref: string;
  /** Column name or address, for the axis label. */
  readonly label: string;
}

/**
 * A surface direction as RATCHET.GRID takes it: 1 rising, −1 falling, 0 picked from the data (the
 * sign of that input's rank correlation with y), 2 no constraint along that input.
 */
export type SurfaceDirectionCode = 1 | -1 | 0 | 2;

/** The surface controls: knot counts (0 = every distinct level, the classic case) and directions. */
export interface SurfaceSettings {
  readonly knots1: number;
  readonly knots2: number;
  /** 1 rising, −1 falling, 0 picked from the data, 2 no constraint along that input. */
  readonly direction1: SurfaceDirectionCode;
  readonly direction2: SurfaceDirectionCode;
}

/** Largest lattice the pane draws cell by cell (larger ones are summarised in the status line). */
export const HEATMAP_MAX_CELLS = 2500;

/**
 * RATCHET.GRID's arguments as cells: known_ys, known_x1s (the pane's x), known_x2s, knots1,
 * knots2, direction1, direction2 [, weights].
 */
export function gridArgs(data: DataColumns, x2: readonly CellValueIn[], s: SurfaceSettings): CellArg[] {
  const args: CellArg[] = [columnArg(data.y), columnArg(data.x), columnArg(x2), s.knots1, s.knots2, s.direction1, s.direction2];
  if (data.w) args.push(columnArg(data.w));
  return args;
}

/**
 * The fitted lattice of y over (x, x2) with these settings, as RATCHET.GRID returns it, ready to
 * draw. Cost: one GRID call (cached by content in the functions) plus O(K1·K2).
 * @param digits significant digits of the cells' text, 1 … 17; default 4 (values keep full precision).
 * @throws CellFailure (analysis.ts) with the code and message a cell would show.
 */
export function computeSurface(data: DataColumns, x2: readonly CellValueIn[], s: SurfaceSettings, digits: number = DEFAULT_DIGITS): HeatmapView {
  return heatmapFromGrid(run('GRID', gridArgs(data, x2, s)), digits);
}

/** The formula text, e.g. `=RATCHET.GRID(Data!$C$2:$C$49,Data!$A$2:$A$49,Data!$B$2:$B$49,4,3,1,1)`. */
export function gridFormula(refs: DataRefs, x2Ref: string, s: SurfaceSettings): string {
  const args = [refs.y, refs.x, x2Ref, String(s.knots1), String(s.knots2), String(s.direction1), String(s.direction2)];
  if (refs.w) args.push(refs.w);
  return `=RATCHET.GRID(${args.join(',')})`;
}

/** How a lattice runs along one input (see {@link latticeTrend}). */
export type LatticeTrend = 'rising' | 'falling' | 'flat' | 'both';

/**
 * How the shown lattice runs along one input: `'rising'` when values rise from one knot to the
 * next along that axis and none falls, `'falling'` the reverse, `'flat'` when none changes,
 * `'both'` when some rise and some fall (possible only without a constraint along it). Reads the
 * drawn values only; O(K1·K2).
 * @param axis 1 = along x (the columns), 2 = along x2 (the rows).
 * @example latticeTrend({ values: [[1, 2], [3, 4]] }, 2) // → 'rising'
 */
export function latticeTrend(view: Pick<HeatmapView, 'values'>, axis: 1 | 2): LatticeTrend {
  let up = false;
  let down = false;
  const v = view.values;
  for (let b = 0; b < v.length; b++) {
    for (let a = 0; a < v[b]!.length; a++) {
      const next = axis === 1 ? v[b]![a + 1] : v[b + 1]?.[a];
      if (next === undefined) continue;
      if (next > v[b]![a]!) up = true;
      if (next < v[b]![a]!) down = true;
    }
  }
  return up ? (down ? 'both' : 'rising') : down ? 'falling' : 'flat';
}

/**
 * The words for one surface direction in the pane's status line: 1 "rising", −1 "falling",
 * 2 "no constraint", 0 "picked from the data: " and how the lattice runs along that input — the
 * direction the rank correlation chose, or "flat" when the fit does not change along it.
 * @example directionWords(0, 'falling') // → "picked from the data: falling"
 */
export function directionWords(code: SurfaceDirectionCode, trend: LatticeTrend): string {
  if (code === 1) return 'rising';
  if (code === -1) return 'falling';
  if (code === 2) return 'no constraint';
  return trend === 'both' ? 'picked from the data' : `picked from the data: ${trend}`;
}

/** Rows × columns the GRID result fills: (K2 + 1) × (K1 + 1). */
export function gridSpill(view: Pick<HeatmapView, 'knots1' | 'knots2'>): { rows: number; cols: number } {
  return { rows: view.knots2.length + 1, cols: view.knots1.length + 1 };
}

/**
 * Reads a knot field: blank → 0 (classic); otherwise the number typed (the functions check it and
 * say what they need).
 */
export function knotField(text: string): number {
  const t = text.trim();
  return t === '' ? 0 : Number(t);
}

function cell(tag: 'th' | 'td', text: string, attrs: Record<string, string> = {}): HTMLTableCellElement {
  const c = document.createElement(tag);
  c.textContent = text;
  for (const [k, v] of Object.entries(attrs)) c.setAttribute(k, v);
  return c;
}

/**
 * Draws `view` into `table` in the layout of RATCHET.GRID on a sheet: x1 knots across (header
 * row), x2 knots down (row headers), values inside. Each value cell has its number as text, a
 * background from the scale and black or white text, and `data-value` with the full-precision
 * number; axis headers name both inputs; knots and legend numbers have `digits` significant digits
 * (default 4). The legend gets swatches from the lowest to the highest value. Lattices wider than
 * 6 columns get the compact style (smaller cells) so that 10 × 10 fits a 350 px pane.
 */
export function renderHeatmap(table: HTMLTableElement, legend: HTMLElement, view: HeatmapView, labels: { x1: string; x2: string; y: string }, digits: number = DEFAULT_DIGITS): void {
  const f = (v: number): string => formatNumber(v, digits);
  const K1 = view.knots1.length;
  const K2 = view.knots2.length;
  table.replaceChildren();
  table.classList.toggle('compact', K1 > 6);
  const caption = document.createElement('caption');
  caption.textContent = `Fitted ${labels.y}, ${K1} × ${K2} knots`;
  const head = document.createElement('thead');
  const r1 = document.createElement('tr');
  // The corner names the column of x2 knots below it; the spanning header names the x1 knots.
  r1.append(cell('th', `${labels.x2} ↓`, { rowspan: '2', scope: 'col', class: 'axis corner' }), cell('th', `${labels.x1} →`, { colspan: String(K1), scope: 'colgroup', class: 'axis' }));
  const r2 = document.createElement('tr');
  for (const k of view.knots1) r2.append(cell('th', f(k), { scope: 'col', 'data-value': String(k) }));
  head.append(r1, r2);
  const body = document.createElement('tbody');
  view.cells.forEach((row, b) => {
    const tr = document.createElement('tr');
    tr.append(cell('th', f(view.knots2[b]!), { scope: 'row', 'data-value': String(view.knots2[b]!) }));
    for (const c of row) {
      const td = cell('td', c.text, { 'data-value': String(c.value), class: 'heat' });
      // CSSOM properties (not a style attribute): allowed under the preview's style-src 'self'.
      td.style.backgroundColor = c.background;
      td.style.color = c.color;
      tr.append(td);
    }
    body.append(tr);
  });
  table.append(caption, head, body);

  legend.replaceChildren();
  const lo = document.createElement('span');
  lo.textContent = `${labels.y}: ${f(view.min)} (pale)`;
  const bar = document.createElement('span');
  bar.className = 'heat-bar';
  bar.setAttribute('aria-hidden', 'true');
  for (let i = 0; i <= 10; i++) {
    const sw = document.createElement('span');
    sw.style.backgroundColor = hex(heatColour(i / 10));
    bar.append(sw);
  }
  const hi = document.createElement('span');
  hi.textContent = `${f(view.max)} (dark)`;
  legend.append(lo, bar, hi);
}
