import js from '@eslint/js';
import globals from 'globals';
import tseslint from 'typescript-eslint';

// Dependency direction (DEVELOPERS.md, "Layers"): model <- engine <- workers; model <- io;
// engine, io <- cli; model, io, client <- ui. Nothing imports ui or cli.
const restrict = (...groups) => ({
  'no-restricted-imports': ['error', { patterns: groups.map((group) => ({ group: [group], message: 'breaks the layer rules in DEVELOPERS.md' })) }],
});

export default tseslint.config(
  { ignores: ['dist/**', 'dist-cli/**', 'node_modules/**', '.ci-out/**', 'scratch/**', 'coverage/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.browser, ...globals.node } },
    rules: {
      '@typescript-eslint/no-explicit-any': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/consistent-type-imports': 'error',
      'no-console': 'off',
    },
  },
  { files: ['src/model/**'], rules: restrict('**/engine/**', '**/io/**', '**/ui/**', '**/cli/**', '**/client/**', '**/spectrum/**', 'lit', 'uplot', 'comlink') },
  { files: ['src/engine/**'], rules: restrict('**/io/**', '**/ui/**', '**/cli/**', '**/client/**', 'lit', 'uplot', 'comlink', 'node:*') },
  { files: ['src/spectrum/**'], rules: restrict('**/ui/**', '**/cli/**', '**/client/**', 'lit', 'uplot', 'comlink', 'node:*') },
  { files: ['src/io/**'], rules: restrict('**/ui/**', '**/cli/**', '**/client/**', 'lit', 'uplot', 'comlink', 'node:*') },
  { files: ['src/client/**'], rules: restrict('**/ui/**', '**/cli/**', 'lit', 'uplot', 'node:*') },
  { files: ['src/cli/**'], rules: restrict('**/ui/**', '**/client/**', 'lit', 'uplot', 'comlink') },
  { files: ['src/ui/**'], rules: restrict('**/cli/**', 'node:*') },
  // The UI renders numbers that arrive from the worker; it may name engine types, never run the engine.
  {
    files: ['src/ui/**', 'src/client/**'],
    rules: {
      '@typescript-eslint/no-restricted-imports': [
        'error',
        { patterns: [{ group: ['**/engine/**'], allowTypeImports: true, message: 'the UI imports engine types only; numbers come from the worker' }] },
      ],
    },
  },
  { files: ['workers/**'], rules: restrict('**/ui/**', '**/cli/**', '**/client/**', 'lit', 'uplot', 'node:*') },
);
