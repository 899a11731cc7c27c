import { describe, expect, it } from 'vitest';
import { toneCramerRaoBounds } from '../../../core/dsp/toneCramerRao.js';
import { referenceVectors } from './referenceVectors.js';

describe('toneCramerRaoBounds(N, snr, fs)', () => {
  it('equals the Kay 1993 ch. 3 real-tone bounds as evaluated offline in numpy for every reference case', () => {
    for (const c of referenceVectors().sineFit) {
      const eta = 10 ** (c.truth.snrDb / 10);
      const b = toneCramerRaoBounds(c.n, eta, c.sampleRateHz);
      expect(b.frequencyHz2 / c.crlb.frequencyHz2).toBeCloseTo(1, 12);
      expect(b.phaseAtStartRad2 / c.crlb.phaseAtStartRad2).toBeCloseTo(1, 12);
      expect(b.phaseAtCentreRad2 / c.crlb.phaseAtCentreRad2).toBeCloseTo(1, 12);
    }
  });

  it('N = 20 000 at 1 MS/s, 40 dB: std(f) ≥ 1.95 mHz, centre phase ≥ 0.243 arcmin (Kay 1993 forms evaluated by hand)', () => {
    // 12 / ((2π)² · 1e4 · 2e4 · (4e8 − 1)) · 1e12 = 3.80e-6 Hz² → 1.95 mHz (hand evaluation).
    const b = toneCramerRaoBounds(20000, 1e4, 1e6);
    expect(Math.sqrt(b.frequencyHz2)).toBeCloseTo(1.949e-3, 5);
    // Phase at the centre: 1/(ηN) = 5e-9 rad² → 7.07e-5 rad = 0.243 arcmin.
    expect((Math.sqrt(b.phaseAtCentreRad2) * 180 * 60) / Math.PI).toBeCloseTo(0.243, 3);
    expect(b.amplitude2).toBeCloseTo((2 * 5e-5) / 20000, 15);
  });

  it('rejects non-physical arguments', () => {
    expect(() => toneCramerRaoBounds(1, 10, 1)).toThrow(RangeError);
    expect(() => toneCramerRaoBounds(10, 0, 1)).toThrow(RangeError);
  });
});
