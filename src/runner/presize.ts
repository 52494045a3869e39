/**
 * Result sizes worked out before a workbook enters the engine.
 *
 * HyperFormula fixes the size of an array result when it parses the formula (plugin.ts). A
 * result whose size is not known yet is first evaluated into one cell, thrown away and entered
 * again with its size, which at a million rows costs as much as the evaluation itself. Most
 * RATCHET formulas are one call whose arguments are ranges of plain values and constants, so
 * their size is known from the cells as the file holds them: this module evaluates such calls
 * once on those cells, and the engine is then built with each result at its final size. The
 * converted ranges are handed to the engine's first evaluation as well, so the calls there read
 * the same (never mutated) arrays and the functions' caches recognise them at once.
 *
 * Only what cannot change before the engine evaluates is read: a range qualifies when none of
 * its cells holds a formula and no formula could spill into one of its empty cells (no formula
 * on that sheet stands above and to the left of the range's bottom-right corner). A formula
 * that does not qualify (nested calls, names, whole columns, text arguments with commas…) is
 * sized the usual way. A guess is never trusted for a result: the engine still evaluates every
 * call, and a call whose size differs from the guess is re-sized as before.
 */
import type { RawCellContent } from 'hyperformula';
import type { CellArg, CellValueIn } from '../functions/types.js';
import { columnIndex } from './address.js';
import { dimsOf, registeredFunction, type Dims, type Staged } from './plugin.js';

/** A formula cell of the grid: sheet index (workbook order), 0-based row and column. */
export interface GridFormula {
  readonly sheet: number;
  readonly row: number;
  readonly col: number;
}

/** One argument as read from the formula text. */
type ArgText = { kind: 'empty' } | { kind: 'const'; value: CellValueIn } | { kind: 'ref'; sheet: string | undefined; top: number; left: number; bottom: number; right: number; single: boolean };

const REF = /^(?:(?:'((?:[^']|'')+)'|([A-Za-z_][A-Za-z0-9_.]*))!)?\$?([A-Za-z]{1,3})\$?([1-9][0-9]*)(?::\$?([A-Za-z]{1,3})\$?([1-9][0-9]*))?$/;
const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/** Splits the text between the call's parentheses at top-level commas; undefined when it holds anything but plain tokens. */
function splitArgs(inner: string): string[] | undefined {
  const out: string[] = [];
  let cur = '';
  for (let i = 0; i < inner.length; i++) {
    const ch = inner[i]!;
    if (ch === '"') {
      const end = inner.indexOf('"', i + 1);
      if (end < 0 || inner[end + 1] === '"') return undefined;
      cur += inner.slice(i, end + 1);
      i = end;
    } else if (ch === ',') {
      out.push(cur.trim());
      cur = '';
    } else if ('(){};'.includes(ch)) return undefined;
    else cur += ch;
  }
  out.push(cur.trim());
  return out;
}

function parseArg(t: string): ArgText | undefined {
  if (t === '') return { kind: 'empty' };
  if (/^"[^"]*"$/.test(t)) return { kind: 'const', value: t.slice(1, -1) };
  if (/^(true|false)$/i.test(t)) return { kind: 'const', value: t.toLowerCase() === 'true' };
  if (NUMBER.test(t)) return { kind: 'const', value: Number(t) };
  const m = REF.exec(t);
  if (!m) return undefined;
  const sheet = m[1] !== undefined ? m[1].replace(/''/g, "'") : m[2];
  const r0 = Number(m[4]) - 1;
  const c0 = columnIndex(m[3]!);
  const r1 = m[6] === undefined ? r0 : Number(m[6]) - 1;
  const c1 = m[5] === undefined ? c0 : columnIndex(m[5]);
  return { kind: 'ref', sheet, top: Math.min(r0, r1), left: Math.min(c0, c1), bottom: Math.max(r0, r1), right: Math.max(c0, c1), single: m[5] === undefined };
}

