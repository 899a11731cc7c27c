// Proves the lint net around core/ can fail: each forbidden snippet, linted as if it were a file
// under core/, must raise an error from the named boundary rule, and the very same snippet
// linted as a file under tests/ must raise nothing. Uses ESLint's documented Node API
// (ESLint class, lintText with filePath; ESLint 9 "Node.js API Reference").
// The file paths are virtual: nothing is written to disk.
import path from 'node:path';
import { ESLint } from 'eslint';
import { beforeAll, describe, expect, it } from 'vitest';

const repoRoot = path.resolve(__dirname, '..');

interface Case {
  readonly what: string;
  readonly code: string;
  readonly rule: string;
}

// Every snippet is otherwise clean (no unused bindings), so under tests/ it must lint to zero
// messages.
const forbiddenInCore: readonly Case[] = [
  { what: "import fs from 'node:fs'", code: "import fs from 'node:fs';\nexport const x = fs;\n", rule: 'no-restricted-imports' },
  { what: "import fs from 'fs'", code: "import fs from 'fs';\nexport const x = fs;\n", rule: 'no-restricted-imports' },
  {
    what: "import from 'fs/promises'",
    code: "import { readFile } from 'fs/promises';\nexport const x = readFile;\n",
    rule: 'no-restricted-imports',
  },
  {
    what: "import 'node:test' (prefix-only built-in)",
    code: "import test from 'node:test';\nexport const x = test;\n",
    rule: 'no-restricted-imports',
  },
  {
    what: "import from 'electron'",
    code: "import { app } from 'electron';\nexport const x = app;\n",
    rule: 'no-restricted-imports',
  },
  {
    what: "import from '../app/...'",
    code: "import { main } from '../app/cli/cli.js';\nexport const x = main;\n",
    rule: 'no-restricted-imports',
  },
  { what: "import('x')", code: "export const p = import('x');\n", rule: 'no-restricted-syntax' },
  { what: 'console.log(1)', code: 'console.log(1);\n', rule: 'no-restricted-globals' },
  { what: 'Date.now()', code: 'export const t = Date.now();\n', rule: 'no-restricted-syntax' },
  { what: 'new Date()', code: 'export const d = new Date();\n', rule: 'no-restricted-syntax' },
  { what: 'process.env', code: 'export const e = process.env;\n', rule: 'no-restricted-globals' },
  { what: 'Buffer.from', code: "export const b = Buffer.from('a');\n", rule: 'no-restricted-globals' },
  { what: 'new TextDecoder()', code: 'export const d = new TextDecoder();\n', rule: 'no-restricted-globals' },
  { what: 'performance.now()', code: 'export const t = performance.now();\n', rule: 'no-restricted-globals' },
  { what: 'setTimeout', code: 'setTimeout(() => undefined, 1);\n', rule: 'no-restricted-globals' },
  { what: 'document', code: 'export const d = document;\n', rule: 'no-restricted-globals' },
];

describe('lint boundaries (eslint.config.mjs)', () => {
  let eslint: ESLint;

  beforeAll(() => {
    eslint = new ESLint({ cwd: repoRoot });
  });

  async function lint(code: string, relativePath: string): Promise<ESLint.LintResult> {
    const results = await eslint.lintText(code, { filePath: path.join(repoRoot, relativePath) });
    expect(results).toHaveLength(1);
    return results[0]!;
  }

  it.each(forbiddenInCore)('$what under core/ is an error from $rule', async ({ code, rule }) => {
    const result = await lint(code, 'core/dsp/__lintProbe__.ts');
    const hits = result.messages.filter((m) => m.ruleId === rule && m.severity === 2);
    expect(hits.length, JSON.stringify(result.messages)).toBeGreaterThan(0);
  });

  it.each(forbiddenInCore)('$what under tests/ lints clean', async ({ code }) => {
    const result = await lint(code, 'tests/__lintProbe__.test.ts');
    expect(result.messages).toEqual([]);
  });

  it('plain numeric code under core/ lints clean (the core block is not a blanket failure)', async () => {
    const code = [
      "import type { Capture } from '../model/capture.js';",
      'export function rmsOf(samples: Float32Array): number {',
      '  let sum = 0;',
      '  for (let i = 0; i < samples.length; i++) sum += samples[i]! * samples[i]!;',
      '  return Math.sqrt(sum / samples.length);',
      '}',
      'export const rateOf = (c: Capture): number => c.sampleRateHz;',
      '',
    ].join('\n');
    const result = await lint(code, 'core/dsp/__lintProbe__.ts');
    expect(result.messages).toEqual([]);
  });

  it('the renderer block bans electron and Node built-ins', async () => {
    const code = "import { ipcRenderer } from 'electron';\nimport fs from 'node:fs';\nexport const x = [ipcRenderer, fs];\n";
    const result = await lint(code, 'app/renderer/__lintProbe__.ts');
    const hits = result.messages.filter((m) => m.ruleId === 'no-restricted-imports' && m.severity === 2);
    // One import per line; 'node:fs' is matched by both the path list and the ^node: pattern.
    expect([...new Set(hits.map((m) => m.line))].sort()).toEqual([1, 2]);
  });

  it('the CLI block bans electron and the DOM but allows Node built-ins', async () => {
    const banned = "import { app } from 'electron';\nexport const x = [app, document];\n";
    const bannedResult = await lint(banned, 'app/cli/__lintProbe__.ts');
    expect(bannedResult.messages.map((m) => m.ruleId).sort()).toEqual(['no-restricted-globals', 'no-restricted-imports']);

    const allowed = "import { readFile } from 'node:fs/promises';\nexport const x = [readFile, process.argv];\n";
    const allowedResult = await lint(allowed, 'app/cli/__lintProbe__.ts');
    expect(allowedResult.messages).toEqual([]);
  });
});
