/**
 * Office-mode insert actions, against an office-addin-mock workbook: a live formula is written
 * into the picked cell only when that cell and the whole area its result spills into are empty;
 * otherwise the user is asked, and a "no" writes nothing. Formula text and spill sizes come from
 * the pane's own builders and the worksheet functions' results.
 */
import { describe, expect, it } from 'vitest';
import { OfficeMockObject } from 'office-addin-mock';
import { formulaReads, insertFormula, type ExcelLike } from '../../taskpane/insert.js';
import { formulaFor, spillSize, type CvSettings, type FitSettings } from '../../taskpane/formulas.js';
import { computeFit, candidateCount } from '../../taskpane/analysis.js';
import { absoluteRef, parseAddress, plainRef, tableColumnRef } from '../../taskpane/refs.js';

interface Cell {
  value?: string | number | boolean;
  formula?: string;
}

/** A one-sheet workbook mock: cells by A1 name; records ranges read, cleared and written. */
function workbook(cells: Record<string, Cell>, sheetName = 'Trials') {
  const log = { reads: [] as string[], cleared: [] as string[], written: [] as { address: string; formulas: unknown }[] };
  const ranges: { address: string; mock: { formulas: unknown } }[] = [];
  let n = 0;
  const sheet = {
    name: sheetName,
    getRange(this: OfficeMockObject, address: string) {
      const a = parseAddress(address);
      const values: (string | number | boolean)[][] = [];
      const formulas: (string | number | boolean)[][] = [];
      for (let r = a.r1; r <= a.r2; r++) {
        const vr: (string | number | boolean)[] = [];
        const fr: (string | number | boolean)[] = [];
        for (let c = a.c1; c <= a.c2; c++) {
          const cell = cells[plainRef({ sheet: undefined, r1: r, r2: r, c1: c, c2: c })] ?? {};
          vr.push(cell.value ?? '');
          fr.push(cell.formula ?? cell.value ?? '');
        }
        values.push(vr);
        formulas.push(fr);
      }
      const key = `range${n++}`;
      // Registered as a child so that context.sync() loads it like a real proxy object.
      const self = this as unknown as { addMock(k: string): void } & Record<string, { populate(o: object): void }>;
      self.addMock(key);
      const mock = self[key]!;
      mock.populate({
        address: `${sheetName}!${plainRef(a)}`,
        values,
        formulas,
        clear(applyTo: string) {
          log.cleared.push(`${plainRef(a)}:${applyTo}`);
        },
      });
      log.reads.push(plainRef(a));
      ranges.push({ address: plainRef(a), mock: mock as unknown as { formulas: unknown } });
      return mock;
    },
  };
  const excel = new OfficeMockObject({
    context: { workbook: { worksheets: { sheet, getActiveWorksheet() { return (this as unknown as { sheet: unknown }).sheet; }, getItem() { return (this as unknown as { sheet: unknown }).sheet; } } } },
    run: async function (this: { context: unknown }, batch: (c: unknown) => Promise<unknown>) {
      return batch(this.context);
    },
  });
  const written = (): { address: string; formulas: unknown }[] =>
    ranges.filter((r) => Array.isArray(r.mock.formulas) && typeof (r.mock.formulas as unknown[][])[0]?.[0] === 'string' && String((r.mock.formulas as unknown[][])[0]![0]).startsWith('=RATCHET.')).map((r) => ({ address: r.address, formulas: r.mock.formulas }));
  return { excel: excel as unknown as ExcelLike, log, written };
}

const never = async (): Promise<boolean> => {
  throw new Error('confirm must not be asked');
};

// Invented data: x in A2:A9, y in B2:B9 of sheet "Trials".
const xs = [1, 2, 3, 4, 5, 6, 7, 8];
const ys = [1, 3, 2, 4, 6, 5, 7, 8];
const dataCells: Record<string, Cell> = {};
xs.forEach((x, i) => {
  dataCells[`A${i + 2}`] = { value: x };
  dataCells[`B${i + 2}`] = { value: ys[i]! };
});
const xArea = { ...parseAddress('A2:A9'), sheet: 'Trials' };
const yArea = { ...parseAddress('B2:B9'), sheet: 'Trials' };
const refs = { x: absoluteRef(xArea, false), y: absoluteRef(yArea, false) };
const fit: FitSettings = { knots: 3, direction: 1 };
const cv: CvSettings = { folds: 4, repeats: 1, seed: 1, rule: 1 };
const view = computeFit({ x: xs, y: ys }, fit);

