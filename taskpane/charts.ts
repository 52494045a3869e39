/**
 * The pane's two Chart.js charts: (1) data points, fitted curve and knots; (2) cv_rmse ± cv_se
 * against the knot count with the suggestion and the rule's threshold. Colours come from CSS
 * custom properties so both follow the light/dark theme.
 */
import {
  Chart,
  Filler,
  Legend,
  LinearScale,
  LineController,
  LineElement,
  PointElement,
  ScatterController,
  Title,
  Tooltip,
  type ChartConfiguration,
  type ChartDataset,
  type ChartOptions,
} from 'chart.js';
import type { CvRow, FitView } from './analysis.js';
import { formatNumber } from '../src/view/number-format.js';
import { shownDigits } from './panels/dom.js';
import { formatSerial } from './dates.js';

Chart.register(ScatterController, LineController, LinearScale, PointElement, LineElement, Filler, Legend, Tooltip, Title);

type XY = { x: number; y: number };

/** A CSS custom property of the page (theme colours), or `fallback` when unset. O(1). @example cssVar('--chart-band', '#888') // → 'rgba(74, 111, 165, 0.22)' */
export function cssVar(name: string, fallback: string): string {
  const v = getComputedStyle(document.documentElement).getPropertyValue(name).trim();
  return v === '' ? fallback : v;
}

/** The chart colours of the current theme. */
export interface Palette {
  points: string;
  curve: string;
  knots: string;
  band: string;
  grid: string;
  text: string;
  mark: string;
}

/** The chart colours read from the page's CSS custom properties now (light or dark). O(1). */
export function palette(): Palette {
  return {
    points: cssVar('--chart-points', '#4a6fa5'),
    curve: cssVar('--chart-curve', '#c2410c'),
    knots: cssVar('--chart-knots', '#15803d'),
    band: cssVar('--chart-band', 'rgba(74,111,165,0.22)'),
    grid: cssVar('--chart-grid', 'rgba(0,0,0,0.1)'),
    text: cssVar('--chart-text', '#1b1b1f'),
    mark: cssVar('--chart-mark', '#b91c1c'),
  };
}

/** A number on a chart (tooltips, value ticks): the digits the pane shows. */
export const num = (v: number): string => formatNumber(v, shownDigits());
/** Tick labels: at most the digits shown, and Chart.js's own step-aware rounding when shorter. */
export const tick = (v: number | string): string => (typeof v === 'number' ? num(v) : v);
/** Ticks small enough for a 320 px pane. */
export const TICK_FONT = { size: 11 };

/** How a chart shows its x values: as numbers, or (serial day numbers) as dates. */
export type XKind = 'number' | 'date';

/**
 * An x value as a chart's tooltip shows it: a date for serial day numbers (`kind` "date"), the
 * digits shown otherwise. O(1). @example xText(45000.5, 'date') // → '2023-03-15 12:00'
 */
export function xText(v: number, kind: XKind): string {
  return kind === 'date' ? formatSerial(v) : num(v);
}

/**
 * A chart of the pane on `canvas`: `type`, `datasets` of `{x, y}` points, and `options` over the
 * options every chart of the pane shares (no animation, sized by its box rather than an aspect
 * ratio, no parsing: the data are given as points). The caller sets the theme colours (`recolour`).
 * O(datasets).
 */
export function paneChart<T extends 'scatter' | 'line'>(canvas: HTMLCanvasElement, type: T, datasets: ChartDataset<T, XY[]>[], options: ChartOptions<T>): Chart<T, XY[]> {
  const config = { type, data: { datasets }, options: { animation: false, maintainAspectRatio: false, responsive: true, parsing: false, ...options } };
  return new Chart(canvas, config as ChartConfiguration<T, XY[]>);
}

/**
 * A linear value axis titled `title`, ticks with the digits shown (a fresh object per call, so
 * each chart can retitle its own). O(1). @example valueScale('residual').title // → { display: true, text: 'residual' }
 */
export function valueScale(title: string) {
  return { type: 'linear' as const, title: { display: true, text: title }, grid: {}, ticks: { font: TICK_FONT, callback: tick } };
}

/**
 * The two axes of a chart drawn against the data's x: x titled "x" (renamed by `setXAxis`) with
 * level ticks at least 8 px apart, y titled `yTitle`; both linear, ticks with the digits shown.
 * Fresh objects per call. O(1).
 */
export function dataScales(yTitle: string) {
  const x = valueScale('x');
  return { x: { ...x, ticks: { ...x.ticks, maxRotation: 0, autoSkipPadding: 8 } }, y: valueScale(yTitle) };
}

/**
 * Names the x axis of `chart` `label` and sets how its ticks show x: dates for `kind` "date",
 * `numberTicks` otherwise (undefined: Chart.js's own ticks). The caller updates the chart. O(1).
 */
export function setXAxis(chart: Chart, label: string, kind: XKind, numberTicks: ((v: number | string) => string) | undefined): void {
  const x = chart.options.scales!.x as { title: { text: string }; ticks: { callback?: unknown } };
  x.title.text = label;
  x.ticks.callback = kind === 'date' ? (v: number | string) => formatSerial(Number(v)) : numberTicks;
}

