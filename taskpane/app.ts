/**
 * The task pane controller shared by Excel and the browser preview: reads the controls, shows the
 * fit (chart, statistics, knot table, formulas), runs cross-validation in the worker with
 * progress and Cancel, and exposes a read-only snapshot for the end-to-end tests
 * (`window.__ratchetTest.snapshot()`). Where the data come from is the business of
 * preview-mode.ts and office-mode.ts, which call {@link App.setSelection}.
 */
import { WorkerClient, type WorkerLike } from '../src/functions/worker-client.js';
import { MappedCellError } from '../src/adapter/errors.js';
import { isRatchetError, suggestKnots } from '../src/core/index.js';
import type { CellResult } from '../src/functions/types.js';
import { CellFailure, computeFit, cvArgs, cvRows, knotTableCsv, type CvRow, type DataColumns, type FitView } from './analysis.js';
import { allFormulas, parseCandidates, type CvSettings, type DataRefs, type DirectionCode, type FitSettings, type FormulaKind } from './formulas.js';
import { CvChart, FitChart, type CvView } from './charts.js';
import { HEATMAP_MAX_CELLS, computeSurface, gridFormula, knotField, renderHeatmap, type SecondInput, type SurfaceSettings } from './surface-view.js';
import type { HeatmapView } from '../src/view/heat-scale.js';

/** The data the pane works on, wherever they come from. */
export interface Selection {
  readonly data: DataColumns;
  /** References for the formulas. */
  readonly refs: DataRefs;
  readonly labels: { x: string; y: string };
  /** What was chosen, for the status line. */
  readonly description: string;
  /** Name of the knot-table download. */
  readonly fileStem: string;
  /** A second input: the pane then also shows the fitted surface over (x, x2) as a heat-map. */
  readonly x2?: SecondInput | undefined;
}

/** State of the cross-validation run. */
export type CvState = 'idle' | 'running' | 'done' | 'cancelled' | 'error';

/** What the tests can read. Plain data, copied on every call. */
export interface Snapshot {
  readonly mode: 'office' | 'preview';
  readonly points: { x: number; y: number }[];
  readonly curve: { x: number; y: number }[];
  readonly knots: { x: number; y: number }[];
  readonly stats: [string, number | string | boolean][];
  readonly data: { x: unknown[]; y: unknown[]; w: unknown[] | null } | null;
  readonly settings: { fit: FitSettings; cv: CvSettings } | null;
  readonly cv: { rows: CvRow[]; best: number; rule: 1 | 0; threshold: number; points: { x: number; y: number }[] } | null;
  readonly cvState: CvState;
  readonly progress: number;
  readonly formulas: Partial<Record<FormulaKind, string>>;
  readonly fitError: string | null;
  /** The heat-map of the surface (null when no x2 is chosen or GRID gave an error). */
  readonly surface: {
    readonly settings: SurfaceSettings;
    readonly knots1: number[];
    readonly knots2: number[];
    readonly values: number[][];
    /** Text and colours of the value cells as drawn (rows = x2 knots). */
    readonly text: string[][];
    readonly background: string[][];
    readonly formula: string;
  } | null;
  readonly surfaceError: string | null;
}

function el<T extends HTMLElement>(id: string): T {
  const e = document.getElementById(id);
  if (!e) throw new Error(`missing element #${id}`);
  return e as T;
}

function fmt(v: number | string | boolean): string {
  if (typeof v !== 'number') return String(v);
  if (Number.isInteger(v)) return String(v);
  return String(Number(v.toPrecision(8)));
}

function errorText(e: unknown): string {
  if (e instanceof CellFailure) return `${e.code} ${e.message}`;
  if (e instanceof MappedCellError) return `${e.mapped.code} ${e.mapped.message}`;
  if (isRatchetError(e)) return e.message;
  return e instanceof Error ? e.message : String(e);
}

/** Creates the cross-validation worker (the add-in's own worker entry, same implementations). */
function createWorker(): WorkerLike {
  return new Worker(new URL('../src/functions/worker.ts', import.meta.url), { name: 'ratchet-cv' }) as unknown as WorkerLike;
}

