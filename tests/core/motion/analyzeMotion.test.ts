import { describe, expect, it } from 'vitest';
import { analyzeMotion } from '../../../core/motion/analyzeMotion.js';
import { analyzeCapture } from '../../../core/pipeline.js';
import { secondOrderStep } from '../../../core/synth/motion.js';
import { synthesizeCapture } from '../../../core/synth/synthesizeCapture.js';
import { ARCMIN, makeTrace } from './traces.js';

const rel = (a: number, b: number): number => Math.abs(a / b - 1);

describe('analyzeMotion(t, unwrappedDeg, opts)', () => {
  it('a damped step with 2′ hunting on both levels: one step with its second-order figures, jitter of the hunting, a hunting warning', () => {
    const wn = 2 * Math.PI * 5;
    const tr = makeTrace(400, 6, (t) => 10 + 30 * secondOrderStep(t - 1, 0.3, wn) + 2 * ARCMIN * Math.sin(2 * Math.PI * 3.1 * t), 0.3 * ARCMIN, 1);
    const m = analyzeMotion(tr.t, tr.deg, { roles: ['s1s3', 's3s2', 's2s1'] });
    expect(m.segments.map((s) => s.kind)).toEqual(['stationary', 'moving', 'stationary']);
    expect(m.velocityDegPerS.length).toBe(tr.t.length);
    expect(m.steps.length).toBe(1);
    const s = m.steps[0]!;
    expect(rel(s.dampingRatio!, 0.3)).toBeLessThan(0.1);
    expect(rel(s.naturalHz!, 5)).toBeLessThan(0.05);
    // Overshoot closed form exp(−ζπ/√(1−ζ²)) (Ogata ch. 5) = 37.23 % for ζ = 0.3.
    expect(rel(s.overshootPct, 100 * Math.exp((-0.3 * Math.PI) / Math.sqrt(0.91)))).toBeLessThan(0.1);
    expect(m.jitter).not.toBeNull();
    expect(rel(m.jitter!.dominantHz[0]!, 3.1)).toBeLessThan(0.02);
    const hunting = m.findings.filter((f) => f.code === 'hunting');
    expect(hunting.length).toBe(1);
    expect(hunting[0]!.severity).toBe('warning');
    expect(hunting[0]!.roles).toEqual(['s1s3', 's3s2', 's2s1']);
    expect(rel(hunting[0]!.figures!.amplitudeArcmin!, 2)).toBeLessThan(0.1);
  });

  it('jitter after a step leaves out the ring: a quiet step gives jitter ≈ the 1′ noise and no finding', () => {
    const tr = makeTrace(400, 6, (t) => 10 + 30 * secondOrderStep(t - 1, 0.2, 2 * Math.PI * 5), ARCMIN, 2);
    const m = analyzeMotion(tr.t, tr.deg);
    expect(m.steps.length).toBe(1);
    expect(rel(m.jitter!.rmsArcmin, 1)).toBeLessThan(0.08);
    expect(m.jitter!.dominantHz).toEqual([]);
    expect(m.findings).toEqual([]);
  });

  it('velocity: a constant-speed drive reads its speed, and the jitter comes from the ramp residual', () => {
    const tr = makeTrace(400, 3, (t) => 12 + 120 * t, 0.5 * ARCMIN, 3);
    const m = analyzeMotion(tr.t, tr.deg);
    expect(m.segments.map((s) => s.kind)).toEqual(['ramp']);
    for (const v of m.velocityDegPerS) expect(Math.abs(v - 120)).toBeLessThan(2);
    expect(m.jitter!.source).toBe('ramp');
    expect(rel(m.jitter!.rmsArcmin, 0.5)).toBeLessThan(0.08);
    expect(m.steps).toEqual([]);
  });

  it('a step whose ±2 % band is narrower than the noise never settles: null settling time and a step-unsettled info finding', () => {
    // 0.5° step: the band is ±0.6′ while the noise is 1′ RMS, so the trace keeps leaving it.
    const tr = makeTrace(400, 4, (t) => 20 + 0.5 * secondOrderStep(t - 1, 0.5, 2 * Math.PI * 5), ARCMIN, 4);
    const m = analyzeMotion(tr.t, tr.deg);
    expect(m.steps.length).toBe(1);
    expect(m.steps[0]!.settlingS).toBeNull();
    const f = m.findings.filter((x) => x.code === 'step-unsettled');
    expect(f.length).toBe(1);
    expect(f[0]!.severity).toBe('info');
    // The level after the unsettled step is left out of the jitter; the level before remains.
    expect(m.jitter!.samples).toBeLessThan(400 * 1.1);
  });

  it('never throws on empty, short, all-NaN or NaN-laden traces; lengths must match (RangeError)', () => {
    for (const [t, d] of [
      [[], []],
      [[0, 0.0025, 0.005], [1, 1, 1]],
      [new Float64Array(500).map((_, i) => i / 400), new Float64Array(500).fill(NaN)],
    ] as [ArrayLike<number>, ArrayLike<number>][]) {
      const m = analyzeMotion(t, d);
      expect(m.segments).toEqual([]);
      expect(m.steps).toEqual([]);
      expect(m.jitter).toBeNull();
      expect(m.findings).toEqual([]);
      expect(m.velocityDegPerS.length).toBe(t.length);
    }
    const tr = makeTrace(400, 4, (t) => 10 + 30 * secondOrderStep(t - 1, 0.3, 2 * Math.PI * 5), ARCMIN, 5);
    for (let i = 0; i < tr.deg.length; i++) if (i % 4 === 0 || (i > 1000 && i < 1040)) tr.deg[i] = NaN;
    const m = analyzeMotion(tr.t, tr.deg);
    expect(m.steps.length).toBe(1);
    expect(m.jitter).not.toBeNull();
    expect(() => analyzeMotion([0, 1], [0])).toThrow(RangeError);
  });

  it('end to end through the demodulator: a synthetic 26 V / 11.8 V synchro at 400 Hz hunting 2′ at 3.1 Hz about a stepped angle', () => {
    // Demodulated one angle per carrier cycle; the one-cycle boxcar passes 3.1 Hz at
    // |sinc(3.1/400)| = 0.9999, so the hunting amplitude is measured as generated.
    const syn = synthesizeCapture({
      seed: 21,
      sampleRateHz: 40_000,
      durationS: 4,
      carrier: { frequencyHz: 400, rmsV: 26, phaseDeg: 10 },
      units: [
        {
          kind: 'synchro',
          transformationRatio: 11.8 / 26,
          phaseLeadDeg: 8,
          motion: {
            type: 'sum',
            parts: [
              { type: 'step', fromDeg: 40, toDeg: 70, atS: 1.5, dampingRatio: 0.35, naturalHz: 4 },
              { type: 'wobble', centreDeg: 0, amplitudeDeg: 2 / 60, frequencyHz: 3.1 },
            ],
          },
          lines: [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }],
        },
      ],
      noiseV: 0.005,
    });
    const a = analyzeCapture(syn.capture);
    const m = analyzeMotion(a.angle!.t, a.angle!.unwrappedDeg);
    expect(m.steps.length).toBe(1);
    expect(rel(m.steps[0]!.dampingRatio!, 0.35)).toBeLessThan(0.1);
    expect(rel(m.steps[0]!.naturalHz!, 4)).toBeLessThan(0.05);
    const h = m.findings.find((f) => f.code === 'hunting');
    expect(h).toBeDefined();
    expect(rel(h!.figures!.frequencyHz!, 3.1)).toBeLessThan(0.02);
    expect(rel(h!.figures!.amplitudeArcmin!, 2)).toBeLessThan(0.1);
  });
});
