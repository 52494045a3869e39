/**
 * A workbook evaluated headlessly: exceljs reads the file, HyperFormula evaluates every formula
 * on every sheet, with the RATCHET functions registered as a plugin (plugin.ts).
 *
 * The file is never modified. Formulas are read in the typed form (`RATCHET.FIT(`) or the stored
 * form Excel writes (`_xldudf_RATCHET_FIT(`), including array-formula and shared-formula cells as
 * exceljs reports them; cells inside an array formula's range hold cached results in the file and
 * are cleared before evaluation so the fresh result can spill there.
 */
import { readFileSync, statSync } from 'node:fs';
import ExcelJS from 'exceljs';
import { DetailedCellError, HyperFormula, type RawCellContent, type SimpleCellAddress } from 'hyperformula';
import { cellName, parseCellRef, parseRange, qualifiedName } from './address.js';
import { callsRatchet, toStoredForm, toTypedForm } from './formula-text.js';
import { beginRecalculation, sizingStateOf, stageForNextEngine } from './plugin.js';
import { presize } from './presize.js';
import { markDynamicArrays } from './dynamic-arrays.js';
import { checkOutput, writeOutputSafely } from './safe-write.js';
import { packageProblem } from './package-check.js';

/** A cell value in the runner's JSON: numbers, text, logicals, null for blank, error codes as text. */
export type JsonCell = number | string | boolean | null;

/** What an input cell may be set to. A string starting with "=" is a formula. */
export type InputValue = number | string | boolean | null;

/** One formula cell after evaluation. */
export interface FormulaResult {
  readonly sheet: string;
  /** "B7" of the formula cell (the top-left of its spill). */
  readonly cell: string;
  /** Formula in the typed form, with a leading "=". */
  readonly formula: string;
  /** Values of the result: one row of one cell for a scalar, the spilled block otherwise. */
  readonly values: JsonCell[][];
  /** Error messages by "Sheet!A1" for error cells of this result. */
  readonly messages: Readonly<Record<string, string>>;
  /** True when the formula calls a RATCHET function. */
  readonly ratchet: boolean;
}

/** The runner's JSON document: "Sheet!A1" → value, plus messages of error cells. */
export interface RunnerJson {
  [address: string]: JsonCell | Record<string, string>;
  messages: Record<string, string>;
}

/** Engine settings: Excel-like dynamic arrays, full precision in results, Excel serial dates (from 1 March 1900 on). */
const HF_CONFIG = {
  licenseKey: 'gpl-v3',
  useArrayArithmetic: true,
  smartRounding: false,
  evaluateNullToZero: true,
  maxRows: 1048576,
  maxColumns: 16384,
} as const;

/** Name of the engine-only sheet of keeper formulas (never written to a copy, never listed). */
const KEEPER_SHEET = '__ratchet_keep';

/** Most re-sizing passes per recalculation (each pass re-enters only the cells that changed size). */
const MAX_PASSES = 25;

/** Excel serial day number of a Date (1900 date system, UTC). */
function excelSerial(d: Date): number {
  return d.getTime() / 86400000 + 25569;
}

/** exceljs cell value → HyperFormula raw content. Text is kept as text ("12" stays text). */
function rawOfValue(v: ExcelJS.CellValue): RawCellContent {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'boolean') return v;
  if (typeof v === 'string') return `'${v}`;
  if (v instanceof Date) return excelSerial(v);
  if (typeof v === 'object') {
    if ('richText' in v && Array.isArray(v.richText)) return `'${v.richText.map((r) => r.text).join('')}`;
    if ('error' in v) return String(v.error);
    if ('text' in v && typeof v.text === 'string') return `'${v.text}`;
  }
  return `'${String(v)}`;
}

/** HyperFormula cell value → JSON cell. */
function jsonOf(v: unknown): JsonCell {
  if (v === null || v === undefined) return null;
  if (v instanceof DetailedCellError) return v.value;
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  return String(v);
}

