import { measureSampleExtremes, type SampleExtremes } from './sampleExtremes.js';

/**
 * Fraction of samples that sit on a flat top at the channel's extreme values: runs of equal
 * samples at the minimum or maximum at least max(4, P/20) long, where P is samples per carrier
 * period. An unclipped sine sampled at P points per period and quantised at 8 bits stays on its
 * top code for only a few samples, so shorter runs are not counted (common practice, no source).
 */
export function clippedFraction(samples: Float32Array, sampleCount: number, samplesPerPeriod: number, extremes?: SampleExtremes): number {
  if (sampleCount === 0) return 0;
  // Pass 1: the extremes and how many samples sit on each (given when measured elsewhere). Pass 2
  // (runs on the extremes) is only needed when enough samples sit there to form a flat top,
  // which a clean capture never has.
  const { lo, hi, countLo, countHi } = extremes !== undefined && extremes.sampleCount === sampleCount ? extremes : measureSampleExtremes(samples, 0, sampleCount);
  if (!(hi > lo)) return 0;
  const minRun = Math.max(4, Math.round(samplesPerPeriod / 20));
  if (countLo < minRun && countHi < minRun) return 0;
  let clipped = 0;
  for (let i = 0; i < sampleCount; i++) {
    const v = samples[i]!;
    if (v !== lo && v !== hi) continue;
    let j = i + 1;
    while (j < sampleCount && samples[j] === v) j++;
    if (j - i >= minRun) clipped += j - i;
    i = j - 1;
  }
  return clipped / sampleCount;
}
