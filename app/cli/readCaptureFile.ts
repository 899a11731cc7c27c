import { availableParallelism } from 'node:os';
import { open, type FileHandle } from 'node:fs/promises';
import { join } from 'node:path';
import { isMainThread, Worker } from 'node:worker_threads';
import { createSplittableCaptureParser, type ImportOptions, type ImportResult } from '../../core/import/captureParser.js';
import type { BodyPart, BodyPartPlan } from '../../core/import/parseBodyPart.js';
import { CHUNK_BYTES, parseFileRange, type ParseJob } from './parseFileRange.js';
import type { ParseReply } from './parseWorker.js';
import { createRangeClaim, MAX_CLAIM_CHUNKS, takeTail, unclaimedChunks } from './rangeClaim.js';
import { readInChunks } from './readInChunks.js';

/** Files at least this large are parsed on two threads (below it a worker costs more than it saves). */
export const SPLIT_MIN_BYTES = 32 * 1024 * 1024;

/**
 * Share of the file's bytes this thread parses first. Which thread finishes first swings by
 * ±0.3 s from run to run on a shared two-core machine (measured, no source), so the split is
 * evened out as it runs: this thread, once its part is parsed and the worker's slices so far
 * merged, takes over the second half of what the worker has not read yet (rangeClaim.ts). A
 * share a little under half makes this thread the one that is done first.
 */
const HEAD_SHARE = 0.45;

/**
 * ImportOptions.presizeSlack of a split read over shared columns: the head's rows may pass the
 * first chunk's estimate by 10 % (see expectedRows), and each part needs its own margin.
 */
const SPLIT_PRESIZE_SLACK = 0.4;

/** Fewest unread chunks of the worker's range worth taking over (the rest is left to it). */
const MIN_TAKEN_CHUNKS = 8;

/**
 * Bytes of the worker's range per slice it answers with: this thread merges each slice (time
 * stamps through the time-base fit, rows copied in) while the worker parses the next, so only
 * the last slice's merge waits for the worker to end. Measured, no source.
 */
const SLICE_BYTES = 16 * 1024 * 1024;

/** How far past the chosen offset a line start is looked for. */
const SPLIT_WINDOW_BYTES = 64 * 1024;

export interface SplitOptions {
  /** Split files of at least this many bytes (default SPLIT_MIN_BYTES); Infinity never splits. */
  readonly minBytes?: number;
  /**
   * Byte offset to split at (moved to the first line start at or after it and after the first
   * chunk read), regardless of size and thread: for tests. Default: HEAD_SHARE of the file.
   */
  readonly splitAt?: number;
  /** Bytes per slice of the worker's answer (default SLICE_BYTES): for tests. */
  readonly sliceBytes?: number;
  /** Bytes per read of the worker and of a tail taken over (default CHUNK_BYTES): for tests. */
  readonly chunkBytes?: number;
  /**
   * Take over the worker's range from this byte offset (moved to the next chunk boundary of the
   * range) as soon as the worker has its job, instead of once the head is parsed: for tests.
   */
  readonly takeTailAt?: number;
  /** The bundled worker (default: parseWorker.js next to the running script). */
  readonly workerScript?: string;
  /** Called with what happened, for tests and benches. */
  readonly onSplit?: (how: 'single' | 'split' | 'worker-failed' | 'merge-refused' | 'tail-taken') => void;
  /**
   * Called once, when a split read has parsed its head and starts merging the worker's slices:
   * the moment a helper for the analysis may start without slowing the two-thread parse. It is
   * given the parse worker, which takes helper jobs once its range is parsed (runHelperJob);
   * returning true keeps that worker running after the read (the callee closes it then).
   */
  readonly onHeadParsed?: (parseWorker: Worker) => boolean;
}

/**
 * Streams a capture file through the core parser in 1 MiB chunks (never one giant string). Two
 * buffers alternate: the next read is in flight while the parser works on the current chunk
 * (the parser copies what it keeps, so a buffer can be reused once push() returns). The file's
 * size is passed on as ImportOptions.sizeHintBytes so the parser sizes its columns once.
 *
 * A large file (SPLIT_MIN_BYTES) read on the main thread with two or more cores is parsed in two
 * halves: the layout is sniffed from the head as usual, a worker thread parses from the line
 * start after the first HEAD_SHARE of the bytes to the end (core BodyPartParser) while this
 * thread parses the first half, and the worker's slices are merged (appendPart) as they come
 * into the result a single pass gives. When the split cannot be made (layout not known from the
 * first chunk, not UTF-8, CR line ends, no line start near the split point) it is not attempted;
 * when the worker fails before any slice was merged this thread parses the second half itself,
 * after that (or when the merge is refused: the row limit) the file is read again in one pass.
 */
