/**
 * Writes a capture as oscilloscope-style CSV text in one of many layouts: the inverse of
 * core/import/captureParser.ts, used by tests and by the demo-capture generator.
 *
 * Quoting follows RFC 4180 §2 (a field holding the delimiter, a double quote or a line break is
 * enclosed in double quotes, inner quotes doubled). The decimal comma follows the SI Brochure
 * (BIPM, 9th ed. 2019, §5.4.4) and is only allowed with a ';' or tab delimiter.
 */
export interface CsvLayoutSpec {
  delimiter: ',' | ';' | '\t';
  decimalMark: '.' | ',';
  lineEnding: 'lf' | 'crlf';
  bom: boolean;
  /** Key/value lines (sample interval, record length, units) before the header. */
  preamble: 'none' | 'key-value';
  header: 'labels' | 'labels+units' | 'none';
  timeColumn: 's' | 'ms' | 'us' | 'none';
  valueUnit: 'V' | 'mV';
  /** Quote every label (labels holding the delimiter or a quote are quoted regardless). */
  quoteLabels: boolean;
  /** End every header and data line with a delimiter (an empty last column). */
  trailingDelimiter: boolean;
  /** Blank lines after the preamble, after the header, in the middle of the data and at the end. */
  blankLines: boolean;
  /** Numbers in exponent form (1.5E-03). */
  scientific: boolean;
  /** Significant digits of printed time stamps (models rounding); default: exact (shortest round trip). */
  timeDigits?: number;
  /** Significant digits of printed values; default: exact (shortest round trip). */
  valueDigits?: number;
}

/** One channel to write: label and samples in volts. */
export interface CsvChannelSpec {
  label: string;
  samples: ArrayLike<number>;
}

const base: CsvLayoutSpec = {
  delimiter: ',', decimalMark: '.', lineEnding: 'lf', bom: false, preamble: 'none', header: 'labels',
  timeColumn: 's', valueUnit: 'V', quoteLabels: false, trailingDelimiter: false, blankLines: false, scientific: false,
};

/** Named layouts covering what scope exports do (every one must round-trip through the importer). */
export const CSV_LAYOUTS: Record<string, CsvLayoutSpec> = {
  plain: { ...base },
  'units-row': { ...base, header: 'labels+units', valueUnit: 'mV' },
  'preamble-time': { ...base, preamble: 'key-value' },
  'preamble-no-time': { ...base, preamble: 'key-value', timeColumn: 'none' },
  'semicolon-decimal-comma': { ...base, delimiter: ';', decimalMark: ',' },
  'tab-ms': { ...base, delimiter: '\t', timeColumn: 'ms' },
  'tab-decimal-comma-units': { ...base, delimiter: '\t', decimalMark: ',', header: 'labels+units', timeColumn: 'us', valueUnit: 'mV' },
  'crlf-bom-quoted': { ...base, lineEnding: 'crlf', bom: true, quoteLabels: true },
  'us-scientific-mV': { ...base, timeColumn: 'us', valueUnit: 'mV', scientific: true },
  'trailing-blank': { ...base, trailingDelimiter: true, blankLines: true },
  headerless: { ...base, header: 'none' },
  'headerless-preamble-no-time': { ...base, header: 'none', preamble: 'key-value', timeColumn: 'none' },
  'preamble-ms-mV-semicolon': { ...base, delimiter: ';', decimalMark: ',', preamble: 'key-value', timeColumn: 'ms', valueUnit: 'mV', header: 'labels' },
  'rounded-time': { ...base, timeDigits: 4, valueDigits: 6 },
};

const TIME_FACTOR = { s: 1, ms: 1e3, us: 1e6 } as const;

