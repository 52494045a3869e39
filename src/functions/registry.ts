/**
 * The registry of RATCHET worksheet functions: the one list every host reads — the Excel entry
 * (functions.ts, whose JSDoc the metadata generator reads; a test checks that it matches these
 * specs), the worker, the headless runner's plugin and the task pane all call `invoke` from here.
 * Each function is one spec and one implementation (src/functions/define.ts); adding one means
 * adding it to this list (DEVELOPERS.md, "Adding a worksheet function").
 */
import type { SheetFunction } from './types.js';
import { BAND, BESTK, CV, EVAL, FIT, INVERT, INVERTBAND, KNOTS, PREDICT, QKNOTS, STATS } from './implementations.js';
import { CVGRID, GRID, SURFACE } from './surface-functions.js';
import { NAMESPACE } from './define.js';

export { NAMESPACE, HELP_BASE, helpUrlOf, signatureOf } from './define.js';

/** Every RATCHET function, in the order of the reference. */
export const SHEET_FUNCTIONS: readonly SheetFunction[] = Object.freeze([FIT, PREDICT, KNOTS, EVAL, INVERT, QKNOTS, CV, BESTK, STATS, BAND, INVERTBAND, SURFACE, GRID, CVGRID]);

const byName = new Map(SHEET_FUNCTIONS.map((f) => [f.name, f]));
const prefix = `${NAMESPACE}.`;

/**
 * The function called `name` (with or without the namespace, any case), or undefined. O(1).
 * @example functionByName('ratchet.fit')?.name // → 'FIT'
 */
export function functionByName(name: string): SheetFunction | undefined {
  const upper = name.toUpperCase();
  return byName.get(upper.startsWith(prefix) ? upper.slice(prefix.length) : upper);
}
