/**
 * Lint: typescript-eslint's recommended rules, the layer rules of DEVELOPERS.md as import
 * restrictions, and a ban on raw unit-conversion literals (app/engine/units.ts holds them).
 *
 * Engine folders have a rank (layers.config.js); a folder imports only from folders of lower rank
 * and from itself: math, time < wheels < body, orbit < hybrid < control, plan < constraints < sim
 * < metrics < scenario < pipeline < study, export. Engine root files are rank 0.
 */
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import importX from 'eslint-plugin-import-x';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import { ENGINE_RANKS } from './layers.config.js';

const RANKS = ENGINE_RANKS;

/** For each engine folder: the folders it may not import (same rank or higher, not itself). */
function engineZones() {
  const zones = [];
  RANKS.forEach((group, r) => {
    for (const folder of group) {
      const from = RANKS.slice(r)
        .flat()
        .filter((f) => f !== folder)
        .map((f) => `./app/engine/${f}`);
      zones.push({
        target: `./app/engine/${folder}`,
        from,
        message: `app/engine/${folder} (rank ${r}) may only import lower-ranked engine folders (eslint.config.js RANKS)`,
      });
    }
  });
  // Root files (errors.ts, units.ts) import nothing from the folders.
  zones.push({ target: './app/engine/*.ts', from: RANKS.flat().map((f) => `./app/engine/${f}`), message: 'engine root files are rank 0' });
  return zones;
}

const unitLiterals = [
  {
    selector: "BinaryExpression[operator='/'][left.value=180][right.object.name='Math'][right.property.name='PI']",
    message: 'Use DEG_PER_RAD from app/engine/units.ts instead of 180 / Math.PI.',
  },
  {
    selector: "BinaryExpression[operator='/'][right.value=180][left.object.name='Math'][left.property.name='PI']",
    message: 'Use RAD_PER_DEG from app/engine/units.ts instead of Math.PI / 180.',
  },
  {
    selector:
      "BinaryExpression[operator='/'][right.value=180][left.type='BinaryExpression'][left.right.object.name='Math'][left.right.property.name='PI']",
    message: 'Use RAD_PER_DEG from app/engine/units.ts instead of (x * Math.PI) / 180.',
  },
  {
    selector:
      "BinaryExpression[operator='/'][right.object.name='Math'][right.property.name='PI'][left.type='BinaryExpression'][left.right.value=180]",
    message: 'Use DEG_PER_RAD from app/engine/units.ts instead of (x * 180) / Math.PI.',
  },
];

export default tseslint.config(
  { ignores: ['node_modules/**', 'dist/**', 'demo-output/**', 'test-output/**', 'coverage/**', '**/*.mjs', 'main/cli/study-worker.mjs'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { 'import-x': importX },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }],
      '@typescript-eslint/no-non-null-assertion': 'off',
      '@typescript-eslint/no-explicit-any': 'error',
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
      'no-restricted-syntax': ['error', ...unitLiterals],
      'import-x/no-duplicates': 'error',
      'import-x/no-cycle': ['error', { ignoreExternal: true }],
      eqeqeq: ['error', 'always', { null: 'ignore' }],
      'prefer-const': 'error',
    },
    settings: { 'import-x/resolver': { node: { extensions: ['.ts', '.tsx', '.js', '.mjs'] } } },
  },
  {
    files: ['app/engine/**/*.ts'],
    rules: {
      'import-x/no-restricted-paths': ['error', { zones: engineZones() }],
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['node:*', 'fs', 'path', 'os', 'child_process', 'worker_threads'],
              message: 'The engine is pure computation: no Node built-ins.',
            },
            {
              group: ['react', 'react-dom', 'react/*', 'three', 'three/*', 'electron', 'uplot'],
              message: 'The engine never imports UI, 3D or Electron code.',
            },
            {
              group: ['**/ui/**', '**/view3d/**', '**/bridge/**', '**/main/**'],
              message: 'The engine never imports the renderer or main/.',
            },
          ],
        },
      ],
    },
  },
  {
    files: ['app/ui/**', 'app/view3d/**', 'app/bridge/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['**/main/**', 'electron', 'node:*'],
              message: 'The renderer talks to main/ only through the preload bridge (app/bridge).',
            },
          ],
        },
      ],
    },
  },
  {
    files: ['app/ui/**/*.tsx'],
    plugins: { 'react-hooks': reactHooks },
    rules: { 'react-hooks/rules-of-hooks': 'error', 'react-hooks/exhaustive-deps': 'warn' },
  },
  {
    files: ['main/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        { patterns: [{ group: ['**/app/ui/**', '**/app/view3d/**'], message: 'main/ never imports the renderer views.' }] },
      ],
    },
  },
  {
    files: ['app/engine/units.ts'],
    rules: { 'no-restricted-syntax': 'off' },
  },
  {
    files: ['test/**'],
    rules: {
      '@typescript-eslint/no-explicit-any': 'off',
      'no-restricted-syntax': 'off',
    },
  },
);
