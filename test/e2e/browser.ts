/**
 * Where the browser tests find their browser, and whether they run.
 *
 * The browser is Debian's chromium at /usr/bin/chromium, or the executable named by the
 * environment variable RATCHET_BROWSER. When it is missing the browser tests are skipped with one
 * notice (printed by test/global-setup.ts), except under CI=true, where a missing browser fails
 * the run so that CI never skips them silently.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

/** The Chromium executable the browser tests drive. */
export const BROWSER_PATH = process.env.RATCHET_BROWSER || '/usr/bin/chromium';

/** True when BROWSER_PATH is an executable file. */
export function browserAvailable(file: string = BROWSER_PATH): boolean {
  try {
    const st = fs.statSync(file);
    if (!st.isFile()) return false;
    fs.accessSync(file, fs.constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

/** True when the browser tests run: the browser exists (under CI a missing one fails in global setup). */
export const RUN_BROWSER_TESTS = browserAvailable();

/** Launch flags for headless Chromium on a closed network (no background traffic, no sandbox as root). */
export const BROWSER_ARGS: readonly string[] = Object.freeze([
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
]);

/** The one line printed when the browser tests are skipped. */
export function skipNotice(file: string = BROWSER_PATH): string {
  return `Browser tests skipped: no Chromium executable at ${file}. Install one (Debian: apt-get install chromium) or set RATCHET_BROWSER to its path to run them.`;
}

/** Options of {@link openBrowserPage}. */
export interface BrowserPageOptions {
  readonly viewport: { readonly width: number; readonly height: number };
  /** Console errors, CSP reports and page errors are pushed here (default: not collected). */
  readonly problems?: string[];
  /** Every request URL is pushed here (default: not collected). */
  readonly requests?: string[];
  /** Serve this text in place of office.js (the stand-in of test/e2e/office-stub.js). */
  readonly officeStub?: string;
  /** Let the page download files (default false). */
  readonly acceptDownloads?: boolean;
}

/** A headless Chromium with a fresh profile, its first page, and `close`, which removes the profile. */
export interface BrowserPage {
  readonly context: BrowserContext;
  readonly page: Page;
  close(): Promise<void>;
}

/**
 * Starts BROWSER_PATH headless with BROWSER_ARGS and a fresh user-data-dir in a temporary folder,
 * wired as the options say; the browser tests' one way to open a page.
 */
export async function openBrowserPage(options: BrowserPageOptions): Promise<BrowserPage> {
  const userDataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'ratchet-chromium-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: BROWSER_PATH,
    headless: true,
    args: [...BROWSER_ARGS],
    acceptDownloads: options.acceptDownloads ?? false,
    viewport: { ...options.viewport },
  });
  const stub = options.officeStub;
  if (stub !== undefined) await context.route('https://appsforoffice.microsoft.com/**', (route) => route.fulfill({ status: 200, contentType: 'text/javascript', body: stub }));
  const requests = options.requests;
  if (requests) context.on('request', (r) => requests.push(r.url()));
  const page = context.pages()[0] ?? (await context.newPage());
  const problems = options.problems;
  if (problems) {
    page.on('console', (m) => {
      if (m.type() === 'error' || /Content Security Policy/i.test(m.text())) problems.push(`console ${m.type()}: ${m.text()}`);
    });
    page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
  }
  return {
    context,
    page,
    async close() {
      await context.close();
      fs.rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/** Options of {@link openExcelModePane}. */
export interface ExcelModePaneOptions {
  /** Where the preview server serves the built pane (ends with "/"). */
  readonly baseUrl: string;
  readonly viewport: { readonly width: number; readonly height: number };
  /** Console errors, CSP reports and page errors are pushed here. */
  readonly problems: string[];
  /** Cells the office.js stand-in's workbook holds before the test: [sheet, address, value]. */
  readonly cells: readonly (readonly [string, string, string | number])[];
}

/**
 * Opens the task pane in Excel mode: office.js replaced by the stand-in of
 * test/e2e/office-stub.js, the page loaded with an Excel host in its query, waited for until it
 * says it runs in Excel, and the stand-in's workbook filled with `cells`. The browser tests' one
 * way into Excel mode.
 */
export async function openExcelModePane(options: ExcelModePaneOptions): Promise<BrowserPage> {
  const officeStub = fs.readFileSync(path.join(import.meta.dirname, 'office-stub.js'), 'utf8');
  const browser = await openBrowserPage({ viewport: options.viewport, officeStub, problems: options.problems });
  const { page } = browser;
  await page.goto(`${options.baseUrl}taskpane.html?_host_Info=Excel$Win32$16.01$en-US$$$$0`);
  await page.waitForFunction(() => document.getElementById('host')?.textContent?.startsWith('Running in Excel'));
  await page.evaluate((cells) => {
    const s = (window as unknown as { __excelStub: { set(sh: string, a: string, v: unknown): void } }).__excelStub;
    for (const [sheet, address, value] of cells) s.set(sheet, address, value);
  }, options.cells);
  return browser;
}

/**
 * Saves a full-page screenshot of `page` to `file` for a person to look at after a layout change
 * (DEVELOPERS.md). The picture is not a check, so a capture that Chromium does not finish within
 * 10 s (seen on a loaded 2-core machine, where a full-page capture at 320 px once hung for 30 s
 * and the tests after it timed out) is reported on stderr and skipped instead of failing the test.
 */
export async function saveScreenshot(page: Page, file: string): Promise<void> {
  fs.mkdirSync(path.dirname(file), { recursive: true });
  try {
    await page.screenshot({ path: file, fullPage: true, timeout: 10_000 });
  } catch (e) {
    process.stderr.write(`screenshot ${path.basename(file)} skipped: ${(e as Error).message.split('\n')[0]}\n`);
  }
}