/**
 * Re-reads the theme into `chart`: dataset i gets border and fill colour `colours[i]` (datasets
 * past the list keep theirs), the axes, legend and title the colours of `p`; then updates the
 * chart. O(datasets + axes).
 */
export function recolour(chart: Chart, colours: readonly string[], p: Palette): void {
  const d = chart.data.datasets;
  colours.forEach((c, i) => Object.assign(d[i]!, { backgroundColor: c, borderColor: c }));
  applyAxisTheme(chart, p);
  chart.update();
}

/** The fit chart. */
export class FitChart {
  readonly chart: Chart<'scatter', XY[]>;
  constructor(canvas: HTMLCanvasElement) {
    const p = palette();
    this.chart = paneChart(canvas, 'scatter', [
      { label: 'Data', data: [], pointRadius: 3, pointHoverRadius: 5, backgroundColor: p.points, borderColor: p.points, order: 3 },
      { label: 'Fitted curve', data: [], showLine: true, pointRadius: 0, pointHitRadius: 4, borderWidth: 2.5, borderColor: p.curve, backgroundColor: p.curve, order: 1 },
      { label: 'Knots', data: [], pointStyle: 'rectRot', pointRadius: 5, pointHoverRadius: 7, backgroundColor: p.knots, borderColor: p.knots, order: 0 },
    ], {
      normalized: true,
      scales: dataScales('y'),
      plugins: {
        legend: { position: 'bottom', labels: { sort: (a, b) => (a.datasetIndex ?? 0) - (b.datasetIndex ?? 0) } },
        title: { display: false },
        tooltip: { callbacks: { label: (c) => `${c.dataset.label}: (${xText(c.parsed.x ?? NaN, this.xKind)}, ${num(c.parsed.y ?? NaN)})` } },
      },
    });
    this.theme();
  }

  /** How the x axis and the tooltips show x: as numbers, or (serial day numbers) as dates. */
  private xKind: XKind = 'number';

  /** Shows a fit; `labels` name the axes; `xKind` "date" shows x (serial day numbers) as dates. */
  show(view: FitView | undefined, labels: { x: string; y: string }, xKind: XKind = 'number'): void {
    this.xKind = xKind;
    const d = this.chart.data.datasets;
    d[0]!.data = view ? view.points.map((q) => ({ x: q.x, y: q.y })) : [];
    // The curve: the knot table's vertices, or a smooth fit sampled densely by RATCHET.EVAL
    // (analysis.ts, curve-points.ts); the markers sit at the knots only.
    d[1]!.data = view ? view.curve.map((q) => ({ x: q.x, y: q.y })) : [];
    const markers = view ? view.knotMarkers.map((q) => ({ x: q.x, y: q.y })) : [];
    d[2]!.data = markers;
    // Many knots (classic fit at every distinct x): smaller markers so the data stay visible.
    (d[2] as ChartDataset<'scatter', XY[]>).pointRadius = markers.length > 40 ? 2.5 : 5;
    setXAxis(this.chart, labels.x, xKind, undefined);
    (this.chart.options.scales!.y as { title: { text: string } }).title.text = labels.y;
    this.chart.update();
  }

  /** Re-reads the theme colours. */
  theme(): void {
    const p = palette();
    recolour(this.chart, [p.points, p.curve, p.knots], p);
  }
}

/** Sets the axis, tick, legend and title colours of `chart` from `p` (the caller updates the chart). O(axes). */
export function applyAxisTheme(chart: Chart, p: Palette): void {
  // Assign single properties: Chart.js options are proxies, and copying them (spread) is not supported.
  for (const s of Object.values(chart.options.scales ?? {})) {
    const scale = s as { grid: { color?: unknown }; ticks: { color?: unknown }; title: { color?: unknown } };
    scale.grid.color = p.grid;
    scale.ticks.color = p.text;
    scale.title.color = p.text;
  }
  const pl = chart.options.plugins as { legend: { labels: { color?: unknown } }; title: { color?: unknown } };
  pl.legend.labels.color = p.text;
  pl.title.color = p.text;
}

/** What the CV chart shows. */
export interface CvView {
  readonly rows: readonly CvRow[];
  readonly best: number;
  readonly rule: 1 | 0;
  /** The rule's cut-off (min cv_rmse + its SE for one-SE, min cv_rmse for minimum). */
  readonly threshold: number;
}

/**
 * The label of a knot-count tick on the CV chart: "classic" for 0 only when the classic fit is
 * one of the candidates shown (`classic`), the count otherwise.
 */
export function knotTick(k: number, classic: boolean): string {
  return k === 0 && classic ? 'classic' : String(k);
}

