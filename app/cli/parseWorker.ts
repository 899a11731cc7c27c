/**
 * Worker thread for one large capture (bundled to dist/cli/parseWorker.js): parses the byte range
 * [start, end) of the file, which begins at a line start, as a body part (core BodyPartParser)
 * and answers with it in slices of about `sliceBytes` (the last one marked), their typed arrays
 * transferred rather than copied, so that the main thread merges while this one parses on.
 */
import { open } from 'node:fs/promises';
import { parentPort } from 'node:worker_threads';
import { BodyPartParser, type BodyPart, type BodyPartPlan } from '../../core/import/parseBodyPart.js';

export interface ParseJob {
  readonly path: string;
  readonly start: number;
  readonly end: number;
  readonly plan: BodyPartPlan;
  /** Bytes per slice answered before the end (default: the whole range in one answer). */
  readonly sliceBytes?: number;
}

export type ParseReply = { readonly ok: true; readonly part: BodyPart; readonly last: boolean } | { readonly ok: false; readonly message: string };

const CHUNK_BYTES = 1 << 20;

/**
 * Reads and parses the job's byte range; two buffers alternate so the next read overlaps parsing.
 * With `onSlice`, the rows are handed over in slices as they are parsed; the part returned is the
 * rest after the last slice.
 */
export async function parseFileRange(job: ParseJob, onSlice?: (part: BodyPart) => void): Promise<BodyPart> {
  const sliceBytes = onSlice !== undefined && job.sliceBytes !== undefined ? job.sliceBytes : Infinity;
  const rangeBytes = Math.max(1, job.end - job.start);
  const sliceRows = Number.isFinite(sliceBytes) ? Math.ceil((job.plan.body.expectedRows * Math.min(sliceBytes, rangeBytes)) / rangeBytes) + 1024 : undefined;
  const parser = new BodyPartParser(job.plan, sliceRows);
  const handle = await open(job.path, 'r');
  try {
    const buffers = [new Uint8Array(CHUNK_BYTES), new Uint8Array(CHUNK_BYTES)];
    let position = job.start;
    let sliceStart = job.start;
    let which = 0;
    const next = (b: Uint8Array): Promise<{ bytesRead: number; buffer: Uint8Array }> => {
      const length = Math.min(CHUNK_BYTES, job.end - position);
      const at = position;
      position += length;
      return length > 0 ? handle.read(b, 0, length, at) : Promise.resolve({ bytesRead: 0, buffer: b });
    };
    let pending = next(buffers[0]!);
    for (;;) {
      const { bytesRead, buffer } = await pending;
      if (bytesRead === 0) break;
      which ^= 1;
      pending = next(buffers[which]!);
      parser.push(buffer.subarray(0, bytesRead));
      if (position - sliceStart >= sliceBytes && position < job.end) {
        const slice = parser.takeSlice();
        if (slice !== undefined) {
          sliceStart = position;
          onSlice!(slice);
        }
      }
    }
  } finally {
    await handle.close();
  }
  return parser.finish();
}

/** The buffers of a part, to transfer instead of copy (each once). */
export function transferablesOf(part: BodyPart): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>();
  for (const c of part.columns) if (c !== undefined) out.add(c.buffer as ArrayBuffer);
  if (part.timeS !== undefined) out.add(part.timeS.buffer as ArrayBuffer);
  if (part.timeExponent !== undefined) out.add(part.timeExponent.buffer as ArrayBuffer);
  out.add(part.lineMarks.buffer as ArrayBuffer);
  return [...out];
}

if (parentPort) {
  const port = parentPort;
  port.once('message', (job: ParseJob) => {
    const answer = (part: BodyPart, last: boolean): void => port.postMessage({ ok: true, part, last } satisfies ParseReply, transferablesOf(part));
    parseFileRange(job, (slice) => answer(slice, false)).then(
      (part) => answer(part, true),
      (error: unknown) => port.postMessage({ ok: false, message: error instanceof Error ? error.message : String(error) } satisfies ParseReply),
    );
  });
}
