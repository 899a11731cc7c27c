import { composeDecimal, int16Exponent, NEG_POW10 } from './composeDecimal.js';
import { decodeUtf8 } from './decodeUtf8.js';
import { OVERRANGE_MAGNITUDE, parseNumberText, unquoteCell } from './parseNumberText.js';
import type { LineFindingCollector } from './collectLineFindings.js';

/** Receives each row's time stamp (TimebaseTracker, or a recorder for a body parsed apart). */
export interface TimeStampSink {
  add(tS: number, lastDigitExponent: number, factorS: number, row: number, line: number): void;
  /**
   * The stamps times[from..to) with their exponents, as add(times[r], exponents[r], factorS,
   * r + rowShift, r + lineShift) for each r in order.
   */
  addRun(times: Float64Array, exponents: Int16Array, factorS: number, from: number, to: number, rowShift: number, lineShift: number): void;
}

/**
 * Rows the clean-row fast path takes per call. Their time stamps are collected and go to the
 * sink in one addRun() call: a call per row with a double argument boxes it (a heap allocation
 * per row when the call is not inlined: hundreds of young-generation collections on a
 * 10^7-row capture, measured). Short calls also get the function optimised whole: one call per
 * 1 MiB read was compiled on stack (OSR) with no feedback for the code after its loop, and that
 * code deoptimised at the end of every call, ~400 times per thread on a 10^7-row capture
 * (seen with --trace-deopt).
 */
const CLEAN_ROWS_PER_CALL = 4096;
const WARM_UP_CALLS = 4;
const WARM_UP_ROWS = 8;

/**
 * A per-line report held back instead of becoming a finding, with the line counted from the
 * start of the part parsed: a body parsed in parts (one per thread) replays them in order.
 */
export type BodyEvent =
  | { readonly kind: 'non-numeric'; readonly line: number; readonly col: number; readonly text: string }
  | { readonly kind: 'empty'; readonly line: number; readonly col: number; readonly count: number }
  | { readonly kind: 'overrange'; readonly line: number; readonly col: number; readonly text: string }
  | { readonly kind: 'ragged'; readonly line: number; readonly cells: number; readonly tooMany: boolean };

/** Held reports: the first `limit` per finding code in full, then only a count per code. */
export interface HeldBodyEvents {
  readonly limit: number;
  readonly events: BodyEvent[];
  readonly counts: Record<string, number>;
}

/** What the body parser does with each column of the file. */
export const COLUMN_CHANNEL = 0;
export const COLUMN_TIME = 1;
export const COLUMN_IGNORED = 2;

export interface BodyPlan {
  readonly delimiter: number; // byte: 44 ',', 59 ';', 9 tab, 32 space
  readonly decimalMark: number; // byte: 46 '.', 44 ','
  /** Number of real columns (a trailing empty column from a trailing delimiter is not counted). */
  readonly columnCount: number;
  /** COLUMN_CHANNEL / COLUMN_TIME / COLUMN_IGNORED per column. */
  readonly kinds: Uint8Array;
  /** Factor to the base unit per column (1e-3 for a column in mV). */
  readonly scales: Float64Array;
  /** Column labels, for finding messages. */
  readonly labels: readonly string[];
  /** Seconds per unit of the time column. */
  readonly timeFactorS: number;
  /** 1-based line number of the first byte handed to the parser. */
  readonly firstLine: number;
  /** Rows to allocate up front (from the preamble's record length), 0 for a default. */
  readonly expectedRows: number;
  /** Refuse more rows than this (Infinity for no limit). */
  readonly maxSamples: number;
  /** Factor by which full columns grow (2 without a size estimate, less with one). */
  readonly growthFactor?: number;
}

const LF = 10;
const CR = 13;
const QUOTE = 34;
const EMPTY_F32 = new Float32Array(0);

/**
 * Byte-level parser for the numeric body of a capture file: a hand-written state machine that
 * reads cells straight from the bytes into growable Float32Array columns (capacity doubles), with
 * no per-cell strings and no regular expressions. A cell matching the numeric grammar (sign,
 * digits, one decimal mark, exponent) is converted by composeDecimal; anything else (quoted
 * cells, words, overrange markers, non-ASCII) drops to a slow path that decodes that one cell.
 *
 * Input is handed over in regions that end just after a line terminator (LF, CR or CRLF; a CRLF
 * split between two regions is handled), so the hot loop needs no bounds checks: every loop
 * stops at a terminator byte. A line break inside a quoted cell ends the row here (the header,
 * where RFC 4180 line breaks in labels do occur, is read by the sniffer instead).
 */
