// Lint, including the layering rule: a file's powers can be read from its path.
//   src/shared   runs anywhere: no Node modules, no Electron, no SQLite, no DOM, nothing from main or renderer.
//   src/renderer needs the DOM: nothing from Node, Electron, SQLite or src/main.
//   src/main     needs Node: nothing from src/renderer.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import globals from 'globals';
import { builtinModules } from 'node:module';

const nodeModules = [...builtinModules, ...builtinModules.map((m) => `node:${m}`)];
const nativeOnly = ['electron', 'electron/*', 'better-sqlite3'];

const domGlobals = ['window', 'document', 'navigator', 'localStorage', 'sessionStorage', 'location', 'HTMLElement', 'fetch', 'alert'];
const nodeGlobals = ['process', 'Buffer', 'require', '__dirname', '__filename', 'global', 'module'];

export default tseslint.config(
  { ignores: ['node_modules/', 'dist/', 'out/', 'test-artifacts/', 'bench/results/'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['**/*.{ts,mjs,js}'],
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['src/shared/**/*.ts'],
    languageOptions: { globals: {} },
    rules: {
      'no-restricted-imports': ['error', {
        paths: [...nodeModules, ...nativeOnly].map((name) => ({ name, message: 'src/shared runs anywhere: no Node, Electron or SQLite imports.' })),
        patterns: [
          { group: ['**/main/**', '**/renderer/**'], message: 'src/shared must not import from src/main or src/renderer.' },
          { group: ['node:*', 'electron/*'], message: 'src/shared runs anywhere: no Node or Electron imports.' },
        ],
      }],
      'no-restricted-globals': ['error', ...[...domGlobals, ...nodeGlobals].map((name) => ({ name, message: 'src/shared runs anywhere: no DOM or Node globals.' }))],
    },
  },
  {
    files: ['src/renderer/**/*.ts'],
    languageOptions: { globals: { ...globals.browser } },
    rules: {
      'no-restricted-imports': ['error', {
        paths: [...nodeModules, ...nativeOnly].map((name) => ({ name, message: 'src/renderer talks to the back end only through the contract in src/shared.' })),
        patterns: [
          { group: ['**/main/**'], message: 'src/renderer must not import from src/main; use the contract in src/shared.' },
          { group: ['node:*', 'electron/*'], message: 'src/renderer has no Node or Electron access.' },
        ],
      }],
      'no-restricted-globals': ['error', ...nodeGlobals.map((name) => ({ name, message: 'src/renderer has no Node globals.' }))],
    },
  },
  {
    files: ['src/main/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [{ group: ['**/renderer/**'], message: 'src/main must not import renderer code.' }],
      }],
    },
  },
);
