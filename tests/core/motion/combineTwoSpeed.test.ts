import { describe, expect, it } from 'vitest';
import { angleDiffDeg, wrapDeg } from '../../../core/angle/unwrapDeg.js';
import { combineTwoSpeed, detectSpeedRatio } from '../../../core/motion/combineTwoSpeed.js';
import { createRandom } from '../../../core/synth/random.js';

// Two-speed 1X/36X course-indicator synchros: TM 55-1905-219-14-11 and TM 55-1905-220-14-11, para 5-117
// (coarse picks the fine sector; the fine unit turns 36 times per coarse turn). The arithmetic check values
// below are derived from that relation (θ = (360·n + θf)/N with n = round((N·θc − θf)/360)).
describe('combineTwoSpeed(coarseDeg, fineDeg, speedRatio)', () => {
  it('gives the 1X/36X check values: coarse 100.3°, fine 12.0° → 100.333°', () => {
    const r = combineTwoSpeed([100.3], [12.0], 36);
    expect(r.deg[0]).toBeCloseTo(100 + 1 / 3, 3);
    expect(r.coarseErrorDeg[0]).toBeCloseTo(100.3 - (100 + 1 / 3), 9);
    expect(r.findings).toEqual([]);
  });

  it('gives the wrap case: coarse 0.2°, fine 354.0° → 359.833°', () => {
    const r = combineTwoSpeed([0.2], [354.0], 36);
    expect(r.deg[0]).toBeCloseTo(359 + 5 / 6, 3);
    expect(r.coarseErrorDeg[0]).toBeCloseTo(0.2 + 1 / 6, 9);
  });

  it('has the ambiguity limit 180°/N = 5° for 36X (derived from the sector width 360°/N)', () => {
    expect(combineTwoSpeed([0], [0], 36).limitDeg).toBe(5);
  });

  it('follows a turning shaft exactly while the coarse error stays inside ±5° (36X)', () => {
    const rnd = createRandom(3);
    const truth: number[] = [];
    const coarse: number[] = [];
    const fine: number[] = [];
    for (let i = 0; i < 4000; i++) {
      const th = 20 + i * 0.11; // a bit over one coarse turn
      truth.push(th);
      coarse.push(wrapDeg(th + 4.9 * Math.sin(i / 97))); // coarse error up to 4.9°
      fine.push(wrapDeg(36 * th + 0.02 * rnd.normal()));
    }
    const r = combineTwoSpeed(coarse, fine, 36);
    let worst = 0;
    for (let i = 0; i < truth.length; i++) worst = Math.max(worst, Math.abs(angleDiffDeg(r.deg[i]!, truth[i]!)));
    expect(worst).toBeLessThan(0.01); // fine noise / 36
    expect(r.ambiguousSamples).toBe(0);
    expect(Math.abs(r.worstCoarseErrorDeg)).toBeCloseTo(4.9, 1);
    expect(r.unwrappedDeg[3999]! - r.unwrappedDeg[0]!).toBeCloseTo(3999 * 0.11, 1);
  });

  it('flags coarse excursions beyond ±5° with a two-speed-ambiguous warning and keeps the fine sector', () => {
    const truth: number[] = [];
    const coarse: number[] = [];
    const fine: number[] = [];
    for (let i = 0; i < 1000; i++) {
      const th = 200 + i * 0.05;
      truth.push(th);
      const spike = i >= 500 && i < 510 ? 6.5 : 0.3; // ten cycles with a 6.5° coarse error
      coarse.push(wrapDeg(th + spike));
      fine.push(wrapDeg(36 * th));
    }
    const r = combineTwoSpeed(coarse, fine, 36, { roles: ['coarse', 'fine'] });
    expect(r.ambiguousSamples).toBe(10);
    expect(r.worstCoarseErrorDeg).toBeCloseTo(6.5, 6);
    expect(r.findings).toHaveLength(1);
    expect(r.findings[0]!.code).toBe('two-speed-ambiguous');
    expect(r.findings[0]!.severity).toBe('warning');
    expect(r.findings[0]!.figures).toMatchObject({ ambiguousCycles: 10, limitDeg: 5 });
    for (let i = 0; i < truth.length; i++) expect(Math.abs(angleDiffDeg(r.deg[i]!, truth[i]!))).toBeLessThan(1e-9);
  });

  // Stick-off: 2.5 V moves the 1X nulls 2.5°, the 1X stator is turned 5° in all = 180° of 36X
  // (TM 55-1905-220-14-11 para 5-117).
  it('removes a 5° stick-off bias from the coarse angle before combining', () => {
    const coarse: number[] = [];
    const fine: number[] = [];
    const truth: number[] = [];
    for (let i = 0; i < 200; i++) {
      const th = 10 + i * 1.7;
      truth.push(th);
      coarse.push(wrapDeg(th + 5 + 0.5 * Math.sin(i)));
      fine.push(wrapDeg(36 * th));
    }
    const r = combineTwoSpeed(coarse, fine, 36, { stickOffDeg: 5 });
    for (let i = 0; i < truth.length; i++) expect(Math.abs(angleDiffDeg(r.deg[i]!, truth[i]!))).toBeLessThan(1e-9);
    expect(r.ambiguousSamples).toBe(0);
    // left in, the same bias is a coarse error of 5° ± 0.5°: about half the cycles pick the wrong sector
    expect(combineTwoSpeed(coarse, fine, 36).ambiguousSamples).toBeGreaterThan(40);
  });

  it('carries NaN through and throws RangeError for bad arguments', () => {
    const r = combineTwoSpeed([100.3, NaN, 100.4], [12.0, 15, NaN], 36);
    expect(r.deg[0]).toBeCloseTo(100.333, 3);
    expect(Number.isNaN(r.deg[1]!)).toBe(true);
    expect(Number.isNaN(r.deg[2]!)).toBe(true);
    expect(() => combineTwoSpeed([1], [1, 2], 36)).toThrow(RangeError);
    expect(() => combineTwoSpeed([1], [1], 0)).toThrow(RangeError);
    expect(() => combineTwoSpeed([1], [1], 2.5)).toThrow(RangeError);
  });
});

describe('detectSpeedRatio(coarseUnwrappedDeg, fineUnwrappedDeg)', () => {
  it('finds 36 from a 40° coarse travel with noise, and 8 from an 8X pair (common practice, no source)', () => {
    const rnd = createRandom(9);
    const c: number[] = [];
    const f36: number[] = [];
    const f8: number[] = [];
    for (let i = 0; i < 500; i++) {
      const th = i * 0.08;
      c.push(th + 0.5 * rnd.normal());
      f36.push(36 * th + 0.05 * rnd.normal());
      f8.push(8 * th + 0.05 * rnd.normal());
    }
    expect(detectSpeedRatio(c, f36)).toBe(36);
    expect(detectSpeedRatio(c, f8)).toBe(8);
  });

  it('is undefined when the coarse hardly moves, runs the other way, or the ratio is not near an integer', () => {
    const c = Array.from({ length: 100 }, (_, i) => i * 0.02); // 2° of travel
    expect(detectSpeedRatio(c, c.map((x) => 36 * x))).toBeUndefined();
    const c2 = Array.from({ length: 100 }, (_, i) => i * 0.5);
    expect(detectSpeedRatio(c2, c2.map((x) => -36 * x))).toBeUndefined();
    expect(detectSpeedRatio(c2, c2.map((x) => 7.5 * x))).toBeUndefined();
    expect(detectSpeedRatio(c2, c2.map((x) => 1 * x))).toBe(1);
  });
});
