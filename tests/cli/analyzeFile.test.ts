import { execFile } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { promisify } from 'node:util';
import { beforeAll, describe, expect, it } from 'vitest';
import { analysisJsonText } from '../../app/cli/analyzeFile.js';
import { readCaptureFile, SPLIT_MIN_BYTES } from '../../app/cli/readCaptureFile.js';
import { analyzeCapture } from '../../core/pipeline.js';
import { benchCapturePath, benchFolder } from '../bench/benchCapture.js';
import { join } from 'node:path';

const run = promisify(execFile);

beforeAll(async () => {
  await run(process.execPath, ['app/build.mjs']);
}, 120_000);

describe('analyzeFile on a capture large enough for both cores', () => {
  it('writes the analysis one thread gives, byte for byte (two-thread parse and demodulation in the built CLI)', async () => {
    // 900k rows at 1 MS/s: about 36 MB, above the two-thread threshold.
    const path = await benchCapturePath(900_000);
    const { size } = (await import('node:fs')).statSync(path);
    expect(size).toBeGreaterThan(SPLIT_MIN_BYTES);
    const out = join(benchFolder(), 'analyze-file-test.json');
    await run(process.execPath, ['dist/cli/statorscope.js', 'analyze', path, '--json', out]);
    // The oracle: this thread alone (no split, no engine), through the same JSON writer.
    const imported = await readCaptureFile(path, {}, { minBytes: Infinity });
    const analysis = analyzeCapture(imported.capture, {});
    const version = JSON.parse(readFileSync('package.json', 'utf8')).version as string;
    const want = analysisJsonText({ ...analysis, findings: [...imported.findings, ...analysis.findings] }, path, version);
    expect(readFileSync(out, 'utf8')).toBe(want);
  }, 120_000);
});
