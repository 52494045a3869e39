/**
 * The surface panel: shown when a second input is chosen; RATCHET.GRID of the data drawn as a
 * heat-map with its legend and status line.
 */
import { HEATMAP_MAX_CELLS, computeSurface, directionWords, knotField, latticeTrend, renderHeatmap, type SurfaceDirectionCode, type SurfaceSettings } from '../surface-view.js';
import type { HeatmapView } from '../../src/view/heat-scale.js';
import { el, errorText, fieldMessage, shownDigits } from './dom.js';
import { readKnotField } from '../guards.js';
import type { Selection } from './selection.js';

/** The surface section of the pane. */
export class SurfacePanel {
  /** The surface shown now (undefined without x2, on an error, or when too large to draw). */
  view: HeatmapView | undefined;
  /** The error shown instead of a heat-map, if any. */
  error: string | null = null;

  /** Reads the surface controls. */
  settings(): SurfaceSettings {
    const d = (id: string): SurfaceDirectionCode => Number(el<HTMLSelectElement>(id).value) as SurfaceDirectionCode;
    return { knots1: knotField(el<HTMLInputElement>('knots1').value), knots2: knotField(el<HTMLInputElement>('knots2').value), direction1: d('direction1'), direction2: d('direction2') };
  }

  /** Hidden without x2; otherwise RATCHET.GRID of the data as a heat-map. `rows`: rows the fit used. */
  render(sel: Selection | undefined, rows: number | undefined): void {
    const section = el<HTMLElement>('surface');
    const table = el<HTMLTableElement>('heatmap');
    const legend = el<HTMLElement>('heatmap-legend');
    this.view = undefined;
    this.error = null;
    if (!sel?.x2) {
      section.hidden = true;
      table.replaceChildren();
      legend.replaceChildren();
      return;
    }
    section.hidden = false;
    const s = el<HTMLDivElement>('surface-status');
    const scroll = table.parentElement!;
    const k1 = readKnotField(el<HTMLInputElement>('knots1').value, 'Knots along x');
    const k2 = readKnotField(el<HTMLInputElement>('knots2').value, 'Knots along x2');
    fieldMessage('knots1', k1.ok ? undefined : k1.message);
    fieldMessage('knots2', k2.ok ? undefined : k2.message);
    scroll.classList.toggle('stale', !k1.ok || !k2.ok);
    if (!k1.ok || !k2.ok) {
      // Keep the last heat-map drawn (greyed) until the field is fixed.
      this.error = (!k1.ok ? k1.message : '') + (!k2.ok ? `${!k1.ok ? ' ' : ''}${k2.message}` : '');
      s.textContent = table.rows.length > 0 ? 'The heat-map shows the last good surface, greyed, until the knot fields are fixed.' : '';
      s.classList.remove('error');
      return;
    }
    try {
      const settings = this.settings();
      const view = computeSurface(sel.data, sel.x2.cells, settings, shownDigits());
      const values = view.knots1.length * view.knots2.length;
      if (values > HEATMAP_MAX_CELLS) {
        table.replaceChildren();
        legend.replaceChildren();
        s.textContent = `The lattice has ${view.knots1.length} × ${view.knots2.length} = ${values} values — too many to draw here (at most ${HEATMAP_MAX_CELLS}). Choose knot counts along x and x2.`;
        s.classList.remove('error');
        return;
      }
      this.view = view;
      renderHeatmap(table, legend, view, { x1: sel.labels.x, x2: sel.x2.label, y: sel.labels.y }, shownDigits());
      const along = `along ${sel.labels.x} ${directionWords(settings.direction1, latticeTrend(view, 1))}, along ${sel.x2.label} ${directionWords(settings.direction2, latticeTrend(view, 2))}`;
      s.textContent =
        `Surface over ${sel.labels.x} and ${sel.x2.label}: ${view.knots1.length} × ${view.knots2.length} = ${values} values, ${along}` +
        (rows !== undefined && values >= rows / 2 ? ` — from about ${rows} rows, at least one value per two rows: expect over-fit.` : '.');
      s.classList.remove('error');
    } catch (e) {
      this.error = errorText(e);
      table.replaceChildren();
      legend.replaceChildren();
      s.textContent = this.error;
      s.classList.add('error');
    }
  }
}
