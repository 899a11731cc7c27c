import { describe, expect, it } from 'vitest';
import { findSpectralPeaks } from '../../../core/motion/findSpectralPeaks.js';
import { welchPsd } from '../../../core/motion/welchPsd.js';
import { createRandom } from '../../../core/synth/random.js';
import { welchCase } from './welchVectors.js';

describe('findSpectralPeaks(fHz, density, opts)', () => {
  it('parabolic interpolation on the log spectrum is exact for a Gaussian-shaped peak (Smith, Spectral Audio Signal Processing, quadratic interpolation)', () => {
    const n = 200;
    const f = Float64Array.from({ length: n }, (_, k) => 0.5 * k);
    const centre = 31.37;
    const d = Float64Array.from(f, (x) => 1e-6 + 5 * Math.exp(-(((x - centre) / 1.3) ** 2)));
    const peaks = findSpectralPeaks(f, d, { minProminenceDb: 10 });
    expect(peaks.length).toBe(1);
    // The 1e-6 pedestal perturbs the Gaussian by < 1e-6 relative near the peak.
    expect(peaks[0]!.frequencyHz).toBeCloseTo(centre, 5);
    expect(peaks[0]!.density).toBeCloseTo(5, 4);
  });

  it('finds both tones of the scipy two-tone vector (3.1 Hz at 2′, 11.7 Hz at 0.7′) within 2 % of their frequencies, strongest first', () => {
    const c = welchCase('twoTone');
    const psd = welchPsd(c.x, c.fs, { segmentLength: c.nperseg, overlap: c.noverlap });
    const peaks = findSpectralPeaks(psd.fHz, psd.density);
    expect(peaks.length).toBe(2);
    expect(Math.abs(peaks[0]!.frequencyHz / 3.1 - 1)).toBeLessThan(0.02);
    expect(Math.abs(peaks[1]!.frequencyHz / 11.7 - 1)).toBeLessThan(0.02);
    expect(peaks[0]!.prominenceDb).toBeGreaterThan(peaks[1]!.prominenceDb);
  });

  it('white noise: no peak 10 dB above the median in 20 seeded Welch spectra (χ² tail with ≥ 8 averages is < 1e-6 per bin; Welch 1967 §III)', () => {
    for (let seed = 1; seed <= 20; seed++) {
      const rnd = createRandom(seed);
      const x = Float64Array.from({ length: 2000 }, () => rnd.normal());
      const psd = welchPsd(x, 400, { segmentLength: 256 });
      expect(findSpectralPeaks(psd.fHz, psd.density)).toEqual([]);
    }
  });

  it('keeps the minimum separation, the bin floor and maxPeaks; rejects mismatched lengths', () => {
    const f = Float64Array.from({ length: 64 }, (_, k) => k);
    const d = new Float64Array(64).fill(1);
    d[1] = 1000; // below minBin 2
    d[20] = 100;
    d[22] = 50; // within 3 bins of a stronger one
    d[40] = 80;
    d[50] = 60;
    const peaks = findSpectralPeaks(f, d, { maxPeaks: 2 });
    expect(peaks.map((p) => p.bin)).toEqual([20, 40]);
    expect(() => findSpectralPeaks(f, d.subarray(1))).toThrow(RangeError);
    expect(findSpectralPeaks([0, 1], [1, 1])).toEqual([]);
  });
});
