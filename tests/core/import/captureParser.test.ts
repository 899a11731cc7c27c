import { describe, expect, it } from 'vitest';
import { createCaptureParser, parseCaptureBytes, type ImportOptions, type ImportResult } from '../../../core/import/captureParser.js';
import { CaptureError } from '../../../core/model/errors.js';
import { createRandom } from '../../../core/synth/random.js';
import { CSV_LAYOUTS, formatCaptureCsv, type CsvChannelSpec, type CsvLayoutSpec } from '../../../core/synth/formatCaptureCsv.js';

const bytesOf = (text: string): Uint8Array => new Uint8Array(Buffer.from(text, 'utf8'));
const parseText = (text: string, options?: ImportOptions): ImportResult => parseCaptureBytes(bytesOf(text), options);

/** Float32 unit in the last place at |x| (IEEE 754 binary32: 24-bit significand). */
function ulp32(x: number): number {
  const a = Math.abs(Math.fround(x));
  if (a < 1.1754943508222875e-38) return 1.401298464324817e-45;
  return 2 ** (Math.floor(Math.log2(a)) - 23);
}

/** Seeded demo channels: a 400 Hz excitation and two stator lines of a turning synchro, plus noise. */
function demoChannels(n: number, rateHz: number, seed: number): CsvChannelSpec[] {
  const rnd = createRandom(seed);
  const ref = new Float64Array(n);
  const s1 = new Float64Array(n);
  const s2 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / rateHz;
    const carrier = Math.sin(2 * Math.PI * 400 * t);
    const angle = 2 * Math.PI * 0.5 * t;
    ref[i] = 26 * Math.SQRT2 * carrier + 0.01 * rnd.normal();
    s1[i] = 11.8 * Math.SQRT2 * Math.sin(angle) * carrier + 0.01 * rnd.normal();
    s2[i] = 11.8 * Math.SQRT2 * Math.sin(angle + (2 * Math.PI) / 3) * carrier * 1e-3; // a small line, tens of mV
  }
  return [
    { label: 'R1-R2, excitation', samples: ref },
    { label: 'S1-S3', samples: s1 },
    { label: 'S3-S2 "low"', samples: s2 },
  ];
}

function formatText(spec: { sampleRateHz: number; startS: number; channels: CsvChannelSpec[] }, layout: CsvLayoutSpec, chunkRows?: number): string {
  return [...formatCaptureCsv(spec, layout, chunkRows)].join('');
}

describe('parseCaptureBytes(bytes) round trip of every named layout', () => {
  const rateHz = 20000;
  const startS = -0.0125;
  const channels = demoChannels(3000, rateHz, 7);
  for (const [name, layout] of Object.entries(CSV_LAYOUTS)) {
    it(`round-trips layout "${name}"`, () => {
      const text = formatText({ sampleRateHz: rateHz, startS, channels }, layout);
      const { capture, layout: seen, findings } = parseText(text);
      expect(findings).toEqual([]);
      expect(capture.sampleCount).toBe(3000);
      expect(capture.channels).toHaveLength(3);
      // Sample interval from the whole record, 1e-9 relative, also for rounded time stamps
      // (common practice, no source).
      expect(Math.abs(capture.sampleRateHz / rateHz - 1)).toBeLessThan(1e-9);
      const q = layout.timeDigits === undefined ? 1e-9 : 10 ** (-1 - layout.timeDigits + 1);
      expect(Math.abs(capture.startS - startS)).toBeLessThan(q);
      expect(seen.delimiter).toBe(layout.delimiter);
      expect(seen.decimalMark).toBe(layout.decimalMark);
      expect(seen.bom).toBe(layout.bom);
      expect(seen.lineEnding).toBe(layout.lineEnding);
      expect(seen.timeColumn).toBe(layout.timeColumn === 'none' ? null : 0);
      expect(seen.timeUnit).toBe(layout.timeColumn === 'none' ? null : layout.timeColumn);
      expect(seen.sampleIntervalSource).toBe(layout.timeColumn === 'none' ? 'preamble' : 'time-column');
      expect(seen.headerLine === null).toBe(layout.header === 'none');
      expect(seen.unitsLine === null).toBe(layout.header !== 'labels+units');
      capture.channels.forEach((ch, k) => {
        expect(ch.column).toBe(k + (layout.timeColumn === 'none' ? 0 : 1));
        expect(ch.label).toBe(layout.header === 'none' ? `CH${k + 1}` : channels[k].label);
        expect(ch.samples).toBeInstanceOf(Float32Array);
        expect(ch.samples.length).toBe(3000);
        const want = channels[k].samples;
        let worst = 0;
        for (let i = 0; i < 3000; i++) {
          const w = want[i];
          // Exact printing: the Float32 rounding of the true value (1 ulp allowed for mV, which
          // is scaled by 1e-3 after parsing). Rounded printing: half a unit of the last digit.
          const tol = layout.valueDigits === undefined
            ? (layout.valueUnit === 'mV' ? ulp32(w) : 0)
            : Math.abs(w) * 5 * 10 ** -layout.valueDigits + ulp32(w);
          const err = Math.abs(ch.samples[i] - Math.fround(w));
          if (err - tol > worst) worst = err - tol;
        }
        expect(worst).toBe(0);
      });
    });
  }
});

