/**
 * The task pane controller shared by Excel and the browser preview: composes the panels (one small
 * module each under taskpane/panels/: fit, band and residuals, direction warning, read-back,
 * cross-validation, surface, formulas), wires the
 * controls to them, and exposes a read-only snapshot for the end-to-end tests
 * (`window.__ratchetTest.snapshot()`). Where the data come from is the business of
 * preview-mode.ts and office-mode.ts, which call {@link App.setSelection}.
 */
import { WorkerClient, type WorkerLike } from '../src/functions/worker-client.js';
import type { FitView, CvRow } from './analysis.js';
import type { CvSettings, FitSettings, FormulaKind } from './formulas.js';
import type { SurfaceSettings } from './surface-view.js';
import type { HeatmapView } from '../src/view/heat-scale.js';
import { el, errorText, setShownDigits, setStatus } from './panels/dom.js';
import type { Selection } from './panels/selection.js';
import { FitPanel } from './panels/fit-panel.js';
import { CvPanel, type CvState } from './panels/cv-panel.js';
import { SurfacePanel } from './panels/surface-panel.js';
import { FormulasPanel } from './panels/formulas-panel.js';
import { layoutBlocks, paneBlocks, type BlockLayout, type FormulaBlock } from './layout.js';
import { candidateCount } from './analysis.js';
import { gridSpill } from './surface-view.js';
import { showLeftOut } from './panels/left-out-panel.js';
import { BandPanel } from './panels/band-panel.js';
import { DirectionPanel } from './panels/direction-panel.js';
import { ReadbackPanel, type ReadBackShown } from './panels/readback-panel.js';
import type { BandFormulaSettings } from './formulas.js';

export type { Selection } from './panels/selection.js';
export type { CvState } from './panels/cv-panel.js';

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
  /** Labels of the fit chart's x-axis ticks as drawn (dates for a date column). */
  readonly xTicks: string[];
  /** What "Copy formulas" put on the clipboard last (tab-separated block), or null. */
  readonly copied: string | null;
  /** The lines of the list of cells left out because they hold text or a logical value. */
  readonly leftOut: string[];
  /** The band shaded on the fit chart (null when none), and why none is drawn ('' when one is). */
  readonly band: { label: string; level: number; kind: 1 | 2; upper: { x: number; y: number }[]; lower: { x: number; y: number }[] } | null;
  readonly bandNote: string;
  /** The residual plot's points (x, y − fitted) and its zero line. */
  readonly residuals: { x: number; y: number }[];
  readonly residualZero: { x: number; y: number }[];
  /** The read-back box. */
  readonly readback: ReadBackShown;
  /** The direction warning shown (null when none). */
  readonly directionWarning: { text: string; suggested: 'up' | 'down'; spearman: number; n: number } | null;
}


/** Creates the cross-validation worker (the add-in's own worker entry, same implementations). */
function createWorker(): WorkerLike {
  return new Worker(new URL('../src/functions/worker.ts', import.meta.url), { name: 'ratchet-cv' }) as unknown as WorkerLike;
}

/** The pane. */
export class App {
  readonly mode: 'office' | 'preview';
  private selection: Selection | undefined;
  private readonly fit: FitPanel;
  private readonly cv: CvPanel;
  private readonly surface = new SurfacePanel();
  private readonly formulaPanel = new FormulasPanel();
  private readonly band: BandPanel;
  private readonly direction: DirectionPanel;
  private readonly readback = new ReadbackPanel();
  /** INVERTBAND's target_ys from the host (Office mode: a range), else the read-back target. */
  targetsRef: string | undefined;
  /** Shape of INVERTBAND's target_ys when it is a range. */
  targetsShape: { rows: number; cols: number } | undefined;
  /** Extra formula options from the host (PREDICT's new_xs). */
  newXsRef: string | undefined;
  /** Shape of PREDICT's new_xs when it is not the x column (Office mode: the new_xs range). */
  newXsShape: { rows: number; cols: number } | undefined;
  /** Called after every refresh (Office mode keeps its insert buttons in step). */
  onRefresh: (() => void) | undefined;
  /** A refused data choice (shown at its own field): the fit waits, its chart greyed. */
  private inputProblem: string | undefined;

