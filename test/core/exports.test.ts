/**
 * The public surface of the core is src/core/index.ts alone, and it holds what the outer layers
 * (src/adapter, src/functions, src/view, src/runner, taskpane, scripts, bench) use — nothing more;
 * tests import internal modules directly. This list is that contract: adding an export is a
 * deliberate change to this file; removing or renaming one breaks callers and must fail here first.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import * as core from '../../src/core/index.js';

const ROOT = join(import.meta.dirname, '..', '..');

/** Every .ts file under `dir` (recursively). */
function tsFiles(dir: string): string[] {
  return readdirSync(join(ROOT, dir), { withFileTypes: true, recursive: true })
    .filter((e) => e.isFile() && e.name.endsWith('.ts'))
    .map((e) => join(e.parentPath, e.name));
}

describe('src/core/index.ts', () => {
  it('exports exactly the runtime names the outer layers import', () => {
    expect(Object.keys(core).sort()).toEqual([
      'RatchetError', 'SplitMix64', 'bandAt', 'checkDirection', 'checkKnotTable', 'crossValidate', 'crossValidateSurface',
      'defaultCandidates', 'evaluateTable', 'fail', 'fitBandModel', 'fitMonotone', 'fitShapedBandModel', 'fitSurface',
      'interpolate', 'interpolateAt', 'inverseBand', 'invertAt', 'invertChecked', 'invertTable', 'isRatchetError',
      'kFoldAssignment', 'knotRegression', 'normalDeviates', 'predict', 'predictSurface', 'quantileKnots', 'spearman', 'suggestKnots',
      'suggestSurfaceKnots',
    ]);
  });

  it('every exported function is a function and every error is a RatchetError', () => {
    for (const [name, value] of Object.entries(core)) {
      if (/^[A-Z_]+$/.test(name)) expect(typeof value).toBe('number');
      else expect(['function']).toContain(typeof value);
    }
    expect(() => core.fail('BAD_OPTION', 'folds', 'needs a whole number ≥ 2')).toThrow(core.RatchetError);
    expect(() => core.fail('BAD_OPTION', 'folds', 'needs a whole number ≥ 2')).toThrow('folds: needs a whole number ≥ 2.');
  });

  it('every runtime export is imported by an outer layer (the index holds nothing only tests use)', () => {
    const outer = ['src/adapter', 'src/functions', 'src/view', 'src/runner', 'taskpane', 'scripts', 'bench'].flatMap(tsFiles);
    const imported = new Set<string>();
    for (const f of outer) {
      for (const m of readFileSync(f, 'utf8').matchAll(/import\s*(?:type\s*)?\{([^}]*)\}\s*from\s*'[^']*core\/index\.js'/g)) {
        for (const n of m[1]!.split(',')) imported.add(n.trim().replace(/^type\s+/, '').split(/\s+as\s+/)[0]!);
      }
    }
    expect(Object.keys(core).filter((n) => !imported.has(n))).toEqual([]);
  });
});
