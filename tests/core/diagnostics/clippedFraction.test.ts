import { describe, expect, it } from 'vitest';
import { clippedFraction } from '../../../core/diagnostics/clippedFraction.js';
import { measureSampleExtremes, mergeSampleExtremes } from '../../../core/diagnostics/sampleExtremes.js';
import { createRandom } from '../../../core/synth/random.js';

/** Direct two-pass oracle: find the extremes, then count long runs sitting on them. */
function oracle(x: Float32Array, minRun: number): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of x) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (!(hi > lo)) return 0;
  let count = 0;
  for (let i = 0; i < x.length; ) {
    let j = i;
    while (j < x.length && x[j] === x[i]) j++;
    if ((x[i] === lo || x[i] === hi) && j - i >= minRun) count += j - i;
    i = j;
  }
  return count / x.length;
}

describe('clippedFraction(samples, n, samplesPerPeriod)', () => {
  it('matches a direct two-pass count on seeded clipped and unclipped sines, 8-bit (common practice, no source)', () => {
    const rnd = createRandom(8);
    for (let trial = 0; trial < 40; trial++) {
      const n = 500 + Math.floor(rnd.uniform() * 5000);
      const period = 20 + rnd.uniform() * 200;
      const clip = 0.6 + rnd.uniform() * 0.6; // above 1: no clipping
      const x = new Float32Array(n);
      for (let i = 0; i < n; i++) {
        const v = Math.sin((2 * Math.PI * i) / period + trial) + 0.02 * rnd.normal();
        x[i] = Math.round(Math.max(-clip, Math.min(clip, v)) * 127) / 127;
      }
      const minRun = Math.max(4, Math.round(period / 20));
      expect(clippedFraction(x, n, period)).toBe(oracle(x, minRun));
      // With the extremes measured in two shares and merged (as the importer gives them).
      const cut = Math.floor(rnd.uniform() * n);
      const extremes = mergeSampleExtremes(measureSampleExtremes(x, 0, cut), measureSampleExtremes(x, cut, n));
      expect(clippedFraction(x, n, period, extremes)).toBe(oracle(x, minRun));
    }
  });

  it('measures the extremes itself when the given ones are for another length', () => {
    const x = Float32Array.from([1, 1, 1, 1, 1, 0, -0.5, 0.2, 1, 1, 1, 1]);
    const stale = measureSampleExtremes(x, 0, 6);
    expect(clippedFraction(x, x.length, 20, stale)).toBeCloseTo(9 / 12, 12);
  });

  it('counts a flat top at the very start and at the very end', () => {
    const x = Float32Array.from([1, 1, 1, 1, 1, 0, -0.5, 0.2, 1, 1, 1, 1]);
    expect(clippedFraction(x, x.length, 20)).toBeCloseTo(9 / 12, 12);
  });

  it('is 0 for a constant or empty channel', () => {
    expect(clippedFraction(new Float32Array(100).fill(3), 100, 50)).toBe(0);
    expect(clippedFraction(new Float32Array(0), 0, 50)).toBe(0);
  });
});
