/**
 * Is this page hosted in Office? Decided before office.js is requested, so the browser preview
 * (and this page opened in a plain browser) never loads anything from outside localhost.
 *
 * Office opens an add-in page with a `_host_Info` query parameter (Excel on Windows, Mac and the
 * web); office.js keeps it in sessionStorage (`hostInfoValue`) for later navigations, and the
 * web host also passes it in `window.name`. Desktop hosts expose their bridge objects
 * (WebView2's `chrome.webview`, WKWebView's `webkit.messageHandlers.Office`, the legacy
 * `external.GetContext`). Any one of these counts (common practice of Office add-in loaders).
 */

/** The parts of `window` the check reads (so tests can pass a plain object). */
export interface HostWindow {
  readonly location: { readonly search: string };
  readonly name?: string;
  readonly sessionStorage?: { getItem(key: string): string | null };
  readonly chrome?: unknown;
  readonly webkit?: unknown;
  readonly external?: unknown;
}

/** URL of office.js on Office's CDN (the only place it is served from). */
export const OFFICE_JS = 'https://appsforoffice.microsoft.com/lib/1/hosted/office.js';

/** True when the page runs inside an Office host. Never throws. */
export function isOfficeHosted(w: HostWindow): boolean {
  try {
    if (new URLSearchParams(w.location.search).has('_host_Info')) return true;
    if (w.sessionStorage?.getItem('hostInfoValue')) return true;
    if (typeof w.name === 'string' && /host_?info/i.test(w.name)) return true;
    const chrome = w.chrome as { webview?: unknown } | undefined;
    if (chrome && typeof chrome === 'object' && chrome.webview) return true;
    const webkit = w.webkit as { messageHandlers?: { Office?: unknown } } | undefined;
    if (webkit?.messageHandlers?.Office) return true;
    const ext = w.external as { GetContext?: unknown } | undefined;
    if (ext && typeof ext === 'object' && 'GetContext' in ext) return true;
  } catch {
    return false;
  }
  return false;
}

/** Adds a script tag and resolves when it has loaded. */
export function loadScript(src: string): Promise<void> {
  return new Promise((resolve, reject) => {
    const s = document.createElement('script');
    s.src = src;
    s.async = false;
    s.onload = () => resolve();
    s.onerror = () => reject(new Error(`could not load ${src}`));
    document.head.append(s);
  });
}
