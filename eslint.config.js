import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';

export default tseslint.config(
  { ignores: ['dist', 'dist-cli', 'node_modules', 'test-results', 'playwright-report', 'public'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.browser, ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['src/ui/**/*.tsx', 'src/ui/**/*.ts', 'src/*.tsx'],
    plugins: { 'react-hooks': reactHooks },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
    },
  },
  {
    // The pure layer cannot see the page: no React, Plotly, store or worker imports.
    files: ['src/core/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['react', 'react-dom', 'react/*', 'react-dom/*'], message: 'src/core must not import React.' },
          { group: ['plotly.js*', '*plotly*'], message: 'src/core must not import Plotly.' },
          { group: ['zustand', 'zustand/*', '**/state/**', '**/state'], message: 'src/core must not import the store.' },
          { group: ['**/ui/**', '**/ui', '**/worker/**', '**/worker'], message: 'src/core must not import UI or worker code.' },
          { group: ['**/cli/**', '**/cli'], message: 'src/core must not import the command line.' },
        ],
      }],
      'no-restricted-globals': ['error', 'document', 'window', 'self', 'postMessage', 'localStorage'],
    },
  },
  {
    // The store sits below the page: state may import the core, never the UI
    // (DEVELOPERS.md, "Folders"; test/architecture/import-direction.test.ts
    // checks the resolved paths too).
    files: ['src/state/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['react', 'react-dom', 'react/*', 'react-dom/*'], message: 'src/state must not import React components; the UI reads the store, not the other way round.' },
          { group: ['**/ui/**', '**/ui'], message: 'src/state must not import src/ui.' },
        ],
      }],
    },
  },
);
