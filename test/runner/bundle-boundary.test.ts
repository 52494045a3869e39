/**
 * The runner stays out of the add-in bundle: following every static and dynamic import from the
 * webpack entry points (webpack.config.js) never reaches src/runner, scripts/, or HyperFormula.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '..', '..');
const ENTRIES = ['src/functions/functions.ts', 'taskpane/taskpane.ts', 'taskpane/preview.ts'].filter((p) => existsSync(join(ROOT, p)));

function resolveImport(from: string, spec: string): string | undefined {
  const base = resolve(dirname(from), spec);
  for (const c of [base, base.replace(/\.js$/, '.ts'), `${base}.ts`, join(base, 'index.ts')]) if (existsSync(c) && c.endsWith('.ts')) return c;
  return undefined;
}

/** Every project file and every package the entry reaches. */
function reach(entry: string): { files: Set<string>; packages: Set<string> } {
  const files = new Set<string>();
  const packages = new Set<string>();
  const todo = [join(ROOT, entry)];
  while (todo.length > 0) {
    const f = todo.pop()!;
    if (files.has(f)) continue;
    files.add(f);
    const text = readFileSync(f, 'utf8');
    for (const m of text.matchAll(/(?:import|export)\s[^'"]*?from\s*['"]([^'"]+)['"]|import\s*\(\s*['"]([^'"]+)['"]\s*\)|import\s+['"]([^'"]+)['"]|new URL\(\s*['"]([^'"]+)['"]/g)) {
      const spec = m[1] ?? m[2] ?? m[3] ?? m[4]!;
      if (spec.startsWith('.')) {
        const r = resolveImport(f, spec);
        if (r) todo.push(r);
      } else packages.add(spec.startsWith('@') ? spec.split('/').slice(0, 2).join('/') : spec.split('/')[0]!);
    }
  }
  return { files, packages };
}

describe('the add-in bundle', () => {
  it('has entry points to check, and the walk follows imports (the functions reach the core)', () => {
    expect(ENTRIES).toContain('src/functions/functions.ts');
    const { files } = reach('src/functions/functions.ts');
    expect([...files].map((f) => relative(ROOT, f))).toContain('src/core/index.ts');
  });
  it.each(ENTRIES)('%s never reaches the runner or HyperFormula', (entry) => {
    const { files, packages } = reach(entry);
    const project = [...files].map((f) => relative(ROOT, f));
    expect(project.filter((f) => f.startsWith('src/runner/') || f.startsWith('scripts/'))).toEqual([]);
    expect([...packages].filter((p) => p === 'hyperformula')).toEqual([]);
    expect(project).toContain(entry);
  });
});
