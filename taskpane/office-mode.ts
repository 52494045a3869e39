/**
 * Excel mode (shared runtime): the x, y and weight ranges come from typed addresses or the
 * selection; they are read with Office.js, watched with worksheet onChanged events (the chart
 * refreshes when their cells change), and the insert buttons write live formulas that reference
 * them — by table column when a range is exactly a table column's data, by absolute address
 * otherwise.
 */
/// <reference types="office-js" />
import type { App, Selection } from './app.js';
import type { CellValueIn } from '../src/functions/types.js';
import { absoluteRef, areaSize, intersects, parseAddress, tableColumnRef, type Area } from './refs.js';
import { insertFormula, type Confirm } from './insert.js';
import { spillSize, type FormulaKind } from './formulas.js';
import { candidateCount, knotTableRows } from './analysis.js';
import { gridSpill } from './surface-view.js';
import { leftOutOf } from './panels/left-out-panel.js';
import { freezeWorkbook, insertAll, insertPortableCurve } from './panels/handoff-panel.js';

function el<T extends HTMLElement>(id: string): T {
  return document.getElementById(id) as T;
}

/**
 * Why BAND or INVERTBAND has no formula to insert: the classic fit (knots 0) has no band; a level or readings field that is not valid; INVERTBAND without a target.
 * @example bandMissing('BAND', 0) // → 'BAND needs the knot model: set the knot count to 2 or more (the classic fit has no band).'
 */
export function bandMissing(kind: 'BAND' | 'INVERTBAND', knots: number): string {
  if (knots === 0) return `${kind} needs the knot model: set the knot count to 2 or more (the classic fit has no band).`;
  return kind === 'INVERTBAND'
    ? 'INVERTBAND needs a target: type a target y in the read-back box or a target_ys range above (and a valid level and number of readings).'
    : 'BAND needs a valid level: a number strictly between 0 and 1 (for example 0.95).';
}

/** A range read from the workbook. */
export interface ReadRange {
  readonly area: Area;
  readonly sheetId: string;
  /** Cells in reading order (a line: one column or one row). */
  readonly cells: CellValueIn[];
  /** How a formula refers to it: a table column or an absolute address (with sheet). */
  readonly ref: string;
}

/** Converts Office.js values + valueTypes to cells: Empty → null, Error → an error cell. */
export function toCells(values: readonly (readonly unknown[])[], types: readonly (readonly string[])[]): CellValueIn[] {
  const out: CellValueIn[] = [];
  for (let r = 0; r < values.length; r++) {
    const row = values[r]!;
    for (let c = 0; c < row.length; c++) {
      const t = types[r]?.[c];
      const v = row[c];
      if (t === 'Empty' || v === '' || v === null || v === undefined) out.push(null);
      else if (t === 'Error') out.push({ kind: 'error', code: String(v) });
      else if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') out.push(v);
      else out.push(String(v));
    }
  }
  return out;
}

