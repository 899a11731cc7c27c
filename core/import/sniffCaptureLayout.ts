import { CaptureError } from '../model/errors.js';
import { finding, type Finding } from '../model/findings.js';
import { decodeUtf8 } from './decodeUtf8.js';
import { parseNumberText } from './parseNumberText.js';
import { isKnownPreambleKey, readPreamble, type PreambleFacts } from './readPreamble.js';
import { readUnitToken, splitLabelUnit, type UnitToken } from './readUnitToken.js';
import { splitDelimitedRecords, type TextRecord } from './splitDelimitedRecords.js';
import { looksLikeTime, referenceInterval } from './inspectTimeColumn.js';

/** How much of the head of the file the layout is decided from: at most this many bytes... */
export const SNIFF_BYTES = 64 * 1024;
/**
 * ...and at most this many lines (preamble, header and data), enough for the cell statistics
 * of any export seen (preambles run to a few dozen lines) while the sniffer, which runs before
 * the code is optimised, stays a few milliseconds per file. Common practice, no source.
 */
export const SNIFF_LINES = 320;

export type Delimiter = ',' | ';' | '\t' | ' ';
export type DecimalMark = '.' | ',';

export interface SniffedColumn {
  readonly kind: 'channel' | 'time' | 'ignored';
  readonly label: string;
  /** Unit after scaling ("V"), "" when the file gives none. */
  readonly unit: string;
  /** Factor from the file's unit to `unit`. */
  readonly factor: number;
}

export interface SniffedLayout {
  readonly delimiter: Delimiter;
  readonly decimalMark: DecimalMark;
  readonly lineEnding: 'lf' | 'crlf' | 'cr';
  readonly preamble: Record<string, string>;
  readonly headerLine: number | null;
  readonly unitsLine: number | null;
  readonly firstDataLine: number;
  readonly timeColumn: number | null;
  readonly timeUnit: 's' | 'ms' | 'us' | null;
  readonly columns: readonly SniffedColumn[];
  /** Seconds per unit of the time column (1 when there is none). */
  readonly timeFactorS: number;
  readonly facts: PreambleFacts;
  /** Interval used for the even-sampling checks (from the sniffed rows), NaN when unknown. */
  readonly referenceIntervalS: number;
  /** Byte offset (into the buffer given) of the first data line. */
  readonly dataOffset: number;
  readonly findings: Finding[];
}

interface Combo {
  readonly delimiter: Delimiter;
  readonly decimalMark: DecimalMark;
}

/** Candidate (delimiter, decimal mark) pairs, in order of preference on a tie. */
const COMBOS: readonly Combo[] = [
  { delimiter: ',', decimalMark: '.' },
  { delimiter: ';', decimalMark: '.' },
  { delimiter: ';', decimalMark: ',' },
  { delimiter: '\t', decimalMark: '.' },
  { delimiter: '\t', decimalMark: ',' },
  { delimiter: ' ', decimalMark: '.' },
  { delimiter: ' ', decimalMark: ',' },
];

/** Header words that name a time column (compared lower-case, unit suffix removed). */
const TIME_LABELS = new Set([
  'time', 't', 'x', 'sec', 'second', 'seconds', 's', 'timestamp', 'time stamp', 'x-axis', 'xaxis',
  'x axis', 'zeit', 'temps', 'tiempo', 'horizontal', 'time axis', 'relative time',
]);

interface RecordStats {
  readonly record: TextRecord;
  readonly blank: boolean;
  readonly numeric: number;
  readonly nonNumeric: number;
  /** Field count, less a trailing empty field when the file has trailing delimiters. */
  effective: number;
  readonly trailingEmpty: boolean;
  readonly preambleKey: boolean;
}

function statsOf(records: TextRecord[], decimalMark: DecimalMark): RecordStats[] {
  return records.map((record) => {
    let numeric = 0;
    let nonNumeric = 0;
    let nonEmpty = 0;
    for (const f of record.fields) {
      const v = parseNumberText(f, decimalMark);
      if (v.kind === 'number' || v.kind === 'overrange') numeric++;
      else if (v.kind === 'invalid') nonNumeric++;
      if (f !== '') nonEmpty++;
    }
    const n = record.fields.length;
    return {
      record,
      blank: nonEmpty === 0,
      numeric,
      nonNumeric,
      effective: n,
      trailingEmpty: n > 1 && record.fields[n - 1] === '' && !record.quoted[n - 1],
      preambleKey: record.fields.length <= 3 && isKnownPreambleKey(record.fields.length === 1 ? record.fields[0].replace(/[:=].*$/, '') : record.fields[0]),
    };
  });
}

