// Net 3 of the core/ purity checks: bundle the public surface for a neutral platform and prove
// nothing in it, including code buried in a third-party dependency, needs a Node built-in.
// esbuild's "neutral" platform marks no module as external (esbuild docs, "Platform"), so an
// import of `fs` or `node:fs` cannot resolve and the build fails. A `require('fs')` inside a
// try/catch is the exception: esbuild leaves it as an external require-call without an error,
// so the metafile's external imports are checked as well (negative control 2 shows it).
import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { builtinModules } from 'node:module';
import os from 'node:os';
import path from 'node:path';
import { build, type Message } from 'esbuild';
import { afterAll, describe, expect, it } from 'vitest';

const repoRoot = path.resolve(__dirname, '..');
const coreEntry = path.join(repoRoot, 'core', 'index.ts');

interface PurityReport {
  /** Build errors (unresolvable imports and the like); empty when the bundle was produced. */
  readonly errors: readonly string[];
  /** Warnings, e.g. a require() with a computed argument that esbuild left unbundled. */
  readonly warnings: readonly string[];
  /** Imports the bundle still needs from its host (esbuild metafile, `external: true`). */
  readonly externalImports: readonly string[];
  /** Calls of esbuild's require shim left in the output (a require esbuild could not bundle). */
  readonly leftoverRequireCalls: number;
}

const describeMessage = (m: Message): string =>
  `${m.location ? `${m.location.file}:${m.location.line}: ` : ''}${m.text}`;

async function bundleNeutral(entry: string): Promise<PurityReport> {
  try {
    const result = await build({
      entryPoints: [entry],
      absWorkingDir: repoRoot,
      bundle: true,
      write: false,
      platform: 'neutral',
      mainFields: ['module', 'main'],
      format: 'esm',
      target: 'es2022',
      outfile: path.join(os.tmpdir(), 'statorscope-purity-bundle.js'),
      metafile: true,
      logLevel: 'silent',
    });
    const externalImports = Object.values(result.metafile.outputs).flatMap((output) =>
      output.imports.filter((imp) => imp.external).map((imp) => `${imp.kind} ${imp.path}`),
    );
    const text = result.outputFiles.map((file) => file.text).join('\n');
    return {
      errors: [],
      warnings: result.warnings.map(describeMessage),
      externalImports,
      // Calls of the shim, not the `function __require()` helper that wraps CommonJS modules.
      leftoverRequireCalls: (text.match(/(?<!function\s+)\b__require\s*\(/g) ?? []).length,
    };
  } catch (error) {
    const errors = (error as { errors?: Message[] }).errors;
    if (!Array.isArray(errors)) throw error;
    return { errors: errors.map(describeMessage), warnings: [], externalImports: [], leftoverRequireCalls: 0 };
  }
}

function isPure(report: PurityReport): boolean {
  return (
    report.errors.length === 0 &&
    report.warnings.length === 0 &&
    report.externalImports.length === 0 &&
    report.leftoverRequireCalls === 0
  );
}

const scratchDirs: string[] = [];

/** Writes files into a fresh directory under os.tmpdir() and returns its path. */
function scratch(files: Readonly<Record<string, string>>): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'statorscope-purity-'));
  scratchDirs.push(dir);
  for (const [name, content] of Object.entries(files)) {
    const file = path.join(dir, name);
    mkdirSync(path.dirname(file), { recursive: true });
    writeFileSync(file, content);
  }
  return dir;
}

afterAll(() => {
  for (const dir of scratchDirs) rmSync(dir, { recursive: true, force: true });
});

describe('core/ bundles for a neutral platform (no Node built-ins)', () => {
  it('core/index.ts bundles with no errors, warnings, external imports or leftover require()', async () => {
    const report = await bundleNeutral(coreEntry);
    expect(report).toEqual({ errors: [], warnings: [], externalImports: [], leftoverRequireCalls: 0 });
    expect(isPure(report)).toBe(true);
  });

  it("negative control 1: an entry importing 'node:fs' fails the same build", async () => {
    const dir = scratch({ 'entry.ts': "import { readFileSync } from 'node:fs';\nexport const read = readFileSync;\n" });
    const report = await bundleNeutral(path.join(dir, 'entry.ts'));
    expect(isPure(report)).toBe(false);
    expect(report.errors.join('\n')).toContain('node:fs');
  });

  it("negative control 2: a dependency's plain require('fs') fails the build", async () => {
    const dir = scratch({
      'node_modules/plain-dep/package.json': '{"name":"plain-dep","version":"1.0.0","main":"index.js"}\n',
      'node_modules/plain-dep/index.js': "var fs = require('fs');\nmodule.exports = function () { return fs; };\n",
      'entry.ts': "import dep from 'plain-dep';\nexport const x = dep;\n",
    });
    const report = await bundleNeutral(path.join(dir, 'entry.ts'));
    expect(isPure(report)).toBe(false);
    expect(report.errors.length).toBeGreaterThan(0);
  });

  it("negative control 3: a dependency's require('fs') inside try/catch builds but is flagged", async () => {
    const dir = scratch({
      'node_modules/guarded-dep/package.json': '{"name":"guarded-dep","version":"1.0.0","main":"index.js"}\n',
      'node_modules/guarded-dep/index.js':
        "var fs;\ntry { fs = require('fs'); } catch (e) { fs = null; }\nmodule.exports = function () { return fs; };\n",
      'entry.ts': "import dep from 'guarded-dep';\nexport const x = dep;\n",
    });
    const report = await bundleNeutral(path.join(dir, 'entry.ts'));
    expect(report.errors).toEqual([]); // esbuild itself accepts this bundle...
    expect(report.externalImports).toEqual(['require-call fs']); // ...the metafile check does not
    expect(builtinModules).toContain('fs');
    expect(isPure(report)).toBe(false);
  });

  it("negative control 4: a dependency's require() with a computed name is flagged", async () => {
    const dir = scratch({
      'node_modules/computed-dep/package.json': '{"name":"computed-dep","version":"1.0.0","main":"index.js"}\n',
      'node_modules/computed-dep/index.js':
        "var name = ['f', 's'].join('');\nmodule.exports = function () { return require(name); };\n",
      'entry.ts': "import dep from 'computed-dep';\nexport const x = dep;\n",
    });
    const report = await bundleNeutral(path.join(dir, 'entry.ts'));
    expect(report.errors).toEqual([]);
    expect(report.leftoverRequireCalls).toBe(1);
    expect(isPure(report)).toBe(false);
  });

  it('positive control: a pure entry using fft.js (core\'s one allowed dependency) is pure', async () => {
    const dir = scratch({
      'entry.ts': [
        `import FFT from ${JSON.stringify(path.join(repoRoot, 'node_modules', 'fft.js', 'lib', 'fft.js'))};`,
        'export const size = (n: number): number => new FFT(n).size;',
        '',
      ].join('\n'),
    });
    expect(isPure(await bundleNeutral(path.join(dir, 'entry.ts')))).toBe(true);
  });
});
