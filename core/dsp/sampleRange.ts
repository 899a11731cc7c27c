/** A resolved [start, start + length) sample range inside an array. */
export interface SampleRange {
  start: number;
  length: number;
}

/**
 * Checks and resolves the optional `start` / `length` arguments shared by the dsp kernels
 * (defaults: from 0 to the end). Bad arguments are bugs in the caller: RangeError.
 */
export function resolveSampleRange(total: number, start: number | undefined, length: number | undefined, who: string): SampleRange {
  const s = start ?? 0;
  if (!Number.isInteger(s) || s < 0 || s > total) {
    throw new RangeError(`${who}: start must be an integer in [0, ${total}], got ${String(start)}`);
  }
  const len = length ?? total - s;
  if (!Number.isInteger(len) || len < 0 || s + len > total) {
    throw new RangeError(`${who}: length must be an integer with start + length <= ${total}, got ${String(length)}`);
  }
  return { start: s, length: len };
}

/** Checks a sample rate argument: finite and > 0 (RangeError otherwise). */
export function checkSampleRate(sampleRateHz: number, who: string): void {
  if (!(sampleRateHz > 0) || !Number.isFinite(sampleRateHz)) {
    throw new RangeError(`${who}: sampleRateHz must be finite and > 0, got ${sampleRateHz}`);
  }
}
