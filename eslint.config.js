// Flat config: ESLint's recommended rules and typescript-eslint's recommended set (no type
// information, so a lint of the whole tree stays fast), with browser globals for the client
// and node globals for the server, tests and config files; React's hook rules for the client.
// Files named *.scratch.ts are personal experiments, never linted.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import globals from 'globals';
import reactHooks from 'eslint-plugin-react-hooks';

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'drizzle/**', 'data/**', 'test-results/**', 'playwright-report/**', 'coverage/**', '**/*.scratch.ts'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { ecmaVersion: 2023, sourceType: 'module' },
    linterOptions: { reportUnusedDisableDirectives: 'warn' },
    rules: {
      // `_`-prefixed names mark a deliberately unused argument or binding.
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_', ignoreRestSiblings: true }],
      // `void promise` marks a promise deliberately not awaited.
      'no-void': 'off',
      // Input validation rejects control characters on purpose.
      'no-control-regex': 'off',
      // Empty interfaces that extend another are a readable way to name a type.
      '@typescript-eslint/no-empty-object-type': ['error', { allowInterfaces: 'with-single-extends' }],
      // Declaration merging for library types (express Request, vitest matchers) needs namespaces.
      '@typescript-eslint/no-namespace': ['error', { allowDeclarations: true }],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    languageOptions: { globals: { ...globals.browser } },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
    },
  },
  {
    files: ['server/**/*.ts', 'shared/**/*.ts', 'tests/**/*.{ts,tsx}', '*.{js,ts}', '.ci/**'],
    languageOptions: { globals: { ...globals.node } },
  },
  {
    files: ['**/*.test.{ts,tsx}', 'tests/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.node, ...globals.browser, ...globals.vitest } },
    rules: {
      // Tests cast freely to reach into responses and rows.
      '@typescript-eslint/no-explicit-any': 'off',
      '@typescript-eslint/no-non-null-assertion': 'off',
    },
  },
);
