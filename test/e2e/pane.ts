/**
 * Driving the task pane in the browser tests: the preview build they load, the ways into the
 * browser preview and into Excel mode on a sheet of invented data, the pane's test hook
 * (`window.__ratchetTest`), its fields, and the worksheet functions (through the registry, the
 * implementations the worksheet functions use) that the expected values come from.
 *
 * A browser test file serves one preview site for all its describe blocks (`usePreviewSite`, at
 * the top level of the file); each block opens its own page (`blockPage`).
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll } from 'vitest';
import type { Page } from 'playwright-core';
import { RUN_BROWSER_TESTS, openBrowserPage, openExcelModePane, type BrowserPage, type BrowserPageOptions, type ExcelModePaneOptions } from './browser.js';
import { buildPreview, startPreviewServer } from '../../taskpane/preview-server.js';
import { functionByName } from '../../src/functions/registry.js';
import type { CellArg, CellOut, CellResult } from '../../src/functions/types.js';
import type { Snapshot } from '../../taskpane/app.js';

/** The repository's root folder. */
export const REPO_ROOT = path.resolve(import.meta.dirname, '../..');

/** Where the browser tests save their screenshots, for a person to look at: test-results/ at the root. */
export const RESULTS_DIR = path.join(REPO_ROOT, 'test-results');

/** The preview and task pane pages built by the project's webpack config, served on 127.0.0.1. */
export interface PreviewSite {
  /** The server's address, ending with "/"; read it in a hook or a test, once the site is up. */
  readonly url: string;
}

/** Builds the preview and task pane pages (the fast development build) into a temporary folder and serves them on a free port. */
async function startPreviewSite(): Promise<PreviewSite & { close(): Promise<void> }> {
  const dir = await buildPreview(undefined, true, ['preview', 'taskpane']);
  const remove = (): void => fs.rmSync(dir, { recursive: true, force: true });
  try {
    const server = await startPreviewServer(dir, 0);
    return {
      url: server.url,
      async close() {
        await server.close();
        remove();
      },
    };
  } catch (e) {
    remove();
    throw e;
  }
}

/**
 * The preview site of one test file, for all its describe blocks: when the browser tests run,
 * registers a file-level `beforeAll` that builds and serves it (up to 90 s) and an `afterAll` that
 * stops the server and removes the build. Call it once, at the top level of the file. Reading
 * `url` before the site is up throws "the preview build did not run".
 */
export function usePreviewSite(): PreviewSite {
  let site: (PreviewSite & { close(): Promise<void> }) | undefined;
  if (RUN_BROWSER_TESTS) {
    beforeAll(async () => {
      site = await startPreviewSite();
    }, 90_000);
    afterAll(async () => {
      await site?.close();
    });
  }
  return {
    get url(): string {
      if (!site) throw new Error('the preview build did not run');
      return site.url;
    },
  };
}

/**
 * The page of the enclosing describe block's tests: registers a `beforeAll` (up to `timeout` ms)
 * that opens it with `open`, and an `afterAll` that closes its browser. Returns a stand-in that
 * forwards every property to the open page (methods bound to it), so that the block's tests and
 * later hooks use it as the page itself; used before the page is open, it throws. Hooks registered
 * after this call run after the page is open.
 */
export function blockPage(open: () => Promise<BrowserPage>, timeout: number): Page {
  let browser: BrowserPage | undefined;
  beforeAll(async () => {
    browser = await open();
  }, timeout);
  afterAll(async () => {
    await browser?.close();
  });
  return new Proxy({} as Page, {
    get(_target, key) {
      if (!browser) throw new Error('the page of this describe block is not open (it opens in beforeAll)');
      const value: unknown = Reflect.get(browser.page, key);
      return typeof value === 'function' ? (value as (...a: unknown[]) => unknown).bind(browser.page) : value;
    },
  });
}

/**
 * Opens the browser preview of `site` in a fresh browser (`options` as for `openBrowserPage`)
 * and waits until its sample list is filled. The caller closes the browser.
 */
