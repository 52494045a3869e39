/**
 * `npm run demo`: evaluates every sample workbook with the headless runner and, per sample,
 * prints the suggested knot count, its cv_rmse and the knot table, and writes an SVG picture of
 * the fit (data points, fitted curve, knots, axes and labels) to out/. A surface sample (two
 * inputs) gets the suggested (knots1, knots2) pair from RATCHET.CVGRID, the RATCHET.GRID table of
 * that lattice, and an SVG heat-map of it.
 *
 * Everything shown is computed by RATCHET formulas evaluated in the workbook (the runner sets
 * them into free cells of the Data sheet in memory; the sample files are not changed); only the
 * one-standard-error choice among the CVGRID rows is made here, by the core's suggestSurfaceKnots.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { EvaluatedWorkbook, type JsonCell } from '../../src/runner/workbook.js';
import type { SampleData } from './samples.js';
import { parseRange } from '../../src/runner/address.js';
import { suggestSurfaceKnots } from '../../src/core/index.js';
import { heatColour, heatmapFromGrid, hex, type HeatmapView } from '../../src/view/heat-scale.js';
import { formatNumber } from '../../src/view/number-format.js';

/** What the demo computed for one sample with one input. */
export interface CurveDemoResult {
  readonly kind: 'curve';
  readonly file: string;
  readonly title: string;
  readonly suggested: number;
  readonly cvRmse: number;
  readonly cvSe: number;
  readonly knots: [number, number][];
  readonly classic: [number, number][];
  readonly points: [number, number][];
  readonly svgPath: string;
}

/** What the demo computed for a surface sample (two inputs). */
export interface SurfaceDemoResult {
  readonly kind: 'surface';
  readonly file: string;
  readonly title: string;
  /** The (knots1, knots2) pair the one-standard-error rule picks from the CVGRID table. */
  readonly suggested: [number, number];
  readonly cvRmse: number;
  readonly cvSe: number;
  /** The RATCHET.GRID table of that lattice. */
  readonly grid: HeatmapView;
  /** Rows with y, x1 and x2 all numbers. */
  readonly rows: number;
  readonly svgPath: string;
}

export type DemoResult = CurveDemoResult | SurfaceDemoResult;

const num = (v: JsonCell | undefined): number => (typeof v === 'number' ? v : NaN);

function columnOf(book: EvaluatedWorkbook, ref: string): JsonCell[] {
  const g = parseRange(ref);
  return book.block(`Data!${ref.split(':')[0]}`, g.bottom - g.top + 1, g.right - g.left + 1).flat();
}

/**
 * Runs the demo over the samples listed in samples/expected.json.
 * @param root repository root; SVGs go to root/out/.
 * @param log where the text report goes.
 * @param outDir where the SVGs go (default root/out, which is not committed).
 */
