import js from '@eslint/js';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

// Layering: dependencies point down only (ui → state → workers → db → core); see DEVELOPERS.md.
const layer = (name) => [`**/${name}`, `**/${name}/**`, `@/${name}/**`];
const uiLibraries = ['react', 'react-dom', 'react-dom/*', 'react/*', 'zustand', 'zustand/*', 'dexie', 'dexie-react-hooks', '@tanstack/*', 'comlink'];
const nodeBuiltins = ['node:*', 'fs', 'fs/*', 'path', 'os', 'child_process', 'worker_threads', 'url', 'crypto', 'stream'];
const domGlobals = ['window', 'document', 'navigator', 'localStorage', 'sessionStorage', 'indexedDB', 'location', 'self', 'HTMLElement', 'Blob', 'File', 'FileReader', 'fetch'];

function restrict(groups, message) {
  return ['error', { patterns: [{ group: groups, message }] }];
}

export default tseslint.config(
  { ignores: ['dist/**', 'dist-cli/**', 'node_modules/**', 'test-results/**', 'test-results-*/**', 'dist-e2e-*/**', 'playwright-report/**', 'bench/out/**', 'sample-corpus/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { ecmaVersion: 2023, sourceType: 'module', globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/consistent-type-imports': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      eqeqeq: ['error', 'always'],
      'no-console': 'off',
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
  },
  {
    files: ['src/core/**/*.ts'],
    languageOptions: { globals: {} },
    rules: {
      'no-restricted-imports': restrict(
        [...uiLibraries, ...nodeBuiltins, ...layer('ui'), ...layer('db'), ...layer('state'), ...layer('workers'), ...layer('cli')],
        'src/core is pure TypeScript: no React, Dexie, DOM, Node built-ins or upper layers.',
      ),
      'no-restricted-globals': ['error', ...domGlobals, 'process', 'Buffer', 'require'],
    },
  },
  {
    files: ['src/db/**/*.ts'],
    rules: {
      'no-restricted-imports': restrict(
        ['react', 'react-dom', 'zustand', ...layer('ui'), ...layer('state'), ...layer('workers'), ...layer('cli')],
        'src/db may import core and Dexie only.',
      ),
    },
  },
  {
    files: ['src/workers/**/*.ts'],
    rules: {
      'no-restricted-imports': restrict(
        ['react', 'react-dom', 'zustand', ...layer('ui'), ...layer('state'), ...layer('cli')],
        'src/workers may import core and db only.',
      ),
    },
  },
  {
    files: ['src/state/**/*.ts'],
    rules: {
      'no-restricted-imports': restrict([...layer('ui'), ...layer('cli')], 'src/state may not import ui or cli.'),
    },
  },
  {
    files: ['src/cli/**/*.ts'],
    rules: {
      'no-restricted-imports': restrict(
        [...uiLibraries, ...layer('ui'), ...layer('db'), ...layer('state'), ...layer('workers')],
        'src/cli runs in Node over core only.',
      ),
    },
  },
  {
    files: ['src/ui/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: {
      ...reactHooks.configs.recommended.rules,
      'no-restricted-imports': restrict(layer('cli'), 'The UI never imports the command line.'),
    },
  },
);