describe('createCaptureParser().push(chunk) at any chunk boundary', () => {
  // A small file with a BOM, CRLF, quoted labels holding delimiters and quotes, a multi-byte
  // UTF-8 label, a units row, a blank line, a bad cell, an overrange marker and no final newline.
  const small =
    '\ufeffSample Interval,1.0E-04\r\nRecord Length,12\r\n"Time","R1-R2, excitation","S1-S3 ""hot""","Ω bridge"\r\n' +
    '(s),(V),(mV),V\r\n0.0000,1.5,250,+0.5\r\n0.0001,-.5,1.5E+2,0.25\r\n\r\n0.0002,2.5e-1,abc,9.91E37\r\n' +
    '0.0003,1,2,3\r\n0.0004,1.25,-2.5,3\r\n0.0005,0,0,0\r\n0.0006,1,,1\r\n0.0007,1,1,1';

  const reference = parseText(small);

  it('parses the small file as expected', () => {
    const { capture, layout, findings } = reference;
    expect(layout.bom).toBe(true);
    expect(layout.lineEnding).toBe('crlf');
    expect(layout.headerLine).toBe(3);
    expect(layout.unitsLine).toBe(4);
    expect(layout.firstDataLine).toBe(5);
    expect(layout.preamble).toEqual({ 'Sample Interval': '1.0E-04', 'Record Length': '12' });
    expect(capture.channels.map((c) => c.label)).toEqual(['R1-R2, excitation', 'S1-S3 "hot"', 'Ω bridge']);
    expect(capture.channels.map((c) => c.unit)).toEqual(['V', 'V', 'V']);
    expect(capture.sampleCount).toBe(8);
    expect(Math.abs(capture.sampleRateHz - 1e4)).toBeLessThan(1e-6);
    expect(Array.from(capture.channels[0].samples)).toEqual([1.5, -0.5, 0.25, 1, 1.25, 0, 1, 1].map(Math.fround));
    const s2 = Array.from(capture.channels[1].samples);
    expect(s2[0]).toBe(Math.fround(0.25)); // 250 mV
    expect(s2[1]).toBe(Math.fround(0.15));
    expect(s2[2]).toBeNaN();
    expect(s2[6]).toBeNaN(); // empty cell: missing, not 0
    expect(s2[7]).toBe(Math.fround(0.001));
    expect(capture.channels[2].samples[2]).toBeNaN();
    expect(findings.map((f) => [f.code, f.at?.line, f.at?.column])).toEqual([
      ['record-length-mismatch', undefined, undefined],
      ['non-numeric-cell', 8, 3],
      ['overrange', 8, 4],
      ['non-numeric-cell', 12, 3],
    ]);
  });

  it('gives identical results for a split at every byte offset', () => {
    const bytes = bytesOf(small);
    for (let cut = 0; cut <= bytes.length; cut++) {
      const p = createCaptureParser();
      p.push(bytes.subarray(0, cut));
      p.push(bytes.subarray(cut));
      expect(p.finish()).toEqual(reference);
    }
  });

  it('gives identical results fed one byte at a time', () => {
    const bytes = bytesOf(small);
    const p = createCaptureParser();
    for (let i = 0; i < bytes.length; i++) p.push(bytes.subarray(i, i + 1));
    expect(p.finish()).toEqual(reference);
  });

  it('gives identical results for seeded random chunk sizes on a file larger than the sniff window', () => {
    const text = formatText({ sampleRateHz: 50000, startS: 0, channels: demoChannels(6000, 50000, 3) }, { ...CSV_LAYOUTS['trailing-blank'], lineEnding: 'crlf' });
    const bytes = bytesOf(text);
    expect(bytes.length).toBeGreaterThan(3 * 65536);
    const whole = parseCaptureBytes(bytes);
    const rnd = createRandom(11);
    for (let trial = 0; trial < 8; trial++) {
      const p = createCaptureParser();
      let o = 0;
      while (o < bytes.length) {
        const size = 1 + Math.floor(rnd.uniform() ** 3 * 40000);
        p.push(bytes.subarray(o, o + size));
        o += size;
      }
      expect(p.finish()).toEqual(whole);
    }
  });

  it('handles CR line endings and a CR/LF pair split across chunks', () => {
    const text = 'Time,CH1\r0,1\r1e-3,2\r2e-3,3\r';
    const r = parseText(text);
    expect(r.layout.lineEnding).toBe('cr');
    expect(Array.from(r.capture.channels[0].samples)).toEqual([1, 2, 3]);
    const crlf = bytesOf('Time,CH1\r\n0,1\r\n1e-3,2\r\nx,3\r\n3e-3,4\r\n');
    for (let cut = 0; cut <= crlf.length; cut++) {
      const p = createCaptureParser();
      p.push(crlf.subarray(0, cut));
      p.push(crlf.subarray(cut));
      const f = p.finish().findings.find((x) => x.code === 'non-numeric-cell');
      expect(f?.at).toEqual({ line: 4, column: 1 });
    }
  });
});

