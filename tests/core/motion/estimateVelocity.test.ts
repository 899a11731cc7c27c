import { describe, expect, it } from 'vitest';
import { estimateVelocity, velocityWindowPoints } from '../../../core/motion/estimateVelocity.js';
import { createRandom } from '../../../core/synth/random.js';

describe('estimateVelocity(t, deg, opts)', () => {
  it('is exact on a ramp everywhere, edges included, even with uneven time stamps (least-squares slope of a line)', () => {
    const rnd = createRandom(3);
    const t = Float64Array.from({ length: 300 }, (_, i) => i / 400 + 1e-4 * rnd.uniform());
    const deg = Float64Array.from(t, (x) => 12.5 - 37.25 * x);
    const v = estimateVelocity(t, deg, { points: 9 });
    for (const x of v) expect(x).toBeCloseTo(-37.25, 9);
  });

  it('is exact for a parabola at interior points (the order-1 and order-2 first-derivative Savitzky–Golay filters coincide; Savitzky & Golay 1964)', () => {
    const fs = 400;
    const t = Float64Array.from({ length: 200 }, (_, i) => i / fs);
    const deg = Float64Array.from(t, (x) => 3 + 20 * x + 150 * x * x);
    const v = estimateVelocity(t, deg, { points: 11 });
    for (let i = 5; i < 195; i++) expect(v[i]).toBeCloseTo(20 + 300 * t[i]!, 8);
  });

  it('equals the 5-point Savitzky–Golay first-derivative convolution (−2, −1, 0, 1, 2)/10 at interior points (Savitzky & Golay 1964 tables, from memory)', () => {
    const rnd = createRandom(11);
    const dt = 1 / 1000;
    const x = Float64Array.from({ length: 100 }, () => rnd.normal());
    const t = Float64Array.from(x, (_, i) => i * dt);
    const v = estimateVelocity(t, x, { points: 5 });
    for (let i = 2; i < 98; i++) {
      const sg = (-2 * x[i - 2]! - x[i - 1]! + x[i + 1]! + 2 * x[i + 2]!) / (10 * dt);
      expect(v[i]).toBeCloseTo(sg, 8);
    }
  });

  it('noise: std of the estimate on white angle noise matches √(12σ²/(Δt² M(M²−1))) within 5 % (variance of a least-squares slope; Brown, Schneider & Mulligan, IEEE Trans. Ind. Electron. 39(1), 1992, from memory)', () => {
    const rnd = createRandom(21);
    const fs = 400;
    const sigma = 0.02;
    const m = 21;
    const n = 200_000;
    const t = Float64Array.from({ length: n }, (_, i) => i / fs);
    const deg = Float64Array.from(t, () => sigma * rnd.normal());
    const v = estimateVelocity(t, deg, { points: m });
    let s2 = 0;
    for (let i = m; i < n - m; i++) s2 += v[i]! * v[i]!;
    const measured = Math.sqrt(s2 / (n - 2 * m));
    const theory = Math.sqrt((12 * sigma * sigma * fs * fs) / (m * (m * m - 1)));
    expect(Math.abs(measured / theory - 1)).toBeLessThan(0.05);
  });

  it('skips NaN points, gives NaN where a window has too few finite points, and never throws on short records', () => {
    const t = Float64Array.from({ length: 50 }, (_, i) => i * 0.01);
    const deg = Float64Array.from(t, (x) => 5 * x);
    deg[10] = NaN;
    deg[11] = NaN;
    const v = estimateVelocity(t, deg, { points: 7 });
    expect(v[10]).toBeCloseTo(5, 10);
    const allNaN = estimateVelocity(t, new Float64Array(50).fill(NaN), { points: 7 });
    expect(allNaN.every(Number.isNaN)).toBe(true);
    expect(estimateVelocity([0], [1]).length).toBe(1);
    expect(Number.isNaN(estimateVelocity([0], [1])[0]!)).toBe(true);
    expect(estimateVelocity([0, 0.5, 1], [0, 1, 2], { points: 9 })[1]).toBeCloseTo(2, 12);
  });

  it('window from seconds: odd, at least 3 points; bad arguments throw RangeError', () => {
    expect(velocityWindowPoints(0.02, 1 / 400)).toBe(9);
    expect(velocityWindowPoints(0.001, 1 / 400)).toBe(3);
    expect(() => estimateVelocity([0, 1], [0, 1], { points: 4 })).toThrow(RangeError);
    expect(() => estimateVelocity([0, 1], [0])).toThrow(RangeError);
    expect(() => estimateVelocity([0, 1], [0, 1], { windowS: -1 })).toThrow(RangeError);
  });
});