/**
 * Parses a value typed on the command line (`--set Sheet!A1=value`): an empty value is a blank
 * cell, a decimal number (optional sign and exponent) a number, TRUE/FALSE (any case) a logical,
 * text starting with "=" a formula, anything else text kept as typed. O(length).
 * @example parseInputValue('2.5e3') // → 2500
 * @example parseInputValue('12 kg') // → '12 kg'
 */
export function parseInputValue(text: string): InputValue {
  const t = text.trim();
  if (t === '') return null;
  if (t.startsWith('=')) return t;
  if (/^(true|false)$/i.test(t)) return t.toLowerCase() === 'true';
  const n = Number(t);
  if (Number.isFinite(n) && /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return n;
  return text;
}

/**
 * The workbook's defined names that refer to one cell or one range, as HyperFormula named
 * expressions (so `=RATCHET.FIT(Strength,Temperature)` works). Names over several ranges and
 * Excel's own names (`_xlnm.Print_Area`, …) are left out; a formula using them shows #NAME?.
 */
function namedRanges(wb: ExcelJS.Workbook): { name: string; expression: string }[] {
  const model = (wb.definedNames as unknown as { model: { name: string; ranges: string[] }[] }).model;
  return model
    .filter((d) => d.ranges.length === 1 && !d.name.startsWith('_xlnm.') && /^[A-Za-z_\\][A-Za-z0-9_.]*$/.test(d.name))
    .map((d) => ({ name: d.name, expression: `=${d.ranges[0]!}` }));
}

/** Thrown for a file the runner cannot read as a workbook; the message is meant for users. */
export class WorkbookReadError extends Error {
  override readonly name = 'WorkbookReadError';
}

/** Wall time of loading a workbook, split into reading its cells and evaluating it (ms). */
export interface WorkbookTimings {
  readonly readMs: number;
  readonly evaluateMs: number;
}

/** A formula value as exceljs reports it, with the array/shared attributes its typings omit. */
interface FormulaCellValue {
  formula?: string;
  sharedFormula?: string;
  result?: unknown;
  shareType?: string;
  ref?: string;
}

/** The cells of a workbook as the engine takes them, with its formula cells and defined names. */
interface WorkbookCells {
  /** Raw contents by sheet name (formulas as "=…" in the typed form, text with a leading "'"). */
  readonly sheets: Record<string, RawCellContent[][]>;
  /** Sheet names in workbook order. */
  readonly names: readonly string[];
  /** Formula cells, sheets numbered in workbook order. */
  readonly formulas: readonly SimpleCellAddress[];
  /** Defined names over one range, as named expressions. */
  readonly defined: { name: string; expression: string }[];
}

/**
 * Reads an exceljs workbook's cells (see {@link EvaluatedWorkbook.fromExcel} for the cell rules);
 * the workbook is not modified. O(cells).
 */
function cellsOf(wb: ExcelJS.Workbook): WorkbookCells {
  const sheets: Record<string, RawCellContent[][]> = {};
  const names: string[] = [];
  const formulas: SimpleCellAddress[] = [];
  for (const ws of wb.worksheets) {
    names.push(ws.name);
    const grid: RawCellContent[][] = [];
    const cleared = new Set<string>();
    const put = (r: number, c: number, v: RawCellContent) => {
      while (grid.length <= r) grid.push([]);
      const row = grid[r]!;
      while (row.length <= c) row.push(null);
      row[c] = v;
    };
    ws.eachRow({ includeEmpty: false }, (row, rowNumber) => {
      // Each row of the grid is allocated once at its width (cells up to the last filled one):
      // grown cell by cell, every row would reserve room for 17 cells — at a million rows about
      // 120 MB more for the collector to move while the engine is built.
      const r = rowNumber - 1;
      while (grid.length < r) grid.push([]);
      if (grid.length === r) grid.push(new Array<RawCellContent>(row.cellCount).fill(null));
      row.eachCell({ includeEmpty: false }, (cell) => {
        // Cells merged into another report the first cell's value; they are empty.
        if (cell.isMerged && cell.master !== cell) return;
        const r = Number(cell.row) - 1;
        const c = Number(cell.col) - 1;
        const v = cell.value as ExcelJS.CellValue;
        if (v !== null && typeof v === 'object' && ('formula' in v || 'sharedFormula' in v)) {
          const text = cell.formula;
          if (typeof text === 'string' && text !== '') {
            put(r, c, `=${toTypedForm(text.replace(/^=/, ''))}`);
            formulas.push({ sheet: names.length - 1, row: r, col: c });
            const fv = v as FormulaCellValue;
            if (fv.shareType === 'array' && typeof fv.ref === 'string') {
              const g = parseRange(fv.ref);
              for (let rr = g.top; rr <= g.bottom; rr++)
                for (let cc = g.left; cc <= g.right; cc++) if (rr !== r || cc !== c) cleared.add(`${rr}:${cc}`);
            }
            return;
          }
          put(r, c, null);
          return;
        }
        put(r, c, rawOfValue(v));
      });
    });
    for (const k of cleared) {
      const [rr, cc] = k.split(':').map(Number) as [number, number];
      const row = grid[rr];
      if (row && cc < row.length && !(typeof row[cc] === 'string' && (row[cc] as string).startsWith('='))) row[cc] = null;
    }
    sheets[ws.name] = grid;
  }
  return { sheets, names, formulas, defined: namedRanges(wb) };
}

/**
 * Loads the bytes of an .xlsx file with exceljs and returns its cells only, so that the exceljs
 * objects are garbage when this returns. O(cells).
 * @throws WorkbookReadError when exceljs cannot read it or it has no worksheets.
 */
async function cellsOfFile(path: string, data: Buffer): Promise<WorkbookCells> {
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.load(data as unknown as ArrayBuffer);
  } catch {
    throw new WorkbookReadError(`Cannot read "${path}": it is not an .xlsx workbook (Excel 2007+ Open XML) or it is damaged.`);
  }
  if (wb.worksheets.length === 0) throw new WorkbookReadError(`Cannot read "${path}": it has no worksheets.`);
  return cellsOf(wb);
}