describe('RFC 4180 quoting (RFC 4180 section 2)', () => {
  it('reads a delimiter inside a quoted label (§2 rule 6)', () => {
    const r = parseText('Time,"R1-R2, excitation","S1-S3"\n0,1,2\n0.001,3,4\n');
    expect(r.capture.channels.map((c) => c.label)).toEqual(['R1-R2, excitation', 'S1-S3']);
  });
  it('reads doubled quotes as one quote (§2 rule 7)', () => {
    const r = parseText('Time,"the ""hot"" line",x2\n0,1,2\n0.001,3,4\n');
    expect(r.capture.channels[0].label).toBe('the "hot" line');
  });
  it('reads a line break inside a quoted label (§2 rule 6) and keeps physical line numbers', () => {
    const r = parseText('Time,"S1-S3\r\nstator",CH2\r\n0,1,2\r\n0.001,x,4\r\n');
    expect(r.capture.channels[0].label).toBe('S1-S3\r\nstator');
    expect(r.layout.headerLine).toBe(1);
    expect(r.layout.firstDataLine).toBe(3);
    expect(r.findings[0].at).toEqual({ line: 4, column: 2 });
  });
  it('reads quoted numbers in the body, including a quoted decimal comma under ";" (§2 rule 5)', () => {
    const r = parseText('"Time";"CH1"\n"0";"1,5"\n"0,001";"-2,25"\n"0,002";""\n');
    expect(r.layout.decimalMark).toBe(',');
    expect(Array.from(r.capture.channels[0].samples)).toEqual([1.5, -2.25, NaN]);
    expect(r.findings.map((f) => f.code)).toEqual(['non-numeric-cell']);
  });
  it('reads a quoted cell holding the delimiter in the body as one (non-numeric) cell (§2 rule 6)', () => {
    const r = parseText('Time,CH1,CH2\n0,1,2\n0.001,"3,5",4\n0.002,5,6\n');
    expect(r.capture.channels[1].samples[1]).toBe(4);
    expect(r.findings.map((f) => [f.code, f.at?.line, f.at?.column])).toEqual([['non-numeric-cell', 3, 2]]);
  });
});