export class NumericBodyParser {
  rows = 0;
  private capacity: number;
  readonly columns: Float32Array[];
  /** Next physical line number (1-based). */
  line: number;
  private pendingCR = false;
  /** Set once the row limit is passed: the rest is only counted. */
  limitLine = 0;
  countedRows = 0;
  nonNumericCells = 0;
  overrangeCells = 0;
  emptyCells = 0;
  raggedRows = 0;

  private readonly plan: BodyPlan;
  private readonly findings: LineFindingCollector;
  private readonly timebase: TimeStampSink | undefined;
  private readonly held: HeldBodyEvents | undefined;

  private readonly allocate: (length: number) => Float32Array;
  /** Scratch for the time stamps of a run of clean rows (see CLEAN_ROWS_PER_CALL). */
  private readonly stamps = new Float64Array(CLEAN_ROWS_PER_CALL);
  private readonly stampExponents = new Int16Array(CLEAN_ROWS_PER_CALL);
  /** Calls of the clean-row fast path so far (the first ones are short, see there). */
  private cleanCalls = 0;
  /** True when the last call of the fast path stopped only because its block was full. */
  private cleanBlockFull = false;

  /**
   * With `held`, per-line reports are kept there (see BodyEvent) instead of going to `findings`;
   * `allocate` makes the sample columns (default: new Float32Array). `given`: columns to parse
   * into first (one per file column, the channel ones of equal length, e.g. views of memory
   * shared with another thread), instead of allocating them; they are left when they fill up.
   */
  constructor(
    plan: BodyPlan,
    findings: LineFindingCollector,
    timebase: TimeStampSink | undefined,
    held?: HeldBodyEvents,
    allocate?: (length: number) => Float32Array,
    given?: readonly (Float32Array | undefined)[],
  ) {
    this.plan = plan;
    this.allocate = allocate ?? ((length) => new Float32Array(length));
    this.findings = findings;
    this.timebase = timebase;
    this.held = held;
    this.columns = [];
    if (given !== undefined) {
      let capacity = Infinity;
      for (let k = 0; k < plan.columnCount; k++) {
        const c = plan.kinds[k] === COLUMN_CHANNEL ? given[k] : EMPTY_F32;
        if (c === undefined) throw new RangeError(`no column given for channel column ${k + 1}`);
        if (c !== EMPTY_F32) capacity = Math.min(capacity, c.length);
        this.columns.push(c);
      }
      this.capacity = Math.min(capacity, plan.maxSamples);
    } else {
      const initial = Math.min(Math.max(16, Math.min(plan.expectedRows > 0 ? plan.expectedRows : 4096, 1 << 28)), plan.maxSamples);
      this.capacity = initial;
      for (let k = 0; k < plan.columnCount; k++) {
        this.columns.push(plan.kinds[k] === COLUMN_CHANNEL ? this.allocate(initial) : EMPTY_F32);
      }
    }
    this.line = plan.firstLine;
  }

  /**
   * Stops filling the columns at `rows` (at least the rows read, at most the capacity): rows
   * beyond go to grown columns, so that another thread may write the memory past it.
   */
  fence(rows: number): void {
    if (!(Number.isInteger(rows) && rows >= this.rows && rows <= this.capacity)) throw new RangeError(`cannot fence the columns at row ${rows}`);
    this.capacity = rows;
  }

  private grow(): boolean {
    if (this.capacity >= this.plan.maxSamples) return false;
    // Called when the rows reach the capacity (which a fence may have set below the length).
    this.resize(Math.min(Math.ceil(this.capacity * (this.plan.growthFactor ?? 2)) + 16, this.plan.maxSamples), this.capacity);
    return true;
  }

  /** New channel columns of `length` samples holding the first `keep` of the old ones. */
  private resize(length: number, keep: number): void {
    for (let k = 0; k < this.columns.length; k++) {
      const old = this.columns[k];
      if (old.length === 0) continue;
      const grown = this.allocate(length);
      grown.set(old.subarray(0, keep));
      this.columns[k] = grown;
    }
    this.capacity = length;
  }

  /** True when the last region ended with a CR whose LF may begin the next one. */
  get awaitingLf(): boolean {
    return this.pendingCR;
  }

