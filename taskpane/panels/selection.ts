/** The data the pane works on, wherever they come from (preview-mode.ts, office-mode.ts). */
import type { DataColumns } from '../analysis.js';
import type { DataRefs } from '../formulas.js';
import type { SecondInput } from '../surface-view.js';
import type { LeftOutEntry } from './left-out-panel.js';

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
  /** "date" when the x cells are the serial day numbers of date cells: the chart shows them as dates. Default "number". */
  readonly xKind?: 'number' | 'date' | undefined;
  /** Data cells left out because they hold text or a logical value, with their addresses (listed by the pane). */
  readonly leftOut?: readonly LeftOutEntry[] | undefined;
}