/** Reads one range (a line of cells); whole columns/rows are cut to the used range. */
export async function readRange(address: string, label: string): Promise<ReadRange> {
  let parsed: Area;
  try {
    parsed = parseAddress(address);
  } catch (e) {
    throw new Error(`${label}: ${e instanceof Error ? e.message : String(e)}.`, { cause: e });
  }
  return Excel.run(async (context) => {
    const sheet = parsed.sheet === undefined ? context.workbook.worksheets.getActiveWorksheet() : context.workbook.worksheets.getItem(parsed.sheet);
    sheet.load(['name', 'id']);
    let range = sheet.getRange(absoluteRef(parsed, false).replace(/\$/g, ''));
    const { rows, cols } = areaSize(parsed);
    if (rows > 100000 || cols > 1000) range = range.getIntersection(sheet.getUsedRange(true));
    range.load(['values', 'valueTypes', 'address', 'rowCount', 'columnCount']);
    const tables = context.workbook.tables;
    tables.load('items/name');
    await context.sync();
    if (range.rowCount > 1 && range.columnCount > 1) throw new Error(`${label}: needs a single column or row; ${range.address} has ${range.rowCount} rows × ${range.columnCount} columns.`);
    const bang = range.address.lastIndexOf('!');
    const area = { ...parseAddress(range.address.slice(bang + 1)), sheet: sheet.name };
    // A table column whose data body is exactly this range → structured reference.
    const cols2 = tables.items.map((t) => {
      const c = t.columns;
      c.load('items/name');
      return { t, c };
    });
    await context.sync();
    const bodies = cols2.flatMap(({ t, c }) =>
      c.items.map((col) => {
        const body = col.getDataBodyRange();
        body.load('address');
        return { table: t.name, column: col.name, body };
      }),
    );
    if (bodies.length > 0) await context.sync();
    let ref = absoluteRef(area, true);
    for (const b of bodies) {
      const i = b.body.address.lastIndexOf('!');
      const ba = { ...parseAddress(b.body.address.slice(i + 1)), sheet: b.body.address.slice(0, i).replace(/^'(.*)'$/, '$1').replace(/''/g, "'") };
      if (ba.sheet.toLowerCase() === area.sheet.toLowerCase() && ba.r1 === area.r1 && ba.r2 === area.r2 && ba.c1 === area.c1 && ba.c2 === area.c2) {
        ref = tableColumnRef(b.table, b.column);
        break;
      }
    }
    return { area, sheetId: sheet.id, cells: toCells(range.values, range.valueTypes as string[][]), ref };
  });
}

/** Address of the current selection (with sheet). */
async function selectionAddress(): Promise<string> {
  return Excel.run(async (context) => {
    const r = context.workbook.getSelectedRange();
    r.load('address');
    await context.sync();
    return r.address;
  });
}

/** Splits a selection of 2–3 columns into x, y [, weight] column addresses, skipping a header row of text. */
async function selectionColumns(): Promise<string[]> {
  return Excel.run(async (context) => {
    const r = context.workbook.getSelectedRange();
    r.load(['address', 'columnCount', 'rowCount', 'valueTypes']);
    await context.sync();
    if (r.columnCount < 2 || r.columnCount > 3) throw new Error(`Select 2 or 3 adjacent columns (x, y, weight); the selection ${r.address} has ${r.columnCount}.`);
    const bang = r.address.lastIndexOf('!');
    const sheetPart = r.address.slice(0, bang + 1);
    const a = parseAddress(r.address.slice(bang + 1));
    const header = (r.valueTypes[0] ?? []).every((t) => t === 'String') && r.rowCount > 1;
    const r1 = header ? a.r1 + 1 : a.r1;
    const out: string[] = [];
    for (let c = a.c1; c <= a.c2; c++) out.push(sheetPart + absoluteRef({ sheet: undefined, r1, r2: a.r2, c1: c, c2: c }, false));
    return out;
  });
}

/** The Excel side of the pane. */
export class OfficeData {
  private ranges: { x: ReadRange; y: ReadRange; w: ReadRange | undefined; x2: ReadRange | undefined } | undefined;
  private handlers: OfficeExtension.EventHandlerResult<Excel.WorksheetChangedEventArgs>[] = [];
  private timer: ReturnType<typeof setTimeout> | undefined;
  private pendingConfirm: ((ok: boolean) => void) | undefined;

