import { open, stat } from 'node:fs/promises';
import { constants as bufferConstants } from 'node:buffer';
import { totalmem } from 'node:os';
import { basename } from 'node:path';

/**
 * Bytes of memory one row of samples costs through the analysis, beyond the Float32 columns
 * themselves (4 bytes per channel): mostly the carrier search's FFT over a Float64 copy of one
 * channel padded to a power of two, with its spectrum, window and twiddle table. Measured with
 * GNU time on a 10^7-row x 4-channel capture: 660 MB peak RSS, of which about 230 MB is the
 * import (columns, buffers, Node itself), so about 43 bytes per row; 64 leaves a margin.
 */
const ANALYSIS_BYTES_PER_ROW = 64;

/** Bytes read from the start of a file to estimate its rows and columns. */
const PROBE_BYTES = 64 * 1024;

export interface CaptureSizeEstimate {
  readonly fileBytes: number;
  readonly rows: number;
  readonly columns: number;
  /** Peak bytes the import and the analysis are expected to need. */
  readonly needBytes: number;
}

/** Memory one capture may use: half the computer's memory (or STATORSCOPE_MEMORY_LIMIT_MB), shared by `workers`. */
export function captureMemoryLimitBytes(workers = 1, env: NodeJS.ProcessEnv = process.env): { bytes: number; why: string } {
  const fromEnv = env.STATORSCOPE_MEMORY_LIMIT_MB;
  if (fromEnv !== undefined && /^\d+(\.\d+)?$/.test(fromEnv.trim())) {
    const bytes = (Number(fromEnv) * 2 ** 20) / workers;
    return { bytes, why: `STATORSCOPE_MEMORY_LIMIT_MB=${fromEnv.trim()}${workers > 1 ? ` shared by ${workers} workers` : ''}` };
  }
  const total = totalmem();
  const bytes = total / 2 / workers;
  return { bytes, why: `half of this computer's ${formatBytes(total)}${workers > 1 ? `, shared by ${workers} workers` : ''}` };
}

/**
 * Estimates rows and columns from the file size and the bytes per line of its first 64 KiB
 * (the head includes any preamble, so the estimate errs on the side of fewer rows).
 */
export async function estimateCaptureSize(path: string): Promise<CaptureSizeEstimate> {
  const { size } = await stat(path);
  const handle = await open(path, 'r');
  let head: Buffer;
  try {
    const buffer = Buffer.alloc(Math.min(PROBE_BYTES, size));
    const { bytesRead } = await handle.read(buffer, 0, buffer.length, 0);
    head = buffer.subarray(0, bytesRead);
  } finally {
    await handle.close();
  }
  let lines = 0;
  let lastBreak = 0;
  let fieldsOnLastLine = 1;
  let fields = 1;
  for (let i = 0; i < head.length; i++) {
    const c = head[i]!;
    if (c === 10) {
      lines++;
      lastBreak = i + 1;
      fieldsOnLastLine = fields;
      fields = 1;
    } else if (c === 44 || c === 59 || c === 9) fields++;
  }
  const bytesPerRow = lines > 0 ? lastBreak / lines : Math.max(head.length, 1);
  const rows = Math.ceil(size / bytesPerRow);
  const columns = Math.max(1, fieldsOnLastLine);
  return { fileBytes: size, rows, columns, needBytes: rows * (columns * 4 + ANALYSIS_BYTES_PER_ROW) };
}

/**
 * The row limit to pass to the parser (ImportOptions.maxSamples), or a refusal message when the
 * estimate alone already exceeds the memory limit or the typed-array length limit.
 */
export function checkCaptureFits(
  file: string,
  estimate: CaptureSizeEstimate,
  limit: { bytes: number; why: string },
): { ok: true; maxSamples: number } | { ok: false; message: string } {
  const perRow = estimate.columns * 4 + ANALYSIS_BYTES_PER_ROW;
  // A Float32Array holds at most buffer.constants.MAX_LENGTH bytes; the parser stops at 2^28 rows.
  const arrayRows = Math.min(Math.floor(bufferConstants.MAX_LENGTH / 8), 2 ** 28);
  const maxSamples = Math.max(2, Math.min(arrayRows, Math.floor(limit.bytes / perRow)));
  if (estimate.needBytes > limit.bytes || estimate.rows > arrayRows) {
    return {
      ok: false,
      message:
        `${basename(file)} is too large to analyse here: ${formatBytes(estimate.fileBytes)}, about ${formatCount(estimate.rows)} rows x ${estimate.columns} columns, ` +
        `which needs about ${formatBytes(estimate.needBytes)} of memory; the limit is ${formatBytes(limit.bytes)} (${limit.why}), ` +
        `at most ${formatCount(maxSamples)} rows. Export a shorter record or split the file`,
    };
  }
  return { ok: true, maxSamples };
}

export function formatBytes(bytes: number): string {
  if (bytes >= 2 ** 30) return `${(bytes / 2 ** 30).toFixed(1)} GiB`;
  if (bytes >= 2 ** 20) return `${(bytes / 2 ** 20).toFixed(0)} MiB`;
  return `${Math.ceil(bytes / 1024)} KiB`;
}

function formatCount(n: number): string {
  if (n >= 1e9) return `${(n / 1e9).toFixed(1)} billion`;
  if (n >= 1e6) return `${(n / 1e6).toFixed(1)} million`;
  return String(n);
}
