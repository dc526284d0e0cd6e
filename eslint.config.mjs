// One ESLint configuration for every workspace (`npm run lint` at the root).
// Import boundaries (api domains, common/, app features) are checked by dependency-cruiser:
// see .dependency-cruiser.cjs.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import jsxA11y from 'eslint-plugin-jsx-a11y';
import globals from 'globals';

const apps = ['admin/**/*.{ts,tsx}', 'portal/**/*.{ts,tsx}'];

export default tseslint.config(
  {
    ignores: [
      '**/node_modules/**',
      '**/dist/**',
      '.local/**',
      'api/contract/src/generated/**',
      'legal-templates/fonts/**',
    ],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    rules: {
      // `_name` marks a parameter a signature needs but the body does not use.
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none', ignoreRestSiblings: true },
      ],
      // Input hygiene refuses NUL and other control characters, so its patterns name them.
      'no-control-regex': 'off',
    },
  },
  {
    // Tests read untyped JSON bodies and reach into browser globals; `any` there is the body's own shape.
    files: ['**/test/**/*.ts', '**/e2e/**/*.ts', '**/*.spec.ts', '**/*.e2e-spec.ts'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
  {
    files: [
      'api/**/*.ts',
      'payments-fake/**/*.{ts,mts}',
      '**/*.config.{ts,mts}',
      '.stack/**/*.{js,mjs}',
      '*/bench/**/*.mjs',
    ],
    languageOptions: { globals: { ...globals.node } },
  },
  {
    // Nest modules are classes that carry only decorators.
    files: ['api/src/**/*.module.ts'],
    rules: { '@typescript-eslint/no-extraneous-class': 'off' },
  },
  {
    // Each domain refuses with its own code (see api/contract/src/problem.ts); the generic 409 'CONFLICT' is only
    // the problem filter's fallback for a bare Nest HttpException.
    files: ['api/src/**/*.ts'],
    ignores: ['api/src/common/errors/problem.filter.ts', '**/*.spec.ts'],
    rules: {
      'no-restricted-syntax': [
        'error',
        {
          selector: "Literal[value='CONFLICT']",
          message: "Throw the domain's own exception with a code that says what happened, not the generic 'CONFLICT'.",
        },
      ],
    },
  },
  {
    files: ['**/*.cjs'],
    languageOptions: { sourceType: 'commonjs', globals: { ...globals.node } },
  },
  {
    files: ['legal-templates/**/*.js'],
    languageOptions: { sourceType: 'commonjs', globals: { ...globals.node } },
    rules: { '@typescript-eslint/no-require-imports': 'off' },
  },
  {
    files: ['payments-fake/src/**/*.browser.ts'],
    languageOptions: { globals: { ...globals.browser } },
  },
  {
    files: apps,
    ...reactHooks.configs.flat['recommended-latest'],
    rules: {
      ...reactHooks.configs.flat['recommended-latest'].rules,
      // The apps are not compiled with React Compiler; these of its diagnostics flag the latest-value ref and
      // reset-on-change effect patterns the apps use on purpose (rules-of-hooks and exhaustive-deps stay on).
      'react-hooks/refs': 'off',
      'react-hooks/set-state-in-effect': 'off',
      'react-hooks/incompatible-library': 'off',
    },
  },
  {
    files: apps,
    ...jsxA11y.flatConfigs.recommended,
    languageOptions: {
      ...jsxA11y.flatConfigs.recommended.languageOptions,
      globals: { ...globals.browser },
    },
    rules: {
      ...jsxA11y.flatConfigs.recommended.rules,
      // Headless UI's Input, Select and Textarea render the native control inside the wrapping label.
      'jsx-a11y/label-has-associated-control': [
        'error',
        { controlComponents: ['Input', 'Select', 'Textarea'], depth: 3 },
      ],
      // A scrollable region takes focus so it can be scrolled by keyboard (axe: scrollable-region-focusable).
      'jsx-a11y/no-noninteractive-tabindex': ['error', { roles: ['region'], tags: [] }],
    },
  },
  {
    files: ['admin/e2e/**/*.ts', 'portal/e2e/**/*.ts', 'admin/vite.config.ts', 'portal/vite.config.ts'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
  },
);
