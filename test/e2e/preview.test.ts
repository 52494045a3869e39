/**
 * End-to-end specification of the browser preview, driven by playwright-core in Debian's chromium
 * (headless). The page is built with the project's webpack config and served on 127.0.0.1.
 *
 * Expected values do not come from the page: the test reads the sample workbook itself (exceljs in
 * Node) and computes RATCHET.KNOTS, CV and BESTK through the registry — the same implementations
 * the worksheet functions use.
 *
 * The browser is /usr/bin/chromium or RATCHET_BROWSER (test/e2e/browser.ts); without one the file
 * is skipped with a notice, except under CI=true, where the run fails (test/global-setup.ts).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import ExcelJS from 'exceljs';
import { RUN_BROWSER_TESTS, openBrowserPage } from './browser.js';
import { REPO_ROOT, RESULTS_DIR, TRIALS, blockPage, invoke, openPreviewPane, setValue, snap, usePreviewSite } from './pane.js';
import { parseCsv } from '../../taskpane/csv.js';
import type { CellValueIn } from '../../src/functions/types.js';
import type { Snapshot } from '../../taskpane/app.js';

/** Columns of a sample's "Data" sheet read in Node, by header name. */
async function sampleColumns(file: string, xHeader: string, yHeader: string): Promise<{ xs: CellValueIn[][]; ys: CellValueIn[][]; used: number }> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(path.join(REPO_ROOT, 'samples', file));
  const ws = wb.getWorksheet('Data');
  if (!ws) throw new Error(`${file} has no Data sheet`);
  const header = ws.getRow(1);
  let cx = -1;
  let cy = -1;
  header.eachCell((cell, col) => {
    // the first column with that header (later blocks of a sample may reuse a header)
    if (cell.value === xHeader && cx < 0) cx = col;
    if (cell.value === yHeader && cy < 0) cy = col;
  });
  if (cx < 0 || cy < 0) throw new Error(`${file}: headers ${xHeader} / ${yHeader} not found`);
  const xs: CellValueIn[][] = [];
  const ys: CellValueIn[][] = [];
  let last = 1;
  for (let r = 2; r <= ws.rowCount; r++) if (typeof ws.getRow(r).getCell(cx).value === 'number' || typeof ws.getRow(r).getCell(cy).value === 'number') last = r;
  let used = 0;
  for (let r = 2; r <= last; r++) {
    const x = ws.getRow(r).getCell(cx).value;
    const y = ws.getRow(r).getCell(cy).value;
    xs.push([typeof x === 'number' ? x : null]);
    ys.push([typeof y === 'number' ? y : null]);
    if (typeof x === 'number' && typeof y === 'number') used++;
  }
  return { xs, ys, used };
}

const site = usePreviewSite();