describe('numeric cells in the body (grammar checked against Node.js Number()/parseFloat behaviour)', () => {
  // Each case is the CH1 cell of row 2 of a ',' (or ';' with decimal comma) file.
  const parseCell = (cell: string, semicolon = false): { value: number; codes: string[] } => {
    const d = semicolon ? ';' : ',';
    const text = `Time${d}CH1${d}CH2\n0${d}0${d}0\n1e-3${d}${cell}${d}7\n2e-3${d}0${d}0\n`;
    const r = parseText(text, semicolon ? { decimalMark: ',' } : {});
    return { value: r.capture.channels[0].samples[1], codes: r.findings.map((f) => f.code) };
  };
  const valid: [string, number][] = [
    ['1.5', 1.5], ['-.5', -0.5], ['+1.5E-03', 1.5e-3], ['1.5e+2', 150], ['1e5', 1e5], ['5.', 5],
    ['1.0E-003', 1e-3], ['2D3', 2000], ['  42  ', 42], ['-0', -0], ['0.000000000000000000000000000001234', 1.234e-30],
    ['12345678901234567890123', 1.2345678901234568e22],
  ];
  for (const [cell, want] of valid) {
    it(`reads "${cell}" as ${want} (as Number() does on the same text)`, () => {
      expect(Number(cell.replace('D', 'e'))).toBe(want);
      const { value, codes } = parseCell(cell);
      expect(value).toBe(Math.fround(want));
      expect(codes).toEqual([]);
    });
  }
  // Number("") is 0 and Number("0x10") is 16; parseFloat("1,5") is 1, parseFloat("12k") is 12:
  // all silently wrong for a sample, so each must become a missing sample with a finding.
  const invalid = ['', '   ', '0x10', '1.2.3', '12k', '3.3mV', '1e', 'e5', '.', '-', '+-1', 'abc', '1_000'];
  for (const cell of invalid) {
    it(`reads "${cell}" as a missing sample with a non-numeric-cell finding, never 0`, () => {
      const { value, codes } = parseCell(cell);
      expect(value).toBeNaN();
      expect(codes).toEqual(['non-numeric-cell']);
    });
  }
  it('reads "1,5" under ";" with a decimal comma as 1.5 (SI Brochure 9th ed. §5.4.4)', () => {
    expect(parseCell('1,5', true)).toEqual({ value: 1.5, codes: [] });
    expect(parseCell('-0,25E-1', true)).toEqual({ value: Math.fround(-0.025), codes: [] });
    expect(parseCell('1.5', true).codes).toEqual(['non-numeric-cell']);
    // Digit-group separators are not accepted (the SI Brochure §5.4.4 groups digits with spaces only).
    expect(parseCell('1.234,56', true).codes).toEqual(['non-numeric-cell']);
  });
  // SCPI-1999 codes 9.91E37 (NaN) and 9.9E37 (infinity) (from memory), and common words.
  for (const cell of ['9.91E37', '9.9E37', '-9.9E37', 'inf', '-Infinity', '--', 'OVER', 'NaN', '1e999']) {
    it(`reads overrange marker "${cell}" as missing with an overrange finding`, () => {
      const { value, codes } = parseCell(cell);
      expect(value).toBeNaN();
      expect(codes).toEqual(['overrange']);
    });
  }
  it('matches Float32 rounding of Number() for seeded random numbers in many printed forms', () => {
    const rnd = createRandom(5);
    const rows: string[] = ['Time,CH1'];
    const want: number[] = [];
    for (let i = 0; i < 20000; i++) {
      const v = (rnd.uniform() - 0.5) * 10 ** Math.floor(rnd.uniform() * 24 - 12);
      const form = i % 4;
      const digits = 1 + Math.floor(rnd.uniform() * 17);
      const s = form === 0 ? v.toPrecision(digits) : form === 1 ? v.toExponential(digits - 1).toUpperCase() : form === 2 ? String(v) : v.toFixed(Math.min(20, digits + 3));
      rows.push(`${i * 1e-3},${s}`);
      want.push(Math.fround(Number(s)));
    }
    const got = parseText(rows.join('\n')).capture.channels[0].samples;
    let exact = 0;
    for (let i = 0; i < want.length; i++) {
      expect(Math.abs(got[i] - want[i])).toBeLessThanOrEqual(ulp32(want[i]));
      if (Object.is(got[i], want[i])) exact++;
    }
    expect(exact).toBeGreaterThanOrEqual(want.length - 2);
  });
  it('reads every row as Number() does when rows the fast path leaves fall at its block edges (8-row warm-up calls, then 4096-row blocks)', () => {
    // The clean-row fast path stops at each block edge and at any row it does not take; rows
    // on either side of those edges must read the same as anywhere else.
    const edges = [7, 8, 9, 16, 31, 32, 33, 4095, 4096, 4097, 4127, 4128, 4129, 8223, 8224, 8225, 12_319, 12_320];
    const odd = new Set(edges);
    const rows: string[] = ['Time,CH1,CH2'];
    const want: [number, number][] = [];
    const rnd = createRandom(77);
    for (let i = 0; i < 16_000; i++) {
      const a = ((rnd.uniform() - 0.5) * 20).toFixed(4);
      const b = ((rnd.uniform() - 0.5) * 2).toPrecision(5);
      if (odd.has(i)) {
        // A quoted number (read), a word (missing) and an empty cell (missing), in turn.
        const kind = i % 3;
        rows.push(kind === 0 ? `${i * 1e-5},"${a}",${b}` : kind === 1 ? `${i * 1e-5},${a},n/a` : `${i * 1e-5},,${b}`);
        want.push(kind === 0 ? [Math.fround(Number(a)), Math.fround(Number(b))] : kind === 1 ? [Math.fround(Number(a)), NaN] : [NaN, Math.fround(Number(b))]);
      } else {
        rows.push(`${i * 1e-5},${a},${b}`);
        want.push([Math.fround(Number(a)), Math.fround(Number(b))]);
      }
    }
    const { capture } = parseText(rows.join('\n') + '\n');
    expect(capture.sampleCount).toBe(want.length);
    const [x, y] = capture.channels.map((c) => c.samples);
    for (let i = 0; i < want.length; i++) {
      expect(Object.is(x![i], want[i]![0]) || Math.abs(x![i]! - want[i]![0]) <= ulp32(want[i]![0])).toBe(true);
      expect(Object.is(y![i], want[i]![1]) || Math.abs(y![i]! - want[i]![1]) <= ulp32(want[i]![1])).toBe(true);
    }
  });
});

