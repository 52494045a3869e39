/**
 * End-to-end specification of the pane's uncertainty features, in Debian's chromium (headless,
 * playwright-core), against the page built with the project's webpack config: the band shaded
 * around the curve (level, kind; none for the classic fit, with its reason), the residual plot,
 * the read-back box, the direction warning and its switch — in the browser preview — and, in
 * Excel mode (office.js replaced by test/e2e/office-stub.js), the insert actions for BAND and
 * INVERTBAND with the overwrite question. Layout at 350 × 900 and 1280 × 900, light and dark, with
 * every new part on screen; screenshots go to test-results/band-*.png.
 *
 * Expected values never come from the page: they are computed in Node through the registry (the
 * implementations the worksheet functions use — RATCHET.BAND, INVERTBAND, FIT, STATS). All data
 * are invented.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { RUN_BROWSER_TESTS, saveScreenshot } from './browser.js';
import { layoutProblems, unlabelled } from './layout-checks.js';
import { RESULTS_DIR, TRIALS, blockPage, invokeRows as invoke, openPreviewPane, openTrialsPane, setValue, snap, usePreviewSite, waitForPoints } from './pane.js';
import type { CellOut } from '../../src/functions/types.js';
import type { Snapshot } from '../../taskpane/app.js';

/**
 * Numbers computed in the page equal those computed in Node to 1e-12 relative: the same code, but
 * Chromium's and Node's engines may round a Math function differently in the last bit.
 */
function expectClose(got: readonly (number | string | null | CellOut)[], want: readonly (number | string | null | CellOut)[]): void {
  expect(got.length).toBe(want.length);
  got.forEach((g, i) => {
    const w = want[i];
    if (typeof g === 'number' && typeof w === 'number') expect(Math.abs(g - w), `${i}: ${g} vs ${w}`).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(w)));
    else expect(g, String(i)).toEqual(w);
  });
}

/** A number as the pane shows it with the default 4 significant digits. */
const four = (v: number): string => String(Number(v.toPrecision(4)));

/** Invented cure data: 24 rows, hours 0…23, hardness rising and levelling off, a deterministic wobble. */
const hours = Array.from({ length: 24 }, (_v, i) => i);
const hardness = hours.map((h, i) => Number((20 + 30 * (1 - Math.exp(-h / 6)) + (((i * 5) % 7) - 3) * 0.6).toFixed(2)));
/** Invented decay data: the same shape, falling. */
const tack = hours.map((h, i) => Number((50 - 30 * (1 - Math.exp(-h / 6)) + (((i * 3) % 5) - 2) * 0.7).toFixed(2)));
const csv = (ys: readonly number[]): string => `hours,value\r\n${hours.map((h, i) => `${h},${ys[i]}`).join('\r\n')}\r\n`;
const col = (v: readonly number[]): number[][] => v.map((q) => [q]);

const site = usePreviewSite();

