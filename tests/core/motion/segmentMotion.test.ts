import { describe, expect, it } from 'vitest';
import { motionThresholds, segmentMotion, type MotionSegment } from '../../../core/motion/segmentMotion.js';
import { secondOrderStep } from '../../../core/synth/motion.js';
import { ARCMIN, makeTrace } from './traces.js';

const FC = 400;

function expectTiling(segments: readonly MotionSegment[], n: number): void {
  expect(segments[0]!.startIndex).toBe(0);
  expect(segments[segments.length - 1]!.endIndex).toBe(n);
  for (let k = 1; k < segments.length; k++) {
    expect(segments[k]!.startIndex).toBe(segments[k - 1]!.endIndex);
    // Neighbours of the same kind would have been merged (a ramp next to a ramp may differ in speed).
    if (segments[k]!.kind !== 'ramp') expect(segments[k]!.kind).not.toBe(segments[k - 1]!.kind);
  }
}

describe('segmentMotion(t, deg, opts)', () => {
  it('a shaft at rest with 1′ noise is one stationary segment at its angle (common practice, no source)', () => {
    const tr = makeTrace(FC, 3, () => 203.7, ARCMIN, 1);
    const s = segmentMotion(tr.t, tr.deg);
    expect(s.map((x) => x.kind)).toEqual(['stationary']);
    expect(s[0]!.meanDeg).toBeCloseTo(203.7, 2);
    expectTiling(s, tr.t.length);
  });

  it('a constant-speed drive is one ramp segment with its speed, fast (120 °/s) or slow (0.2 °/s, below the velocity threshold)', () => {
    const sigma = 0.5 * ARCMIN;
    const n = 4 * FC;
    // Standard error of a least-squares slope over N points spanning T: σ·√(12/(N T²)) (ordinary least squares).
    const slopeSe = sigma * Math.sqrt(12 / (n * 16));
    for (const degPerS of [120, 0.2, -35]) {
      const tr = makeTrace(FC, 4, (t) => 12 + degPerS * t, sigma, 2);
      const s = segmentMotion(tr.t, tr.deg);
      expect(s.map((x) => x.kind)).toEqual(['ramp']);
      expect(Math.abs(s[0]!.degPerS - degPerS)).toBeLessThan(5 * slopeSe);
    }
  });

  it('a staircase of three damped steps alternates stationary and moving, with each move starting within 30 ms of its step', () => {
    const steps = [1, 2.5, 4];
    const tr = makeTrace(FC, 5.5, (t) => steps.reduce((a, at, k) => a + 10 * (k + 1) * secondOrderStep(t - at, 0.4, 2 * Math.PI * 6), 30), ARCMIN, 3);
    const s = segmentMotion(tr.t, tr.deg);
    expect(s.map((x) => x.kind)).toEqual(['stationary', 'moving', 'stationary', 'moving', 'stationary', 'moving', 'stationary']);
    const moves = s.filter((x) => x.kind === 'moving');
    moves.forEach((m, k) => expect(Math.abs(m.startS - steps[k]!)).toBeLessThan(0.03));
    expectTiling(s, tr.t.length);
  });

  it('hunting about a fixed angle stays stationary: the velocity spread raises the on-threshold above its peak velocity', () => {
    for (const amplitudeArcmin of [2, 10, 40]) {
      const tr = makeTrace(FC, 5, (t) => 45 + amplitudeArcmin * ARCMIN * Math.sin(2 * Math.PI * 3.1 * t), 0.3 * ARCMIN, 4);
      const th = motionThresholds(tr.t, tr.deg)!;
      // Peak velocity 2π·f·A; the robust spread of A·ω·cos is 1.4826·0.7071·Aω ≈ 1.05 Aω, and on = 3× that.
      const peak = 2 * Math.PI * 3.1 * amplitudeArcmin * ARCMIN;
      expect(th.onDegPerS).toBeGreaterThan(2 * peak);
      expect(segmentMotion(tr.t, tr.deg).map((x) => x.kind)).toEqual(['stationary']);
      // Forced down to the noise-only threshold, the excursion rule still holds it: no net change of level, range < 2°.
      const forced = segmentMotion(tr.t, tr.deg, { onDegPerS: 6 * th.velocityNoiseDegPerS });
      expect(forced.map((x) => x.kind)).toEqual(['stationary']);
    }
  });

  it('a sweep larger than maxOscillationDeg (±5° at 0.5 Hz) is motion, not jitter', () => {
    const tr = makeTrace(FC, 6, (t) => 90 + 5 * Math.sin(2 * Math.PI * 0.5 * t), 0.3 * ARCMIN, 12);
    expect(segmentMotion(tr.t, tr.deg).map((x) => x.kind)).not.toContain('stationary');
  });

  it('thresholds come from the trace noise (MAD of second differences) and can be overridden', () => {
    const tr = makeTrace(FC, 3, (t) => (t > 1.5 ? 20 : 0), 2 * ARCMIN, 5);
    const th = motionThresholds(tr.t, tr.deg)!;
    expect(th.noiseDeg / (2 * ARCMIN)).toBeCloseTo(1, 1);
    expect(th.offDegPerS).toBeCloseTo(th.onDegPerS / 2, 12);
    expect(segmentMotion(tr.t, tr.deg).map((x) => x.kind)).toEqual(['stationary', 'moving', 'stationary']);
    // An excursion threshold above the step size turns the step into... no move at all.
    expect(segmentMotion(tr.t, tr.deg, { minExcursionDeg: 50, maxOscillationDeg: 50 }).map((x) => x.kind)).not.toContain('moving');
    expect(motionThresholds(tr.t, tr.deg, { noiseDeg: 0.1, onDegPerS: 7 })!.onDegPerS).toBe(7);
  });

  it('never throws on bad data: short, all-NaN and NaN-laden traces', () => {
    expect(segmentMotion([0, 1, 2], [1, 2, 3])).toEqual([]);
    expect(segmentMotion(new Float64Array(100), new Float64Array(100).fill(NaN))).toEqual([]);
    const tr = makeTrace(FC, 3, (t) => (t > 1.5 ? 20 : 0), ARCMIN, 6);
    for (let i = 0; i < tr.deg.length; i += 3) tr.deg[i] = NaN;
    const s = segmentMotion(tr.t, tr.deg);
    expectTiling(s, tr.t.length);
    expect(s.map((x) => x.kind)).toEqual(['stationary', 'moving', 'stationary']);
    expect(() => segmentMotion([0, 1], [0])).toThrow(RangeError);
  });
});