describe('sampling from the whole record', () => {
  it('recovers 1 MS/s exactly (1e-6 relative) from time stamps rounded to 4 significant digits', () => {
    // Start times on either side of 0 and across a decade of |t| (where the printed resolution
    // q changes tenfold). With q = 10..100 intervals a plain least-squares slope is off by up to
    // ~5e-6 here, because rounding midpoints fall one way in one part of the record and the other
    // way elsewhere; the resolution-bounds fit is not biased by that.
    for (const startS of [0, -0.05, 0.02, 0.1]) {
      const n = 100000;
      const text = formatText({ sampleRateHz: 1e6, startS, channels: [{ label: 'CH1', samples: new Float64Array(n).fill(0.5) }] }, { ...CSV_LAYOUTS.plain, timeDigits: 4 });
      const lines = text.split('\n');
      expect(lines.slice(60001, 60004).every((l) => l === lines[60001])).toBe(true); // repeated stamps really occur
      const r = parseText(text);
      expect(Math.abs(r.capture.sampleRateHz / 1e6 - 1)).toBeLessThan(1e-6);
      // The start is the fitted time of sample 0: within half the coarsest printed resolution.
      expect(Math.abs(r.capture.startS - startS)).toBeLessThan(5e-5);
      expect(r.findings).toEqual([]);
    }
  });

  const evenRows = (n: number, edit?: (i: number, t: number) => number | null): string => {
    const rows = ['Time,CH1'];
    for (let i = 0; i < n; i++) {
      const t = edit ? edit(i, i * 1e-5) : i * 1e-5;
      if (t !== null) rows.push(`${t.toPrecision(9)},${(i % 7) * 0.1}`);
    }
    return rows.join('\n');
  };

  it('reports a gap (missing samples) with its line number', () => {
    // Rows 500..502 removed: the row of sample 503 is on line 2 + 500 = 502.
    const r = parseText(evenRows(2000, (i, t) => (i >= 500 && i <= 502 ? null : t)));
    const f = r.findings.filter((x) => x.code === 'uneven-sampling');
    expect(f).toHaveLength(1);
    expect(f[0].at?.line).toBe(502);
    expect(f[0].message).toMatch(/about 4\.0 sample intervals/);
  });

  it('reports one jittered time stamp with its line number', () => {
    const r = parseText(evenRows(2000, (i, t) => (i === 1234 ? t + 0.5e-5 : t)));
    const f = r.findings.filter((x) => x.code === 'uneven-sampling');
    expect(f.map((x) => x.at?.line)).toEqual([1236]);
    expect(f[0].figures?.intervals).toBeCloseTo(0.5, 2);
  });

  it('reports time going backwards', () => {
    const r = parseText(evenRows(300, (i, t) => (i === 100 ? t - 3e-5 : t)));
    const lines = r.findings.filter((x) => x.code === 'uneven-sampling').map((x) => x.at?.line);
    expect(lines[0]).toBe(102);
  });

  it('caps per-line findings at 5 plus a total', () => {
    const r = parseText(evenRows(3000, (i, t) => (i % 100 === 50 ? t + 0.6e-5 : t)));
    const f = r.findings.filter((x) => x.code === 'uneven-sampling');
    expect(f).toHaveLength(6);
    expect(f[5].figures?.count).toBe(30);
    expect(f[5].at?.line).toBe(52);
  });

  it('takes the interval from the preamble, or from the options, when there is no time column', () => {
    for (const [line, hz] of [['Sample Interval,2.5E-05', 40000], ['Sampling Rate (Hz),40000', 40000], ['X Increment: 25e-6', 40000], ['Time per point,25 us', 40000], ['dt;0,000025', 40000], ['Sample Rate,40 kSa/s', 40000]] as const) {
      const d = line.includes(';') ? ';' : ',';
      const r = parseText(`${line}\nCH1${d}CH2\n1${d}2\n3${d}4\n`);
      expect(r.layout.sampleIntervalSource).toBe('preamble');
      expect(r.capture.sampleRateHz).toBeCloseTo(hz, 6);
    }
    const r = parseText('CH1,CH2\n1,2\n3,4\n', { sampleRateHz: 1000 });
    expect(r.capture.sampleRateHz).toBe(1000);
    expect(r.layout.sampleIntervalSource).toBe('none');
  });
});

