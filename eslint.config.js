// ESLint flat config: typescript-eslint's recommended rules plus the layer boundaries
// (DEVELOPERS.md, "Conventions"): core ← adapter ← functions ← view ← runner, taskpane.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import globals from 'globals';


/** Import bans of one layer: the outer layers it must not reach, and the core other than its index. */
function layer(files, banned, message) {
  return {
    files,
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            { group: banned, message },
            { group: ['**/core/*', '!**/core/index.js'], message: 'Outer layers import the core only through src/core/index.ts.' },
          ],
        },
      ],
    },
  };
}

export default tseslint.config(
  { ignores: ['node_modules/', 'dist/', 'out/', 'test-results/', 'coverage/'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      'no-eval': 'error',
      'no-implied-eval': 'error',
      'no-new-func': 'error',
    },
  },
  {
    // The core is pure TypeScript: no host APIs, no imports from outer layers.
    files: ['src/core/**/*.ts'],
    rules: {
      'no-restricted-globals': [
        'error',
        { name: 'Excel', message: 'src/core must not use host APIs.' },
        { name: 'Office', message: 'src/core must not use host APIs.' },
        { name: 'CustomFunctions', message: 'src/core must not use host APIs.' },
        { name: 'window', message: 'src/core must not use browser globals.' },
        { name: 'document', message: 'src/core must not use browser globals.' },
      ],
      'no-restricted-imports': [
        'error',
        { patterns: [{ group: ['../*', '!./*'], message: 'src/core imports only from src/core.' }, { group: ['node:*', 'fs', 'path'], message: 'src/core must not use Node APIs.' }] },
      ],
    },
  },
  layer(['src/adapter/**/*.ts'], ['**/functions/*', '**/view/*', '**/runner/*', '**/taskpane/*', '**/scripts/*'], 'src/adapter imports only the core (layers point one way).'),
  layer(['src/functions/**/*.ts'], ['**/view/*', '**/runner/*', '**/taskpane/*', '**/scripts/*'], 'src/functions imports only the core and the adapter (layers point one way).'),
  layer(['src/view/**/*.ts'], ['**/runner/*', '**/taskpane/*', '**/scripts/*'], 'src/view imports only the core, the adapter and the functions (layers point one way).'),
  layer(['src/runner/**/*.ts'], ['**/view/*', '**/taskpane/*', '**/scripts/*'], 'src/runner is the headless host: no task pane, no sample building (layers point one way).'),
  layer(['taskpane/**/*.ts'], ['**/runner/*', '**/scripts/*'], 'The task pane does not use the headless runner (layers point one way).'),
);
