import { LineRegionFeeder } from './lineRegionFeeder.js';
import { TimeStampRecorder } from './recordTimeStamps.js';
import { LineFindingCollector } from './collectLineFindings.js';
import { COLUMN_CHANNEL, NumericBodyParser, type BodyEvent, type BodyPlan, type HeldBodyEvents } from './parseNumericBody.js';
import type { TimebaseTracker } from './trackTimebase.js';

/**
 * What a later part of a capture's numeric body is parsed with, apart from the head (on another
 * thread): the head's body plan, with lines counted from 1 at the first byte of the part. Plain
 * data (structured-clone safe).
 */
export interface BodyPartPlan {
  readonly body: BodyPlan;
  /** True when the capture has a time column: the part then records its time stamps. */
  readonly timeStamps: boolean;
  /** Findings listed per code (LineFindingCollector.perCodeLimit of the head). */
  readonly perCodeLimit: number;
  /** Where the part's rows go, when the head's columns have room for them (see BodyPartPlacement). */
  readonly placement?: BodyPartPlacement;
}

/**
 * Room in the head's own columns (memory shared between threads) for the rows of a part: views
 * from row `firstRow` to the end of each channel column, past the row where the head stops
 * filling them (NumericBodyParser.fence). A part parses into them instead of columns of its
 * own, so that merging it moves rows within the columns (or not at all) instead of copying.
 */
export interface BodyPartPlacement {
  readonly firstRow: number;
  /** One entry per file column: a view for each channel column, undefined otherwise. */
  readonly columns: readonly (Float32Array | undefined)[];
}

/**
 * A part of the body parsed apart: its rows with local row indices (from 0) and local line
 * numbers (from 1), the per-line reports held back, and the time stamps unprocessed, so that
 * merging it after the head (mergeBodyPart) replays exactly the calls a single pass makes.
 * Every array is a plain typed array (transferable between threads).
 */
export interface BodyPart {
  readonly rows: number;
  /** Next local line after the part (1 + the physical lines it holds). */
  readonly nextLine: number;
  /**
   * One entry per file column: the samples of a channel column, undefined otherwise (all
   * undefined when the rows lie in the plan's placement, see placedAt).
   */
  readonly columns: (Float32Array | undefined)[];
  /** Row of the head's columns where the part's rows lie, when parsed into the placement. */
  readonly placedAt?: number;
  /** Per row: time stamp in seconds (NaN when not a number) and power of ten of its last digit. */
  readonly timeS: Float64Array | undefined;
  /** Clamped to the int16 range, which changes nothing: powerOfTen() saturates beyond ±324. */
  readonly timeExponent: Int16Array | undefined;
  /** Pairs (row, local line) at the first row and wherever a row is not on the line after the previous row. */
  readonly lineMarks: Int32Array;
  readonly events: BodyEvent[];
  readonly eventCounts: Record<string, number>;
  readonly counters: { nonNumericCells: number; overrangeCells: number; emptyCells: number; raggedRows: number };
  /** True when the part alone passed the row limit (it cannot be merged). */
  readonly limited: boolean;
}

/**
 * Parses a later part of a capture's body, given in chunks that may split lines anywhere; the
 * part must begin at the start of a line. Same state machine as the single pass
 * (NumericBodyParser), with the reports held (BodyEvent) and the time stamps recorded.
 *
 * The rows parsed so far can be taken as a part of their own (takeSlice) while parsing goes on
 * from the next line: merged one after the other, the slices give what one part would, so a
 * thread can merge the first slices while the rest is still being parsed.
 */
export class BodyPartParser {
  private readonly plan: BodyPartPlan;
  /** Rows to size each slice's columns for after the first (the plan's estimate for the first). */
  private readonly sliceRows: number;
  private body!: NumericBodyParser;
  private recorder: TimeStampRecorder | undefined;
  private held!: HeldBodyEvents;
  private readonly kinds: Uint8Array;
  private readonly feeder: LineRegionFeeder;
  private finished = false;
  /** Rows of the placement filled by earlier slices; -1 once a slice outgrew it (none after). */
  private placedRows = 0;
  /** The placement views the current slice started with (undefined: its own columns). */
  private given: readonly (Float32Array | undefined)[] | undefined;

