import { describe, expect, it } from 'vitest';
import { solveSymmetric } from '../../../core/dsp/linearSolve.js';

/** Binomial coefficient C(n, k). */
function binom(n: number, k: number): number {
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return r;
}

/**
 * Exact integer inverse of the n×n Hilbert matrix (M.-D. Choi, "Tricks or treats with the
 * Hilbert matrix", Amer. Math. Monthly 90(5), 1983, closed form; 1-based i, j):
 * (H⁻¹)_ij = (−1)^{i+j} (i+j−1) C(n+i−1, n−j) C(n+j−1, n−i) C(i+j−2, i−1)².
 */
function hilbertInverse(n: number, i: number, j: number): number {
  const sign = (i + j) % 2 === 0 ? 1 : -1;
  return sign * (i + j - 1) * binom(n + i - 1, n - j) * binom(n + j - 1, n - i) * binom(i + j - 2, i - 1) ** 2;
}

describe('solveSymmetric(m, r, n)', () => {
  it('solves Hilbert systems (n = 3 … 6) to the accuracy their condition allows (Choi 1983 inverse)', () => {
    for (const n of [3, 4, 5, 6]) {
      const m = new Float64Array(n * n);
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) m[i * n + j] = 1 / (i + j + 1);
      for (let col = 0; col < n; col++) {
        const e = new Float64Array(n);
        e[col] = 1;
        const res = solveSymmetric(m, e, n);
        expect(res.ok).toBe(true);
        for (let i = 0; i < n; i++) {
          const exact = hilbertInverse(n, i + 1, col + 1);
          // cond₂(H_6) ≈ 1.5e7, so ~1e-16·1.5e7 relative error is the float64 expectation.
          expect(Math.abs(res.x[i] - exact) / Math.abs(exact), `n=${n} (${i},${col})`).toBeLessThan(1e-8);
        }
      }
    }
  });

  it('equilibrates: a diagonal system with entries spanning 1e-12 … 1e12 is solved exactly', () => {
    const d = [1e-12, 1, 1e12];
    const m = new Float64Array(9);
    d.forEach((v, i) => (m[i * 3 + i] = v));
    const res = solveSymmetric(m, Float64Array.of(2e-12, 3, 4e12), 3);
    expect(res.ok).toBe(true);
    expect(Array.from(res.x)).toEqual([2, 3, 4]);
    expect(res.reciprocalCondition).toBe(1);
  });

  it('flags a singular matrix (rank 1) with ok = false and NaN instead of throwing', () => {
    const m = Float64Array.of(1, 2, 2, 4);
    const res = solveSymmetric(m, Float64Array.of(1, 2), 2);
    expect(res.ok).toBe(false);
    expect(Number.isNaN(res.x[0])).toBe(true);
    const zero = solveSymmetric(new Float64Array(4), Float64Array.of(1, 1), 2);
    expect(zero.ok).toBe(false);
  });

  it('flags an ill-conditioned but factorable matrix against the threshold', () => {
    const eps = 1e-7; // [[1, 1−eps],[1−eps, 1]]: cond ≈ 2/eps = 2e7
    const m = Float64Array.of(1, 1 - eps, 1 - eps, 1);
    expect(solveSymmetric(m, Float64Array.of(1, 1), 2).ok).toBe(true);
    expect(solveSymmetric(m, Float64Array.of(1, 1), 2, 1e-6).ok).toBe(false);
  });

  it('throws RangeError only for inconsistent sizes', () => {
    expect(() => solveSymmetric(new Float64Array(3), new Float64Array(2), 2)).toThrow(RangeError);
    expect(() => solveSymmetric(new Float64Array(4), new Float64Array(2), 0)).toThrow(RangeError);
  });
});