describe('insert actions (office-addin-mock workbook)', () => {
  it('write the KNOTS formula, with absolute addresses of the chosen ranges, into an empty target and ask nothing', async () => {
    const wb = workbook(dataCells);
    const formula = formulaFor('KNOTS', refs, fit, cv);
    expect(formula).toBe('=RATCHET.KNOTS($B$2:$B$9,$A$2:$A$9,3,1)');
    const size = spillSize('KNOTS', { knotRows: view.knots.length, candidates: 0, newXs: { rows: 8, cols: 1 } });
    expect(size).toEqual({ rows: 3, cols: 2 }); // three knots → 3 × 2 table (RATCHET.KNOTS)
    const out = await insertFormula(wb.excel, { formula, target: 'D2', rows: size.rows, cols: size.cols, inputs: [xArea, yArea] }, never);
    expect(out.written).toBe(true);
    expect(wb.log.reads[0]).toBe('D2:E4'); // the whole spill area was checked
    expect(wb.written()).toEqual([{ address: 'D2', formulas: [['=RATCHET.KNOTS($B$2:$B$9,$A$2:$A$9,3,1)']] }]);
    expect(wb.log.cleared).toEqual([]);
  });

  it('refuse to write over a value inside the spill area when the user says no', async () => {
    const wb = workbook({ ...dataCells, E3: { value: 42 } });
    let asked = '';
    const out = await insertFormula(
      wb.excel,
      { formula: formulaFor('KNOTS', refs, fit, cv), target: 'D2', rows: 3, cols: 2, inputs: [xArea, yArea] },
      async (q) => {
        asked = q;
        return false;
      },
    );
    expect(out.written).toBe(false);
    expect(out.occupied).toEqual(['E3']);
    expect(asked).toBe('The result needs 3 × 2 cells (Trials!D2:E4), but 1 is not empty: E3. Overwrite it?');
    expect(wb.written()).toEqual([]);
    expect(wb.log.cleared).toEqual([]);
  });

  it('treat a formula cell showing an empty text as occupied, too', async () => {
    const wb = workbook({ ...dataCells, D9: { value: '', formula: '=IF(A1>0,"","x")' } });
    let asked = false;
    const out = await insertFormula(wb.excel, { formula: formulaFor('STATS', refs, fit, cv), target: 'D2', rows: 9, cols: 2, inputs: [xArea, yArea] }, async () => {
      asked = true;
      return false;
    });
    expect(asked).toBe(true);
    expect(out.occupied).toEqual(['D9']);
    expect(wb.written()).toEqual([]);
  });

  it('clear the area and write the formula only after the user confirms', async () => {
    const wb = workbook({ ...dataCells, D2: { value: 'old' }, E11: { value: 1 } });
    const formula = formulaFor('STATS', refs, fit, cv);
    const out = await insertFormula(wb.excel, { formula, target: 'Trials!D2', rows: 9, cols: 2, inputs: [xArea, yArea] }, async () => true);
    expect(out.written).toBe(true);
    expect(out.occupied).toEqual(['D2']); // E11 is below the 9-row STATS table: not in the way
    expect(wb.log.reads[0]).toBe('D2:E10');
    expect(wb.log.cleared).toEqual(['D2:E10:Contents']);
    expect(wb.written()).toEqual([{ address: 'D2', formulas: [['=RATCHET.STATS($B$2:$B$9,$A$2:$A$9,3,1)']] }]);
  });

  it('size the CV area as candidates + 1 rows × 6 columns and write the CV formula', async () => {
    const wb = workbook(dataCells);
    const rows = candidateCount(view, cv) + 1; // default candidates 2 … min(20, 8 distinct x) = 7, plus the header
    expect(rows).toBe(8);
    const formula = formulaFor('CV', refs, fit, cv);
    expect(formula).toBe('=RATCHET.CV($B$2:$B$9,$A$2:$A$9,,4,1,1,1)');
    const size = spillSize('CV', { knotRows: 0, candidates: rows - 1, newXs: { rows: 1, cols: 1 } });
    const out = await insertFormula(wb.excel, { formula, target: 'H1', rows: size.rows, cols: size.cols, inputs: [xArea, yArea] }, never);
    expect(out.written).toBe(true);
    expect(wb.log.reads[0]).toBe('H1:M8');
    expect(wb.written()).toEqual([{ address: 'H1', formulas: [[formula]] }]);
  });

  it('refuse a target whose result would overlap the data it reads (a circular reference), writing nothing', async () => {
    const wb = workbook(dataCells);
    await expect(
      insertFormula(wb.excel, { formula: formulaFor('PREDICT', refs, fit, cv), target: 'B5', rows: 8, cols: 1, inputs: [xArea, yArea] }, never),
    ).rejects.toThrow('The result (Trials!B5:B12) would overlap the data it reads; pick a cell outside the data ranges.');
    expect(wb.written()).toEqual([]);
  });

  it('write table-column references when the data are an Excel table', async () => {
    const wb = workbook(dataCells);
    const tableRefs = { x: tableColumnRef('Trials', 'dose'), y: tableColumnRef('Trials', 'response [mV]') };
    const formula = formulaFor('PREDICT', tableRefs, { knots: 0, direction: -1 }, cv, '$G$2:$G$4');
    expect(formula).toBe("=RATCHET.PREDICT($G$2:$G$4,Trials[[response '[mV']]],Trials[dose],0,-1)");
    const out = await insertFormula(wb.excel, { formula, target: 'H2', rows: 3, cols: 1, inputs: [] }, never);
    expect(out.written).toBe(true);
    expect(wb.written()).toEqual([{ address: 'H2', formulas: [[formula]] }]);
  });

  it('stop before reading the sheet when the result would run off the worksheet', async () => {
    const wb = workbook(dataCells);
    await expect(insertFormula(wb.excel, { formula: '=RATCHET.STATS(B2:B9,A2:A9)', target: 'A1048570', rows: 9, cols: 2, inputs: [] }, never)).rejects.toThrow(
      'the result would not fit on the worksheet below and right of that cell',
    );
    expect(wb.log.reads).toEqual([]);
  });

  it("refuse a PREDICT target inside its own new_xs range (D3 with new_xs D2:D4), found in the formula text, writing nothing", async () => {
    const wb = workbook({ ...dataCells, D2: { value: 1.5 }, D3: { value: 2.5 }, D4: { value: 3.5 } });
    const formula = formulaFor('PREDICT', refs, fit, cv, '$D$2:$D$4');
    expect(formula).toBe('=RATCHET.PREDICT($D$2:$D$4,$B$2:$B$9,$A$2:$A$9,3,1)');
    // the caller lists only the data ranges: the guard must also see new_xs in the formula itself
    let asked = false;
    await expect(
      insertFormula(wb.excel, { formula, target: 'D3', rows: 3, cols: 1, inputs: [xArea, yArea] }, async () => {
        asked = true;
        return true;
      }),
    ).rejects.toThrow('The result (Trials!D3:D5) would overlap the data it reads; pick a cell outside the data ranges.');
    expect(asked).toBe(false);
    expect(wb.written()).toEqual([]);
    expect(wb.log.cleared).toEqual([]);
  });

  it('ask again, listing the new cells, when the area changed while the question was open; a no then writes and clears nothing', async () => {
    const cells: Record<string, Cell> = { ...dataCells, D2: { value: 'old' } };
    const wb = workbook(cells);
    const questions: string[] = [];
    const out = await insertFormula(wb.excel, { formula: formulaFor('KNOTS', refs, fit, cv), target: 'D2', rows: 3, cols: 2, inputs: [xArea, yArea] }, async (q) => {
      questions.push(q);
      if (questions.length === 1) {
        cells.E4 = { value: 'typed meanwhile' }; // edited while the question is open
        return true;
      }
      return false;
    });
    expect(questions).toEqual([
      'The result needs 3 × 2 cells (Trials!D2:E4), but 1 is not empty: D2. Overwrite it?',
      'The cells changed while the question was open. The result needs 3 × 2 cells (Trials!D2:E4), but 2 are not empty: D2, E4. Overwrite them?',
    ]);
    expect(out.written).toBe(false);
    expect(out.occupied).toEqual(['D2', 'E4']);
    expect(wb.log.cleared).toEqual([]);
    expect(wb.written()).toEqual([]);
  });

  it('ask again when a cell listed in the question was changed meanwhile, and clear and write after the second yes', async () => {
    const cells: Record<string, Cell> = { ...dataCells, D2: { value: 'old' } };
    const wb = workbook(cells);
    let n = 0;
    const formula = formulaFor('KNOTS', refs, fit, cv);
    const out = await insertFormula(wb.excel, { formula, target: 'D2', rows: 3, cols: 2, inputs: [xArea, yArea] }, async () => {
      n++;
      if (n === 1) cells.D2 = { value: 'newer' }; // same cell, other contents
      return true;
    });
    expect(n).toBe(2);
    expect(out.written).toBe(true);
    expect(out.occupied).toEqual(['D2']);
    expect(wb.log.cleared).toEqual(['D2:E4:Contents']);
    expect(wb.written()).toEqual([{ address: 'D2', formulas: [[formula]] }]);
  });
});

describe('formulaReads (the ranges an inserted formula reads, from its text)', () => {
  it('finds absolute, relative, sheet-qualified, quoted-sheet and whole-column references', () => {
    const reads = formulaReads("=RATCHET.PREDICT($D$2:$D$4,Data!B2:B9,'My data'!$A:$A,3,1)");
    expect(reads).toEqual([
      { sheet: undefined, r1: 2, c1: 4, r2: 4, c2: 4 },
      { sheet: 'Data', r1: 2, c1: 2, r2: 9, c2: 2 },
      { sheet: 'My data', r1: 1, c1: 1, r2: 1048576, c2: 1 },
    ]);
  });

  it('skips function names that look like cells, text in quotes, plain numbers and table references', () => {
    expect(formulaReads('=LOG10(2)+LEN("A1:B2")+3+Trials[dose]+RATCHET.STATS(Trials[[response \'[mV\']]],Trials[dose])')).toEqual([]);
  });
});