/** A workbook loaded into the engine. */
export class EvaluatedWorkbook {
  private constructor(
    private readonly hf: HyperFormula,
    /** The workbook as it was read, as .xlsx bytes: what {@link copyBytes} starts from. */
    private readonly sourceBytes: () => Promise<Uint8Array>,
    private readonly sheetNames: readonly string[],
  ) {}

  /**
   * Reads an .xlsx file and evaluates it. Cost: reading plus one evaluation of every formula
   * (array results re-sized in a few more passes over the formulas that spill).
   * @throws WorkbookReadError when the file is missing, unreadable, encrypted, an old .xls, would
   * unpack to more than 1 GiB (package-check.ts), or is not an .xlsx workbook.
   */
  static async fromFile(path: string): Promise<EvaluatedWorkbook> {
    const start = performance.now();
    let data: Buffer;
    try {
      if (statSync(path).isDirectory()) throw new WorkbookReadError(`Cannot read "${path}": it is a folder.`);
      data = readFileSync(path);
    } catch (e) {
      if (e instanceof WorkbookReadError) throw e;
      const code = (e as { code?: string }).code;
      const why = code === 'ENOENT' ? 'no such file' : code === 'EACCES' ? 'permission denied' : `the file cannot be opened (${code ?? String(e)})`;
      throw new WorkbookReadError(`Cannot read "${path}": ${why}.`);
    }
    const problem = packageProblem(data);
    if (problem !== undefined) throw new WorkbookReadError(`Cannot read "${path}": ${problem.reason}.`);
    // Only the cells are kept: the exceljs objects (about 500 bytes a cell) can be collected
    // before the engine is built, and a copy is written from the file's own bytes.
    const cells = await cellsOfFile(path, data);
    const book = EvaluatedWorkbook.build(cells, () => Promise.resolve(data), performance.now() - start);
    book.sourcePath = path;
    return book;
  }

