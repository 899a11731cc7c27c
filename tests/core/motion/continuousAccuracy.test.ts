import { describe, expect, it } from 'vitest';
import { analyzeContinuousAccuracy } from '../../../core/motion/continuousAccuracy.js';
import { createRandom } from '../../../core/synth/random.js';

const RAD = Math.PI / 180;
const RATE_HZ = 400; // one angle per carrier cycle of a 400 Hz system

/** Known error curve without offset (a constant-speed run cannot see it), arcmin. */
const curve = (shaftDeg: number): number => 3 * Math.cos((shaftDeg - 30) * RAD) + 1.72 * Math.sin(2 * shaftDeg * RAD) + 0.8 * Math.cos(4 * shaftDeg * RAD);

function drive(degPerS: number, seconds: number, startDeg: number, noiseDeg: number, seed: number): { t: Float64Array; deg: Float64Array } {
  const rnd = createRandom(seed);
  const n = Math.round(seconds * RATE_HZ);
  const t = new Float64Array(n);
  const deg = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = i / RATE_HZ;
    const shaft = startDeg + degPerS * t[i]!;
    deg[i] = shaft + curve(shaft) / 60 + noiseDeg * rnd.normal();
  }
  return { t, deg };
}

/** Every bin within 4.5 standard errors (+0.03′ for the bin smoothing), and their RMS within 1.5 standard errors. */
function checkBins(bins: readonly { nominalDeg: number; errorArcmin: number; samples: number }[], noiseArcmin: number): void {
  let sum2 = 0;
  let se2 = 0;
  for (const b of bins) {
    const se = noiseArcmin / Math.sqrt(b.samples);
    const d = b.errorArcmin - curve(b.nominalDeg);
    expect(Math.abs(d)).toBeLessThan(4.5 * se + 0.03);
    sum2 += d * d;
    se2 += se * se;
  }
  expect(Math.sqrt(sum2 / bins.length)).toBeLessThan(1.5 * Math.sqrt(se2 / bins.length) + 0.01);
}

// Error = indicated − true shaft angle over the full turn, a Fourier series by order (electrical-error
// harmonics of sin/cos sensors: Hwang et al., J. Power Electronics 14(1), 2014; Kuntz et al.,
// arXiv:2205.08472, 2022). The truth here is the known curve the trace was built with.
describe('analyzeContinuousAccuracy(t, unwrappedDeg) on a constant-speed drive', () => {
  it('recovers the error curve per 10° bin and its harmonics over 2.3 turns (not a whole number)', () => {
    const run = drive(90, 9.2, 17, 0.02, 1);
    const { accuracy, findings, errorArcmin } = analyzeContinuousAccuracy(run.t, run.deg);
    expect(findings).toEqual([]);
    expect(accuracy!.positions).toHaveLength(36);
    expect(accuracy!.binWidthDeg).toBe(10);
    expect(accuracy!.speedDegPerS).toBeCloseTo(90, 2);
    expect(accuracy!.turns).toBeCloseTo(2.3, 1);
    // bin mean of the curve over ±5°: attenuation sinc(k·5°) ≤ 1.3 % at order 4 (≤ 0.02′ here); the
    // rest is the noise mean σ/√n per bin (standard error of a mean)
    checkBins(accuracy!.positions, 0.02 * 60);
    // harmonic amplitude standard error σ·√(2/N) (least-squares/CRLB variance 2σ²/N of a sinusoid's
    // amplitude in white noise, Kay 1993 Vol. I ch.3); 4 standard errors allowed, phase likewise / A
    const se = 0.02 * 60 * Math.sqrt(2 / run.t.length);
    const h = accuracy!.harmonics;
    expect(h[0]!.amplitudeArcmin).toBeLessThan(4 * se); // the line's offset absorbs any constant
    for (const [k, amp, phase] of [[1, 3, 30], [2, 1.72, 90], [4, 0.8, 0]] as const) {
      expect(Math.abs(h[k]!.amplitudeArcmin - amp)).toBeLessThan(4 * se);
      expect(Math.abs(h[k]!.phaseDeg - phase)).toBeLessThan(((4 * se) / amp) / RAD);
    }
    expect(h[3]!.amplitudeArcmin).toBeLessThan(4 * se);
    expect(accuracy!.residualRmsArcmin).toBeCloseTo(0.02 * 60, 1); // only the noise is left
    expect(errorArcmin).toHaveLength(run.t.length);
    const truthPp = 2 * Math.max(...Array.from({ length: 3600 }, (_, i) => Math.abs(curve(i / 10))));
    expect(accuracy!.ppArcmin).toBeLessThanOrEqual(truthPp + 0.3);
  });

  it('does not leak the error curve into the fitted line on a noiseless 1.1-turn record (common practice, no source)', () => {
    // a line fitted alone over a non-whole number of turns absorbs part of the 1st harmonic
    const run = drive(90, 4.4, 17, 0, 1);
    const h = analyzeContinuousAccuracy(run.t, run.deg).accuracy!.harmonics;
    expect(h[0]!.amplitudeArcmin).toBeLessThan(1e-6);
    expect(h[1]!.amplitudeArcmin).toBeCloseTo(3, 6);
    expect(h[2]!.amplitudeArcmin).toBeCloseTo(1.72, 6);
    expect(h[4]!.amplitudeArcmin).toBeCloseTo(0.8, 6);
  });

  it('works for a reverse drive and 72 bins', () => {
    const run = drive(-150, 6, 300, 0.01, 2);
    const { accuracy } = analyzeContinuousAccuracy(run.t, run.deg, { bins: 72 });
    expect(accuracy!.positions).toHaveLength(72);
    expect(accuracy!.speedDegPerS).toBeCloseTo(-150, 2);
    checkBins(accuracy!.positions, 0.01 * 60);
  });

  it('returns null with an info finding below a full turn', () => {
    const run = drive(30, 10, 0, 0.02, 3); // 300°
    const { accuracy, findings } = analyzeContinuousAccuracy(run.t, run.deg);
    expect(accuracy).toBeNull();
    expect(findings[0]!.code).toBe('accuracy-run-incomplete');
    expect(findings[0]!.severity).toBe('info');
    expect(findings[0]!.figures!.coveredDeg).toBeLessThan(360);
  });

  it('skips NaN cycles and rejects bad arguments', () => {
    const run = drive(120, 4, 0, 0.02, 4);
    for (let i = 100; i < 140; i++) run.deg[i] = NaN;
    const { accuracy, errorArcmin } = analyzeContinuousAccuracy(run.t, run.deg);
    expect(accuracy).not.toBeNull();
    expect(Number.isNaN(errorArcmin[120]!)).toBe(true);
    expect(() => analyzeContinuousAccuracy(run.t, run.deg.subarray(1))).toThrow(RangeError);
    expect(() => analyzeContinuousAccuracy(run.t, run.deg, { bins: 2 })).toThrow(RangeError);
  });
});
