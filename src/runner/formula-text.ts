/**
 * Formula text as files store it and as users type it.
 *
 * Excel writes an add-in function typed as `=RATCHET.FIT(…)` into the file as
 * `_xldudf_RATCHET_FIT(…)` (prefix `_xldudf_`, the namespace dot as an underscore), and newer
 * built-ins such as SEQUENCE as `_xlfn.SEQUENCE(…)`. The runner evaluates and shows the typed
 * form and writes the stored form. Text inside string literals ("…") is never changed.
 */
import { NAMESPACE } from '../functions/define.js';

/** Stored prefix of add-in functions in workbook files. */
export const STORED_PREFIX = '_xldudf_';

/** Built-ins that Excel stores with a `_xlfn.` prefix (and `_xlws.` for the sort family). */
const FUTURE_FUNCTIONS: Readonly<Record<string, string>> = {
  SEQUENCE: '_xlfn.SEQUENCE',
  UNIQUE: '_xlfn.UNIQUE',
  FILTER: '_xlfn._xlws.FILTER',
  SORT: '_xlfn._xlws.SORT',
  SORTBY: '_xlfn.SORTBY',
  XLOOKUP: '_xlfn.XLOOKUP',
  XMATCH: '_xlfn.XMATCH',
  RANDARRAY: '_xlfn.RANDARRAY',
  LET: '_xlfn.LET',
};

/** Applies `edit` to the parts of `formula` outside string literals. O(length). */
function outsideStrings(formula: string, edit: (code: string) => string): string {
  const parts = formula.split('"');
  // Even-indexed parts lie outside string literals; a doubled quote "" inside a literal splits
  // into an empty odd part and keeps the parity right.
  return parts.map((p, i) => (i % 2 === 0 ? edit(p) : p)).join('"');
}

/**
 * Converts formula text to the typed form: `_xldudf_RATCHET_FIT(` → `RATCHET.FIT(`, and drops
 * the `_xlfn.` / `_xlws.` prefixes of built-ins. A leading `=` is kept if present.
 * Cost O(length).
 * @example toTypedForm('_xldudf_RATCHET_FIT(B2:B9,A2:A9)') // → 'RATCHET.FIT(B2:B9,A2:A9)'
 */
export function toTypedForm(formula: string): string {
  return outsideStrings(formula, (code) =>
    code
      .replace(/(^|[^A-Za-z0-9_.])_xldudf_RATCHET_([A-Za-z][A-Za-z0-9]*)\s*\(/gi, (_m, lead: string, name: string) => `${lead}${NAMESPACE}.${name.toUpperCase()}(`)
      .replace(/_xlfn\.(_xlws\.)?/gi, ''),
  );
}

/**
 * Converts formula text to the stored form written into files: `RATCHET.FIT(` →
 * `_xldudf_RATCHET_FIT(`, `SEQUENCE(` → `_xlfn.SEQUENCE(`. Text already in stored form is left
 * as it is. Cost O(length).
 * @example toStoredForm('=RATCHET.KNOTS(B2:B9,A2:A9,SEQUENCE(3))') // → '=_xldudf_RATCHET_KNOTS(B2:B9,A2:A9,_xlfn.SEQUENCE(3))'
 */
export function toStoredForm(formula: string): string {
  return outsideStrings(toTypedForm(formula), (code) =>
    code
      .replace(/(^|[^A-Za-z0-9_.])RATCHET\.([A-Za-z][A-Za-z0-9]*)\s*\(/gi, (_m, lead: string, name: string) => `${lead}${STORED_PREFIX}${NAMESPACE}_${name.toUpperCase()}(`)
      .replace(/(^|[^A-Za-z0-9_.])([A-Za-z]+)\s*\(/g, (m, lead: string, name: string) => {
        const stored = FUTURE_FUNCTIONS[name.toUpperCase()];
        return stored === undefined ? m : `${lead}${stored}(`;
      }),
  );
}

/** True when the formula text calls an add-in function in either form. */
export function callsRatchet(formula: string): boolean {
  return /(^|[^A-Za-z0-9_.])(RATCHET\.|_xldudf_RATCHET_)[A-Za-z]/i.test(formula);
}
