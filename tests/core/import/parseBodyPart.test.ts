import { describe, expect, it } from 'vitest';
import { createSplittableCaptureParser, parseCaptureBytes, type ImportResult } from '../../../core/import/captureParser.js';
import { BodyPartParser, type BodyPart } from '../../../core/import/parseBodyPart.js';
import { CSV_LAYOUTS, formatCaptureCsv, type CsvChannelSpec, type CsvLayoutSpec } from '../../../core/synth/formatCaptureCsv.js';
import { createRandom } from '../../../core/synth/random.js';

// The oracle for every check here is the importer's own single pass over the same bytes: a body
// parsed in two parts and merged must give exactly that result (common practice, no source).

const encoder = (text: string): Uint8Array => new Uint8Array(Buffer.from(text, 'utf8'));
const sharedColumn = (length: number): Float32Array => new Float32Array(new SharedArrayBuffer(length * 4));

/** Seeded demo channels: excitation and two stator lines of a bench resolver turning slowly. */
function demoChannels(n: number, rateHz: number, seed: number): CsvChannelSpec[] {
  const rnd = createRandom(seed);
  const out: CsvChannelSpec[] = [
    { label: 'R1-R2', samples: new Float64Array(n) },
    { label: 'S1-S3', samples: new Float64Array(n) },
    { label: 'S2-S4', samples: new Float64Array(n) },
  ];
  for (let i = 0; i < n; i++) {
    const t = i / rateHz;
    const carrier = Math.sin(2 * Math.PI * 400 * t);
    const angle = 2 * Math.PI * 0.3 * t;
    (out[0].samples as Float64Array)[i] = 26 * Math.SQRT2 * carrier + 0.01 * rnd.normal();
    (out[1].samples as Float64Array)[i] = 11.8 * Math.SQRT2 * Math.sin(angle) * carrier + 0.01 * rnd.normal();
    (out[2].samples as Float64Array)[i] = 11.8 * Math.SQRT2 * Math.cos(angle) * carrier + 0.01 * rnd.normal();
  }
  return out;
}

const ROWS = 6000;
const RATE_HZ = 50000;

/**
 * A capture text in `layout`, with defects put into the data lines when `defects` is set: cells
 * that are not numbers (more than the listing cap), an empty cell, a short and a long row, an
 * overrange marker, blank lines, a quoted cell holding a line break, a gap and a backwards step
 * in the time column. Returns the text and the indices (into the lines) of the defects.
 */
function captureText(layout: CsvLayoutSpec, defects: boolean, seed: number): { text: string; marks: number[] } {
  const text = [...formatCaptureCsv({ sampleRateHz: RATE_HZ, startS: 0.0125, channels: demoChannels(ROWS, RATE_HZ, seed) }, layout)].join('');
  if (!defects) return { text, marks: [] };
  const eol = layout.lineEnding === 'crlf' ? '\r\n' : '\n';
  const lines = text.split(eol);
  const d = layout.delimiter;
  // Data lines sit after the head; defects go from line 3000 on (well past the sniffed 64 KiB).
  const marks: number[] = [];
  const cells = (k: number): string[] => lines[k].split(d);
  const hasTime = layout.timeColumn !== 'none';
  const valueCol = hasTime ? 1 : 0;
  for (let j = 0; j < 12; j++) {
    const k = 3000 + 40 * j;
    const c = cells(k);
    c[valueCol + (j % 2)] = j % 3 === 0 ? 'n/a' : '--';
    lines[k] = c.join(d);
    marks.push(k);
  }
  {
    const k = 3600;
    const c = cells(k);
    c[valueCol] = '';
    lines[k] = c.join(d);
    marks.push(k);
  }
  {
    const k = 3650;
    lines[k] = cells(k).slice(0, 2).join(d);
    marks.push(k);
    lines[k + 5] = `${lines[k + 5]}${d}7${d}8`;
    marks.push(k + 5);
  }
  {
    const k = 3700;
    const c = cells(k);
    c[valueCol] = layout.decimalMark === ',' ? '9,9E37' : '9.9E37';
    lines[k] = c.join(d);
    marks.push(k);
  }
  {
    const k = 3800;
    const c = cells(k);
    c[valueCol] = '"a\nb"';
    lines[k] = c.join(d);
    marks.push(k);
  }
  if (hasTime) {
    // A gap: three rows missing.
    lines.splice(3900, 3);
    marks.push(3900);
    // Backwards: two rows swapped.
    const t = lines[4000];
    lines[4000] = lines[4001];
    lines[4001] = t;
    marks.push(4000);
  }
  lines.splice(4100, 0, '', '');
  marks.push(4100);
  return { text: lines.join(eol), marks };
}

