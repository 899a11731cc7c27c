import { describe, expect, it } from 'vitest';
import { ellipseFit } from '../../../core/diagnostics/ellipseFit.js';
import { angleCoverageDeg, inPhasePair, sinCosPlane, type PlaneFigures } from '../../../core/diagnostics/sinCosPlane.js';
import { unitFigures } from '../../../core/diagnostics/unitFigures.js';
import { createRandom } from '../../../core/synth/random.js';
import { runUnitChain } from './unitChain.js';

const DEG = Math.PI / 180;
const ARCMIN = (180 * 60) / Math.PI;

/** Resolver pair c = o_c + cos θ, s = o_s + (1+γ)·sin(θ+φ) over an arc; angles decoded by atan2. */
function pair(n: number, e: { oc?: number; os?: number; gamma?: number; phi?: number }, arcDeg = 360, noise = 0, seed = 3, startDeg = 17) {
  const rnd = createRandom(seed);
  const c = new Float64Array(n), s = new Float64Array(n), theta = new Float64Array(n), decoded = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const th = (startDeg + (arcDeg * i) / n) * DEG;
    theta[i] = th;
    c[i] = (e.oc ?? 0) + Math.cos(th) + noise * rnd.normal();
    s[i] = (e.os ?? 0) + (1 + (e.gamma ?? 0)) * Math.sin(th + (e.phi ?? 0)) + noise * rnd.normal();
    decoded[i] = (Math.atan2(s[i]!, c[i]!) * 180) / Math.PI;
  }
  return { c, s, theta, decoded };
}

/** DC, 1st and 2nd harmonic amplitudes (rad) of the true atan2 error over a full uniform turn (a direct DFT). */
function errorHarmonics(p: ReturnType<typeof pair>): [number, number, number] {
  const n = p.theta.length;
  const out: [number, number, number] = [0, 0, 0];
  for (let k = 0; k <= 2; k++) {
    let re = 0, im = 0;
    for (let i = 0; i < n; i++) {
      const e = Math.atan2(p.s[i]!, p.c[i]!) - p.theta[i]!;
      const w = e - 2 * Math.PI * Math.round(e / (2 * Math.PI));
      re += w * Math.cos(k * p.theta[i]!);
      im -= w * Math.sin(k * p.theta[i]!);
    }
    out[k] = k === 0 ? re / n : (2 * Math.hypot(re, im)) / n;
  }
  return out;
}

function figures(p: ReturnType<typeof pair>): PlaneFigures {
  const r = sinCosPlane(p.s, p.c, p.decoded);
  expect(r.identifiable).toBe(true);
  return r as PlaneFigures;
}

