/**
 * The band panel: the level and kind controls, the band shaded around the curve on the fit chart
 * (RATCHET.BAND through the registry, uncertainty.ts) and the residual plot under the chart. For
 * the classic fit (knots 0), which has no valid pointwise band, the controls are disabled and one
 * line says why.
 */
import type { FitView } from '../analysis.js';
import type { FitChart } from '../charts.js';
import type { FitSettings } from '../formulas.js';
import { addBandLayer, bandDrawn, ResidualChart, showBand, themeBand } from '../band-charts.js';
import { argumentOf, bandGrid, flatHint, bandSentence, computeBand, residuals, residualSummary, usedRows, type BandControls, type BandView, type UsedRows } from '../uncertainty.js';
import { el, errorText, fieldMessage, fmt } from './dom.js';
import type { Selection } from './selection.js';

/** The one-line reason shown instead of a band for the classic fit. */
export const CLASSIC_NO_BAND =
  'No band for the classic fit (knot count 0): its pointwise bands would be wrong (README “Cautions for bands”). Set 2 or more knots for a band and a read-back interval.';

/** The band section of the fit card, and the residual plot. */
export class BandPanel {
  /** The band drawn now (undefined when none). */
  band: BandView | undefined;
  /** Why no band is drawn, or the flat-stretch caution under a band drawn ('' when neither). */
  note = '';
  /** The rows of the fit drawn now, with fitted values (undefined without a fit). */
  rows: UsedRows | undefined;
  readonly residualChart: ResidualChart;

  constructor(private readonly fitChart: FitChart) {
    addBandLayer(fitChart.chart);
    this.residualChart = new ResidualChart(el<HTMLCanvasElement>('residual-chart'));
  }

  /**
   * Reads the band controls: the level as typed (RATCHET.BAND checks it; an empty field is the
   * functions' default 0.95) and the kind.
   */
  controls(): BandControls & { level: string } {
    const level = el<HTMLInputElement>('band-level').value.trim();
    return { level: level === '' ? '0.95' : level, kind: el<HTMLSelectElement>('band-kind').value === '2' ? 2 : 1 };
  }

  /** The level as a number when the field holds one strictly between 0 and 1, else undefined. */
  level(): number | undefined {
    const v = Number(this.controls().level);
    return v > 0 && v < 1 ? v : undefined;
  }

  /**
   * Draws the band and the residuals of the fit shown (`view`, computed from `sel` with `fit`);
   * without a fit both are cleared. Cost: one BAND call over about 120 x plus one FIT call (both
   * cached by the functions for these data).
   */
  render(sel: Selection | undefined, view: FitView | undefined, fit: FitSettings): void {
    this.band = undefined;
    this.rows = undefined;
    const classic = fit.knots === 0;
    el<HTMLInputElement>('band-level').disabled = classic;
    el<HTMLSelectElement>('band-kind').disabled = classic;
    fieldMessage('band-level', undefined);
    if (!sel || !view) {
      this.note = '';
    } else {
      try {
        this.rows = usedRows(sel.data, fit);
      } catch (e) {
        this.rows = undefined;
        this.note = errorText(e);
      }
      if (classic) {
        this.note = CLASSIC_NO_BAND;
      } else if (this.rows) {
        try {
          this.band = computeBand(sel.data, fit, this.controls(), bandGrid(this.rows.x, view.knots.map(([x]) => x)));
          this.note = flatHint(view);
        } catch (e) {
          if (argumentOf(e) === 'level') {
            fieldMessage('band-level', errorText(e));
            this.note = 'No band until the level is a number strictly between 0 and 1 (for example 0.95).';
          } else {
            this.note = `No band: ${errorText(e)}`;
          }
        }
      }
    }
    el<HTMLElement>('band-note').textContent = this.note;
    showBand(this.fitChart.chart, this.band);
    const res = this.rows ? residuals(this.rows) : [];
    this.residualChart.show(res, sel?.labels.x ?? 'x', sel?.xKind);
    const summary = residualSummary(res, fmt);
    el<HTMLCanvasElement>('residual-chart').setAttribute('aria-label', summary);
    el<HTMLElement>('residual-chart-summary').textContent = summary;
  }

  /** The band in words, for the fit chart's text alternative ('' without a fit). */
  sentence(hasFit: boolean): string {
    if (!hasFit) return '';
    if (this.band) return bandSentence(this.band);
    return this.note === CLASSIC_NO_BAND ? 'No band for the classic fit.' : 'No band.';
  }

  /** Re-reads the theme colours of the band and the residual plot. */
  theme(): void {
    themeBand(this.fitChart.chart);
    this.residualChart.theme();
  }

  /** What the tests read: the band as drawn, the note, the residual points. */
  snapshot(): {
    band: { label: string; level: number; kind: 1 | 2; upper: { x: number; y: number }[]; lower: { x: number; y: number }[] } | null;
    note: string;
    residuals: { x: number; y: number }[];
    zero: { x: number; y: number }[];
  } {
    const drawn = bandDrawn(this.fitChart.chart);
    const [res, zero] = this.residualChart.chart.data.datasets.map((d) => d.data.map((p) => ({ x: p.x, y: p.y })));
    return { band: drawn && this.band ? { ...drawn, level: this.band.level, kind: this.band.kind } : null, note: this.note, residuals: res ?? [], zero: zero ?? [] };
  }
}
