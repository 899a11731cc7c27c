import { describe, expect, it } from 'vitest';
import { measureSampleExtremes, mergeSampleExtremes } from '../../../core/diagnostics/sampleExtremes.js';
import { createRandom } from '../../../core/synth/random.js';

/** Oracle: Math.min/Math.max over the numbers and a filter count (common practice, no source). */
function oracle(x: Float32Array): { lo: number; hi: number; countLo: number; countHi: number } {
  const numbers = Array.from(x).filter((v) => !Number.isNaN(v));
  const lo = numbers.length ? Math.min(...numbers) : Infinity;
  const hi = numbers.length ? Math.max(...numbers) : -Infinity;
  return { lo, hi, countLo: numbers.filter((v) => v === lo).length, countHi: numbers.filter((v) => v === hi).length };
}

describe('measureSampleExtremes / mergeSampleExtremes', () => {
  it('match the oracle on seeded 4-bit-quantised records with NaNs, whole and merged from two shares cut anywhere', () => {
    const rnd = createRandom(31);
    for (let trial = 0; trial < 60; trial++) {
      const n = 1 + Math.floor(rnd.uniform() * 3000);
      const x = Float32Array.from({ length: n }, () => (rnd.uniform() < 0.02 ? NaN : Math.round(rnd.normal() * 3) / 8));
      const want = oracle(x);
      expect(measureSampleExtremes(x, 0, n)).toEqual({ sampleCount: n, ...want });
      const cut = Math.floor(rnd.uniform() * (n + 1));
      expect(mergeSampleExtremes(measureSampleExtremes(x, 0, cut), measureSampleExtremes(x, cut, n))).toEqual({ sampleCount: n, ...want });
    }
  });

  it('gives infinite bounds and zero counts for no numbers at all', () => {
    expect(measureSampleExtremes(Float32Array.from([NaN, NaN]), 0, 2)).toEqual({ sampleCount: 2, lo: Infinity, hi: -Infinity, countLo: 0, countHi: 0 });
    expect(measureSampleExtremes(new Float32Array(4), 2, 2).sampleCount).toBe(0);
  });
});