  /** `sliceRows`: expected rows per slice when the part is taken in slices (see takeSlice). */
  constructor(plan: BodyPartPlan, sliceRows?: number) {
    if (plan.body.firstLine !== 1) throw new RangeError('a body part counts its lines from 1');
    this.plan = plan;
    this.kinds = plan.body.kinds;
    this.sliceRows = sliceRows ?? plan.body.expectedRows;
    this.restart(this.sliceRows);
    this.feeder = new LineRegionFeeder((bytes, from, to) => this.body.parseRegion(bytes, from, to));
  }

  private restart(expectedRows: number): void {
    const plan = this.plan;
    this.held = { limit: plan.perCodeLimit, events: [], counts: {} };
    this.recorder = plan.timeStamps ? new TimeStampRecorder(expectedRows) : undefined;
    const place = plan.placement;
    const room = place === undefined || this.placedRows < 0 ? 0 : Math.min(...place.columns.map((c) => (c === undefined ? Infinity : c.length))) - this.placedRows;
    this.given = room > 0 ? place!.columns.map((c) => c?.subarray(this.placedRows)) : undefined;
    this.body = new NumericBodyParser({ ...plan.body, expectedRows }, new LineFindingCollector(plan.perCodeLimit), this.recorder, this.held, undefined, this.given);
  }