/** The cross-validation chart. */
export class CvChart {
  readonly chart: Chart<'line', XY[]>;
  /** True when the classic fit (0) is among the candidates drawn. */
  private classic = false;
  constructor(canvas: HTMLCanvasElement) {
    const p = palette();
    this.chart = paneChart(canvas, 'line', [
      { label: 'cv_rmse ± cv_se', data: [], pointRadius: 0, borderWidth: 1, borderColor: p.band, backgroundColor: p.band, fill: '+1', order: 4 },
      { label: 'cv_rmse − cv_se', data: [], pointRadius: 0, borderWidth: 1, borderColor: p.band, backgroundColor: p.band, fill: false, order: 4 },
      { label: 'cv_rmse', data: [], pointRadius: 3, borderWidth: 2, borderColor: p.points, backgroundColor: p.points, fill: false, order: 2 },
      { label: 'Rule threshold', data: [], pointRadius: 0, borderWidth: 1.5, borderDash: [6, 4], borderColor: p.mark, backgroundColor: p.mark, fill: false, order: 3 },
      { label: 'Suggested', data: [], showLine: false, pointStyle: 'star', pointRadius: 11, pointBorderWidth: 2.5, borderColor: p.mark, backgroundColor: p.mark, order: 0 },
    ], {
      scales: {
        x: { type: 'linear', title: { display: true, text: 'knot count' }, grid: {}, ticks: { precision: 0, font: TICK_FONT, maxRotation: 0, callback: (v) => knotTick(Number(v), this.classic) } },
        y: valueScale('cv_rmse'),
      },
      plugins: {
        title: { display: true, text: 'No cross-validation yet' },
        legend: { position: 'bottom', labels: { filter: (item) => item.text !== 'cv_rmse − cv_se', sort: (a, b) => (a.datasetIndex ?? 0) - (b.datasetIndex ?? 0) } },
        tooltip: { callbacks: { label: (c) => `${c.dataset.label}: ${num(c.parsed.y ?? NaN)} at ${knotTick(c.parsed.x ?? NaN, this.classic)}` } },
      },
    });
    this.theme();
  }

  /** Shows a CV result (undefined clears the chart). */
  show(view: CvView | undefined): void {
    const d = this.chart.data.datasets;
    const rows = view ? [...view.rows].sort((a, b) => a.knots - b.knots) : [];
    this.classic = rows.some((r) => r.knots === 0);
    d[0]!.data = rows.map((r) => ({ x: r.knots, y: r.cvRmse + r.cvSe }));
    d[1]!.data = rows.map((r) => ({ x: r.knots, y: r.cvRmse - r.cvSe }));
    d[2]!.data = rows.map((r) => ({ x: r.knots, y: r.cvRmse }));
    if (view && rows.length > 0) {
      const x0 = rows[0]!.knots;
      const x1 = rows[rows.length - 1]!.knots;
      d[3]!.data = [
        { x: x0, y: view.threshold },
        { x: x1, y: view.threshold },
      ];
      const s = rows.find((r) => r.knots === view.best);
      d[4]!.data = s ? [{ x: s.knots, y: s.cvRmse }] : [];
      d[3]!.label = view.rule === 1 ? 'One-SE threshold (best cv_rmse + its SE)' : 'Minimum cv_rmse';
      const name = view.rule === 1 ? 'one-standard-error rule' : 'minimum cv_rmse';
      this.chart.options.plugins!.title!.text = `Suggested: ${view.best === 0 ? 'classic fit (0)' : `${view.best} knots`} — ${name}`;
    } else {
      d[3]!.data = [];
      d[4]!.data = [];
      this.chart.options.plugins!.title!.text = 'No cross-validation yet — press “Suggest knot count”';
    }
    // An empty chart shows the usual candidate range instead of Chart.js's 0…1 default.
    const sc = this.chart.options.scales as { x: { min?: number; max?: number }; y: { min?: number; max?: number } };
    sc.x.min = rows.length > 0 ? undefined : 2;
    sc.x.max = rows.length > 0 ? undefined : 20;
    this.chart.update();
    const summary = cvSummary(view);
    this.chart.canvas.setAttribute('aria-label', summary);
    const p = document.getElementById('cv-chart-summary');
    if (p) p.textContent = summary;
  }

  /** Re-reads the theme colours. */
  theme(): void {
    const p = palette();
    recolour(this.chart, [p.band, p.band, p.points, p.mark, p.mark], p);
  }
}

/**
 * The CV chart in one sentence, for its text alternative: candidates, the suggestion and its
 * cv_rmse (to the digits shown), the rule.
 * @example cvSummary(undefined) // → "Cross-validation chart: no cross-validation yet."
 */
export function cvSummary(view: CvView | undefined): string {
  if (!view || view.rows.length === 0) return 'Cross-validation chart: no cross-validation yet.';
  const ks = view.rows.map((r) => r.knots);
  const best = view.rows.find((r) => r.knots === view.best);
  return (
    `Cross-validation chart: cv_rmse of ${ks.length} candidates from ${Math.min(...ks)} to ${Math.max(...ks)} knots; ` +
    `suggested ${view.best === 0 ? 'the classic fit (0)' : `${view.best} knots`}` +
    (best ? ` with cv_rmse ${num(best.cvRmse)} ± ${num(best.cvSe)}` : '') +
    ` by the ${view.rule === 1 ? 'one-standard-error rule' : 'minimum cv_rmse'}.`
  );
}
