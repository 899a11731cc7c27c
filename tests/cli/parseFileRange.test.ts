import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseFileRange } from '../../app/cli/parseFileRange.js';
import { createRangeClaim, takeTail } from '../../app/cli/rangeClaim.js';
import { createSplittableCaptureParser, parseCaptureBytes } from '../../core/import/captureParser.js';
import { CSV_LAYOUTS, formatCaptureCsv } from '../../core/synth/formatCaptureCsv.js';
import { createRandom } from '../../core/synth/random.js';

/** A seeded capture of a rudder-angle repeater's lines, its bytes and its path. */
function capture(rows: number): { path: string; bytes: Uint8Array } {
  const rnd = createRandom(31);
  const ch = (phase: number): Float64Array => Float64Array.from({ length: rows }, (_, i) => 8 * Math.sin(2 * Math.PI * 60 * (i / 6000) + phase) + 0.01 * rnd.normal());
  const text = [...formatCaptureCsv({ sampleRateHz: 6000, startS: 0, channels: [{ label: 'R1-R2', samples: ch(0) }, { label: 'S1-S3', samples: ch(1) }] }, CSV_LAYOUTS.plain)].join('');
  const path = join(mkdtempSync(join(tmpdir(), 'statorscope-range-')), 'repeater.csv');
  writeFileSync(path, text);
  return { path, bytes: new Uint8Array(readFileSync(path)) };
}

/** Index of the first line start (byte after an LF) at or after `from`. */
function lineStartAtOrAfter(bytes: Uint8Array, from: number): number {
  let i = from;
  while (bytes[i - 1] !== 10) i++;
  return i;
}

describe('parseFileRange', () => {
  const { path, bytes } = capture(20000);
  const single = parseCaptureBytes(bytes);
  const at = lineStartAtOrAfter(bytes, 100_000);
  const head = createSplittableCaptureParser({ sizeHintBytes: bytes.length });
  head.push(bytes.subarray(0, at));
  const plan = head.bodyPartPlan(bytes.length - at)!;
  // Every line after `at` is one row (the file ends with a line feed).
  const headRows = single.capture.sampleCount - [...bytes.subarray(at)].filter((b) => b === 10).length;

  it('reads its range in chunks of any size into the rows the one-pass parse has there (the oracle)', async () => {
    for (const chunkBytes of [1000, 4096, 1 << 20]) {
      const part = await parseFileRange({ path, start: at, end: bytes.length, plan, chunkBytes });
      expect(part.rows).toBe(single.capture.sampleCount - headRows);
      const s1 = single.capture.channels[1]!.samples;
      expect(part.columns[2]).toEqual(s1.subarray(headRows));
    }
  });

  it('stops at the first line of a tail taken from it, finishing its last line up to there', async () => {
    const chunkBytes = 4096;
    for (const cutChunk of [1, 7, 20]) {
      const boundary = at + cutChunk * chunkBytes;
      const lineStart = lineStartAtOrAfter(bytes, boundary);
      const claim = createRangeClaim(Math.ceil((bytes.length - at) / chunkBytes));
      expect(takeTail(claim, cutChunk, lineStart - boundary)).toBe(true);
      const part = await parseFileRange({ path, start: at, end: bytes.length, plan, chunkBytes, claim });
      const rows = [...bytes.subarray(at, lineStart)].filter((b) => b === 10).length;
      expect(part.rows).toBe(rows);
      expect(part.columns[1]).toEqual(single.capture.channels[0]!.samples.subarray(headRows, headRows + rows));
    }
  });
});
