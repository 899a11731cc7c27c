import { describe, expect, it } from 'vitest';
import { lineBasis, linePattern, redecodeAngle } from '../../../core/diagnostics/linePatterns.js';

const DEG = Math.PI / 180;

describe('linePattern(role) and redecodeAngle', () => {
  it('standard synchro equations (NEETS Module 15): S1-S3 ∝ sin θ, S3-S2 ∝ sin(θ+120°), S2-S1 ∝ sin(θ+240°), reversed pairs negated; resolver sin/cos', () => {
    for (const th of [0, 17, 90, 200, 333]) {
      const t = th * DEG;
      expect(linePattern('s1s3')!(t)).toBeCloseTo(Math.sin(t), 12);
      expect(linePattern('s3s2')!(t)).toBeCloseTo(Math.sin(t + 120 * DEG), 12);
      expect(linePattern('coarse.s2s1')!(t)).toBeCloseTo(Math.sin(t + 240 * DEG), 12);
      expect(linePattern('s2s3')!(t)).toBeCloseTo(-Math.sin(t + 120 * DEG), 12);
      expect(linePattern('sin')!(t)).toBeCloseTo(Math.sin(t), 12);
      expect(linePattern('fine.cos')!(t)).toBeCloseTo(Math.cos(t), 12);
      // The three lines sum to zero (Kirchhoff's voltage law round S1, S2, S3).
      expect(linePattern('s1s3')!(t) + linePattern('s3s2')!(t) + linePattern('s2s1')!(t)).toBeCloseTo(0, 12);
    }
    expect(lineBasis('ref')).toBeUndefined();
  });

  it('redecodeAngle recovers θ exactly from line models z = s·p(θ) + c, and declines with one line', () => {
    const roles = ['s1s3', 's3s2', 's2s1'];
    const slopes = [{ re: 16, im: 2, cRe: 0.01, cIm: 0.2 }, { re: 15.9, im: 2.1, cRe: -0.02, cIm: -0.1 }, { re: 16.1, im: 1.9, cRe: 0, cIm: -0.1 }];
    const truth = [3, 95, 181, 299].map((d) => d * DEG);
    const lines = roles.map((role, k) => {
      const s = slopes[k]!;
      const p = truth.map((t) => linePattern(role)!(t));
      return { inPhaseV: p.map((v) => s.re * v + s.cRe), quadratureV: p.map((v) => s.im * v + s.cIm) };
    });
    const theta = new Float64Array(truth.length);
    expect(redecodeAngle(theta, lines, roles.map((r) => lineBasis(r)!), slopes)).toBe(true);
    truth.forEach((t, m) => expect(Math.abs(Math.atan2(Math.sin(theta[m]! - t), Math.cos(theta[m]! - t)))).toBeLessThan(1e-12));
    expect(redecodeAngle(theta, lines, roles.map((r) => lineBasis(r)!), [slopes[0], undefined, undefined])).toBe(false);
  });
});
