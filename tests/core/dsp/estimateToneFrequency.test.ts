import { describe, expect, it } from 'vitest';
import { estimateToneFrequency } from '../../../core/dsp/estimateToneFrequency.js';
import { fitSine4 } from '../../../core/dsp/sineFit.js';
import { createRandom } from '../../../core/synth/random.js';
import { referenceVectors } from './referenceVectors.js';

function tone(n: number, cycles: number, phaseRad: number, amplitude = 1): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => amplitude * Math.cos((2 * Math.PI * cycles * i) / n + phaseRad));
}

describe('estimateToneFrequency(x, fs) — Hann window + Grandke (1983) ratio', () => {
  it('matches the numpy evaluation of the same estimator on ~10-cycle real tones (offline numpy vectors)', () => {
    const g = referenceVectors().grandke;
    expect(g.rows.length).toBe(11 * 12);
    for (const row of g.rows) {
      const est = estimateToneFrequency(tone(g.n, row.cycles, row.phaseRad), g.n);
      expect(est).toBeDefined();
      // fs = N, so Hz are bins.
      expect(Math.abs(est!.frequencyHz - row.estimateBins)).toBeLessThan(1e-11);
    }
  });

  it('worst bias on a real tone of ~10 cycles (N = 64, δ = 0 … 0.5, 12 phases) is ≤ 6e-5 bin (Grandke 1983 method; numpy figure 5.45e-5)', () => {
    const g = referenceVectors().grandke;
    let worst = 0;
    for (const row of g.rows) {
      const est = estimateToneFrequency(tone(g.n, row.cycles, row.phaseRad), g.n)!;
      worst = Math.max(worst, Math.abs(est.frequencyHz - row.cycles));
    }
    expect(worst).toBeLessThanOrEqual(6e-5);
    expect(worst).toBeCloseTo(g.worstBiasBins, 12);
  });

  it('bias on a complex-like case (many cycles, N = 4096) is far smaller: Grandke ratio exact for the Hann kernel up to O(1/N²)', () => {
    for (const d of [0, 0.1, 0.25, 0.4, 0.5]) {
      const est = estimateToneFrequency(tone(4096, 500 + d, 0.3), 4096)!;
      expect(Math.abs(est.frequencyHz - (500 + d))).toBeLessThan(2e-6);
      expect(est.peakBin + est.binOffset).toBeCloseTo(500 + d, 5);
      expect(est.fftLength).toBe(4096);
    }
  });

  it('lands inside the four-parameter fit\'s ±0.7-bin basin for fractional offsets 0 … 0.5 at 10 dB SNR, N = 256, and the fit then converges (IEEE Std 1057 fit chain)', () => {
    const rnd = createRandom(31);
    const n = 256;
    const fs = 2000;
    const sigma = 1 / Math.sqrt(2 * 10); // η = A²/(2σ²) = 10 dB
    let worstStart = 0;
    for (let i = 0; i <= 10; i++) {
      const cycles = 12 + i * 0.05;
      for (let t = 0; t < 20; t++) {
        const phi = 2 * Math.PI * rnd.uniform();
        const x = Float64Array.from({ length: n }, (_, k) => Math.sin((2 * Math.PI * cycles * k) / n + phi) + sigma * rnd.normal());
        const est = estimateToneFrequency(x, fs)!;
        const errBins = Math.abs(est.frequencyHz - (cycles * fs) / n) / (fs / n);
        worstStart = Math.max(worstStart, errBins);
        const fit = fitSine4(x, fs, est.frequencyHz);
        expect(fit.converged).toBe(true);
        expect(Math.abs(fit.frequencyHz - (cycles * fs) / n) / (fs / n)).toBeLessThan(0.1);
      }
    }
    expect(worstStart).toBeLessThan(0.7);
  });

  it('estimates the amplitude within 0.1 % across the bin (Hann scalloping undone, Harris 1978 kernel)', () => {
    for (const d of [0, 0.2, 0.35, 0.5]) {
      const est = estimateToneFrequency(tone(1024, 40 + d, 1.1, 2.5), 1024)!;
      expect(Math.abs(est.amplitude / 2.5 - 1)).toBeLessThan(1e-3);
    }
  });

  it('uses the largest power of two ≤ length from the centre of the range, in Hz', () => {
    const fs = 48000;
    const f = 1234.5;
    const x = Float64Array.from({ length: 3000 }, (_, k) => Math.sin((2 * Math.PI * f * k) / fs));
    const est = estimateToneFrequency(x, fs)!;
    expect(est.fftLength).toBe(2048);
    expect(Math.abs(est.frequencyHz - f)).toBeLessThan(1e-3 * (fs / 2048));
    const sub = estimateToneFrequency(x, fs, { start: 100, length: 1100 })!;
    expect(sub.fftLength).toBe(1024);
    expect(Math.abs(sub.frequencyHz - f)).toBeLessThan(1e-3 * (fs / 1024));
  });

  it('minHz / maxHz restrict the search to a band (the weaker tone is found inside it)', () => {
    const n = 1024;
    const x = Float64Array.from({ length: n }, (_, k) => Math.sin((2 * Math.PI * 50.2 * k) / n) + 0.1 * Math.sin((2 * Math.PI * 200.3 * k) / n));
    expect(estimateToneFrequency(x, n)!.frequencyHz).toBeCloseTo(50.2, 3);
    expect(estimateToneFrequency(x, n, { minHz: 100 })!.frequencyHz).toBeCloseTo(200.3, 2);
    expect(estimateToneFrequency(x, n, { maxHz: 40 })!.peakBin).toBeLessThan(41);
    expect(estimateToneFrequency(x, n, { minHz: 300, maxHz: 250 })).toBeUndefined();
  });

  it('skips NaN samples: a tone with 1 % NaN still starts the fit inside its basin', () => {
    const rnd = createRandom(3);
    const n = 2048;
    const x = new Float32Array(n);
    for (let k = 0; k < n; k++) x[k] = rnd.uniform() < 0.01 ? NaN : Math.sin((2 * Math.PI * 77.3 * k) / n);
    const est = estimateToneFrequency(x, n)!;
    expect(Math.abs(est.frequencyHz - 77.3)).toBeLessThan(0.05);
  });

  it('returns undefined when there is no tone: all zero, constant, NaN-only, too short', () => {
    expect(estimateToneFrequency(new Float64Array(1024), 1000)).toBeUndefined();
    expect(estimateToneFrequency(new Float64Array(1024).fill(3.3), 1000)).toBeUndefined();
    expect(estimateToneFrequency(new Float64Array(1024).fill(NaN), 1000)).toBeUndefined();
    expect(estimateToneFrequency(tone(15, 3, 0), 1000)).toBeUndefined();
    expect(estimateToneFrequency([], 1000)).toBeUndefined();
  });

  it('throws RangeError for bad arguments from code', () => {
    expect(() => estimateToneFrequency(tone(64, 5, 0), 0)).toThrow(RangeError);
    expect(() => estimateToneFrequency(tone(64, 5, 0), 1000, { start: 60, length: 10 })).toThrow(RangeError);
    expect(() => estimateToneFrequency(tone(64, 5, 0), 1000, { minHz: -1 })).toThrow(RangeError);
  });
});