  constructor(private readonly app: App) {
    const pick = (input: string) => async (): Promise<void> => {
      el<HTMLInputElement>(input).value = await selectionAddress();
      if (input !== 'target') await this.read();
    };
    const safe = (f: () => Promise<void>, status: (t: string) => void) => () => void f().catch((e: unknown) => status(e instanceof Error ? e.message : String(e)));
    const fitStatus = (t: string): void => this.app.status(t, true);
    el<HTMLButtonElement>('pick-x').addEventListener('click', safe(pick('addr-x'), fitStatus));
    el<HTMLButtonElement>('pick-y').addEventListener('click', safe(pick('addr-y'), fitStatus));
    el<HTMLButtonElement>('pick-w').addEventListener('click', safe(pick('addr-w'), fitStatus));
    el<HTMLButtonElement>('pick-x2').addEventListener('click', safe(pick('addr-x2'), fitStatus));
    el<HTMLButtonElement>('pick-target').addEventListener('click', safe(pick('target'), (t) => this.insertStatus(t, true)));
    el<HTMLButtonElement>('pick-columns').addEventListener(
      'click',
      safe(async () => {
        const cols = await selectionColumns();
        el<HTMLInputElement>('addr-x').value = cols[0]!;
        el<HTMLInputElement>('addr-y').value = cols[1]!;
        el<HTMLInputElement>('addr-w').value = cols[2] ?? '';
        await this.read();
      }, fitStatus),
    );
    el<HTMLButtonElement>('read-ranges').addEventListener('click', safe(() => this.read(), fitStatus));
    for (const id of ['addr-x', 'addr-y', 'addr-w', 'addr-x2']) {
      el<HTMLInputElement>(id).addEventListener('change', safe(() => this.read(), fitStatus));
    }
    this.onOptionalRange('addr-targets', (ref, shape) => {
      app.targetsRef = ref;
      app.targetsShape = shape;
    });
    this.onOptionalRange('addr-newx', (ref, shape) => {
      app.newXsRef = ref;
      app.newXsShape = shape;
    });
    for (const b of document.querySelectorAll<HTMLButtonElement>('[data-insert]')) {
      b.addEventListener('click', safe(() => this.insert(b.dataset.insert as FormulaKind), (t) => this.insertStatus(t, true)));
    }
    el<HTMLButtonElement>('insert-grid').addEventListener('click', safe(() => this.insertGrid(), (t) => this.insertStatus(t, true)));
    el<HTMLButtonElement>('insert-all').addEventListener('click', safe(() => this.insertAll(), (t) => this.insertStatus(t, true)));
    el<HTMLButtonElement>('insert-portable').addEventListener('click', safe(() => this.insertPortable(), (t) => this.insertStatus(t, true)));
    el<HTMLButtonElement>('freeze').addEventListener('click', safe(() => this.freeze(), (t) => this.insertStatus(t, true)));
    el<HTMLButtonElement>('confirm-yes').addEventListener('click', () => this.answer(true));
    el<HTMLButtonElement>('confirm-no').addEventListener('click', () => this.answer(false));
    el<HTMLDivElement>('confirm').addEventListener('keydown', (e) => {
      if (e.key === 'Escape') this.answer(false);
    });
    app.setHostText('Running in Excel. Choose the data ranges; the chart follows their cells.');
  }

  /**
   * Wires the optional range field `id`: on each change `set` gets the field's absolute reference
   * and its size (both undefined when the field is blank; the size undefined when it is not a cell
   * address), then the formulas are rewritten.
   */
  private onOptionalRange(id: string, set: (ref: string | undefined, shape: { rows: number; cols: number } | undefined) => void): void {
    el<HTMLInputElement>(id).addEventListener('change', () => {
      const v = el<HTMLInputElement>(id).value.trim();
      const ref = v === '' ? undefined : this.absolute(v);
      let shape: { rows: number; cols: number } | undefined;
      try {
        shape = v === '' ? undefined : areaSize(parseAddress(v));
      } catch {
        shape = undefined;
      }
      set(ref, shape);
      this.app.updateFormulas();
    });
  }

  private absolute(address: string): string {
    try {
      return absoluteRef(parseAddress(address));
    } catch {
      return address;
    }
  }

  private insertStatus(text: string, error = false): void {
    const s = el<HTMLDivElement>('insert-status');
    s.textContent = text;
    s.classList.toggle('error', error);
  }

