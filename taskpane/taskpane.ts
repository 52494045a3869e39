/**
 * Entry of the task pane page, which is also the add-in's shared runtime. The page is only ever
 * opened by Office (the browser preview is its own page, preview.html, which never loads
 * office.js): office.js comes first through a static script tag in the page's head, as Office
 * requires; then this entry loads the custom-functions bundle (which registers the RATCHET
 * functions with CustomFunctions.associate — so it must run after office.js) and starts the pane
 * in Excel mode.
 */
/// <reference types="office-js" />
import { App } from './app.js';

async function main(): Promise<void> {
  if (typeof Office === 'undefined') {
    document.getElementById('host')!.textContent =
      "Office's script library is not available: this page is the add-in's page inside Excel. For a preview without Excel, run npm run preview.";
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
