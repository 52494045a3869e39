/**
 * The import graph of the project's TypeScript sources, read as text (no bundler): every project
 * file and every package an entry point reaches through static and dynamic imports. Shared by the
 * bundle-boundary and dependency-classification tests.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';

export const ROOT = join(import.meta.dirname, '..', '..');

function resolveImport(from: string, spec: string): string | undefined {
  const base = resolve(dirname(from), spec);
  for (const c of [base, base.replace(/\.js$/, '.ts'), `${base}.ts`, join(base, 'index.ts')]) if (existsSync(c) && c.endsWith('.ts')) return c;
  return undefined;
}

/** Every project file and every package the entry (a path relative to the repository) reaches. */
export function reach(entry: string): { files: Set<string>; packages: Set<string> } {
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
      if (/^(?:import|export)\s+type\s/.test(m[0])) continue; // erased at compile time
      if (spec.startsWith('.')) {
        const r = resolveImport(f, spec);
        if (r) todo.push(r);
      } else packages.add(spec.startsWith('@') ? spec.split('/').slice(0, 2).join('/') : spec.split('/')[0]!);
    }
  }
  return { files, packages };
}