/** Byte offset of the start of each line (after LF), in the UTF-8 bytes. */
function lineStarts(bytes: Uint8Array): number[] {
  const out: number[] = [];
  for (let i = 0; i < bytes.length; i++) if (bytes[i] === 10) out.push(i + 1);
  return out;
}

/**
 * Parses bytes[0, at) as the head and bytes[at, end) as a part, in chunks of `chunk` bytes; with
 * `sliced`, the part is taken as a slice after every chunk and the slices merged one by one.
 */
function parseSplit(bytes: Uint8Array, at: number, chunk: number, sliced = false, shared?: { placed: number; parts: number; presizeSlack?: number }): ImportResult | undefined {
  // With `shared`, the head's columns lie in shared memory, so the part parses into their room
  // (structuredClone gives the part other views of the same memory, as a thread would have);
  // `shared` counts the parts that stayed in it.
  const slack = shared?.presizeSlack !== undefined ? { presizeSlack: shared.presizeSlack } : {};
  const head = createSplittableCaptureParser({ sizeHintBytes: bytes.length, ...slack, ...(shared ? { allocateSamples: sharedColumn } : {}) });
  // The plan is taken as soon as the layout is known (as the CLI does), the rest of the head
  // pushed after it.
  let plan: ReturnType<typeof head.bodyPartPlan>;
  for (let p = 0; p < at; p += chunk) {
    head.push(bytes.subarray(p, Math.min(p + chunk, at)));
    plan ??= head.bodyPartPlan(bytes.length - at);
  }
  plan ??= head.bodyPartPlan(bytes.length - at);
  if (plan === undefined) return undefined;
  if (shared) {
    const original = head.appendPart.bind(head);
    head.appendPart = (slice) => {
      shared.parts++;
      if (slice.placedAt !== undefined) shared.placed++;
      return original(slice);
    };
  }
  // Through a structured clone, as it reaches a worker thread.
  const part = new BodyPartParser(structuredClone(plan), sliced ? 64 : undefined);
  const slices: BodyPart[] = [];
  for (let p = at; p < bytes.length; p += chunk) {
    part.push(bytes.subarray(p, Math.min(p + chunk, bytes.length)));
    const slice = sliced ? part.takeSlice() : undefined;
    if (slice !== undefined) slices.push(structuredClone(slice));
  }
  slices.push(structuredClone(part.finish()));
  if (!sliced) return head.finishWithPart(slices[0]!);
  expect(slices.length).toBeGreaterThan(bytes.length - at > 40 * chunk ? 10 : 0);
  for (const slice of slices) if (!head.appendPart(slice)) return undefined;
  return head.finishAppended();
}

/** Index of the first sample whose bits differ, -1 when none does. */
function firstBitDifference(a: Float32Array, b: Float32Array): number {
  const x = new Uint32Array(a.buffer, a.byteOffset, a.length);
  const y = new Uint32Array(b.buffer, b.byteOffset, b.length);
  if (x.length !== y.length) return Math.min(x.length, y.length);
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return i;
  return -1;
}

/** Identical results: samples bit for bit, same findings and layout, interval to 1e-12 relative. */
function expectSame(got: ImportResult, want: ImportResult): void {
  expect(got.layout).toEqual(want.layout);
  expect(got.findings).toEqual(want.findings);
  expect(got.capture.sampleCount).toBe(want.capture.sampleCount);
  expect(got.capture.channels.map((c) => [c.column, c.label, c.unit])).toEqual(want.capture.channels.map((c) => [c.column, c.label, c.unit]));
  got.capture.channels.forEach((c, k) => {
    const w = want.capture.channels[k].samples;
    expect(firstBitDifference(c.samples, w)).toBe(-1);
  });
  // Sums over the two parts are added in another order: 1e-12 relative (common practice, no source).
  expect(Math.abs(got.capture.sampleRateHz / want.capture.sampleRateHz - 1)).toBeLessThan(1e-12);
  expect(Math.abs(got.capture.startS - want.capture.startS)).toBeLessThanOrEqual(1e-12 * Math.max(Math.abs(want.capture.startS), 1 / want.capture.sampleRateHz));
}

