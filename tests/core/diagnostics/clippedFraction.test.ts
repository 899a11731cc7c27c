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

  it('matches the direct count on runs of every length at every offset from the stride (common practice, no source)', () => {
    // Runs of 1..3·minRun samples on the top and bottom codes, placed at every offset, with
    // runs of a middle value between them: the strided search must find exactly the long ones.
    const rnd = createRandom(21);
    for (const minRun of [4, 5, 7, 12]) {
      const period = minRun * 20;
      for (let trial = 0; trial < 30; trial++) {
        const values: number[] = [];
        while (values.length < 2000) {
          const len = 1 + Math.floor(rnd.uniform() * 3 * minRun);
          const pick = rnd.uniform();
          const v = pick < 0.35 ? 1 : pick < 0.7 ? -1 : Math.round(rnd.uniform() * 100) / 200;
          for (let k = 0; k < len; k++) values.push(v);
        }
        const x = Float32Array.from(values);
        expect(clippedFraction(x, x.length, period)).toBe(oracle(x, minRun));
      }
    }
  });

  it('matches the direct count on a long clean 12-bit sine, where the top codes recur every cycle (common practice, no source)', () => {
    const n = 200_000;
    for (const period of [100, 400]) {
      const x = new Float32Array(n);
      for (let i = 0; i < n; i++) x[i] = Math.round(Math.sin((2 * Math.PI * i) / period) * 0.98 * 2047) / 2047;
      const minRun = Math.max(4, Math.round(period / 20));
      expect(clippedFraction(x, n, period)).toBe(oracle(x, minRun));
      // And clipped at 90 %: flat tops of about 0.29 period per cycle.
      const c = x.map((v) => Math.max(-0.9, Math.min(0.9, v)));
      const got = clippedFraction(c, n, period);
      expect(got).toBe(oracle(c, minRun));
      expect(got).toBeGreaterThan(0.25);
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