  /**
   * Evaluates an exceljs workbook held in memory (it is not modified). Cell rules: numbers and
   * logicals as they are; text stays text (even "12" or "=x"); dates become Excel serial day
   * numbers (1900 system); rich text becomes its plain text; error cells keep their code;
   * formulas are read in either form; cached values inside an array formula's range are dropped.
   * Defined names over one range become named expressions.
   * Cost: O(cells) to load plus the evaluation; an array result whose size is not yet known costs
   * one more evaluation of that formula.
   * @example EvaluatedWorkbook.fromExcel(wb).value('Data!D2') // → 1 (the first fitted value)
   */
  static fromExcel(wb: ExcelJS.Workbook): EvaluatedWorkbook {
    const start = performance.now();
    const cells = cellsOf(wb);
    return EvaluatedWorkbook.build(cells, async () => new Uint8Array((await wb.xlsx.writeBuffer()) as ArrayBuffer), performance.now() - start);
  }

  /**
   * Builds the engine from the cells of a workbook: results sized ahead (presize.ts), one
   * `buildFromSheets`, then the re-sizing passes. `cells.sheets` is emptied once the engine holds
   * its own copy. `readMs` is how long reading the cells took (kept in {@link timings}).
   * O(cells) plus the evaluation.
   */
  private static build(cells: WorkbookCells, sourceBytes: () => Promise<Uint8Array>, readMs: number): EvaluatedWorkbook {
    const start = performance.now();
    const { sheets, names, formulas, defined } = cells;
    // The engine numbers sheets in the order of the object's keys, which is workbook order unless
    // a name looks like an array index ("2024"): only then are results sized inside the engine.
    const ordered = names.every((n) => !/^(0|[1-9][0-9]*)$/.test(n));
    stageForNextEngine(ordered ? presize(names.map((n) => sheets[n]!), names, formulas) : undefined);
    let hf: HyperFormula;
    try {
      hf = HyperFormula.buildFromSheets(sheets, HF_CONFIG, defined);
    } finally {
      stageForNextEngine(undefined);
    }
    // The engine holds its own copy of the cells: let the grid go before the re-sizing passes.
    for (const n of names) delete sheets[n];
    const book = new EvaluatedWorkbook(hf, sourceBytes, names);
    for (const a of formulas) book.noteFormulaCell({ sheet: hf.getSheetId(names[a.sheet]!)!, row: a.row, col: a.col });
    book.settle();
    // Sizes worked out before the build are for the formulas read from the file only.
    sizingStateOf(hf).presized.clear();
    book.phaseTimes = { readMs, evaluateMs: performance.now() - start };
    return book;
  }

  private phaseTimes: WorkbookTimings = { readMs: 0, evaluateMs: 0 };

  /**
   * How long the workbook took to load, in milliseconds of wall time: `readMs` reading its cells
   * (for {@link fromFile} the file, its package check and exceljs's parse; for {@link fromExcel}
   * walking the workbook's cells), `evaluateMs` building the engine and evaluating every formula
   * (results sized and re-sized included). Later {@link set} calls do not change it.
   * @example Object.keys((await EvaluatedWorkbook.fromFile('samples/kiln-strength.xlsx')).timings) // → ['readMs', 'evaluateMs'] (both positive; their values depend on the machine)
   */
  get timings(): WorkbookTimings {
    return { ...this.phaseTimes };
  }

  /** The file the workbook was read from ({@link fromFile}); a copy never replaces it. */
  private sourcePath: string | undefined;

  /** Sheet names in workbook order. */
  get sheets(): readonly string[] {
    return this.sheetNames;
  }

  /** Number of RATCHET calls evaluated so far (each pass counts). */
  get ratchetCalls(): number {
    return sizingStateOf(this.hf).calls;
  }