describe.skipIf(!RUN_BROWSER_TESTS)('browser preview (playwright-core + Debian chromium)', () => {
  const requests: string[] = [];
  const problems: string[] = [];
  const page = blockPage(() => openPreviewPane(site, { viewport: { width: 900, height: 1400 }, acceptDownloads: true, problems, requests }), 90_000);

  it('opens a sample: the chart holds every usable row as a point and the KNOTS table as curve vertices', async () => {
    await page.selectOption('#sample', 'kiln-strength.xlsx');
    await page.click('#sample-open');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length > 0);
    const s = await snap(page);
    expect(s.mode).toBe('preview');
    const { xs, ys, used } = await sampleColumns('kiln-strength.xlsx', 'temperature °C', 'strength MPa');
    expect(s.points.length).toBe(used);
    // classic fit (knots 0), rising
    const table = invoke('KNOTS', [ys, xs, 0, 1]) as number[][];
    expect(s.curve.length).toBe(table.length);
    expect(s.curve.map((p) => p.x)).toEqual(table.map((r) => r[0]));
    expect(s.curve.map((p) => p.y)).toEqual(table.map((r) => r[1]));
    // a knot fit: the curve has exactly K vertices
    await setValue(page, '#knots', '5');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().curve.length === 5);
    const s5 = await snap(page);
    const t5 = invoke('KNOTS', [ys, xs, 5, 1]) as number[][];
    expect(s5.curve).toEqual(t5.map((r) => ({ x: r[0], y: r[1] })));
    expect(s5.knots).toEqual(s5.curve);
    expect(s5.formulas.KNOTS).toBe('=RATCHET.KNOTS(Data!$B$2:$B$29,Data!$A$2:$A$29,5,1)');
  });

  it('suggests the knot count RATCHET.BESTK gives on the same data, and charts the CV table', async () => {
    await page.click('#suggest');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().cvState === 'done', undefined, { timeout: 20_000 });
    const s = await snap(page);
    const { xs, ys } = await sampleColumns('kiln-strength.xlsx', 'temperature °C', 'strength MPa');
    // defaults of the pane: candidates default, folds 5, repeats 1, seed 1, direction 1, no weights, one-SE rule
    const best = invoke('BESTK', [ys, xs, undefined, 5, 1, 1, 1, undefined, 1]);
    expect(s.cv!.best).toBe(best);
    const cv = invoke('CV', [ys, xs, undefined, 5, 1, 1, 1]) as (number | string)[][];
    expect(s.cv!.rows.map((r) => [r.knots, r.cvRmse, r.cvSe, r.cvR2, r.cvMae, r.trainRmse])).toEqual(cv.slice(1));
    expect(s.cv!.points.length).toBe(cv.length - 1);
    expect(await page.textContent('#cv-status')).toContain('one-standard-error rule');
    fs.mkdirSync(RESULTS_DIR, { recursive: true });
    await page.screenshot({ path: path.join(RESULTS_DIR, 'preview-kiln.png'), fullPage: true });
  });

  it('downloads the knot table as CSV equal to RATCHET.KNOTS', async () => {
    const [download] = await Promise.all([page.waitForEvent('download'), page.click('#download')]);
    const text = fs.readFileSync((await download.path())!, 'utf8');
    const rows = parseCsv(text);
    expect(rows[0]).toEqual(['knot_x', 'fitted_value']);
    const { xs, ys } = await sampleColumns('kiln-strength.xlsx', 'temperature °C', 'strength MPa');
    const table = invoke('KNOTS', [ys, xs, 5, 1]) as number[][];
    // full precision: the shortest round-trip decimal of each double
    expect(rows.slice(1).map((r) => r.map(Number))).toEqual(table);
    expect(download.suggestedFilename()).toBe('kiln-strength-knots.csv');
  });

  it('cancels a long cross-validation and can run again afterwards', async () => {
    await page.selectOption('#sample', 'knot-count-study.xlsx');
    await page.click('#sample-open');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().data?.x.length === 40);
    await setValue(page, '#cv-folds', '10');
    await setValue(page, '#cv-repeats', '1000');
    await page.click('#suggest');
    await page.waitForFunction(() => {
      const s = (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot();
      return s.cvState === 'running' && s.progress > 0;
    });
    const before = await snap(page);
    expect(before.progress).toBeLessThan(0.9);
    await page.focus('#cancel'); // keyboard: Cancel is operable with Enter

    await page.keyboard.press('Enter');
    const s = await snap(page);
    expect(s.cvState).toBe('cancelled');
    expect(s.cv).toBeNull();
    await page.waitForTimeout(300);
    expect((await snap(page)).cvState).toBe('cancelled');
    expect(await page.textContent('#cv-status')).toBe('Cancelled.');
    // a fresh worker serves the next run
    await setValue(page, '#cv-folds', '5');
    await setValue(page, '#cv-repeats', '1');
    await page.click('#suggest');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().cvState === 'done', undefined, { timeout: 20_000 });
    const { xs, ys } = await sampleColumns('knot-count-study.xlsx', 'setting', 'response');
    expect((await snap(page)).cv!.best).toBe(invoke('BESTK', [ys, xs, undefined, 5, 1, 1, 1, undefined, 1]));
  });

  it('opens a CSV file: rows with a blank are left out, and the formulas reference where the CSV lands in a workbook', async () => {
    // Invented data; row 4 has no y and is left out.
    const csv = 'dose,"response, mV"\r\n1,2.0\r\n2,\r\n3,2.5\r\n4,4.1\r\n5,3.9\r\n6,6.0\r\n';
    await page.setInputFiles('#file', { name: 'assay.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().data?.x.length === 6);
    await setValue(page, '#knots', '0');
    const s = await snap(page);
    expect(s.points).toEqual([
      { x: 1, y: 2 },
      { x: 3, y: 2.5 },
      { x: 4, y: 4.1 },
      { x: 5, y: 3.9 },
      { x: 6, y: 6 },
    ]);
    const ys = [[2], [null], [2.5], [4.1], [3.9], [6]];
    const xs = [[1], [2], [3], [4], [5], [6]];
    const table = invoke('KNOTS', [ys, xs, 0, 1]) as number[][];
    expect(s.curve).toEqual(table.map((r) => ({ x: r[0], y: r[1] })));
    expect(s.formulas.STATS).toBe('=RATCHET.STATS(assay!$B$2:$B$7,assay!$A$2:$A$7,0,1)');
  });

  it('uses a weight column: the curve equals RATCHET.KNOTS with those weights', async () => {
    await page.selectOption('#sample', 'lab-calibration.xlsx');
    await page.click('#sample-open');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().data?.x.length === 12);
    const label = await page.evaluate(() => [...(document.getElementById('col-w') as HTMLSelectElement).options].find((o) => o.text.startsWith('replicates'))!.value);
    await page.selectOption('#col-w', label);
    await setValue(page, '#knots', '0');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().data?.w !== null);
    const s = await snap(page);
    const { xs, ys } = await sampleColumns('lab-calibration.xlsx', 'conc mg/L', 'signal');
    const { ys: ws } = await sampleColumns('lab-calibration.xlsx', 'conc mg/L', 'replicates');
    const weighted = invoke('KNOTS', [ys, xs, 0, 1, ws]) as number[][];
    const unweighted = invoke('KNOTS', [ys, xs, 0, 1]) as number[][];
    expect(weighted).not.toEqual(unweighted); // the weights matter on these data
    expect(s.curve).toEqual(weighted.map((r) => ({ x: r[0], y: r[1] })));
    expect(s.formulas.KNOTS).toBe('=RATCHET.KNOTS(Data!$B$2:$B$13,Data!$A$2:$A$13,0,1,Data!$C$2:$C$13)');
  });

  it('a second x column shows the fitted surface as a heat-map: K1 × K2 cells equal to RATCHET.GRID', async () => {
    const file = 'coating-cure.xlsx';
    await page.selectOption('#sample', file);
    await page.click('#sample-open');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().data?.x.length === 48);
    expect(await page.isHidden('#surface')).toBe(true); // no x2 chosen: the one-input pane as before
    expect((await snap(page)).surface).toBeNull();
    const optionFor = (id: string, header: string): Promise<string> =>
      page.evaluate(({ id, header }) => [...(document.getElementById(id) as HTMLSelectElement).options].find((o) => o.text.startsWith(`${header} — `))!.value, { id, header });
    await page.selectOption('#col-y', await optionFor('col-y', 'hardness'));
    await page.selectOption('#col-x2', await optionFor('col-x2', 'dwell min'));
    await setValue(page, '#knots1', '4');
    await setValue(page, '#knots2', '3');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().surface?.knots1.length === 4);
    const { xs, ys } = await sampleColumns(file, 'oven temp °C', 'hardness');
    const { ys: x2s } = await sampleColumns(file, 'oven temp °C', 'dwell min');
    const drawn = async () => ({
      values: (await page.$$eval('#heatmap td.heat', (tds) => tds.map((td) => (td as HTMLElement).dataset.value!))).map(Number),
      text: await page.$$eval('#heatmap td.heat', (tds) => tds.map((td) => td.textContent)),
      cols: (await page.$$eval('#heatmap thead tr:last-child th', (ths) => ths.map((th) => (th as HTMLElement).dataset.value!))).map(Number),
      rows: (await page.$$eval('#heatmap tbody th[scope="row"]', (ths) => ths.map((th) => (th as HTMLElement).dataset.value!))).map(Number),
      backgrounds: await page.$$eval('#heatmap td.heat', (tds) => tds.map((td) => getComputedStyle(td).backgroundColor)),
    });
    for (const [k1, k2] of [
      [4, 3],
      [0, 0],
    ] as const) {
      if (k1 === 0) {
        await setValue(page, '#knots1', '0');
        await setValue(page, '#knots2', '0');
        await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().surface?.knots1.length === 7);
      }
      const grid = invoke('GRID', [ys, xs, x2s, k1, k2, 1, 1]) as number[][];
      const K1 = grid[0]!.length - 1;
      const K2 = grid.length - 1;
      const d = await drawn();
      expect(d.values.length).toBe(K1 * K2);
      expect(d.values).toEqual(grid.slice(1).flatMap((r) => r.slice(1)));
      // the digits rule: 4 significant digits by default (the values behind keep full precision)
      expect(d.text).toEqual(grid.slice(1).flatMap((r) => r.slice(1)).map((v) => String(Number(v.toPrecision(4)))));
      expect(d.cols).toEqual(grid[0]!.slice(1));
      expect(d.rows).toEqual(grid.slice(1).map((r) => r[0]));
      // the colours follow the values: the lowest cell is the palest, the highest the darkest
      const light = d.backgrounds.map((c) => c.match(/\d+/g)!.slice(0, 3).reduce((a, v) => a + Number(v), 0));
      expect(light[d.values.indexOf(Math.min(...d.values))]).toBe(Math.max(...light));
      expect(light[d.values.indexOf(Math.max(...d.values))]).toBe(Math.min(...light));
      const s = await snap(page);
      expect(s.surface!.formula).toBe(`=RATCHET.GRID(Data!$C$2:$C$49,Data!$A$2:$A$49,Data!$B$2:$B$49,${k1},${k2},1,1)`);
      expect(s.surfaceError).toBeNull();
      fs.mkdirSync(RESULTS_DIR, { recursive: true });
      if (k1 === 0) await page.locator('#surface').screenshot({ path: path.join(RESULTS_DIR, 'preview-surface-classic.png') });
      if (k1 === 4) {
        await page.locator('#surface').screenshot({ path: path.join(RESULTS_DIR, 'preview-surface.png') });
        await page.emulateMedia({ colorScheme: 'dark' });
        await page.waitForTimeout(100);
        await page.locator('#surface').screenshot({ path: path.join(RESULTS_DIR, 'preview-surface-dark.png') });
        await page.emulateMedia({ colorScheme: 'light' });
      }
    }
    expect(await page.inputValue('#formulas')).toContain('Surface table:    =RATCHET.GRID(');
    // the one-input chart is unchanged beside it: y against x alone
    const s = await snap(page);
    const table = invoke('KNOTS', [ys, xs, Number(s.settings!.fit.knots), 1]) as number[][];
    expect(s.curve).toEqual(table.map((r) => ({ x: r[0], y: r[1] })));
    // back to no x2: the surface section goes away
    await page.selectOption('#col-x2', '');
    expect(await page.isHidden('#surface')).toBe(true);
    expect((await snap(page)).formulas).not.toHaveProperty('GRID');
    expect(await page.inputValue('#formulas')).not.toContain('RATCHET.GRID');
  });

  it('follows the dark colour scheme (screenshot)', async () => {
    await page.selectOption('#sample', 'adhesive-tack.xlsx');
    await page.click('#sample-open');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().data?.x.length === 26);
    await page.selectOption('#direction', '-1');
    await setValue(page, '#knots', '4');
    await page.emulateMedia({ colorScheme: 'dark' });
    await page.waitForTimeout(100);
    const bg = await page.evaluate(() => getComputedStyle(document.body).backgroundColor);
    expect(bg).toBe('rgb(24, 24, 27)');
    await page.screenshot({ path: path.join(RESULTS_DIR, 'preview-dark.png'), fullPage: true });
    await page.emulateMedia({ colorScheme: 'light' });
  });

  it('labels every visible control, and every control is reachable with Tab', async () => {
    const unlabelled = await page.evaluate(() =>
      [...document.querySelectorAll<HTMLElement>('input, select, textarea, button, progress')]
        .filter((e) => e.offsetParent !== null)
        .filter((e) => {
          const labels = (e as HTMLInputElement).labels;
          const text = e.tagName === 'BUTTON' ? (e.textContent ?? '').trim() : '';
          return !(labels && labels.length > 0) && !e.getAttribute('aria-label') && text === '';
        })
        .map((e) => e.id || e.outerHTML.slice(0, 60)),
    );
    expect(unlabelled).toEqual([]);
    // Tab from the top reaches the suggestion button without a pointer.
    await page.focus('#file');
    let reached = false;
    for (let i = 0; i < 30 && !reached; i++) {
      await page.keyboard.press('Tab');
      reached = (await page.evaluate(() => document.activeElement?.id)) === 'suggest';
    }
    expect(reached).toBe(true);
  });

  it('sent no request beyond localhost and logged no error or CSP violation', async () => {
    // Even with Office's host parameter in its address, the preview page never asks for office.js.
    await page.goto(`${site.url}preview.html?_host_Info=Excel$Win32$16.01$en-US$$$$0`);
    await page.waitForFunction(() => document.getElementById('host')?.textContent?.startsWith('Browser preview'));
    expect(requests.length).toBeGreaterThan(3);
    const outside = requests.filter((u) => !(u.startsWith(site.url) || u.startsWith('data:') || u.startsWith('blob:')));
    expect(outside).toEqual([]);
    expect(requests.some((u) => u.includes('office.js'))).toBe(false);
    expect(problems).toEqual([]);
  });
});

