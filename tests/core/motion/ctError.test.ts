import { describe, expect, it } from 'vitest';
import { constantCarrierTrack } from '../../../core/carrier/carrierTrack.js';
import { demodulateCycles } from '../../../core/demod/demodulateCycles.js';
import {
  CT_MAX_OUTPUT_115V_V,
  CT_MAX_OUTPUT_26V_V,
  ctErrorSignal,
  ctGradientVPerDeg,
  defaultCtMaxOutputV,
  estimateCtPhaseRad,
  trackingError,
} from '../../../core/motion/ctError.js';
import { createRandom } from '../../../core/synth/random.js';
import { phasorsFrom } from '../../helpers/phasorsFrom.js';

const RAD = Math.PI / 180;

describe('ctGradientVPerDeg(maxOutputV): E_max·π/180 near null (derived from E = E_max·sin δ)', () => {
  it('gives 1.000 V/° for 57.3 V (rating from memory), 0.960 V/° for 55 V and 0.393 V/° for 22.5 V', () => {
    // 55 V: largest CT rotor output at 90° in the 115 V CX–CT example, NEETS Module 15 (NAVEDTRA 14187) p.1-36
    expect(ctGradientVPerDeg(55)).toBeCloseTo(0.96, 3);
    expect(ctGradientVPerDeg(CT_MAX_OUTPUT_115V_V)).toBeCloseTo(1.0, 3);
    expect(ctGradientVPerDeg(CT_MAX_OUTPUT_26V_V)).toBeCloseTo(0.393, 3);
    // 1 V/° = 16.7 mV per arc-minute
    expect((ctGradientVPerDeg(57.3) * 1000) / 60).toBeCloseTo(16.7, 1);
    expect(() => ctGradientVPerDeg(0)).toThrow(RangeError);
  });

  it('picks the 26 V family below 60 V of excitation, else the 115 V family (from memory)', () => {
    expect(defaultCtMaxOutputV(26)).toBe(22.5);
    expect(defaultCtMaxOutputV(115)).toBe(57.3);
    expect(defaultCtMaxOutputV(null)).toBe(57.3);
  });
});

describe('ctErrorSignal(phasors, ctChannel, phaseRad) on a demodulated CT rotor waveform', () => {
  // CT rotor output ∝ sin(misalignment), in or out of time phase with the excitation by direction, zero
  // at correspondence (NEETS Module 15 p.1-36); 55 V at 90° for the 115 V example (same page).
  const fs = 40_000;
  const fc = 400;
  const T = 0.5;
  const n = Math.round(fs * T);
  const psi = 8 * RAD; // the unit's time-phase lead
  const quadV = 0.02; // 20 mV RMS residual in quadrature
  const misalignDeg = (tS: number): number => -1 + (2 * tS) / T; // −1° … +1°, through null at T/2
  const track = constantCarrierTrack(fs, fc, 0, n);
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const phase = (2 * Math.PI * fc * i) / fs;
    const e = 55 * Math.sin(misalignDeg(i / fs) * RAD);
    v[i] = Math.SQRT2 * (e * Math.sin(phase + psi) + quadV * Math.cos(phase + psi));
  }
  const phasors = demodulateCycles([v], track, n);

  it('gives the signed in-phase error (V RMS), the quadrature (mV) and the misalignment from the gradient', () => {
    const r = ctErrorSignal(phasors, 0, psi, { maxOutputV: 55 });
    expect(r.gradientSource).toBe('max-output');
    expect(r.gradientVPerDeg).toBeCloseTo(0.96, 3);
    let worstV = 0;
    let worstDeg = 0;
    for (let m = 0; m < phasors.cycleCount; m++) {
      const d = misalignDeg(r.tS[m]!);
      worstV = Math.max(worstV, Math.abs(r.inPhaseV[m]! - 55 * Math.sin(d * RAD)));
      worstDeg = Math.max(worstDeg, Math.abs(r.errorDeg[m]! - d));
      // the amplitude ramps by ΔA = 9.6 mV per cycle; a one-cycle fit of a ramped sine puts −ΔA/(4π)
      // = 0.76 mV into quadrature (derived: projection of τ·sin Φ onto cos Φ over one period)
      expect(Math.abs(r.quadratureMv[m]! - 20 + 9.6 / (4 * Math.PI))).toBeLessThan(0.1);
    }
    expect(worstV).toBeLessThan(5e-4);
    expect(worstDeg).toBeLessThan(1e-3); // plus sin δ ≈ δ: (π/180)²/6 relative at 1°
  });

  it('finds the one null crossing at T/2 (rising) with the quadrature there', () => {
    const r = ctErrorSignal(phasors, 0, psi);
    expect(r.gradientSource).toBe('default-115V-from-memory');
    expect(r.nullCrossings).toHaveLength(1);
    expect(Math.abs(r.nullCrossings[0]!.tS - T / 2)).toBeLessThan(0.05 / fc); // within 1/20 of a cycle
    expect(r.nullCrossings[0]!.direction).toBe(1);
    expect(Math.abs(r.nullCrossings[0]!.quadratureMv - 20 + 9.6 / (4 * Math.PI))).toBeLessThan(0.1);
  });

  it('rotates the phasor exactly: Re/Im of Z·e^{−jψ}, peak → RMS, and interpolates the crossing linearly', () => {
    // phasor-level check, I + jQ = A·e^{jψ} for a unit leading by ψ (IEEE Std 1057 three-parameter fit form)
    const amps = [-3, -1, 1, 3]; // V RMS in phase, with 0.05 V RMS in quadrature
    const z = amps.map((a) => [Math.SQRT2 * (a * Math.cos(psi) - 0.05 * Math.sin(psi)), Math.SQRT2 * (a * Math.sin(psi) + 0.05 * Math.cos(psi))]);
    const ph = phasorsFrom([z.map((x) => x[0]!)], [z.map((x) => x[1]!)]);
    const r = ctErrorSignal(ph, 0, psi, { gradientVPerDeg: 2 });
    for (let m = 0; m < 4; m++) {
      expect(r.inPhaseV[m]!).toBeCloseTo(amps[m]!, 12);
      expect(r.quadratureMv[m]!).toBeCloseTo(50, 9);
      expect(r.errorDeg[m]!).toBeCloseTo(amps[m]! / 2, 12);
    }
    expect(r.nullCrossings).toHaveLength(1);
    expect(r.nullCrossings[0]!.tS).toBeCloseTo(1.5 / 400, 12); // midway between cycles 1 and 2
    expect(r.gradientSource).toBe('given');
  });

  it('estimates the unit phase from the principal axis of the phasors', () => {
    expect(estimateCtPhaseRad(phasors, 0)! / RAD).toBeCloseTo(8, 1);
  });

  it('rejects a bad channel or gradient', () => {
    expect(() => ctErrorSignal(phasors, 1, 0)).toThrow(RangeError);
    expect(() => ctErrorSignal(phasors, 0, 0, { gradientVPerDeg: -1 })).toThrow(RangeError);
  });
});

