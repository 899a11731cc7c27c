import { describe, expect, it } from 'vitest';
import { constantCarrierTrack } from '../../../core/carrier/carrierTrack.js';
import { demodulateCycles } from '../../../core/demod/demodulateCycles.js';
import { removeMotionQuadrature } from '../../../core/diagnostics/removeMotionQuadrature.js';

describe('removeMotionQuadrature(lines, ψ, Φc)', () => {
  it('a linearly rising envelope demodulated per cycle shows −(g₁/2)·cos 2(Φc+ψ) of quadrature (derived); after removal it is below 2 % of g₁/2', () => {
    // y = (g0 + slope·n)·sin(Φ + ψ) with no quadrature at all; 243.25 samples per cycle.
    const fs = 97_300, f = 400, psi = 0.2, n = 97_30;
    const track = constantCarrierTrack(fs, f, 0.4, n);
    const slopePerSample = 2e-4;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = (1 + slopePerSample * i) * Math.sin(0.4 + (2 * Math.PI * f * i) / fs + psi);
    const ph = demodulateCycles([x], track, n);
    const quadIn = (re: number, im: number) => im * Math.cos(psi) - re * Math.sin(psi);
    const g1 = slopePerSample * (fs / f) / (2 * Math.PI); // envelope change per radian of carrier
    for (let m = 1; m < ph.cycleCount - 1; m++) {
      const predicted = -(g1 / 2) * Math.cos(2 * (ph.centrePhaseRad[m]! + psi));
      // continuous-window derivation against a 243.25-sample window: within 2 % of g₁/2
      expect(Math.abs(quadIn(ph.inPhase[0]![m]!, ph.quadrature[0]![m]!) - predicted)).toBeLessThan(0.02 * g1 / 2);
    }
    const [fixed] = removeMotionQuadrature([{ role: 'sin', inPhaseV: ph.inPhase[0]!, quadratureV: ph.quadrature[0]! }], psi, ph.centrePhaseRad);
    for (let m = 1; m < ph.cycleCount - 1; m++) {
      expect(Math.abs(quadIn(fixed!.inPhaseV[m]!, fixed!.quadratureV[m]!))).toBeLessThan(0.02 * g1 / 2);
    }
  });
});
