/**
 * The lowest and highest sample of a channel and how many samples sit on each: the first pass
 * of the clipping check (clippedFraction), measured apart so that it can be taken elsewhere (in
 * the demodulation's pass, CyclePhasors.extremes) or in shares that are merged. NaN samples are
 * skipped.
 */
export interface SampleExtremes {
  /** Samples measured (NaN ones included); the extremes fit a channel only of this length. */
  readonly sampleCount: number;
  /** Lowest and highest sample; +Infinity and -Infinity when no sample is a number. */
  readonly lo: number;
  readonly hi: number;
  /** Samples equal to lo and to hi. */
  readonly countLo: number;
  readonly countHi: number;
}

/** Samples per call of the scan kernel (see measureSampleExtremes). */
const BLOCK = 1 << 16;

/**
 * Extremes of samples[from, to). The scan runs in blocks through a small kernel, merged as it
 * goes: a kernel called often is optimised as a whole early, where one loop over tens of
 * millions of samples ran ~3x slower in its first call (compiled on stack while running).
 */
export function measureSampleExtremes(samples: Float32Array, from: number, to: number): SampleExtremes {
  let result = scanBlock(samples, from, Math.min(to, from + BLOCK));
  for (let start = from + BLOCK; start < to; start += BLOCK) result = mergeSampleExtremes(result, scanBlock(samples, start, Math.min(to, start + BLOCK)));
  return result;
}

function scanBlock(samples: Float32Array, from: number, to: number): SampleExtremes {
  // Nothing after the loop needs type feedback: the loop is compiled on stack in the first call,
  // and a property load there (Math.max) deoptimised that code at the end of every call, ~600
  // times on a 4 x 10^7-sample capture (seen with --trace-deopt).
  const sampleCount = to > from ? to - from : 0;
  let lo = Infinity;
  let hi = -Infinity;
  let countLo = 0;
  let countHi = 0;
  for (let i = from; i < to; i++) {
    const v = samples[i]!;
    if (v <= lo) {
      if (v < lo) {
        lo = v;
        countLo = 0;
      }
      countLo++;
    }
    if (v >= hi) {
      if (v > hi) {
        hi = v;
        countHi = 0;
      }
      countHi++;
    }
  }
  return { sampleCount, lo, hi, countLo, countHi };
}

/** Extremes of two runs of samples, one after the other, from the extremes of each. */
export function mergeSampleExtremes(a: SampleExtremes, b: SampleExtremes): SampleExtremes {
  const lo = Math.min(a.lo, b.lo);
  const hi = Math.max(a.hi, b.hi);
  return {
    sampleCount: a.sampleCount + b.sampleCount,
    lo,
    hi,
    countLo: (a.lo === lo ? a.countLo : 0) + (b.lo === lo ? b.countLo : 0),
    countHi: (a.hi === hi ? a.countHi : 0) + (b.hi === hi ? b.countHi : 0),
  };
}
