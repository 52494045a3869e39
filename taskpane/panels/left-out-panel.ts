/**
 * The list of data cells left out because they hold text or a logical value (see the README,
 * "How cells are read": such a cell leaves its row out, as a blank does). The pane shows each by
 * its address, so the user can find and fix it.
 *
 * The cells, their addresses and sentences come from the worksheet layer (`leftOutCellsOf`,
 * src/functions/define.ts), which reads the ranges exactly as a RATCHET formula on them does; the
 * pane only says where each range lies.
 */
import { leftOutCellsOf, type LeftOutEntry } from '../../src/functions/define.js';
import { PARAMS } from '../../src/functions/params.js';
import type { CellArg, CellValueIn } from '../../src/functions/types.js';
import { absoluteRef, type Area } from '../refs.js';
import { el } from './dom.js';

export type { LeftOutEntry } from '../../src/functions/define.js';

/** One of the pane's data ranges: its cells in reading order and where they lie. */
export interface PaneRange {
  readonly cells: readonly CellValueIn[];
  /** The range (sheet, r1, c1, r2, c2): one column, or one row (r1 === r2, more than one column). */
  readonly area: Area;
}

/** The data parameters the pane's ranges stand for, in the order of its list: x, y, weights, second x. */
const PANE_DATA = [PARAMS.knownXs, PARAMS.knownYs, PARAMS.weights, PARAMS.knownX2s] as const;

/**
 * The text and logical cells of the pane's ranges (x, y, weights, second x; absent ones
 * skipped), each with its address and sentence as the worksheet layer gives them
 * (`leftOutCellsOf`): what a formula on these ranges would leave out. A range the worksheet layer
 * refuses (an error cell, say) lists nothing here; the fit shows that error itself. A range
 * without a sheet lists nothing (no address to name the cells by).
 * Cost O(cells).
 * @param ranges x, y, weights, second x; undefined where the pane has none.
 * @example leftOutOf([{ cells: [1, '47.6', null], area: { sheet: 'Data', r1: 4, r2: 6, c1: 2, c2: 2 } }]).map((e) => e.message)
 *   // → ['Data!B5 holds the text "47.6" — convert it with VALUE to use it']
 */
export function leftOutOf(ranges: readonly (PaneRange | undefined)[]): LeftOutEntry[] {
  return ranges.flatMap((r, i) => {
    const param = PANE_DATA[i];
    if (r === undefined || param === undefined || r.area.sheet === undefined || r.cells.length === 0) return [];
    const across = r.area.r1 === r.area.r2 && r.area.c2 > r.area.c1;
    const arg: CellArg = across ? [r.cells.slice()] : r.cells.map((v) => [v]);
    try {
      return leftOutCellsOf({ params: [param] }, [arg], { addresses: [absoluteRef(r.area, true)] });
    } catch {
      return [];
    }
  });
}

/** How many cells the pane lists by address (the count says how many more there are). */
export const LEFT_OUT_SHOWN = 20;

/** Shows the list under the fit's status line (hidden when it is empty). */
export function showLeftOut(all: readonly LeftOutEntry[]): void {
  // One line per cell, also when two pickers name the same column.
  const seen = new Set<string>();
  const cells = all.filter((c) => !seen.has(c.cell) && (seen.add(c.cell), true));
  const box = el<HTMLDivElement>('left-out');
  const list = el<HTMLUListElement>('left-out-list');
  list.replaceChildren(
    ...cells.slice(0, LEFT_OUT_SHOWN).map((c) => {
      const li = document.createElement('li');
      li.textContent = c.message;
      return li;
    }),
  );
  if (cells.length > LEFT_OUT_SHOWN) {
    const li = document.createElement('li');
    li.textContent = `and ${cells.length - LEFT_OUT_SHOWN} more`;
    list.append(li);
  }
  el<HTMLParagraphElement>('left-out-title').textContent =
    cells.length === 0 ? '' : `${cells.length} cell${cells.length === 1 ? '' : 's'} left out because ${cells.length === 1 ? 'it holds' : 'they hold'} text or a logical value:`;
  box.hidden = cells.length === 0;
}
