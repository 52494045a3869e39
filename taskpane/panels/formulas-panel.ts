/**
 * The formulas panel: the RATCHET formulas of the current references and settings as text, and
 * the Copy button.
 */
import { allFormulas, bandFormulas, type BandFormulaSettings, type CvSettings, type FitSettings, type FormulaKind } from '../formulas.js';
import { gridFormula, type SurfaceSettings } from '../surface-view.js';
import { el } from './dom.js';
import type { Selection } from './selection.js';

/** The settings the formulas are written for; `cv` throws for a malformed candidates field. */
export interface FormulaInputs {
  readonly fit: FitSettings;
  readonly cv: () => CvSettings;
  readonly surface: () => SurfaceSettings;
  readonly newXsRef: string | undefined;
  /** The band controls (undefined while the level is not valid: no BAND or INVERTBAND then). */
  readonly band?: BandFormulaSettings | undefined;
}

/** The formulas section of the pane. */
export class FormulasPanel {
  /** The formula of each kind for the current state. */
  formulas: Partial<Record<FormulaKind, string>> = {};
  /** The RATCHET.GRID formula (undefined without x2). */
  gridText: string | undefined;

  /**
   * Rebuilds the formula text for `sel`. Returns the error of the cross-validation settings when
   * they cannot be read (the text is then empty), else undefined.
   */
  update(sel: Selection | undefined, inputs: FormulaInputs): unknown {
    const area = el<HTMLTextAreaElement>('formulas');
    this.formulas = {};
    this.gridText = undefined;
    if (!sel) {
      area.value = '';
      el<HTMLButtonElement>('copy').disabled = true;
      return undefined;
    }
    let cv: CvSettings;
    try {
      cv = inputs.cv();
    } catch (e) {
      area.value = '';
      el<HTMLButtonElement>('copy').disabled = true;
      return e;
    }
    const band = inputs.band ? bandFormulas(sel.refs, inputs.fit, inputs.band, inputs.newXsRef) : {};
    this.formulas = { ...allFormulas(sel.refs, inputs.fit, cv, inputs.newXsRef), ...band };
    const f = this.formulas as Record<FormulaKind, string>;
    if (sel.x2) this.gridText = gridFormula(sel.refs, sel.x2.ref, inputs.surface());
    area.value = [
      `Knot table:       ${f.KNOTS}`,
      `Curve at new x:   ${f.PREDICT}`,
      `Fit statistics:   ${f.STATS}`,
      `Cross-validation: ${f.CV}`,
      `Suggested count:  ${f.BESTK}`,
      ...(band.BAND === undefined ? [] : [`Band at new x:    ${band.BAND}`]),
      ...(band.INVERTBAND === undefined ? [] : [`Read-back x:      ${band.INVERTBAND}`]),
      ...(this.gridText === undefined ? [] : [`Surface table:    ${this.gridText}`]),
    ].join('\n');
    el<HTMLButtonElement>('copy').disabled = false;
    return undefined;
  }

  /**
   * Puts `text` (the laid-out block of layout.ts) on the clipboard; true when the browser allowed
   * it, else the block is shown in the text area and selected for Ctrl+C.
   */
  async copy(text: string): Promise<boolean> {
    const area = el<HTMLTextAreaElement>('formulas');
    try {
      await navigator.clipboard.writeText(text);
      return true;
    } catch {
      area.value = text;
      area.focus();
      area.select();
      return false;
    }
  }
}
