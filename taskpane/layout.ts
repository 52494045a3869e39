/**
 * Formula blocks that never collide: the pane's formulas laid out one below the other, each with
 * a label cell on its left and room below and to the right for the whole result it spills
 * (knot table K rows, STATS its rows, CV its candidates plus a header, PREDICT the shape of its
 * new x, BAND and INVERTBAND three values per new x or target), one empty row between blocks. The same layout gives the text for "Copy formulas"
 * (tab-separated cells, one line per worksheet row, so pasting it fills cells) and the cell
 * writes for "Insert all". Pure functions, no host APIs.
 */
import { spillSize, type FormulaKind, type SpillInputs } from './formulas.js';

/** One formula and the area its result needs from its own cell. */
export interface FormulaBlock {
  /** Text of the label cell beside the formula (no tab or line break). */
  readonly label: string;
  /** Formula text with the leading "=". */
  readonly formula: string;
  /** Rows × columns of the result, both ≥ 1 (see spillSize in formulas.ts). */
  readonly rows: number;
  readonly cols: number;
}

/** One cell to write, at an offset from the anchor (the top-left cell of the layout). */
export interface LayoutWrite {
  /** Rows below and columns right of the anchor, from 0. */
  readonly dr: number;
  readonly dc: number;
  /** A label (text) or a formula (starting with "="). */
  readonly value: string;
  readonly kind: 'label' | 'formula';
}

/** Where one block landed. */
export interface PlacedBlock extends FormulaBlock {
  /** Offset of the formula cell from the anchor; its label is at (dr, dc − 1). */
  readonly dr: number;
  readonly dc: number;
}

/** A laid-out set of blocks. */
export interface BlockLayout {
  /** Tab-separated cells, lines joined by "\n": pasted at a cell, it fills the layout from there. */
  readonly text: string;
  /** Label and formula cells, row by row. */
  readonly writes: readonly LayoutWrite[];
  readonly blocks: readonly PlacedBlock[];
  /** Rows × columns of the whole area the layout and its results fill from the anchor. */
  readonly rows: number;
  readonly cols: number;
}

/** Labels of the pane's formula kinds, as they appear in the label cells. */
export const BLOCK_LABELS: Readonly<Record<FormulaKind, string>> = {
  KNOTS: 'Knot table (knot x, fitted value)',
  STATS: 'Fit statistics',
  CV: 'Cross-validation of knot counts',
  BESTK: 'Suggested knot count',
  PREDICT: 'Fitted values at new x',
  BAND: 'Band at new x (lower, fitted, upper)',
  INVERTBAND: 'Read-back x with its interval (lower x, x, upper x)',
};

/** Order of the blocks: the short ones first, PREDICT and BAND (as long as their new x) last. */
export const BLOCK_ORDER: readonly FormulaKind[] = ['KNOTS', 'STATS', 'CV', 'BESTK', 'INVERTBAND', 'PREDICT', 'BAND'];

/**
 * Lays out `blocks` from an anchor: label in column 0, formula in column 1, block i + 1 starting
 * `gap` empty rows below the last row of block i's result. No result can reach another block's
 * cells, so none of them shows #SPILL! — provided the cells of the area are empty (the pane checks
 * that before "Insert all") and each block's size is not smaller than its result. Give a result
 * that can grow with the data (the classic fit's knot table grows with the number of distinct x)
 * the largest size it can take to keep that true after the data change.
 *
 * Cost: O(number of blocks + rows of the layout) — the text has one line per row, empty ones
 * included.
 *
 * @param blocks the formulas in the order to place them; at least one.
 * @param gap empty rows between blocks, a whole number ≥ 0; default 1.
 * @throws Error naming the block when a size is not a whole number ≥ 1, a label holds a tab or
 *   line break, or a formula does not start with "=" or holds a tab or line break.
 * @example layoutBlocks([{ label: 'Knot table', formula: '=RATCHET.KNOTS($B$2:$B$7,$A$2:$A$7,3)', rows: 3, cols: 2 }, { label: 'Suggested knot count', formula: '=RATCHET.BESTK($B$2:$B$7,$A$2:$A$7)', rows: 1, cols: 1 }]).text
 * // → 'Knot table\t=RATCHET.KNOTS($B$2:$B$7,$A$2:$A$7,3)\n\n\n\nSuggested knot count\t=RATCHET.BESTK($B$2:$B$7,$A$2:$A$7)'
 */
export function layoutBlocks(blocks: readonly FormulaBlock[], gap = 1): BlockLayout {
  if (blocks.length === 0) throw new Error('blocks: needs at least one formula to lay out.');
  if (!Number.isInteger(gap) || gap < 0) throw new Error(`gap: needs a whole number of rows ≥ 0; got ${gap}.`);
  const placed: PlacedBlock[] = [];
  const writes: LayoutWrite[] = [];
  let row = 0;
  let cols = 1;
  for (const b of blocks) {
    const name = JSON.stringify(b.label);
    if (!Number.isInteger(b.rows) || b.rows < 1 || !Number.isInteger(b.cols) || b.cols < 1) throw new Error(`block ${name}: needs a size of whole numbers ≥ 1; got ${b.rows} × ${b.cols}.`);
    if (/[\t\r\n]/.test(b.label)) throw new Error(`block ${name}: the label may not hold a tab or a line break.`);
    if (!b.formula.startsWith('=') || /[\t\r\n]/.test(b.formula)) throw new Error(`block ${name}: needs a formula starting with "=" without tabs or line breaks; got ${JSON.stringify(b.formula)}.`);
    placed.push({ ...b, dr: row, dc: 1 });
    writes.push({ dr: row, dc: 0, value: b.label, kind: 'label' }, { dr: row, dc: 1, value: b.formula, kind: 'formula' });
    cols = Math.max(cols, 1 + b.cols);
    row += b.rows + gap;
  }
  const rows = row - gap;
  const lines: string[] = new Array<string>(rows).fill('');
  for (const p of placed) lines[p.dr] = `${p.label}\t${p.formula}`;
  // A pasted block ends with its last formula's line; the rows its result spills into stay untouched.
  const text = lines.slice(0, placed[placed.length - 1]!.dr + 1).join('\n');
  return { text, writes, blocks: placed, rows, cols };
}

/**
 * The pane's formulas as blocks in {@link BLOCK_ORDER}, sized by spillSize (formulas.ts) from
 * the current data and settings, labelled with {@link BLOCK_LABELS}. Kinds missing from
 * `formulas` are left out. Cost O(1).
 * @param formulas formula text by kind (allFormulas in formulas.ts).
 * @param sizes what the result sizes depend on (knot rows, candidates, the shape of new x).
 * @example paneBlocks({ BESTK: '=RATCHET.BESTK($B$2:$B$7,$A$2:$A$7)' }, { knotRows: 3, candidates: 5, newXs: { rows: 6, cols: 1 } })
 * // → [{ label: 'Suggested knot count', formula: '=RATCHET.BESTK($B$2:$B$7,$A$2:$A$7)', rows: 1, cols: 1 }]
 */
export function paneBlocks(formulas: Partial<Record<FormulaKind, string>>, sizes: SpillInputs): FormulaBlock[] {
  const out: FormulaBlock[] = [];
  for (const kind of BLOCK_ORDER) {
    const formula = formulas[kind];
    if (formula === undefined) continue;
    out.push({ label: BLOCK_LABELS[kind], formula, ...spillSize(kind, sizes) });
  }
  return out;
}
