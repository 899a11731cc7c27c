import { describe, expect, it } from 'vitest';
import { ANGLE_NOISE_FLOOR_DEG, estimateAngleNoiseDeg } from '../../../core/motion/estimateAngleNoise.js';
import { secondOrderStep } from '../../../core/synth/motion.js';
import { ARCMIN, makeTrace } from './traces.js';

describe('estimateAngleNoiseDeg(deg)', () => {
  it('recovers σ of white noise within 5 % whether the shaft rests, ramps or steps (var of [1, −2, 1] on white noise = 6σ²; MAD, Hampel 1974)', () => {
    const motions = [() => 10, (t: number) => 10 + 90 * t, (t: number) => 10 + 40 * secondOrderStep(t - 1, 0.3, 2 * Math.PI * 5)];
    for (const [k, m] of motions.entries()) {
      const tr = makeTrace(400, 5, m, 1.5 * ARCMIN, 30 + k);
      expect(Math.abs(estimateAngleNoiseDeg(tr.deg) / (1.5 * ARCMIN) - 1)).toBeLessThan(0.05);
    }
  });

  it('falls back to first differences when NaNs leave no three finite points in a row; floors noise-free input; NaN when hopeless', () => {
    const tr = makeTrace(400, 5, () => 10, 1.5 * ARCMIN, 40);
    for (let i = 0; i < tr.deg.length; i += 3) tr.deg[i] = NaN;
    expect(Math.abs(estimateAngleNoiseDeg(tr.deg) / (1.5 * ARCMIN) - 1)).toBeLessThan(0.08);
    expect(estimateAngleNoiseDeg(new Float64Array(100).fill(3))).toBe(ANGLE_NOISE_FLOOR_DEG);
    expect(Number.isNaN(estimateAngleNoiseDeg([1, NaN, 2, NaN]))).toBe(true);
  });
});