  constructor(mode: 'office' | 'preview', workerFactory: () => WorkerLike = createWorker) {
    this.mode = mode;
    const client = new WorkerClient(() => workerFactory());
    this.fit = new FitPanel();
    this.band = new BandPanel(this.fit.chart);
    this.fit.summaryTail = () => this.band.sentence(true);
    this.direction = new DirectionPanel((d) => {
      const select = el<HTMLSelectElement>('direction');
      select.value = String(d);
      select.dispatchEvent(new Event('change'));
      select.focus();
    });
    this.cv = new CvPanel(client, {
      selection: () => this.selection,
      fit: () => this.fit.settings(),
      rowsUsed: () => this.fit.view?.points.length,
    });
    for (const n of document.querySelectorAll<HTMLElement>('[data-only]')) n.hidden = n.dataset.only !== mode;
    this.wire();
    this.cv.chart.show(undefined);
    this.exposeTestHook();
  }

  private wire(): void {
    el<HTMLInputElement>('knots').addEventListener('change', () => this.refresh());
    for (const id of ['band-level', 'band-kind', 'readback-target', 'readback-replicates']) el<HTMLElement>(id).addEventListener('change', () => this.refresh());
    for (const id of ['knots1', 'knots2', 'direction1', 'direction2']) el<HTMLElement>(id).addEventListener('change', () => this.refresh());
    el<HTMLSelectElement>('direction').addEventListener('change', () => {
      this.cv.invalidate('The direction changed: run the suggestion again.');
      this.refresh();
    });
    for (const id of ['curvature', 'degree']) {
      el<HTMLSelectElement>(id).addEventListener('change', () => {
        this.cv.invalidate('The shape changed: run the suggestion again (it compares knot counts for the shape chosen).');
        this.refresh();
      });
    }
    for (const id of ['cv-candidates', 'cv-folds', 'cv-repeats', 'cv-seed', 'cv-rule']) {
      el<HTMLElement>(id).addEventListener('change', () => this.updateFormulas());
    }
    el<HTMLSelectElement>('digits').addEventListener('change', () => {
      setShownDigits(Number(el<HTMLSelectElement>('digits').value));
      this.refresh();
      this.cv.redraw();
    });
    el<HTMLButtonElement>('suggest').addEventListener('click', () => void this.suggest());
    el<HTMLButtonElement>('cancel').addEventListener('click', () => this.cancel());
    el<HTMLButtonElement>('use-suggestion').addEventListener('click', () => {
      if (!this.cv.view) return;
      el<HTMLInputElement>('knots').value = String(this.cv.view.best);
      this.refresh();
      el<HTMLInputElement>('knots').focus();
    });
    el<HTMLButtonElement>('download').addEventListener('click', () => this.fit.download(this.selection));
    el<HTMLButtonElement>('copy').addEventListener('click', () => void this.copy());
    const media = window.matchMedia?.('(prefers-color-scheme: dark)');
    media?.addEventListener?.('change', () => {
      this.fit.chart.theme();
      this.band.theme();
      this.cv.chart.theme();
    });
  }

  /** Sets the host line at the top. */
  setHostText(text: string): void {
    el<HTMLParagraphElement>('host').textContent = text;
  }

  /** Shows a status message in the fit section. */
  status(text: string, error = false): void {
    this.fit.status(text, error);
  }

  /**
   * Marks the data choice as refused (`message`, already shown at its field by the caller) or,
   * with undefined, as fine again. While refused, the chart keeps the last good fit, greyed.
   */
  refuseInput(message: string | undefined): void {
    this.inputProblem = message;
    this.refresh();
  }

  /** Replaces the data (undefined clears). Cross-validation results of other data are dropped. */
  setSelection(sel: Selection | undefined, keepCv = false): void {
    this.inputProblem = undefined;
    this.selection = sel;
    if (!keepCv) this.cv.invalidate('');
    this.refresh();
  }

  /** Current data and references, if any. */
  current(): Selection | undefined {
    return this.selection;
  }

  /** The fit shown now (undefined when there is none or the data give an error). */
  currentFit(): FitView | undefined {
    return this.fit.view;
  }

  /** Reads the fit controls. */
  fitSettings(): FitSettings {
    return this.fit.settings();
  }

  /** Reads the cross-validation controls. @throws Error for a malformed candidates field. */
  cvSettings(): CvSettings {
    return this.cv.settings();
  }

