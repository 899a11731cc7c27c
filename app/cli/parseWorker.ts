/**
 * Worker thread for one large capture (bundled to dist/cli/parseWorker.js): parses the byte range
 * [start, end) of the file, which begins at a line start, as a body part (parseFileRange.ts)
 * and answers with it in slices of about `sliceBytes` (the last one marked), their typed arrays
 * transferred rather than copied, so that the main thread merges while this one parses on.
 * Then it may serve as the analysis helper (runHelperJob), saving a second worker's start.
 */
import { parentPort } from 'node:worker_threads';
import type { BodyPart } from '../../core/import/parseBodyPart.js';
import type { HelperJob } from './demodJob.js';
import { parseFileRange, type ParseJob } from './parseFileRange.js';
import { isHelperJob, runHelperJob } from './runHelperJob.js';

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
  // The first message is the range to parse; after it the main thread may keep this worker as
  // its analysis helper (ParallelDemodulator) and send it helper jobs.
  port.on('message', (message: ParseJob | HelperJob) => {
    if (isHelperJob(message)) {
      runHelperJob(message);
      return;
    }
    const answer = (part: BodyPart, last: boolean): void => port.postMessage({ ok: true, part, last } satisfies ParseReply, transferablesOf(part));
    parseFileRange(message, (slice) => answer(slice, false)).then(
      (part) => answer(part, true),
      (error: unknown) => port.postMessage({ ok: false, message: error instanceof Error ? error.message : String(error) } satisfies ParseReply),
    );
  });
}