  /** Reads the three ranges, re-registers change events and refreshes the pane. */
  async read(keepCv = false): Promise<void> {
    const xa = el<HTMLInputElement>('addr-x').value.trim();
    const ya = el<HTMLInputElement>('addr-y').value.trim();
    const wa = el<HTMLInputElement>('addr-w').value.trim();
    const x2a = el<HTMLInputElement>('addr-x2').value.trim();
    if (xa === '' || ya === '') return;
    const [x, y, w, x2] = await Promise.all([
      readRange(xa, 'x range'),
      readRange(ya, 'y range'),
      wa === '' ? Promise.resolve(undefined) : readRange(wa, 'weight range'),
      x2a === '' ? Promise.resolve(undefined) : readRange(x2a, 'second x range'),
    ]);
    this.ranges = { x, y, w, x2 };
    const sel: Selection = {
      data: { x: x.cells, y: y.cells, w: w?.cells },
      refs: { x: x.ref, y: y.ref, w: w?.ref },
      labels: { x: `x (${x.ref})`, y: `y (${y.ref})` },
      description: `x = ${x.ref}, y = ${y.ref}${w ? `, weight = ${w.ref}` : ''}${x2 ? `, x2 = ${x2.ref}` : ''}`,
      fileStem: 'ratchet',
      leftOut: leftOutOf([x, y, w, x2]),
      x2: x2 ? { cells: x2.cells, ref: x2.ref, label: `x2 (${x2.ref})` } : undefined,
    };
    this.app.setSelection(sel, keepCv);
    await this.watch();
  }

  private async watch(): Promise<void> {
    const old = this.handlers;
    this.handlers = [];
    const r = this.ranges;
    if (!r) return;
    const sheets = new Set([r.x.area.sheet, r.y.area.sheet, ...(r.w ? [r.w.area.sheet] : []), ...(r.x2 ? [r.x2.area.sheet] : [])].filter((s): s is string => s !== undefined));
    // A handler is removed through the request context it was added with.
    for (const h of old) {
      try {
        h.remove();
        await h.context.sync();
      } catch {
        // the sheet may be gone; nothing left to remove
      }
    }
    await Excel.run(async (context) => {
      for (const name of sheets) {
        const ws = context.workbook.worksheets.getItem(name);
        this.handlers.push(ws.onChanged.add((e) => this.changed(e)));
      }
      await context.sync();
    });
  }

