/**
 * The uncertainty layers of the pane's charts: the band shaded around the fitted curve (two
 * datasets added to the fit chart, the upper edge filled down to the lower one) and the residual
 * plot (residual against x with a zero line) drawn under the fit chart. Colours come from CSS
 * custom properties, so both follow the light/dark theme.
 */
import type { Chart, ChartDataset } from 'chart.js';
import { cssVar, dataScales, num, palette, paneChart, recolour, setXAxis, tick, xText, type XKind } from './charts.js';
import { percent, type BandView } from './uncertainty.js';

type XY = { x: number; y: number };
/** A dataset of the band layer, found by its role (the fit chart's own datasets keep their places). */
type BandDataset = ChartDataset<'scatter', XY[]> & { bandRole?: 'upper' | 'lower'; legendHidden?: boolean };

function bandColour(): string {
  return cssVar('--chart-fit-band', 'rgba(194, 65, 12, 0.18)');
}

function roleOf(chart: Chart<'scatter', XY[]>, role: 'upper' | 'lower'): BandDataset | undefined {
  return (chart.data.datasets as BandDataset[]).find((d) => d.bandRole === role);
}

/**
 * Adds the band layer to the fit chart: an upper-edge dataset filled down to the lower-edge one
 * (drawn under the points and the curve; only the upper edge is in the legend). Call once.
 * Cost O(1).
 */
export function addBandLayer(chart: Chart<'scatter', XY[]>): void {
  const c = bandColour();
  const upper: BandDataset = { label: 'Band', data: [], showLine: true, pointRadius: 0, pointHitRadius: 3, borderWidth: 1, borderColor: c, backgroundColor: c, fill: '+1', order: 5, bandRole: 'upper' };
  const lower: BandDataset = { label: 'Band (lower edge)', data: [], showLine: true, pointRadius: 0, pointHitRadius: 3, borderWidth: 1, borderColor: c, backgroundColor: c, fill: false, order: 5, bandRole: 'lower', legendHidden: true };
  chart.data.datasets.push(upper, lower);
  const labels = (chart.options.plugins as { legend: { labels: { filter?: unknown } } }).legend.labels;
  labels.filter = (item: { datasetIndex?: number }, data: { datasets: BandDataset[] }) => data.datasets[item.datasetIndex ?? -1]?.legendHidden !== true;
}

/** The legend text of a band. @example bandLabel({ level: 0.95, kind: 1, … }) // → '95 % confidence band' */
export function bandLabel(band: Pick<BandView, 'level' | 'kind'>): string {
  return `${percent(band.level)} % ${band.kind === 1 ? 'confidence' : 'prediction'} band`;
}

/**
 * Shows `band` on the fit chart (undefined removes it) and updates the chart. Cost O(grid).
 */
export function showBand(chart: Chart<'scatter', XY[]>, band: BandView | undefined): void {
  const upper = roleOf(chart, 'upper');
  const lower = roleOf(chart, 'lower');
  if (!upper || !lower) return;
  const pts = (v: readonly number[]): XY[] => (band ? band.x.map((x, i) => ({ x, y: v[i]! })).filter((p) => Number.isFinite(p.y)) : []);
  upper.data = pts(band?.upper ?? []);
  lower.data = pts(band?.lower ?? []);
  upper.hidden = band === undefined;
  lower.hidden = band === undefined;
  if (band) {
    upper.label = bandLabel(band);
    lower.label = `${bandLabel(band)} (lower edge)`;
  }
  chart.update();
}

/** The band as drawn (for the tests): upper and lower edge points, or null when none is shown. */
export function bandDrawn(chart: Chart<'scatter', XY[]>): { label: string; upper: XY[]; lower: XY[] } | null {
  const upper = roleOf(chart, 'upper');
  const lower = roleOf(chart, 'lower');
  if (!upper || !lower || upper.hidden === true || upper.data.length === 0) return null;
  return { label: upper.label ?? '', upper: upper.data.map((p) => ({ x: p.x, y: p.y })), lower: lower.data.map((p) => ({ x: p.x, y: p.y })) };
}

/** Re-reads the band colour of the theme. */
export function themeBand(chart: Chart<'scatter', XY[]>): void {
  const c = bandColour();
  for (const role of ['upper', 'lower'] as const) {
    const d = roleOf(chart, role);
    if (d) Object.assign(d, { borderColor: c, backgroundColor: c });
  }
  chart.update();
}

/** The residual plot: residual (y − fitted) against x, with a dashed zero line. */
export class ResidualChart {
  readonly chart: Chart<'scatter', XY[]>;
  private xKind: XKind = 'number';
  constructor(canvas: HTMLCanvasElement) {
    const p = palette();
    this.chart = paneChart(canvas, 'scatter', [
      { label: 'Residual', data: [], pointRadius: 2.5, pointHoverRadius: 4, backgroundColor: p.points, borderColor: p.points, order: 1 },
      { label: 'Zero', data: [], showLine: true, pointRadius: 0, pointHitRadius: 0, borderWidth: 1.5, borderDash: [6, 4], borderColor: p.curve, backgroundColor: p.curve, order: 0 },
    ], {
      normalized: true,
      scales: dataScales('residual'),
      plugins: {
        legend: { display: false },
        title: { display: false },
        tooltip: { callbacks: { label: (c) => `residual ${num(c.parsed.y ?? NaN)} at ${xText(c.parsed.x ?? NaN, this.xKind)}` } },
      },
    });
    this.theme();
  }

  /** Shows the residuals (empty clears the plot); `xLabel` names the x axis. Cost O(n). */
  show(points: readonly XY[], xLabel: string, xKind: XKind = 'number'): void {
    this.xKind = xKind;
    const d = this.chart.data.datasets;
    d[0]!.data = points.map((q) => ({ x: q.x, y: q.y }));
    let lo = Infinity;
    let hi = -Infinity;
    for (const q of points) {
      if (q.x < lo) lo = q.x;
      if (q.x > hi) hi = q.x;
    }
    d[1]!.data = points.length > 0 ? [{ x: lo, y: 0 }, { x: hi, y: 0 }] : [];
    setXAxis(this.chart, xLabel, xKind, tick);
    this.chart.update();
  }

  /** Re-reads the theme colours. */
  theme(): void {
    const p = palette();
    recolour(this.chart, [p.points, p.curve], p);
  }
}
