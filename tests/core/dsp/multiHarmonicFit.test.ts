import { describe, expect, it } from 'vitest';
import { estimateToneFrequency } from '../../../core/dsp/estimateToneFrequency.js';
import { fitHarmonics } from '../../../core/dsp/multiHarmonicFit.js';
import { fitSine3, fitSine4 } from '../../../core/dsp/sineFit.js';
import { referenceVectors } from './referenceVectors.js';

describe('fitHarmonics(x, fs, f, H) — multi-harmonic least squares', () => {
  it('12.37 cycles in 4096 samples (harmonics 2, 3, 5 of 1e-3, 3e-3, 5e-4; DC 0.01; noise 1e-5): matches numpy.linalg.lstsq (offline numpy vector)', () => {
    const h = referenceVectors().harmonics;
    const fit = fitHarmonics(h.x, h.sampleRateHz, h.frequencyHz, h.harmonics);
    expect(fit.ok).toBe(true);
    expect(fit.amplitudes.length).toBe(h.harmonics + 1);
    expect(Math.abs(fit.offset - h.lstsq.offset)).toBeLessThan(1e-12);
    for (let k = 1; k <= h.harmonics; k++) {
      expect(Math.abs(fit.a[k] - h.lstsq.a[k]), `a[${k}]`).toBeLessThan(1e-12);
      expect(Math.abs(fit.b[k] - h.lstsq.b[k]), `b[${k}]`).toBeLessThan(1e-12);
    }
    expect(fit.thd / h.lstsq.thd).toBeCloseTo(1, 10);
    expect(fit.residualRms / h.lstsq.residualRms).toBeCloseTo(1, 9);
  });

  it('THD is 0.3202 % ± 0.0005 % against a true 0.32016 % (IEEE Std 1241 THD definition, 7 harmonics)', () => {
    const h = referenceVectors().harmonics;
    expect(h.truth.thd).toBeCloseTo(0.0032016, 7);
    const fit = fitHarmonics(h.x, h.sampleRateHz, h.frequencyHz, h.harmonics);
    expect(Math.abs(fit.thd * 100 - 0.3202)).toBeLessThan(0.0005);
    expect(fit.amplitudes[3]).toBeCloseTo(3e-3, 6);
    expect(fit.amplitudes[4]).toBeLessThan(1e-6);
  });

  it('with the fundamental from fitSine4 (not known in advance) THD is still 0.3202 % ± 0.0005 %', () => {
    const h = referenceVectors().harmonics;
    const est = estimateToneFrequency(h.x, h.sampleRateHz)!;
    const f = fitSine4(h.x, h.sampleRateHz, est.frequencyHz);
    expect(f.converged).toBe(true);
    const fit = fitHarmonics(h.x, h.sampleRateHz, f.frequencyHz, 7);
    expect(Math.abs(fit.thd * 100 - 0.3202)).toBeLessThan(0.0005);
  });

  it('H = 1 is the three-parameter fit; noise-free harmonics are recovered exactly with the t = 0 reference', () => {
    const fs = 50000;
    const f = 401.3;
    const n = 3001;
    const x = Float64Array.from({ length: n }, (_, k) => {
      const w = (2 * Math.PI * f * k) / fs;
      return 0.5 + 2 * Math.cos(w) - 1 * Math.sin(w) + 0.03 * Math.cos(3 * w) + 0.04 * Math.sin(3 * w);
    });
    const one = fitHarmonics(x, fs, f, 1);
    const three = fitSine3(x, fs, f);
    expect(one.a[1]).toBeCloseTo(three.a, 12);
    expect(one.b[1]).toBeCloseTo(three.b, 12);
    expect(one.thd).toBe(0);
    const fit = fitHarmonics(x, fs, f, 5, 0, n);
    expect(fit.offset).toBeCloseTo(0.5, 12);
    expect(fit.a[1]).toBeCloseTo(2, 12);
    expect(fit.b[1]).toBeCloseTo(-1, 12);
    expect(fit.a[3]).toBeCloseTo(0.03, 12);
    expect(fit.b[3]).toBeCloseTo(0.04, 12);
    expect(fit.amplitudes[3]).toBeCloseTo(0.05, 12);
    expect(fit.amplitudes[2]).toBeLessThan(1e-12);
    expect(fit.thd).toBeCloseTo(0.05 / Math.sqrt(5), 12);
    expect(fit.residualRms).toBeLessThan(1e-12);
    // A sub-range starts its own t = 0: harmonic h rotates by h·ω·start.
    const sub = fitHarmonics(x, fs, f, 5, 100, 2000);
    const rot = (3 * 2 * Math.PI * f * 100) / fs;
    expect(sub.a[3]).toBeCloseTo(0.03 * Math.cos(rot) + 0.04 * Math.sin(rot), 12);
  });

  it('skips NaN samples and flags a system with too few samples instead of throwing', () => {
    const h = referenceVectors().harmonics;
    const x = Float64Array.from(h.x);
    x[5] = NaN;
    x[4000] = NaN;
    const fit = fitHarmonics(x, h.sampleRateHz, h.frequencyHz, 7);
    expect(fit.skippedSamples).toBe(2);
    expect(Math.abs(fit.thd * 100 - 0.3202)).toBeLessThan(0.0005);
    const tiny = fitHarmonics([1, 2, 3], 1000, 10, 3);
    expect(tiny.ok).toBe(false);
    expect(Number.isNaN(tiny.thd)).toBe(true);
  });

  it('throws RangeError for bad arguments from code', () => {
    expect(() => fitHarmonics([1, 2, 3], 1000, 0, 3)).toThrow(RangeError);
    expect(() => fitHarmonics([1, 2, 3], 1000, 10, 0)).toThrow(RangeError);
    expect(() => fitHarmonics([1, 2, 3], 1000, 10, 2.5)).toThrow(RangeError);
  });
});
