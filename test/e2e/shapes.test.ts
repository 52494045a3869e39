/**
 * The pane's shape controls (curvature and degree) end to end, in the browser preview and in
 * Excel mode (office.js replaced by test/e2e/office-stub.js), driven by playwright-core in
 * Debian's chromium:
 * - at 350 × 900 (a typical task pane, common practice) and 1280 × 900 both controls are labelled,
 *   not clipped, inside the viewport, and the page does not scroll sideways — also with the
 *   refusal message showing;
 * - choosing concave, convex or smooth on the kiln-strength sample draws exactly the curve of
 *   RATCHET.KNOTS / RATCHET.EVAL / RATCHET.FIT with the same arguments, computed here in Node
 *   through the registry (numbers compared, not pixels); a smooth curve has ≥ 20 samples per
 *   knot interval and its knot markers sit at the knots;
 * - the classic fit with a curvature (or degree 2) shows the function's own message at that field,
 *   and the chart keeps the last good fit, greyed, until the field is fixed;
 * - in Excel mode the insert action writes the formula with the curvature and degree arguments.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { RUN_BROWSER_TESTS } from './browser.js';
import { RESULTS_DIR, blockPage, invoke, openPreviewPane, openTrialsPane, setValue, snap, usePreviewSite } from './pane.js';
import { mapError } from '../../src/adapter/errors.js';
import type { CellArg, CellResult, CellValueIn } from '../../src/functions/types.js';
import type { Snapshot } from '../../taskpane/app.js';

const rows = (r: CellResult): number[][] => (Array.isArray(r) ? r : [[r]]) as number[][];

/** Layout problems of the fit section's shape fields (empty = fine). */
async function shapeFieldProblems(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    const vw = document.documentElement.clientWidth;
    if (document.documentElement.scrollWidth > vw) out.push(`page scrolls sideways: ${document.documentElement.scrollWidth} > ${vw}`);
    const canvas = document.createElement('canvas').getContext('2d')!;
    for (const id of ['curvature', 'degree']) {
      const s = document.getElementById(id) as HTMLSelectElement;
      const field = s.closest('.field')!;
      for (const e of [field, ...field.querySelectorAll('*')]) {
        const r = e.getBoundingClientRect();
        if (r.width === 0) continue;
        if (r.left < -0.5 || r.right > vw + 0.5) out.push(`#${id}: ${e.tagName.toLowerCase()}${e.id ? `#${e.id}` : ''} spans ${Math.round(r.left)}…${Math.round(r.right)}, viewport ${vw}`);
        if ((e as HTMLElement).scrollWidth > (e as HTMLElement).clientWidth + 1 && e.tagName !== 'SELECT') out.push(`#${id}: ${e.tagName.toLowerCase()}${e.id ? `#${e.id}` : ''} text clipped`);
      }
      const labels = s.labels;
      if (!labels || labels.length === 0 || labels[0]!.textContent!.trim() === '') out.push(`#${id} has no label`);
      const cs = getComputedStyle(s);
      canvas.font = `${cs.fontWeight} ${cs.fontSize} ${cs.fontFamily}`;
      // every option, as the closed control would show it when chosen (the arrow takes about 20 px)
      for (const o of s.options) {
        const need = canvas.measureText(o.text).width + parseFloat(cs.paddingLeft) + parseFloat(cs.paddingRight) + 20;
        if (need > s.clientWidth + 1) out.push(`select#${id} option "${o.text}" needs ${Math.round(need)} px, has ${s.clientWidth}`);
      }
    }
    return out;
  });
}

const site = usePreviewSite();

