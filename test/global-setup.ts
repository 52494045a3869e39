/**
 * Runs once before the test files: decides about the browser tests (see test/e2e/browser.ts).
 * Missing browser: one notice and the browser tests skip; under CI=true the run fails instead.
 */
import { BROWSER_PATH, browserAvailable, skipNotice } from './e2e/browser.js';

export default function setup(): void {
  if (browserAvailable()) return;
  if (process.env.CI === 'true') {
    throw new Error(`CI=true and no Chromium executable at ${BROWSER_PATH}: the browser tests must run in CI (install chromium, or set RATCHET_BROWSER).`);
  }
  console.log(skipNotice());
}
