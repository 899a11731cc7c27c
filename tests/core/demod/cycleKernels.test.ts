import { describe, expect, it } from 'vitest';
import { EXTREMES_STATE, fillCycleTable, projectPair } from '../../../core/demod/cycleKernels.js';
import { createRandom } from '../../../core/synth/random.js';

/** Direct sums with Math.sin/Math.cos at every sample (the oracle; common practice, no source). */
function directSums(x: Float32Array, start: number, length: number, phase: number, w: number): [number, number, number] {
  let s = 0, c = 0, one = 0;
  for (let i = 0; i < length; i++) {
    s += x[start + i]! * Math.sin(phase + i * w);
    c += x[start + i]! * Math.cos(phase + i * w);
    one += x[start + i]!;
  }
  return [s, c, one];
}

describe('cycle kernels', () => {
  it('fillCycleTable steps sin/cos by rotation to within 1e-12 of Math.sin/Math.cos over 5000 steps, and sums them', () => {
    const length = 5000;
    const phase = 2.1;
    const w = (2 * Math.PI) / 4999.3;
    const sinBuf = new Float64Array(length);
    const cosBuf = new Float64Array(length);
    const sums = new Float64Array(6);
    fillCycleTable(phase, w, length, sinBuf, cosBuf, sums);
    let ss = 0, sc = 0, cc = 0, s1 = 0, c1 = 0;
    for (let i = 0; i < length; i++) {
      const s = Math.sin(phase + i * w);
      const c = Math.cos(phase + i * w);
      expect(Math.abs(sinBuf[i]! - s)).toBeLessThan(1e-12);
      expect(Math.abs(cosBuf[i]! - c)).toBeLessThan(1e-12);
      ss += s * s;
      sc += s * c;
      cc += c * c;
      s1 += s;
      c1 += c;
    }
    [ss, sc, cc, s1, c1].forEach((want, k) => expect(Math.abs(sums[k]! - want)).toBeLessThan(1e-8));
  });

  it('projectPair matches direct sums, also with one channel as both (an odd channel), and carries the extremes across calls (seeded, quantised so that samples tie)', () => {
    const random = createRandom(7);
    const n = 3000;
    const x = Float32Array.from({ length: n }, () => Math.round(random.normal() * 6) / 4);
    const y = Float32Array.from({ length: n }, () => Math.round(random.normal() * 3) / 2);
    const length = 1000;
    const w = (2 * Math.PI) / 997;
    const sinBuf = new Float64Array(length);
    const cosBuf = new Float64Array(length);
    const sums = new Float64Array(6);
    const fresh = (): Float64Array => Float64Array.from([Infinity, -Infinity, 0, 0, Infinity, -Infinity, 0, 0]);
    const ext = fresh();
    const extSelf = fresh();
    for (let start = 0; start < n; start += length) {
      fillCycleTable(0.4, w, length, sinBuf, cosBuf, sums);
      projectPair(x, y, start, length, sinBuf, cosBuf, sums, ext, 0);
      const [xs, xc, x1] = directSums(x, start, length, 0.4, w);
      const [ys, yc, y1] = directSums(y, start, length, 0.4, w);
      [xs, xc, x1, ys, yc, y1].forEach((want, k) => expect(Math.abs(sums[k]! - want)).toBeLessThan(1e-9));
      const paired = sums.slice(3, 6);
      // y with itself: both halves give y's sums as y gets them beside x, bit for bit.
      projectPair(y, y, start, length, sinBuf, cosBuf, sums, extSelf, 0);
      expect(sums.slice(0, 3)).toEqual(paired);
      expect(sums.slice(3, 6)).toEqual(paired);
    }
    for (const [state, o, v] of [[ext, 0, x], [ext, EXTREMES_STATE, y], [extSelf, 0, y], [extSelf, EXTREMES_STATE, y]] as const) {
      const lo = v.reduce((a, b) => Math.min(a, b), Infinity);
      const hi = v.reduce((a, b) => Math.max(a, b), -Infinity);
      expect([...state.subarray(o, o + 4)]).toEqual([lo, hi, v.filter((s) => s === lo).length, v.filter((s) => s === hi).length]);
    }
  });
});