  private address(ref: string): SimpleCellAddress {
    const p = parseCellRef(ref);
    const sheet = this.hf.getSheetId(p.sheet);
    if (sheet === undefined) throw new Error(`${ref}: there is no sheet named "${p.sheet}" (sheets: ${this.sheetNames.join(', ')})`);
    return { sheet, row: p.row, col: p.col };
  }

  /**
   * Sets input cells (a formula when the text starts with "=") and recalculates everything that
   * depends on them, re-sizing array results. Typed and stored forms are both accepted.
   * @param changes "Sheet!A1" → value.
   * A value typed into the area a result spills into blocks that result (#SPILL!), as in Excel.
   * Cost: the recalculation of the cells that depend on the changes.
   * @throws Error naming a malformed reference or an unknown sheet.
   */
  set(changes: Readonly<Record<string, InputValue>>): void {
    const entries = Object.entries(changes).map(([ref, v]) => {
      const addr = this.address(ref);
      const raw: RawCellContent = typeof v === 'string' ? (v.startsWith('=') ? `=${toTypedForm(v.slice(1))}` : `'${v}`) : v;
      return { addr, raw, ref, v };
    });
    beginRecalculation(this.hf);
    this.hf.batch(() => {
      for (const e of entries) this.hf.setCellContents(e.addr, [[e.raw]]);
    });
    for (const e of entries) {
      this.recordSet(e.ref, e.v);
      if (typeof e.raw === 'string' && e.raw.startsWith('=')) this.noteFormulaCell(e.addr);
    }
    this.settle();
  }

  private readonly setLog: [string, InputValue][] = [];
  private recordSet(ref: string, v: InputValue): void {
    this.setLog.push([ref, v]);
  }

  /** Re-enters formulas whose results changed size until every array result has its size. */
  private settle(): void {
    const sizing = sizingStateOf(this.hf);
    const probed = new Set<string>();
    for (let pass = 0; pass < MAX_PASSES; pass++) {
      const todo = new Set(sizing.dirty);
      sizing.dirty.clear();
      // A result held at #SPILL! is never evaluated, so its size cannot shrink on its own: forget
      // its size once and let one evaluation learn it again.
      for (const k of this.spilledRatchetCells()) {
        if (probed.has(k)) continue;
        probed.add(k);
        for (const key of [...sizing.learned.keys()]) if (key.startsWith(`${k}|`)) sizing.learned.delete(key);
        sizing.presized.delete(k);
        todo.add(k);
      }
      if (todo.size === 0) {
        // Converted ranges are not needed after a recalculation; drop them so their memory is freed.
        beginRecalculation(this.hf);
        return;
      }
      this.keepRangesOf(todo);
      beginRecalculation(this.hf);
      this.hf.batch(() => {
        for (const k of todo) {
          const [sheet, row, col] = k.split(':').map(Number) as [number, number, number];
          const addr = { sheet, row, col };
          const f = this.hf.getCellFormula(addr);
          if (f !== undefined) this.hf.setCellContents(addr, [[f]]);
        }
      });
    }
  }

  /** Ranges (by "sheet:r0:c0:r1:c1") that a keeper formula already reads. */
  private readonly keptRanges = new Set<string>();
  private keeperSheet: number | undefined;
  private keeperRows = 0;

