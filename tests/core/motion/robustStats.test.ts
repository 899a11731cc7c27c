import { describe, expect, it } from 'vitest';
import { fitLine } from '../../../core/motion/fitLine.js';
import { medianIntervalS, medianOf, scaledMadOf } from '../../../core/motion/robustStats.js';
import { createRandom } from '../../../core/synth/random.js';

describe('robust statistics and the line fit', () => {
  it('medianOf skips NaN and averages the middle pair; scaledMadOf is consistent for Gaussian data (1.4826·MAD, Hampel 1974)', () => {
    expect(medianOf([3, NaN, 1, 2])).toBe(2);
    expect(medianOf([4, 1, 3, 2])).toBe(2.5);
    expect(Number.isNaN(medianOf([NaN]))).toBe(true);
    const rnd = createRandom(8);
    const x = Float64Array.from({ length: 100_000 }, () => 0.7 * rnd.normal() + 5);
    expect(Math.abs(scaledMadOf(x) / 0.7 - 1)).toBeLessThan(0.01);
  });

  it('medianIntervalS ignores a dropped stamp; fitLine recovers a line through NaN gaps (ordinary least squares)', () => {
    expect(medianIntervalS([0, 1, 2, 4, 5, 6])).toBe(1);
    const t = Float64Array.from({ length: 50 }, (_, i) => 100 + i * 0.01);
    const x = Float64Array.from(t, (v) => 7 - 3 * (v - 100));
    x[4] = NaN;
    const f = fitLine(t, x);
    expect(f.count).toBe(49);
    expect(f.degPerS).toBeCloseTo(-3, 10);
    expect(f.residualRmsDeg).toBeLessThan(1e-9);
    expect(fitLine(t, x, 3, 3).count).toBe(0);
  });
});

describe('medianOf against a full sort (the oracle: sorted order statistics)', () => {
  it('medianOf equals the middle of a sort (mean of the two middle values for an even count) on 2e5 seeded values', () => {
    const rnd = createRandom(100);
    for (const n of [200_000, 200_001]) {
      const x = Float64Array.from({ length: n }, () => Math.round(rnd.normal() * 1000) / 7);
      const s = Float64Array.from(x).sort();
      const m = n >> 1;
      expect(medianOf(x)).toBe(n % 2 === 1 ? s[m] : 0.5 * (s[m - 1]! + s[m]!));
    }
  });
});