  private async changed(e: Excel.WorksheetChangedEventArgs): Promise<void> {
    const r = this.ranges;
    if (!r) return;
    let changedArea: Area;
    try {
      changedArea = parseAddress(e.address);
    } catch {
      return;
    }
    const hit = [r.x, r.y, r.w, r.x2].some((q) => q !== undefined && q.sheetId === e.worksheetId && intersects({ ...q.area, sheet: undefined }, changedArea));
    if (!hit) return;
    if (this.timer !== undefined) clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.timer = undefined;
      this.read().catch((err: unknown) => this.app.status(err instanceof Error ? err.message : String(err), true));
    }, 250);
  }

  private readonly confirm: Confirm = (message) =>
    new Promise<boolean>((resolve) => {
      this.pendingConfirm?.(false);
      this.pendingConfirm = resolve;
      el<HTMLParagraphElement>('confirm-text').textContent = message;
      el<HTMLDivElement>('confirm').hidden = false;
      el<HTMLButtonElement>('confirm-no').focus();
    });

  private answer(ok: boolean): void {
    const p = this.pendingConfirm;
    this.pendingConfirm = undefined;
    el<HTMLDivElement>('confirm').hidden = true;
    p?.(ok);
  }

  /** Inserts the RATCHET.GRID formula of the surface at the target cell (asks before writing over anything). */
  async insertGrid(): Promise<void> {
    this.insertStatus('');
    const r = this.ranges;
    const view = this.app.currentSurface();
    const formula = this.app.surfaceFormula();
    if (!r?.x2 || !view || !formula) {
      this.insertStatus('Choose a second x range whose surface is drawn without an error first.', true);
      return;
    }
    const target = this.targetCell();
    if (target === undefined) return;
    const size = gridSpill(view);
    const inputs = [r.x.area, r.y.area, r.x2.area, ...(r.w ? [r.w.area] : [])];
    const outcome = await insertFormula(Excel, { formula, target, rows: size.rows, cols: size.cols, inputs }, this.confirm);
    this.insertStatus(outcome.message, !outcome.written);
  }

  /** The data ranges a result may not cover. */
  private inputAreas(): Area[] {
    const r = this.ranges;
    return r ? [r.x.area, r.y.area, ...(r.w ? [r.w.area] : []), ...(r.x2 ? [r.x2.area] : [])] : [];
  }

  /** The target cell, or undefined after saying that one is needed. */
  private targetCell(): string | undefined {
    const target = el<HTMLInputElement>('target').value.trim();
    if (target === '') this.insertStatus('Pick the top-left cell of the result first.', true);
    return target === '' ? undefined : target;
  }

  /**
   * The start of an insert action that needs `needed` (a layout or fit of the chosen ranges,
   * undefined when there is none): clears the insert status and returns `needed` with the target
   * cell, or undefined after saying which of the two is missing.
   */
  private readyToInsert<T>(needed: T | undefined): { needed: T; target: string } | undefined {
    this.insertStatus('');
    if (needed === undefined) {
      this.insertStatus('Choose data that fit without an error first.', true);
      return undefined;
    }
    const target = this.targetCell();
    return target === undefined ? undefined : { needed, target };
  }

  /** "Insert all": every formula of the pane, laid out so that no result collides (asks before writing over anything). */
  async insertAll(): Promise<void> {
    const ready = this.readyToInsert(this.ranges ? this.app.blockLayout() : undefined);
    if (!ready) return;
    const { needed: layout, target } = ready;
    const outcome = await insertAll(Excel, layout, target, this.inputAreas(), this.confirm);
    this.insertStatus(outcome.written ? `Inserted ${layout.blocks.length} formulas with their labels in ${outcome.area}; each result has room to spill.` : outcome.message, !outcome.written);
  }

  /** "Portable curve": the knot table as values with INDEX/MATCH formulas beside it. */
  async insertPortable(): Promise<void> {
    const ready = this.readyToInsert(this.ranges ? this.app.currentFit() : undefined);
    if (!ready) return;
    const { needed: view, target } = ready;
    // A smooth fit's table keeps its third column: the portable formulas refuse it with a message.
    const outcome = await insertPortableCurve(Excel, knotTableRows(view), target, this.inputAreas(), this.confirm);
    this.insertStatus(
      outcome.written
        ? `Wrote the knot table (${view.knots.length} knots) as values in ${outcome.area}, with formulas that need no add-in: type x values into the "new x" column.`
        : outcome.message,
      !outcome.written,
    );
  }

  /** "Frozen values": replaces every RATCHET formula of the workbook by its values, after confirmation. */
  async freeze(): Promise<void> {
    this.insertStatus('');
    const outcome = await freezeWorkbook(Excel, this.confirm);
    this.insertStatus(outcome.message, outcome.replaced === 0);
  }

  /** Inserts one formula at the target cell (asks before writing over anything). */
  async insert(kind: FormulaKind): Promise<void> {
    this.insertStatus('');
    const r = this.ranges;
    const view = this.app.currentFit();
    const formula = this.app.formula(kind);
    if (r && view && !formula && (kind === 'BAND' || kind === 'INVERTBAND')) {
      this.insertStatus(bandMissing(kind, this.app.fitSettings().knots), true);
      return;
    }
    if (!r || !view || !formula) {
      this.insertStatus('Choose data that fit without an error first.', true);
      return;
    }
    const target = this.targetCell();
    if (target === undefined) return;
    const cv = this.app.cvSettings();
    let newXs = { rows: r.x.area.r2 - r.x.area.r1 + 1, cols: r.x.area.c2 - r.x.area.c1 + 1 };
    const nx = el<HTMLInputElement>('addr-newx').value.trim();
    if (nx !== '') newXs = areaSize(parseAddress(nx));
    const size = spillSize(kind, {
      knotRows: view.knots.length,
      knotCols: view.smooth ? 3 : 2,
      candidates: candidateCount(view, cv),
      newXs,
      targets: this.app.targetsShape,
    });
    const outcome = await insertFormula(Excel, { formula, target, rows: size.rows, cols: size.cols, inputs: [r.x.area, r.y.area, ...(r.w ? [r.w.area] : [])] }, this.confirm);
    this.insertStatus(outcome.message, !outcome.written);
  }
}
