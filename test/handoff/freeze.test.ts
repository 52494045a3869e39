/**
 * The frozen copy (`npm run sheet -- <book> --freeze <copy>`; plan in src/adapter/freeze-plan.ts,
 * applied by src/runner/freeze.ts): for every sample workbook, the copy holds no formula that
 * calls the add-in — checked in the sheet XML of the package itself, not only through exceljs —
 * and, evaluated again by the runner without the add-in's formulas, shows the same value in every
 * cell the original's formulas fill; the note sheet lists each replaced formula once.
 * The sample values themselves are checked against scikit-learn, SciPy and NumPy in
 * test/runner/sklearn-samples.test.ts; here the reference is the evaluated original.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import { describe, expect, it } from 'vitest';
import '../../src/runner/ratchet.js';
import { callsAddIn, freezePlan, NOTE_HEADER } from '../../src/adapter/freeze-plan.js';
import { parseSheetArgs, runSheet } from '../../src/runner/cli.js';
import { writeFrozenCopy } from '../../src/runner/freeze.js';
import { EvaluatedWorkbook } from '../../src/runner/workbook.js';
import { evaluate } from '../runner/helpers.js';

const SAMPLES = join(import.meta.dirname, '..', '..', 'samples');
const tmp = mkdtempSync(join(tmpdir(), 'ratchet-freeze-test-'));

/** Every formula text stored in the worksheets of an .xlsx package (the <f> elements). */
async function storedFormulas(path: string): Promise<string[]> {
  const zip = await JSZip.loadAsync(readFileSync(path));
  const out: string[] = [];
  for (const name of Object.keys(zip.files).filter((n) => /^xl\/worksheets\/[^/]+\.xml$/.test(n))) {
    const xml = await zip.file(name)!.async('string');
    for (const m of xml.matchAll(/<f(?:\s[^>]*)?>([^<]*)<\/f>/g)) out.push(m[1]!);
  }
  return out;
}

function capture() {
  const err: string[] = [];
  return { io: { out: () => undefined, err: (s: string) => err.push(s) }, err };
}

describe('--freeze on the sample workbooks', () => {
  it.each(['kiln-strength', 'adhesive-tack', 'lab-calibration', 'knot-count-study', 'coating-cure'])(
    '%s: no RATCHET formula is left, every value is the same, the note lists each replaced formula',
    async (name) => {
      const source = join(SAMPLES, `${name}.xlsx`);
      const frozen = join(tmp, `${name}-frozen.xlsx`);
      const { io, err } = capture();
      expect(await runSheet([source, '--freeze', frozen], io)).toBe(0);
      expect(err.join('')).toContain(`wrote ${frozen}`);

      const formulas = await storedFormulas(frozen);
      expect(formulas.filter((f) => /RATCHET/i.test(f))).toEqual([]);

      const original = await EvaluatedWorkbook.fromFile(source);
      const ratchet = original.results().filter((r) => r.ratchet);
      expect(ratchet.length).toBeGreaterThan(0);
      const copy = await EvaluatedWorkbook.fromFile(frozen);
      expect(copy.results().filter((r) => r.ratchet)).toEqual([]);
      const want = original.toJson();
      const differ = Object.entries(want)
        .filter(([k]) => k !== 'messages')
        .filter(([k, v]) => {
          const got = copy.value(k.replace(/^(.*)!/, (_m, s: string) => `'${s.replace(/'/g, "''")}'!`));
          return !(got === v || (v === '' && got === null));
        });
      expect(Object.keys(want).length).toBeGreaterThan(ratchet.length);
      expect(differ.slice(0, 5)).toEqual([]);

      const wb = new ExcelJS.Workbook();
      await wb.xlsx.readFile(frozen);
      const note = wb.getWorksheet('Frozen values')!;
      expect(note).toBeDefined();
      expect(note.getRow(3).values).toEqual([undefined, ...NOTE_HEADER]);
      const listed: string[] = [];
      note.eachRow((row, r) => {
        if (r > 3) listed.push(`${String(row.getCell(1).value)}!${String(row.getCell(2).value).split(':')[0]} ${String(row.getCell(3).value)}`);
      });
      expect(listed).toEqual(ratchet.map((r) => `${r.sheet}!${r.cell} ${r.formula}`));
    },
  );

  it('a formula that reads a RATCHET result stays a formula and gives the same value; an error result is frozen as that error', async () => {
    const book = evaluate({
      Data: {
        A1: 1, A2: 2, A3: 3, B1: 1, B2: 3, B3: 2,
        D1: { f: 'RATCHET.KNOTS(B1:B3,A1:A3)' },
        G1: { f: 'SUM(E1:E3)' },
        G2: { f: 'RATCHET.INVERT(99,D1:E3)' },
        G3: { f: 'ROUND(_xldudf_RATCHET_EVAL(2.5,D1:E3),3)' },
      },
    });
    const path = join(tmp, 'dependent.xlsx');
    const summary = await writeFrozenCopy(book, path, new Date('2026-12-01T21:45:00Z'));
    expect(summary).toEqual({ replaced: 3, noteSheet: 'Frozen values', unresolved: [] });
    const copy = await EvaluatedWorkbook.fromFile(path);
    const formulas = copy.results().map((r) => `${r.cell} ${r.formula}`);
    expect(formulas).toEqual(['G1 =SUM(E1:E3)']);
    // KNOTS of 1 3 2 at x 1 2 3: pooled 2 2 → table (1, 1), (2, 2.5), (3, 2.5); SUM 6 (hand)
    expect(copy.block('Data!D1', 3, 2)).toEqual([[1, 1], [2, 2.5], [3, 2.5]]);
    expect(copy.value('Data!G1')).toBe(6);
    expect(copy.value('Data!G2')).toBe('#N/A');
    expect(copy.value('Data!G3')).toBe(2.5);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(path);
    const rows: unknown[] = [];
    wb.getWorksheet('Frozen values')!.eachRow((row) => rows.push((row.values as unknown[]).slice(1)));
    expect(rows.slice(1)).toEqual([
      NOTE_HEADER,
      ['Data', 'D1:E3', '=RATCHET.KNOTS(B1:B3,A1:A3)', '2026-12-01 21:45 UTC'],
      ['Data', 'G2', '=RATCHET.INVERT(99,D1:E3)', '2026-12-01 21:45 UTC'],
      ['Data', 'G3', '=ROUND(RATCHET.EVAL(2.5,D1:E3),3)', '2026-12-01 21:45 UTC'],
    ]);
  });

  it('a result blocked by #SPILL! is frozen as that error and reported as unresolved', async () => {
    const book = evaluate({ Data: { A1: 1, A2: 2, A3: 3, B1: 1, B2: 3, B3: 2, D1: { f: 'RATCHET.KNOTS(B1:B3,A1:A3)' }, D2: 'in the way' } });
    const summary = await writeFrozenCopy(book, join(tmp, 'spill.xlsx'));
    expect(summary.unresolved).toEqual(['Data!D1']);
  });
});

