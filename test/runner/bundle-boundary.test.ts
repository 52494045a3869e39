/**
 * The runner stays out of the add-in bundle: following every static and dynamic import from the
 * webpack entry points (webpack.config.js) never reaches src/runner, scripts/, or HyperFormula.
 */
import { existsSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, reach } from './import-graph.js';

const ENTRIES = ['src/functions/functions.ts', 'taskpane/taskpane.ts', 'taskpane/preview.ts'].filter((p) => existsSync(join(ROOT, p)));

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
