/**
 * Registers the add-in's own worksheet functions (src/functions/registry.ts) with HyperFormula,
 * with the one error mapping of src/adapter/errors.ts. Import this module once before evaluating
 * workbooks; it is idempotent.
 */
import { NAMESPACE, SHEET_FUNCTIONS } from '../functions/registry.js';
import { mapError } from '../adapter/errors.js';
import { registerRatchetPlugin, registeredFunctionNames } from './plugin.js';

/** Registers SHEET_FUNCTIONS unless they already are. */
export function useRatchetFunctions(): void {
  const wanted = SHEET_FUNCTIONS.map((f) => `${NAMESPACE}.${f.name}`);
  const have = registeredFunctionNames();
  if (have.length === wanted.length && wanted.every((n, i) => have[i] === n)) return;
  registerRatchetPlugin(SHEET_FUNCTIONS, mapError);
}

useRatchetFunctions();
