/**
 * The pane at task-pane width and on a wide screen, light and dark (prefers-color-scheme
 * emulation), in the browser preview driven by playwright-core in Debian's chromium:
 * - no element reaches beyond the viewport and the page does not scroll sideways;
 * - no control's text is clipped: for buttons, inputs and labels scrollWidth ≤ clientWidth; for a
 *   drop-down the width of its chosen option's text (measured with the same font) fits inside it
 *   (a long column header in a file can still be wider than a 350 px pane: the open list shows it whole);
 * - a 10 × 10 surface heat-map fits at 350 px without scrolling;
 * - the defaults and guards show at their fields (y defaults to the sample's named y; x2 = y is
 *   refused inline; knot count 2.5 explains itself and the chart keeps the last good fit, greyed;
 *   a knot count above the distinct x gets a warning with the numbers);
 * - every control has a label, the charts a text alternative (knot count, direction, r2, the band);
 * - the surface directions (0 = from the data, the longest option) fit their drop-downs, and the
 *   status line says which way 0 chose along each input.
 * Screenshots go to test-results/layout-*.png.
 *
 * Sizes 350 × 900 (a typical task pane, common practice) and 1280 × 900, and 320 and 400 px wide, the
 * ends of the pane widths the README promises ("Narrow panes").
 */
import { beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { RUN_BROWSER_TESTS, saveScreenshot } from './browser.js';
import { layoutProblems, unlabelled } from './layout-checks.js';
import { RESULTS_DIR, blockPage, openPreviewPane, setValue, snap, usePreviewSite } from './pane.js';
import type { Snapshot } from '../../taskpane/app.js';

async function optionFor(page: Page, id: string, header: string): Promise<string> {
  return page.evaluate(({ id, header }) => [...(document.getElementById(id) as HTMLSelectElement).options].find((o) => o.text.startsWith(`${header} — `))!.value, { id, header });
}

const site = usePreviewSite();

describe.skipIf(!RUN_BROWSER_TESTS)('the pane at 350 and 1280 px, light and dark (playwright-core + Debian chromium)', () => {
  const page = blockPage(() => openPreviewPane(site, { viewport: { width: 350, height: 900 } }), 90_000);

  beforeAll(() => {
    fs.mkdirSync(RESULTS_DIR, { recursive: true });
  });

  it('the coating-cure sample starts y on its named y column (hardness), not on the second column', async () => {
    await page.selectOption('#sample', 'coating-cure.xlsx');
    await page.click('#sample-open');
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().data?.x.length === 48);
    const chosen = await page.$eval('#col-y', (s) => (s as HTMLSelectElement).selectedOptions[0]!.text);
    expect(chosen.startsWith('hardness — ')).toBe(true);
  });

  it('refuses x2 = y at the x2 picker, keeps the last good fit greyed, and accepts a valid x2 again', async () => {
    const before = await snap(page);
    await page.selectOption('#col-x2', await optionFor(page, 'col-x2', 'hardness'));
    expect(await page.textContent('#col-x2-msg')).toBe('The second input cannot be the y column (both are "hardness"): choose another x2, or none.');
    expect(await page.getAttribute('#col-x2', 'aria-invalid')).toBe('true');
    expect(await page.getAttribute('#fit-chart-box', 'class')).toContain('stale');
    const s = await snap(page);
    expect(s.points).toEqual(before.points); // the last good fit stays on the chart
    expect(s.fitError).toBe('The second input cannot be the y column (both are "hardness"): choose another x2, or none.');
    await page.selectOption('#col-x2', await optionFor(page, 'col-x2', 'dwell min'));
    expect(await page.textContent('#col-x2-msg')).toBe('');
    expect(await page.getAttribute('#fit-chart-box', 'class')).not.toContain('stale');
    expect((await snap(page)).fitError).toBeNull();
  });

  it('knot count 2.5 explains itself at the field and the chart keeps the last good fit; 500 warns with the numbers', async () => {
    await setValue(page, '#knots', '4');
    const good = await snap(page);
    expect(good.curve.length).toBe(4);
    await setValue(page, '#knots', '2.5');
    expect(await page.textContent('#knots-msg')).toBe('Knot count: needs 0 (classic fit) or a whole number of knots ≥ 2; 2.5 is not a whole number.');
    expect(await page.textContent('#knots-msg')).not.toContain('range of knot positions');
    const s = await snap(page);
    expect(s.curve).toEqual(good.curve);
    expect(await page.getAttribute('#fit-chart-box', 'class')).toContain('stale');
    await setValue(page, '#knots', '1');
    expect(await page.textContent('#knots-msg')).toContain('1 knot would make the curve one flat value');
    expect((await snap(page)).curve).toEqual(good.curve);
    const distinct = new Set(good.points.map((p) => p.x)).size;
    await setValue(page, '#knots', '500');
    expect(await page.textContent('#knots-msg')).toBe(`Knot count 500 is more than the ${distinct} distinct x values of the rows used: at most ${distinct} knots can each sit on data.`);
    expect(await page.getAttribute('#knots', 'aria-invalid')).toBeNull();
    await setValue(page, '#knots', '4');
    expect(await page.textContent('#knots-msg')).toBe('');
  });

  it('every control is labelled and the fit chart has a text alternative with knot count, direction and r2', async () => {
    expect(await unlabelled(page)).toEqual([]);
    const s = await snap(page);
    const r2 = s.stats.find(([k]) => k === 'r2')![1] as number;
    const label = await page.getAttribute('#fit-chart', 'aria-label');
    expect(label).toBe(`Fit chart: ${s.points.length} points, 4 knots, rising, r2 ${String(Number(r2.toPrecision(4)))}. 95 % confidence band for the curve shaded.`);
    expect(await page.textContent('#fit-chart-summary')).toBe(label);
    // the heat-map table has row and column headers
    await setValue(page, '#knots1', '4');
    await setValue(page, '#knots2', '3');
    expect(await page.$$eval('#heatmap th[scope="col"]', (t) => t.length)).toBeGreaterThanOrEqual(4);
    expect(await page.$$eval('#heatmap th[scope="row"]', (t) => t.length)).toBe(3);
  });

  for (const [width, scheme] of [
    [350, 'light'],
    [350, 'dark'],
    [1280, 'light'],
    [1280, 'dark'],
    // the ends of the task-pane range the layout is made for
    [320, 'light'],
    [400, 'dark'],
  ] as const) {
    it(`at ${width} × 900, ${scheme}: nothing wider than the viewport, no clipped control${width >= 350 ? ', a 10 × 10 heat-map fits' : ''}`, async () => {
      await page.setViewportSize({ width, height: 900 });
      await page.emulateMedia({ colorScheme: scheme });
      await setValue(page, '#knots1', '10');
      await setValue(page, '#knots2', '10');
      // The longest surface direction option, "pick from the data (0)", chosen in both drop-downs.
      await page.selectOption('#direction1', '0');
      await page.selectOption('#direction2', '0');
      await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().surface?.knots1.length === 10);
      // Hardness rises with both inputs in the sample: the status line says which way 0 chose.
      expect(await page.textContent('#surface-status')).toContain('along oven temp °C picked from the data: rising, along dwell min picked from the data: rising');
      await page.waitForTimeout(150); // charts re-size on the next frame
      await saveScreenshot(page, path.join(RESULTS_DIR, `layout-${width}-${scheme}.png`));
      expect(await layoutProblems(page)).toEqual([]);
      // A 10 × 10 heat-map fits from 350 px up (README, "Narrow panes"); narrower, it may scroll inside its own box.
      const heat = await page.$eval('.heat-scroll', (e) => ({ scroll: e.scrollWidth, client: e.clientWidth }));
      if (width >= 350) expect(heat.scroll).toBeLessThanOrEqual(heat.client);
      // the digits rule in the heat-map: at most 4 significant digits
      const texts = await page.$$eval('#heatmap td.heat', (tds) => tds.map((td) => td.textContent!));
      expect(texts.length).toBe(100);
      for (const t of texts) expect(t.replace(/^-?0*\.?0*|[.-]/g, '').length).toBeLessThanOrEqual(4);
    });
  }

  it('the digits control changes what the statistics show (6 digits), and back to 4', async () => {
    const r2 = (await snap(page)).stats.find(([k]) => k === 'r2')![1] as number;
    const shown = async (): Promise<string> => page.$$eval('#stats tr', (trs) => (trs as HTMLTableRowElement[]).find((tr) => tr.cells[0]!.textContent === 'r2')!.cells[1]!.textContent!);
    expect(await shown()).toBe(String(Number(r2.toPrecision(4))));
    await page.selectOption('#digits', '6');
    expect(await shown()).toBe(String(Number(r2.toPrecision(6))));
    await page.selectOption('#digits', '4');
    expect(await shown()).toBe(String(Number(r2.toPrecision(4))));
  });
});