export async function runDemo(root: string, log: (line: string) => void = console.log, outDir = join(root, 'out')): Promise<DemoResult[]> {
  const samplesDir = join(root, 'samples');
  mkdirSync(outDir, { recursive: true });
  const index = JSON.parse(readFileSync(join(samplesDir, 'expected.json'), 'utf8')) as {
    samples: Record<string, { title: string; data: SampleData }>;
  };
  const results: DemoResult[] = [];
  for (const [file, s] of Object.entries(index.samples)) {
    const book = await EvaluatedWorkbook.fromFile(join(samplesDir, file));
    const d = s.data;
    if (d.x2s !== undefined) {
      results.push(surfaceDemo(book, file, s.title, d, outDir, log));
      continue;
    }
    const w = d.weights ?? '';
    // Default candidates (2 … min(20, distinct x)), 5 folds, 1 repeat, seed 1, one-SE rule.
    book.set({
      'Data!AA1': `=RATCHET.BESTK(${d.ys},${d.xs},,,,,${d.direction},${w})`,
      'Data!AB1': `=RATCHET.CV(${d.ys},${d.xs},,,,,${d.direction},${w})`,
      'Data!AJ1': `=RATCHET.KNOTS(${d.ys},${d.xs},AA1,${d.direction},${w})`,
      'Data!AM1': `=RATCHET.KNOTS(${d.ys},${d.xs},0,${d.direction},${w})`,
    });
    const bestCell = book.value('Data!AA1');
    if (typeof bestCell !== 'number') throw new Error(`${file}: BESTK gave ${String(bestCell)}: ${book.message('Data!AA1') ?? ''}`);
    const cv = book.result('Data!AB1');
    const row = cv.find((r) => r[0] === bestCell) ?? [];
    const knots = book.result('Data!AJ1').map((r) => [num(r[0]), num(r[1])] as [number, number]);
    const classic = book.result('Data!AM1').map((r) => [num(r[0]), num(r[1])] as [number, number]);
    const xs = columnOf(book, d.xs);
    const ys = columnOf(book, d.ys);
    const points: [number, number][] = [];
    xs.forEach((x, i) => {
      const y = ys[i];
      if (typeof x === 'number' && typeof y === 'number') points.push([x, y]);
    });
    const svgPath = join(outDir, file.replace(/\.xlsx$/, '.svg'));
    writeFileSync(svgPath, fitSvg({ title: s.title, xLabel: d.xLabel, yLabel: d.yLabel, points, knots, classic, suggested: bestCell }));
    const result: CurveDemoResult = { kind: 'curve', file, title: s.title, suggested: bestCell, cvRmse: num(row[1]), cvSe: num(row[2]), knots, classic, points, svgPath };
    results.push(result);

    log(`${file} — ${s.title} (invented data)`);
    log(`  suggested knot count: ${bestCell}  (5-fold cross-validation, seed 1, one-standard-error rule)`);
    log(`  cv_rmse at ${bestCell} knots: ${fmt(result.cvRmse)}  (cv_se ${fmt(result.cvSe)})`);
    log(`  knot table (x, fitted value):`);
    for (const [x, y] of knots) log(`    ${fmt(x).padStart(12)}  ${fmt(y).padStart(12)}`);
    log(`  picture: ${relative(process.cwd(), svgPath) || svgPath}`);
    log('');
  }
  return results;
}

/** The surface part of the demo: CVGRID with its defaults, the suggested pair, its GRID, a heat-map SVG. */
function surfaceDemo(book: EvaluatedWorkbook, file: string, title: string, d: SampleData, outDir: string, log: (line: string) => void): SurfaceDemoResult {
  const dir = d.direction;
  const x2s = d.x2s!;
  // Default candidates (2 … min(6, distinct levels) per input), 5 folds, 1 repeat, seed 1.
  book.set({ 'Data!AA1': `=RATCHET.CVGRID(${d.ys},${d.xs},${x2s},,,,,,${dir},${dir})` });
  const cv = book.result('Data!AA1');
  if (cv[0]?.[0] !== 'knots1') throw new Error(`${file}: CVGRID gave ${String(cv[0]?.[0])}: ${book.message('Data!AA1') ?? ''}`);
  const scores = cv.slice(1).map((r) => ({ knots1: num(r[0]), knots2: num(r[1]), cvRmse: num(r[2]), cvSe: num(r[3]) }));
  const pick = suggestSurfaceKnots(scores, 'one-se');
  const chosen = scores[pick.index]!;
  book.set({ 'Data!AH1': `=RATCHET.GRID(${d.ys},${d.xs},${x2s},${pick.knots1},${pick.knots2},${dir},${dir})` });
  const grid = heatmapFromGrid(book.result('Data!AH1'));
  const x1 = columnOf(book, d.xs);
  const x2 = columnOf(book, x2s);
  const y = columnOf(book, d.ys);
  const rows = y.filter((v, i) => typeof v === 'number' && typeof x1[i] === 'number' && typeof x2[i] === 'number').length;
  const svgPath = join(outDir, file.replace(/\.xlsx$/, '.svg'));
  const x2Label = d.x2Label ?? 'x2';
  writeFileSync(svgPath, heatmapSvg({ title, xLabel: d.xLabel, x2Label, yLabel: d.yLabel, grid, rows }));
  log(`${file} — ${title} (invented data)`);
  log(`  suggested lattice: ${pick.knots1} × ${pick.knots2} knots  (RATCHET.CVGRID over ${scores.length} pairs, 5-fold, seed 1, one-standard-error rule)`);
  log(`  cv_rmse at ${pick.knots1} × ${pick.knots2}: ${fmt(chosen.cvRmse)}  (cv_se ${fmt(chosen.cvSe)})`);
  log(`  RATCHET.GRID (rows: ${x2Label}; columns: ${d.xLabel}; values: ${d.yLabel}):`);
  const w = 10;
  log(`    ${''.padStart(w)}${grid.knots1.map((k) => fmt(k).padStart(w)).join('')}`);
  grid.values.forEach((row, b) => log(`    ${fmt(grid.knots2[b]!).padStart(w)}${row.map((v) => fmt(v).padStart(w)).join('')}`));
  log(`  picture: ${relative(process.cwd(), svgPath) || svgPath}`);
  log('');
  return { kind: 'surface', file, title, suggested: [pick.knots1, pick.knots2], cvRmse: chosen.cvRmse, cvSe: chosen.cvSe, grid, rows, svgPath };
}

