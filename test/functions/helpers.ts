/** Helpers for the worksheet-function tests: call a function as a host would and map what it throws. */
import { functionByName } from '../../src/functions/registry.js';
import { mapError, type MappedError } from '../../src/adapter/errors.js';
import type { CellArg, CellResult } from '../../src/functions/types.js';

/** Result or mapped error of RATCHET.<name>(...args). */
export function cell(name: string, ...args: CellArg[]): CellResult | { error: MappedError } {
  const f = functionByName(name);
  if (!f) throw new Error(`no function ${name}`);
  try {
    return f.invoke(args);
  } catch (e) {
    return { error: mapError(e) };
  }
}

/** A column range from values. */
export function col(...values: (number | string | boolean | null | { kind: 'error'; code: string })[]): CellArg {
  return values.map((v) => [v]);
}

/** A row range from values. */
export function row(...values: (number | string | boolean | null)[]): CellArg {
  return [values];
}

/** The mapped error {code, message}. */
export function err(code: string, message: string): { error: MappedError } {
  return { error: { code, message } as MappedError };
}