  /** Parses buf[start, end); buf[end - 1] must be LF or CR. */
  parseRegion(buf: Uint8Array, start: number, end: number): void {
    let p = start;
    if (this.pendingCR) {
      this.pendingCR = false;
      if (p < end && buf[p] === LF) p++;
    }
    if (this.limitLine > 0) {
      this.countRest(buf, p, end);
      return;
    }
    const plan = this.plan;
    const delim = plan.delimiter;
    const dec = plan.decimalMark;
    const collapse = delim === 32;
    // Blanks around a number (never the delimiter itself); -1 never matches a byte.
    const blankA = collapse ? -1 : 32;
    const blankB = delim === 9 ? -1 : 9;
    const columnCount = plan.columnCount;
    const kinds = plan.kinds;
    const scales = plan.scales;
    const columns = this.columns;
    const timebase = this.timebase;
    const timeFactor = plan.timeFactorS;
    let row = this.rows;
    let line = this.line;
    let c = 0;
    const fastRows = !collapse && columnCount > 0;

    while (p < end) {
      if (row === this.capacity && !this.grow()) {
        this.rows = row;
        this.line = line;
        this.limitLine = line;
        this.countRest(buf, p, end);
        return;
      }
      if (fastRows) {
        this.rows = row;
        this.line = line;
        // A block at a time (see CLEAN_ROWS_PER_CALL), until a row the fast path does not
        // take, the capacity or the end of the region.
        do p = this.parseCleanRows(buf, p, end);
        while (this.cleanBlockFull);
        row = this.rows;
        line = this.line;
        if (p >= end) break;
        if (row === this.capacity) continue;
      }
      let col = 0;
      let content = false;
      let extra = false;
      let firstEmptyCol = -1;
      let emptyInRow = 0;
      let timeValue = NaN;
      let timeExp = 0;
      c = buf[p];
      if (collapse) while (c === 32) c = buf[++p];

      for (;;) {
        const cellStart = p;
        while (c === blankA || c === blankB) c = buf[++p];
        const numberStart = p;
        let negative = false;
        if (c === 45) {
          negative = true;
          c = buf[++p];
        } else if (c === 43) {
          c = buf[++p];
        }
        // Digits accumulate into a double; digit counts come from positions, so the loops do
        // nothing else. More than 19 digits go to the (exact) slow path.
        let mantissa = 0;
        const intStart = p;
        while (c >= 48 && c <= 57) {
          mantissa = mantissa * 10 + (c - 48);
          c = buf[++p];
        }
        let digits = p - intStart;
        let exp10 = 0;
        if (c === dec) {
          c = buf[++p];
          const fracStart = p;
          while (c >= 48 && c <= 57) {
            mantissa = mantissa * 10 + (c - 48);
            c = buf[++p];
          }
          exp10 = fracStart - p;
          digits -= exp10;
        }
        let ok = digits > 0 && digits <= 19;
        if (ok && ((c | 32) === 101 || (c | 32) === 100)) {
          c = buf[++p];
          let expNegative = false;
          if (c === 45) {
            expNegative = true;
            c = buf[++p];
          } else if (c === 43) {
            c = buf[++p];
          }
          let e = 0;
          ok = c >= 48 && c <= 57;
          while (c >= 48 && c <= 57) {
            if (e < 100000) e = e * 10 + (c - 48);
            c = buf[++p];
          }
          exp10 += expNegative ? -e : e;
        }
        while (c === blankA || c === blankB) c = buf[++p];
        const atEnd = c === delim || c === LF || c === CR;
        let value: number;
        let isEmpty = false;
        if (ok && atEnd) {
          value = composeDecimal(mantissa, exp10);
          if (negative) value = -value;
          if (!(value < OVERRANGE_MAGNITUDE && value > -OVERRANGE_MAGNITUDE)) {
            value = NaN;
            if (col < columnCount && kinds[col] !== COLUMN_IGNORED) this.reportOverrange(line, col, buf, numberStart, p);
          }
        } else if (atEnd && p === numberStart) {
          value = NaN;
          isEmpty = true;
        } else {
          // Slow path: find the end of the cell (RFC 4180 quoting within the line) and classify it.
          p = cellStart;
          c = buf[p];
          while (c === 32 || c === 9) {
            if (c === delim) break;
            c = buf[++p];
          }
          if (c === QUOTE) {
            c = buf[++p];
            for (;;) {
              if (c === LF || c === CR) break;
              if (c === QUOTE) {
                c = buf[++p];
                if (c === QUOTE) {
                  c = buf[++p];
                  continue;
                }
                break;
              }
              c = buf[++p];
            }
          }
          while (c !== delim && c !== LF && c !== CR) c = buf[++p];
          let cellEnd = p;
          if (collapse) while (cellEnd > cellStart && buf[cellEnd - 1] === 32) cellEnd--;
          value = NaN;
          if (col < columnCount && kinds[col] !== COLUMN_IGNORED) {
            const text = unquoteCell(decodeUtf8(buf, cellStart, cellEnd).text);
            const parsed = parseNumberText(text, dec === 44 ? ',' : '.');
            if (parsed.kind === 'number') {
              value = parsed.value;
              exp10 = parsed.lastDigitExponent;
            } else if (parsed.kind === 'empty') {
              isEmpty = true;
            } else if (parsed.kind === 'overrange') {
              this.reportOverrangeText(line, col, () => text);
            } else {
              this.reportNonNumeric(line, col, text);
            }
          } else if (col >= columnCount) {
            // Beyond the known columns: only whether it holds anything matters.
            isEmpty = true;
            for (let k = cellStart; k < cellEnd; k++) {
              const b = buf[k];
              if (b !== 32 && b !== 9 && b !== QUOTE) {
                isEmpty = false;
                break;
              }
            }
          }
        }

        if (col < columnCount) {
          const kind = kinds[col];
          if (kind === COLUMN_CHANNEL) columns[col][row] = value * scales[col];
          else if (kind === COLUMN_TIME) {
            timeValue = value;
            timeExp = exp10;
          }
          if (isEmpty && kind !== COLUMN_IGNORED) {
            if (firstEmptyCol < 0) firstEmptyCol = col;
            emptyInRow++;
          }
        } else if (!isEmpty) extra = true;
        if (!isEmpty) content = true;
        col++;
        if (c === delim) {
          c = buf[++p];
          if (collapse) {
            while (c === 32) c = buf[++p];
            if (c === LF || c === CR) break;
          }
          continue;
        }
        break;
      }

      // c is LF or CR.
      p++;
      if (c === CR) {
        if (p < end) {
          if (buf[p] === LF) p++;
        } else this.pendingCR = true;
      }
      const thisLine = line;
      line++;
      if (!content) continue; // blank line, or only delimiters and blanks

      if (emptyInRow > 0) this.reportEmpty(thisLine, firstEmptyCol, emptyInRow);
      if (col < columnCount) {
        for (let k = col; k < columnCount; k++) if (kinds[k] === COLUMN_CHANNEL) columns[k][row] = NaN;
        this.reportRagged(thisLine, col, false);
      } else if (extra) this.reportRagged(thisLine, col, true);
      if (timebase !== undefined) {
        timebase.add(timeValue * timeFactor, timeExp, timeFactor, row, thisLine);
      }
      row++;
    }
    this.rows = row;
    this.line = line;
  }

