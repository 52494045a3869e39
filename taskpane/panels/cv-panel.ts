/**
 * The cross-validation panel: its controls, RATCHET.CV and RATCHET.BESTK run in the worker with a
 * progress bar and Cancel, the CV chart and the suggestion's status line.
 */
import { isRatchetError, suggestKnots } from '../../src/core/index.js';
import type { WorkerClient } from '../../src/functions/worker-client.js';
import type { CellResult } from '../../src/functions/types.js';
import { cvArgs, cvRows } from '../analysis.js';
import { CvChart, type CvView } from '../charts.js';
import { parseCandidates, type CvSettings, type FitSettings } from '../formulas.js';
import { el, errorText, fmt, setStatus } from './dom.js';
import type { Selection } from './selection.js';

/**
 * The shape a cross-validation ran for, as words for its summary line ("" for the plain fit).
 * @example shapeWords({ direction: 1, curvature: -1, degree: 2 }) // → ' for concave smooth fits'
 */
export function shapeWords(fit: Pick<FitSettings, 'curvature' | 'degree'>): string {
  const c = fit.curvature ?? 0;
  const d = fit.degree ?? 1;
  if (c === 0 && d === 1) return '';
  const words = [c === -1 ? 'concave' : c === 1 ? 'convex' : '', d === 2 ? 'smooth' : 'piecewise-linear'].filter((w) => w !== '');
  return ` for ${words.join(' ')} fits`;
}

/** State of the cross-validation run. */
export type CvState = 'idle' | 'running' | 'done' | 'cancelled' | 'error';

/** What the panel needs from the rest of the pane. */
export interface CvHost {
  selection(): Selection | undefined;
  /** The fit's direction and shape: the candidates are cross-validated for this shape. */
  fit(): Pick<FitSettings, 'direction' | 'curvature' | 'degree'>;
  /** Rows the current fit uses (undefined without a fit). */
  rowsUsed(): number | undefined;
}

/** The cross-validation section of the pane. */
export class CvPanel {
  view: CvView | undefined;
  state: CvState = 'idle';
  progress = 0;
  readonly chart: CvChart;
  private abort: AbortController | undefined;
  private progressFrame = 0;

  constructor(
    private readonly client: WorkerClient,
    private readonly host: CvHost,
  ) {
    this.chart = new CvChart(el<HTMLCanvasElement>('cv-chart'));
  }

  /** Reads the cross-validation controls. @throws Error for a malformed candidates field. */
  settings(): CvSettings {
    const num = (id: string, def: number): number => {
      const v = el<HTMLInputElement>(id).value.trim();
      return v === '' ? def : Number(v);
    };
    return {
      candidates: parseCandidates(el<HTMLInputElement>('cv-candidates').value),
      folds: num('cv-folds', 5),
      repeats: num('cv-repeats', 1),
      seed: num('cv-seed', 1),
      rule: el<HTMLSelectElement>('cv-rule').value === '0' ? 0 : 1,
    };
  }

  /** Re-renders the summary of the last run (the digits shown changed). */
  private summary: (() => string) | undefined;

  /** Redraws the chart and the run's summary line with the digits shown now. */
  redraw(): void {
    this.chart.show(this.view);
    if (this.summary && this.state === 'done') this.status(this.summary());
  }

  /** Shows a status message in the cross-validation section. */
  status(text: string, error = false): void {
    setStatus('cv-status', text, error);
  }

  /** Records progress; the bar is redrawn at most once per animation frame (the worker reports every fit). */
  private setProgress(f: number): void {
    this.progress = f;
    if (this.progressFrame !== 0) return;
    this.progressFrame = requestAnimationFrame(() => {
      this.progressFrame = 0;
      const bar = el<HTMLProgressElement>('cv-progress');
      bar.value = this.progress;
      bar.setAttribute('aria-valuetext', `${Math.round(this.progress * 100)} %`);
    });
  }

  /** Drops the results (other data or settings), stopping a running run, and shows `message`. */
  invalidate(message: string): void {
    if (this.state === 'running') this.cancel(true);
    this.view = undefined;
    this.state = 'idle';
    this.setProgress(0);
    this.chart.show(undefined);
    el<HTMLButtonElement>('use-suggestion').disabled = true;
    this.status(message);
  }

  /** Runs RATCHET.CV and RATCHET.BESTK in the worker; progress bar; Cancel stops it. */
  async suggest(): Promise<void> {
    const sel = this.host.selection();
    if (!sel || this.state === 'running') return;
    let cv: CvSettings;
    try {
      cv = this.settings();
    } catch (e) {
      this.status(errorText(e), true);
      return;
    }
    const fit = this.host.fit();
    const abort = new AbortController();
    this.abort = abort;
    this.state = 'running';
    this.setProgress(0);
    el<HTMLButtonElement>('suggest').disabled = true;
    el<HTMLButtonElement>('cancel').disabled = false;
    el<HTMLButtonElement>('use-suggestion').disabled = true;
    this.status('Cross-validating…');
    const started = performance.now();
    try {
      const table: CellResult = await this.client.run('cv', 'CV', cvArgs(sel.data, cv, fit, false), {
        signal: abort.signal,
        onProgress: (f) => this.setProgress(f),
      });
      const best = await this.client.run('cv', 'BESTK', cvArgs(sel.data, cv, fit, true), { signal: abort.signal });
      if (this.abort !== abort) return;
      const rows = cvRows(table);
      const rule = cv.rule;
      const threshold = suggestKnots(rows, rule === 1 ? 'one-se' : 'min').threshold;
      this.view = { rows, best: Number(best), rule, threshold };
      this.state = 'done';
      this.setProgress(1);
      this.chart.show(this.view);
      const b = this.view.best;
      const r = rows.find((q) => q.knots === b);
      const ms = Math.round(performance.now() - started);
      const few = (this.host.rowsUsed() ?? 0) < 30;
      this.summary = () =>
        `Suggested knot count: ${b === 0 ? '0 (classic fit)' : b} by the ${rule === 1 ? 'one-standard-error rule' : 'minimum cv_rmse'}` +
          (r ? ` (cv_rmse ${fmt(r.cvRmse)} ± ${fmt(r.cvSe)})` : '') +
          `${shapeWords(fit)}; ${rows.length} candidates, ${cv.folds} folds × ${cv.repeats} repeat${cv.repeats === 1 ? '' : 's'}, ${ms} ms.` +
          (few ? ' Few points: this choice is noisy.' : '');
      this.status(this.summary());
      el<HTMLButtonElement>('use-suggestion').disabled = false;
    } catch (e) {
      if (this.abort !== abort) return;
      if (isRatchetError(e) && e.code === 'CANCELLED') {
        this.state = 'cancelled';
        this.status('Cancelled.');
      } else {
        this.state = 'error';
        this.status(errorText(e), true);
      }
      this.setProgress(0);
    } finally {
      if (this.abort === abort) {
        this.abort = undefined;
        el<HTMLButtonElement>('cancel').disabled = true;
        el<HTMLButtonElement>('suggest').disabled = this.host.selection() === undefined;
      }
    }
  }

  /** Stops a running cross-validation (the worker is terminated). */
  cancel(silent = false): void {
    const a = this.abort;
    if (!a) return;
    this.abort = undefined;
    a.abort();
    this.state = 'cancelled';
    this.setProgress(0);
    el<HTMLButtonElement>('cancel').disabled = true;
    el<HTMLButtonElement>('suggest').disabled = this.host.selection() === undefined;
    if (!silent) {
      this.status('Cancelled.');
      el<HTMLButtonElement>('suggest').focus();
    }
  }
}
