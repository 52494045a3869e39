/**
 * End-to-end specification of the pane's real-data input and hand-off actions, in Debian's
 * chromium (headless, playwright-core), against the page built with the project's webpack config:
 * a semicolon CSV with decimal commas, a headerless CSV, an .xlsx date column as x, the "Copy
 * formulas" block pasted into a workbook and evaluated by the headless runner, and in Excel mode
 * (office.js replaced by test/e2e/office-stub.js) "Insert all", "Portable curve" and "Frozen values".
 *
 * Expected values never come from the page: fits are recomputed in Node through the registry (the
 * same implementations the worksheet functions use) or by the headless runner (HyperFormula);
 * Excel serial day numbers are days since 1899-12-30 for dates from 1 March 1900 on (common
 * practice: Excel's 1900 date system). All data are invented.
 *
 * The browser is /usr/bin/chromium or RATCHET_BROWSER (test/e2e/browser.ts).
 */
import { describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import type { Page } from 'playwright-core';
import { RUN_BROWSER_TESTS } from './browser.js';
import { TRIALS, blockPage, invoke, openPreviewPane, openTrialsPane, setValue, snap, usePreviewSite } from './pane.js';
import type { Snapshot } from '../../taskpane/app.js';
import { evaluate, type SetupCell } from '../runner/helpers.js';

async function choose(page: Page, selector: string, value: string): Promise<void> {
  await page.selectOption(selector, value);
}

/** Invented wear data: 30 rows, hours 0…145, wear in µm with a deterministic wobble. */
const hours = Array.from({ length: 30 }, (_v, i) => 5 * i);
const wear = hours.map((h, i) => Number((25 + 0.1 * h + (((i * 7) % 5) - 2) * 0.4).toFixed(1)));
/** The same data as a German-style CSV: semicolons, decimal commas, a title line and a blank line. */
const wearCsv = `Verschleißprüfung Charge 7\r\n\r\nStunden;Verschleiß (µm)\r\n${hours.map((h, i) => `${h};${wear[i]!.toFixed(1).replace('.', ',')}`).join('\r\n')}\r\n`;

const site = usePreviewSite();
const col = (v: readonly number[]): number[][] => v.map((q) => [q]);

describe.skipIf(!RUN_BROWSER_TESTS)('pane: real data in (browser preview)', () => {
  const problems: string[] = [];
  const page = blockPage(() => openPreviewPane(site, { viewport: { width: 900, height: 1400 }, problems }), 90_000);

  it('a semicolon CSV with decimal commas opens with a full chart (every row a point, the curve RATCHET.KNOTS), and says how it was read', async () => {
    await page.setInputFiles('#file', { name: 'wear.csv', mimeType: 'text/csv', buffer: Buffer.from(wearCsv) });
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length === 30);
    await setValue(page, '#knots', '0');
    const s = await snap(page);
    expect(s.fitError).toBeNull();
    expect(s.points).toEqual(hours.map((h, i) => ({ x: h, y: wear[i] })));
    const table = invoke('KNOTS', [col(wear), col(hours), 0, 1]) as number[][];
    expect(s.curve).toEqual(table.map((r) => ({ x: r[0], y: r[1] })));
    // the data land below the title and blank line: header on row 3, data A4:B33
    expect(s.formulas.KNOTS).toBe('=RATCHET.KNOTS(wear!$B$4:$B$33,wear!$A$4:$A$33,0,1)');
    expect(await page.textContent('#csv-format-hint')).toBe('Read with ";" (detected) between fields and "," (detected) as the decimal mark.');
    expect(await page.isVisible('#csv-separator')).toBe(true);
  });

  it('the decimal-mark control overrides the detection: "." leaves "25,3" as text, back to detect gives the full chart again', async () => {
    await choose(page, '#csv-decimal', '.');
    await page.waitForFunction(() => /"\." as the decimal mark/.test(document.getElementById('csv-format-hint')?.textContent ?? ''));
    const labels = await page.$$eval('#col-y option', (o) => o.map((q) => q.textContent));
    expect(labels).toEqual(['Stunden — column A, 30 numbers']);
    // y is now text: the pane lists the left-out cells by address
    await choose(page, '#csv-decimal', '');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length === 30);
    expect(await page.$$eval('#col-y option', (o) => o.map((q) => q.textContent))).toEqual(['Stunden — column A, 30 numbers', 'Verschleiß (µm) — column B, 30 numbers']);
  });

  it('a headerless CSV gets columns A, B, … and the pickers hold only that file’s columns', async () => {
    await page.setInputFiles('#file', { name: 'plain.csv', mimeType: 'text/csv', buffer: Buffer.from('1,2.5\n2,2.9\n3,3.1\n4,4.0\n5,3.8\n') });
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length === 5);
    expect(await page.$$eval('#col-x option', (o) => o.map((q) => q.textContent))).toEqual(['A — column A, 5 numbers', 'B — column B, 5 numbers']);
    const s = await snap(page);
    expect(s.formulas.STATS).toBe('=RATCHET.STATS(plain!$B$1:$B$5,plain!$A$1:$A$5,0,1)');
  });

  it('lists text and logical cells by address, and says to convert a number stored as text with VALUE', async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Wear');
    ws.addRow(['hours', 'wear µm']);
    [[0, 25.3], [10, 27.9], [20, 28.4], [30, '47.6'], [40, 'n/a'], [50, true], [60, 33.0]].forEach((r) => ws.addRow(r));
    const buffer = Buffer.from(await wb.xlsx.writeBuffer());
    await page.setInputFiles('#file', { name: 'wear.xlsx', mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', buffer });
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().leftOut.length === 3);
    expect((await snap(page)).leftOut).toEqual([
      'Wear!B5 holds the text "47.6" — convert it with VALUE to use it',
      'Wear!B6 holds the text "n/a" — its row is left out',
      'Wear!B7 holds the logical TRUE — its row is left out',
    ]);
    expect(await page.textContent('#left-out-title')).toBe('3 cells left out because they hold text or a logical value:');
  });

  it('a damaged .xlsx is explained in plain words, and the pickers of the previous file are emptied', async () => {
    await page.setInputFiles('#file', { name: 'cut.xlsx', mimeType: 'application/octet-stream', buffer: Buffer.from('PK\u0003\u0004 cut short') });
    await page.waitForFunction(() => /damaged/.test(document.getElementById('data-status')?.textContent ?? ''));
    expect(await page.textContent('#data-status')).toMatch(/^cut\.xlsx is damaged: it looks like an \.xlsx workbook, but parts of it cannot be read/);
    expect(await page.$$eval('#col-x option', (o) => o.length)).toBe(0);
    expect((await snap(page)).data).toBeNull();
  });

  it('an .xlsx date column is offered as x: its serial day numbers are the points, and the x axis shows dates', async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Log');
    ws.addRow(['day', 'thickness nm']);
    const days = Array.from({ length: 12 }, (_v, i) => new Date(Date.UTC(2026, 0, 5 + 7 * i)));
    const thick = [40.1, 40.9, 41.2, 40.8, 42.5, 43.0, 42.7, 44.1, 44.9, 44.6, 46.2, 46.0];
    days.forEach((d, i) => ws.addRow([d, thick[i]]));
    const buffer = Buffer.from(await wb.xlsx.writeBuffer());
    await page.setInputFiles('#file', { name: 'log.xlsx', mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', buffer });
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length === 12);
    expect(await page.$$eval('#col-x option', (o) => o.map((q) => q.textContent))).toEqual(['day — column A, 12 dates', 'thickness nm — column B, 12 numbers']);
    // Excel's 1900 date system: days since 1899-12-30 (common practice)
    const serials = days.map((d) => (d.getTime() - Date.UTC(1899, 11, 30)) / 86400000);
    const s = await snap(page);
    expect(s.points).toEqual(serials.map((x, i) => ({ x, y: thick[i] })));
    const table = invoke('KNOTS', [col(thick), col(serials), 0, 1]) as number[][];
    expect(s.curve).toEqual(table.map((r) => ({ x: r[0], y: r[1] })));
    expect(s.xTicks.length).toBeGreaterThan(1);
    for (const t of s.xTicks) expect(t).toMatch(/^20(25|26)-\d\d-\d\d$/);
  });

  it('the "Copy formulas" block, pasted into a workbook and evaluated by the runner, gives no #SPILL! and the same knot table', async () => {
    await page.setInputFiles('#file', { name: 'wear.csv', mimeType: 'text/csv', buffer: Buffer.from(wearCsv) });
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length === 30);
    await setValue(page, '#knots', '5');
    await page.click('#copy');
    await page.waitForFunction(() => /block of/.test(document.getElementById('results-status')?.textContent ?? ''));
    const s = await snap(page);
    expect(s.copied).not.toBeNull();
    // The CSV opened in a spreadsheet: title A1, header row 3, data A4:B33 on sheet "wear"; paste at D1.
    const cells: Record<string, SetupCell> = { A1: 'Verschleißprüfung Charge 7', A3: 'Stunden', B3: 'Verschleiß (µm)' };
    hours.forEach((h, i) => {
      cells[`A${i + 4}`] = h;
      cells[`B${i + 4}`] = wear[i]!;
    });
    const letters = 'DEFGHIJKLMN';
    let formulas = 0;
    s.copied!.split('\n').forEach((line, r) => {
      line.split('\t').forEach((text, c) => {
        if (text === '') return;
        cells[`${letters[c]}${r + 1}`] = text.startsWith('=') ? { f: text.slice(1) } : text;
        if (text.startsWith('=')) formulas++;
      });
    });
    expect(formulas).toBe(6); // KNOTS, STATS, CV, BESTK, PREDICT and BAND (a knot fit has a band)
    const book = evaluate({ wear: cells });
    const ratchet = book.results().filter((q) => q.ratchet);
    expect(ratchet.length).toBe(6);
    for (const q of ratchet) expect(q.values.flat().filter((v) => v === '#SPILL!'), `${q.cell} ${q.formula}`).toEqual([]);
    const knots = ratchet.find((q) => q.formula.startsWith('=RATCHET.KNOTS'))!;
    expect(knots.values).toEqual(invoke('KNOTS', [col(wear), col(hours), 5, 1]));
    expect(problems).toEqual([]);
  });
});

