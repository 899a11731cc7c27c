import { describe, expect, it } from 'vitest';
import { CSV_LAYOUTS, formatCaptureCsv } from '../../../core/synth/formatCaptureCsv.js';

const spec = {
  sampleRateHz: 1000,
  startS: 0,
  channels: [
    { label: 'R1-R2, excitation', samples: [1.5, -0.25] },
    { label: 'S1-S3 "hot"', samples: [0.002, 3] },
  ],
};
const text = (layout: (typeof CSV_LAYOUTS)[string], chunkRows?: number): string => [...formatCaptureCsv(spec, layout, chunkRows)].join('');

describe('formatCaptureCsv(spec, layout)', () => {
  it('writes the plain layout, quoting labels that hold the delimiter or a quote (RFC 4180 §2 rules 6, 7)', () => {
    expect(text(CSV_LAYOUTS.plain)).toBe('Time,"R1-R2, excitation","S1-S3 ""hot"""\n0,1.5,0.002\n0.001,-0.25,3\n');
  });
  it('writes a decimal comma under ";" (SI Brochure 9th ed. §5.4.4), where the comma needs no quoting', () => {
    expect(text(CSV_LAYOUTS['semicolon-decimal-comma'])).toBe('Time;R1-R2, excitation;"S1-S3 ""hot"""\n0;1,5;0,002\n0,001;-0,25;3\n');
  });
  it('writes a BOM, CRLF and quoted labels', () => {
    expect(text(CSV_LAYOUTS['crlf-bom-quoted'])).toBe('\ufeff"Time","R1-R2, excitation","S1-S3 ""hot"""\r\n0,1.5,0.002\r\n0.001,-0.25,3\r\n');
  });
  it('writes a key/value preamble, units, trailing delimiters, blank lines and scientific mV', () => {
    expect(text({ ...CSV_LAYOUTS['us-scientific-mV'], preamble: 'key-value', header: 'labels+units', trailingDelimiter: true, blankLines: true })).toBe(
      'Sample Interval,1E-3\nRecord Length,2\nVertical Units,mV\nHorizontal Units,us\n\n' +
        'Time,"R1-R2, excitation","S1-S3 ""hot""",\nus,mV,mV,\n\n' +
        // A blank line after the middle row (row n >> 1 = 1 here), then two at the end.
        '0E+0,1.5E+3,2E+0,\n1E+3,-2.5E+2,3E+3,\n\n\n\n',
    );
  });
  it('rounds time stamps and values to the requested significant digits', () => {
    expect(text({ ...CSV_LAYOUTS.headerless, timeDigits: 3, valueDigits: 2 })).toBe('0.00,1.5,0.0020\n0.00100,-0.25,3.0\n');
  });
  it('gives the same text for any chunk size', () => {
    const long = { ...spec, channels: [{ label: 'CH1', samples: Array.from({ length: 1000 }, (_, i) => Math.sin(i)) }] };
    const whole = [...formatCaptureCsv(long, CSV_LAYOUTS['trailing-blank'], 1000)].join('');
    const parts = [...formatCaptureCsv(long, CSV_LAYOUTS['trailing-blank'], 7)];
    expect(parts.length).toBeGreaterThan(100);
    expect(parts.join('')).toBe(whole);
  });
  it('refuses impossible layouts and bad arguments with RangeError', () => {
    expect(() => text({ ...CSV_LAYOUTS.plain, decimalMark: ',' })).toThrow(RangeError);
    expect(() => text({ ...CSV_LAYOUTS.headerless, timeColumn: 'ms' })).toThrow(RangeError);
    expect(() => [...formatCaptureCsv({ ...spec, sampleRateHz: 0 }, CSV_LAYOUTS.plain)]).toThrow(RangeError);
    expect(() => [...formatCaptureCsv({ ...spec, channels: [{ label: 'a', samples: [1] }, { label: 'b', samples: [1, 2] }] }, CSV_LAYOUTS.plain)]).toThrow(RangeError);
  });
});