describe.skipIf(!RUN_BROWSER_TESTS)('shape controls in the browser preview (kiln-strength sample)', () => {
  const problems: string[] = [];
  let xs: CellValueIn[][] = [];
  let ys: CellValueIn[][] = [];
  const page = blockPage(() => openPreviewPane(site, { viewport: { width: 350, height: 900 }, problems }), 90_000);

  beforeAll(async () => {
    await page.selectOption('#sample', 'kiln-strength.xlsx');
    await page.click('#sample-open');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length > 0);
    const s = await snap(page);
    // The data the pane fits, as cells; the expected values are computed from them in Node.
    xs = s.data!.x.map((v) => [v as CellValueIn]);
    ys = s.data!.y.map((v) => [v as CellValueIn]);
    fs.mkdirSync(RESULTS_DIR, { recursive: true });
  }, 60_000);

  const waitCurve = (n: number): Promise<unknown> =>
    page.waitForFunction((k) => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().curve.length === k, n);

  it.each([
    [350, 900],
    [1280, 900],
  ])('at %i × %i the curvature and degree controls are labelled, not clipped, and nothing scrolls sideways', async (width, height) => {
    await page.setViewportSize({ width, height });
    expect(await shapeFieldProblems(page)).toEqual([]);
    await page.locator('#curvature').screenshot({ path: path.join(RESULTS_DIR, `shapes-curvature-${width}.png`) });
  });

  it.each([
    ['concave', '-1', '1', -1, 1],
    ['convex', '1', '1', 1, 1],
    ['smooth', '0', '2', 0, 2],
    ['concave and smooth', '-1', '2', -1, 2],
  ] as const)('%s with 5 knots: the chart curve is RATCHET.KNOTS / EVAL / FIT of the same formula', async (_name, cText, dText, curvature, degree) => {
    await page.setViewportSize({ width: 350, height: 900 });
    await setValue(page, '#knots', '5');
    await page.selectOption('#curvature', cText);
    await page.selectOption('#degree', dText);
    const args: CellArg[] = [ys, xs, 5, 1, undefined, curvature, degree];
    const table = rows(invoke('KNOTS', args));
    const smooth = degree === 2;
    // 4 intervals × 24 samples + the last knot for a smooth curve; the 5 vertices otherwise
    await waitCurve(smooth ? 4 * 24 + 1 : 5);
    const s = await snap(page);
    expect(s.fitError).toBeNull();
    expect(s.formulas.KNOTS!.endsWith(`,5,1,,${curvature === 0 ? '' : curvature}${smooth ? ',2' : ''})`)).toBe(true);
    // Knot markers at the knots: every row, or the even rows of a smooth table (not the midpoints).
    expect(s.knots).toEqual(table.filter((_r, i) => !smooth || i % 2 === 0).map((r) => ({ x: r[0], y: r[1] })));
    if (smooth) {
      expect(table.every((r) => r[2] === 2)).toBe(true);
      const knotX = s.knots.map((k) => k.x);
      for (let j = 0; j + 1 < knotX.length; j++) {
        expect(s.curve.filter((p) => p.x >= knotX[j]! && p.x < knotX[j + 1]!).length).toBeGreaterThanOrEqual(20);
      }
    } else {
      expect(s.curve).toEqual(table.map((r) => ({ x: r[0], y: r[1] })));
    }
    // The drawn curve is RATCHET.EVAL of the knot table at the curve's own x…
    const evalAt = rows(invoke('EVAL', [s.curve.map((p) => [p.x]), table])).map((r) => r[0]);
    expect(s.curve.map((p) => p.y)).toEqual(evalAt);
    // …and passes through RATCHET.FIT at the data x (the fitted values lie on it).
    const fit = rows(invoke('FIT', args)).map((r) => r[0]);
    const onCurve = rows(invoke('EVAL', [xs, table])).map((r) => r[0]);
    fit.forEach((v, i) => {
      if (typeof v === 'number') expect(onCurve[i]).toBeCloseTo(v, 9);
    });
    const stats = rows(invoke('STATS', args));
    expect(s.stats.map((r) => r[1])).toEqual(stats.map((r) => r[1]));
    const summary = await page.textContent('#fit-chart-summary');
    expect(summary).toContain('5 knots');
    if (curvature === -1) expect(summary).toContain('concave');
    if (smooth) expect(summary).toContain('smooth');
    await page.screenshot({ path: path.join(RESULTS_DIR, `shapes-${cText}-${dText}-350.png`), fullPage: false, clip: (await page.locator('#fit').boundingBox())! });
  });

  it('the classic fit with a curvature shows the function’s message at the curvature field; the chart keeps the last good fit, greyed', async () => {
    await page.setViewportSize({ width: 350, height: 900 });
    await page.selectOption('#degree', '1');
    await page.selectOption('#curvature', '-1');
    await setValue(page, '#knots', '4');
    await waitCurve(4);
    const good = await snap(page);
    await setValue(page, '#knots', '0');
    await page.waitForFunction(() => (document.getElementById('curvature-msg')?.textContent ?? '') !== '');
    let expected = '';
    try {
      invoke('FIT', [ys, xs, 0, 1, undefined, -1]);
    } catch (e) {
      const m = mapError(e);
      expected = `${m.code} ${m.message}`;
    }
    expect(expected).toMatch(/^#VALUE! curvature: needs knots \(K ≥ 2\)/);
    expect(await page.textContent('#curvature-msg')).toBe(expected);
    expect(await page.getAttribute('#curvature', 'aria-invalid')).toBe('true');
    // at the field: the message sits right under the control (above its hint), inside the same field
    const box = (await page.locator('#curvature').boundingBox())!;
    const msg = (await page.locator('#curvature-msg').boundingBox())!;
    expect(msg.y - (box.y + box.height)).toBeLessThan(12);
    expect(await page.evaluate(() => document.getElementById('curvature-msg')!.closest('.field') === document.getElementById('curvature')!.closest('.field'))).toBe(true);
    const s = await snap(page);
    expect(s.fitError).toBe(expected);
    expect(s.curve).toEqual(good.curve);
    expect(await page.evaluate(() => document.getElementById('fit-chart-box')!.classList.contains('stale'))).toBe(true);
    expect(await page.textContent('#fit-status')).toContain('last good fit, greyed');
    expect(await page.textContent('#fit-chart-summary')).toMatch(/^Last good fit/);
    expect(await shapeFieldProblems(page)).toEqual([]);
    await page.screenshot({ path: path.join(RESULTS_DIR, 'shapes-refused-350.png'), clip: (await page.locator('#fit').boundingBox())! });
    await page.setViewportSize({ width: 1280, height: 900 });
    expect(await shapeFieldProblems(page)).toEqual([]);
    await page.setViewportSize({ width: 350, height: 900 });
    // degree 2 with the classic fit: the degree field speaks
    await page.selectOption('#curvature', '0');
    await page.selectOption('#degree', '2');
    await page.waitForFunction(() => (document.getElementById('degree-msg')?.textContent ?? '').startsWith('#VALUE! degree: needs knots'));
    expect(await page.textContent('#curvature-msg')).toBe('');
    // fixed: the message goes, the chart is live again
    await page.selectOption('#degree', '1');
    await page.waitForFunction(() => (document.getElementById('degree-msg')?.textContent ?? '') === '');
    expect(await page.evaluate(() => document.getElementById('fit-chart-box')!.classList.contains('stale'))).toBe(false);
    expect((await snap(page)).fitError).toBeNull();
  });

  it('cross-validation runs over knot counts for the chosen shape: the table is RATCHET.CV with curvature and degree', async () => {
    await setValue(page, '#knots', '4');
    await page.selectOption('#curvature', '-1');
    await page.selectOption('#degree', '2');
    await setValue(page, '#cv-candidates', '2-6');
    await page.click('#suggest');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().cvState === 'done', undefined, { timeout: 30_000 });
    const s = await snap(page);
    const cand = [2, 3, 4, 5, 6].map((k) => [k]);
    const cv = rows(invoke('CV', [ys, xs, cand, 5, 1, 1, 1, undefined, -1, 2])).slice(1);
    expect(s.cv!.rows.map((r) => [r.knots, r.cvRmse, r.cvSe])).toEqual(cv.map((r) => [r[0], r[1], r[2]]));
    expect(s.cv!.best).toBe(invoke('BESTK', [ys, xs, cand, 5, 1, 1, 1, undefined, 1, -1, 2]));
    expect(s.formulas.CV!.endsWith(',-1,2)')).toBe(true);
    expect(await page.textContent('#cv-status')).toContain('for concave smooth fits');
    // another shape drops the suggestion rather than showing it for a shape it was not made for
    await page.selectOption('#curvature', '1');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().cv === null);
    expect(await page.textContent('#cv-status')).toContain('The shape changed');
    await setValue(page, '#cv-candidates', '');
  });

  it('the page logged no console errors or CSP reports', () => {
    expect(problems).toEqual([]);
  });
});