  /** Reads the surface controls. */
  surfaceSettings(): SurfaceSettings {
    return this.surface.settings();
  }

  /** Refits and redraws everything that depends on the data or the fit settings. */
  refresh(): void {
    const sel = this.selection;
    this.fit.show(sel, this.inputProblem);
    const fit = this.fit.settings();
    this.band.render(sel, this.fit.view, fit);
    this.direction.render(this.band.rows, this.fit.view);
    this.readback.render(sel, this.fit.view, fit, this.band.controls().level, this.band.rows);
    if (this.fit.view) this.fit.summarise();
    this.fit.renderStats();
    this.fit.renderKnotTable();
    showLeftOut(sel?.leftOut ?? []);
    this.surface.render(sel, this.fit.view?.points.length);
    this.updateFormulas();
    el<HTMLButtonElement>('download').disabled = this.fit.view === undefined;
    el<HTMLButtonElement>('suggest').disabled = sel === undefined || this.cv.state === 'running';
    this.onRefresh?.();
  }

  /** Rebuilds the formula text for the current references and settings. */
  updateFormulas(): void {
    const error = this.formulaPanel.update(this.selection, {
      fit: this.fit.settings(),
      cv: () => this.cv.settings(),
      surface: () => this.surface.settings(),
      newXsRef: this.newXsRef,
      band: this.bandFormulaSettings(),
    });
    if (error !== undefined) this.cv.status(errorText(error), true);
  }

  /**
   * The band controls as BAND and INVERTBAND formulas take them; undefined while the level or the
   * readings are not valid numbers. INVERTBAND's target_ys: the host's range, else the read-back
   * target when it is a number.
   */
  private bandFormulaSettings(): BandFormulaSettings | undefined {
    const level = this.band.level();
    const { target, replicates } = this.readback.inputs();
    const m = replicates === '' ? 1 : Number(replicates);
    if (level === undefined || !(m >= 1) || !Number.isFinite(m)) return undefined;
    const t = target === '' ? NaN : Number(target);
    return { level, kind: this.band.controls().kind, replicates: m, targets: this.targetsRef ?? (Number.isFinite(t) ? String(t) : undefined) };
  }

  /** The RATCHET.GRID formula for the current x2 and surface settings (undefined without x2). */
  surfaceFormula(): string | undefined {
    return this.formulaPanel.gridText;
  }

  /** The surface shown now (undefined without x2, on an error, or when too large to draw). */
  currentSurface(): HeatmapView | undefined {
    return this.surface.view;
  }

  /** The formula of one kind for the current state (Office insert actions). */
  formula(kind: FormulaKind): string | undefined {
    return this.formulaPanel.formulas[kind];
  }

  /** Runs RATCHET.CV and RATCHET.BESTK in the worker; progress bar; Cancel stops it. */
  suggest(): Promise<void> {
    return this.cv.suggest();
  }

  /** Stops a running cross-validation (the worker is terminated). */
  cancel(silent = false): void {
    this.cv.cancel(silent);
  }

  /**
   * The pane's formulas laid out so that no result collides with the next (layout.ts): each block
   * gets the rows and columns its result spills — the knot table's K rows, as many rows as STATS
   * returns now, CV's candidates plus a header, PREDICT the shape of its new x, GRID (K2 + 1) ×
   * (K1 + 1) — with its label on the left. Undefined without a fit (the sizes are not known).
   * @throws Error for a malformed candidates field.
   */
  blockLayout(): BlockLayout | undefined {
    const view = this.fit.view;
    const sel = this.selection;
    const formulas = this.formulaPanel.formulas;
    if (!view || !sel || formulas.KNOTS === undefined) return undefined;
    const sizes = {
      knotRows: view.knots.length,
      knotCols: view.smooth ? 3 : 2,
      candidates: candidateCount(view, this.cv.settings()),
      newXs: this.newXsShape ?? { rows: sel.data.x.length, cols: 1 },
      targets: this.targetsRef === undefined ? undefined : this.targetsShape,
    };
    const blocks: FormulaBlock[] = paneBlocks(formulas, sizes).map((b) => (b.formula === formulas.STATS ? { ...b, rows: Math.max(b.rows, view.stats.length) } : b));
    const surface = this.surface.view;
    const grid = this.formulaPanel.gridText;
    if (surface && grid !== undefined) blocks.push({ label: 'Surface table (GRID)', formula: grid, ...gridSpill(surface) });
    return layoutBlocks(blocks);
  }