  /**
   * Fast path for the common row: exactly columnCount plain numbers (sign, at most 19 digits,
   * optional e-exponent), no blanks, no quotes, values within range. Digits accumulate in one
   * double, as in the general path; a cell whose mantissa reaches 2^53 leaves the fast path, so
   * every partial sum here is an exact integer and both paths give the same value.
   * Parses such rows from p on and returns where it stopped: at the first row it cannot read
   * (left untouched for the general state machine in parseRegion, so both paths give the same
   * samples and findings), at the end of the region or when the columns are full.
   */
  private parseCleanRows(buf: Uint8Array, start: number, end: number): number {
    const plan = this.plan;
    const delim = plan.delimiter;
    const dec = plan.decimalMark;
    const columnCount = plan.columnCount;
    const kinds = plan.kinds;
    const scales = plan.scales;
    const columns = this.columns;
    const timebase = this.timebase;
    const timeFactor = plan.timeFactorS;
    let row = this.rows;
    // The first calls take a few rows only, so that the code after the loop runs (and gives
    // its type feedback) before the loop is hot enough to be compiled on stack.
    const stop = Math.min(this.capacity, row + (this.cleanCalls++ < WARM_UP_CALLS ? WARM_UP_ROWS : CLEAN_ROWS_PER_CALL));
    let line = this.line;
    let p = start;
    const stamps = this.stamps;
    const exponents = this.stampExponents;
    // Clean rows are one line each: the stamps of the block share one line-row offset.
    const lineShift = line - row;
    const runStart = row;
    let n = 0;
    while (p < end && row < stop) {
      let q = p;
      let b = buf[q];
      let tValue = NaN;
      let tExp = 0;
      let k = 0;
      for (; k < columnCount; k++) {
        let neg = false;
        if (b === 45) {
          neg = true;
          b = buf[++q];
        } else if (b === 43) b = buf[++q];
        const intStart = q;
        let mantissa = 0;
        while (b >= 48 && b <= 57) {
          mantissa = mantissa * 10 + (b - 48);
          b = buf[++q];
        }
        let nd = q - intStart;
        let nf = 0;
        if (b === dec) {
          b = buf[++q];
          const fracStart = q;
          while (b >= 48 && b <= 57) {
            mantissa = mantissa * 10 + (b - 48);
            b = buf[++q];
          }
          nf = q - fracStart;
          nd += nf;
        }
        if (nd === 0 || nd > 19 || !(mantissa < 9007199254740992)) break;
        let e10 = -nf;
        let v: number;
        if ((b | 32) !== 101) v = mantissa * NEG_POW10[nf]!;
        else {
          b = buf[++q];
          let eNeg = false;
          if (b === 45) {
            eNeg = true;
            b = buf[++q];
          } else if (b === 43) b = buf[++q];
          const expStart = q;
          let e = 0;
          while (b >= 48 && b <= 57) {
            e = (e * 10 + (b - 48)) | 0;
            b = buf[++q];
          }
          const ne = q - expStart;
          if (ne === 0 || ne > 5) break;
          e10 += eNeg ? -e : e;
          v = composeDecimal(mantissa, e10);
        }
        if (!(v < OVERRANGE_MAGNITUDE)) break;
        if (neg) v = -v;
        const kind = kinds[k];
        if (kind === COLUMN_CHANNEL) columns[k][row] = v * scales[k];
        else if (kind === COLUMN_TIME) {
          tValue = v;
          tExp = e10;
        }
        if (k + 1 < columnCount) {
          if (b !== delim) break;
          b = buf[++q];
        }
      }
      if (k === columnCount) {
        // One empty trailing cell (a delimiter at the end of every row) is what the general path
        // ignores too.
        if (b === delim) b = buf[++q];
        if (b === LF || b === CR) {
          q++;
          if (b === CR) {
            if (q < end) {
              if (buf[q] === LF) q++;
            } else this.pendingCR = true;
          }
          p = q;
          if (timebase !== undefined) {
            stamps[n] = tValue * timeFactor;
            exponents[n] = int16Exponent(tExp);
            n++;
          }
          line++;
          row++;
          continue;
        }
      }
      break;
    }
    if (n > 0) timebase!.addRun(stamps, exponents, timeFactor, 0, n, runStart, runStart + lineShift);
    this.cleanBlockFull = row === stop && stop < this.capacity && p < end;
    this.rows = row;
    this.line = line;
    return p;
  }