/** Yields the CSV text in chunks of roughly `chunkRows` rows (a 10M-row file never becomes one string). */
export function* formatCaptureCsv(
  spec: { sampleRateHz: number; startS: number; channels: CsvChannelSpec[] },
  layout: CsvLayoutSpec,
  chunkRows = 10000,
): Generator<string> {
  if (!(spec.sampleRateHz > 0 && Number.isFinite(spec.sampleRateHz))) throw new RangeError('sampleRateHz must be a positive finite number');
  if (spec.channels.length === 0) throw new RangeError('at least one channel is needed');
  if (layout.delimiter === ',' && layout.decimalMark === ',') throw new RangeError('a decimal comma needs a ";" or tab delimiter');
  if (!(Number.isInteger(chunkRows) && chunkRows >= 1)) throw new RangeError('chunkRows must be a positive integer');
  const n = spec.channels[0].samples.length;
  for (const c of spec.channels) if (c.samples.length !== n) throw new RangeError('all channels must have the same length');
  const time = layout.timeColumn;
  if (layout.header === 'none' && layout.preamble === 'none' && (time === 'ms' || time === 'us' || layout.valueUnit === 'mV')) {
    throw new RangeError('a headerless file without a preamble cannot say its units; use seconds and volts');
  }

  const d = layout.delimiter;
  const eol = layout.lineEnding === 'crlf' ? '\r\n' : '\n';
  const tail = layout.trailingDelimiter ? d : '';
  const valueFactor = layout.valueUnit === 'mV' ? 1e3 : 1;
  const num = (x: number, digits: number | undefined): string => {
    let s: string;
    if (layout.scientific) s = digits !== undefined ? x.toExponential(digits - 1) : x.toExponential();
    else s = digits !== undefined ? x.toPrecision(digits) : String(x);
    if (layout.scientific) s = s.replace('e', 'E');
    return layout.decimalMark === ',' ? s.replace('.', ',') : s;
  };
  const quote = (label: string): string =>
    layout.quoteLabels || label.includes(d) || label.includes('"') || /[\r\n]/.test(label) ? `"${label.replace(/"/g, '""')}"` : label;

  let head = layout.bom ? '\ufeff' : '';
  if (layout.preamble === 'key-value') {
    const interval = 1 / spec.sampleRateHz;
    head += `Sample Interval${d}${num(interval, undefined)}${eol}`;
    head += `Record Length${d}${n}${eol}`;
    head += `Vertical Units${d}${layout.valueUnit}${eol}`;
    if (time !== 'none') head += `Horizontal Units${d}${time}${eol}`;
    else head += `Start Time${d}${num(spec.startS, undefined)}${eol}`;
    if (layout.blankLines) head += eol;
  }
  if (layout.header !== 'none') {
    const labels: string[] = [];
    const units: string[] = [];
    const explicit = layout.header === 'labels' && layout.preamble === 'none';
    if (time !== 'none') {
      labels.push(explicit && time !== 's' ? (time === 'ms' ? 'Time (ms)' : 't[us]') : 'Time');
      units.push(time);
    }
    for (const c of spec.channels) {
      labels.push(explicit && layout.valueUnit === 'mV' ? `${c.label} (mV)` : c.label);
      units.push(layout.valueUnit);
    }
    head += labels.map(quote).join(d) + tail + eol;
    if (layout.header === 'labels+units') head += units.join(d) + tail + eol;
    if (layout.blankLines) head += eol;
  }
  yield head;

  const timeFactor = time === 'none' ? 0 : TIME_FACTOR[time];
  const middle = n >> 1;
  let out = '';
  let inChunk = 0;
  for (let i = 0; i < n; i++) {
    let line = '';
    if (time !== 'none') line = num((spec.startS + i / spec.sampleRateHz) * timeFactor, layout.timeDigits) + d;
    for (let k = 0; k < spec.channels.length; k++) {
      if (k > 0) line += d;
      line += num(spec.channels[k].samples[i] * valueFactor, layout.valueDigits);
    }
    out += line + tail + eol;
    if (layout.blankLines && i === middle) out += eol;
    if (++inChunk === chunkRows) {
      yield out;
      out = '';
      inChunk = 0;
    }
  }
  if (layout.blankLines) out += eol + eol;
  if (out !== '') yield out;
}
