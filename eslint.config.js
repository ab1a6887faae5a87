import js from '@eslint/js';
import globals from 'globals';
import tseslint from 'typescript-eslint';

// Dependency direction (DEVELOPERS.md, "Layers"): model <- engine <- spectrum <- assist, safety;
// model <- io; model <- drawing; everything pure <- report <- cli and workers; model, io, planner,
// drawing, client <- ui. Nothing imports ui or cli. The pure layers use neither the DOM nor Node.
const restrict = (...groups) => ({
  'no-restricted-imports': ['error', { patterns: groups.map((group) => ({ group: [group], message: 'breaks the layer rules in DEVELOPERS.md' })) }],
});

export default tseslint.config(
  { ignores: ['dist/**', 'dist-cli/**', 'node_modules/**', '.ci-out/**', 'scratch/**', '.scratch/**', 'coverage/**', 'fixtures/touchstone/*.ts' /* Touchstone 2 data files, not TypeScript */] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.browser, ...globals.node } },
    rules: {
      '@typescript-eslint/no-explicit-any': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/consistent-type-imports': 'error',
      'no-console': 'off',
      // No way in for code: nothing is evaluated, and user text (names, notes, file contents) is never markup.
      'no-eval': 'error',
      'no-implied-eval': 'error',
      'no-new-func': 'error',
      'no-restricted-properties': [
        'error',
        { property: 'innerHTML', message: 'render text with lit templates or textContent; user text is never markup' },
        { property: 'outerHTML', message: 'render text with lit templates or textContent; user text is never markup' },
        { property: 'insertAdjacentHTML', message: 'render text with lit templates or textContent; user text is never markup' },
        { object: 'document', property: 'write', message: 'no document.write' },
      ],
      'no-restricted-syntax': [
        'error',
        { selector: "ImportDeclaration[source.value=/unsafe-(html|svg)/]", message: 'unsafeHTML and unsafeSVG turn text into markup; build nodes instead' },
        { selector: "CallExpression[callee.property.name='createContextualFragment']", message: 'no HTML parsing of strings' },
      ],
    },
  },
  { files: ['src/model/**'], rules: restrict('**/engine/**', '**/io/**', '**/ui/**', '**/cli/**', '**/client/**', '**/spectrum/**', 'lit', 'uplot', 'comlink') },
  { files: ['src/engine/**'], rules: restrict('**/io/**', '**/ui/**', '**/cli/**', '**/client/**', 'lit', 'uplot', 'comlink', 'node:*') },
  { files: ['src/spectrum/**'], rules: restrict('**/ui/**', '**/cli/**', '**/client/**', 'lit', 'uplot', 'comlink', 'node:*') },
  { files: ['src/io/**'], rules: restrict('**/ui/**', '**/cli/**', '**/client/**', 'lit', 'uplot', 'comlink', 'node:*') },
  { files: ['src/drawing/**'], rules: restrict('**/ui/**', '**/cli/**', '**/client/**', '**/planner/**', 'lit', 'uplot', 'comlink', 'node:*') },
  { files: ['src/assist/**', 'src/safety/**'], rules: restrict('**/ui/**', '**/cli/**', '**/client/**', '**/planner/**', '**/report/**', 'lit', 'uplot', 'comlink', 'node:*') },
  { files: ['src/report/**'], rules: restrict('**/ui/**', '**/cli/**', '**/client/**', '**/planner/**', 'lit', 'uplot', 'comlink', 'node:*') },
  { files: ['src/planner/**'], rules: restrict('**/ui/**', '**/cli/**', '**/client/**', 'lit', 'uplot', 'comlink', 'node:*') },
  { files: ['src/client/**'], rules: restrict('**/ui/**', '**/cli/**', 'lit', 'uplot', 'node:*') },
  { files: ['src/cli/**'], rules: restrict('**/ui/**', '**/client/**', 'lit', 'uplot', 'comlink') },
  { files: ['src/ui/**'], rules: restrict('**/cli/**', 'node:*') },
  // The UI renders numbers that arrive from the worker; it may name engine types, never run the engine
  // (nor the assistants, the safety checks or the report builder, which run in workers too).
  {
    files: ['src/ui/**', 'src/client/**', 'src/planner/**'],
    rules: {
      '@typescript-eslint/no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['**/engine/**', '**/assist/**', '**/safety/**', '**/report/**'],
              allowTypeImports: true,
              message: 'the page imports types only from the number layers; numbers come from the worker',
            },
          ],
        },
      ],
    },
  },
  { files: ['workers/**'], rules: restrict('**/ui/**', '**/cli/**', '**/client/**', 'lit', 'uplot', 'node:*') },
);