describe('ctErrorSignal null crossings with noise (common practice, no source)', () => {
  it('counts every sign change without hysteresis and none around a static null with it', () => {
    const rnd = createRandom(21);
    const noise = Array.from({ length: 400 }, () => 0.002 * rnd.normal() * Math.SQRT2); // 2 mV RMS
    const staticNull = phasorsFrom([noise]);
    expect(ctErrorSignal(staticNull, 0, 0).nullCrossings.length).toBeGreaterThan(50);
    expect(ctErrorSignal(staticNull, 0, 0, { hysteresisMv: 10 }).nullCrossings).toHaveLength(0);
    // a slow sweep through null with the same noise: exactly one crossing, near the true time
    const sweep = phasorsFrom([noise.map((x, i) => x + Math.SQRT2 * 0.001 * (200 - i))]); // 1 mV per cycle, falling
    const r = ctErrorSignal(sweep, 0, 0, { hysteresisMv: 10 });
    expect(r.nullCrossings).toHaveLength(1);
    expect(r.nullCrossings[0]!.direction).toBe(-1);
    expect(Math.abs(r.nullCrossings[0]!.tS - 200 / 400)).toBeLessThan(10 / 400);
  });
});

describe('trackingError(angleADeg, angleBDeg)', () => {
  it('gives the wrapped difference per cycle with mean, RMS and largest value in arcmin (common practice, no source)', () => {
    const b = [359.95, 0.0, 0.05, 120, NaN];
    const a = [0.0, 0.05, 0.0, 120.1, 3];
    const r = trackingError(a, b);
    expect(r.samples).toBe(4);
    expect(r.diffDeg[0]).toBeCloseTo(0.05, 12);
    expect(r.diffDeg[2]).toBeCloseTo(-0.05, 12);
    expect(r.meanArcmin).toBeCloseTo(((0.05 + 0.05 - 0.05 + 0.1) / 4) * 60, 9);
    expect(r.rmsArcmin).toBeCloseTo(Math.sqrt((3 * 0.05 ** 2 + 0.1 ** 2) / 4) * 60, 9);
    expect(r.maxAbsArcmin).toBeCloseTo(6, 9);
    expect(() => trackingError([1], [])).toThrow(RangeError);
  });
});
