import { describe, expect, it } from 'vitest';
import { TimeStampRecorder } from '../../../core/import/recordTimeStamps.js';
import { createRandom } from '../../../core/synth/random.js';

describe('TimeStampRecorder', () => {
  it('records the same stamps, exponents and line marks through addRun as through add() row by row (the oracle), growing past its first size', () => {
    const rnd = createRandom(8);
    const n = 5000;
    const times = Float64Array.from({ length: n }, (_, i) => i * 1e-6 + 1e-9 * rnd.normal());
    const exps = Int16Array.from({ length: n }, (_, i) => -7 - (i % 3));
    // Lines jump twice (blank lines between rows); runs never span a jump.
    const lineOf = (r: number): number => r + 2 + (r >= 1200 ? 3 : 0) + (r >= 4000 ? 1 : 0);
    const one = new TimeStampRecorder(100);
    for (let r = 0; r < n; r++) one.add(times[r]!, exps[r]!, 1, r, lineOf(r));
    const runs = new TimeStampRecorder(100);
    for (const [from, to] of [[0, 700], [700, 1200], [1200, 1201], [1201, 4000], [4000, n]] as const) runs.addRun(times, exps, 1, from, to, 0, lineOf(from) - from);
    expect(runs.count).toBe(n);
    expect(runs.timeS.subarray(0, n)).toEqual(one.timeS.subarray(0, n));
    expect(runs.exponent.subarray(0, n)).toEqual(one.exponent.subarray(0, n));
    expect(runs.marks.subarray(0, runs.markCount)).toEqual(one.marks.subarray(0, one.markCount));
    expect(one.markCount).toBe(6);
  });

  it('refuses stamps out of row order', () => {
    const r = new TimeStampRecorder(10);
    r.add(0, -6, 1, 0, 2);
    expect(() => r.add(1e-6, -6, 1, 2, 4)).toThrow(RangeError);
    expect(() => r.addRun(new Float64Array(3), new Int16Array(3), 1, 0, 3, 5, 7)).toThrow(RangeError);
  });

  it('clamps exponents to int16 (where powerOfTen saturates anyway)', () => {
    const r = new TimeStampRecorder(10);
    r.add(0, -40000, 1, 0, 2);
    expect(r.exponent[0]).toBe(-32768);
  });
});