  /** After the row limit: count the remaining non-blank lines only. */
  private countRest(buf: Uint8Array, start: number, end: number): void {
    let p = start;
    let content = false;
    while (p < end) {
      const c = buf[p++];
      if (c === LF || c === CR) {
        if (c === CR) {
          if (p < end) {
            if (buf[p] === LF) p++;
          } else this.pendingCR = true;
        }
        if (content) this.countedRows++;
        content = false;
      } else if (c !== 32 && c !== 9 && c !== this.plan.delimiter) content = true;
    }
  }

  private columnName(col: number): string {
    const label = this.plan.labels[col];
    return label ? ` ("${label}")` : '';
  }

  /** Counts a held report of `code`; true while it is still to be kept in full. */
  private hold(code: string): boolean {
    const h = this.held!;
    const n = h.counts[code] ?? 0;
    h.counts[code] = n + 1;
    return n < h.limit;
  }

  /**
   * Reports a held event (from a part of the body parsed apart) as if it had been met here,
   * its line shifted by `lineShift`.
   */
  replayEvent(e: BodyEvent, lineShift: number): void {
    const line = e.line + lineShift;
    if (e.kind === 'non-numeric') this.reportNonNumeric(line, e.col, e.text);
    else if (e.kind === 'empty') this.reportEmpty(line, e.col, e.count);
    else if (e.kind === 'overrange') this.reportOverrangeText(line, e.col, () => e.text);
    else this.reportRagged(line, e.cells, e.tooMany);
  }