describe('layout details', () => {
  it('reads units from a "(s),(mV)" units row, a label suffix and the preamble', () => {
    expect(parseText('Time,CH1\n(s),(mV)\n0,1500\n1e-3,2\n').capture.channels[0].samples[0]).toBe(1.5);
    const a = parseText('Time (ms),CH2 (mV),CH3 [kV]\n0,1500,0.001\n1,2,0.002\n');
    expect(a.capture.sampleRateHz).toBeCloseTo(1000, 9);
    expect(a.capture.channels.map((c) => [c.label, c.unit, c.samples[0]])).toEqual([['CH2', 'V', 1.5], ['CH3', 'V', 1]]);
    const b = parseText('t[us],CH1\n0,1\n10,2\n');
    expect(b.capture.sampleRateHz).toBeCloseTo(1e5, 6);
    expect(b.layout.timeUnit).toBe('us');
    const c = parseText('Vertical Units,mV\nHorizontal Units,ms\nTime,CH1\n0,1000\n0.5,2000\n');
    expect(c.capture.sampleRateHz).toBeCloseTo(2000, 9);
    expect(c.capture.channels[0].samples[1]).toBe(2);
  });

  it('reads headerless files: a first column that is an even time base is time; otherwise all columns are channels', () => {
    const t = parseText('0,1,2\n0.001,3,4\n0.002,5,6\n0.003,7,8\n');
    expect(t.layout.timeColumn).toBe(0);
    expect(t.capture.channels.map((c) => c.label)).toEqual(['CH1', 'CH2']);
    const s = parseText('Sample Interval,1e-3\n0.5,1\n-0.5,3\n0.2,5\n0.1,7\n');
    expect(s.layout.timeColumn).toBeNull();
    expect(s.capture.channels.map((c) => c.column)).toEqual([0, 1]);
    expect(s.capture.sampleRateHz).toBe(1000);
  });

  it('reads tab and space delimiters and a decimal comma under tab', () => {
    const tab = parseText('Time\tCH1\n0\t1,5\n0,001\t2,5\n');
    expect([tab.layout.delimiter, tab.layout.decimalMark]).toEqual(['\t', ',']);
    expect(Array.from(tab.capture.channels[0].samples)).toEqual([1.5, 2.5]);
    const space = parseText('  0.000   1.5  -2\n  0.001  2.5   3\n  0.002  3.5   4\n');
    expect(space.layout.delimiter).toBe(' ');
    expect(Array.from(space.capture.channels[1].samples)).toEqual([-2, 3, 4]);
  });

  it('follows the delimiter and decimal-mark overrides', () => {
    const text = 'CH1;CH2\n1,5;2\n3;4,25\n';
    expect(parseText(text, { sampleRateHz: 1 }).capture.channels[0].samples[0]).toBe(1.5);
    const forced = parseText('CH1;CH2;CH3\n1;2,5;3\n3;4;5\n5;6;7\n', { sampleRateHz: 1, decimalMark: '.' });
    expect(forced.capture.channels[1].samples[0]).toBeNaN();
    expect(forced.findings.map((f) => f.code)).toEqual(['non-numeric-cell']);
    // "1,5" alone is ambiguous (two cells, or 1.5): the sniffer takes two cells, the overrides 1.5.
    const ambiguous = 'Sample Interval: 1\n1,5\n2,5\n';
    expect(parseText(ambiguous).capture.channels).toHaveLength(2);
    for (const o of [{ decimalMark: ',' }, { delimiter: ';' }] as const) {
      const r = parseText(ambiguous, o);
      expect(r.capture.channels.map((c) => Array.from(c.samples))).toEqual([[1.5, 2.5]]);
    }
  });

  it('reports ragged rows and ignores an empty trailing column', () => {
    const r = parseText('Time,CH1,CH2,\n0,1,2,\n1e-3,3,\n2e-3,5,6,\n3e-3,5,6,7,8\n4e-3,5,6\n');
    expect(r.capture.channels).toHaveLength(2);
    expect(r.capture.channels[1].samples[1]).toBeNaN();
    expect(r.findings.map((f) => [f.code, f.at?.line])).toEqual([['non-numeric-cell', 3], ['ragged-row', 5]]);
    const short = parseText('Time,CH1,CH2\n0,1,2\n1e-3,3\n2e-3,5,6\n');
    expect(short.findings.map((f) => [f.code, f.at?.line])).toEqual([['ragged-row', 3]]);
  });

  it('decodes UTF-16LE and UTF-16BE text with a byte-order mark', () => {
    const text = '\ufeffTime;Ω;CH2\r\n0;1,5;2\r\n0,001;3;4\r\n';
    const le = new Uint8Array(Buffer.from(text, 'utf16le'));
    const r = parseCaptureBytes(le);
    expect(r.capture.channels.map((c) => c.label)).toEqual(['Ω', 'CH2']);
    expect(r.capture.channels[0].samples[0]).toBe(1.5);
    expect(r.findings.map((f) => f.code)).toEqual(['text-encoding']);
    const be = new Uint8Array(le.length);
    for (let i = 0; i < le.length; i += 2) {
      be[i] = le[i + 1];
      be[i + 1] = le[i];
    }
    const p = createCaptureParser();
    for (let i = 0; i < be.length; i += 3) p.push(be.subarray(i, i + 3));
    expect(p.finish().capture).toEqual(r.capture);
  });
});