  /**
   * Gives every range that the formulas about to be re-entered read a second reader: one keeper
   * formula `=ROWS(range)` per range on an engine-only sheet that is not part of the workbook.
   * Re-entering a formula replaces its vertex; when it was a range's only reader, HyperFormula
   * removes the range vertex and then walks all its cells in a loop that grows quadratically
   * with the range (the cause of a runner that grew as n^1.7), only to build the same range again.
   * With a keeper the range stays, and re-entering costs O(1) for the graph. A keeper costs one
   * graph vertex and one edge; ROWS never reads the cells. O(formulas re-entered).
   */
  private keepRangesOf(cells: ReadonlySet<string>): void {
    const add: string[] = [];
    for (const k of cells) {
      const [sheet, row, col] = k.split(':').map(Number) as [number, number, number];
      for (const p of this.hf.getCellPrecedents({ sheet, row, col })) {
        if (!('start' in p) || p.start.sheet < 0) continue;
        const key = `${p.start.sheet}:${p.start.row}:${p.start.col}:${p.end.row}:${p.end.col}`;
        if (this.keptRanges.has(key)) continue;
        this.keptRanges.add(key);
        const text = this.hf.simpleCellRangeToString(p, { includeSheetName: true });
        if (text !== undefined) add.push(`=IF(FALSE,COUNT(${text}))`);
      }
    }
    if (add.length === 0) return;
    if (this.keeperSheet === undefined) {
      let name = KEEPER_SHEET;
      for (let i = 2; !this.hf.isItPossibleToAddSheet(name); i++) name = `${KEEPER_SHEET}${i}`;
      this.hf.addSheet(name);
      this.keeperSheet = this.hf.getSheetId(name)!;
    }
    const sheet = this.keeperSheet;
    const top = this.keeperRows;
    this.keeperRows += add.length;
    this.hf.batch(() => add.forEach((f, i) => this.hf.setCellContents({ sheet, row: top + i, col: 0 }, [[f]])));
  }

  private *spilledRatchetCells(): Generator<string> {
    for (const { addr, formula } of this.formulaCells()) {
      if (!callsRatchet(formula)) continue;
      const v = this.hf.getCellValue(addr);
      if (v instanceof DetailedCellError && v.type === 'SPILL') yield `${addr.sheet}:${addr.row}:${addr.col}`;
    }
  }

  /**
   * Cells that hold or held a formula (read from the file or set later), sheet by sheet, row by
   * row: the formulas are found without visiting every cell of the used ranges (which cost
   * O(cells) per re-sizing pass).
   */
  private formulaIndex: SimpleCellAddress[] = [];
  private formulaIndexSorted = true;
  private readonly formulaIndexKeys = new Set<string>();

  private noteFormulaCell(addr: SimpleCellAddress): void {
    const k = `${addr.sheet}:${addr.row}:${addr.col}`;
    if (this.formulaIndexKeys.has(k)) return;
    this.formulaIndexKeys.add(k);
    this.formulaIndex.push(addr);
    this.formulaIndexSorted = false;
  }

  private *formulaCells(): Generator<{ addr: SimpleCellAddress; formula: string }> {
    if (!this.formulaIndexSorted) {
      this.formulaIndex.sort((a, b) => a.sheet - b.sheet || a.row - b.row || a.col - b.col);
      this.formulaIndexSorted = true;
    }
    for (const addr of this.formulaIndex) {
      const f = this.hf.getCellFormula(addr);
      if (f !== undefined) yield { addr, formula: f };
    }
  }

  /**
   * Formula cells the engine cannot calculate, as "Sheet!A1": their formula calls a function the
   * engine does not know (RATCHET functions are always known), reads such a cell, or cannot be
   * parsed. They show `#NAME?` (or `#ERROR!`) here; {@link writeCopy} keeps the value stored in
   * the file for them. O(cells of the used ranges).
   * @example book.uncomputable() // → ['Data!F2'] for a cell holding =SOMEADDINFN(A2)
   */
  uncomputable(): string[] {
    const out: string[] = [];
    for (const { addr } of this.formulaCells()) {
      const v = this.hf.getCellValue(addr);
      if (!(v instanceof DetailedCellError)) continue;
      const m = v.message ?? '';
      if ((v.type === 'NAME' && /^Function name .* not recognized\.$/.test(m)) || (v.type === 'ERROR' && m === 'Parsing error.')) {
        out.push(qualifiedName(this.sheetNames[addr.sheet]!, addr.row, addr.col));
      }
    }
    return out;
  }

