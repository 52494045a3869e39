/**
 * Office-mode insert action: writes one live RATCHET formula at a cell the user picked, after
 * checking that neither that cell nor the area its result will spill into holds anything — a
 * value, a formula, or part of another spilled result. If something is there, the user is asked
 * (through `confirm`) and nothing is written unless they agree; on agreement the area's contents
 * are cleared first so the new result can spill.
 */
/// <reference types="office-js" />
import { areaSize, intersects, parseAddress, plainRef, spillArea, type Area } from './refs.js';

/** The part of the Excel namespace the action uses (the real `Excel`, or an office-addin-mock object). */
export interface ExcelLike {
  run<T>(batch: (context: Excel.RequestContext) => Promise<T>): Promise<T>;
}

/** Asks the user a yes/no question; resolves true to go ahead. */
export type Confirm = (message: string) => Promise<boolean>;

/** One insert request. */
export interface InsertRequest {
  /** Formula text, e.g. "=RATCHET.KNOTS($B$2:$B$29,$A$2:$A$29,5,1)". */
  readonly formula: string;
  /** Address of the top-left cell ("E2", "Sheet1!E2"); a larger range uses its top-left cell. */
  readonly target: string;
  /** Size of the result (see spillSize in formulas.ts). */
  readonly rows: number;
  readonly cols: number;
  /** Ranges the formula reads: the result must not overlap them (that would be a circular reference). */
  readonly inputs: readonly Area[];
}

/** Outcome of an insert. */
export interface InsertOutcome {
  readonly written: boolean;
  /** Address (with sheet) of the area the result occupies. */
  readonly area: string;
  /** Non-empty cells found in the area before writing (A1 addresses without sheet). */
  readonly occupied: readonly string[];
  readonly message: string;
}

function isEmptyCell(value: unknown, formula: unknown): boolean {
  const v = value === null || value === undefined || value === '';
  const f = formula === null || formula === undefined || formula === '';
  return v && f;
}

function cellName(a: Area, r: number, c: number): string {
  return plainRef({ sheet: undefined, r1: a.r1 + r, r2: a.r1 + r, c1: a.c1 + c, c2: a.c1 + c });
}

/** One reading of the result area: its address and the cells that are not empty. */
interface AreaReading {
  readonly address: string;
  readonly sheetName: string;
  readonly occupied: readonly string[];
  /** Value and formula of every cell, row-major, for comparing two readings. */
  readonly contents: string;
}

async function readArea(excel: ExcelLike, area0: Area): Promise<AreaReading> {
  return excel.run(async (context) => {
    const sheet = area0.sheet === undefined ? context.workbook.worksheets.getActiveWorksheet() : context.workbook.worksheets.getItem(area0.sheet);
    sheet.load('name');
    const range = sheet.getRange(plainRef(area0));
    range.load(['values', 'formulas', 'address']);
    await context.sync();
    const values = range.values as unknown[][];
    const formulas = range.formulas as unknown[][];
    const { rows, cols } = areaSize(area0);
    const occupied: string[] = [];
    const contents: unknown[] = [];
    for (let r = 0; r < rows; r++) {
      for (let c = 0; c < cols; c++) {
        const v = values[r]?.[c];
        const f = formulas[r]?.[c];
        contents.push([v ?? null, f ?? null]);
        if (!isEmptyCell(v, f)) occupied.push(cellName(area0, r, c));
      }
    }
    return { address: range.address, sheetName: sheet.name, occupied, contents: JSON.stringify(contents) };
  });
}

/**
 * The A1 ranges a formula's text refers to (`$B$2:$B$9`, `Data!A2`, `'My data'!$C:$C`; text in
 * double quotes is skipped; structured table references are not resolved here — pass their areas
 * as {@link InsertRequest.inputs}). Names followed by "(" are functions, not cells (`LOG10(`).
 * Cost: O(length of the formula).
 * @param formula formula text, with or without the leading "=".
 * @returns the areas, each with its sheet or undefined (the formula's own sheet).
 * @example formulaReads('=RATCHET.PREDICT($D$2:$D$4,Data!$B$2:$B$9,Data!$A$2:$A$9,3,1)').length // → 3
 */