describe('unusable files give one CaptureError with the line', () => {
  const cases: [string, Uint8Array, RegExp, number][] = [
    ['an empty file', new Uint8Array(0), /empty/, 1],
    ['only blank lines', bytesOf('\n \r\n\t\n'), /empty/, 1],
    ['a header and no data', bytesOf('Time,CH1,CH2\n'), /No rows of numbers/, 1],
    ['an HTML page', bytesOf('<!DOCTYPE html>\n<html><body>Not found</body></html>\n'), /No rows of numbers/, 1],
    ['one data row', bytesOf('Sample Interval,1e-3\nCH1,CH2\n1,2\n'), /only one data row/, 3],
    ['no time column and no interval', bytesOf('\nCH1,CH2\n1,2\n3,4\n'), /sample rate is unknown.*Sample Interval/, 2],
    ['a time column that does not increase', bytesOf('Time,CH1\n0.5,1\n0.5,2\n0.5,3\n'), /does not increase/, 2],
    ['a time column only', bytesOf('Time\n0\n1\n2\n'), /no signal columns/, 1],
    ['UTF-16 without a byte-order mark', new Uint8Array(Buffer.from('Time,CH1\n0,1\n', 'utf16le')), /binary data.*UTF-8/, 1],
  ];
  const rnd = createRandom(99);
  const garbage = new Uint8Array(5000);
  for (let i = 0; i < garbage.length; i++) garbage[i] = Math.floor(rnd.uniform() * 256);
  cases.push(['binary garbage', garbage, /binary data|not UTF-8|not text/, 0]);

  for (const [what, bytes, pattern, line] of cases) {
    it(`refuses ${what}`, () => {
      let caught: unknown;
      try {
        parseCaptureBytes(bytes);
      } catch (e) {
        caught = e;
      }
      expect(caught).toBeInstanceOf(CaptureError);
      const err = caught as CaptureError;
      expect(err.message).toMatch(pattern);
      expect(err.message).toMatch(/\(line \d+/);
      if (line > 0) expect(err.at?.line).toBe(line);
    });
  }

  it('refuses more rows than maxSamples, saying how many and the limit', () => {
    const text = formatText({ sampleRateHz: 1000, startS: 0, channels: [{ label: 'CH1', samples: new Float64Array(250) }] }, CSV_LAYOUTS.plain);
    expect(() => parseText(text, { maxSamples: 100 })).toThrow(/250 samples per channel, more than the limit of 100.*\(line 102\)/);
    expect(parseText(text, { maxSamples: 250 }).capture.sampleCount).toBe(250);
  });

  it('rejects bad options and misuse with RangeError/TypeError', () => {
    expect(() => createCaptureParser({ delimiter: ',', decimalMark: ',' })).toThrow(RangeError);
    expect(() => createCaptureParser({ maxSamples: 0 })).toThrow(RangeError);
    expect(() => createCaptureParser({ sampleRateHz: -1 })).toThrow(RangeError);
    const p = createCaptureParser();
    expect(() => p.push('x' as unknown as Uint8Array)).toThrow(TypeError);
  });
});