describe('freezePlan', () => {
  const date = new Date('2026-12-01T21:45:00Z');
  it('matches its documented example', () => {
    const plan = freezePlan([{ sheet: 'Data', row: 2, col: 4, formula: '=RATCHET.EVAL(3,{1,1;6,5})', values: [[2.6]] }], { date, sheets: ['Data'] });
    expect(plan.writes).toEqual([{ sheet: 'Data', row: 2, col: 4, value: 2.6 }]);
    expect(plan.noteRows.slice(2)).toEqual([[...NOTE_HEADER], ['Data', 'D2', '=RATCHET.EVAL(3,{1,1;6,5})', '2026-12-01 21:45 UTC']]);
    expect(plan).toMatchObject({ noteSheet: 'Frozen values', replaced: 1, unresolved: [] });
  });

  it('leaves formulas without an add-in call alone, also when RATCHET appears only inside a string', () => {
    const plan = freezePlan(
      [
        { sheet: 'S', row: 1, col: 1, formula: '=SUM(A2:A9)', values: [[3]] },
        { sheet: 'S', row: 2, col: 1, formula: '=CONCAT("RATCHET.FIT(",B1)', values: [['x']] },
      ],
      { date, sheets: ['S'] },
    );
    expect(plan.writes).toEqual([]);
    expect(plan.replaced).toBe(0);
    expect(plan.noteRows[0]![0]).toMatch(/^No cell held a formula of the Ratchet add-in/);
  });

  it('picks a note-sheet name the workbook does not use, ignoring case', () => {
    expect(freezePlan([], { date, sheets: ['frozen VALUES', 'Frozen values 2'] }).noteSheet).toBe('Frozen values 3');
  });

  it('writes every cell of a spilled block at its own address', () => {
    const plan = freezePlan([{ sheet: 'S', row: 5, col: 27, formula: 'RATCHET.KNOTS(B1:B3,A1:A3)', values: [[1, 2], [3, { error: '#N/A' }]] }], { date, sheets: ['S'] });
    expect(plan.writes).toEqual([
      { sheet: 'S', row: 5, col: 27, value: 1 },
      { sheet: 'S', row: 5, col: 28, value: 2 },
      { sheet: 'S', row: 6, col: 27, value: 3 },
      { sheet: 'S', row: 6, col: 28, value: { error: '#N/A' } },
    ]);
    expect(plan.noteRows[3]).toEqual(['S', 'AA5:AB6', '=RATCHET.KNOTS(B1:B3,A1:A3)', '2026-12-01 21:45 UTC']);
  });

  it('refuses an empty or ragged result', () => {
    expect(() => freezePlan([{ sheet: 'S', row: 1, col: 1, formula: '=RATCHET.FIT(A1:A2,B1:B2)', values: [[1], []] }], { date, sheets: ['S'] })).toThrow('S!A1: the result to freeze is empty or ragged.');
  });

  it('callsAddIn recognises the typed and the stored form', () => {
    expect(['=RATCHET.FIT(A1:A3,B1:B3)', '_xldudf_RATCHET_FIT(A1:A3,B1:B3)', '=1+ratchet.eval(2,D1:E3)'].map(callsAddIn)).toEqual([true, true, true]);
    expect(['=MYRATCHET.FIT(1)', '=SUM(A1)', '="=RATCHET.FIT("'].map(callsAddIn)).toEqual([false, false, false]);
  });
});

describe('--freeze on the command line', () => {
  it('needs a file name of its own', () => {
    expect(() => parseSheetArgs(['book.xlsx', '--freeze'])).toThrow('--freeze needs a file name');
    expect(() => parseSheetArgs(['book.xlsx', '--freeze', 'book.xlsx'])).toThrow('--freeze must name a new file of its own');
    expect(() => parseSheetArgs(['book.xlsx', '--out', 'a.xlsx', '--freeze', 'a.xlsx'])).toThrow('--freeze must name a new file of its own');
    expect(parseSheetArgs(['book.xlsx', '--freeze', 'f.xlsx']).freeze).toBe('f.xlsx');
  });
});