/** The pane. */
export class App {
  readonly mode: 'office' | 'preview';
  private selection: Selection | undefined;
  private view: FitView | undefined;
  private fitError: string | null = null;
  private cvView: CvView | undefined;
  private cvState: CvState = 'idle';
  private progress = 0;
  private abort: AbortController | undefined;
  private formulas: Partial<Record<FormulaKind, string>> = {};
  private surfaceView: HeatmapView | undefined;
  private surfaceError: string | null = null;
  private gridText: string | undefined;
  private readonly fitChart: FitChart;
  private readonly cvChart: CvChart;
  private readonly client: WorkerClient;
  /** Extra formula options from the host (PREDICT's new_xs). */
  newXsRef: string | undefined;
  /** Called after every refresh (Office mode keeps its insert buttons in step). */
  onRefresh: (() => void) | undefined;

  constructor(mode: 'office' | 'preview', workerFactory: () => WorkerLike = createWorker) {
    this.mode = mode;
    this.client = new WorkerClient(() => workerFactory());
    this.fitChart = new FitChart(el<HTMLCanvasElement>('fit-chart'));
    this.cvChart = new CvChart(el<HTMLCanvasElement>('cv-chart'));
    for (const n of document.querySelectorAll<HTMLElement>('[data-only]')) n.hidden = n.dataset.only !== mode;
    this.wire();
    this.cvChart.show(undefined);
    this.exposeTestHook();
  }

  private wire(): void {
    el<HTMLInputElement>('knots').addEventListener('change', () => this.refresh());
    for (const id of ['knots1', 'knots2', 'direction1', 'direction2']) el<HTMLElement>(id).addEventListener('change', () => this.refresh());
    el<HTMLSelectElement>('direction').addEventListener('change', () => {
      this.invalidateCv('The direction changed: run the suggestion again.');
      this.refresh();
    });
    for (const id of ['cv-candidates', 'cv-folds', 'cv-repeats', 'cv-seed', 'cv-rule']) {
      el<HTMLElement>(id).addEventListener('change', () => this.updateFormulas());
    }
    el<HTMLButtonElement>('suggest').addEventListener('click', () => void this.suggest());
    el<HTMLButtonElement>('cancel').addEventListener('click', () => this.cancel());
    el<HTMLButtonElement>('use-suggestion').addEventListener('click', () => {
      if (!this.cvView) return;
      el<HTMLInputElement>('knots').value = String(this.cvView.best);
      this.refresh();
      el<HTMLInputElement>('knots').focus();
    });
    el<HTMLButtonElement>('download').addEventListener('click', () => this.download());
    el<HTMLButtonElement>('copy').addEventListener('click', () => void this.copy());
    const media = window.matchMedia?.('(prefers-color-scheme: dark)');
    media?.addEventListener?.('change', () => {
      this.fitChart.theme();
      this.cvChart.theme();
    });
  }

  /** Sets the host line at the top. */
  setHostText(text: string): void {
    el<HTMLParagraphElement>('host').textContent = text;
  }

  /** Shows a status message in the fit section. */
  status(text: string, error = false): void {
    const s = el<HTMLDivElement>('fit-status');
    s.textContent = text;
    s.classList.toggle('error', error);
  }

  /** Replaces the data (undefined clears). Cross-validation results of other data are dropped. */
  setSelection(sel: Selection | undefined, keepCv = false): void {
    this.selection = sel;
    if (!keepCv) this.invalidateCv('');
    this.refresh();
  }

  /** Current data and references, if any. */
  current(): Selection | undefined {
    return this.selection;
  }

  /** The fit shown now (undefined when there is none or the data give an error). */
  currentFit(): FitView | undefined {
    return this.view;
  }

  /** Reads the fit controls. */
  fitSettings(): FitSettings {
    const raw = el<HTMLInputElement>('knots').value.trim();
    const knots = raw === '' ? 0 : Number(raw);
    const direction = Number(el<HTMLSelectElement>('direction').value) as DirectionCode;
    return { knots, direction };
  }