const strictData = (s: RecordStats): boolean => !s.blank && s.numeric > 0 && s.nonNumeric === 0 && !s.preambleKey;
const looseData = (s: RecordStats): boolean => !s.blank && s.numeric > s.nonNumeric && !s.preambleKey;

function modalCount(stats: RecordStats[], isData: (s: RecordStats) => boolean): { count: number; lines: number } {
  const tally = new Map<number, number>();
  for (const s of stats) if (isData(s)) tally.set(s.effective, (tally.get(s.effective) ?? 0) + 1);
  let best = { count: 0, lines: 0 };
  for (const [count, lines] of tally) {
    if (lines > best.lines || (lines === best.lines && count > best.count)) best = { count, lines };
  }
  return best;
}

function lineColumnOf(text: string, index: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < index; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || c === 13) {
      if (c === 13 && text.charCodeAt(i + 1) === 10) i++;
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: index - lineStart + 1 };
}

/** Byte offset of the start of physical line `line` (1-based), counting CRLF as one break. */
function offsetOfLine(bytes: Uint8Array, start: number, line: number): number {
  let p = start;
  let current = 1;
  while (current < line && p < bytes.length) {
    const c = bytes[p++];
    if (c === 10) current++;
    else if (c === 13) {
      if (bytes[p] === 10) p++;
      current++;
    }
  }
  return p;
}

export interface SniffOptions {
  delimiter?: ',' | ';' | '\t';
  decimalMark?: '.' | ',';
}

/**
 * Decides the text layout of a capture file from its first SNIFF_BYTES bytes (UTF-8, BOM
 * already skipped: the text starts at `start`). `final` says the buffer holds the whole file.
 * Throws CaptureError when the head is not a usable capture.
 */
