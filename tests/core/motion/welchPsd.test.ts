import { describe, expect, it } from 'vitest';
import { defaultWelchSegmentLength, welchPsd, welchPsdOfRecords } from '../../../core/motion/welchPsd.js';
import { createRandom } from '../../../core/synth/random.js';
import { welchCase, welchVectors } from './welchVectors.js';

/** Largest relative difference, with an absolute floor of 1e-13 of the largest reference bin. */
function worstRelative(got: ArrayLike<number>, want: readonly number[]): number {
  const peak = Math.max(...want);
  let worst = 0;
  for (let k = 0; k < want.length; k++) {
    worst = Math.max(worst, Math.abs(got[k]! - want[k]!) / Math.max(Math.abs(want[k]!), 1e-13 * peak));
  }
  return worst;
}

describe('welchPsd(x, fs, opts) against scipy.signal.welch (offline vectors, scripts/reference/gen_welch_vectors.py)', () => {
  for (const name of ['white', 'twoTone', 'oddOverlap', 'constant']) {
    it(`${name}: every bin equal to scipy.signal.welch(hann, density) within 1e-10 relative`, () => {
      const c = welchCase(name);
      const psd = welchPsd(c.x, c.fs, { segmentLength: c.nperseg, overlap: c.noverlap, detrend: c.detrend });
      expect(psd.density.length).toBe(c.psd.length);
      expect(worstRelative(psd.fHz, c.f)).toBeLessThan(1e-12);
      expect(worstRelative(psd.density, c.psd)).toBeLessThan(1e-10);
      // scipy's segment count: (N − noverlap) // (nperseg − noverlap)
      expect(psd.segments).toBe(Math.floor((c.x.length - c.noverlap) / (c.nperseg - c.noverlap)));
    });
  }

  it('white noise σ = 0.3 at fs = 1 kHz: mean PSD ≈ 2σ²/fs = 1.8e-4 and ∫PSD df ≈ variance (Welch 1967 scaling; scipy stats in the vector file)', () => {
    const c = welchCase('white');
    const psd = welchPsd(c.x, c.fs, { segmentLength: c.nperseg });
    let sum = 0;
    for (const v of psd.density) sum += v;
    const mean = sum / psd.density.length;
    expect(mean).toBeCloseTo(c.stats.meanPsd, 15);
    expect(sum * psd.binHz).toBeCloseTo(c.stats.integral, 13);
    // Against theory: 31 averaged periodograms give ~±5 % scatter per estimate (χ² with ~60 dof).
    expect(Math.abs(mean / 1.8e-4 - 1)).toBeLessThan(0.05);
    expect(Math.abs((sum * psd.binHz) / c.stats.variance - 1)).toBeLessThan(0.03);
    expect(welchVectors().scipy).toMatch(/^\d+\.\d+/);
  });

  it('one-sided density integrates to the variance of a long seeded white record (Parseval; Welch 1967)', () => {
    const rnd = createRandom(5);
    const x = Float64Array.from({ length: 1 << 15 }, () => 2.5 * rnd.normal());
    const psd = welchPsd(x, 400);
    let sum = 0;
    for (const v of psd.density) sum += v;
    expect(Math.abs((sum * psd.binHz) / 6.25 - 1)).toBeLessThan(0.02);
    expect(psd.segmentLength).toBe(8192); // largest power of two ≤ N/4
  });

  it('a tone of amplitude A carries power A²/2 in the density (Parseval, periodic Hann ENBW 1.5 bins, Harris 1978)', () => {
    const fs = 1000;
    const x = Float64Array.from({ length: 8192 }, (_, i) => 3 * Math.sin((2 * Math.PI * 123.4 * i) / fs));
    const psd = welchPsd(x, fs, { segmentLength: 1024 });
    let sum = 0;
    for (const v of psd.density) sum += v;
    expect((sum * psd.binHz) / 4.5).toBeCloseTo(1, 3);
    expect(psd.enbwHz / psd.binHz).toBeCloseTo(1.5, 12);
  });

  it('welchPsdOfRecords pools periodograms: two records equal the segment-count-weighted mean of their PSDs (Welch 1967 averaging)', () => {
    const rnd = createRandom(9);
    const a = Float64Array.from({ length: 1024 }, () => rnd.normal());
    const b = Float64Array.from({ length: 640 }, () => rnd.normal());
    const pa = welchPsd(a, 100, { segmentLength: 128 });
    const pb = welchPsd(b, 100, { segmentLength: 128 });
    const pooled = welchPsdOfRecords([a, b], 100, { segmentLength: 128 });
    expect(pooled.segments).toBe(pa.segments + pb.segments);
    for (let k = 0; k < pooled.density.length; k++) {
      const want = (pa.density[k]! * pa.segments + pb.density[k]! * pb.segments) / (pa.segments + pb.segments);
      expect(pooled.density[k]).toBeCloseTo(want, 12);
    }
  });

  it('defaults and bad arguments: default length is a power of two ≤ N/4; short records shrink the segment; bad input throws RangeError', () => {
    expect(defaultWelchSegmentLength(7)).toBeNull();
    expect(defaultWelchSegmentLength(20)).toBe(16);
    expect(defaultWelchSegmentLength(2000)).toBe(256);
    expect(welchPsd(new Float64Array(100).map((_, i) => Math.sin(i)), 10, { segmentLength: 1024 }).segmentLength).toBe(64);
    expect(() => welchPsd([1, 2, 3], 10)).toThrow(RangeError);
    expect(() => welchPsd(new Float64Array(64), 0)).toThrow(RangeError);
    expect(() => welchPsd(new Float64Array(64), 10, { segmentLength: 24 })).toThrow(RangeError);
    expect(() => welchPsd(new Float64Array(64), 10, { segmentLength: 16, overlap: 16 })).toThrow(RangeError);
    expect(() => welchPsd(new Float64Array(64).fill(NaN), 10)).toThrow(RangeError);
  });
});