/** Excel mode with office.js replaced by the stand-in (test/e2e/office-stub.js). */
describe.skipIf(!RUN_BROWSER_TESTS)('pane: hand-off actions in Excel mode (office.js stand-in)', () => {
  const problems: string[] = [];
  const { x, y } = TRIALS;
  const page = blockPage(() => openTrialsPane(site, { viewport: { width: 700, height: 1600 }, problems, x, y, headers: ['dose', 'response'] }), 60_000);

  const cellsOf = (sheet: string): Promise<Record<string, { value: unknown; formula?: string }> | null> =>
    page.evaluate((sh) => (window as unknown as { __excelStub: { cellsOf(s: string): Record<string, { value: unknown; formula?: string }> | null } }).__excelStub.cellsOf(sh), sheet);

  it('"Insert all" writes every formula with its label, each with room for its result (KNOTS K rows, STATS its rows, CV candidates + 1, BAND a row per x)', async () => {
    await setValue(page, '#knots', '4');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().curve.length === 4);
    const s = await snap(page);
    await page.fill('#target', 'Trials!H2');
    await page.click('#insert-all');
    await page.waitForFunction(() => /Inserted 6 formulas/.test(document.getElementById('insert-status')?.textContent ?? ''));
    const c = (await cellsOf('Trials'))!;
    const stats = invoke('STATS', [col(y), col(x), 4, 1]) as unknown[][];
    const cvRows = (invoke('CV', [col(y), col(x)]) as unknown[][]).length;
    // KNOTS at I2 (4 rows + 1 gap) → STATS at I7 → CV at I(7 + rows + 1) → BESTK → PREDICT
    const statsAt = 2 + 4 + 1;
    const cvAt = statsAt + stats.length + 1;
    const bestAt = cvAt + cvRows + 1;
    expect([c.H2?.value, c.I2?.formula]).toEqual(['Knot table (knot x, fitted value)', s.formulas.KNOTS]);
    expect([c[`H${statsAt}`]?.value, c[`I${statsAt}`]?.formula]).toEqual(['Fit statistics', s.formulas.STATS]);
    expect([c[`H${cvAt}`]?.value, c[`I${cvAt}`]?.formula]).toEqual(['Cross-validation of knot counts', s.formulas.CV]);
    expect([c[`H${bestAt}`]?.value, c[`I${bestAt}`]?.formula]).toEqual(['Suggested knot count', s.formulas.BESTK]);
    expect([c[`H${bestAt + 2}`]?.value, c[`I${bestAt + 2}`]?.formula]).toEqual(['Fitted values at new x', s.formulas.PREDICT]);
    // PREDICT spills one row per x (12), then one empty row
    expect([c[`H${bestAt + 2 + 12 + 1}`]?.value, c[`I${bestAt + 2 + 12 + 1}`]?.formula]).toEqual(['Band at new x (lower, fitted, upper)', s.formulas.BAND]);
  });

  it('"Portable curve" writes the knot table as values and INDEX/MATCH formulas that the runner evaluates to RATCHET.EVAL', async () => {
    await page.fill('#target', 'Trials!P2');
    await page.click('#insert-portable');
    await page.waitForFunction(() => /Wrote the knot table/.test(document.getElementById('insert-status')?.textContent ?? ''));
    const c = (await cellsOf('Trials'))!;
    const table = invoke('KNOTS', [col(y), col(x), 4, 1]) as number[][];
    expect([c.P2?.value, c.Q2?.value, c.S2?.value, c.T2?.value]).toEqual(['knot x', 'fitted value', 'new x', 'predicted']);
    table.forEach(([kx, ky], i) => expect([c[`P${i + 3}`]?.value, c[`Q${i + 3}`]?.value]).toEqual([kx, ky]));
    const portable = Array.from({ length: 10 }, (_v, i) => c[`T${i + 3}`]?.formula ?? '');
    for (const f of portable) {
      expect(f).toMatch(/INDEX\(/);
      expect(f).toMatch(/MATCH\(/);
      expect(f).not.toMatch(/RATCHET/i);
    }
    // The block evaluated by the runner, with new x typed in: equal to RATCHET.EVAL of the same table.
    const setup: Record<string, SetupCell> = {};
    for (const [addr, cell] of Object.entries(c)) if (/^[P-T]\d+$/.test(addr)) setup[addr] = cell.formula ? { f: cell.formula.slice(1) } : (cell.value as SetupCell);
    const newX = [-3, 1, 2.5, 4.75, 7, 9.1, 12, 30, 6.5, 11.999];
    newX.forEach((v, i) => {
      setup[`S${i + 3}`] = v;
      setup[`V${i + 3}`] = { f: `RATCHET.EVAL(S${i + 3},P3:Q${2 + table.length})` };
    });
    const book = evaluate({ Trials: setup });
    newX.forEach((_v, i) => expect(book.value(`Trials!T${i + 3}`)).toBeCloseTo(book.value(`Trials!V${i + 3}`) as number, 12));
  });

  it('"Frozen values" lists every RATCHET formula in its confirmation, then replaces them (whole spilled results) by values and adds the note sheet', async () => {
    // A spilled KNOTS result at Z2:AA3 as Excel would show it (the stand-in does not calculate).
    await page.evaluate(() => {
      const s = (window as unknown as { __excelStub: { set(sh: string, a: string, v: unknown, f?: string, spill?: string): void } }).__excelStub;
      s.set('Trials', 'Z2', 1, '=RATCHET.KNOTS(B2:B13,A2:A13,2)', 'Z2:AA3');
      s.set('Trials', 'AA2', 2.25);
      s.set('Trials', 'Z3', 12);
      s.set('Trials', 'AA3', 8.9);
    });
    await page.click('#freeze');
    await page.waitForSelector('#confirm:not([hidden])');
    const question = (await page.textContent('#confirm-text')) ?? '';
    expect(question).toMatch(/^Replace 7 RATCHET formulas of THIS workbook/);
    expect(question).toContain('Trials!I2 =RATCHET.KNOTS(');
    await page.click('#confirm-yes');
    await page.waitForFunction(() => /Froze 7 formulas/.test(document.getElementById('insert-status')?.textContent ?? ''));
    const c = (await cellsOf('Trials'))!;
    expect([c.Z2, c.AA2, c.Z3, c.AA3]).toEqual([{ value: 1 }, { value: 2.25 }, { value: 12 }, { value: 8.9 }]);
    expect(Object.entries(c).filter(([, v]) => /RATCHET/i.test(v.formula ?? ''))).toEqual([]);
    // the portable formulas are not the add-in's: they stay
    expect(c.T3?.formula).toMatch(/INDEX\(/);
    const note = (await cellsOf('Frozen values'))!;
    expect(note.A3?.value).toBe('Sheet');
    expect([note.A4?.value, note.B4?.value]).toEqual(['Trials', 'I2']);
    const listed = Object.entries(note).filter(([a, v]) => /^B\d+$/.test(a) && a !== 'B3' && v.value !== '').map(([, v]) => v.value);
    expect(listed).toContain('Z2:AA3');
    expect(listed.length).toBe(7); // the six of "Insert all" and Z2
    expect(problems).toEqual([]);
  });
});
