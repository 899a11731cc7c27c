import { LineRegionFeeder } from './lineRegionFeeder.js';
import type { Capture, CaptureChannel } from '../model/capture.js';
import { CaptureError } from '../model/errors.js';
import { finding, type Finding } from '../model/findings.js';
import { LineFindingCollector } from './collectLineFindings.js';
import { mergeBodyPart, type BodyPart, type BodyPartPlacement, type BodyPartPlan } from './parseBodyPart.js';
import { COLUMN_CHANNEL, COLUMN_IGNORED, COLUMN_TIME, NumericBodyParser, type BodyPlan } from './parseNumericBody.js';
import { SNIFF_BYTES, sniffCaptureLayout, type SniffedLayout } from './sniffCaptureLayout.js';
import { TimebaseTracker } from './trackTimebase.js';
import { Utf16ToUtf8 } from './transcodeUtf16.js';

export interface ImportOptions {
  /** Override the sniffed field delimiter. */
  delimiter?: ',' | ';' | '\t';
  /** Override the sniffed decimal mark. */
  decimalMark?: '.' | ',';
  /** Refuse (CaptureError) a file with more rows than this per channel. */
  maxSamples?: number;
  /** Sample rate in hertz to use when the file has neither a time column nor a preamble interval. */
  sampleRateHz?: number;
  /**
   * Total size of the input in bytes when it is known (a file's size). The parser then sizes its
   * columns once from the bytes per row of the first lines, instead of doubling them as rows
   * arrive (which costs copies and up to twice the memory). Only a hint: any size is read right.
   */
  sizeHintBytes?: number;
  /**
   * Allocates the sample columns (zero-filled, `length` samples): e.g. over a SharedArrayBuffer,
   * so that other threads can read the capture without a copy. Default: new Float32Array(length).
   */
  allocateSamples?: (length: number) => Float32Array;
  /**
   * Rows added to the size-hint estimate when the columns are sized, as a fraction (default
   * 0.12). A read that will split the body between threads over allocateSamples memory asks
   * for more, so that head and part each find room in the one set of columns (pages never
   * written take no memory); such columns are then kept as they are, not copied to size.
   */
  presizeSlack?: number;
}

export interface CaptureLayout {
  delimiter: ',' | ';' | '\t' | ' ';
  decimalMark: '.' | ',';
  bom: boolean;
  lineEnding: 'lf' | 'crlf' | 'cr';
  /** Key/value lines before the header (keys as written). */
  preamble: Record<string, string>;
  /** 1-based line number of the label row, null if none. */
  headerLine: number | null;
  /** 1-based line number of the units row, null if none. */
  unitsLine: number | null;
  /** 1-based line number of the first data row. */
  firstDataLine: number;
  /** Zero-based column index of the time column, null when the file has none. */
  timeColumn: number | null;
  timeUnit: 's' | 'ms' | 'us' | null;
  sampleIntervalSource: 'time-column' | 'preamble' | 'none';
}

export interface ImportResult {
  capture: Capture;
  layout: CaptureLayout;
  findings: Finding[];
}

export interface CaptureParser {
  /** Feeds the next bytes of the file; chunks may split lines, numbers or UTF-8 characters anywhere. */
  push(chunk: Uint8Array): void;
  /** Ends the input. Throws CaptureError for an unusable file. */
  finish(): ImportResult;
}

/**
 * A capture parser whose body can be finished by a part parsed elsewhere (another thread): push
 * the head of the file up to a line start, take bodyPartPlan(), parse the rest with
 * BodyPartParser, then finishWithPart(). The result is the one a single pass gives.
 */
export interface SplittableCaptureParser extends CaptureParser {
  /**
   * The plan for parsing the bytes after those pushed so far apart (`partBytes` long), or
   * undefined when they cannot be: layout not sniffed yet, not UTF-8, CR-only line ends, an
   * error or the row limit already met. The plan holds however far the head is pushed, but the
   * head must end with a line feed (LF, or the LF of a CRLF) before finishWithPart().
   */
  bodyPartPlan(partBytes: number): BodyPartPlan | undefined;
  /**
   * Ends the input with the part parsed from the plan; undefined (the parser is then spent) when
   * the rows together pass the row limit: parse the file in one pass for the exact error.
   * Throws CaptureError for an unusable file, as finish() does.
   */
  finishWithPart(part: BodyPart): ImportResult | undefined;
  /**
   * Merges one part (a slice of the bytes after the head: parts follow one another in file
   * order) after the rows so far; false (the parser is then spent) when the rows together pass
   * the row limit. After the first part the head takes no more bytes.
   */
  appendPart(part: BodyPart): boolean;
  /** Ends the input after the parts appended; the result is the one a single pass gives. */
  finishAppended(): ImportResult;
}