export function formulaReads(formula: string): Area[] {
  const out: Area[] = [];
  // Blank out string literals so that text inside quotes is never read as a reference.
  const text = formula.replace(/"(?:[^"]|"")*"/g, (m) => ' '.repeat(m.length));
  const cellOrCol = String.raw`\$?[A-Za-z]{1,3}(?:\$?[0-9]{1,7})?`;
  const ref = new RegExp(String.raw`(?:('(?:[^']|'')+'|[A-Za-z_][A-Za-z0-9_.]*)!)?(${cellOrCol}(?::${cellOrCol})?|\$?[0-9]{1,7}:\$?[0-9]{1,7})`, 'g');
  for (let m = ref.exec(text); m !== null; m = ref.exec(text)) {
    const before = text[m.index - 1];
    const after = text[m.index + m[0].length];
    if (before !== undefined && /[A-Za-z0-9_.$'\][]/.test(before)) continue;
    if (after !== undefined && /[A-Za-z0-9_.(![]/.test(after)) continue;
    const sheet = m[1];
    try {
      const a = parseAddress(m[2]!);
      out.push({ ...a, sheet: sheet === undefined ? undefined : sheet.startsWith("'") ? sheet.slice(1, -1).replace(/''/g, "'") : sheet });
    } catch {
      // not a reference (a name such as TRUE or a bare word): nothing to guard
    }
  }
  return out;
}

function questionFor(reading: AreaReading, rows: number, cols: number, changed: boolean): string {
  const { occupied } = reading;
  const list = occupied.slice(0, 5).join(', ') + (occupied.length > 5 ? ` and ${occupied.length - 5} more` : '');
  return (
    (changed ? 'The cells changed while the question was open. ' : '') +
    `The result needs ${rows} × ${cols} cell${rows * cols === 1 ? '' : 's'} (${reading.address}), but ${occupied.length} ` +
    `${occupied.length === 1 ? 'is' : 'are'} not empty: ${list}. Overwrite ${occupied.length === 1 ? 'it' : 'them'}?`
  );
}

/**
 * Checks the target area and writes the formula into its top-left cell.
 *
 * The result may not overlap any range the formula reads: `req.inputs` (the data ranges, also
 * table columns) and every A1 reference in the formula text itself (PREDICT's new_xs, for
 * instance; see {@link formulaReads}). When the area holds anything, the user is asked; just
 * before writing the area is read again, and if anything in it changed since the question was
 * asked, the user is asked again with the new list (so nothing is cleared that was not listed).
 * Cost: one round trip to read the area, then per answer one to re-read it and write.
 * @throws Error for an unreadable target address, a result that would not fit on the sheet, or
 *   an area overlapping the data (nothing is written in these cases).
 */
export async function insertFormula(excel: ExcelLike, req: InsertRequest, confirm: Confirm): Promise<InsertOutcome> {
  const anchor = parseAddress(req.target);
  const area0 = spillArea(anchor, req.rows, req.cols);
  const { rows, cols } = areaSize(area0);
  let reading = await readArea(excel, area0);
  const area: Area = { ...area0, sheet: reading.sheetName };
  for (const input of [...req.inputs, ...formulaReads(req.formula)]) {
    const inputOnSheet: Area = input.sheet === undefined ? { ...input, sheet: reading.sheetName } : input;
    if (intersects(area, inputOnSheet)) {
      throw new Error(`The result (${reading.address}) would overlap the data it reads; pick a cell outside the data ranges.`);
    }
  }
  let changed = false;
  for (;;) {
    if (reading.occupied.length > 0) {
      const ok = await confirm(questionFor(reading, rows, cols, changed));
      if (!ok) return { written: false, area: reading.address, occupied: reading.occupied, message: 'Nothing was written: the cells were kept.' };
    }
    const agreed = reading;
    const outcome = await excel.run(async (context) => {
      const sheet = area0.sheet === undefined ? context.workbook.worksheets.getActiveWorksheet() : context.workbook.worksheets.getItem(area0.sheet);
      const now = await readArea({ run: (b) => b(context) }, area0);
      if (now.contents !== agreed.contents) return now;
      if (agreed.occupied.length > 0) sheet.getRange(plainRef(area0)).clear('Contents');
      const cell = sheet.getRange(plainRef({ ...area0, r2: area0.r1, c2: area0.c1 }));
      cell.formulas = [[req.formula]];
      await context.sync();
      return undefined;
    });
    if (outcome === undefined) {
      return { written: true, area: agreed.address, occupied: agreed.occupied, message: `Inserted ${req.formula} at ${cellName(area0, 0, 0)}.` };
    }
    reading = outcome;
    changed = true;
  }
}
