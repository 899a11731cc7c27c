import { describe, expect, it } from 'vitest';
import { detectSteps } from '../../../core/motion/detectSteps.js';
import { measureStep, type StepResult } from '../../../core/motion/measureStep.js';
import { segmentMotion } from '../../../core/motion/segmentMotion.js';
import { secondOrderStep } from '../../../core/synth/motion.js';
import { ARCMIN, exactCrossingS, exactSettlingS, makeTrace, type Trace } from './traces.js';

const FC = 400; // one angle per cycle of a 400 Hz carrier

function stepsOf(tr: Trace): StepResult[] {
  const segments = segmentMotion(tr.t, tr.deg);
  return detectSteps(tr.t, tr.deg, segments).map((w) => measureStep(tr.t, tr.deg, w)!);
}

const rel = (a: number, b: number): number => Math.abs(a / b - 1);

describe('detectSteps + measureStep on second-order steps with known ζ and ωn (400 Hz cycle rate, 1′ noise)', () => {
  // Closed forms for the standard second-order system (K. Ogata, Modern Control Engineering,
  // 5th ed., ch. 5): Mp = exp(−ζπ/√(1−ζ²)), tp = π/ωd, ωd = ωn√(1−ζ²); the 10–90 % rise time
  // and the 2 % settling time (last exit from the band, IEEE Std 181-2011) are found on the
  // closed-form response itself by bisection.
  const cases = [
    { zeta: 0.2, fn: 5, from: 10, to: 40 },
    { zeta: 0.35, fn: 3, from: 250, to: 205 },
    { zeta: 0.6, fn: 8, from: -20, to: 15 },
  ];
  for (const c of cases) {
    it(`ζ = ${c.zeta}, fn = ${c.fn} Hz, ${c.from}° → ${c.to}°: overshoot and ζ within 10 %, settling within 15 %, ωn within 5 %`, () => {
      const wn = 2 * Math.PI * c.fn;
      const atS = 1;
      const u = (tau: number): number => secondOrderStep(tau, c.zeta, wn);
      const tr = makeTrace(FC, 4, (t) => c.from + (c.to - c.from) * u(t - atS), ARCMIN, Math.round(c.zeta * 100));
      const steps = stepsOf(tr);
      expect(steps.length).toBe(1);
      const s = steps[0]!;
      const mp = Math.exp((-c.zeta * Math.PI) / Math.sqrt(1 - c.zeta ** 2));
      const wd = wn * Math.sqrt(1 - c.zeta ** 2);
      const settle = exactSettlingS(u, 0.02, 3);
      const rise = exactCrossingS(u, 0.9, 2) - exactCrossingS(u, 0.1, 2);

      expect(Math.abs(s.tS - atS)).toBeLessThan(0.0025); // within one cycle
      expect(s.fromDeg).toBeCloseTo(c.from, 1);
      expect(s.toDeg).toBeCloseTo(c.to, 1);
      expect(rel(s.overshootPct, 100 * mp)).toBeLessThan(0.1);
      expect(s.dampingSource).toBe('fit');
      expect(rel(s.dampingRatio!, c.zeta)).toBeLessThan(0.1);
      expect(rel(s.naturalHz!, c.fn)).toBeLessThan(0.05);
      expect(rel(s.settlingS!, settle)).toBeLessThan(0.15);
      expect(rel(s.peakTimeS!, Math.PI / wd)).toBeLessThan(0.05);
      expect(rel(s.riseTimeS!, rise)).toBeLessThan(0.05);
      // The other two estimates alongside: overshoot formula and logarithmic decrement.
      expect(rel(s.fromOvershoot!.dampingRatio, c.zeta)).toBeLessThan(0.1);
      expect(rel(s.fromOvershoot!.naturalHz, c.fn)).toBeLessThan(0.05);
      expect(rel(s.fromDecrement!.dampingRatio, c.zeta)).toBeLessThan(0.1);
      expect(rel(s.fromDecrement!.naturalHz, c.fn)).toBeLessThan(0.05);
      expect(s.settlingBandArcmin).toBeCloseTo(0.02 * Math.abs(c.to - c.from) * 60, 0);
      // After settling only the decaying ring and the 1′ noise remain, inside the band.
      expect(s.residualArcmin!).toBeGreaterThan(0.9);
      expect(s.residualArcmin!).toBeLessThan(s.settlingBandArcmin);
    });
  }

  it('worked check ζ = 0.2, ωn = 2π·5 (noise-free): overshoot 52.662 %, 2 % settling 0.624 s, ζ from overshoot and from decrement 0.200', () => {
    // Mp from the closed form exp(−ζπ/√(1−ζ²)) = 52.662 % (Ogata ch. 5); the actual 2 % settling
    // time of this response is 0.624 s, against the common estimate 4/(ζωn) = 0.637 s
    // (both computed from the closed form, not measured data).
    const wn = 2 * Math.PI * 5;
    expect(100 * Math.exp((-0.2 * Math.PI) / Math.sqrt(0.96))).toBeCloseTo(52.662, 3);
    expect(exactSettlingS((tau) => secondOrderStep(tau, 0.2, wn), 0.02, 3)).toBeCloseTo(0.624, 3);
    expect(4 / (0.2 * wn)).toBeCloseTo(0.637, 3);
    const tr = makeTrace(FC, 4, (t) => 100 + 20 * secondOrderStep(t - 1, 0.2, wn), 0, 1);
    const s = stepsOf(tr)[0]!;
    expect(s.overshootPct).toBeCloseTo(52.662, 1);
    expect(s.settlingS!).toBeCloseTo(0.624, 2);
    expect(s.fromOvershoot!.dampingRatio).toBeCloseTo(0.2, 3);
    expect(s.fromDecrement!.dampingRatio).toBeCloseTo(0.2, 2);
    expect(s.dampingRatio!).toBeCloseTo(0.2, 5);
    expect(s.naturalHz!).toBeCloseTo(5, 4);
  });

  it('overdamped step (ζ = 1.5): no overshoot, no overshoot or decrement estimate, ζ from the fit only within 10 %', () => {
    const tr = makeTrace(FC, 4, (t) => 5 + 25 * secondOrderStep(t - 1, 1.5, 2 * Math.PI * 4), ARCMIN, 77);
    const s = stepsOf(tr)[0]!;
    expect(s.overshootPct).toBe(0);
    expect(s.peakTimeS).toBeNull();
    expect(s.fromOvershoot).toBeNull();
    expect(s.fromDecrement).toBeNull();
    expect(s.dampingSource).toBe('fit');
    expect(rel(s.dampingRatio!, 1.5)).toBeLessThan(0.1);
    expect(rel(s.naturalHz!, 4)).toBeLessThan(0.05);
    const settle = exactSettlingS((tau) => secondOrderStep(tau, 1.5, 2 * Math.PI * 4), 0.02, 3);
    expect(rel(s.settlingS!, settle)).toBeLessThan(0.15);
  });

  it('a staircase gives one result per step, in order, each with its own levels', () => {
    const at = [0.8, 2.3, 3.8];
    const levels = [0, 15, 45, 30];
    const tr = makeTrace(FC, 5.5, (t) => at.reduce((a, s, k) => a + (levels[k + 1]! - levels[k]!) * secondOrderStep(t - s, 0.45, 2 * Math.PI * 7), 0), ARCMIN, 5);
    const steps = stepsOf(tr);
    expect(steps.map((s) => Math.round(s.toDeg))).toEqual([15, 45, 30]);
    steps.forEach((s, k) => {
      expect(Math.abs(s.tS - at[k]!)).toBeLessThan(0.0025);
      expect(rel(s.dampingRatio!, 0.45)).toBeLessThan(0.1);
    });
  });

  it('an ideal (instant) step and a NaN-laden step do not throw; the ideal one has no second-order fit', () => {
    const ideal = makeTrace(FC, 3, (t) => (t >= 1.5 ? 30 : 0), 0.5 * ARCMIN, 9);
    const si = stepsOf(ideal);
    expect(si.length).toBe(1);
    expect(si[0]!.settlingS!).toBeLessThan(0.01);
    expect(si[0]!.overshootPct).toBe(0);
    const tr = makeTrace(FC, 4, (t) => 10 + 30 * secondOrderStep(t - 1, 0.3, 2 * Math.PI * 5), ARCMIN, 10);
    for (let i = 0; i < tr.deg.length; i += 7) tr.deg[i] = NaN;
    const s = stepsOf(tr)[0]!;
    expect(rel(s.dampingRatio!, 0.3)).toBeLessThan(0.1);
  });
});