/** The Excel side of the pane in a real browser, with office.js replaced by test/e2e/office-stub.js. */
describe.skipIf(!RUN_BROWSER_TESTS)('task pane in Excel mode (office.js stand-in)', () => {
  const requests: string[] = [];
  const problems: string[] = [];
  const stub = fs.readFileSync(path.join(import.meta.dirname, 'office-stub.js'), 'utf8');
  // Invented data: 12 rows on sheet "Trials", and a table "Assay" at D1:E7.
  const { x, y } = TRIALS;
  const page = blockPage(() => openBrowserPage({ viewport: { width: 700, height: 1600 }, officeStub: stub, problems, requests }), 60_000);

  beforeAll(async () => {
    await page.goto(`${site.url}taskpane.html?_host_Info=Excel$Win32$16.01$en-US$$$$0`);
    await page.waitForFunction(() => document.getElementById('host')?.textContent?.startsWith('Running in Excel'));
    await page.evaluate(
      ({ x, y }) => {
        const s = (window as unknown as { __excelStub: { set(sh: string, a: string, v: unknown): void; addTable(n: string, sh: string, a: string, c: string[]): void } }).__excelStub;
        s.set('Trials', 'A1', 'dose');
        s.set('Trials', 'B1', 'response');
        x.forEach((v, i) => s.set('Trials', `A${i + 2}`, v));
        y.forEach((v, i) => s.set('Trials', `B${i + 2}`, v));
        s.addTable('Assay', 'Trials', 'D1:E7', ['conc', 'signal [mV]']);
        [0.5, 1, 2, 4, 8, 16].forEach((v, i) => {
          s.set('Trials', `D${i + 2}`, v);
          s.set('Trials', `E${i + 2}`, [0.11, 0.2, 0.43, 0.8, 1.52, 2.9][i]);
        });
      },
      { x, y },
    );
  }, 60_000);

  const stubCall = <T>(fn: string, ...args: unknown[]): Promise<T> =>
    page.evaluate(({ fn, args }) => (window as unknown as { __excelStub: Record<string, (...a: unknown[]) => T> }).__excelStub[fn]!(...args), { fn, args });

  it('reads the selection as x and y columns (header skipped) and charts the same fit as RATCHET.KNOTS', async () => {
    await stubCall('select', 'Trials', 'A1:B13');
    await page.click('#pick-columns');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length === 12);
    expect(await page.inputValue('#addr-x')).toBe('Trials!$A$2:$A$13');
    expect(await page.inputValue('#addr-y')).toBe('Trials!$B$2:$B$13');
    const s = await snap(page);
    expect(s.mode).toBe('office');
    const table = invoke('KNOTS', [y.map((v) => [v]), x.map((v) => [v]), 0, 1]) as number[][];
    expect(s.curve).toEqual(table.map((r) => ({ x: r[0], y: r[1] })));
  });

  it('refreshes the chart when a cell of the chosen ranges changes (worksheet onChanged)', async () => {
    await stubCall('set', 'Trials', 'B4', 9.5); // row 4 now lies far above its neighbours
    expect(await stubCall<number>('change', 'Trials', 'B4')).toBe(1);
    const y2 = y.slice();
    y2[2] = 9.5;
    const table = invoke('KNOTS', [y2.map((v) => [v]), x.map((v) => [v]), 0, 1]) as number[][];
    await page.waitForFunction((n) => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().curve.length === n, table.length);
    expect((await snap(page)).curve).toEqual(table.map((r) => ({ x: r[0], y: r[1] })));
    // a change elsewhere on the sheet does not refit
    await stubCall('set', 'Trials', 'Z1', 5);
    await stubCall('change', 'Trials', 'Z1');
  });

  it('inserts a live KNOTS formula into an empty cell, and asks before writing over a value', async () => {
    await page.fill('#target', 'Trials!H2');
    await page.click('[data-insert="KNOTS"]');
    await page.waitForFunction(() => /Inserted/.test(document.getElementById('insert-status')?.textContent ?? ''));
    expect(await stubCall('get', 'Trials', 'H2')).toEqual({ value: '(formula)', formula: '=RATCHET.KNOTS(Trials!$B$2:$B$13,Trials!$A$2:$A$13,0,1)' });
    // a value inside the 3 × 2 area of a 3-knot table
    await setValue(page, '#knots', '3');
    await stubCall('set', 'Trials', 'I4', 'note');
    await page.click('[data-insert="KNOTS"]');
    await page.waitForSelector('#confirm:not([hidden])');
    expect(await page.textContent('#confirm-text')).toBe('The result needs 3 × 2 cells (Trials!H2:I4), but 2 are not empty: H2, I4. Overwrite them?');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('confirm-no');
    fs.mkdirSync(RESULTS_DIR, { recursive: true });
    await page.screenshot({ path: path.join(RESULTS_DIR, 'office-confirm.png'), fullPage: true });
    await page.keyboard.press('Enter'); // "Keep the cells"
    await page.waitForFunction(() => /Nothing was written/.test(document.getElementById('insert-status')?.textContent ?? ''));
    expect(await stubCall('get', 'Trials', 'I4')).toEqual({ value: 'note' });
    expect((await stubCall<{ formula: string }>('get', 'Trials', 'H2')).formula).toBe('=RATCHET.KNOTS(Trials!$B$2:$B$13,Trials!$A$2:$A$13,0,1)');
    await page.click('[data-insert="KNOTS"]');
    await page.click('#confirm-yes');
    await page.waitForFunction(() => /Inserted/.test(document.getElementById('insert-status')?.textContent ?? ''));
    expect((await stubCall<{ formula: string }>('get', 'Trials', 'H2')).formula).toBe('=RATCHET.KNOTS(Trials!$B$2:$B$13,Trials!$A$2:$A$13,3,1)');
    expect(await stubCall('get', 'Trials', 'I4')).toBeNull();
  });

  it('refers to table columns by name when the ranges are an Excel table’s columns', async () => {
    await page.fill('#addr-x', 'Trials!D2:D7');
    await page.fill('#addr-y', 'Trials!E2:E7');
    await page.click('#read-ranges');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length === 6);
    await page.fill('#target', 'Trials!K2');
    await page.click('[data-insert="STATS"]');
    await page.waitForFunction(() => /Inserted/.test(document.getElementById('insert-status')?.textContent ?? ''));
    expect((await stubCall<{ formula: string }>('get', 'Trials', 'K2')).formula).toBe("=RATCHET.STATS(Assay[[signal '[mV']]],Assay[conc],3,1)");
  });

  it('a second x range shows the surface heat-map equal to RATCHET.GRID, and Insert GRID writes that formula', async () => {
    // Invented second input for the 12 rows of sheet Trials.
    const x2 = [3, 1, 2, 3, 1, 2, 3, 1, 2, 3, 1, 2];
    await page.evaluate((x2) => {
      const s = (window as unknown as { __excelStub: { set(sh: string, a: string, v: unknown): void } }).__excelStub;
      x2.forEach((v, i) => s.set('Trials', `C${i + 2}`, v));
    }, x2);
    await page.fill('#addr-x', 'Trials!A2:A13');
    await page.fill('#addr-y', 'Trials!B2:B13');
    await page.fill('#addr-x2', 'Trials!C2:C13');
    await page.click('#read-ranges');
    await page.waitForSelector('#surface:not([hidden])'); // the surface controls appear with x2
    await setValue(page, '#knots1', '3');
    await setValue(page, '#knots2', '2');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().surface?.knots2.length === 2);
    // y as the sheet holds it now (an earlier check changed B4)
    const yNow: number[] = [];
    for (let i = 0; i < y.length; i++) yNow.push((await stubCall<{ value: number }>('get', 'Trials', `B${i + 2}`)).value);
    expect(yNow[2]).toBe(9.5);
    const grid = invoke('GRID', [yNow.map((v) => [v]), x.map((v) => [v]), x2.map((v) => [v]), 3, 2, 1, 1]) as number[][];
    const values = (await page.$$eval('#heatmap td.heat', (tds) => tds.map((td) => (td as HTMLElement).dataset.value!))).map(Number);
    expect(values).toEqual(grid.slice(1).flatMap((r) => r.slice(1)));
    expect(values.length).toBe(6);
    await page.fill('#target', 'Trials!M2');
    await page.click('#insert-grid');
    await page.waitForFunction(() => /Inserted/.test(document.getElementById('insert-status')?.textContent ?? ''));
    expect((await stubCall<{ formula: string }>('get', 'Trials', 'M2')).formula).toBe('=RATCHET.GRID(Trials!$B$2:$B$13,Trials!$A$2:$A$13,Trials!$C$2:$C$13,3,2,1,1)');
    await page.screenshot({ path: path.join(RESULTS_DIR, 'office-surface.png'), fullPage: true });
  });

  it('requested office.js only because it is hosted (served by the stand-in), nothing else outside localhost, no errors', () => {
    const outside = requests.filter((u) => !(u.startsWith(site.url) || u.startsWith('data:') || u.startsWith('blob:')));
    expect(outside).toEqual(['https://appsforoffice.microsoft.com/lib/1/hosted/office.js']);
    expect(problems).toEqual([]);
  });
});
