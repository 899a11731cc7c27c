/**
 * Reads and parses one byte range of a capture file as a body part (core BodyPartParser): the
 * parse worker's job (parseWorker.ts), and this thread's when it takes over the tail of the
 * worker's range (rangeClaim.ts).
 */
import { open } from 'node:fs/promises';
import { BodyPartParser, type BodyPart, type BodyPartPlan } from '../../core/import/parseBodyPart.js';
import { claimChunk, claimEnd } from './rangeClaim.js';
import { readInChunks, type ChunkRead } from './readInChunks.js';

export interface ParseJob {
  readonly path: string;
  /** The range [start, end) of the file; start is a line start. */
  readonly start: number;
  readonly end: number;
  readonly plan: BodyPartPlan;
  /** Bytes per slice answered before the end (default: the whole range in one answer). */
  readonly sliceBytes?: number;
  /** Bytes per read (default CHUNK_BYTES); a claim counts chunks of this size. */
  readonly chunkBytes?: number;
  /**
   * The range's chunks as claimed in shared memory (rangeClaim.ts): another thread may take its
   * tail, and the range then ends at the first line start of the part taken.
   */
  readonly claim?: Int32Array;
}

export const CHUNK_BYTES = 1 << 20;

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
  const chunkBytes = job.chunkBytes ?? CHUNK_BYTES;
  const chunks = Math.ceil((job.end - job.start) / chunkBytes);
  const handle = await open(job.path, 'r');
  try {
    let own = 0;
    let position = job.start;
    let sliceStart = job.start;
    // Chunks are read in order; with a claim, each is claimed as its read is issued.
    const next: ChunkRead = (b) => {
      const chunk = job.claim !== undefined ? claimChunk(job.claim) : own < chunks ? own++ : -1;
      if (chunk < 0) return Promise.resolve({ bytesRead: 0, buffer: b });
      const at = job.start + chunk * chunkBytes;
      const length = Math.min(chunkBytes, job.end - at);
      position = at + length;
      return handle.read(b, 0, length, at);
    };
    await readInChunks(next, [new Uint8Array(chunkBytes), new Uint8Array(chunkBytes)], (bytes) => {
      parser.push(bytes);
      if (position - sliceStart >= sliceBytes && position < job.end) {
        const slice = parser.takeSlice();
        if (slice !== undefined) {
          sliceStart = position;
          onSlice!(slice);
        }
      }
    });
    if (job.claim !== undefined) {
      // The tail was taken: finish the last line, up to where the tail's first line starts.
      const cut = claimEnd(job.claim);
      if (cut.chunk < chunks && cut.lineOffset > 0) {
        const rest = new Uint8Array(cut.lineOffset);
        const { bytesRead } = await handle.read(rest, 0, rest.length, job.start + cut.chunk * chunkBytes);
        parser.push(rest.subarray(0, bytesRead));
      }
    }
  } finally {
    await handle.close();
  }
  return parser.finish();
}
