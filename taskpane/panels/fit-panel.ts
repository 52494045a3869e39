/**
 * The fit panel: the knots and direction controls, the fit chart, the statistics and knot tables,
 * the status line and the knot-table download. Every number comes from the registry (analysis.ts).
 */
import { computeFit, knotTableCsv, type FitView } from '../analysis.js';
import { FitChart } from '../charts.js';
import type { DirectionCode, FitSettings } from '../formulas.js';
import { el, errorText, fmt, setStatus } from './dom.js';
import type { Selection } from './selection.js';

/** The fit section of the pane. */
export class FitPanel {
  /** The fit shown now (undefined when there is none or the data give an error). */
  view: FitView | undefined;
  /** The error shown instead of a fit, if any. */
  error: string | null = null;
  readonly chart: FitChart;

  constructor() {
    this.chart = new FitChart(el<HTMLCanvasElement>('fit-chart'));
  }

  /** Reads the fit controls. */
  settings(): FitSettings {
    const raw = el<HTMLInputElement>('knots').value.trim();
    const knots = raw === '' ? 0 : Number(raw);
    const direction = Number(el<HTMLSelectElement>('direction').value) as DirectionCode;
    return { knots, direction };
  }

  /** Shows a status message in the fit section. */
  status(text: string, error = false): void {
    setStatus('fit-status', text, error);
  }

  /** Refits `sel` with the current settings and redraws the chart and both tables. */
  show(sel: Selection | undefined): void {
    this.view = undefined;
    this.error = null;
    if (sel) {
      try {
        this.view = computeFit(sel.data, this.settings());
        const n = this.view.points.length;
        this.status(`${sel.description}: ${n} rows used${n < 15 ? ' — few points: expect a noisy cross-validation' : ''}.`);
      } catch (e) {
        this.error = errorText(e);
        this.status(this.error, true);
      }
    } else {
      this.status('Choose the data to fit.');
    }
    this.chart.show(this.view, sel?.labels ?? { x: 'x', y: 'y' });
  }

  /** Redraws the statistics table. */
  renderStats(): void {
    const t = el<HTMLTableElement>('stats');
    t.replaceChildren();
    for (const [label, value] of this.view?.stats ?? []) {
      const tr = document.createElement('tr');
      const a = document.createElement('td');
      a.textContent = label;
      const b = document.createElement('td');
      b.textContent = typeof value === 'object' ? `${value.code} ${value.message}` : label === 'direction' ? (value === 1 ? 'rising (1)' : 'falling (−1)') : fmt(value);
      tr.append(a, b);
      t.append(tr);
    }
  }

  /** Redraws the knot table. */
  renderKnotTable(): void {
    const body = el<HTMLTableElement>('knot-table').tBodies[0]!;
    body.replaceChildren();
    for (const [x, y] of this.view?.knots ?? []) {
      const tr = document.createElement('tr');
      for (const v of [x, y]) {
        const td = document.createElement('td');
        td.textContent = fmt(v);
        tr.append(td);
      }
      body.append(tr);
    }
  }

  /** Downloads the knot table as CSV named after the selection. */
  download(sel: Selection | undefined): void {
    if (!this.view || !sel) return;
    const blob = new Blob([knotTableCsv(this.view.knots)], { type: 'text/csv;charset=utf-8' });
    const url = URL.createObjectURL(blob);
    const a = document.createElement('a');
    a.href = url;
    a.download = `${sel.fileStem}-knots.csv`;
    document.body.append(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 10000);
  }
}
