/**
 * The one row pairing of the worksheet functions, and with it the blank-cell rule (README.md, "How
 * cells are read"): the data arguments of a call (known_ys, then each input, then optional weights)
 * are read cell by cell in parallel, and a row is left out when any of them is blank there. Used by
 * the one-input functions (known_ys, known_xs) and the surface functions (known_ys, known_x1s,
 * known_x2s) alike, so a function with N inputs needs nothing new.
 */
import { fail } from '../core/index.js';
import { cellName, formatNumber, type Vector } from './cells.js';

/** One data argument of a call: its parameter name (for messages), its parsed cells and its range address when the host gave one. */
export interface Column {
  readonly name: string;
  readonly vector: Vector;
  readonly address?: string | undefined;
}

/** The rows of a call's data arguments where every one of them holds a number. */
export interface PairedRows {
  /** One array per column, in the order given; `columns[j][k]` is column j at used row k. */
  readonly columns: readonly Float64Array[];
  /** The weights at the used rows, or undefined when the call has none. */
  readonly weights: Float64Array | undefined;
  /** For each used row, its position in the ranges (reading order). */
  readonly used: Int32Array;
  /** Cells in each range (used rows plus rows left out). */
  readonly rows: number;
  /**
   * Rows left out because a data argument holds text or a logical there (a referenced range; see
   * README.md, "How cells are read"); they are part of `rows - used.length` with the blank rows.
   */
  readonly textRows: number;
}

/** "a and b both" / "a, b and c all": the names a row needs, for messages. */
function needsAll(names: readonly string[]): string {
  if (names.length === 1) return names[0]!;
  if (names.length === 2) return `${names[0]} and ${names[1]} both`;
  return `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]} all`;
}

/**
 * Pairs the rows of `columns` (the first one, known_ys, sets the length) and optional `weights`;
 * a row with a blank (NaN) in any of them is left out. Cost O(n · columns), one pass to find the
 * used rows and one to gather them.
 *
 * @param columns the data arguments, at least one; every vector must have as many cells as the first.
 * @param weights optional weights, one per cell of the first column, each ≥ 0 or blank.
 * @returns the used rows' values, their positions, the cell count and the rows left out for text.
 * @throws RatchetError LENGTH_MISMATCH (a column or the weights with another cell count, named by
 *   its parameter), BAD_WEIGHT (a negative weight), TOO_FEW_POINTS (fewer than 2 used rows; named
 *   by the first column).
 * @example pairRows([{ name: 'known_ys', vector: ys }, { name: 'known_xs', vector: xs }]).used
 *   // → Int32Array [0, 2] for ys = [1, blank, 3], xs = [1, 2, 3]
 * References: README.md, "How cells are read".
 */
export function pairRows(columns: readonly Column[], weights?: Column): PairedRows {
  const lead = columns[0]!;
  const n = lead.vector.values.length;
  for (const c of weights ? [...columns.slice(1), weights] : columns.slice(1)) {
    const m = c.vector.values.length;
    if (m !== n) fail('LENGTH_MISMATCH', c.name, `needs one cell per cell of ${lead.name} (${n}); got ${m}`);
  }
  const wv = weights?.vector.values;
  if (wv !== undefined) {
    for (let i = 0; i < n; i++) {
      if (wv[i]! < 0) {
        const v = weights!.vector;
        const at = cellName(weights!.address, v.rows, v.cols, v.cols === 1 ? i : 0, v.cols === 1 ? 0 : i);
        fail('BAD_WEIGHT', weights!.name, `needs numbers ≥ 0; ${at} is ${formatNumber(wv[i]!)}`);
      }
    }
  }
  const values = columns.map((c) => c.vector.values);
  const width = values.length;
  const used = new Int32Array(n);
  let m = 0;
  outer: for (let i = 0; i < n; i++) {
    for (let j = 0; j < width; j++) {
      const v = values[j]![i]!;
      if (v !== v) continue outer;
    }
    if (wv !== undefined) {
      const c = wv[i]!;
      if (c !== c) continue;
    }
    used[m++] = i;
  }
  if (m < 2) {
    const names = columns.map((c) => c.name);
    if (weights) names.push(weights.name);
    const text = textRowsOf(weights ? [...columns, weights] : columns, n);
    const note = text > 0 ? ` (${text} row${text === 1 ? '' : 's'} left out for text or logical cells)` : '';
    fail('TOO_FEW_POINTS', lead.name, `needs at least 2 rows where ${needsAll(names)} hold numbers; got ${m}${note}`);
  }
  const pick = (v: Float64Array): Float64Array => {
    const out = new Float64Array(m);
    for (let k = 0; k < m; k++) out[k] = v[used[k]!]!;
    return out;
  };
  return { columns: values.map(pick), weights: wv ? pick(wv) : undefined, used: used.slice(0, m), rows: n, textRows: textRowsOf(weights ? [...columns, weights] : columns, n) };
}

/** Number of rows (below n) where at least one of `columns` left out a text or logical cell. O(left-out cells). */
function textRowsOf(columns: readonly Column[], n: number): number {
  const withText = columns.filter((c) => c.vector.leftOut.length > 0);
  if (withText.length === 0) return 0;
  if (withText.length === 1) return withText[0]!.vector.leftOut.filter((c) => c.index < n).length;
  const rows = new Set<number>();
  for (const c of withText) for (const cell of c.vector.leftOut) if (cell.index < n) rows.add(cell.index);
  return rows.size;
}