describe.skipIf(!RUN_BROWSER_TESTS)('pane: band, residuals, read-back and direction warning (browser preview)', () => {
  const problems: string[] = [];
  const page = blockPage(() => openPreviewPane(site, { viewport: { width: 900, height: 1400 }, problems }), 90_000);

  beforeAll(async () => {
    await page.setInputFiles('#file', { name: 'cure.csv', mimeType: 'text/csv', buffer: Buffer.from(csv(hardness)) });
    await waitForPoints(page, 24);
  }, 60_000);

  it('shades the 95 % confidence band of RATCHET.BAND around a 5-knot curve, over the data’s x range, and names it in the text alternative', async () => {
    await setValue(page, '#knots', '5');
    const s = await snap(page);
    expect(s.band).not.toBeNull();
    const b = s.band!;
    expect([b.label, b.level, b.kind]).toEqual(['95 % confidence band', 0.95, 1]);
    const xs = b.upper.map((p) => p.x);
    expect([xs[0], xs[xs.length - 1]]).toEqual([0, 23]);
    const ref = invoke('BAND', [col(xs), col(hardness), col(hours), 5, 1, undefined, 0.95, 1]);
    expectClose(b.upper.map((p) => p.y), ref.map((r) => r[2]!));
    expectClose(b.lower.map((p) => p.y), ref.map((r) => r[0]!));
    // the knots are on the grid, where the band's edges have corners
    for (const k of s.knots) expect(xs).toContain(k.x);
    expect(await page.getAttribute('#fit-chart', 'aria-label')).toMatch(/^Fit chart: 24 points, 5 knots, rising, r2 [0-9.]+\. 95 % confidence band for the curve shaded\.$/);
    // the caution under the band when the fit joined knots into flat stretches (STATS levels < knots)
    const stats = invoke('STATS', [col(hardness), col(hours), 5, 1]);
    const levels = stats.find((r) => r[0] === 'levels')![1] as number;
    expect(s.bandNote).toBe(
      levels < 5 ? `The curve has flat stretches (5 knots at ${levels} distinct value${levels === 1 ? '' : 's'}): the band treats them as known and is optimistic near them (README “Cautions for bands”).` : '',
    );
    expect(s.formulas.BAND).toBe('=RATCHET.BAND(cure!$A$2:$A$25,cure!$B$2:$B$25,cure!$A$2:$A$25,5,1,,0.95,1)');
  });

  it('the kind and level controls change the band: 80 % prediction band equals RATCHET.BAND with level 0.8, kind 2', async () => {
    await page.selectOption('#band-kind', '2');
    await setValue(page, '#band-level', '0.8');
    const s = await snap(page);
    const b = s.band!;
    expect(b.label).toBe('80 % prediction band');
    const xs = b.upper.map((p) => p.x);
    const ref = invoke('BAND', [col(xs), col(hardness), col(hours), 5, 1, undefined, 0.8, 2]);
    expectClose(b.upper.map((p) => p.y), ref.map((r) => r[2]!));
    expectClose(b.lower.map((p) => p.y), ref.map((r) => r[0]!));
    expect(await page.getAttribute('#fit-chart', 'aria-label')).toContain('80 % prediction band for one new observation shaded.');
    expect(s.formulas.BAND).toBe('=RATCHET.BAND(cure!$A$2:$A$25,cure!$B$2:$B$25,cure!$A$2:$A$25,5,1,,0.8,2)');
  });

  it('a level outside (0, 1) is refused at its field with BAND’s message, and no band is drawn until it is fixed', async () => {
    await setValue(page, '#band-level', '1.5');
    expect(await page.textContent('#band-level-msg')).toBe('#VALUE! level: needs a number strictly between 0 and 1; got 1.5.');
    expect(await page.getAttribute('#band-level', 'aria-invalid')).toBe('true');
    const s = await snap(page);
    expect(s.band).toBeNull();
    expect(s.bandNote).toBe('No band until the level is a number strictly between 0 and 1 (for example 0.95).');
    expect(s.formulas.BAND).toBeUndefined();
    await setValue(page, '#band-level', '0.95');
    await page.selectOption('#band-kind', '1');
    expect((await snap(page)).band?.label).toBe('95 % confidence band');
    expect(await page.getAttribute('#band-level', 'aria-invalid')).toBeNull();
  });

  it('the classic fit (knots 0) has no band: the controls are disabled and one line says why', async () => {
    await setValue(page, '#knots', '0');
    const s = await snap(page);
    expect(s.band).toBeNull();
    expect(s.bandNote).toBe('No band for the classic fit (knot count 0): its pointwise bands would be wrong (README “Cautions for bands”). Set 2 or more knots for a band and a read-back interval.');
    expect(await page.textContent('#band-note')).toBe(s.bandNote);
    expect(await page.isDisabled('#band-level')).toBe(true);
    expect(await page.isDisabled('#band-kind')).toBe(true);
    expect(await page.getAttribute('#fit-chart', 'aria-label')).toMatch(/No band for the classic fit\.$/);
    expect(s.formulas.BAND).toBeUndefined();
    await setValue(page, '#knots', '5');
    expect(await page.isDisabled('#band-level')).toBe(false);
    expect((await snap(page)).band).not.toBeNull();
  });

  it('a concave band carries curvature -1; the smooth curve (degree 2) has its band: RATCHET.BAND with degree 2, controls enabled', async () => {
    await page.selectOption('#curvature', '-1');
    let s = await snap(page);
    const xs = s.band!.upper.map((p) => p.x);
    const ref = invoke('BAND', [col(xs), col(hardness), col(hours), 5, 1, undefined, 0.95, 1, -1]);
    expectClose(s.band!.upper.map((p) => p.y), ref.map((r) => r[2]!));
    expect(s.formulas.BAND).toBe('=RATCHET.BAND(cure!$A$2:$A$25,cure!$B$2:$B$25,cure!$A$2:$A$25,5,1,,0.95,1,-1)');
    await page.selectOption('#curvature', '0');
    await page.selectOption('#degree', '2');
    s = await snap(page);
    expect(s.band).not.toBeNull();
    const xs2 = s.band!.upper.map((p) => p.x);
    const ref2 = invoke('BAND', [col(xs2), col(hardness), col(hours), 5, 1, undefined, 0.95, 1, undefined, 2]);
    expectClose(s.band!.upper.map((p) => p.y), ref2.map((r) => r[2]!));
    expectClose(s.band!.lower.map((p) => p.y), ref2.map((r) => r[0]!));
    expect(await page.isDisabled('#band-level')).toBe(false);
    expect(await page.isDisabled('#band-kind')).toBe(false);
    expect(s.formulas.BAND).toBe('=RATCHET.BAND(cure!$A$2:$A$25,cure!$B$2:$B$25,cure!$A$2:$A$25,5,1,,0.95,1,,2)');
    await page.selectOption('#degree', '1');
    expect((await snap(page)).band).not.toBeNull();
    expect(await page.isDisabled('#band-level')).toBe(false);
  });

  it('draws the residuals y − RATCHET.FIT against x under the fit chart, with a zero line and a text alternative', async () => {
    const s = await snap(page);
    const fitted = invoke('FIT', [col(hardness), col(hours), 5, 1]).map((r) => r[0] as number);
    expect(s.residuals.map((p) => p.x)).toEqual(hours);
    expectClose(s.residuals.map((p) => p.y), hours.map((_h, i) => hardness[i]! - fitted[i]!));
    const res = s.residuals.map((p) => p.y);
    const summary = `Residual plot: 24 residuals (y − fitted) against x, from ${four(Math.min(...res))} to ${four(Math.max(...res))}; dashed zero line.`;
    expect(await page.getAttribute('#residual-chart', 'aria-label')).toBe(summary);
    expect(await page.textContent('#residual-chart-summary')).toBe(summary);
    expect(s.residualZero).toEqual([{ x: 0, y: 0 }, { x: 23, y: 0 }]);
    expect((await page.$eval('#residual-chart', (c) => c.getBoundingClientRect().height))).toBeGreaterThan(100);
  });

  it('reads back a target y: the x and its interval equal RATCHET.INVERTBAND, to the digits shown', async () => {
    await setValue(page, '#readback-target', '40');
    const s = await snap(page);
    const ref = invoke('INVERTBAND', [[[40]], col(hardness), col(hours), 5, 1, undefined, 0.95, 1])[0]!;
    expect(ref.every((v) => typeof v === 'number')).toBe(true); // this target has a two-sided interval
    expectClose(s.readback.values, ref);
    expect(s.readback.cells).toEqual(ref.map((v) => four(v as number)));
    expect(s.readback.status).toBe(`At 95 % for one reading (RATCHET.INVERTBAND): x = ${four(ref[1] as number)}, from ${four(ref[0] as number)} to ${four(ref[2] as number)}.`);
    expect(s.formulas.INVERTBAND).toBe('=RATCHET.INVERTBAND(40,cure!$B$2:$B$25,cure!$A$2:$A$25,5,1,,0.95,1)');
    // 6 digits shown
    await page.selectOption('#digits', '6');
    expect((await snap(page)).readback.cells).toEqual(ref.map((v) => String(Number((v as number).toPrecision(6)))));
    await page.selectOption('#digits', '4');
    // the mean of 4 readings: a narrower interval, as INVERTBAND computes it
    await setValue(page, '#readback-replicates', '4');
    const four4 = invoke('INVERTBAND', [[[40]], col(hardness), col(hours), 5, 1, undefined, 0.95, 4])[0]!;
    expectClose((await snap(page)).readback.values, four4);
    expect((await snap(page)).readback.status).toMatch(/^At 95 % for the mean of 4 readings/);
    await setValue(page, '#readback-replicates', '1');
  });

  it('says so when a limit is not reached inside the data, and when the target is outside the curve’s range', async () => {
    const table = invoke('KNOTS', [col(hardness), col(hours), 5, 1]);
    const low = (table[0]![1] as number) + 0.3;
    const ref = invoke('INVERTBAND', [[[low]], col(hardness), col(hours), 5, 1, undefined, 0.95, 1])[0]!;
    expect(typeof ref[0]).toBe('object'); // precondition: the lower limit is not reached on these data
    expect(typeof ref[1]).toBe('number');
    await setValue(page, '#readback-target', String(low));
    let s = await snap(page);
    expectClose(s.readback.values, ['#N/A', ref[1]!, typeof ref[2] === 'number' ? ref[2] : '#N/A']);
    expect(s.readback.cells[0]).toBe('not reached');
    expect(s.readback.status).toContain(`Lower x: not reached — even at the smallest x of the data (0) the band still contains ${four(low)}, so the interval reaches beyond the data on that side.`);
    await setValue(page, '#readback-target', '1000');
    s = await snap(page);
    const ys = table.map((r) => r[1] as number);
    expect(s.readback.cells).toEqual(['—', '—', '—']);
    expect(s.readback.status).toBe(`Target 1000 is outside the curve’s range, from ${four(Math.min(...ys))} to ${four(Math.max(...ys))}: no x on the curve gives it.`);
    expect(await page.getAttribute('#readback-status', 'class')).toContain('error');
    await setValue(page, '#readback-target', 'forty');
    expect(await page.textContent('#readback-target-msg')).toBe('#VALUE! target_ys: needs numbers or blanks; cell 1 is the text "forty".');
  });

  it('the classic fit reads back with RATCHET.INVERT and says there is no interval', async () => {
    await setValue(page, '#knots', '0');
    await setValue(page, '#readback-target', '40');
    const s = await snap(page);
    const table = invoke('KNOTS', [col(hardness), col(hours), 0, 1]);
    const x = invoke('INVERT', [[[40]], table])[0]![0] as number;
    expectClose(s.readback.values, [null, x, null]);
    expect(s.readback.cells).toEqual(['—', four(x), '—']);
    expect(s.readback.status).toBe(`The curve reaches 40 at x = ${four(x)} (RATCHET.INVERT). No interval for the classic fit (knot count 0): set 2 or more knots (README “Cautions for bands”).`);
    expect(await page.isDisabled('#readback-replicates')).toBe(true);
    expect(s.formulas.INVERTBAND).toBeUndefined();
  });

  it('warns when falling data are fitted rising (role alert), and the switch refits falling in one click', async () => {
    await page.setInputFiles('#file', { name: 'tack.csv', mimeType: 'text/csv', buffer: Buffer.from(csv(tack)) });
    await page.waitForFunction(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length === 24);
    await setValue(page, '#knots', '5');
    let s = await snap(page);
    expect(await page.isVisible('#direction-warning')).toBe(true);
    expect(await page.getAttribute('#direction-warning', 'role')).toBe('alert');
    const rho = invoke('STATS', [col(tack), col(hours), 5, 1]).find((r) => r[0] === 'spearman')![1] as number;
    expect(s.directionWarning).toEqual({
      text: `y falls as x rises (Spearman’s rank correlation ${four(rho)}, 24 rows), but the fit is rising: a rising curve through falling data comes out flat. Fit it falling instead?`,
      suggested: 'down',
      spearman: s.directionWarning!.spearman,
      n: 24,
    });
    expectClose([s.directionWarning!.spearman], [rho]);
    expect(await page.textContent('#direction-switch')).toBe('Switch to falling and refit');
    // fitted rising, the falling data give one flat level: the band's caution says so
    expect(s.bandNote).toBe('The curve has flat stretches (5 knots at 1 distinct value): the band treats them as known and is optimistic near them (README “Cautions for bands”).');
    await page.click('#direction-switch');
    s = await snap(page);
    expect(await page.inputValue('#direction')).toBe('-1');
    expect(await page.isVisible('#direction-warning')).toBe(false);
    expect(s.directionWarning).toBeNull();
    const stats = invoke('STATS', [col(tack), col(hours), 5, -1]);
    expect(s.stats.map((r) => r[0])).toEqual(stats.map((r) => r[0]));
    expectClose(s.stats.map((r) => r[1] as number), stats.map((r) => r[1]!));
    expect(s.formulas.KNOTS).toBe('=RATCHET.KNOTS(tack!$B$2:$B$25,tack!$A$2:$A$25,5,-1)');
    expect(await page.evaluate(() => document.activeElement?.id)).toBe('direction');
  });

  for (const [width, scheme] of [
    [350, 'light'],
    [350, 'dark'],
    [1280, 'light'],
    [1280, 'dark'],
  ] as const) {
    it(`at ${width} × 900, ${scheme}: band, residual plot, read-back messages and the direction warning fit without clipping`, async () => {
      await page.selectOption('#direction', '1');
      await page.dispatchEvent('#direction', 'change');
      await setValue(page, '#knots', '5');
      await setValue(page, '#readback-target', '30');
      await page.setViewportSize({ width, height: 900 });
      await page.emulateMedia({ colorScheme: scheme });
      await page.waitForTimeout(150); // charts re-size on the next frame
      expect(await page.isVisible('#direction-warning')).toBe(true);
      expect((await snap(page)).band).not.toBeNull();
      fs.mkdirSync(RESULTS_DIR, { recursive: true });
      await saveScreenshot(page, path.join(RESULTS_DIR, `band-${width}-${scheme}.png`));
      expect(await layoutProblems(page)).toEqual([]);
      expect(await unlabelled(page)).toEqual([]);
    });
  }

  it('logs no console problem', () => {
    expect(problems).toEqual([]);
  });
});

