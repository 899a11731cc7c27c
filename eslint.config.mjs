// ESLint 9 flat config with typescript-eslint 8.
//
// The per-folder blocks below are one of three nets that keep core/ pure (the others are the
// per-folder tsconfigs and the dependency-cruiser / bundle checks). tests/lintBoundaries.test.ts
// proves each rule here can fail.
//
// DO NOT RELAX THE BOUNDARY BLOCKS. Every rule is at "error" on purpose. In flat config a later
// block that sets the same rule replaces its options wholesale, so each folder block lists its
// full set of restrictions instead of extending another.
import { builtinModules } from 'node:module';
import js from '@eslint/js';
import { defineConfig } from 'eslint/config';
import globals from 'globals';
import tseslint from 'typescript-eslint';

/** Every Node built-in, bare and with the `node:` prefix (`fs`, `node:fs`, `fs/promises`, ...). */
const nodeBuiltins = [
  ...new Set(builtinModules.flatMap((name) => (name.startsWith('node:') ? [name] : [name, `node:${name}`]))),
].sort();

const builtinPaths = nodeBuiltins.map((name) => ({
  name,
  message: 'Node built-ins are not available here; do the I/O at the edge (CLI or main process).',
}));

/** Prefix-only built-ins (node:test, node:sea, node:sqlite...) are missing from builtinModules. */
const anyNodePrefix = {
  regex: '^node:',
  message: 'Node built-ins are not available here; do the I/O at the edge (CLI or main process).',
};

const electronPath = {
  name: 'electron',
  message: 'Electron belongs in app/main and app/preload only.',
};

const domGlobals = ['window', 'document', 'navigator'].map((name) => ({
  name,
  message: 'No DOM here; the UI lives in app/renderer.',
}));

const nodeGlobals = [
  'process',
  'require',
  'Buffer',
  'global',
  '__dirname',
  '__filename',
  'module',
  'exports',
  'setImmediate',
].map((name) => ({ name, message: 'Node globals are not available here.' }));

/** core/: no host at all. Keep pure numerics; clocks, timers, logging and I/O live at the edges. */
const coreHostGlobals = [
  ...domGlobals,
  ...nodeGlobals,
  ...['console'].map((name) => ({ name, message: 'No logging in core/: return a Finding instead.' })),
  ...['setTimeout', 'setInterval', 'clearTimeout', 'clearInterval', 'queueMicrotask', 'requestAnimationFrame'].map(
    (name) => ({ name, message: 'No timers in core/: it is synchronous, pure code.' }),
  ),
  { name: 'performance', message: 'No clocks in core/: time comes from the capture, not the machine.' },
  ...['TextDecoder', 'TextEncoder'].map((name) => ({
    name,
    message: 'Decode bytes at the edge (CLI, main or worker); core/ takes text.',
  })),
  { name: 'fetch', message: 'No network in core/.' },
  ...['globalThis', 'self'].map((name) => ({
    name,
    message: 'No reaching into the host global object from core/.',
  })),
];

const clockSyntax = [
  {
    selector: 'ImportExpression',
    message: 'No dynamic import(): it escapes no-restricted-imports and the neutral bundle check.',
  },
  { selector: "NewExpression[callee.name='Date']", message: 'No clocks in core/ (new Date()).' },
  { selector: "CallExpression[callee.name='Date']", message: 'No clocks in core/ (Date()).' },
  {
    selector: "MemberExpression[object.name='Date'][property.name='now']",
    message: 'No clocks in core/ (Date.now()).',
  },
];

