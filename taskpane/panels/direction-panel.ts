/**
 * The direction warning: when the data contradict the direction of the fit shown (the rule of the
 * README's "Direction check", `checkDirection` in the core), a visible alert says so, with the
 * rank correlation to the digits shown, and one button switches the direction and refits.
 */
import type { FitView } from '../analysis.js';
import { directionCheck, type UsedRows } from '../uncertainty.js';
import type { DirectionWarning } from '../../src/core/index.js';
import { el, fmt } from './dom.js';

/**
 * The warning as the pane words it (numbers to the digits shown).
 * @example directionText({ direction: 'up', suggested: 'down', spearman: -0.8857, n: 32, … })
 * // → 'y falls as x rises (Spearman’s rank correlation -0.8857, 32 rows), but the fit is rising: a rising curve through falling data comes out flat. Fit it falling instead?'
 */
export function directionText(w: Pick<DirectionWarning, 'direction' | 'suggested' | 'spearman' | 'n'>): string {
  const up = w.direction === 'up';
  return (
    `y ${up ? 'falls' : 'rises'} as x rises (Spearman’s rank correlation ${fmt(w.spearman)}, ${w.n} rows), but the fit is ${up ? 'rising' : 'falling'}: ` +
    `a ${up ? 'rising' : 'falling'} curve through ${up ? 'falling' : 'rising'} data comes out flat. Fit it ${up ? 'falling' : 'rising'} instead?`
  );
}

/** The direction warning of the fit card. */
export class DirectionPanel {
  /** The warning shown now (null when none). */
  warning: DirectionWarning | null = null;

  /** @param onSwitch called with the direction code to switch to (1 rising, −1 falling). */
  constructor(onSwitch: (direction: 1 | -1) => void) {
    el<HTMLButtonElement>('direction-switch').addEventListener('click', () => {
      const w = this.warning;
      if (w) onSwitch(w.suggested === 'up' ? 1 : -1);
    });
  }

  /** Checks the fit shown (`rows` its used rows, `view` its statistics) and shows or hides the warning. Cost O(n). */
  render(rows: UsedRows | undefined, view: FitView | undefined): void {
    const d = view?.stats.find(([k]) => k === 'direction')?.[1];
    this.warning = rows && (d === 1 || d === -1) ? directionCheck(rows, d) : null;
    const box = el<HTMLElement>('direction-warning');
    const w = this.warning;
    box.hidden = w === null;
    el<HTMLElement>('direction-warning-text').textContent = w ? directionText(w) : '';
    el<HTMLButtonElement>('direction-switch').textContent = w ? `Switch to ${w.suggested === 'up' ? 'rising' : 'falling'} and refit` : 'Switch the direction and refit';
  }
}
