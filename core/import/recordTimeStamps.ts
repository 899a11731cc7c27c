import { int16Exponent } from './composeDecimal.js';
import type { TimeStampSink } from './parseNumericBody.js';

/** Stores each row's time stamp in order (the TimeStampSink of a part parsed apart). */
export class TimeStampRecorder implements TimeStampSink {
  timeS: Float64Array;
  exponent: Int16Array;
  marks: Int32Array = new Int32Array(64);
  markCount = 0;
  private delta = NaN;
  count = 0;

  constructor(expectedRows: number) {
    const n = Math.max(1024, expectedRows);
    this.timeS = new Float64Array(n);
    this.exponent = new Int16Array(n);
  }

  add(tS: number, lastDigitExponent: number, _factorS: number, row: number, line: number): void {
    if (row !== this.count) throw new RangeError(`time stamps must arrive in row order (row ${row} after ${this.count} rows)`);
    if (row === this.timeS.length) this.grow(row + 1);
    this.timeS[row] = tS;
    this.exponent[row] = int16Exponent(lastDigitExponent);
    this.count = row + 1;
    this.noteLine(row, line);
  }

  addRun(times: Float64Array, exponents: Int16Array, _factorS: number, from: number, to: number, rowShift: number, lineShift: number): void {
    if (to <= from) return;
    const row = from + rowShift;
    if (row !== this.count) throw new RangeError(`time stamps must arrive in row order (row ${row} after ${this.count} rows)`);
    const end = row + (to - from);
    if (end > this.timeS.length) this.grow(end);
    this.timeS.set(times.subarray(from, to), row);
    this.exponent.set(exponents.subarray(from, to), row);
    this.count = end;
    // One line-row offset for the whole run: only its first row can start a new one.
    this.noteLine(row, from + lineShift);
  }

  private grow(atLeast: number): void {
    const n = Math.max(atLeast, Math.ceil(this.timeS.length * 1.5) + 1024);
    const t = new Float64Array(n);
    t.set(this.timeS.subarray(0, this.count));
    this.timeS = t;
    const e = new Int16Array(n);
    e.set(this.exponent.subarray(0, this.count));
    this.exponent = e;
  }

  noteLine(row: number, line: number): void {
    if (line - row === this.delta) return;
    this.delta = line - row;
    if (this.markCount + 2 > this.marks.length) {
      const m = new Int32Array(this.marks.length * 2);
      m.set(this.marks);
      this.marks = m;
    }
    this.marks[this.markCount++] = row;
    this.marks[this.markCount++] = line;
  }
}
