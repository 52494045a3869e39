/**
 * Column letters of A1 addresses, shared by the task pane (which writes references into formulas)
 * and the headless runner (which names cells in its output). Pure functions, no host APIs.
 */

/** Largest row and column of a worksheet (Excel 2007 and later). */
export const MAX_ROWS = 1048576;
export const MAX_COLS = 16384;

/**
 * Column number (1-based) → letters: 1 → "A", 27 → "AA", 16384 → "XFD". O(log col).
 * @throws RangeError for a column outside 1 … 16384.
 */
export function columnLetters(col: number): string {
  if (!Number.isInteger(col) || col < 1 || col > MAX_COLS) throw new RangeError(`column ${col} is outside 1…${MAX_COLS}`);
  let s = '';
  let c = col;
  while (c > 0) {
    const m = (c - 1) % 26;
    s = String.fromCharCode(65 + m) + s;
    c = Math.floor((c - 1) / 26);
  }
  return s;
}

/**
 * Column letters → number (1-based): "A" → 1, "aa" → 27. O(length).
 * @throws RangeError for anything but the letters A–Z.
 */
export function columnNumber(letters: string): number {
  let n = 0;
  for (const ch of letters.toUpperCase()) {
    const v = ch.charCodeAt(0) - 64;
    if (v < 1 || v > 26) throw new RangeError(`"${letters}" is not a column name`);
    n = n * 26 + v;
  }
  return n;
}
