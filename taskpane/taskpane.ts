/**
 * Entry of the task pane page, which is also the add-in's shared runtime: when the page is hosted
 * in Office it loads office.js, then the custom-functions bundle (which registers the RATCHET
 * functions with CustomFunctions.associate — so it must run after office.js), then starts the
 * pane in Excel mode. Opened in a plain browser it never requests office.js and runs as the
 * preview instead.
 */
/// <reference types="office-js" />
import { App } from './app.js';
import { OFFICE_JS, isOfficeHosted, loadScript } from './host.js';

async function main(): Promise<void> {
  if (!isOfficeHosted(window as unknown as Parameters<typeof isOfficeHosted>[0])) {
    const { PreviewData } = await import(/* webpackChunkName: "preview-mode" */ './preview-mode.js');
    new PreviewData(new App('preview'));
    return;
  }
  try {
    await loadScript(OFFICE_JS);
  } catch (e) {
    document.getElementById('host')!.textContent = `Office's script library could not be loaded (${e instanceof Error ? e.message : String(e)}). The add-in needs it to talk to Excel.`;
    return;
  }
  // Shared runtime: the RATCHET functions live in this page too.
  await import(/* webpackChunkName: "functions-runtime" */ '../src/functions/functions.js');
  const info = await Office.onReady();
  const app = new App('office');
  if (info.host !== Office.HostType.Excel) {
    app.setHostText(`This add-in works in Excel; this host is ${String(info.host ?? 'unknown')}.`);
    return;
  }
  const { OfficeData } = await import(/* webpackChunkName: "office-mode" */ './office-mode.js');
  new OfficeData(app);
}

void main();
