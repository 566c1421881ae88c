// Psiform's lint rules (ESLint flat config), shared by every workspace through the root eslint.config.mjs.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';

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
    // libs stay pure: no React, three, Nest or I/O (DEVELOPERS.md). The Node-only parallel sampler is the one exception.
    files: ['libs/*/src/**/*.ts'],
    ignores: ['libs/orbitals/src/node/**'],
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
    files: ['**/*.mjs', '**/*.js'],
    languageOptions: { globals: { process: 'readonly', console: 'readonly', Buffer: 'readonly', URL: 'readonly', fetch: 'readonly', setTimeout: 'readonly', clearTimeout: 'readonly' } },
  },
);
