/**
 * Worker thread for one large capture (bundled to dist/cli/parseWorker.js): parses the byte range
 * [start, end) of the file, which begins at a line start, as a body part (core BodyPartParser)
 * and answers with it, its typed arrays transferred rather than copied.
 */
import { open } from 'node:fs/promises';
import { parentPort } from 'node:worker_threads';
import { BodyPartParser, type BodyPart, type BodyPartPlan } from '../../core/import/parseBodyPart.js';

export interface ParseJob {
  readonly path: string;
  readonly start: number;
  readonly end: number;
  readonly plan: BodyPartPlan;
}

export type ParseReply = { readonly ok: true; readonly part: BodyPart } | { readonly ok: false; readonly message: string };

const CHUNK_BYTES = 1 << 20;

/** Reads and parses the job's byte range; two buffers alternate so the next read overlaps parsing. */
export async function parseFileRange(job: ParseJob): Promise<BodyPart> {
  const parser = new BodyPartParser(job.plan);
  const handle = await open(job.path, 'r');
  try {
    const buffers = [new Uint8Array(CHUNK_BYTES), new Uint8Array(CHUNK_BYTES)];
    let position = job.start;
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
    parseFileRange(job).then(
      (part) => port.postMessage({ ok: true, part } satisfies ParseReply, transferablesOf(part)),
      (error: unknown) => port.postMessage({ ok: false, message: error instanceof Error ? error.message : String(error) } satisfies ParseReply),
    );
  });
}
