/**
 * Package classification (README, "Quick start"): everything that ships in the add-in bundle or
 * that the runner and the demo need at run time is under `dependencies`, build and test tooling
 * under `devDependencies`, so that `npm audit --omit=dev` audits what users get. The sideload
 * toolchain is optional: a fresh machine without a compiler or libsecret must still install.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { builtinModules } from 'node:module';
import { describe, expect, it } from 'vitest';
import { ROOT, reach } from './import-graph.js';

interface PackageJson {
  engines: { node: string };
  scripts: Record<string, string>;
  dependencies: Record<string, string>;
  devDependencies: Record<string, string>;
  optionalDependencies?: Record<string, string>;
}
const pkg = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as PackageJson;

/** Run-time entry points: the add-in bundle (webpack entries) and the runner's and demo's scripts. */
const RUNTIME_ENTRIES = ['src/functions/functions.ts', 'taskpane/taskpane.ts', 'taskpane/preview.ts', 'scripts/sheet.ts', 'scripts/demo.ts'];

function runtimePackages(): string[] {
  const all = new Set<string>();
  for (const e of RUNTIME_ENTRIES) for (const p of reach(e).packages) all.add(p);
  const builtin = new Set(builtinModules);
  return [...all].filter((p) => !p.startsWith('node:') && !builtin.has(p)).sort();
}

describe('package.json classifies packages by who needs them', () => {
  it('every package the bundle, the runner or the demo imports at run time is a dependency, not a devDependency', () => {
    const used = runtimePackages();
    expect(used).toEqual(expect.arrayContaining(['chart.js', 'exceljs', 'hyperformula']));
    expect(used.filter((p) => !(p in pkg.dependencies))).toEqual([]);
    expect(used.filter((p) => p in pkg.devDependencies)).toEqual([]);
  });
  it('tsx, which runs `npm run sheet` and `npm run demo`, is a dependency', () => {
    expect(pkg.scripts['sheet']).toMatch(/^tsx /);
    expect(pkg.dependencies).toHaveProperty('tsx');
  });
  it('the sideload toolchain (office-addin-debugging, which builds a native module) is optional, and nothing else needs it', () => {
    expect(pkg.optionalDependencies).toHaveProperty('office-addin-debugging');
    expect(pkg.devDependencies).not.toHaveProperty('office-addin-debugging');
    expect(pkg.dependencies).not.toHaveProperty('office-addin-debugging');
    expect(pkg.scripts['start']).toContain('scripts/sideload.mjs');
  });
  it('promises the Node version the machine has (engines field ≥ 20.19)', () => {
    expect(pkg.engines.node).toBe('>=20.19');
  });
});