  /**
   * Appends `rows` rows parsed apart (one column per file column, the channel ones filled) after
   * the rows read so far; `nextLine` is the next physical line after them. Only between regions
   * that end at a line break. Rows that lie in the columns' own memory past a fence (parsed
   * there by another thread) are moved down within it instead of copied in.
   */
  appendRows(columns: readonly (Float32Array | undefined)[], rows: number, nextLine: number): void {
    if (!(Number.isInteger(rows) && rows >= 0)) throw new RangeError(`rows must be a non-negative integer, not ${rows}`);
    const need = this.rows + rows;
    if (need > this.capacity) {
      let room = Infinity;
      for (const c of this.columns) if (c.length > 0) room = Math.min(room, c.length);
      if (need <= room) this.capacity = room;
      else this.resize(need, this.rows);
    }
    for (let k = 0; k < this.columns.length; k++) {
      if (this.plan.kinds[k] !== COLUMN_CHANNEL) continue;
      const from = columns[k];
      if (from === undefined || from.length < rows) throw new RangeError(`column ${k + 1} of the appended rows holds fewer than ${rows} values`);
      const to = this.columns[k];
      if (from.buffer === to.buffer) {
        const at = (from.byteOffset - to.byteOffset) / Float32Array.BYTES_PER_ELEMENT;
        if (at !== this.rows) to.copyWithin(this.rows, at, at + rows);
      } else to.set(from.subarray(0, rows), this.rows);
    }
    this.rows = need;
    this.line = nextLine;
  }

  private reportNonNumeric(line: number, col: number, text: string): void {
    this.nonNumericCells++;
    if (this.held !== undefined) {
      if (this.hold('non-numeric-cell')) this.held.events.push({ kind: 'non-numeric', line, col, text });
      return;
    }
    this.findings.add('non-numeric-cell', 'warning', { line, column: col + 1 }, 'cells that are not numbers', () => ({
      message: `Line ${line}, column ${col + 1}${this.columnName(col)}: "${clip(text)}" is not a number; it is read as a missing sample.`,
      advice: 'Missing samples are skipped by the analysis; check the export for text in numeric columns.',
      figures: { line, column: col + 1 },
    }));
  }

  private reportEmpty(line: number, col: number, count: number): void {
    this.emptyCells += count;
    if (this.held !== undefined) {
      if (this.hold('non-numeric-cell')) this.held.events.push({ kind: 'empty', line, col, count });
      return;
    }
    this.findings.add('non-numeric-cell', 'warning', { line, column: col + 1 }, 'cells that are not numbers', () => ({
      message: `Line ${line}, column ${col + 1}${this.columnName(col)} is empty${count > 1 ? ` (${count} empty cells in the row)` : ''}; read as a missing sample, not as 0.`,
      figures: { line, column: col + 1, emptyCells: count },
    }));
  }

  private reportOverrange(line: number, col: number, buf: Uint8Array, start: number, end: number): void {
    this.reportOverrangeText(line, col, () => decodeUtf8(buf, start, end).text);
  }

  private reportOverrangeText(line: number, col: number, textOf: () => string): void {
    this.overrangeCells++;
    if (this.held !== undefined) {
      if (this.hold('overrange')) this.held.events.push({ kind: 'overrange', line, col, text: textOf() });
      return;
    }
    this.findings.add('overrange', 'warning', { line, column: col + 1 }, 'overrange samples', () => ({
      message: `Line ${line}, column ${col + 1}${this.columnName(col)}: "${clip(textOf())}" marks a sample outside the scope's range; it is read as missing.`,
      advice: 'The input exceeded the vertical range; lower the volts/div or use a larger probe attenuation.',
      figures: { line, column: col + 1 },
    }));
  }

  private reportRagged(line: number, cells: number, tooMany: boolean): void {
    this.raggedRows++;
    if (this.held !== undefined) {
      if (this.hold('ragged-row')) this.held.events.push({ kind: 'ragged', line, cells, tooMany });
      return;
    }
    const expected = this.plan.columnCount;
    this.findings.add('ragged-row', 'warning', { line }, 'rows with the wrong number of cells', () => ({
      message: tooMany
        ? `Line ${line} has ${cells} cells, more than the ${expected} columns of the header; the extra cells are ignored.`
        : `Line ${line} has ${cells} cell${cells === 1 ? '' : 's'} where ${expected} are expected; the missing samples are read as missing.`,
      figures: { line, cells, expected },
    }));
  }
}

function clip(text: string): string {
  return text.length > 24 ? `${text.slice(0, 21)}...` : text;
}