  /** Reads the cross-validation controls. @throws Error for a malformed candidates field. */
  cvSettings(): CvSettings {
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

  /** Refits and redraws everything that depends on the data or the fit settings. */
  refresh(): void {
    const sel = this.selection;
    this.view = undefined;
    this.fitError = null;
    if (sel) {
      try {
        this.view = computeFit(sel.data, this.fitSettings());
        const n = this.view.points.length;
        this.status(`${sel.description}: ${n} rows used${n < 15 ? ' — few points: expect a noisy cross-validation' : ''}.`);
      } catch (e) {
        this.fitError = errorText(e);
        this.status(this.fitError, true);
      }
    } else {
      this.status('Choose the data to fit.');
    }
    this.fitChart.show(this.view, sel?.labels ?? { x: 'x', y: 'y' });
    this.renderStats();
    this.renderKnotTable();
    this.renderSurface();
    this.updateFormulas();
    el<HTMLButtonElement>('download').disabled = this.view === undefined;
    el<HTMLButtonElement>('suggest').disabled = sel === undefined || this.cvState === 'running';
    this.onRefresh?.();
  }

  /** Reads the surface controls. */
  surfaceSettings(): SurfaceSettings {
    const d = (id: string): DirectionCode => Number(el<HTMLSelectElement>(id).value) as DirectionCode;
    return { knots1: knotField(el<HTMLInputElement>('knots1').value), knots2: knotField(el<HTMLInputElement>('knots2').value), direction1: d('direction1'), direction2: d('direction2') };
  }

  /** The surface section: hidden without x2; otherwise RATCHET.GRID of the data as a heat-map. */
  private renderSurface(): void {
    const sel = this.selection;
    const section = el<HTMLElement>('surface');
    const table = el<HTMLTableElement>('heatmap');
    const legend = el<HTMLElement>('heatmap-legend');
    this.surfaceView = undefined;
    this.surfaceError = null;
    if (!sel?.x2) {
      section.hidden = true;
      table.replaceChildren();
      legend.replaceChildren();
      return;
    }
    section.hidden = false;
    const s = el<HTMLDivElement>('surface-status');
    try {
      const view = computeSurface(sel.data, sel.x2.cells, this.surfaceSettings());
      const values = view.knots1.length * view.knots2.length;
      if (values > HEATMAP_MAX_CELLS) {
        table.replaceChildren();
        legend.replaceChildren();
        s.textContent = `The lattice has ${view.knots1.length} × ${view.knots2.length} = ${values} values — too many to draw here (at most ${HEATMAP_MAX_CELLS}). Choose knot counts along x and x2.`;
        s.classList.remove('error');
        return;
      }
      this.surfaceView = view;
      renderHeatmap(table, legend, view, { x1: sel.labels.x, x2: sel.x2.label, y: sel.labels.y });
      const rows = this.view?.points.length;
      s.textContent =
        `Surface over ${sel.labels.x} and ${sel.x2.label}: ${view.knots1.length} × ${view.knots2.length} = ${values} values` +
        (rows !== undefined && values >= rows / 2 ? ` from about ${rows} rows — at least one value per two rows: expect over-fit.` : '.');
      s.classList.remove('error');
    } catch (e) {
      this.surfaceError = errorText(e);
      table.replaceChildren();
      legend.replaceChildren();
      s.textContent = this.surfaceError;
      s.classList.add('error');
    }
  }

  private renderStats(): void {
    const t = el<HTMLTableElement>('stats');
    t.replaceChildren();
    for (const [label, value] of this.view?.stats ?? []) {
      const tr = document.createElement('tr');
      const a = document.createElement('td');
      a.textContent = label;
      const b = document.createElement('td');
      b.textContent = label === 'direction' ? (value === 1 ? 'rising (1)' : 'falling (−1)') : fmt(value);
      tr.append(a, b);
      t.append(tr);
    }
  }

  private renderKnotTable(): void {
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

  /** Rebuilds the formula text for the current references and settings. */
  updateFormulas(): void {
    const area = el<HTMLTextAreaElement>('formulas');
    const sel = this.selection;
    this.formulas = {};
    this.gridText = undefined;
    if (!sel) {
      area.value = '';
      el<HTMLButtonElement>('copy').disabled = true;
      return;
    }
    let cv: CvSettings;
    try {
      cv = this.cvSettings();
    } catch (e) {
      this.cvStatus(errorText(e), true);
      area.value = '';
      el<HTMLButtonElement>('copy').disabled = true;
      return;
    }
    this.formulas = allFormulas(sel.refs, this.fitSettings(), cv, this.newXsRef);
    const f = this.formulas as Record<FormulaKind, string>;
    if (sel.x2) this.gridText = gridFormula(sel.refs, sel.x2.ref, this.surfaceSettings());
    area.value = [
      `Knot table:       ${f.KNOTS}`,
      `Curve at new x:   ${f.PREDICT}`,
      `Fit statistics:   ${f.STATS}`,
      `Cross-validation: ${f.CV}`,
      `Suggested count:  ${f.BESTK}`,
      ...(this.gridText === undefined ? [] : [`Surface table:    ${this.gridText}`]),
    ].join('\n');
    el<HTMLButtonElement>('copy').disabled = false;
  }

  /** The RATCHET.GRID formula for the current x2 and surface settings (undefined without x2). */
  surfaceFormula(): string | undefined {
    return this.gridText;
  }

  /** The surface shown now (undefined without x2, on an error, or when too large to draw). */
  currentSurface(): HeatmapView | undefined {
    return this.surfaceView;
  }

  /** The formula of one kind for the current state (Office insert actions). */
  formula(kind: FormulaKind): string | undefined {
    return this.formulas[kind];
  }

  private cvStatus(text: string, error = false): void {
    const s = el<HTMLDivElement>('cv-status');
    s.textContent = text;
    s.classList.toggle('error', error);
  }

  private progressFrame = 0;

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

  private invalidateCv(message: string): void {
    if (this.cvState === 'running') this.cancel(true);
    this.cvView = undefined;
    this.cvState = 'idle';
    this.setProgress(0);
    this.cvChart.show(undefined);
    el<HTMLButtonElement>('use-suggestion').disabled = true;
    this.cvStatus(message);
  }

  /** Runs RATCHET.CV and RATCHET.BESTK in the worker; progress bar; Cancel stops it. */
  async suggest(): Promise<void> {
    const sel = this.selection;
    if (!sel || this.cvState === 'running') return;
    let cv: CvSettings;
    try {
      cv = this.cvSettings();
    } catch (e) {
      this.cvStatus(errorText(e), true);
      return;
    }
    const direction = this.fitSettings().direction;
    const abort = new AbortController();
    this.abort = abort;
    this.cvState = 'running';
    this.setProgress(0);
    el<HTMLButtonElement>('suggest').disabled = true;
    el<HTMLButtonElement>('cancel').disabled = false;
    el<HTMLButtonElement>('use-suggestion').disabled = true;
    this.cvStatus('Cross-validating…');
    const started = performance.now();
    try {
      const table: CellResult = await this.client.run('cv', 'CV', cvArgs(sel.data, cv, direction, false), {
        signal: abort.signal,
        onProgress: (f) => this.setProgress(f),
      });
      const best = await this.client.run('cv', 'BESTK', cvArgs(sel.data, cv, direction, true), { signal: abort.signal });
      if (this.abort !== abort) return;
      const rows = cvRows(table);
      const rule = cv.rule;
      const threshold = suggestKnots(rows, rule === 1 ? 'one-se' : 'min').threshold;
      this.cvView = { rows, best: Number(best), rule, threshold };
      this.cvState = 'done';
      this.setProgress(1);
      this.cvChart.show(this.cvView);
      const b = this.cvView.best;
      const r = rows.find((q) => q.knots === b);
      const ms = Math.round(performance.now() - started);
      this.cvStatus(
        `Suggested knot count: ${b === 0 ? '0 (classic fit)' : b} by the ${rule === 1 ? 'one-standard-error rule' : 'minimum cv_rmse'}` +
          (r ? ` (cv_rmse ${fmt(r.cvRmse)} ± ${fmt(r.cvSe)})` : '') +
          `; ${rows.length} candidates, ${cv.folds} folds × ${cv.repeats} repeat${cv.repeats === 1 ? '' : 's'}, ${ms} ms.` +
          ((this.view?.points.length ?? 0) < 30 ? ' Few points: this choice is noisy.' : ''),
      );
      el<HTMLButtonElement>('use-suggestion').disabled = false;
    } catch (e) {
      if (this.abort !== abort) return;
      if (isRatchetError(e) && e.code === 'CANCELLED') {
        this.cvState = 'cancelled';
        this.cvStatus('Cancelled.');
      } else {
        this.cvState = 'error';
        this.cvStatus(errorText(e), true);
      }
      this.setProgress(0);
    } finally {
      if (this.abort === abort) {
        this.abort = undefined;
        el<HTMLButtonElement>('cancel').disabled = true;
        el<HTMLButtonElement>('suggest').disabled = this.selection === undefined;
      }
    }
  }

  /** Stops a running cross-validation (the worker is terminated). */
  cancel(silent = false): void {
    const a = this.abort;
    if (!a) return;
    this.abort = undefined;
    a.abort();
    this.cvState = 'cancelled';
    this.setProgress(0);
    el<HTMLButtonElement>('cancel').disabled = true;
    el<HTMLButtonElement>('suggest').disabled = this.selection === undefined;
    if (!silent) {
      this.cvStatus('Cancelled.');
      el<HTMLButtonElement>('suggest').focus();
    }
  }

  private download(): void {
    if (!this.view || !this.selection) return;
    const blob = new Blob([knotTableCsv(this.view.knots)], { type: 'text/csv;charset=utf-8' });
    const url = URL.createObjectURL(blob);
    const a = document.createElement('a');
    a.href = url;
    a.download = `${this.selection.fileStem}-knots.csv`;
    document.body.append(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 10000);
  }

  private async copy(): Promise<void> {
    const area = el<HTMLTextAreaElement>('formulas');
    const text = [...Object.values(this.formulas), ...(this.gridText === undefined ? [] : [this.gridText])].join('\n');
    try {
      await navigator.clipboard.writeText(text);
      this.cvStatus('');
      this.status('Formulas copied: paste them into cells of the workbook that holds the data.');
    } catch {
      area.focus();
      area.select();
      this.status('Copying was refused by the browser: the formulas are selected — press Ctrl+C (⌘C).');
    }
  }

  /** Read-only view of what the charts and tables hold, for the end-to-end tests. */
  snapshot(): Snapshot {
    const ds = this.fitChart.chart.data.datasets;
    const copy = (d: readonly { x: number; y: number }[]): { x: number; y: number }[] => d.map((p) => ({ x: p.x, y: p.y }));
    const sel = this.selection;
    let settings: Snapshot['settings'];
    try {
      settings = { fit: this.fitSettings(), cv: this.cvSettings() };
    } catch {
      settings = null;
    }
    const cvPoints = this.cvChart.chart.data.datasets[2]!.data as { x: number; y: number }[];
    return structuredClone({
      mode: this.mode,
      points: copy(ds[0]!.data as { x: number; y: number }[]),
      curve: copy(ds[1]!.data as { x: number; y: number }[]),
      knots: copy(ds[2]!.data as { x: number; y: number }[]),
      stats: (this.view?.stats ?? []).map(([a, b]) => [a, b] as [string, number | string | boolean]),
      data: sel ? { x: [...sel.data.x], y: [...sel.data.y], w: sel.data.w ? [...sel.data.w] : null } : null,
      settings,
      cv: this.cvView ? { rows: [...this.cvView.rows], best: this.cvView.best, rule: this.cvView.rule, threshold: this.cvView.threshold, points: copy(cvPoints) } : null,
      cvState: this.cvState,
      progress: this.progress,
      formulas: { ...this.formulas },
      fitError: this.fitError,
      surface:
        this.surfaceView && this.gridText !== undefined
          ? {
              settings: this.surfaceSettings(),
              knots1: [...this.surfaceView.knots1],
              knots2: [...this.surfaceView.knots2],
              values: this.surfaceView.values.map((r) => [...r]),
              text: this.surfaceView.cells.map((r) => r.map((c) => c.text)),
              background: this.surfaceView.cells.map((r) => r.map((c) => c.background)),
              formula: this.gridText,
            }
          : null,
      surfaceError: this.surfaceError,
    });
  }

  private exposeTestHook(): void {
    const hook = Object.freeze({ snapshot: () => this.snapshot() });
    Object.defineProperty(window, '__ratchetTest', { value: hook, writable: false, configurable: false, enumerable: false });
  }
}