/** createCaptureParser, with the split-body methods. */
export function createSplittableCaptureParser(options: ImportOptions = {}): SplittableCaptureParser {
  checkOptions(options);
  return new StreamingCaptureParser(options);
}

/** Default ImportOptions.presizeSlack. */
const PRESIZE_SLACK = 0.12;

/** Relative disagreement between a preamble interval and the time column worth a finding. */
const INTERVAL_MISMATCH = 1e-3;

const DELIMITER_BYTE = { ',': 44, ';': 59, '\t': 9, ' ': 32 } as const;

/**
 * Streaming import of an oscilloscope CSV capture: sniffs the layout from the first 64 KiB
 * (delimiter, decimal mark, preamble, header, units row, time column), then parses the numeric
 * body byte by byte into Float32 columns (see NumericBodyParser). The sample interval comes from
 * a least-squares line over the whole time column (TimebaseTracker) or from the preamble.
 */
export function createCaptureParser(options: ImportOptions = {}): CaptureParser {
  checkOptions(options);
  return new StreamingCaptureParser(options);
}

/**
 * Bytes per push() when parseCaptureBytes feeds a whole file: the head is copied until the
 * layout is sniffed, and one call over a 400 MB file ran at about half the speed of 1 MiB
 * pushes (measured: the parse loop's first call is then one long on-stack-compiled run).
 */
const BYTES_PER_PUSH = 1 << 20;

/** Parses one complete file given as bytes; same result as pushing it in chunks. */
export function parseCaptureBytes(bytes: Uint8Array, options?: ImportOptions): ImportResult {
  const parser = createCaptureParser({ sizeHintBytes: bytes.length, ...options });
  for (let at = 0; at < bytes.length; at += BYTES_PER_PUSH) parser.push(bytes.subarray(at, Math.min(bytes.length, at + BYTES_PER_PUSH)));
  return parser.finish();
}

function checkOptions(o: ImportOptions): void {
  if (o === null || typeof o !== 'object') throw new TypeError('options must be an object');
  if (o.delimiter !== undefined && !(o.delimiter === ',' || o.delimiter === ';' || o.delimiter === '\t')) {
    throw new RangeError(`options.delimiter must be ",", ";" or "\\t", not ${JSON.stringify(o.delimiter)}`);
  }
  if (o.decimalMark !== undefined && o.decimalMark !== '.' && o.decimalMark !== ',') {
    throw new RangeError(`options.decimalMark must be "." or ",", not ${JSON.stringify(o.decimalMark)}`);
  }
  if (o.delimiter === ',' && o.decimalMark === ',') throw new RangeError('options.delimiter and options.decimalMark cannot both be ","');
  if (o.maxSamples !== undefined && !(Number.isInteger(o.maxSamples) && o.maxSamples >= 1)) {
    throw new RangeError(`options.maxSamples must be a positive integer, not ${o.maxSamples}`);
  }
  if (o.allocateSamples !== undefined && typeof o.allocateSamples !== 'function') throw new TypeError('options.allocateSamples must be a function');
  if (o.presizeSlack !== undefined && !(Number.isFinite(o.presizeSlack) && o.presizeSlack >= 0 && o.presizeSlack <= 4)) {
    throw new RangeError(`options.presizeSlack must be a fraction from 0 to 4, not ${o.presizeSlack}`);
  }
  if (o.sizeHintBytes !== undefined && !(Number.isFinite(o.sizeHintBytes) && o.sizeHintBytes >= 0)) {
    throw new RangeError(`options.sizeHintBytes must be a non-negative finite number, not ${o.sizeHintBytes}`);
  }
  if (o.sampleRateHz !== undefined && !(Number.isFinite(o.sampleRateHz) && o.sampleRateHz > 0)) {
    throw new RangeError(`options.sampleRateHz must be a positive finite number, not ${o.sampleRateHz}`);
  }
}

