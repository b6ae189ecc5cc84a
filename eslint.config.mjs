// ESLint over the three workspaces and the root scripts: the recommended JavaScript and typescript-eslint
// rules only (no style rules: formatting is not what this check is for). Run with `npm run lint`.
import js from '@eslint/js';
import { defineConfig } from 'eslint/config';
import globals from 'globals';
import tseslint from 'typescript-eslint';

export default defineConfig(
  {
    ignores: [
      '**/node_modules/**',
      '**/dist/**',
      '**/coverage/**',
      // written by openapi-typescript from the server's OpenAPI document, never by hand
      'station-ui/src/lib/api-types.ts',
      // database files, screenshots and other run output
      '**/*.sqlite*',
      'station-ui/e2e/screenshots/**',
    ],
  },
  js.configs.recommended,
  tseslint.configs.recommended,
  {
    rules: {
      // An argument or binding named with a leading underscore is kept on purpose (a callback signature,
      // an interface method a fake implements, a rest-spread that drops a field).
      '@typescript-eslint/no-unused-vars': [
        'error',
        {
          argsIgnorePattern: '^_',
          varsIgnorePattern: '^_',
          caughtErrorsIgnorePattern: '^_',
          destructuredArrayIgnorePattern: '^_',
          ignoreRestSiblings: true,
        },
      ],
    },
  },
  // Server and simulated fixture: Node.
  {
    files: ['station-api/**/*.{ts,mts}', 'mock-fixture/**/*.{ts,mts}'],
    languageOptions: { globals: { ...globals.node } },
  },
  // Screens: the browser.
  {
    files: ['station-ui/src/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
  },
  // Browser tests run in Node and drive Chromium; code passed to page.evaluate runs in the page.
  // Build configs and build scripts run in Node.
  {
    files: ['station-ui/e2e/**/*.ts'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
  },
  {
    files: ['station-ui/*.{ts,mts,js,cjs,mjs}', 'station-ui/scripts/**/*.{js,mjs}'],
    languageOptions: { globals: { ...globals.node } },
  },
  {
    // CommonJS packages' plain scripts (station-api is "type": "commonjs")
    files: ['**/*.cjs', 'station-api/scripts/**/*.js'],
    languageOptions: { sourceType: 'commonjs', globals: { ...globals.node } },
    rules: { '@typescript-eslint/no-require-imports': 'off' },
  },
  {
    files: ['scripts/**/*.mjs', '*.mjs'],
    languageOptions: { globals: { ...globals.node } },
  },
);
