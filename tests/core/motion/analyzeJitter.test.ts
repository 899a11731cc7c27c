import { describe, expect, it } from 'vitest';
import { analyzeJitter, huntingFinding } from '../../../core/motion/analyzeJitter.js';
import { segmentMotion, type MotionSegment } from '../../../core/motion/segmentMotion.js';
import { ARCMIN, addTo, makeTrace, type Trace } from './traces.js';

function jitterOf(tr: Trace) {
  return analyzeJitter(tr.t, tr.deg, segmentMotion(tr.t, tr.deg))!;
}

const rel = (a: number, b: number): number => Math.abs(a / b - 1);
const wobble = (amplitudeArcmin: number, hz: number, phase = 0.3) => (t: number) => amplitudeArcmin * ARCMIN * Math.sin(2 * Math.PI * hz * t + phase);

describe('analyzeJitter(t, deg, segments)', () => {
  it('white noise: RMS = σ within 5 %, peak-to-peak within the Gaussian range, PSD level 2σ²/fs (one-sided density, Welch 1967), no tone', () => {
    const tr = makeTrace(400, 10, () => 77, 0.8 * ARCMIN, 1);
    const j = jitterOf(tr);
    expect(j.source).toBe('stationary');
    expect(rel(j.rmsArcmin, 0.8)).toBeLessThan(0.05);
    // 4000 Gaussian samples span about ±3.5σ (expected range of the sample extremes).
    expect(j.ppArcmin / 0.8).toBeGreaterThan(5.5);
    expect(j.ppArcmin / 0.8).toBeLessThan(9);
    // Median of a χ² PSD estimate sits a little below its mean; ±10 % covers it with ≥ 4 averages.
    expect(rel(j.noiseFloorArcmin2PerHz!, (2 * 0.8 * 0.8) / 400)).toBeLessThan(0.1);
    expect(rel(j.bandRmsArcmin!, j.rmsArcmin)).toBeLessThan(0.05);
    expect(j.dominantHz).toEqual([]);
    expect(j.hunting).toBeNull();
  });

  it('false-alarm rate: no hunting and no tone on 20 seeded white-noise traces (our rule: ≥ 10 dB above the median PSD and ≥ 3× the RMS of the rest)', () => {
    let alarms = 0;
    for (let seed = 100; seed < 120; seed++) {
      const j = jitterOf(makeTrace(400, 5, () => 12.3, ARCMIN, seed));
      if (j.hunting !== null || j.dominantHz.length > 0) alarms++;
    }
    expect(alarms).toBe(0);
  });

  for (const fc of [50, 400, 10_000]) {
    it(`wobble 2′ at 3.1 Hz in 0.3′ noise at a ${fc} Hz cycle rate: amplitude within 10 %, frequency within 2 %, hunting found`, () => {
      const tr = makeTrace(fc, 5, (t) => 123.4 + wobble(2, 3.1)(t), 0.3 * ARCMIN, 3);
      const j = jitterOf(tr);
      expect(j.tones.length).toBeGreaterThanOrEqual(1);
      expect(rel(j.tones[0]!.frequencyHz, 3.1)).toBeLessThan(0.02);
      expect(rel(j.tones[0]!.amplitudeArcmin, 2)).toBeLessThan(0.1);
      // RMS of a sine of amplitude A plus noise σ: √(A²/2 + σ²).
      expect(rel(j.rmsArcmin, Math.sqrt(2 + 0.09))).toBeLessThan(0.05);
      expect(j.hunting).not.toBeNull();
      expect(rel(j.hunting!.frequencyHz, 3.1)).toBeLessThan(0.02);
      expect(rel(j.hunting!.amplitudeArcmin, 2)).toBeLessThan(0.1);
      expect(j.hunting!.sustainedRatio).toBeGreaterThan(0.9);
    });
  }

  it('two tones (3.1 Hz at 2′ and 11.7 Hz at 0.7′) are both found with their amplitudes; only the strong one is hunting', () => {
    const tr = makeTrace(400, 5, (t) => 50 + wobble(2, 3.1)(t) + wobble(0.7, 11.7, 1)(t), 0.3 * ARCMIN, 4);
    const j = jitterOf(tr);
    expect(j.dominantHz.length).toBe(2);
    expect(rel(j.dominantHz[0]!, 3.1)).toBeLessThan(0.02);
    expect(rel(j.dominantHz[1]!, 11.7)).toBeLessThan(0.02);
    expect(rel(j.tones[0]!.amplitudeArcmin, 2)).toBeLessThan(0.1);
    expect(rel(j.tones[1]!.amplitudeArcmin, 0.7)).toBeLessThan(0.1);
    expect(rel(j.hunting!.frequencyHz, 3.1)).toBeLessThan(0.02);
  });

  it('a weak tone (0.4′ in 1′ noise) is listed but is not hunting: it is not 3× the rest', () => {
    const j = jitterOf(makeTrace(400, 10, (t) => 5 + wobble(0.4, 7.3)(t), ARCMIN, 6));
    expect(j.dominantHz.length).toBe(1);
    expect(rel(j.dominantHz[0]!, 7.3)).toBeLessThan(0.02);
    expect(j.hunting).toBeNull();
  });

  it('a decaying ring is not hunting: its amplitude is not sustained over the record', () => {
    const j = jitterOf(makeTrace(400, 5, (t) => 5 + 3 * ARCMIN * Math.exp(-1.5 * t) * Math.sin(2 * Math.PI * 4 * t), 0.1 * ARCMIN, 7));
    expect(j.tones.length).toBeGreaterThan(0);
    expect(j.hunting).toBeNull();
  });

  it('property: adding a constant angle or a ramp leaves every jitter figure unchanged (the fitted line is removed first)', () => {
    const base = makeTrace(400, 5, (t) => 50 + wobble(2, 3.1)(t) + wobble(0.7, 11.7, 1)(t), 0.3 * ARCMIN, 8);
    const j0 = jitterOf(base);
    for (const extra of [(): number => 1000, (t: number) => 20 * t, (t: number) => -0.2 * t, (t: number) => 300 - 90 * t]) {
      const j = jitterOf(addTo(base, extra));
      expect(j.rmsArcmin).toBeCloseTo(j0.rmsArcmin, 6);
      expect(j.ppArcmin).toBeCloseTo(j0.ppArcmin, 6);
      expect(j.dominantHz.length).toBe(j0.dominantHz.length);
      j.dominantHz.forEach((f, k) => expect(f).toBeCloseTo(j0.dominantHz[k]!, 6));
      j.tones.forEach((x, k) => expect(x.amplitudeArcmin).toBeCloseTo(j0.tones[k]!.amplitudeArcmin, 6));
    }
  });

  it('pools several stationary segments, falls back to ramp segments, and returns null without usable ones', () => {
    const tr = makeTrace(400, 6, () => 0, ARCMIN, 9);
    const seg = (a: number, b: number, kind: MotionSegment['kind']): MotionSegment => ({ startIndex: a, endIndex: b, startS: tr.t[a]!, endS: tr.t[b - 1]!, kind, meanDeg: 0, degPerS: 0 });
    const pooled = analyzeJitter(tr.t, tr.deg, [seg(0, 800, 'stationary'), seg(800, 1600, 'moving'), seg(1600, 2400, 'stationary')])!;
    expect(pooled.segmentsUsed).toBe(2);
    expect(pooled.samples).toBe(1600);
    expect(rel(pooled.rmsArcmin, 1)).toBeLessThan(0.06);
    expect(analyzeJitter(tr.t, tr.deg, [seg(0, 2400, 'ramp')])!.source).toBe('ramp');
    expect(analyzeJitter(tr.t, tr.deg, [seg(0, 2400, 'moving')])).toBeNull();
    expect(analyzeJitter(tr.t, tr.deg, [seg(0, 20, 'stationary')])).toBeNull();
  });

  it('bridges NaN points for the PSD and still finds the tone', () => {
    const tr = makeTrace(400, 5, (t) => 9 + wobble(2, 3.1)(t), 0.3 * ARCMIN, 10);
    for (let i = 0; i < tr.deg.length; i += 11) tr.deg[i] = NaN;
    const j = jitterOf(tr);
    expect(rel(j.dominantHz[0]!, 3.1)).toBeLessThan(0.02);
    expect(j.samples).toBe(tr.deg.length - Math.ceil(tr.deg.length / 11));
  });

  it('huntingFinding: code hunting, severity warning, frequency and peak amplitude in figures', () => {
    const j = jitterOf(makeTrace(400, 5, (t) => 1 + wobble(2, 3.1)(t), 0.3 * ARCMIN, 11));
    const f = huntingFinding(j.hunting!, ['s1s3']);
    expect(f.code).toBe('hunting');
    expect(f.severity).toBe('warning');
    expect(f.roles).toEqual(['s1s3']);
    expect(rel(f.figures!.frequencyHz!, 3.1)).toBeLessThan(0.02);
    expect(rel(f.figures!.amplitudeArcmin!, 2)).toBeLessThan(0.1);
    // Worded for the records it was found on: a shaft at rest, or one turning steadily.
    expect(f.message).toContain('should be at rest');
    const turning = huntingFinding(j.hunting!, ['s1s3'], 'ramp');
    expect(turning.message).toContain('should turn at a steady speed');
    expect(turning.message).not.toContain('at rest');
  });
});