/** Excel mode with office.js replaced by the stand-in (test/e2e/office-stub.js). */
describe.skipIf(!RUN_BROWSER_TESTS)('pane: inserting BAND and INVERTBAND in Excel mode (office.js stand-in)', () => {
  const problems: string[] = [];
  // The dose-response rows, and three read-back targets in D2:D4.
  const page = blockPage(() => openTrialsPane(site, { viewport: { width: 700, height: 1600 }, problems, ...TRIALS, cells: [4, 6, 8].map((v, i) => ['Trials', `D${i + 2}`, v] as const) }), 60_000);

  beforeAll(async () => {
    await setValue(page, '#knots', '4');
  }, 60_000);

  const cellsOf = (sheet: string): Promise<Record<string, { value: unknown; formula?: string }>> =>
    page.evaluate((sh) => (window as unknown as { __excelStub: { cellsOf(s: string): Record<string, { value: unknown; formula?: string }> } }).__excelStub.cellsOf(sh), sheet);
  const status = (): Promise<string> => page.textContent('#insert-status').then((t) => t ?? '');

  it('"Insert BAND" writes the live RATCHET.BAND formula (the x range as new_xs) at the target cell', async () => {
    await page.fill('#target', 'Trials!H2');
    await page.click('[data-insert="BAND"]');
    await page.waitForFunction(() => /^Inserted /.test(document.getElementById('insert-status')?.textContent ?? ''));
    const c = await cellsOf('Trials');
    expect(c.H2?.formula).toBe('=RATCHET.BAND(Trials!$A$2:$A$13,Trials!$B$2:$B$13,Trials!$A$2:$A$13,4,1,,0.95,1)');
    expect(c.H2?.formula).toBe((await snap(page)).formulas.BAND);
  });

  it('"Insert INVERTBAND" writes the read-back target, or a target_ys range with its 3 × 3 spill area checked', async () => {
    await setValue(page, '#readback-target', '5');
    await page.fill('#target', 'Trials!L2');
    await page.click('[data-insert="INVERTBAND"]');
    await page.waitForFunction(() => /^Inserted /.test(document.getElementById('insert-status')?.textContent ?? ''));
    expect((await cellsOf('Trials')).L2?.formula).toBe('=RATCHET.INVERTBAND(5,Trials!$B$2:$B$13,Trials!$A$2:$A$13,4,1,,0.95,1)');
    // a range of targets: the result spills 3 rows × 3 columns; a value in the third row is listed first
    await setValue(page, '#addr-targets', 'Trials!D2:D4');
    await page.evaluate(() => (window as unknown as { __excelStub: { set(sh: string, a: string, v: unknown): void } }).__excelStub.set('Trials', 'R4', 'note'));
    await page.fill('#target', 'Trials!P2');
    await page.click('[data-insert="INVERTBAND"]');
    await page.waitForSelector('#confirm:not([hidden])');
    expect(await page.textContent('#confirm-text')).toBe('The result needs 3 × 3 cells (Trials!P2:R4), but 1 is not empty: R4. Overwrite it?');
    await page.click('#confirm-no');
    await page.waitForFunction(() => /^Nothing was written/.test(document.getElementById('insert-status')?.textContent ?? ''));
    let c = await cellsOf('Trials');
    expect([c.P2, c.R4?.value]).toEqual([undefined, 'note']);
    await page.click('[data-insert="INVERTBAND"]');
    await page.waitForSelector('#confirm:not([hidden])');
    await page.click('#confirm-yes');
    await page.waitForFunction(() => /^Inserted /.test(document.getElementById('insert-status')?.textContent ?? ''));
    c = await cellsOf('Trials');
    expect(c.P2?.formula).toBe('=RATCHET.INVERTBAND(Trials!$D$2:$D$4,Trials!$B$2:$B$13,Trials!$A$2:$A$13,4,1,,0.95,1)');
    expect(c.R4).toBeUndefined();
    await setValue(page, '#addr-targets', '');
  });

  for (const scheme of ['light', 'dark'] as const) {
    it(`at 350 × 900, ${scheme}, in Excel mode: the insert section with BAND, INVERTBAND and target_ys fits without clipping`, async () => {
      await page.setViewportSize({ width: 350, height: 900 });
      await page.emulateMedia({ colorScheme: scheme });
      await page.waitForTimeout(150);
      expect(await page.isVisible('[data-insert="INVERTBAND"]')).toBe(true);
      expect(await layoutProblems(page)).toEqual([]);
      expect(await unlabelled(page)).toEqual([]);
      fs.mkdirSync(RESULTS_DIR, { recursive: true });
      await saveScreenshot(page, path.join(RESULTS_DIR, `band-office-350-${scheme}.png`));
      await page.setViewportSize({ width: 700, height: 1600 });
    });
  }

  it('refuses a BAND result over the data it reads, and explains why the classic fit has no BAND to insert', async () => {
    await page.fill('#target', 'Trials!B5');
    await page.click('[data-insert="BAND"]');
    await page.waitForFunction(() => /overlap/.test(document.getElementById('insert-status')?.textContent ?? ''));
    expect(await status()).toMatch(/^The result \(Trials!B5:D16\) would overlap the data it reads/);
    await setValue(page, '#knots', '0');
    await page.fill('#target', 'Trials!H30');
    await page.click('[data-insert="BAND"]');
    await page.waitForFunction(() => /knot model/.test(document.getElementById('insert-status')?.textContent ?? ''));
    expect(await status()).toBe('BAND needs the knot model: set the knot count to 2 or more (the classic fit has no band).');
    expect((await cellsOf('Trials')).H30).toBeUndefined();
    expect(problems).toEqual([]);
  });
});
