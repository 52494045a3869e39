/**
 * functions.json is generated from the JSDoc of src/functions/functions.ts by the Office toolchain's
 * own generator (custom-functions-metadata, the library inside custom-functions-metadata-plugin
 * that the webpack build runs). This test runs that generator directly — no webpack — and checks
 * a snapshot of what users and Excel see (ids, names, parameter counts, dimensionality, optional
 * flags, options) against the argument lists of the README's function reference, plus agreement with the registry
 * (descriptions, help URLs), which is the one source of truth.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { generateCustomFunctionsMetadata } from 'custom-functions-metadata';
import { NAMESPACE, SHEET_FUNCTIONS, helpUrlOf, signatureOf } from '../../src/functions/registry.js';
import { headingAnchors, renderHelpPage } from '../../scripts/help-page.mjs';

interface ParamMeta {
  name: string;
  description?: string;
  dimensionality?: string;
  optional?: boolean;
  type?: string;
}
interface FunctionMeta {
  id: string;
  name: string;
  description: string;
  helpUrl: string;
  parameters: ParamMeta[];
  result: { dimensionality?: string; type?: string };
  options?: Record<string, boolean>;
}

const source = fileURLToPath(new URL('../../src/functions/functions.ts', import.meta.url));
let functions: FunctionMeta[] = [];
let errors: string[] = [];

beforeAll(async () => {
  const result = await generateCustomFunctionsMetadata(source, false);
  errors = result.errors;
  functions = errors.length === 0 ? (JSON.parse(result.metadataJson) as { functions: FunctionMeta[] }).functions : [];
});

/** The nine one-input functions of the README (other functions may follow them in the registry). */
const CORE_NINE = ['FIT', 'PREDICT', 'KNOTS', 'EVAL', 'INVERT', 'QKNOTS', 'CV', 'BESTK', 'STATS'];
const nine = (): FunctionMeta[] => functions.filter((f) => CORE_NINE.includes(f.id));

/** Compact form: "name" (scalar) / "name[]" (matrix), "?" when optional. */
function signature(f: FunctionMeta): string {
  const ps = f.parameters.map((p) => `${p.name}${p.dimensionality === 'matrix' ? '[]' : ''}${p.optional ? '?' : ''}`);
  return `${f.id}/${f.name}(${ps.join(', ')}) → ${f.result.dimensionality === 'matrix' ? 'matrix' : (f.result.type ?? 'any')} ${JSON.stringify(f.options ?? {})}`;
}

describe('generated functions.json', () => {
  it('generates without errors', () => {
    expect(errors).toEqual([]);
  });

  it('snapshot: ids, names, parameters (count, dimensionality, optional) and options', () => {
    const addr = '{"requiresParameterAddresses":true}';
    const cancel = '{"cancelable":true,"requiresParameterAddresses":true}';
    expect(nine().map(signature)).toEqual([
      `FIT/FIT(known_ys[], known_xs[], knots[]?, direction?, weights[]?, curvature?, degree?) → matrix ${addr}`,
      `PREDICT/PREDICT(new_xs[], known_ys[], known_xs[], knots[]?, direction?, weights[]?, curvature?, degree?) → matrix ${addr}`,
      `KNOTS/KNOTS(known_ys[], known_xs[], knots[]?, direction?, weights[]?, curvature?, degree?) → matrix ${addr}`,
      `EVAL/EVAL(new_xs[], knot_table[]) → matrix ${addr}`,
      `INVERT/INVERT(target_ys[], knot_table[], tie?) → matrix ${addr}`,
      `QKNOTS/QKNOTS(known_xs[], count) → matrix ${addr}`,
      `CV/CV(known_ys[], known_xs[], candidates[]?, folds?, repeats?, seed?, direction?, weights[]?, curvature?, degree?) → matrix ${cancel}`,
      `BESTK/BESTK(known_ys[], known_xs[], candidates[]?, folds?, repeats?, seed?, direction?, weights[]?, rule?, curvature?, degree?) → number ${cancel}`,
      `STATS/STATS(known_ys[], known_xs[], knots[]?, direction?, weights[]?, curvature?, degree?) → matrix ${addr}`,
    ]);
    expect(nine().map((f) => f.parameters.length)).toEqual([7, 8, 7, 2, 3, 2, 10, 11, 7]);
    expect(functions.slice(0, 9).map((f) => f.id)).toEqual(CORE_NINE);
  });

  it('agrees with the registry: names, order, descriptions, optional flags, result kind, cancelable', () => {
    expect(functions.map((f) => f.id)).toEqual(SHEET_FUNCTIONS.map((f) => f.name));
    for (const [i, meta] of functions.entries()) {
      const reg = SHEET_FUNCTIONS[i]!;
      expect(meta.description).toBe(reg.description);
      expect(meta.parameters.map((p) => p.name)).toEqual(reg.params.map((p) => p.name));
      expect(meta.parameters.map((p) => p.description)).toEqual(reg.params.map((p) => p.description));
      expect(meta.parameters.map((p) => p.optional === true)).toEqual(reg.params.map((p) => p.optional));
      expect(meta.result.dimensionality === 'matrix').toBe(reg.returnsArray);
      expect(meta.options?.cancelable === true).toBe(reg.longWork === true);
    }
  });

  it('each of the nine has a description, per-argument descriptions and a help URL on its section of the reference', () => {
    const readme = readFileSync(fileURLToPath(new URL('../../README.md', import.meta.url)), 'utf8');
    const anchors = new Set(headingAnchors(readme));
    for (const f of nine()) {
      expect(f.description.length).toBeGreaterThan(20);
      for (const p of f.parameters) expect(p.description?.length ?? 0).toBeGreaterThan(10);
      expect(f.helpUrl).toBe(helpUrlOf(f.id));
      expect(f.helpUrl).toMatch(/^https:\/\/localhost:3000\/help\.html#ratchet[a-z]+$/);
      // The help page is the README with an id on every heading; "### RATCHET.FIT" gets "ratchetfit".
      expect(readme).toContain(`\n### RATCHET.${f.id}\n`);
      expect(anchors.has(f.helpUrl.split('#')[1]!)).toBe(true);
    }
  });

  it("each function's section of the help page opens with the syntax line derived from its spec", () => {
    const readme = readFileSync(fileURLToPath(new URL('../../README.md', import.meta.url)), 'utf8');
    for (const f of SHEET_FUNCTIONS) {
      const section = readme.split(`\n### ${NAMESPACE}.${f.name}\n`)[1]!.split('\n### ')[0]!;
      expect(section).toContain(`\`=${signatureOf(f)}\``);
    }
  });

  it('every registered function (surfaces included) links to an existing heading of the help page', () => {
    const readmePath = fileURLToPath(new URL('../../README.md', import.meta.url));
    const page = renderHelpPage(readmePath);
    for (const f of SHEET_FUNCTIONS) {
      const anchor = helpUrlOf(f.name).split('#')[1]!;
      expect(page).toContain(`<h3 id="${anchor}">RATCHET.${f.name}</h3>`);
    }
    // The page is self-contained: no script of any kind, and a CSP that forbids them.
    expect(page).not.toMatch(/<script/i);
    expect(page).toContain("default-src 'none'");
  });
});