export async function openPreviewPane(site: PreviewSite, options: BrowserPageOptions): Promise<BrowserPage> {
  const browser = await openBrowserPage(options);
  try {
    await browser.page.goto(site.url);
    await browser.page.waitForFunction(() => (document.getElementById('sample') as HTMLSelectElement | null)?.options.length === 5);
    return browser;
  } catch (e) {
    await browser.close();
    throw e;
  }
}

/** Invented data of the Excel-mode tests: 12 rows of dose (x) and response (y). */
export const TRIALS: { readonly x: readonly number[]; readonly y: readonly number[] } = Object.freeze({
  x: Object.freeze([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]),
  y: Object.freeze([2.1, 2.0, 3.4, 3.1, 4.8, 5.5, 5.2, 6.9, 7.4, 7.1, 8.8, 9.0]),
});

/** Options of {@link openTrialsPane}. */
export interface TrialsPaneOptions extends Pick<ExcelModePaneOptions, 'viewport' | 'problems'> {
  /** x values, written to Trials!A2 downwards. */
  readonly x: readonly number[];
  /** y values (as many as x), written to Trials!B2 downwards. */
  readonly y: readonly number[];
  /** Column headers written to Trials!A1 and B1 first (default: none). */
  readonly headers?: readonly [string, string];
  /** More cells of the workbook, written after the data: [sheet, address, value] (default: none). */
  readonly cells?: ExcelModePaneOptions['cells'];
}

/**
 * Opens the pane of `site` in Excel mode (`openExcelModePane`) on sheet "Trials" holding `x` in
 * column A and `y` in column B from row 2, types those ranges into the x and y address fields and
 * waits until the chart holds every row. The caller closes the browser.
 */
export async function openTrialsPane(site: PreviewSite, options: TrialsPaneOptions): Promise<BrowserPage> {
  const { x, y } = options;
  const last = x.length + 1;
  const browser = await openExcelModePane({
    baseUrl: site.url,
    viewport: options.viewport,
    problems: options.problems,
    cells: [
      ...(options.headers ? [['Trials', 'A1', options.headers[0]] as const, ['Trials', 'B1', options.headers[1]] as const] : []),
      ...x.map((v, i) => ['Trials', `A${i + 2}`, v] as const),
      ...y.map((v, i) => ['Trials', `B${i + 2}`, v] as const),
      ...(options.cells ?? []),
    ],
  });
  try {
    await setValue(browser.page, '#addr-x', `Trials!A2:A${last}`);
    await setValue(browser.page, '#addr-y', `Trials!B2:B${last}`);
    await waitForPoints(browser.page, x.length);
    return browser;
  } catch (e) {
    await browser.close();
    throw e;
  }
}

/** The pane's state now, from its test hook. */
export async function snap(page: Page): Promise<Snapshot> {
  return page.evaluate(() => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot());
}

/** Types `value` into the field `selector` and fires its change event, as leaving the field does. */
export async function setValue(page: Page, selector: string, value: string): Promise<void> {
  await page.fill(selector, value);
  await page.dispatchEvent(selector, 'change');
}

/** Waits until the fit chart holds `n` data points. */
export async function waitForPoints(page: Page, n: number): Promise<void> {
  await page.waitForFunction((k) => (window as unknown as { __ratchetTest: { snapshot(): Snapshot } }).__ratchetTest.snapshot().points.length === k, n);
}

/**
 * The result of worksheet function `name` (as registered, e.g. "KNOTS") on `args` in the order
 * users type them; throws what the function throws.
 * @example invoke('KNOTS', [[[1], [3]], [[1], [2]], 0, 1]) // → [[1, 1], [2, 3]]
 */
export function invoke(name: string, args: CellArg[]): CellResult {
  return functionByName(name)!.invoke(args);
}

/** {@link invoke} as rows: a single value becomes a 1 × 1 table. */
export function invokeRows(name: string, args: CellArg[]): CellOut[][] {
  const r = invoke(name, args);
  return Array.isArray(r) ? r : [[r]];
}