export async function readCaptureFile(path: string, options: ImportOptions = {}, split: SplitOptions = {}): Promise<ImportResult> {
  const handle = await open(path, 'r');
  let worker: Worker | undefined;
  /** The worker handed on as a helper (see onHeadParsed), not terminated here. */
  let kept: Worker | undefined;
  try {
    const { size } = await handle.stat();
    const forced = split.splitAt !== undefined;
    const wanted = forced || (size >= (split.minBytes ?? SPLIT_MIN_BYTES) && isMainThread && availableParallelism() >= 2);
    // A split over shared columns sizes them with room to spare for both parts (see placePart).
    const slack = wanted && options.allocateSamples !== undefined && options.presizeSlack === undefined ? { presizeSlack: SPLIT_PRESIZE_SLACK } : {};
    const parser = createSplittableCaptureParser({ sizeHintBytes: size, ...slack, ...options });
    // The worker starts now, so that its start-up overlaps the first read and the sniffing; its
    // answers are listened for from the start (an early failure is kept for next()).
    let stream: PartStream | undefined;
    if (wanted) {
      try {
        worker = new Worker(split.workerScript ?? join(__dirname, 'parseWorker.js'));
        stream = streamParts(worker);
      } catch (error) {
        const failure = error instanceof Error ? error : new Error(String(error));
        stream = { start: () => undefined, ready: () => true, next: () => Promise.reject(failure) };
      }
    }
    let limit = size;
    let position = 0;
    let parts: PartStream | undefined;
    let job: ParseJob | undefined;
    // The tail of the worker's range parsed here (see HEAD_SHARE), merged after its last slice.
    let tail: Promise<BodyPart | undefined> | undefined;
    const buffers = [new Uint8Array(CHUNK_BYTES), new Uint8Array(CHUNK_BYTES)];
    let which = 0;
    const next = (b: Uint8Array): Promise<{ bytesRead: number; buffer: Uint8Array }> => {
      const length = Math.min(CHUNK_BYTES, limit - position);
      const at = position;
      position += length;
      return length > 0 ? handle.read(b, 0, length, at) : Promise.resolve({ bytesRead: 0, buffer: b });
    };
    let pending = next(buffers[0]!);
    let decided = !wanted;
    for (;;) {
      const { bytesRead, buffer } = await pending;
      if (bytesRead === 0) break;
      which ^= 1;
      // The next read goes into the other buffer while this one is parsed (once the split is
      // decided: the first chunk may move the end of the range read here).
      if (decided) pending = next(buffers[which]!);
      parser.push(buffer.subarray(0, bytesRead));
      if (!decided) {
        // Decided once, right after the first chunk: the layout is known from it or not at all.
        decided = true;
        const at = await splitOffset(handle, size, position, split.splitAt ?? Math.floor(size * HEAD_SHARE));
        const plan = at === undefined ? undefined : parser.bodyPartPlan(size - at);
        if (at !== undefined && plan !== undefined) {
          limit = at;
          parts = stream!;
          const chunkBytes = split.chunkBytes ?? CHUNK_BYTES;
          const chunks = Math.ceil((size - at) / chunkBytes);
          job = {
            path,
            start: at,
            end: size,
            plan,
            sliceBytes: split.sliceBytes ?? SLICE_BYTES,
            chunkBytes,
            ...(chunks <= MAX_CLAIM_CHUNKS ? { claim: createRangeClaim(chunks) } : {}),
          };
          // A forced take-over (tests) is claimed before the worker can read there.
          const forced = split.takeTailAt === undefined ? undefined : await takeOver(handle, job, Math.ceil((split.takeTailAt - at) / chunkBytes));
          parts.start(job);
          if (forced !== undefined) tail = Promise.resolve(await forced());
        }
        pending = next(buffers[which]!);
      }
    }
    if (parts === undefined) {
      split.onSplit?.('single');
      return parser.finish();
    }
    if (worker !== undefined && split.onHeadParsed?.(worker) === true) kept = worker;
    // The worker's slices are merged as they come.
    let appended = 0;
    let refused = false;
    try {
      for (;;) {
        // Nothing to merge and the worker still reading: take over half of what it has left.
        if (tail === undefined && !parts.ready() && job?.claim !== undefined) {
          const left = unclaimedChunks(job.claim);
          const parse = left >= MIN_TAKEN_CHUNKS ? await takeOver(handle, job, Math.ceil((job.end - job.start) / job.chunkBytes!) - Math.floor(left / 2)) : undefined;
          tail = parse === undefined ? Promise.resolve(undefined) : parse();
          // Parsed before the worker's slices are merged on: they wait in its queue.
          await tail;
        }
        const { part, last } = await parts.next();
        if (!parser.appendPart(part)) {
          refused = true;
          break;
        }
        appended++;
        if (last) break;
      }
      const taken = await tail;
      if (!refused && taken !== undefined) {
        split.onSplit?.('tail-taken');
        if (!parser.appendPart(taken)) refused = true;
      }
    } catch {
      split.onSplit?.('worker-failed');
      if (appended > 0) return readCaptureFile(path, options, { ...split, splitAt: undefined, minBytes: Infinity, onSplit: undefined });
      // Nothing of the worker's merged: parse the second half here.
      limit = size;
      await readInChunks(next, [buffers[0]!, buffers[1]!], (bytes) => parser.push(bytes));
      return parser.finish();
    }
    if (!refused) {
      split.onSplit?.('split');
      return parser.finishAppended();
    }
    split.onSplit?.('merge-refused');
    return readCaptureFile(path, options, { ...split, splitAt: undefined, minBytes: Infinity, onSplit: undefined });
  } finally {
    if (worker !== undefined && worker !== kept) void worker.terminate();
    await handle.close();
  }
}