/**
 * The SVG heat-map of a fitted lattice: one rectangle per knot pair, coloured by the shared
 * sequential scale and labelled with its value; x1 knots along the bottom, x2 knots up the left
 * (higher x2 higher up), a colour bar from the lowest to the highest value.
 */
export function heatmapSvg(p: { title: string; xLabel: string; x2Label: string; yLabel: string; grid: HeatmapView; rows: number }): string {
  const g = p.grid;
  const K1 = g.knots1.length;
  const K2 = g.knots2.length;
  const cw = Math.max(56, Math.min(96, 600 / K1));
  const ch = Math.max(30, Math.min(60, 420 / K2));
  const m = { left: Math.max(96, (760 - K1 * cw) / 2), right: 130, top: 60, bottom: 64 };
  const W = Math.max(760, m.left + K1 * cw + m.right);
  const H = m.top + K2 * ch + m.bottom;
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="12">`);
  parts.push(`<rect width="${W}" height="${H}" fill="white"/>`);
  parts.push(`<text x="${W / 2}" y="22" text-anchor="middle" font-size="15" font-weight="bold">${esc(p.title)}</text>`);
  parts.push(
    `<text x="${W / 2}" y="40" text-anchor="middle" fill="#555">invented data · ${p.rows} rows · RATCHET.GRID lattice of ${K1} × ${K2} knots (${K1 * K2} values), monotone in both inputs</text>`,
  );
  for (let b = 0; b < K2; b++) {
    const yTop = m.top + (K2 - 1 - b) * ch; // higher x2 higher up
    parts.push(`<text x="${m.left - 8}" y="${(yTop + ch / 2 + 4).toFixed(1)}" text-anchor="end">${fmt(g.knots2[b]!)}</text>`);
    for (let a = 0; a < K1; a++) {
      const c = g.cells[b]![a]!;
      const x = m.left + a * cw;
      parts.push(`<rect class="cell" x="${x.toFixed(1)}" y="${yTop.toFixed(1)}" width="${cw.toFixed(1)}" height="${ch.toFixed(1)}" fill="${c.background}" stroke="white"/>`);
      parts.push(`<text x="${(x + cw / 2).toFixed(1)}" y="${(yTop + ch / 2 + 4).toFixed(1)}" text-anchor="middle" fill="${c.color}">${esc(fmt(c.value))}</text>`);
    }
  }
  const bottom = m.top + K2 * ch;
  for (let a = 0; a < K1; a++) parts.push(`<text x="${(m.left + (a + 0.5) * cw).toFixed(1)}" y="${bottom + 18}" text-anchor="middle">${fmt(g.knots1[a]!)}</text>`);
  parts.push(`<text x="${m.left + (K1 * cw) / 2}" y="${H - 18}" text-anchor="middle">knots of ${esc(p.xLabel)}</text>`);
  parts.push(`<text transform="translate(${m.left - 56} ${m.top + (K2 * ch) / 2}) rotate(-90)" text-anchor="middle">knots of ${esc(p.x2Label)}</text>`);
  // Colour bar: lowest value at the bottom, highest at the top.
  const bx = m.left + K1 * cw + 28;
  const bh = K2 * ch;
  const stops = Array.from({ length: 21 }, (_, i) => `<stop offset="${i * 5}%" stop-color="${hex(heatColour(1 - i / 20))}"/>`).join('');
  parts.push(`<defs><linearGradient id="scale" x1="0" y1="0" x2="0" y2="1">${stops}</linearGradient></defs>`);
  parts.push(`<rect x="${bx}" y="${m.top}" width="16" height="${bh}" fill="url(#scale)" stroke="#999"/>`);
  parts.push(`<text x="${bx + 22}" y="${m.top + 10}">${fmt(g.max)}</text>`);
  parts.push(`<text x="${bx + 22}" y="${m.top + bh}">${fmt(g.min)}</text>`);
  parts.push(`<text transform="translate(${bx + 48} ${m.top + bh / 2}) rotate(90)" text-anchor="middle">${esc(p.yLabel)}</text>`);
  parts.push('</svg>');
  return `${parts.join('\n')}\n`;
}

/** Numbers in the pictures and the printout: 4 significant digits, as the task pane shows them. */
function fmt(v: number): string {
  return formatNumber(v);
}

/**
 * "Nice" tick positions covering [lo, hi]: about `count` steps of 1, 2 or 5 × 10^k, and at least
 * `min` ticks (the step is made finer, 5 → 2 → 1 → 0.5 …, until there are). Cost O(ticks).
 * @param count steps aimed at; default 6. @param min fewest ticks; default 4.
 * @example niceTicks(863.2, 1256.8) // → [900, 1000, 1100, 1200]
 */
export function niceTicks(lo: number, hi: number, count = 6, min = 4): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / count;
  let mag = 10 ** Math.floor(Math.log10(raw));
  const mults = [1, 2, 5];
  let i = mults.findIndex((m) => m * mag >= raw);
  if (i < 0) [i, mag] = [0, mag * 10];
  const ticks = (step: number): number[] => {
    const out: number[] = [];
    for (let t = Math.ceil(lo / step) * step; t <= hi + step * 1e-9; t += step) out.push(Number(t.toPrecision(12)));
    return out;
  };
  let out = ticks(mults[i]! * mag);
  for (let guard = 0; out.length < min && guard < 30; guard++) {
    if (--i < 0) [i, mag] = [2, mag / 10];
    out = ticks(mults[i]! * mag);
  }
  return out;
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

/**
 * The SVG picture of one fit: data points, a comparison fit (thin, dashed: the classic fit unless
 * labelled otherwise), the knot fit and its knots, axes, labels. `curve` is the line of the fit
 * when it is not the polygon through `knots` (a smooth fit sampled densely); `subtitle`,
 * `fitLabel` and `comparisonLabel` replace the default texts.
 */
export function fitSvg(p: {
  title: string;
  xLabel: string;
  yLabel: string;
  points: readonly [number, number][];
  knots: readonly [number, number][];
  classic: readonly [number, number][];
  suggested: number;
  curve?: readonly [number, number][];
  subtitle?: string;
  fitLabel?: string;
  comparisonLabel?: string;
}): string {
  const curve = p.curve ?? p.knots;
  const fitLabel = p.fitLabel ?? `fit with ${p.suggested} knots, and its knots`;
  const comparisonLabel = p.comparisonLabel ?? 'classic fit';
  const W = 720;
  const H = 460;
  const m = { left: 72, right: 24, top: 48, bottom: 64 };
  const allX = [...p.points.map((q) => q[0]), ...p.knots.map((q) => q[0])];
  const allY = [...p.points.map((q) => q[1]), ...curve.map((q) => q[1]), ...p.classic.map((q) => q[1])];
  let [x0, x1] = [Math.min(...allX), Math.max(...allX)];
  let [y0, y1] = [Math.min(...allY), Math.max(...allY)];
  const padX = (x1 - x0 || 1) * 0.04;
  const padY = (y1 - y0 || 1) * 0.08;
  [x0, x1, y0, y1] = [x0 - padX, x1 + padX, y0 - padY, y1 + padY];
  const sx = (x: number) => m.left + ((x - x0) / (x1 - x0)) * (W - m.left - m.right);
  const sy = (y: number) => H - m.bottom - ((y - y0) / (y1 - y0)) * (H - m.top - m.bottom);
  const f = (v: number) => v.toFixed(1);
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="12">`);
  parts.push(`<rect width="${W}" height="${H}" fill="white"/>`);
  parts.push(`<text x="${W / 2}" y="22" text-anchor="middle" font-size="15" font-weight="bold">${esc(p.title)}</text>`);
  parts.push(`<text x="${W / 2}" y="38" text-anchor="middle" fill="#555">${esc(p.subtitle ?? `invented data · monotone fit with ${p.suggested} knots (suggested by cross-validation) and the classic fit`)}</text>`);
  // Axes, ticks and grid.
  const bx = H - m.bottom;
  parts.push(`<line x1="${m.left}" y1="${bx}" x2="${W - m.right}" y2="${bx}" stroke="black"/>`);
  parts.push(`<line x1="${m.left}" y1="${m.top}" x2="${m.left}" y2="${bx}" stroke="black"/>`);
  for (const t of niceTicks(x0, x1)) {
    parts.push(`<line x1="${f(sx(t))}" y1="${bx}" x2="${f(sx(t))}" y2="${bx + 5}" stroke="black"/>`);
    parts.push(`<line x1="${f(sx(t))}" y1="${m.top}" x2="${f(sx(t))}" y2="${bx}" stroke="#eee"/>`);
    parts.push(`<text x="${f(sx(t))}" y="${bx + 18}" text-anchor="middle">${t}</text>`);
  }
  for (const t of niceTicks(y0, y1)) {
    parts.push(`<line x1="${m.left - 5}" y1="${f(sy(t))}" x2="${m.left}" y2="${f(sy(t))}" stroke="black"/>`);
    parts.push(`<line x1="${m.left}" y1="${f(sy(t))}" x2="${W - m.right}" y2="${f(sy(t))}" stroke="#eee"/>`);
    parts.push(`<text x="${m.left - 8}" y="${f(sy(t) + 4)}" text-anchor="end">${t}</text>`);
  }
  parts.push(`<text x="${(m.left + W - m.right) / 2}" y="${H - 18}" text-anchor="middle">${esc(p.xLabel)}</text>`);
  parts.push(`<text transform="translate(18 ${(m.top + bx) / 2}) rotate(-90)" text-anchor="middle">${esc(p.yLabel)}</text>`);
  // Curves: the classic fit (thin, grey) and the knot fit; both flat to the ends of the data.
  const line = (table: readonly [number, number][]) => table.map(([x, y]) => `${f(sx(x))},${f(sy(y))}`).join(' ');
  parts.push(`<polyline points="${line(p.classic)}" fill="none" stroke="#999" stroke-width="1.2" stroke-dasharray="4 3"/>`);
  parts.push(`<polyline points="${line(curve)}" fill="none" stroke="#1f5fa8" stroke-width="2.4"/>`);
  for (const [x, y] of p.points) parts.push(`<circle cx="${f(sx(x))}" cy="${f(sy(y))}" r="3.2" fill="#e07b00" fill-opacity="0.85"/>`);
  for (const [x, y] of p.knots) parts.push(`<rect x="${f(sx(x) - 4.5)}" y="${f(sy(y) - 4.5)}" width="9" height="9" fill="white" stroke="#1f5fa8" stroke-width="2"/>`);
  // Legend in the upper corner the curve leaves empty (left when rising, right when falling).
  const rising = (p.knots[0]?.[1] ?? 0) <= (p.knots[p.knots.length - 1]?.[1] ?? 0);
  // about 6.6 px per character at 12 px sans-serif
  const lw = Math.max(230, Math.ceil(36 + 6.6 * Math.max(fitLabel.length, comparisonLabel.length)));
  const lx = rising ? m.left + 14 : W - m.right - lw - 6;
  const ly = m.top + 10;
  parts.push(`<rect x="${lx - 8}" y="${ly - 10}" width="${lw}" height="66" fill="white" fill-opacity="0.9" stroke="#ccc"/>`);
  parts.push(`<circle cx="${lx}" cy="${ly}" r="3.2" fill="#e07b00"/><text x="${lx + 12}" y="${ly + 4}">data (${p.points.length} points)</text>`);
  parts.push(`<line x1="${lx - 6}" y1="${ly + 18}" x2="${lx + 6}" y2="${ly + 18}" stroke="#1f5fa8" stroke-width="2.4"/><rect x="${lx - 4}" y="${ly + 14}" width="8" height="8" fill="white" stroke="#1f5fa8" stroke-width="2"/><text x="${lx + 12}" y="${ly + 22}">${esc(fitLabel)}</text>`);
  parts.push(`<line x1="${lx - 6}" y1="${ly + 36}" x2="${lx + 6}" y2="${ly + 36}" stroke="#999" stroke-dasharray="4 3"/><text x="${lx + 12}" y="${ly + 40}">${esc(comparisonLabel)}</text>`);
  parts.push('</svg>');
  return `${parts.join('\n')}\n`;
}
