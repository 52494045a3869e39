// ESLint flat config: typescript-eslint's recommended rules plus the layer boundary of src/core.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import globals from 'globals';

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
);
