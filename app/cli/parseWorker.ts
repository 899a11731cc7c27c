/**
 * Worker thread for one large capture (bundled to dist/cli/parseWorker.js): parses the byte range
 * [start, end) of the file, which begins at a line start, as a body part (parseFileRange.ts)
 * and answers with it in slices of about `sliceBytes` (the last one marked), their typed arrays
 * transferred rather than copied, so that the main thread merges while this one parses on.
 */
import { parentPort } from 'node:worker_threads';
import type { BodyPart } from '../../core/import/parseBodyPart.js';
import { parseFileRange, type ParseJob } from './parseFileRange.js';

export type { ParseJob };

export type ParseReply = { readonly ok: true; readonly part: BodyPart; readonly last: boolean } | { readonly ok: false; readonly message: string };

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