  push(chunk: Uint8Array): void {
    if (this.finished) throw new RangeError('push() called after finish()');
    if (Object.getPrototypeOf(chunk) !== Uint8Array.prototype) chunk = new Uint8Array(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    this.feeder.feed(chunk);
  }

  /**
   * The rows parsed since the last slice, as a part; parsing goes on from the next line (a line
   * not yet complete belongs to the next slice). Undefined when no row is waiting, when the last
   * bytes were a CR whose LF may follow, or once the row limit is passed (finish() then reports it).
   */
  takeSlice(): BodyPart | undefined {
    if (this.finished) throw new RangeError('takeSlice() called after finish()');
    const b = this.body;
    if (b.rows === 0 || b.awaitingLf || b.limitLine > 0) return undefined;
    const part = this.snapshot();
    this.restart(this.sliceRows);
    return part;
  }

  /** The rows since the last slice (all rows when no slice was taken), as a part. */
  finish(): BodyPart {
    if (this.finished) throw new RangeError('finish() called twice');
    this.finished = true;
    this.feeder.flush();
    return this.snapshot();
  }

  private snapshot(): BodyPart {
    const b = this.body;
    const rows = b.rows;
    // Still in the placement when no channel column had to grow out of it.
    const given = this.given;
    const placed = given !== undefined && b.columns.every((c, k) => this.kinds[k] !== COLUMN_CHANNEL || c === given[k]);
    const placedAt = placed ? this.plan.placement!.firstRow + this.placedRows : undefined;
    if (given !== undefined) this.placedRows = placed ? this.placedRows + rows : -1;
    const columns = b.columns.map((c, k) => (this.kinds[k] === COLUMN_CHANNEL && !placed ? c.subarray(0, rows) : undefined));
    const r = this.recorder;
    return {
      rows,
      nextLine: b.line,
      columns,
      ...(placedAt !== undefined ? { placedAt } : {}),
      timeS: r?.timeS.subarray(0, r.count),
      timeExponent: r?.exponent.subarray(0, r.count),
      lineMarks: r ? r.marks.slice(0, r.markCount) : new Int32Array(0),
      events: this.held.events,
      eventCounts: this.held.counts,
      counters: { nonNumericCells: b.nonNumericCells, overrangeCells: b.overrangeCells, emptyCells: b.emptyCells, raggedRows: b.raggedRows },
      limited: b.limitLine > 0,
    };
  }
}

/** Finding code and noun of each held report kind (as NumericBodyParser reports them). */
const NOUN: Record<string, string> = {
  'non-numeric-cell': 'cells that are not numbers',
  overrange: 'overrange samples',
  'ragged-row': 'rows with the wrong number of cells',
};

/**
 * Appends a part parsed apart after the rows `body` has read (which must end at a line break),
 * making exactly the calls a single pass over head and part makes: the held reports and the time
 * stamps go to `body` and `timebase` in line order (a row's cell reports before its time stamp),
 * rows shifted by the head's row count and lines by its line count; counts past the listing cap
 * are added to `findings`. Returns false, changing nothing, when the part cannot be merged (it
 * passed the row limit, or head and part together would): the caller then parses in one pass.
 */
export function mergeBodyPart(
  body: NumericBodyParser,
  timebase: TimebaseTracker | undefined,
  findings: LineFindingCollector,
  part: BodyPart,
  factorS: number,
  maxSamples: number,
  placement?: BodyPartPlacement,
): boolean {
  if (part.limited || body.limitLine > 0 || body.rows + part.rows > maxSamples) return false;
  if (part.placedAt !== undefined && placement === undefined) throw new RangeError('the part lies in a placement the head did not give');
  if ((timebase !== undefined) !== (part.timeS !== undefined)) throw new RangeError('the part and the head disagree on the time column');
  const rowShift = body.rows;
  const lineShift = body.line - 1;
  const counters = {
    nonNumericCells: body.nonNumericCells + part.counters.nonNumericCells,
    overrangeCells: body.overrangeCells + part.counters.overrangeCells,
    emptyCells: body.emptyCells + part.counters.emptyCells,
    raggedRows: body.raggedRows + part.counters.raggedRows,
  };
  const t = part.timeS;
  const e = part.timeExponent;
  const marks = part.lineMarks;
  const stamps = t === undefined ? 0 : t.length;
  let row = 0;
  let mark = 0;
  let delta = 0;
  // Replays the time stamps of the rows on lines before `line`, a run of rows with one
  // line-row offset at a time (the offset changes only at a line mark).
  const replayUntil = (line: number): void => {
    if (timebase === undefined) return;
    while (row < stamps) {
      while (mark < marks.length && marks[mark] <= row) {
        delta = marks[mark + 1] - marks[mark];
        mark += 2;
      }
      const runEnd = Math.min(mark < marks.length ? marks[mark] : stamps, stamps, Math.max(row, line - delta));
      if (runEnd <= row) return;
      const shift = delta + lineShift;
      timebase.addRun(t!, e!, factorS, row, runEnd, rowShift, shift);
      row = runEnd;
    }
  };
  const listed: Record<string, number> = {};
  for (const ev of part.events) {
    replayUntil(ev.line);
    body.replayEvent(ev, lineShift);
    const code = ev.kind === 'ragged' ? 'ragged-row' : ev.kind === 'overrange' ? 'overrange' : 'non-numeric-cell';
    listed[code] = (listed[code] ?? 0) + 1;
  }
  replayUntil(Infinity);
  for (const code of Object.keys(part.eventCounts)) {
    const more = part.eventCounts[code] - (listed[code] ?? 0);
    // Past the cap only the count changes (the code was listed above, so its entry exists).
    for (let k = 0; k < more; k++) findings.add(code, 'warning', { line: 1 }, NOUN[code] ?? code, () => ({ message: '' }));
  }
  // A placed part's rows, seen through the head's own views of the placement.
  const from = part.placedAt === undefined ? part.columns : placement!.columns.map((c) => c?.subarray(part.placedAt! - placement!.firstRow, part.placedAt! - placement!.firstRow + part.rows));
  body.appendRows(from, part.rows, part.nextLine + lineShift);
  body.nonNumericCells = counters.nonNumericCells;
  body.overrangeCells = counters.overrangeCells;
  body.emptyCells = counters.emptyCells;
  body.raggedRows = counters.raggedRows;
  return true;
}