  /** Rows × columns an evaluated formula spills into (1 × 1 for a scalar). */
  private spillSize(addr: SimpleCellAddress): { rows: number; cols: number } {
    const v = this.hf.dependencyGraph.getCell(addr) as unknown as { width?: unknown; height?: unknown } | undefined;
    if (v && typeof v.width === 'number' && typeof v.height === 'number' && !(this.hf.getCellValue(addr) instanceof DetailedCellError)) {
      return { rows: v.height, cols: v.width };
    }
    return { rows: 1, cols: 1 };
  }

  /** The value of one cell as JSON ("Sheet!A1"). */
  value(ref: string): JsonCell {
    return jsonOf(this.hf.getCellValue(this.address(ref)));
  }

  /** The error message of one cell, if it holds an error with a message. */
  message(ref: string): string | undefined {
    const v = this.hf.getCellValue(this.address(ref));
    return v instanceof DetailedCellError && v.message ? v.message : undefined;
  }

  /**
   * A block of values: `count` rows × `cols` columns from "Sheet!A1".
   * Convenience for tests and the demo.
   */
  block(ref: string, rows: number, cols: number): JsonCell[][] {
    const a = this.address(ref);
    const out: JsonCell[][] = [];
    for (let r = 0; r < rows; r++) {
      const row: JsonCell[] = [];
      for (let c = 0; c < cols; c++) row.push(jsonOf(this.hf.getCellValue({ sheet: a.sheet, row: a.row + r, col: a.col + c })));
      out.push(row);
    }
    return out;
  }

  /** The spilled result anchored at "Sheet!A1" (one row of one cell for a scalar). */
  result(ref: string): JsonCell[][] {
    const a = this.address(ref);
    const s = this.spillSize(a);
    return this.block(ref, s.rows, s.cols);
  }

  /** Every formula cell with its result, sheet by sheet, row by row. O(cells of the used ranges). */
  results(): FormulaResult[] {
    const out: FormulaResult[] = [];
    for (const { addr, formula } of this.formulaCells()) {
      const sheet = this.sheetNames[addr.sheet]!;
      const s = this.spillSize(addr);
      const values: JsonCell[][] = [];
      const messages: Record<string, string> = {};
      for (let r = 0; r < s.rows; r++) {
        const row: JsonCell[] = [];
        for (let c = 0; c < s.cols; c++) {
          const at = { sheet: addr.sheet, row: addr.row + r, col: addr.col + c };
          const v = this.hf.getCellValue(at);
          if (v instanceof DetailedCellError && v.message) messages[qualifiedName(sheet, at.row, at.col)] = v.message;
          row.push(jsonOf(v));
        }
        values.push(row);
      }
      out.push({ sheet, cell: cellName(addr.row, addr.col), formula, values, messages, ratchet: callsRatchet(formula) });
    }
    return out;
  }

  /**
   * The runner's JSON: every formula cell and every cell its result spills into, keyed
   * "Sheet!A1" (sheet name unquoted), then "messages" with the message of each error cell.
   * O(cells of the used ranges).
   * @example book.toJson() // → { 'Data!D2': 1, 'Data!D3': 2.5, …, messages: { 'Data!N8': 'target_ys: …' } }
   */
  toJson(): RunnerJson {
    const json: RunnerJson = { messages: {} };
    for (const res of this.results()) {
      const a = this.address(`${quoteSheet(res.sheet)}!${res.cell}`);
      res.values.forEach((row, r) => row.forEach((v, c) => (json[qualifiedName(res.sheet, a.row + r, a.col + c)] = v)));
      Object.assign(json.messages, res.messages);
    }
    // "messages" last, so the document reads values first.
    const { messages, ...values } = json;
    return { ...values, messages } as RunnerJson;
  }

