/**
 * The read-back box: the user types a target y and sees the x at which the curve reaches it and
 * the interval of x whose prediction band contains it (RATCHET.INVERTBAND through the registry,
 * uncertainty.ts; the classic fit has no interval and shows RATCHET.INVERT's x alone). A limit the
 * band does not reach inside the data's x range, and a target outside the curve's range, are said
 * in words.
 */
import { CellFailure, knotTableRows, type FitView } from '../analysis.js';
import type { FitSettings } from '../formulas.js';
import { argumentOf, percent, readBack, type ReadBack, type ReadBackValue, type UsedRows } from '../uncertainty.js';
import { el, errorText, fieldMessage, fmt } from './dom.js';
import type { Selection } from './selection.js';

/** What the box shows, as plain data for the tests. */
export interface ReadBackShown {
  readonly target: string;
  readonly replicates: string;
  /** Cell texts of lower x, x, upper x as shown. */
  readonly cells: [string, string, string];
  /** The values behind them (numbers, or the code of the error in that cell; null when empty). */
  readonly values: [number | string | null, number | string | null, number | string | null];
  readonly status: string;
}

const isNumber = (v: ReadBackValue | undefined): v is number => typeof v === 'number';

/** The sentence for a target outside the curve's range (the knot table's smallest to largest value). */
function outsideText(target: number, view: FitView): string {
  const ys = view.knots.map(([, y]) => y);
  return `Target ${fmt(target)} is outside the curve’s range, from ${fmt(Math.min(...ys))} to ${fmt(Math.max(...ys))}: no x on the curve gives it.`;
}

/** The read-back section. */
export class ReadbackPanel {
  /** The read-back shown now (undefined without a target or on an error). */
  result: ReadBack | undefined;

  /** Reads the target and the readings averaged into it, as typed. */
  inputs(): { target: string; replicates: string } {
    return { target: el<HTMLInputElement>('readback-target').value.trim(), replicates: el<HTMLInputElement>('readback-replicates').value.trim() };
  }

  /**
   * Reads the target back on the fit shown. `level` is the band's level as typed; `rows` the fit's
   * rows (for the data's x range in the messages). Cost: one INVERTBAND (or INVERT) call.
   */
  render(sel: Selection | undefined, view: FitView | undefined, fit: FitSettings, level: string, rows: UsedRows | undefined): void {
    this.result = undefined;
    const { target, replicates } = this.inputs();
    fieldMessage('readback-target', undefined);
    fieldMessage('readback-replicates', undefined);
    el<HTMLInputElement>('readback-replicates').disabled = fit.knots === 0 || fit.degree === 2;
    let status: string;
    let error = false;
    if (!sel || !view) {
      status = 'Choose data that fit without an error first.';
    } else if (target === '') {
      status = 'Type a target y to read back its x.';
    } else {
      try {
        this.result = readBack(sel.data, fit, knotTableRows(view), target, level, replicates);
        status = this.describe(this.result, view, level, replicates, rows);
      } catch (e) {
        const arg = argumentOf(e);
        error = true;
        if (e instanceof CellFailure && e.code === '#N/A') {
          // RATCHET.INVERT refuses a target outside the curve's range for the whole call.
          status = outsideText(Number(target), view);
        } else if (arg === 'target_ys') {
          fieldMessage('readback-target', errorText(e));
          status = 'The target needs to be a number.';
        } else if (arg === 'replicates') {
          fieldMessage('readback-replicates', errorText(e));
          status = 'The number of readings needs to be 1 or more.';
        } else if (arg === 'level') {
          status = 'Fix the band’s level first (a number strictly between 0 and 1).';
        } else {
          status = errorText(e);
        }
      }
    }
    const r = this.result;
    const text = (v: ReadBackValue | undefined): string => (v === undefined ? '—' : isNumber(v) ? fmt(v) : v.code === '#N/A' ? 'not reached' : v.code);
    const outside = r !== undefined && !isNumber(r.x);
    el<HTMLElement>('readback-lower').textContent = r && !outside ? text(r.lower) : '—';
    el<HTMLElement>('readback-x').textContent = r && !outside ? text(r.x) : '—';
    el<HTMLElement>('readback-upper').textContent = r && !outside ? text(r.upper) : '—';
    const s = el<HTMLElement>('readback-status');
    s.textContent = status;
    s.classList.toggle('error', error || outside);
  }

  private describe(r: ReadBack, view: FitView, level: string, replicates: string, rows: UsedRows | undefined): string {
    const t = fmt(r.target);
    if (!isNumber(r.x)) return outsideText(r.target, view);
    if (r.source === 'INVERT') {
      const why = view.smooth
        ? 'No interval for the smooth curve (degree 2) yet: choose the piecewise-linear curve for one.'
        : 'No interval for the classic fit (knot count 0): set 2 or more knots (README “Cautions for bands”).';
      return `The curve reaches ${t} at x = ${fmt(r.x)} (RATCHET.INVERT). ${why}`;
    }
    const m = Number(replicates === '' ? 1 : replicates);
    const head = `At ${percent(Number(level))} % for ${m === 1 ? 'one reading' : `the mean of ${fmt(m)} readings`} (RATCHET.INVERTBAND): x = ${fmt(r.x)}`;
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i < (rows?.x.length ?? 0); i++) {
      if (rows!.w[i]! > 0) {
        lo = Math.min(lo, rows!.x[i]!);
        hi = Math.max(hi, rows!.x[i]!);
      }
    }
    const parts: string[] = [];
    if (isNumber(r.lower) && isNumber(r.upper)) return `${head}, from ${fmt(r.lower)} to ${fmt(r.upper)}.`;
    parts.push(`${head}${isNumber(r.lower) ? `, lower x ${fmt(r.lower)}` : ''}${isNumber(r.upper) ? `, upper x ${fmt(r.upper)}` : ''}.`);
    const beyond = (side: 'Lower' | 'Upper', end: number): string =>
      `${side} x: not reached — even at the ${side === 'Lower' ? 'smallest' : 'largest'} x of the data (${fmt(end)}) the band still contains ${t}, so the interval reaches beyond the data on that side.`;
    if (!isNumber(r.lower)) parts.push(beyond('Lower', lo));
    if (!isNumber(r.upper)) parts.push(beyond('Upper', hi));
    parts.push('A lower level, more readings per target or more data narrow it.');
    return parts.join(' ');
  }

  /** What the tests read. */
  shown(): ReadBackShown {
    const r = this.result;
    const v = (q: ReadBackValue | undefined): number | string | null => (q === undefined ? null : isNumber(q) ? q : q.code);
    return {
      ...this.inputs(),
      cells: [el('readback-lower').textContent ?? '', el('readback-x').textContent ?? '', el('readback-upper').textContent ?? ''],
      values: r ? [v(r.lower), v(r.x), v(r.upper)] : [null, null, null],
      status: el('readback-status').textContent ?? '',
    };
  }
}