describe('sinCosPlane(sinIn, cosIn, angleDeg) — channel errors and predicted error harmonics', () => {
  it('0.1 % gain imbalance → 1.72′ 2nd harmonic (error-harmonic model, unit amplitude), confirmed by the DFT of the actual atan2 error', () => {
    const p = pair(720, { gamma: 0.001 });
    const f = figures(p);
    expect(f.gainMismatchPct).toBeCloseTo(0.1, 9);
    expect(f.predicted.secondHarmonicArcmin).toBeCloseTo(1.72, 2);
    expect(f.predicted.firstHarmonicArcmin).toBeLessThan(1e-6);
    expect(Math.abs(errorHarmonics(p)[2] * ARCMIN - 1.72)).toBeLessThan(0.01);
  });

  it('0.1 % offset on the sine channel → 3.44′ 1st harmonic (error-harmonic model), confirmed by the DFT of the error', () => {
    const p = pair(720, { os: 0.001 });
    const f = figures(p);
    expect(f.sinOffsetPct).toBeCloseTo(0.1, 6);
    expect(f.predicted.firstHarmonicArcmin).toBeCloseTo(3.44, 2);
    expect(Math.abs(errorHarmonics(p)[1] * ARCMIN - 3.44)).toBeLessThan(0.01);
  });

  it('0.1° skew → 3′ constant + 3′ 2nd harmonic (error-harmonic model), confirmed by the DFT of the error', () => {
    const p = pair(720, { phi: 0.1 * DEG });
    const f = figures(p);
    expect(f.nonOrthogonalityDeg).toBeCloseTo(0.1, 8);
    expect(f.predicted.constantArcmin).toBeCloseTo(3, 2);
    expect(f.predicted.secondHarmonicArcmin).toBeCloseTo(3, 2);
    const [dc, , h2] = errorHarmonics(p);
    expect(Math.abs(dc * ARCMIN - 3)).toBeLessThan(0.01);
    expect(Math.abs(h2 * ARCMIN - 3)).toBeLessThan(0.01);
  });

  it('combined o_c = 0.01, o_s = −0.02, γ = 0.03, φ = 1°: DC 0.00873, H1 0.02236, H2 0.01735 rad predicted; the exact error (second-order terms) within 3 %', () => {
    const p = pair(1440, { oc: 0.01, os: -0.02, gamma: 0.03, phi: 1 * DEG });
    const f = figures(p);
    // Offsets are read as fractions of the mean radius (a + b)/2, so they sit ~1.5 % below o/1.
    expect(f.predicted.constantArcmin / ARCMIN).toBeCloseTo(0.00873, 5);
    expect(f.predicted.firstHarmonicArcmin / ARCMIN).toBeCloseTo(0.02236 / 1.015, 4);
    expect(f.predicted.secondHarmonicArcmin / ARCMIN).toBeCloseTo(0.01735, 4);
    const [dc, h1, h2] = errorHarmonics(p);
    expect(Math.abs(dc / 0.00873 - 1)).toBeLessThan(0.03);
    expect(Math.abs(h1 / 0.02236 - 1)).toBeLessThan(0.03);
    expect(Math.abs(h2 / 0.01735 - 1)).toBeLessThan(0.03);
  });

  it('coverage rule (500 points, noise 2e-3, 20 seeds): offset RMS error ~1.9e-4 over 360°, ~1.4e-3 over 180°; 90° is not identifiable (and an ellipse fit there is off by > 1e-2)', () => {
    const rms = (arc: number) => {
      let sum = 0;
      for (let seed = 1; seed <= 20; seed++) {
        const p = pair(500, { oc: 0.01, os: -0.02 }, arc, 2e-3, seed, 40);
        const f = ellipseFit(p.c, p.s);
        sum += (f.centreX - 0.01) ** 2 + (f.centreY + 0.02) ** 2;
      }
      return Math.sqrt(sum / 40);
    };
    expect(rms(360)).toBeLessThan(2 * 1.9e-4);
    expect(rms(180)).toBeLessThan(2 * 1.4e-3);
    expect(rms(90)).toBeGreaterThan(1e-2);
    const full = pair(500, {}, 360, 2e-3, 1);
    expect(sinCosPlane(full.s, full.c, full.decoded).identifiable).toBe(true);
    const half = pair(500, {}, (180 * 500) / 499, 2e-3, 1); // first to last point exactly 180°
    expect(sinCosPlane(half.s, half.c, half.decoded).identifiable).toBe(true);
    const quarter = pair(500, {}, 90, 2e-3, 1);
    const q = sinCosPlane(quarter.s, quarter.c, quarter.decoded);
    expect(q.identifiable).toBe(false);
    expect(q.coverageDeg).toBeCloseTo(90, 0);
  });

  it('angleCoverageDeg: 360 − the largest gap, across the wrap', () => {
    expect(angleCoverageDeg([350, 10, 20])).toBeCloseTo(30, 9);
    expect(angleCoverageDeg([5, 5, 5])).toBe(0);
    expect(angleCoverageDeg([])).toBe(0);
  });

  it('end to end on a synthetic resolver turning once with +0.2 % sine gain: gain mismatch 0.2 % within 0.02 %; a static capture is not identifiable', () => {
    const base = {
      seed: 19,
      sampleRateHz: 100_000,
      durationS: 1,
      carrier: { frequencyHz: 400, rmsV: 26 },
      noiseV: 0.005,
      quantization: { bits: 14 },
    };
    const lines = [{ role: 'sin', gain: 1.002 }, { role: 'cos' }];
    const turning = runUnitChain({ ...base, units: [{ kind: 'resolver', transformationRatio: 11.8 / 26, phaseLeadDeg: 7, motion: { type: 'ramp', startDeg: 0, degPerS: 360 }, lines }] });
    const fig = unitFigures({
      kind: 'resolver',
      lines: turning.lines.map((l) => ({ role: l.role, inPhaseV: turning.phasors.inPhase[l.slot]!, quadratureV: turning.phasors.quadrature[l.slot]! })),
      angleDeg: turning.angle.deg,
      centrePhaseRad: turning.phasors.centrePhaseRad,
    });
    const { sinIn, cosIn } = inPhasePair(turning.sinCos, fig.phaseLeadDeg);
    const plane = sinCosPlane(sinIn, cosIn, turning.angle.deg);
    expect(plane.identifiable).toBe(true);
    const f = plane as PlaneFigures;
    expect(Math.abs(f.gainMismatchPct - 0.2)).toBeLessThan(0.02);
    expect(f.radiusV).toBeCloseTo(11.8 * Math.SQRT2 * 1.001, 1);
    const still = runUnitChain({ ...base, durationS: 0.2, units: [{ kind: 'resolver', transformationRatio: 11.8 / 26, phaseLeadDeg: 7, motion: { type: 'static', deg: 33 }, lines }] });
    const pairStill = inPhasePair(still.sinCos, 7);
    const r = sinCosPlane(pairStill.sinIn, pairStill.cosIn, still.angle.deg);
    expect(r.identifiable).toBe(false);
    expect(r.coverageDeg).toBeLessThan(1);
  });
});
