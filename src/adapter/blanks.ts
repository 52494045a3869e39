/**
 * The blank-cell policy: a blank cell never enters a fit as 0.
 *
 * Hosts pass an empty cell of a range argument as `null` (Excel's documented behaviour, and what the
 * headless runner does) or as `""`; both are blanks everywhere in Ratchet. Some Excel builds have
 * been reported to pass empty cells as the number 0, which is indistinguishable by value from a
 * typed 0. The Excel entry therefore asks for its arguments' addresses
 * (`@requiresParameterAddresses`) and, only when an argument contains a 0 and comes from a
 * worksheet range, reads that range's `valueTypes` through `Excel.run` in the shared runtime; a cell
 * whose type is `"Empty"` is then treated as blank ({@link applyBlankTypes}). Arguments that are not
 * ranges (constants, array literals, results of other formulas) have no address and are taken by
 * value. Two policies follow, both tested:
 *
 * - `'values'`: null and "" are blanks, 0 is the number 0 (runner, task pane, tests);
 * - `'types'` (Excel): as `'values'`, plus every 0 whose cell type is Empty is a blank.
 */
import type { CellArg, CellValueIn } from './cell-types.js';

/** Excel's per-cell value type names (the subset the policy needs). */
export type ValueTypeName = 'Empty' | 'String' | 'Double' | 'Integer' | 'Boolean' | 'Error' | 'Unknown' | 'RichValue' | string;

/**
 * True when `arg` holds a number 0 somewhere — the only value the `'types'` policy has to check.
 * Cost O(cells), no allocation.
 */
export function hasZero(arg: CellArg): boolean {
  if (!Array.isArray(arg)) return arg === 0;
  for (const row of arg) {
    if (!Array.isArray(row)) continue;
    for (const v of row) if (v === 0) return true;
  }
  return false;
}

/**
 * Returns `arg` with every cell whose value type is `"Empty"` replaced by `null`. `valueTypes` must
 * have the argument's shape; when it does not (e.g. the host trimmed the range) the argument is
 * returned unchanged, which is the `'values'` policy. Scalars: a 1×1 type grid applies.
 * Cost O(cells). The input is not modified.
 * @example applyBlankTypes([[1], [0]], [['Double'], ['Empty']]) // → [[1], [null]]
 */
export function applyBlankTypes(arg: CellArg, valueTypes: readonly (readonly ValueTypeName[])[] | undefined): CellArg {
  if (valueTypes === undefined || arg === undefined) return arg;
  if (!Array.isArray(arg)) {
    return valueTypes.length === 1 && valueTypes[0]?.length === 1 && valueTypes[0][0] === 'Empty' ? null : arg;
  }
  if (valueTypes.length !== arg.length) return arg;
  let changed = false;
  const out: CellValueIn[][] = [];
  for (let r = 0; r < arg.length; r++) {
    const row = arg[r]!;
    const types = valueTypes[r]!;
    if (!Array.isArray(row) || types.length !== row.length) return arg;
    let copy: CellValueIn[] | undefined;
    for (let c = 0; c < row.length; c++) {
      if (types[c] === 'Empty' && row[c] !== null) {
        copy ??= row.slice();
        copy[c] = null;
      }
    }
    if (copy) changed = true;
    out.push(copy ?? row);
  }
  return changed ? out : arg;
}

/**
 * Splits an Excel range address such as `Sheet1!A1:B9`, `'Kiln data'!$B$2:$B$40` or
 * `[Book1]Sheet1!A:A` into sheet name and range part; undefined when it is not a sheet address.
 * @example splitAddress("'It''s'!A1:A3") // → { sheet: "It's", range: 'A1:A3' }
 */
export function splitAddress(address: string | undefined | null): { sheet: string; range: string } | undefined {
  if (typeof address !== 'string') return undefined;
  const bang = address.lastIndexOf('!');
  if (bang <= 0) return undefined;
  let sheet = address.slice(0, bang);
  const range = address.slice(bang + 1);
  if (!/^\$?[A-Za-z]{0,3}\$?\d*(:\$?[A-Za-z]{0,3}\$?\d*)?$/.test(range) || range === '') return undefined;
  if (sheet.startsWith("'") && sheet.endsWith("'") && sheet.length >= 2) sheet = sheet.slice(1, -1).replace(/''/g, "'");
  sheet = sheet.replace(/^\[[^\]]*\]/, '');
  if (sheet === '') return undefined;
  return { sheet, range };
}

/** Reads the value types of a worksheet range (in Excel: `Excel.run` + `range.valueTypes`). */
export type ValueTypeReader = (sheet: string, range: string) => Promise<ValueTypeName[][]>;

/**
 * Applies the `'types'` policy to every argument that has a sheet address and contains a 0.
 * Concurrent requests for the same address share one read (`inflight`), so a recalculation of
 * 10,000 cells over one range reads its types once. A failed read leaves that argument as it is
 * (the `'values'` policy) — it never fails the calculation.
 */
export async function resolveBlanks(
  args: readonly CellArg[],
  addresses: readonly (string | undefined | null)[] | undefined,
  read: ValueTypeReader,
  inflight: Map<string, Promise<ValueTypeName[][]>> = sharedInflight,
): Promise<CellArg[]> {
  const out = args.slice();
  if (!addresses) return out;
  await Promise.all(
    args.map(async (arg, i) => {
      if (!hasZero(arg)) return;
      const where = splitAddress(addresses[i]);
      if (!where) return;
      const key = `${where.sheet}!${where.range}`;
      let p = inflight.get(key);
      if (!p) {
        p = read(where.sheet, where.range);
        inflight.set(key, p);
        const drop = (): void => {
          if (inflight.get(key) === p) inflight.delete(key);
        };
        p.then(drop, drop);
      }
      try {
        out[i] = applyBlankTypes(arg, await p);
      } catch {
        /* keep the 'values' policy for this argument */
      }
    }),
  );
  return out;
}

const sharedInflight = new Map<string, Promise<ValueTypeName[][]>>();
