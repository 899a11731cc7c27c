import { describe, expect, it } from 'vitest';
import { analyzeCapture } from '../../core/pipeline.js';
import { anglesToCsv } from '../../core/report/anglesCsv.js';
import { synthesizeCapture } from '../../core/synth/synthesizeCapture.js';

// A transmitter and its repeater in one capture: the repeater follows 6′ behind (the generator's
// own truth). Tracking error = repeater minus transmitter, per cycle.
describe('combineUnits on a transmitter and a repeater', () => {
  it('reports the tracking error between two units and writes it to the angle CSV', () => {
    const lines = [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }];
    const syn = synthesizeCapture({
      seed: 31,
      sampleRateHz: 40_000,
      durationS: 0.5,
      carrier: { frequencyHz: 400, rmsV: 26 },
      units: [
        { id: 'tx', kind: 'synchro', transformationRatio: 0.4538, phaseLeadDeg: 8, motion: { type: 'ramp', startDeg: 30, degPerS: 20 }, lines },
        { id: 'rx', kind: 'synchro', transformationRatio: 0.4538, phaseLeadDeg: 8, motion: { type: 'ramp', startDeg: 30 - 0.1, degPerS: 20 }, lines },
      ],
      noiseV: 0.005,
      quantization: { bits: 12 },
    });
    const overrides = Object.fromEntries(syn.roles.map((role, i) => [role, `ch${i + 1}`]));
    const analysis = analyzeCapture(syn.capture, { overrides });
    expect(analysis.twoSpeed).toBeNull();
    expect(analysis.tracking!.a).toBe('tx');
    expect(analysis.tracking!.b).toBe('rx');
    expect(analysis.tracking!.meanArcmin).toBeCloseTo(-6, 0);
    expect(analysis.tracking!.rmsArcmin).toBeCloseTo(6, 0);
    const csv = anglesToCsv(analysis).split('\n');
    expect(csv[0]).toContain('tracking_error_arcmin');
    expect(Number(csv[100]!.split(',').at(-1))).toBeCloseTo(-6, 0);
  });
});
