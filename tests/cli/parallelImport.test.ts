import { execFile } from 'node:child_process';
import { mkdtempSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import type { Worker } from 'node:worker_threads';
import { beforeAll, describe, expect, it } from 'vitest';
import { readCaptureFile, type SplitOptions } from '../../app/cli/readCaptureFile.js';
import type { ImportResult } from '../../core/import/captureParser.js';
import { CaptureError } from '../../core/model/errors.js';
import { CSV_LAYOUTS, formatCaptureCsv, type CsvLayoutSpec } from '../../core/synth/formatCaptureCsv.js';
import { createRandom } from '../../core/synth/random.js';

// Oracle: the same file read in one pass on one thread; the two-thread read must give exactly
// that (common practice, no source).

const WORKER = resolve('dist/cli/parseWorker.js');
const sharedColumn = (length: number): Float32Array => new Float32Array(new SharedArrayBuffer(length * 4));
const dir = mkdtempSync(join(tmpdir(), 'statorscope-split-'));

beforeAll(async () => {
  await promisify(execFile)(process.execPath, ['app/build.mjs']);
}, 120_000);

/** A seeded capture of a wind-vane transmitter's stator lines, written in `layout`. */
function writeCapture(name: string, layout: CsvLayoutSpec, rows: number, seed: number, edit?: (lines: string[]) => void): string {
  const rnd = createRandom(seed);
  const ch = (phase: number): Float64Array => Float64Array.from({ length: rows }, (_, i) => 10 * Math.sin(2 * Math.PI * 400 * (i / 20000) + phase) + 0.01 * rnd.normal());
  let text = [...formatCaptureCsv({ sampleRateHz: 20000, startS: 0, channels: [{ label: 'R1-R2', samples: ch(0) }, { label: 'S1-S3', samples: ch(1) }, { label: 'S3-S2', samples: ch(2) }] }, layout)].join('');
  if (edit) {
    const eol = layout.lineEnding === 'crlf' ? '\r\n' : '\n';
    const lines = text.split(eol);
    edit(lines);
    text = lines.join(eol);
  }
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

function expectSame(got: ImportResult, want: ImportResult): void {
  expect(got.layout).toEqual(want.layout);
  expect(got.findings).toEqual(want.findings);
  expect(got.capture.sampleCount).toBe(want.capture.sampleCount);
  got.capture.channels.forEach((c, k) => {
    const x = new Uint32Array(c.samples.buffer, c.samples.byteOffset, c.samples.length);
    const w = want.capture.channels[k].samples;
    const y = new Uint32Array(w.buffer, w.byteOffset, w.length);
    let diff = x.length === y.length ? -1 : 0;
    for (let i = 0; i < x.length && diff < 0; i++) if (x[i] !== y[i]) diff = i;
    expect(diff).toBe(-1);
  });
  // 1e-12 relative: the parts' sums are added in another order (common practice, no source).
  expect(Math.abs(got.capture.sampleRateHz / want.capture.sampleRateHz - 1)).toBeLessThan(1e-12);
  expect(Math.abs(got.capture.startS - want.capture.startS)).toBeLessThanOrEqual(1e-12 / want.capture.sampleRateHz);
}

async function readSplit(path: string, split: SplitOptions): Promise<{ result: ImportResult; how: string[] }> {
  const how: string[] = [];
  const result = await readCaptureFile(path, {}, { workerScript: WORKER, ...split, onSplit: (h) => how.push(h), onHeadParsed: () => { how.push('head-parsed'); return false; } });
  return { result, how };
}

describe('readCaptureFile on two threads', () => {
  const defects = (lines: string[]): void => {
    for (let j = 0; j < 9; j++) lines[20000 + 997 * j] = lines[20000 + 997 * j].replace(/,[^,]*$/, ',err');
    lines.splice(25000, 4); // a gap in the time column
    lines.splice(26000, 0, ''); // a blank line
  };
  const cases: [string, CsvLayoutSpec, ((l: string[]) => void) | undefined][] = [
    ['plain', CSV_LAYOUTS.plain, defects],
    ['crlf-bom-quoted', CSV_LAYOUTS['crlf-bom-quoted'], undefined],
    ['preamble-ms-mV-semicolon', CSV_LAYOUTS['preamble-ms-mV-semicolon'], undefined],
    ['rounded-time', CSV_LAYOUTS['rounded-time'], defects],
  ];
  for (const [name, layout, edit] of cases) {
    it(`layout "${name}": the worker's half merges into the one-pass result at several split points`, async () => {
      const path = writeCapture(`${name}.csv`, layout, 40000, 11, edit);
      const single = await readSplit(path, { minBytes: Infinity });
      expect(single.how).toEqual(['single']);
      const rnd = createRandom(5);
      for (const fraction of [0.5, 0.5 + 0.4 * rnd.uniform(), 0.1 + 0.4 * rnd.uniform(), 0.62]) {
        const size = (await import('node:fs')).statSync(path).size;
        const { result, how } = await readSplit(path, { splitAt: Math.floor(size * fraction) });
        expect(how).toEqual(['head-parsed', 'split']);
        expectSame(result, single.result);
      }
      // The worker's answer in slices (one per 1 MiB chunk read), merged as they come.
      const sliced = await readSplit(path, { splitAt: 1000, sliceBytes: 1 });
      expect(sliced.how).toEqual(['head-parsed', 'split']);
      expectSame(sliced.result, single.result);
    }, 60_000);
  }

  it('merges the answer of the worker in slices as they come, and reads again in one pass when the worker stops after some', async () => {
    // About 7 MB: seven 1 MiB chunks for the worker, a slice after each; bad cells across them.
    const path = writeCapture('sliced.csv', CSV_LAYOUTS.plain, 200000, 13, (lines) => {
      for (let j = 1; j < 10; j++) lines[20000 * j] = lines[20000 * j].replace(/,[^,]*$/, ',err');
    });
    const single = await readSplit(path, { minBytes: Infinity });
    const sliced = await readSplit(path, { splitAt: 1000, sliceBytes: 1 });
    // This thread, done with its head at once, may take over the tail of the worker's range.
    expect(sliced.how.filter((h) => h !== 'tail-taken')).toEqual(['head-parsed', 'split']);
    expectSame(sliced.result, single.result);
    // A worker that stops after its third answer (so at least two slices came before the end).
    const quitting = join(dir, 'quittingWorker.js');
    writeFileSync(quitting, [
      "const { parentPort } = require('node:worker_threads');",
      'const post = parentPort.postMessage.bind(parentPort);',
      'let answers = 0;',
      'parentPort.postMessage = (message, transfer) => { post(message, transfer); if (++answers === 3) process.exit(3); };',
      `require(${JSON.stringify(WORKER)});`,
    ].join('\n'));
    const quit = await readSplit(path, { splitAt: 1000, sliceBytes: 1, workerScript: quitting });
    expect(quit.how).toEqual(['head-parsed', 'worker-failed']);
    expectSame(quit.result, single.result);
  }, 60_000);

  it('takes over the tail of the worker\'s range and merges it after the worker\'s part, for any cut (in and across lines, in the last chunk), with the placement and without', async () => {
    const path = writeCapture('taken.csv', CSV_LAYOUTS.plain, 60000, 17, defects);
    const single = await readSplit(path, { minBytes: Infinity });
    const { size } = statSync(path);
    const rnd = createRandom(23);
    for (const [k, chunkBytes] of [4096, 7777, 65536].entries()) {
      const splitAt = Math.floor(size * (0.2 + 0.1 * k));
      for (const cut of [splitAt + 3 * chunkBytes, splitAt + Math.floor(rnd.uniform() * (size - splitAt)), size - 10]) {
        for (const shared of [false, true]) {
          const how: string[] = [];
          const result = await readCaptureFile(path, shared ? { allocateSamples: sharedColumn } : {}, {
            workerScript: WORKER, splitAt, chunkBytes, sliceBytes: 3 * chunkBytes, takeTailAt: cut, onSplit: (h) => how.push(h),
          });
          expect(how, `chunk ${chunkBytes}, cut at ${cut}`).toEqual(['tail-taken', 'split']);
          expectSame(result, single.result);
        }
      }
    }
  }, 60_000);

  it('hands the parse worker on when asked at the head (it then answers a helper job after the read) and terminates it otherwise', async () => {
    const path = writeCapture('handed.csv', CSV_LAYOUTS.plain, 30000, 19);
    const single = await readSplit(path, { minBytes: Infinity });
    for (const keep of [true, false]) {
      let handed: Worker | undefined;
      const result = await readCaptureFile(path, {}, { workerScript: WORKER, splitAt: 300000, onHeadParsed: (w) => ((handed = w), keep) });
      expectSame(result, single.result);
      expect(handed).toBeDefined();
      if (keep) {
        // Answers through shared memory (DEMOD_DONE = 1) while it runs.
        const alive = new Int32Array(new SharedArrayBuffer(4));
        handed!.postMessage({ kind: 'listen', alive });
        for (let k = 0; k < 200 && Atomics.load(alive, 0) !== 1; k++) await new Promise((r) => setTimeout(r, 10));
        expect(Atomics.load(alive, 0)).toBe(1);
        await handed!.terminate();
      } else {
        // threadId turns -1 once the worker no longer runs (Node's worker_threads documentation).
        for (let k = 0; k < 200 && handed!.threadId !== -1; k++) await new Promise((r) => setTimeout(r, 10));
        expect(handed!.threadId).toBe(-1);
      }
    }
  }, 60_000);

  it('falls back to one thread: small file, unusable split point, failing worker, row limit', async () => {
    const path = writeCapture('fallback.csv', CSV_LAYOUTS.plain, 30000, 12, defects);
    const single = await readSplit(path, { minBytes: Infinity });
    // Small file, default threshold: no split.
    expect((await readSplit(path, {})).how).toEqual(['single']);
    // A split point inside the first chunk already read moves to the first line start after it;
    // one past the last line start cannot be used.
    const early = await readSplit(path, { splitAt: 10 });
    expect(early.how).toEqual(['head-parsed', 'split']);
    expectSame(early.result, single.result);
    const size = (await import('node:fs')).statSync(path).size;
    expect((await readSplit(path, { splitAt: size - 2 })).how).toEqual(['single']);
    // A worker that fails: this thread parses the second half.
    const bad = join(dir, 'badWorker.js');
    writeFileSync(bad, "throw new Error('no worker today');\n");
    const failed = await readSplit(path, { splitAt: 700000, workerScript: bad });
    expect(failed.how).toEqual(['head-parsed', 'worker-failed']);
    expectSame(failed.result, single.result);
    // A row limit met by the two halves together: read again in one pass, same error.
    const limit = single.result.capture.sampleCount - 10;
    const oneError = await readCaptureFile(path, { maxSamples: limit }, { minBytes: Infinity }).catch((e: unknown) => e);
    const how: string[] = [];
    const splitError = await readCaptureFile(path, { maxSamples: limit }, { workerScript: WORKER, splitAt: 700000, onSplit: (h) => how.push(h) }).catch((e: unknown) => e);
    expect(oneError).toBeInstanceOf(CaptureError);
    expect(splitError).toEqual(oneError);
    expect((splitError as CaptureError).message).toBe((oneError as CaptureError).message);
    expect(how).toEqual(['merge-refused']);
  }, 60_000);

  it('a failing worker on a file of many chunks: this thread reads the rest without losing a row', async () => {
    // Several MiB after the split point, so the fallback reads many chunks through its two
    // alternating buffers (a read issued into the buffer still being parsed would lose rows).
    const path = writeCapture('fallback-big.csv', CSV_LAYOUTS.plain, 200_000, 14);
    const single = await readSplit(path, { minBytes: Infinity });
    const bad = join(dir, 'badWorker2.js');
    writeFileSync(bad, "throw new Error('no worker today');\n");
    const failed = await readSplit(path, { splitAt: 1_500_000, workerScript: bad });
    expect(failed.how).toEqual(['head-parsed', 'worker-failed']);
    expect(failed.result.capture.sampleCount).toBe(200_000);
    expectSame(failed.result, single.result);
  }, 60_000);

  it('does not split UTF-16 or CR-only files', async () => {
    const lf = writeCapture('cr.csv', CSV_LAYOUTS.plain, 30000, 13);
    const text = (await import('node:fs')).readFileSync(lf, 'utf8');
    const cr = join(dir, 'cr-only.csv');
    writeFileSync(cr, text.replace(/\n/g, '\r'));
    const crRead = await readSplit(cr, { splitAt: 700000 });
    expect(crRead.how).toEqual(['single']);
    const u16 = join(dir, 'utf16.csv');
    writeFileSync(u16, Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]));
    const u16Read = await readSplit(u16, { splitAt: 1400000 });
    expect(u16Read.how).toEqual(['single']);
    expectSame(u16Read.result, (await readSplit(u16, { minBytes: Infinity })).result);
  }, 60_000);
});
