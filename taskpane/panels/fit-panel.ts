/**
 * The fit panel: the knots, direction, curvature and degree controls, the fit chart, the
 * statistics and knot tables, the status line and the knot-table download. Every number comes
 * from the registry (analysis.ts); a setting the functions refuse (the classic fit with a
 * curvature or degree 2) shows the function's own message at its field.
 */
import { CellFailure, computeFit, knotTableCsv, type FitView } from '../analysis.js';
import { FitChart } from '../charts.js';
import type { CurvatureCode, DegreeCode, DirectionCode, FitSettings } from '../formulas.js';
import { el, errorText, fieldMessage, fmt, setStatus } from './dom.js';
import { knotCountWarning, readKnotField } from '../guards.js';
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

  /** The last fit drawn without an error: kept on the chart, greyed, while an input is wrong. */
  private lastGood: { view: FitView; labels: { x: string; y: string }; shape: Pick<FitSettings, 'curvature' | 'degree'> } | undefined;

  /**
   * Reads the fit controls. A knot field the pane does not accept (1, 2.5, text) reads as its
   * number so that formulas show what was typed; {@link show} refuses to fit it.
   */
  settings(): FitSettings {
    const raw = el<HTMLInputElement>('knots').value;
    const k = readKnotField(raw);
    const knots = k.ok ? k.knots : Number(raw.trim());
    const direction = Number(el<HTMLSelectElement>('direction').value) as DirectionCode;
    const curvature = Number(el<HTMLSelectElement>('curvature').value) as CurvatureCode;
    const degree = Number(el<HTMLSelectElement>('degree').value) as DegreeCode;
    return { knots, direction, curvature, degree };
  }

  /** Shows a status message in the fit section. */
  status(text: string, error = false): void {
    setStatus('fit-status', text, error);
  }

  /** Refits `sel` with the current settings and redraws the chart and both tables. */
  show(sel: Selection | undefined, inputProblem?: string): void {
    this.view = undefined;
    this.error = null;
    const k = readKnotField(el<HTMLInputElement>('knots').value);
    fieldMessage('knots', k.ok ? undefined : k.message);
    for (const f of SHAPE_FIELDS) fieldMessage(f, undefined);
    let fieldError = false;
    if (inputProblem !== undefined) {
      // A refused input (shown at its own field): keep the last good fit, greyed.
      this.error = inputProblem;
    } else if (!k.ok) {
      this.error = k.message;
    } else if (sel) {
      try {
        const view = computeFit(sel.data, this.settings());
        this.view = view;
        const n = view.points.length;
        const distinct = new Set(view.points.map((p) => p.x)).size;
        const warning = knotCountWarning(k.knots, distinct);
        if (warning !== undefined) fieldMessage('knots', warning, 'warning');
        this.status(`${sel.description}: ${n} rows used${n < 15 ? ' — few points: expect a noisy cross-validation' : ''}.`);
      } catch (e) {
        this.error = errorText(e);
        const field = shapeFieldOf(e);
        if (field !== undefined) {
          // The function's own message, at the field that caused it (not in the status below).
          fieldMessage(field, this.error);
          fieldError = true;
        } else {
          this.status(this.error, true);
        }
      }
    } else {
      this.status('Choose the data to fit.');
    }
    if (this.error !== null && (inputProblem !== undefined || !k.ok || fieldError)) this.status('The chart shows the last good fit, greyed, until the input is fixed.');
    const labels = sel?.labels ?? { x: 'x', y: 'y' };
    const settings = this.settings();
    if (this.view) this.lastGood = { view: this.view, labels, shape: { curvature: settings.curvature, degree: settings.degree } };
    else if (sel === undefined) this.lastGood = undefined;
    const stale = this.view === undefined && this.lastGood !== undefined && this.error !== null;
    el<HTMLElement>('fit-chart-box').classList.toggle('stale', stale);
    const shown = this.view ?? (stale ? this.lastGood!.view : undefined);
    this.chart.show(shown, this.view ? labels : stale ? this.lastGood!.labels : labels, sel?.xKind);
    this.summarise(shown, stale, this.view ? settings : this.lastGood?.shape);
  }

  /** A sentence appended to the chart's text alternative for a current fit (the band panel's). */
  summaryTail: () => string = () => '';

  /** The chart's text alternative: knot count, direction, shape and r2 of the fit drawn (and the tail's sentence for a current fit). */
  summarise(view: FitView | undefined = this.view, stale = false, shape: Pick<FitSettings, 'curvature' | 'degree'> = this.settings()): void {
    const tail = view !== undefined && !stale ? this.summaryTail() : '';
    const text = view === undefined ? 'No fit drawn.' : `${fitSummary(view, stale, shape)}${tail === '' ? '' : ` ${tail}`}`;
    el<HTMLCanvasElement>('fit-chart').setAttribute('aria-label', text);
    el<HTMLElement>('fit-chart-summary').textContent = text;
  }

  /** Redraws the statistics table (numbers to the digits shown). */
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
    const smooth = this.view?.smooth === true;
    el<HTMLElement>('knot-table-caption').textContent = smooth
      ? 'Knot table (RATCHET.KNOTS) of a smooth fit: knots and, between them, interval midpoints (marked ·); in a sheet its third column of 2s tells EVAL to read parabolas'
      : 'Knot table (RATCHET.KNOTS)';
    (this.view?.knots ?? []).forEach(([x, y], i) => {
      const tr = document.createElement('tr');
      if (smooth && i % 2 === 1) tr.className = 'midpoint';
      for (const v of [x, y]) {
        const td = document.createElement('td');
        td.textContent = smooth && i % 2 === 1 && v === x ? `· ${fmt(v)}` : fmt(v);
        tr.append(td);
      }
      body.append(tr);
    });
  }

  /** Downloads the knot table as CSV named after the selection. */
  download(sel: Selection | undefined): void {
    if (!this.view || !sel) return;
    const blob = new Blob([knotTableCsv(this.view.knots, this.view.smooth)], { type: 'text/csv;charset=utf-8' });
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

/** The fields whose refusal by the functions is shown at the field itself. */
const SHAPE_FIELDS = ['curvature', 'degree'] as const;

/**
 * The shape field an error is about: the functions' messages start with the argument's name
 * ("curvature: needs knots (K ≥ 2): …"), so the pane can show the message at that field.
 */
function shapeFieldOf(e: unknown): (typeof SHAPE_FIELDS)[number] | undefined {
  if (!(e instanceof CellFailure)) return undefined;
  return SHAPE_FIELDS.find((f) => e.message.startsWith(`${f}:`));
}

/**
 * A fit in one sentence, for the chart's text alternative: points, knots, direction, the shape
 * (when it is not the plain one) and r2 (r2 to the digits shown). A smooth fit counts its knots,
 * not the midpoint rows of its table.
 * @example fitSummary(view) // → "Fit chart: 28 points, 5 knots, rising, r2 0.9312."
 * @example fitSummary(computeFit({ x: [1, 2, 3, 4, 5, 6], y: [10, 14, 12, 17, 16, 21] }, { knots: 3, direction: 1, curvature: -1, degree: 2 }), false, { curvature: -1, degree: 2 })
 * // → "Fit chart: 6 points, 3 knots, rising, concave, smooth, r2 0.8188." (README example data)
 */
export function fitSummary(view: FitView, stale = false, shape: Pick<FitSettings, 'curvature' | 'degree'> = {}): string {
  const stat = (name: string): unknown => view.stats.find(([k]) => k === name)?.[1];
  const d = stat('direction');
  const r2 = stat('r2');
  const c = shape.curvature ?? 0;
  const words = [c === -1 ? 'concave' : c === 1 ? 'convex' : '', view.smooth ? 'smooth' : ''].filter((w) => w !== '');
  return (
    `${stale ? 'Last good fit (greyed; the input is wrong now)' : 'Fit chart'}: ${view.points.length} points, ${view.knotMarkers.length} knots, ` +
    `${d === 1 ? 'rising' : d === -1 ? 'falling' : 'direction unknown'}${words.map((w) => `, ${w}`).join('')}${typeof r2 === 'number' ? `, r2 ${fmt(r2)}` : ''}.`
  );
}
