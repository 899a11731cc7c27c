import { describe, expect, it } from 'vitest';
import { carrierFrequencyHzAt } from '../../../core/carrier/carrierTrack.js';
import { trackCarrier } from '../../../core/carrier/trackCarrier.js';
import { CaptureError } from '../../../core/model/errors.js';
import { synthesizeCapture, type SynthSpec } from '../../../core/synth/synthesizeCapture.js';

const spec = (over: Partial<SynthSpec> & { driftHzPerS?: number; frequencyHz?: number } = {}): SynthSpec => ({
  seed: over.seed ?? 5,
  sampleRateHz: over.sampleRateHz ?? 50_000,
  durationS: over.durationS ?? 1,
  carrier: { frequencyHz: over.frequencyHz ?? 400.37, rmsV: 26, phaseDeg: 17, driftHzPerS: over.driftHzPerS ?? 0 },
  includeReference: over.includeReference ?? true,
  units: [
    {
      kind: 'synchro',
      transformationRatio: 0.4538,
      phaseLeadDeg: 8,
      motion: { type: 'ramp', startDeg: 20, degPerS: 200 },
      lines: [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }],
    },
  ],
  noiseV: 0.02,
  quantization: { bits: 12 },
});

// Kay 1993 ch.3 (real tone in white noise): var(f) >= 12 fs² / ((2π)² η N (N² − 1)), η = A²/(2σ²).
const crlbStdHz = (fs: number, n: number, amplitude: number, sigma: number): number =>
  Math.sqrt((12 * fs * fs) / ((2 * Math.PI) ** 2 * (amplitude ** 2 / (2 * sigma ** 2)) * n * (n * n - 1)));

describe('trackCarrier(sources, kind, fs, n)', () => {
  it('finds a 1 s carrier within 0.002 Hz, and within a few Cramér–Rao standard deviations, across seeds', () => {
    for (const seed of [1, 2, 3, 4, 5]) {
      const syn = synthesizeCapture(spec({ seed }));
      const ref = syn.capture.channels[0]!.samples;
      const est = trackCarrier([ref], 'reference', 50_000, syn.capture.sampleCount, ['ref']);
      const error = Math.abs(est.frequencyHz - 400.37);
      expect(error).toBeLessThan(0.002);
      // The noise on the reference includes 12-bit quantisation (LSB/√12 with LSB = 2.2·36.8 V/4096).
      const sigma = Math.hypot(0.02, (2.2 * 26 * Math.SQRT2) / 4096 / Math.sqrt(12));
      expect(error).toBeLessThan(5 * crlbStdHz(50_000, syn.capture.sampleCount, 26 * Math.SQRT2, sigma));
      expect(est.driftDegree).toBe(1);
      expect(est.referenceRmsV).toBeCloseTo(26, 2);
      expect(est.findings).toHaveLength(0);
    }
  });

  it('follows a linear drift and reports carrier-drift with start and end frequency', () => {
    const syn = synthesizeCapture(spec({ driftHzPerS: 2, durationS: 2 }));
    const est = trackCarrier([syn.capture.channels[0]!.samples], 'reference', 50_000, syn.capture.sampleCount, ['ref']);
    // first and last window centres are about half a cycle inside the record
    expect(est.startHz).toBeCloseTo(400.37 + 2 * (0.5 / 400.37), 2);
    expect(est.endHz).toBeCloseTo(400.37 + 2 * (2 - 0.5 / 400.37), 2);
    expect(est.frequencyHz).toBeCloseTo(402.37, 2); // 400.37 + 2 Hz/s × 1 s, the mid-record value
    expect(carrierFrequencyHzAt(est.track, 50_000)).toBeCloseTo(402.37, 2);
    expect(est.findings.map((f) => f.code)).toContain('carrier-drift');
  });

  it('recovers the carrier from the stator lines alone while the shaft turns (no reference)', () => {
    const syn = synthesizeCapture(spec({ includeReference: false }));
    const lines = syn.capture.channels.map((c) => c.samples);
    const est = trackCarrier(lines, 'stators', 50_000, syn.capture.sampleCount, ['s1s3', 's3s2', 's2s1']);
    expect(est.source).toBe('stators');
    expect(Math.abs(est.frequencyHz - 400.37)).toBeLessThan(0.002);
  });

  it('refuses a record shorter than three carrier cycles with a clear CaptureError', () => {
    const syn = synthesizeCapture(spec({ durationS: 0.006 }));
    expect(() => trackCarrier([syn.capture.channels[0]!.samples], 'reference', 50_000, syn.capture.sampleCount, ['ref'])).toThrow(CaptureError);
  });

  it('refuses a flat channel: no carrier', () => {
    const flat = new Float32Array(10_000);
    expect(() => trackCarrier([flat], 'reference', 50_000, 10_000, ['ref'])).toThrow(/no carrier/);
  });
});
