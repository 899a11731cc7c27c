import { describe, expect, it } from 'vitest';
import { cachedFftPlanCount, getFftPlan, isFftSize, largestFftSizeAtMost, realFft, realFftMagnitudeSquared } from '../../../core/dsp/fftPlan.js';
import { createRandom } from '../../../core/synth/random.js';
import { referenceVectors } from './referenceVectors.js';

/** Direct O(N²) DFT from the definition X_k = Σ x_n e^{−2πikn/N} (common practice, no source). */
function directDft(x: Float64Array): { re: Float64Array; im: Float64Array } {
  const n = x.length;
  const re = new Float64Array(n / 2 + 1);
  const im = new Float64Array(n / 2 + 1);
  for (let k = 0; k <= n / 2; k++) {
    for (let j = 0; j < n; j++) {
      const a = (2 * Math.PI * ((k * j) % n)) / n;
      re[k] += x[j] * Math.cos(a);
      im[k] -= x[j] * Math.sin(a);
    }
  }
  return { re, im };
}

describe('realFft(x)', () => {
  it('matches numpy.fft.rfft for sizes 8 … 4096 (offline numpy vectors)', () => {
    const vectors = referenceVectors().fft;
    expect(vectors.map((v) => v.n)).toEqual([8, 16, 32, 64, 128, 256, 512, 1024, 2048, 4096]);
    for (const v of vectors) {
      const spec = realFft(Float64Array.from(v.x));
      expect(spec.length).toBe(v.n + 2);
      let scale = 0;
      for (let k = 0; k < v.re.length; k++) scale = Math.max(scale, Math.hypot(v.re[k], v.im[k]));
      let worst = 0;
      for (let k = 0; k <= v.n / 2; k++) {
        worst = Math.max(worst, Math.abs(spec[2 * k] - v.re[k]), Math.abs(spec[2 * k + 1] - v.im[k]));
      }
      // fft.js is float64 radix-4; relative error ~1e-16·log N (fft.js README claims float64).
      expect(worst / scale, `n = ${v.n}`).toBeLessThan(1e-13);
    }
  });

  it('matches a direct DFT of the definition for seeded inputs, sizes 2 … 64', () => {
    const rnd = createRandom(7);
    for (let n = 2; n <= 64; n *= 2) {
      const x = Float64Array.from({ length: n }, () => rnd.normal());
      const spec = realFft(x);
      const ref = directDft(x);
      for (let k = 0; k <= n / 2; k++) {
        expect(spec[2 * k]).toBeCloseTo(ref.re[k], 11);
        expect(spec[2 * k + 1]).toBeCloseTo(ref.im[k], 11);
      }
    }
  });

  it('writes into a caller buffer of length 2N and returns its first N + 2 entries', () => {
    const x = Float64Array.from({ length: 16 }, (_, i) => Math.cos((2 * Math.PI * 3 * i) / 16));
    const out = new Float64Array(32);
    const spec = realFft(x, out);
    expect(spec.buffer).toBe(out.buffer);
    expect(spec.length).toBe(18);
    // A bin-centred cosine of amplitude 1 gives X_3 = N/2 (DFT definition).
    expect(spec[6]).toBeCloseTo(8, 12);
    expect(() => realFft(x, new Float64Array(20))).toThrow(RangeError);
  });

  it('rejects lengths that are not powers of two with a RangeError', () => {
    expect(() => realFft(new Float64Array(1000))).toThrow(RangeError);
    expect(() => realFft(new Float64Array(1))).toThrow(RangeError);
  });
});

describe('realFftMagnitudeSquared(x)', () => {
  it('equals |numpy rfft|² and satisfies Parseval (Σx² = (|X_0|² + 2Σ|X_k|² + |X_{N/2}|²)/N)', () => {
    for (const v of referenceVectors().fft) {
      const x = Float64Array.from(v.x);
      const p = realFftMagnitudeSquared(x);
      expect(p.length).toBe(v.n / 2 + 1);
      let energy = 0;
      for (const s of v.x) energy += s * s;
      let spectral = p[0] + p[v.n / 2];
      for (let k = 1; k < v.n / 2; k++) spectral += 2 * p[k];
      expect(spectral / v.n / energy).toBeCloseTo(1, 12);
      for (let k = 0; k <= v.n / 2; k++) {
        const ref = v.re[k] * v.re[k] + v.im[k] * v.im[k];
        expect(Math.abs(p[k] - ref)).toBeLessThan(1e-12 * v.n * energy);
      }
    }
  });
});

describe('getFftPlan(size)', () => {
  it('reuses the plan for a size and keeps at most 4 plans (bounded cache)', () => {
    const a = getFftPlan(256);
    expect(getFftPlan(256)).toBe(a);
    for (const n of [8, 16, 32, 64, 128, 512]) getFftPlan(n);
    expect(cachedFftPlanCount()).toBeLessThanOrEqual(4);
    // 256 was evicted by the newer sizes, so a fresh plan is built.
    expect(getFftPlan(256)).not.toBe(a);
  });

  it('isFftSize and largestFftSizeAtMost', () => {
    expect([1, 2, 3, 4, 1000, 1024].map(isFftSize)).toEqual([false, true, false, true, false, true]);
    expect(largestFftSizeAtMost(2)).toBe(2);
    expect(largestFftSizeAtMost(1000)).toBe(512);
    expect(largestFftSizeAtMost(1024)).toBe(1024);
    expect(() => largestFftSizeAtMost(1)).toThrow(RangeError);
  });
});
