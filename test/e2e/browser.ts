/**
 * Where the browser tests find their browser, and whether they run.
 *
 * The browser is Debian's chromium at /usr/bin/chromium, or the executable named by the
 * environment variable RATCHET_BROWSER. When it is missing the browser tests are skipped with one
 * notice (printed by test/global-setup.ts), except under CI=true, where a missing browser fails
 * the run so that CI never skips them silently.
 */
import fs from 'node:fs';

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
