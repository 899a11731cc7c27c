/**
 * Fraction of samples that sit on a flat top at the channel's extreme values: runs of equal
 * samples at the minimum or maximum at least max(4, P/20) long, where P is samples per carrier
 * period. An unclipped sine sampled at P points per period and quantised at 8 bits stays on its
 * top code for only a few samples, so shorter runs are not counted (common practice, no source).
 */
export function clippedFraction(samples: Float32Array, sampleCount: number, samplesPerPeriod: number): number {
  if (sampleCount === 0) return 0;
  const minRun = Math.max(4, Math.round(samplesPerPeriod / 20));
  // One pass over runs of equal samples: each finished run first updates the running extremes (a
  // new extreme resets its count), then, if it is long enough, is credited to the extreme it sits on.
  let lo = Infinity;
  let hi = -Infinity;
  let atLo = 0;
  let atHi = 0;
  let runValue = samples[0]!;
  let runStart = 0;
  for (let i = 1; i <= sampleCount; i++) {
    const v = i < sampleCount ? samples[i]! : NaN;
    if (v === runValue) continue;
    if (runValue > hi) {
      hi = runValue;
      atHi = 0;
    }
    if (runValue < lo) {
      lo = runValue;
      atLo = 0;
    }
    const run = i - runStart;
    if (run >= minRun) {
      // While hi equals lo (only one value seen) the run is held in both counts; the first new
      // extreme on either side resets the count it no longer belongs to.
      if (runValue === hi) atHi += run;
      if (runValue === lo) atLo += run;
    }
    runValue = v;
    runStart = i;
  }
  if (!(hi > lo)) return 0;
  return (atLo + atHi) / sampleCount;
}