export default defineConfig([
  {
    ignores: [
      '**/node_modules/',
      'dist/',
      '.tsbuild/',
      'release/',
      'sample-captures/',
      'bench-results/',
      '**/__screenshots__/',
      '**/.vitest-attachments/',
      'tmp/',
    ],
  },

  js.configs.recommended,
  tseslint.configs.recommended,

  {
    files: ['**/*.ts'],
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      // `interface Options extends Base {}` is a deliberate extension point.
      '@typescript-eslint/no-empty-object-type': ['error', { allowInterfaces: 'with-single-extends' }],
    },
  },

  // Node-side code: tests, tools, scripts, the CLI, the main process, build and config files.
  {
    files: [
      'tests/**',
      'tools/**',
      'scripts/**',
      'app/cli/**',
      'app/main/**',
      'app/*.{js,mjs,cjs,ts}',
      '*.{js,mjs,cjs,ts}',
    ],
    languageOptions: { globals: { ...globals.node } },
  },
  {
    files: ['**/*.cjs'],
    languageOptions: { sourceType: 'commonjs' },
  },

  // ---- core/: pure TypeScript. No Electron, no uPlot, no Node built-ins, no app/, no DOM,
  // ---- no clocks, no timers, no logging, no dynamic import.
  {
    files: ['core/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: [electronPath, { name: 'uplot', message: 'Charts belong in app/renderer.' }, ...builtinPaths],
          patterns: [
            anyNodePrefix,
            { group: ['**/app/**', 'app/**'], message: 'core/ must not depend on app/.' },
          ],
        },
      ],
      'no-restricted-globals': ['error', ...coreHostGlobals],
      'no-restricted-syntax': ['error', ...clockSyntax],
      'max-lines': ['warn', { max: 300 }],
    },
  },

  // ---- app/renderer/: browser code in a sandboxed renderer. No Electron, no Node.
  {
    files: ['app/renderer/**/*.ts'],
    languageOptions: { globals: { ...globals.browser, ...globals.worker } },
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: [electronPath, ...builtinPaths],
          patterns: [
            anyNodePrefix,
            {
              group: ['**/main/**', '**/cli/**', '**/preload/**'],
              message: 'The renderer talks to main only through the preload API (app/shared types).',
            },
          ],
        },
      ],
      'no-restricted-globals': ['error', ...nodeGlobals],
      'max-lines': ['warn', { max: 400 }],
    },
  },

  // ---- app/preload/: sandboxed preload; it cannot load Node built-ins anyway.
  {
    files: ['app/preload/**/*.ts'],
    languageOptions: { globals: { ...globals.browser } },
    rules: {
      'no-restricted-imports': ['error', { paths: builtinPaths, patterns: [anyNodePrefix] }],
      'no-restricted-globals': ['error', ...nodeGlobals.filter((g) => g.name !== 'process')],
      'max-lines': ['warn', { max: 400 }],
    },
  },

  // ---- app/main/: Electron main process. No DOM; raw ipcMain only in app/main/ipc.ts, which
  // ---- checks every sender.
  {
    files: ['app/main/**/*.ts'],
    ignores: ['app/main/ipc.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: [
            {
              name: 'electron',
              importNames: ['ipcMain'],
              message: 'Register IPC handlers in app/main/ipc.ts, which checks every sender.',
            },
          ],
        },
      ],
    },
  },
  {
    files: ['app/main/**/*.ts'],
    rules: {
      'no-restricted-globals': ['error', ...domGlobals],
      'max-lines': ['warn', { max: 400 }],
    },
  },

  // ---- app/cli/: plain Node. No Electron (its binary is not there), no DOM.
  {
    files: ['app/cli/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: [{ name: 'electron', message: 'The CLI runs under plain Node; Electron is not there.' }],
          patterns: [
            {
              group: ['**/main/**', '**/renderer/**', '**/preload/**'],
              message: 'The CLI uses core/ only, never the desktop app folders.',
            },
          ],
        },
      ],
      'no-restricted-globals': ['error', ...domGlobals],
      'max-lines': ['warn', { max: 400 }],
    },
  },

  // Other app/ folders (shared/...) get the size budget too.
  {
    files: ['app/shared/**/*.ts'],
    rules: { 'max-lines': ['warn', { max: 400 }] },
  },
]);
