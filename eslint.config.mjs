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
    },
  },
  {
    files: ['api/**/*.ts', 'payments-fake/**/*.{ts,mts}', '**/*.config.{ts,mts}', '.stack/**/*.{js,mjs}'],
    languageOptions: { globals: { ...globals.node } },
  },
  {
    // Nest modules are classes that carry only decorators.
    files: ['api/src/**/*.module.ts'],
    rules: { '@typescript-eslint/no-extraneous-class': 'off' },
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
  },
  {
    files: apps,
    ...jsxA11y.flatConfigs.recommended,
    languageOptions: {
      ...jsxA11y.flatConfigs.recommended.languageOptions,
      globals: { ...globals.browser },
    },
  },
  {
    files: ['admin/e2e/**/*.ts', 'portal/e2e/**/*.ts', 'admin/vite.config.ts', 'portal/vite.config.ts'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
  },
);
