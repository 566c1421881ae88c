// Psiform's lint rules (ESLint flat config), shared by every workspace through the root eslint.config.mjs.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';

export default tseslint.config(
  { ignores: ['**/dist/**', '**/node_modules/**', '**/coverage/**', '.data/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    rules: {
      '@typescript-eslint/no-unused-vars': ['warn', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/no-explicit-any': 'warn',
      'no-console': 'off',
    },
  },
  {
    // libs stay pure: no React, three, Nest or I/O (DEVELOPERS.md). The Node-only parallel sampler is one exception;
    // libs/server (the server core both NestJS apps share: persistence and adapters) is the other.
    files: ['libs/*/src/**/*.ts'],
    ignores: ['libs/orbitals/src/node/**', 'libs/server/src/**'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['react', 'react-*', 'three', 'three/*', '@react-three/*', '@nestjs/*'], message: 'libs/* must not import UI or server frameworks' },
          { group: ['fs', 'node:fs', 'fs/*', 'node:fs/*', 'net', 'node:net', 'http', 'node:http', 'child_process', 'node:child_process', 'worker_threads', 'node:worker_threads'], message: 'libs/* do no I/O' },
        ],
      }],
    },
  },
  {
    // No app imports another app: what two apps share lives in libs/ (the server core in libs/server).
    files: ['apps/*/src/**/*.{ts,tsx}', 'libs/server/src/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['@psiform/api', '@psiform/api/*', '@psiform/worker', '@psiform/worker/*', '@psiform/web', '@psiform/web/*', '@psiform/cli', '@psiform/cli/*'], message: 'apps import libs, never another app: move what they share into libs/ (libs/server for the server core)' },
          { group: ['**/apps/*/src/**', '**/apps/*/dist/**'], message: 'apps import libs, never another app' },
        ],
      }],
    },
  },
  {
    files: ['apps/web/src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: { 'react-hooks/rules-of-hooks': 'error', 'react-hooks/exhaustive-deps': 'warn' },
    languageOptions: { globals: globals.browser },
  },
  {
    files: ['**/*.mjs', '**/*.js'],
    languageOptions: { globals: globals.node },
  },
  {
    // Browser tests pass callbacks to page.evaluate: they run in the page.
    files: ['test/e2e/**/*.mjs'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
  },
);
