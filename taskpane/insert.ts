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

/**
 * Checks the target area and writes the formula into its top-left cell.
 * Cost: one round trip to read the area's values and formulas, one to write.
 * @throws Error for an unreadable target address, a result that would not fit on the sheet, or
 *   an area overlapping the data (nothing is written in these cases).
 */
export async function insertFormula(excel: ExcelLike, req: InsertRequest, confirm: Confirm): Promise<InsertOutcome> {
  const anchor = parseAddress(req.target);
  const area0 = spillArea(anchor, req.rows, req.cols);
  return excel.run(async (context) => {
    const sheet = area0.sheet === undefined ? context.workbook.worksheets.getActiveWorksheet() : context.workbook.worksheets.getItem(area0.sheet);
    sheet.load('name');
    const range = sheet.getRange(plainRef(area0));
    range.load(['values', 'formulas', 'address']);
    await context.sync();
    const area: Area = { ...area0, sheet: sheet.name };
    for (const input of req.inputs) {
      const inputOnSheet: Area = input.sheet === undefined ? { ...input, sheet: sheet.name } : input;
      if (intersects(area, inputOnSheet)) {
        throw new Error(`The result (${range.address}) would overlap the data it reads; pick a cell outside the data ranges.`);
      }
    }
    const values = range.values as unknown[][];
    const formulas = range.formulas as unknown[][];
    const { rows, cols } = areaSize(area0);
    const occupied: string[] = [];
    for (let r = 0; r < rows; r++) {
      for (let c = 0; c < cols; c++) {
        if (!isEmptyCell(values[r]?.[c], formulas[r]?.[c])) occupied.push(cellName(area0, r, c));
      }
    }
    if (occupied.length > 0) {
      const list = occupied.slice(0, 5).join(', ') + (occupied.length > 5 ? ` and ${occupied.length - 5} more` : '');
      const question =
        `The result needs ${rows} × ${cols} cell${rows * cols === 1 ? '' : 's'} (${range.address}), but ${occupied.length} ` +
        `${occupied.length === 1 ? 'is' : 'are'} not empty: ${list}. Overwrite ${occupied.length === 1 ? 'it' : 'them'}?`;
      const ok = await confirm(question);
      if (!ok) return { written: false, area: range.address, occupied, message: 'Nothing was written: the cells were kept.' };
      range.clear('Contents');
    }
    const cell = sheet.getRange(plainRef({ ...area0, r2: area0.r1, c2: area0.c1 }));
    cell.formulas = [[req.formula]];
    await context.sync();
    return { written: true, area: range.address, occupied, message: `Inserted ${req.formula} at ${cellName(area0, 0, 0)}.` };
  });
}