export function sniffCaptureLayout(bytes: Uint8Array, start: number, final: boolean, options: SniffOptions): SniffedLayout {
  let windowEnd = Math.min(bytes.length, start + SNIFF_BYTES);
  if (windowEnd < bytes.length || !final) {
    let cut = windowEnd;
    let lines = 0;
    for (let i = start; i < windowEnd; i++) {
      const b = bytes[i];
      if ((b === 10 || (b === 13 && bytes[i + 1] !== 10)) && ++lines === SNIFF_LINES) {
        cut = i + 1;
        break;
      }
    }
    while (cut > start && bytes[cut - 1] !== 10 && bytes[cut - 1] !== 13) cut--;
    if (cut === start) {
      throw new CaptureError(
        'No line break in the first 64 KiB: this is not a CSV capture (or its first line is far too long). Export the capture as CSV text with one sample per line',
        { line: 1 },
      );
    }
    windowEnd = cut;
  }
  for (let i = start; i < windowEnd; i++) {
    if (bytes[i] === 0) {
      const where = lineColumnOf(decodeUtf8(bytes, start, i).text, i - start);
      throw new CaptureError(
        'The file contains binary data (a NUL byte), so it is not a CSV text file; if it is UTF-16 text without a byte-order mark, re-save it as UTF-8',
        where,
      );
    }
  }
  const decoded = decodeUtf8(bytes, start, windowEnd);
  const text = decoded.text;
  if (decoded.invalidCount > Math.max(8, (windowEnd - start) / 100)) {
    throw new CaptureError('The file is not UTF-8 text (many invalid byte sequences); re-save the capture as CSV in UTF-8', lineColumnOf(text, text.indexOf('\ufffd')));
  }
  let controls = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if ((c < 32 && c !== 9 && c !== 10 && c !== 13) || c === 127) controls++;
  }
  if (controls > Math.max(8, text.length / 100)) {
    throw new CaptureError('The file is not text (many control characters); export the capture as CSV text', { line: 1 });
  }
  if (text.trim() === '') {
    throw new CaptureError('The file is empty: it holds no lines of data. Export the capture again as CSV', { line: 1 });
  }
  const firstBreak = text.search(/[\r\n]/);
  const lineEnding: 'lf' | 'crlf' | 'cr' = firstBreak < 0 || text[firstBreak] === '\n' ? 'lf' : text[firstBreak + 1] === '\n' ? 'crlf' : 'cr';

  // Choose the delimiter and decimal mark: the pair under which the most lines are rows of numbers
  // with one consistent cell count (tie: more cells, then the order of COMBOS).
  const combos = COMBOS.filter(
    (c) => (options.delimiter === undefined || c.delimiter === options.delimiter) && (options.decimalMark === undefined || c.decimalMark === options.decimalMark),
  );
  const recordsByDelimiter = new Map<string, TextRecord[]>();
  let best: { combo: Combo; stats: RecordStats[]; lines: number; count: number; strict: boolean } | undefined;
  for (const strict of [true, false]) {
    for (const combo of combos) {
      let records = recordsByDelimiter.get(combo.delimiter);
      if (!records) {
        records = splitDelimitedRecords(text, combo.delimiter);
        recordsByDelimiter.set(combo.delimiter, records);
      }
      const stats = statsOf(records, combo.decimalMark);
      const isData = strict ? strictData : looseData;
      const dataRows = stats.filter(isData);
      const trailing = dataRows.filter((s) => s.trailingEmpty).length * 2 > dataRows.length;
      if (trailing) for (const s of stats) if (s.trailingEmpty) s.effective--;
      const modal = modalCount(stats, isData);
      if (modal.lines > 0 && (!best || modal.lines > best.lines || (modal.lines === best.lines && modal.count > best.count))) {
        best = { combo, stats, lines: modal.lines, count: modal.count, strict };
      }
    }
    if (best) break;
  }
  const firstText = text.trimStart().slice(0, 32).split(/[\r\n]/)[0];
  const firstLine = lineColumnOf(text, text.length - text.trimStart().length).line;
  if (!best) {
    throw new CaptureError(
      `No rows of numbers found: the file does not look like a CSV capture (it starts with "${firstText}"). Export the capture as CSV with one sample per line`,
      { line: firstLine },
    );
  }
  const { combo, stats } = best;
  const isData = best.strict ? strictData : looseData;
  const columnCount = best.count;

  // First data line: a data row with the modal cell count followed by a mostly numeric row (or
  // the end of the file).
  const nonBlank = stats.filter((s) => !s.blank);
  let dataIndex = -1;
  for (let i = 0; i < nonBlank.length; i++) {
    const s = nonBlank[i];
    if (!isData(s) || s.effective !== columnCount) continue;
    const next = nonBlank[i + 1];
    if (next === undefined || looseData(next)) {
      dataIndex = i;
      break;
    }
  }
  if (dataIndex < 0) {
    throw new CaptureError(
      `No run of numeric rows with a consistent number of columns found (the first line reads "${firstText}"). Export the capture as CSV with one sample per line`,
      { line: firstLine },
    );
  }
  // A first data row with a bad cell still belongs to the data when most of its cells are numbers.
  while (dataIndex > 0) {
    const prev = nonBlank[dataIndex - 1];
    const filled = prev.record.fields.filter((f) => f !== '').length;
    if (prev.preambleKey || prev.effective !== columnCount || !(prev.numeric * 2 > filled)) break;
    dataIndex--;
  }
  const firstData = nonBlank[dataIndex];

  // Header, units row, preamble.
  const before = nonBlank.slice(0, dataIndex);
  let units: RecordStats | undefined;
  let header: RecordStats | undefined;
  let preambleEnd = before.length;
  const last = before[before.length - 1];
  const isUnitsRow = (s: RecordStats): boolean => {
    const filled = s.record.fields.filter((f) => f !== '');
    return filled.length > 0 && filled.every((f) => readUnitToken(f) !== undefined) && s.effective <= columnCount + 1;
  };
  const headerLike = (s: RecordStats | undefined): s is RecordStats =>
    s !== undefined && !s.preambleKey && (s.effective === columnCount || (columnCount >= 2 && s.effective >= 2 && Math.abs(s.effective - columnCount) <= 1));
  if (last && isUnitsRow(last) && !last.preambleKey) {
    units = last;
    preambleEnd--;
    const above = before[before.length - 2];
    if (headerLike(above) && !isUnitsRow(above)) {
      header = above;
      preambleEnd--;
    }
  } else if (headerLike(last)) {
    header = last;
    preambleEnd--;
  }
  const preamble: Record<string, string> = {};
  const entries = [];
  for (const s of before.slice(0, preambleEnd)) {
    const f = s.record.fields;
    let key = f[0].replace(/^[#%]\s*/, '');
    let value = f.slice(1).filter((x) => x !== '').join(combo.delimiter === ' ' ? ' ' : combo.delimiter);
    if (f.length === 1) {
      const m = /^([^:=]+)[:=]\s*(.*)$/.exec(key);
      if (m) {
        key = m[1].trim();
        value = m[2].trim();
      }
    }
    key = key.replace(/:$/, '').trim();
    preamble[key] = value;
    entries.push({ key, value, line: s.record.line });
  }
  const facts = readPreamble(entries, combo.decimalMark);

  // Columns.
  const dataRows = stats.slice(stats.indexOf(firstData)).filter((s) => !s.blank);
  const findings: Finding[] = [];
  const labelOf = (k: number): string => (header ? (header.record.fields[k] ?? '') : '');
  const unitsOf = (k: number): UnitToken | undefined => (units ? readUnitToken(units.record.fields[k] ?? '') : undefined);
  let timeColumn: number | null = null;
  let timeToken: UnitToken | undefined;
  const kinds: ('channel' | 'time' | 'ignored')[] = [];
  const columnNumbers: number[][] = [];
  const columnExponents: number[][] = [];
  for (let k = 0; k < columnCount; k++) {
    const values: number[] = [];
    const exps: number[] = [];
    for (const s of dataRows) {
      const v = parseNumberText(s.record.fields[k] ?? '', combo.decimalMark);
      values.push(v.value);
      exps.push(v.lastDigitExponent);
    }
    columnNumbers.push(values);
    columnExponents.push(exps);
  }
  for (let k = 0; k < columnCount; k++) {
    const { label, unit: labelUnit } = splitLabelUnit(labelOf(k));
    const token = unitsOf(k) ?? labelUnit;
    const isTime = token?.quantity === 'time' || (header !== undefined && TIME_LABELS.has(label.toLowerCase()));
    if (isTime) {
      if (timeColumn === null) {
        timeColumn = k;
        timeToken = token?.quantity === 'time' ? token : undefined;
        kinds.push('time');
      } else {
        kinds.push('ignored');
        findings.push(finding('ignored-column', 'info', `Column ${k + 1} ("${label}") is a second time column; it is not read.`, { at: { line: header?.record.line ?? firstData.record.line, column: k + 1 } }));
      }
      continue;
    }
    kinds.push('channel');
  }
  if (header === undefined && timeColumn === null && columnCount >= 2 && looksLikeTime(columnNumbers[0], columnExponents[0])) {
    timeColumn = 0;
    kinds[0] = 'time';
  }
  const timeFactorS = timeColumn === null ? 1 : (timeToken ?? facts.horizontalUnit)?.factor ?? 1;
  const timeUnit = timeColumn === null ? null : ((timeToken ?? facts.horizontalUnit)?.timeUnit ?? 's');

  const columns: SniffedColumn[] = [];
  let channelNumber = 0;
  for (let k = 0; k < columnCount; k++) {
    const raw = labelOf(k);
    const { label: base, unit: labelUnit } = splitLabelUnit(raw);
    if (kinds[k] !== 'channel') {
      columns.push({ kind: kinds[k], label: base, unit: '', factor: 1 });
      continue;
    }
    channelNumber++;
    if (!columnNumbers[k].some((v) => v === v)) {
      kinds[k] = 'ignored';
      columns.push({ kind: 'ignored', label: base, unit: '', factor: 1 });
      findings.push(finding('ignored-column', 'info', `Column ${k + 1}${base ? ` ("${base}")` : ''} holds no numbers in the first rows; it is not read as a channel.`, { at: { line: firstData.record.line, column: k + 1 } }));
      continue;
    }
    const token = unitsOf(k) ?? labelUnit ?? facts.verticalUnit;
    columns.push({
      kind: 'channel',
      label: base !== '' ? base : `CH${channelNumber}`,
      unit: token ? token.baseUnit : '',
      factor: token ? token.factor : 1,
    });
  }

  let referenceIntervalS = NaN;
  if (timeColumn !== null) {
    referenceIntervalS = referenceInterval(columnNumbers[timeColumn].map((t) => t * timeFactorS), columnExponents[timeColumn], timeFactorS);
  }
  if (!(referenceIntervalS > 0)) referenceIntervalS = facts.intervalS ?? (facts.rateHz ? 1 / facts.rateHz : NaN);

  return {
    delimiter: combo.delimiter,
    decimalMark: combo.decimalMark,
    lineEnding,
    preamble,
    headerLine: header ? header.record.line : null,
    unitsLine: units ? units.record.line : null,
    firstDataLine: firstData.record.line,
    timeColumn,
    timeUnit,
    columns,
    timeFactorS,
    facts,
    referenceIntervalS,
    dataOffset: offsetOfLine(bytes, start, firstData.record.line),
    findings,
  };
}