  /**
   * Writes a copy of the workbook with the current inputs, formulas kept in the stored form
   * (`_xldudf_RATCHET_…`), computed values cached, and spilled results written as dynamic-array
   * formulas over their current range (dynamic-arrays.ts). The source file is not touched: the
   * copy is refused when it would be one of `inputs` (same path, a link to it, a hard link) or
   * when it exists and `force` is false, and it is written to a temporary file in the same folder
   * that then takes its name (safe-write.ts).
   * @param path the new file. @param options.inputs files that must not be touched besides the
   * file the workbook was read from (default: none);
   * options.force replaces an existing file that is not an input (default false).
   * @throws OutputRefusedError when the copy would replace an input or an existing file.
   */
  async writeCopy(path: string, options: { inputs?: readonly string[]; force?: boolean } = {}): Promise<void> {
    const inputs = [...(this.sourcePath === undefined ? [] : [this.sourcePath]), ...(options.inputs ?? [])];
    checkOutput(path, inputs, options.force ?? false);
    writeOutputSafely(path, await this.copyBytes(), inputs, options.force ?? false);
  }

  /** The bytes of the copy {@link writeCopy} writes. O(cells). */
  async copyBytes(): Promise<Uint8Array> {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load((await this.sourceBytes()) as unknown as ArrayBuffer);
    for (const [ref, v] of this.setLog) {
      const p = parseCellRef(ref);
      const ws = wb.getWorksheet(p.sheet)!;
      const cell = ws.getCell(p.row + 1, p.col + 1);
      if (typeof v === 'string' && v.startsWith('=')) cell.value = { formula: toStoredForm(v.slice(1)) } as ExcelJS.CellFormulaValue;
      else cell.value = v;
    }
    const cellOut = (v: JsonCell): ExcelJS.CellValue => {
      if (typeof v === 'string' && /^#[A-Z/0-9!?]+[!?A]$/.test(v)) return { error: v } as ExcelJS.CellErrorValue;
      return v;
    };
    // Cells the engine cannot calculate keep what the file stored (formula, cached value, array range).
    const keep = new Set(this.uncomputable());
    const kept = (sheet: string, row: number, col: number) => keep.has(qualifiedName(sheet, row, col));
    for (const ws of wb.worksheets) {
      // Old array ranges: their cached cells are cleared before fresh results are written.
      ws.eachRow({ includeEmpty: false }, (row) =>
        row.eachCell({ includeEmpty: false }, (cell) => {
          const v = cell.value as FormulaCellValue | null;
          if (v && typeof v === 'object' && v.shareType === 'array' && typeof v.ref === 'string') {
            const g = parseRange(v.ref);
            if (kept(ws.name, g.top, g.left)) return;
            for (let r = g.top; r <= g.bottom; r++) for (let c = g.left; c <= g.right; c++) if (r !== g.top || c !== g.left) ws.getCell(r + 1, c + 1).value = null;
          }
        }),
      );
    }
    for (const res of this.results()) {
      const ws = wb.getWorksheet(res.sheet)!;
      const a = parseCellRef(`${quoteSheet(res.sheet)}!${res.cell}`);
      if (kept(res.sheet, a.row, a.col)) continue;
      const stored = toStoredForm(res.formula.replace(/^=/, ''));
      const first = res.values[0]![0]!;
      const result = first === null ? undefined : cellOut(first);
      const spills = res.values.length > 1 || res.values[0]!.length > 1;
      const top = ws.getCell(a.row + 1, a.col + 1);
      top.value = (
        spills
          ? { formula: stored, result, shareType: 'array', ref: `${res.cell}:${cellName(a.row + res.values.length - 1, a.col + res.values[0]!.length - 1)}` }
          : { formula: stored, result }
      ) as ExcelJS.CellFormulaValue;
      res.values.forEach((row, r) =>
        row.forEach((v, c) => {
          if (r === 0 && c === 0) return;
          ws.getCell(a.row + r + 1, a.col + c + 1).value = v === null ? null : cellOut(v);
        }),
      );
    }
    const { bytes } = await markDynamicArrays(new Uint8Array((await wb.xlsx.writeBuffer()) as ArrayBuffer));
    return bytes;
  }
}

/** A sheet name quoted for a reference when it needs quotes. */
export function quoteSheet(name: string): string {
  return /^[A-Za-z_][A-Za-z0-9_.]*$/.test(name) ? name : `'${name.replace(/'/g, "''")}'`;
}