/**
 * Works out the result size of every formula cell that is one RATCHET call over plain values, by
 * evaluating the call on the grid's cells (the registered implementation, so the same code as in
 * the engine), and the converted range arguments those calls read. Cost: one evaluation of each
 * such call (the functions' result cache makes the engine's own evaluation of it a hit) and
 * O(cells) of the ranges read.
 * @param grids the sheets' raw contents as handed to `HyperFormula.buildFromSheets`, in
 * workbook order (formulas as text starting with "=", text with a leading "'").
 * @param names the sheet names in the same order.
 * @param formulas the formula cells of the grids (any order).
 * @returns sizes by "sheet:row:col" (only calls that evaluated without an error) and ranges by
 * "sheet:r0:c0:r1:c1", sheets numbered in workbook order as the engine numbers them. Never
 * throws: a call that throws, or one with an argument it cannot read, is left out.
 * @example presize([[[1, 1, '=RATCHET.FIT(B1:B4,A1:A4)'], [2, 3], [3, 2], [4, 4]]], ['Data'], [{ sheet: 0, row: 0, col: 2 }]).sizes
 * // → Map { '0:0:2' => { rows: 4, cols: 1 } }
 */
export function presize(grids: readonly (readonly (readonly RawCellContent[])[])[], names: readonly string[], formulas: readonly GridFormula[]): Staged {
  const sizes = new Map<string, Dims>();
  const ranges = new Map<string, CellArg>();
  const bySheet = new Map<number, GridFormula[]>();
  for (const f of formulas) {
    let list = bySheet.get(f.sheet);
    if (!list) bySheet.set(f.sheet, (list = []));
    list.push(f);
  }
  /** The cells of a range as the engine would hand them to a call, or undefined when they may still change. */
  const readRange = (sheet: number, a: Extract<ArgText, { kind: 'ref' }>): CellArg | undefined => {
    const key = `${sheet}:${a.top}:${a.left}:${a.bottom}:${a.right}`;
    const known = ranges.get(key);
    if (known !== undefined) return known;
    const grid = grids[sheet]!;
    const spillable = (bySheet.get(sheet) ?? []).some((f) => f.row <= a.bottom && f.col <= a.right);
    // Each row is allocated at its width (a row grown by push reserves room for 17 cells: at a
    // million rows that is hundreds of megabytes for the collector to move).
    const width = a.right - a.left + 1;
    const out: CellValueIn[][] = new Array<CellValueIn[]>(a.bottom - a.top + 1);
    for (let r = a.top; r <= a.bottom; r++) {
      const line = grid[r];
      const row: CellValueIn[] = new Array<CellValueIn>(width);
      for (let c = a.left; c <= a.right; c++) {
        const v = line === undefined ? null : (line[c] ?? null);
        if (v === null) {
          if (spillable) return undefined;
        } else if (!(typeof v === 'boolean' || (typeof v === 'number' && Number.isFinite(v)))) return undefined;
        row[c - a.left] = v;
      }
      out[r - a.top] = row;
    }
    ranges.set(key, out);
    return out;
  };
  for (const f of formulas) {
    const text = grids[f.sheet]![f.row]![f.col];
    if (typeof text !== 'string') continue;
    const m = /^=\s*(RATCHET\.[A-Za-z0-9]+)\s*\((.*)\)\s*$/i.exec(text);
    if (!m) continue;
    const fn = registeredFunction(m[1]!);
    const parts = fn === undefined ? undefined : splitArgs(m[2]!);
    if (fn === undefined || parts === undefined || parts.length > fn.params.length) continue;
    if (parts.length === 1 && parts[0] === '') parts.length = 0;
    const args: CellArg[] = [];
    let ok = true;
    for (const p of parts) {
      const a = parseArg(p);
      if (a === undefined) ok = false;
      else if (a.kind === 'empty') args.push(undefined);
      else if (a.kind === 'const') args.push(a.value);
      else {
        const sheet = a.sheet === undefined ? f.sheet : names.indexOf(a.sheet);
        // A single cell arrives as a scalar, and an empty one as 0 (the engine's evaluateNullToZero).
        const cells = sheet < 0 ? undefined : readRange(sheet, a);
        if (cells === undefined || !Array.isArray(cells)) ok = false;
        else if (a.single) {
          const v = cells[0]![0]!;
          if (v === null) ok = false;
          else args.push(v);
        } else args.push(cells);
      }
      if (!ok) break;
    }
    if (!ok) continue;
    while (args.length < fn.params.length) args.push(undefined);
    try {
      const d = dimsOf(fn.invoke(args));
      if (d.rows > 0 && d.cols > 0) sizes.set(`${f.sheet}:${f.row}:${f.col}`, d);
    } catch {
      // Sized by the engine instead.
    }
  }
  return { sizes, ranges };
}