describe('a body parsed in two parts and merged gives the single-pass result', () => {
  for (const [name, layout] of Object.entries(CSV_LAYOUTS)) {
    for (const defects of [false, true]) {
      it(`layout "${name}"${defects ? ' with bad cells, ragged rows, overrange, gap, blank lines' : ''}`, () => {
        const { text, marks } = captureText(layout, defects, name.length);
        const bytes = encoder(text);
        const single = parseCaptureBytes(bytes);
        if (defects) expect(single.findings.length).toBeGreaterThan(5);
        const starts = lineStarts(bytes);
        // Line k (0-based in the text) starts at starts[k - 1] (BOM bytes included in offsets).
        const positions = new Set<number>();
        for (const k of marks) for (let dk = -1; dk <= 1; dk++) positions.add(starts[k + dk - 1]);
        const rnd = createRandom(99);
        for (let j = 0; j < 6; j++) positions.add(starts[Math.floor(2000 + rnd.uniform() * (starts.length - 2001))]);
        positions.add(starts[starts.length - 1]); // the part holds at most the last line
        const counts = { placed: 0, parts: 0 };
        for (const at of positions) {
          const merged = parseSplit(bytes, at, 4096 + (at % 5000));
          expect(merged, `split at byte ${at}`).toBeDefined();
          expectSame(merged!, single);
          // The part in slices of one chunk each (CRLF pairs and defects fall across slices).
          const inSlices = parseSplit(bytes, at, 3001 + (at % 2000), true);
          expect(inSlices, `split at byte ${at}, in slices`).toBeDefined();
          expectSame(inSlices!, single);
          // Into the room left in the head's shared columns, whole and in slices.
          for (const sliced of [false, true]) {
            const placed = parseSplit(bytes, at, 3001 + (at % 2000), sliced, counts);
            expect(placed, `split at byte ${at}, shared${sliced ? ', in slices' : ''}`).toBeDefined();
            expectSame(placed!, single);
          }
        }
        // Most parts went into the room (a split near the end of the file leaves no row of
        // slack to give; one with defects in the first chunk may be estimated short).
        expect(counts.placed).toBeGreaterThan(counts.parts / 2);
      });
    }
  }

  it('rows longer in the first chunk than later (fewer rows estimated than there are): head and part outgrow their room and still merge to the one-pass result', () => {
    const { text } = captureText(CSV_LAYOUTS.plain, false, 5);
    const lines = text.split('\n');
    // Trailing zeros on the first 1500 rows' values: the same numbers, printed longer.
    for (let k = 1; k <= 1500; k++) lines[k] = lines[k].split(',').map((c, j) => (j === 0 ? c : `${c}${c.includes('.') ? '' : '.'}0000000000`)).join(',');
    const bytes = encoder(lines.join('\n'));
    const single = parseCaptureBytes(bytes);
    const starts = lineStarts(bytes);
    const counts = { placed: 0, parts: 0 };
    for (const at of [starts[2500], starts[4000], starts[5500]]) {
      for (const sliced of [false, true]) {
        const merged = parseSplit(bytes, at, 4096, sliced, counts);
        expect(merged).toBeDefined();
        expectSame(merged!, single);
      }
    }
    // Some parts could not stay in their room (the heads all pass their fence here: the
    // estimate from the long rows of the first chunk is short).
    expect(counts.placed).toBeGreaterThan(0);
    expect(counts.placed).toBeLessThan(counts.parts);
  });

  it('with more slack asked for (as a split read does), rows a little longer at first than later still all find room: every part placed, the columns kept as views, the one-pass result', () => {
    const { text } = captureText(CSV_LAYOUTS.plain, false, 6);
    const lines = text.split('\n');
    // Two more digits on the first 2000 rows' values: about 10 % fewer rows estimated.
    for (let k = 1; k <= 2000; k++) lines[k] = lines[k].split(',').map((c, j) => (j === 0 || !c.includes('.') ? c : `${c}00`)).join(',');
    const bytes = encoder(lines.join('\n'));
    const single = parseCaptureBytes(bytes);
    const starts = lineStarts(bytes);
    for (const at of [starts[2600], starts[3000], starts[3400]]) {
      for (const sliced of [false, true]) {
        const counts = { placed: 0, parts: 0, presizeSlack: 0.4 };
        const merged = parseSplit(bytes, at, 4096, sliced, counts)!;
        expectSame(merged, single);
        expect(counts.placed).toBe(counts.parts);
        for (const c of merged.capture.channels) expect(c.samples.buffer).toBeInstanceOf(SharedArrayBuffer);
        expect(merged.capture.channels[0]!.samples.length).toBeLessThan(merged.capture.channels[0]!.samples.buffer.byteLength / 4);
      }
    }
    expect(() => createSplittableCaptureParser({ presizeSlack: -1 })).toThrow(RangeError);
  });

  it('a part that is empty, and a file ending without a line break, merge as well', () => {
    const { text } = captureText(CSV_LAYOUTS.plain, false, 3);
    const bytes = encoder(text.trimEnd());
    const single = parseCaptureBytes(bytes);
    const starts = lineStarts(bytes);
    expectSame(parseSplit(bytes, starts[starts.length - 1], 65536)!, single);
    const whole = encoder(`${text.trimEnd()}\n`);
    expectSame(parseSplit(whole, whole.length, 65536)!, parseCaptureBytes(whole));
  });

  it('refuses to finish with a head that stops between CR and LF, or mid-line', () => {
    const { text } = captureText(CSV_LAYOUTS['crlf-bom-quoted'], false, 4);
    const bytes = encoder(text);
    const at = lineStarts(bytes)[4000] - 1; // just before the LF of a CRLF
    expect(() => parseSplit(bytes, at, 65536)).toThrow(RangeError);
    expect(() => parseSplit(bytes, at - 5, 65536)).toThrow(RangeError);
  });

  it('gives no plan before the layout is known, for UTF-16 or for CR-only line ends', () => {
    const { text } = captureText(CSV_LAYOUTS.plain, false, 5);
    const bytes = encoder(text);
    const early = createSplittableCaptureParser({ sizeHintBytes: bytes.length });
    early.push(bytes.subarray(0, 1000));
    expect(early.bodyPartPlan(bytes.length - 1000)).toBeUndefined();

    const cr = encoder(text.replace(/\n/g, '\r'));
    const crParser = createSplittableCaptureParser({});
    crParser.push(cr.subarray(0, 200000));
    expect(crParser.bodyPartPlan(1)).toBeUndefined();

    const utf16 = new Uint8Array(Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]));
    const u = createSplittableCaptureParser({});
    u.push(utf16.subarray(0, 300000));
    expect(u.bodyPartPlan(1)).toBeUndefined();
  });

  it('hands the row limit back to a single pass (undefined), and merges just under it', () => {
    const { text } = captureText(CSV_LAYOUTS.plain, true, 6);
    const bytes = encoder(text);
    const starts = lineStarts(bytes);
    const at = starts[4500];
    const rows = parseCaptureBytes(bytes).capture.sampleCount;
    const run = (maxSamples: number): ImportResult | undefined | 'no plan' => {
      const head = createSplittableCaptureParser({ sizeHintBytes: bytes.length, maxSamples });
      head.push(bytes.subarray(0, at));
      const plan = head.bodyPartPlan(bytes.length - at);
      if (plan === undefined) return 'no plan';
      const part = new BodyPartParser(plan);
      part.push(bytes.subarray(at));
      return head.finishWithPart(part.finish());
    };
    expect(run(rows - 1)).toBeUndefined();
    // The head alone passed the limit: no plan, the single pass reports it.
    expect(run(1000)).toBe('no plan');
    expectSame(run(rows) as ImportResult, parseCaptureBytes(bytes, { maxSamples: rows }));
  });
});