class StreamingCaptureParser implements SplittableCaptureParser {
  private readonly head: Uint8Array[] = [];
  private headBytes = 0;
  private sniffed: SniffedLayout | undefined;
  private body: NumericBodyParser | undefined;
  private timebase: TimebaseTracker | undefined;
  private readonly findings = new LineFindingCollector(5);
  private error: CaptureError | undefined;
  private transcoder: Utf16ToUtf8 | undefined;
  private encoding: 'utf-8' | 'utf-16le' | 'utf-16be' = 'utf-8';
  private bom = false;
  private feeder: LineRegionFeeder | undefined;
  private finished = false;
  /** Set by the first appendPart(): no more bytes of the head may be pushed. */
  private appending = false;
  private bodyPlan: BodyPlan | undefined;
  /** The room given to a part parsed apart (see placePart); null when there is none. */
  private placement: BodyPartPlacement | null | undefined;
  /** Mean bytes per row of the first chunk (expectedRows), 0 when not measured. */
  private bytesPerRow = 0;
  private dataBytes = 0;
  private lastPushedByte = -1;

  private readonly options: ImportOptions;

  constructor(options: ImportOptions) {
    this.options = options;
  }

  push(chunk: Uint8Array): void {
    if (!(chunk instanceof Uint8Array)) throw new TypeError('push() takes a Uint8Array');
    if (this.finished) throw new RangeError('push() called after finish()');
    if (this.appending) throw new RangeError('push() called after appendPart()');
    if (this.error !== undefined || chunk.length === 0) return;
    this.lastPushedByte = chunk[chunk.length - 1];
    // One element type for the hot loops: a Uint8Array subclass (e.g. Node's Buffer) has another
    // map, and a mix of both makes every byte load polymorphic.
    if (Object.getPrototypeOf(chunk) !== Uint8Array.prototype) chunk = new Uint8Array(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    if (this.body === undefined) {
      this.head.push(chunk.slice());
      this.headBytes += chunk.length;
      if (this.headBytes >= SNIFF_BYTES + 4) this.sniff(false);
      return;
    }
    this.feed(this.transcoder ? this.transcoder.push(chunk) : chunk);
  }

  finish(): ImportResult {
    if (this.finished) throw new RangeError('finish() called twice');
    this.finished = true;
    if (this.error === undefined && this.body === undefined) {
      if (this.headBytes === 0) this.error = new CaptureError('The file is empty (0 bytes). Export the capture again as CSV', { line: 1 });
      else this.sniff(true);
    }
    if (this.error !== undefined) throw this.error;
    if (this.transcoder) this.feed(this.transcoder.finish());
    this.feeder!.flush();
    return this.result();
  }

  bodyPartPlan(partBytes: number): BodyPartPlan | undefined {
    if (!(Number.isFinite(partBytes) && partBytes >= 0)) throw new RangeError(`partBytes must be a non-negative finite number, not ${partBytes}`);
    if (!this.splittable()) return undefined;
    const plan = this.bodyPlan!;
    // Rows to presize: the head's estimate for the whole body, in proportion to the part's bytes.
    const expectedRows = plan.expectedRows > 0 && this.dataBytes > 0 ? Math.ceil((plan.expectedRows * partBytes) / this.dataBytes) + 64 : 0;
    this.placement ??= this.placePart(partBytes);
    return {
      body: { ...plan, firstLine: 1, expectedRows: Math.min(expectedRows, plan.maxSamples) },
      timeStamps: this.timebase !== undefined,
      perCodeLimit: this.findings.perCodeLimit,
      ...(this.placement !== null ? { placement: this.placement } : {}),
    };
  }

  private splittable(): boolean {
    const s = this.sniffed;
    const body = this.body;
    if (this.finished || this.error !== undefined || s === undefined || body === undefined || this.bodyPlan === undefined) return false;
    return this.encoding === 'utf-8' && s.lineEnding !== 'cr' && body.limitLine === 0;
  }

  /**
   * Room for a part of `partBytes` bytes at the end of the head's columns, when they lie in
   * shared memory (ImportOptions.allocateSamples) and were sized from the file's size: the
   * columns' slack beyond the estimated rows of head and part is split between the two, the head
   * is fenced where the part's room begins, and the part parses into the rest (null: no room).
   */
  private placePart(partBytes: number): BodyPartPlacement | null {
    const body = this.body!;
    const plan = this.bodyPlan!;
    const channels = body.columns.filter((c, k) => plan.kinds[k] === COLUMN_CHANNEL);
    if (!(this.dataBytes > 0 && partBytes > 0 && partBytes < this.dataBytes && plan.expectedRows > 0)) return null;
    if (!channels.every((c) => typeof SharedArrayBuffer !== 'undefined' && c.buffer instanceof SharedArrayBuffer && c.length === channels[0]!.length)) return null;
    const capacity = channels[0]!.length;
    const bytesPerRow = this.bytesPerRow;
    if (!(bytesPerRow > 0)) return null;
    const headRows = (this.dataBytes - partBytes) / bytesPerRow;
    const slack = capacity - this.dataBytes / bytesPerRow;
    const firstRow = Math.ceil(headRows + slack / 2);
    if (!(slack > 0 && firstRow > body.rows && firstRow < capacity)) return null;
    body.fence(firstRow);
    return { firstRow, columns: body.columns.map((c, k) => (plan.kinds[k] === COLUMN_CHANNEL ? c.subarray(firstRow) : undefined)) };
  }

  appendPart(part: BodyPart): boolean {
    if (this.finished) throw new RangeError('appendPart() called after the parser finished');
    const body = this.body;
    if (!this.appending) {
      if (!this.splittable()) throw new RangeError('appendPart() needs a parser that gave a body part plan');
      if (this.lastPushedByte !== 10 || this.feeder!.pendingBytes > 0) throw new RangeError('appendPart() needs the bytes pushed to end with a line feed');
      this.appending = true;
    }
    if (!mergeBodyPart(body!, this.timebase, this.findings, part, this.bodyPlan!.timeFactorS, this.bodyPlan!.maxSamples, this.placement ?? undefined)) {
      this.finished = true;
      return false;
    }
    return true;
  }

  finishAppended(): ImportResult {
    if (this.finished || !this.appending) throw new RangeError('finishAppended() needs appendPart() to have merged a part');
    this.finished = true;
    return this.result();
  }

  finishWithPart(part: BodyPart): ImportResult | undefined {
    return this.appendPart(part) ? this.finishAppended() : undefined;
  }

  /** The first `rows` samples of a column, in a column of their own. */
  private copyOf(column: Float32Array, rows: number): Float32Array {
    const allocate = this.options.allocateSamples;
    if (allocate === undefined) return column.slice(0, rows);
    const copy = allocate(rows);
    copy.set(column.subarray(0, rows));
    return copy;
  }

  private sniff(final: boolean): void {
    let buf: Uint8Array;
    if (this.head.length === 1) buf = this.head[0];
    else {
      buf = new Uint8Array(this.headBytes);
      let o = 0;
      for (const h of this.head) {
        buf.set(h, o);
        o += h.length;
      }
    }
    this.head.length = 0;
    let start = 0;
    if (buf.length >= 3 && buf[0] === 0xef && buf[1] === 0xbb && buf[2] === 0xbf) {
      start = 3;
      this.bom = true;
    } else if (buf.length >= 2 && ((buf[0] === 0xff && buf[1] === 0xfe) || (buf[0] === 0xfe && buf[1] === 0xff))) {
      const le = buf[0] === 0xff;
      this.bom = true;
      this.encoding = le ? 'utf-16le' : 'utf-16be';
      this.transcoder = new Utf16ToUtf8(le);
      const converted = this.transcoder.push(buf.subarray(2));
      if (final) {
        const rest = this.transcoder.finish();
        buf = new Uint8Array(converted.length + rest.length);
        buf.set(converted);
        buf.set(rest, converted.length);
      } else buf = converted.slice();
    }
    try {
      this.sniffed = sniffCaptureLayout(buf, start, final, this.options);
    } catch (e) {
      if (e instanceof CaptureError) {
        this.error = e;
        return;
      }
      throw e;
    }
    const s = this.sniffed;
    const columnCount = s.columns.length;
    const kinds = new Uint8Array(columnCount);
    const scales = new Float64Array(columnCount);
    s.columns.forEach((c, k) => {
      kinds[k] = c.kind === 'channel' ? COLUMN_CHANNEL : c.kind === 'time' ? COLUMN_TIME : COLUMN_IGNORED;
      scales[k] = c.factor;
    });
    const plan: BodyPlan = {
      delimiter: DELIMITER_BYTE[s.delimiter],
      decimalMark: s.decimalMark === ',' ? 44 : 46,
      columnCount,
      kinds,
      scales,
      labels: s.columns.map((c) => c.label),
      timeFactorS: s.timeFactorS,
      firstLine: s.firstDataLine,
      expectedRows: this.expectedRows(buf, s),
      maxSamples: this.options.maxSamples ?? Infinity,
      growthFactor: this.options.sizeHintBytes !== undefined && this.encoding === 'utf-8' ? 1.25 : 2,
    };
    this.bodyPlan = plan;
    this.dataBytes = this.options.sizeHintBytes !== undefined ? Math.max(0, this.options.sizeHintBytes - s.dataOffset) : 0;
    if (s.timeColumn !== null) this.timebase = new TimebaseTracker(s.referenceIntervalS, this.findings);
    const body = new NumericBodyParser(plan, this.findings, this.timebase, undefined, this.options.allocateSamples);
    this.body = body;
    this.feeder = new LineRegionFeeder((bytes, from, to) => body.parseRegion(bytes, from, to));
    this.feed(buf.subarray(s.dataOffset));
  }

  /**
   * Rows to allocate up front. With a size hint: the data bytes left divided by the mean bytes
   * per row of the first chunk, plus presizeSlack (rows vary in length with signs and digits:
   * on the bench's 10^7-row capture, whose time stamps print shorter after the first second,
   * the first 64 KiB under-estimate the rows by about 10 %, measured). Without
   * one: the preamble's record length, but at most 2^20 rows, so that a wrong preamble cannot
   * make the parser allocate more than the file needs before the first row is read.
   */
  private expectedRows(buf: Uint8Array, s: SniffedLayout): number {
    const hint = this.options.sizeHintBytes;
    const announced = s.facts.recordLength ?? 0;
    if (hint === undefined || this.encoding !== 'utf-8') return Math.min(announced, 1 << 20);
    let lines = 0;
    let last = s.dataOffset;
    const terminator = s.lineEnding === 'cr' ? 13 : 10;
    for (let i = s.dataOffset; i < buf.length; i++) {
      if (buf[i] === terminator) {
        lines++;
        last = i + 1;
      }
    }
    if (lines < 8) return Math.min(announced, 1 << 20);
    const bytesPerRow = (last - s.dataOffset) / lines;
    this.bytesPerRow = bytesPerRow;
    const estimate = Math.ceil(((hint - s.dataOffset) / bytesPerRow) * (1 + (this.options.presizeSlack ?? PRESIZE_SLACK))) + 64;
    return announced > 0 ? Math.min(announced, estimate) : estimate;
  }

  /** Hands complete lines to the body parser; keeps a trailing partial line for the next chunk. */
  private feed(chunk: Uint8Array): void {
    this.feeder!.feed(chunk);
  }

  private result(): ImportResult {
    const s = this.sniffed!;
    const body = this.body!;
    const rows = body.rows;
    const findings: Finding[] = [...s.findings];
    if (this.encoding !== 'utf-8') {
      findings.push(finding('text-encoding', 'info', `The file is ${this.encoding === 'utf-16le' ? 'UTF-16LE' : 'UTF-16BE'} text; it was converted to UTF-8 for reading.`));
    }
    if (body.limitLine > 0 && body.countedRows > 0) {
      throw new CaptureError(
        `The capture has ${rows + body.countedRows} samples per channel, more than the limit of ${this.options.maxSamples}; export a shorter record or raise the limit`,
        { line: body.limitLine },
      );
    }
    if (rows === 0) {
      throw new CaptureError('No rows of numbers found after the header; export the capture with its sample values', { line: s.firstDataLine });
    }
    if (rows === 1) {
      throw new CaptureError('The capture has only one data row; at least two samples are needed. Export a longer record', { line: s.firstDataLine });
    }
    const channelColumns = s.columns.map((c, k) => ({ c, k })).filter(({ c }) => c.kind === 'channel');
    if (channelColumns.length === 0) {
      throw new CaptureError('The file has no signal columns (only a time column); export the channels with the capture', { line: s.headerLine ?? s.firstDataLine });
    }

    let sampleRateHz: number;
    let startS = 0;
    let source: CaptureLayout['sampleIntervalSource'];
    const facts = s.facts;
    const preambleIntervalS = facts.intervalS ?? (facts.rateHz !== undefined ? 1 / facts.rateHz : undefined);
    const preambleLine = facts.intervalS !== undefined ? facts.intervalLine : facts.rateLine;
    if (this.timebase) {
      const fit = this.timebase.fit();
      const where = { line: s.firstDataLine, column: (s.timeColumn ?? 0) + 1 };
      if (fit === undefined) {
        throw new CaptureError('The time column has fewer than two numeric time stamps, so the sample rate is unknown; fix the time column or remove it and add a "Sample Interval" line', where);
      }
      if (!(fit.intervalS > 0) || !Number.isFinite(fit.intervalS)) {
        throw new CaptureError('The time column does not increase, so the sample rate is unknown; check that the first column is time, or export the time base', where);
      }
      sampleRateHz = 1 / fit.intervalS;
      startS = fit.startS;
      source = 'time-column';
      if (preambleIntervalS !== undefined && Math.abs(preambleIntervalS / fit.intervalS - 1) > INTERVAL_MISMATCH) {
        findings.push(finding('sample-interval-mismatch', 'warning',
          `The preamble gives a sample interval of ${preambleIntervalS} s but the time column spaces samples ${fit.intervalS.toPrecision(6)} s apart; the time column is used.`,
          { figures: { preambleIntervalS, timeColumnIntervalS: fit.intervalS }, ...(preambleLine !== undefined ? { at: { line: preambleLine } } : {}) }));
      }
      if (this.timebase.missing > 0) {
        findings.push(finding('uneven-sampling', 'warning', `${this.timebase.missing} time stamps are not numbers; those samples are kept but left out of the sample-rate fit.`, { figures: { count: this.timebase.missing } }));
      }
    } else if (preambleIntervalS !== undefined) {
      sampleRateHz = facts.intervalS !== undefined ? 1 / facts.intervalS : facts.rateHz!;
      startS = facts.startS ?? 0;
      source = 'preamble';
    } else if (this.options.sampleRateHz !== undefined) {
      sampleRateHz = this.options.sampleRateHz;
      source = 'none';
    } else {
      throw new CaptureError(
        'The sample rate is unknown: the file has no time column and no "Sample Interval" line. Add a time column, or a line such as "Sample Interval,1.0E-05" (seconds) before the header, or give the sample rate',
        { line: s.headerLine ?? s.firstDataLine },
      );
    }
    if (this.options.sampleRateHz !== undefined && source !== 'none') {
      findings.push(finding('sample-rate-option-ignored', 'info', `The file gives the sample rate (${sampleRateHz} Hz); the sample rate passed in (${this.options.sampleRateHz} Hz) is not used.`));
    }
    if (facts.recordLength !== undefined && facts.recordLength !== rows) {
      findings.push(finding('record-length-mismatch', 'info', `The preamble announces ${facts.recordLength} points but the file holds ${rows} rows.`, { figures: { announced: facts.recordLength, rows } }));
    }

    const channels: CaptureChannel[] = channelColumns.map(({ c, k }) => {
      const column = body.columns[k];
      // A view when little is unused (a presized column), a copy otherwise (frees the rest).
      const keepView = rows >= 0.85 * column.length || (this.placement != null && this.options.presizeSlack !== undefined);
      const samples = column.length === rows ? column : keepView ? column.subarray(0, rows) : this.copyOf(column, rows);
      return { column: k, label: c.label, unit: c.unit, samples };
    });
    const capture: Capture = { sampleRateHz, startS, sampleCount: rows, channels };
    const layout: CaptureLayout = {
      delimiter: s.delimiter,
      decimalMark: s.decimalMark,
      bom: this.bom,
      lineEnding: s.lineEnding,
      preamble: s.preamble,
      headerLine: s.headerLine,
      unitsLine: s.unitsLine,
      firstDataLine: s.firstDataLine,
      timeColumn: s.timeColumn,
      timeUnit: s.timeUnit,
      sampleIntervalSource: source,
    };
    return { capture, layout, findings: [...findings, ...this.findings.result()] };
  }
}