/**
 * The first line start at or after `target` (just after an LF), if it lies after the bytes read
 * so far, within SPLIT_WINDOW_BYTES of the target and before the end of the file.
 */
async function splitOffset(handle: FileHandle, size: number, readSoFar: number, target: number): Promise<number | undefined> {
  const from = Math.max(target, readSoFar);
  if (from >= size) return undefined;
  const at = await lineStartFrom(handle, size, from);
  return at !== undefined && at < size && at > readSoFar ? at : undefined;
}

/** The first line start at or after `from` (> 0), within SPLIT_WINDOW_BYTES; `size` when the file ends first. */
async function lineStartFrom(handle: FileHandle, size: number, from: number): Promise<number | undefined> {
  const window = new Uint8Array(Math.min(SPLIT_WINDOW_BYTES, size - from + 1));
  // One byte before `from`: an LF there makes `from` itself a line start.
  const { bytesRead } = await handle.read(window, 0, window.length, from - 1);
  for (let i = 0; i < bytesRead; i++) if (window[i] === 10) return from + i;
  return bytesRead === size - from + 1 ? size : undefined;
}

/**
 * Takes over the worker's range from chunk `fromChunk` on, from the first line start in that
 * chunk, and gives the parse of it (a body part without the placement: the worker writes
 * there); undefined when the worker has read that far already, the range ends first, or no line
 * starts near there.
 */
async function takeOver(handle: FileHandle, job: ParseJob, fromChunk: number): Promise<(() => Promise<BodyPart>) | undefined> {
  const chunkBytes = job.chunkBytes!;
  const boundary = job.start + fromChunk * chunkBytes;
  if (job.claim === undefined || fromChunk < 1 || boundary >= job.end) return undefined;
  const lineStart = await lineStartFrom(handle, job.end, boundary);
  if (lineStart === undefined || lineStart - boundary >= chunkBytes || !takeTail(job.claim, fromChunk, lineStart - boundary)) return undefined;
  const { placement: _placement, ...plan } = job.plan;
  // Columns sized for the tail's share of the rows the whole range was expected to hold.
  const expectedRows = Math.ceil((plan.body.expectedRows * (job.end - lineStart)) / (job.end - job.start)) + 1024;
  return () => parseFileRange({ path: job.path, start: lineStart, end: job.end, plan: { ...plan, body: { ...plan.body, expectedRows } }, chunkBytes });
}

/** The worker's answers in order: each next() gives the next slice, or throws once it failed. */
interface PartStream {
  /** Sends the worker its job. */
  start(job: ParseJob): void;
  /** True when a slice (or a failure) is waiting for next(). */
  ready(): boolean;
  next(): Promise<{ part: BodyPart; last: boolean }>;
}

function streamParts(worker: Worker): PartStream {
  const ready: { part: BodyPart; last: boolean }[] = [];
  let failure: Error | undefined;
  let finished = false;
  let wake: (() => void) | undefined;
  const notify = (): void => {
    const w = wake;
    wake = undefined;
    w?.();
  };
  worker.on('message', (reply: ParseReply) => {
    if (reply.ok) {
      ready.push({ part: reply.part, last: reply.last });
      if (reply.last) finished = true;
    } else failure ??= new Error(reply.message);
    notify();
  });
  worker.once('error', (error: Error) => {
    failure ??= error;
    notify();
  });
  worker.once('exit', (code) => {
    if (!finished) failure ??= new Error(`the parse worker stopped (exit code ${code})`);
    notify();
  });
  return {
    start(job) {
      worker.postMessage(job satisfies ParseJob);
    },
    ready: () => ready.length > 0 || failure !== undefined,
    async next() {
      for (;;) {
        const first = ready.shift();
        if (first !== undefined) return first;
        if (failure !== undefined) throw failure;
        await new Promise<void>((resolve) => (wake = resolve));
      }
    },
  };
}

export type { BodyPartPlan };