/** Excel mode with office.js replaced by the stand-in (test/e2e/office-stub.js). */
describe.skipIf(!RUN_BROWSER_TESTS)('shape controls in Excel mode (office.js stand-in)', () => {
  const problems: string[] = [];
  // Invented data: a rising response that levels off.
  const x = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
  const y = [2.1, 4.0, 5.2, 6.9, 7.1, 8.4, 8.2, 9.0, 9.4, 9.3, 9.8, 9.9];
  const page = blockPage(() => openTrialsPane(site, { viewport: { width: 350, height: 900 }, problems, x, y }), 60_000);

  it('at 350 and 1280 px the controls show in Excel mode, labelled and unclipped', async () => {
    for (const width of [350, 1280]) {
      await page.setViewportSize({ width, height: 900 });
      expect(await shapeFieldProblems(page)).toEqual([]);
    }
    await page.setViewportSize({ width: 350, height: 900 });
  });

  it('"Insert KNOTS" writes the formula with curvature and degree, with room for the smooth table (7 × 3)', async () => {
    await setValue(page, '#knots', '4');
    await page.selectOption('#curvature', '-1');
    await page.selectOption('#degree', '2');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().curve.length === 3 * 24 + 1);
    const s = await snap(page);
    expect(s.formulas.KNOTS).toBe('=RATCHET.KNOTS(Trials!$B$2:$B$13,Trials!$A$2:$A$13,4,1,,-1,2)');
    expect(s.formulas.BESTK).toBe('=RATCHET.BESTK(Trials!$B$2:$B$13,Trials!$A$2:$A$13,,5,1,1,1,,,-1,2)');
    // a value in the third column of the area: the smooth table needs it, so the pane asks first
    await page.evaluate(() => (window as unknown as { __excelStub: { set(sh: string, a: string, v: unknown): void } }).__excelStub.set('Trials', 'F8', 'note'));
    await page.fill('#target', 'Trials!D2');
    await page.click('[data-insert="KNOTS"]');
    await page.waitForFunction(() => !(document.getElementById('confirm') as HTMLElement).hidden);
    expect(await page.textContent('#confirm-text')).toContain('The result needs 7 × 3 cells');
    expect(await page.textContent('#confirm-text')).toContain('F8');
    await page.click('#confirm-yes');
    await page.waitForFunction(() => /RATCHET\.KNOTS/.test(document.getElementById('insert-status')?.textContent ?? '') || /Inserted|Wrote/.test(document.getElementById('insert-status')?.textContent ?? ''));
    const c = await page.evaluate(() => (window as unknown as { __excelStub: { cellsOf(s: string): Record<string, { value: unknown; formula?: string }> | null } }).__excelStub.cellsOf('Trials'));
    expect(c!.D2?.formula).toBe(s.formulas.KNOTS);
  });

  it('"Portable curve" refuses a smooth table with its message instead of writing straight lines', async () => {
    await page.fill('#target', 'Trials!K2');
    await page.click('#insert-portable');
    await page.waitForFunction(() => (document.getElementById('insert-status')?.textContent ?? '') !== '');
    expect(await page.textContent('#insert-status')).toContain('knots: needs a piecewise-linear table');
    const c = await page.evaluate(() => (window as unknown as { __excelStub: { cellsOf(s: string): Record<string, { value: unknown; formula?: string }> | null } }).__excelStub.cellsOf('Trials'));
    expect(c!.K2).toBeUndefined();
  });

  it('the page logged no console errors or CSP reports', () => {
    expect(problems).toEqual([]);
  });
});
