/**
 * The list of data cells left out because they hold text or a logical value (see the README,
 * "How cells are read": such a cell leaves its row out, as a blank does). The pane shows each by
 * its address, so the user can find and fix it.
 *
 * The list is built against the small {@link LeftOutCell} interface; `textCellsOf` gives it from
 * the cells the pane read and where they lie. Where the worksheet layer reports the left-out
 * cells itself, its list can be shown unchanged.
 */
import { columnLetters, sheetPrefix, type Area } from '../refs.js';
import type { CellValueIn } from '../../src/functions/types.js';
import { el } from './dom.js';

/** A data cell left out of the fit because it holds text or a logical value. */
export interface LeftOutCell {
  /** Where it is, with the sheet: "Data!B5", "'Wear test'!B5". */
  readonly address: string;
  /** What it holds. */
  readonly value: string | boolean;
}

/** Text that Excel's VALUE would turn into a number (a number stored as text). */
function looksNumeric(text: string): boolean {
  const t = text.trim();
  return t !== '' && Number.isFinite(Number(t));
}

/**
 * The sentence for one left-out cell.
 * - a number stored as text: `Data!B5 holds the text "47.6" — convert it with VALUE to use it`;
 * - other text: `Data!B6 holds the text "n/a" — its row is left out`;
 * - a logical: `Data!B7 holds the logical value TRUE — its row is left out`.
 * Cost O(length of the text).
 * @example leftOutText({ address: 'Data!B5', value: '47.6' }) // → 'Data!B5 holds the text "47.6" — convert it with VALUE to use it'
 */
export function leftOutText(c: LeftOutCell): string {
  if (typeof c.value === 'boolean') return `${c.address} holds the logical value ${c.value ? 'TRUE' : 'FALSE'} — its row is left out`;
  const tail = looksNumeric(c.value) ? 'convert it with VALUE to use it' : 'its row is left out';
  return `${c.address} holds the text "${c.value}" — ${tail}`;
}

/**
 * The cells of a line of cells (one column or one row, in reading order, starting at the
 * top-left of `area`) that hold text (not blank) or a logical value, with their addresses.
 * Cost O(cells).
 * @param cells the cells as read; null is a blank (never listed); an empty or blank-only string
 *   counts as blank.
 * @param area where the first cell lies (sheet, r1, c1) and whether the line runs down (one
 *   column, the default) or across (`r1 === r2` and more than one column).
 * @example textCellsOf([1, '47.6', null], { sheet: 'Data', r1: 4, r2: 6, c1: 2, c2: 2 }) // → [{ address: 'Data!B5', value: '47.6' }]
 */
export function textCellsOf(cells: readonly CellValueIn[], area: Area): LeftOutCell[] {
  const across = area.r1 === area.r2 && area.c2 > area.c1;
  const prefix = area.sheet === undefined ? '' : sheetPrefix(area.sheet);
  const out: LeftOutCell[] = [];
  cells.forEach((v, i) => {
    if (typeof v === 'boolean' || (typeof v === 'string' && v.trim() !== '')) {
      const row = across ? area.r1 : area.r1 + i;
      const col = across ? area.c1 + i : area.c1;
      out.push({ address: `${prefix}${columnLetters(col)}${row}`, value: v });
    }
  });
  return out;
}

/** How many cells the pane lists by address (the count says how many more there are). */
export const LEFT_OUT_SHOWN = 20;

/** Shows the list under the fit's status line (hidden when it is empty). */
export function showLeftOut(all: readonly LeftOutCell[]): void {
  // One line per cell, also when two pickers name the same column.
  const seen = new Set<string>();
  const cells = all.filter((c) => !seen.has(c.address) && (seen.add(c.address), true));
  const box = el<HTMLDivElement>('left-out');
  const list = el<HTMLUListElement>('left-out-list');
  list.replaceChildren(
    ...cells.slice(0, LEFT_OUT_SHOWN).map((c) => {
      const li = document.createElement('li');
      li.textContent = leftOutText(c);
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