  private async copy(): Promise<void> {
    let layout: BlockLayout | undefined;
    try {
      layout = this.blockLayout();
    } catch (e) {
      setStatus('results-status', errorText(e), true);
      return;
    }
    if (!layout) {
      setStatus('results-status', 'Choose data that fit without an error first: the block needs the size of each result.', true);
      return;
    }
    this.copiedText = layout.text;
    if (await this.formulaPanel.copy(layout.text)) {
      setStatus('results-status', `Formulas copied as a block of ${layout.rows} rows × ${layout.cols} columns, a label beside each: click one empty cell of the workbook that holds the data and paste; each result has room to spill.`);
    } else {
      setStatus('results-status', 'Copying was refused by the browser: the block is selected — press Ctrl+C (⌘C).', true);
    }
  }

  /** The text "Copy formulas" put on the clipboard last (for the tests). */
  private copiedText: string | null = null;

  /** Read-only view of what the charts and tables hold, for the end-to-end tests. */
  snapshot(): Snapshot {
    const ds = this.fit.chart.chart.data.datasets;
    const copy = (d: readonly { x: number; y: number }[]): { x: number; y: number }[] => d.map((p) => ({ x: p.x, y: p.y }));
    const sel = this.selection;
    let settings: Snapshot['settings'];
    try {
      settings = { fit: this.fitSettings(), cv: this.cvSettings() };
    } catch {
      settings = null;
    }
    const cvPoints = this.cv.chart.chart.data.datasets[2]!.data as { x: number; y: number }[];
    const view = this.fit.view;
    const cvView = this.cv.view;
    const surface = this.surface.view;
    const gridText = this.formulaPanel.gridText;
    return structuredClone({
      mode: this.mode,
      points: copy(ds[0]!.data as { x: number; y: number }[]),
      curve: copy(ds[1]!.data as { x: number; y: number }[]),
      knots: copy(ds[2]!.data as { x: number; y: number }[]),
      stats: (view?.stats ?? []).map(([a, b]) => [a, b] as [string, number | string | boolean]),
      data: sel ? { x: [...sel.data.x], y: [...sel.data.y], w: sel.data.w ? [...sel.data.w] : null } : null,
      settings,
      cv: cvView ? { rows: [...cvView.rows], best: cvView.best, rule: cvView.rule, threshold: cvView.threshold, points: copy(cvPoints) } : null,
      cvState: this.cv.state,
      progress: this.cv.progress,
      formulas: { ...this.formulaPanel.formulas },
      fitError: this.fit.error,
      surface:
        surface && gridText !== undefined
          ? {
              settings: this.surfaceSettings(),
              knots1: [...surface.knots1],
              knots2: [...surface.knots2],
              values: surface.values.map((r) => [...r]),
              text: surface.cells.map((r) => r.map((c) => c.text)),
              background: surface.cells.map((r) => r.map((c) => c.background)),
              formula: gridText,
            }
          : null,
      surfaceError: this.surface.error,
      xTicks: (this.fit.chart.chart.scales['x']?.ticks ?? []).map((t) => String(t.label)),
      copied: this.copiedText,
      leftOut: [...document.querySelectorAll('#left-out-list li')].map((li) => li.textContent ?? ''),
      ...this.uncertaintySnapshot(),
    });
  }

  private uncertaintySnapshot(): Pick<Snapshot, 'band' | 'bandNote' | 'residuals' | 'residualZero' | 'readback' | 'directionWarning'> {
    const b = this.band.snapshot();
    const w = this.direction.warning;
    return {
      band: b.band,
      bandNote: b.note,
      residuals: b.residuals,
      residualZero: b.zero,
      readback: this.readback.shown(),
      directionWarning: w ? { text: el<HTMLElement>('direction-warning-text').textContent ?? '', suggested: w.suggested, spearman: w.spearman, n: w.n } : null,
    };
  }

  private exposeTestHook(): void {
    const hook = Object.freeze({ snapshot: () => this.snapshot() });
    Object.defineProperty(window, '__ratchetTest', { value: hook, writable: false, configurable: false, enumerable: false });
  }
}
