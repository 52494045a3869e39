/**
 * The layout rules of the pane as checks on a page (used by the browser tests of layout and of
 * the band, residual and read-back panels):
 * - no element reaches beyond the viewport and the page does not scroll sideways;
 * - no control's text is clipped: for buttons, inputs and labels scrollWidth ≤ clientWidth; for a
 *   drop-down the width of its chosen option's text (measured with the same font) fits inside it;
 * - every control has an accessible name.
 */
import type { Page } from 'playwright-core';

/** Everything the layout rules forbid, as readable lines (empty = fine). */
export async function layoutProblems(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    const vw = document.documentElement.clientWidth;
    const name = (e: Element): string => `${e.tagName.toLowerCase()}${e.id ? `#${e.id}` : ''}${e.className && typeof e.className === 'string' ? `.${e.className.split(' ').join('.')}` : ''}`;
    if (document.documentElement.scrollWidth > vw) out.push(`page scrolls sideways: scrollWidth ${document.documentElement.scrollWidth} > ${vw}`);
    const visible = (e: Element): boolean => {
      const r = e.getBoundingClientRect();
      return r.width > 0 && r.height > 0 && getComputedStyle(e).visibility !== 'hidden';
    };
    // Elements inside a scrolling region may extend past it; the region itself may not.
    const inScroller = (e: Element): boolean => e.parentElement?.closest('.table-scroll') !== null;
    for (const e of document.body.querySelectorAll('*')) {
      if (!visible(e) || inScroller(e) || e.tagName === 'OPTION') continue;
      const r = e.getBoundingClientRect();
      if (r.right > vw + 0.5 || r.left < -0.5) out.push(`${name(e)} spans ${Math.round(r.left)}…${Math.round(r.right)} px, viewport ${vw}`);
    }
    for (const e of document.querySelectorAll<HTMLElement>('button, input:not([type=file]), label, legend, textarea, h1, h2, .hint, .field-msg, .status')) {
      if (!visible(e)) continue;
      if (e.scrollWidth > e.clientWidth + 1) out.push(`${name(e)} text clipped: scrollWidth ${e.scrollWidth} > clientWidth ${e.clientWidth}`);
    }
    const canvas = document.createElement('canvas').getContext('2d')!;
    for (const s of document.querySelectorAll<HTMLSelectElement>('select')) {
      if (!visible(s) || s.selectedIndex < 0) continue;
      const cs = getComputedStyle(s);
      canvas.font = `${cs.fontWeight} ${cs.fontSize} ${cs.fontFamily}`;
      // the chosen option, which the closed control shows (the open list is as wide as it needs); the arrow takes about 20 px
      for (const o of [s.options[s.selectedIndex]!]) {
        const need = canvas.measureText(o.text).width + parseFloat(cs.paddingLeft) + parseFloat(cs.paddingRight) + 20;
        if (need > s.clientWidth + 1) out.push(`select#${s.id} option "${o.text}" needs ${Math.round(need)} px, has ${s.clientWidth}`);
      }
    }
    return out;
  });
}

/** Controls without an accessible name (label, aria-label or aria-labelledby). */
export async function unlabelled(page: Page): Promise<string[]> {
  return page.evaluate(() =>
    [...document.querySelectorAll<HTMLElement>('input, select, textarea, button, progress')]
      .filter((e) => {
        const labels = (e as HTMLInputElement).labels;
        const byLabel = labels !== null && labels !== undefined && labels.length > 0 && [...labels].some((l) => l.textContent!.trim() !== '');
        return !byLabel && !e.getAttribute('aria-label') && !e.getAttribute('aria-labelledby') && !(e.tagName === 'BUTTON' && e.textContent!.trim() !== '');
      })
      .map((e) => `${e.tagName.toLowerCase()}#${e.id}`),
  );
}
