import { describe, expect, it } from 'vitest';
import type { Capture } from '../../../core/model/capture.js';
import type { AccuracyRun } from '../../../core/motion/accuracyRun.js';
import { analyzeCapture } from '../../../core/pipeline.js';
import type { MotionSpec } from '../../../core/synth/motion.js';
import { synthesizeCapture, type SynthLineSpec } from '../../../core/synth/synthesizeCapture.js';
import { angleError } from '../../helpers/angleError.js';
import { codes, synchroSpec, THREE_LINES, TR_26 } from './fixtures.js';

// End-to-end acceptance of the motion and accuracy analysis: synthetic captures with known shaft
// motion through analyzeCapture. Truth is the generator's own parameters.

const relErr = (got: number, truth: number): number => Math.abs(got / truth - 1);

describe('step response (Ogata, Modern Control Engineering, 5th ed., ch.5)', () => {
  const zeta = 0.4;
  const naturalHz = 5;
  const wn = 2 * Math.PI * naturalHz;
  /** Underdamped unit step response, Ogata ch.5: 1 − e^{−ζωn t}/√(1−ζ²)·sin(ωd t + arccos ζ). */
  const response = (t: number): number =>
    1 - (Math.exp(-zeta * wn * t) / Math.sqrt(1 - zeta * zeta)) * Math.sin(wn * Math.sqrt(1 - zeta * zeta) * t + Math.acos(zeta));
  /** 2 % settling time: the last exit from |y − 1| ≤ 0.02, found on a 1 µs grid then by bisection. */
  function settlingTimeS(band: number): number {
    const horizon = 10 / (zeta * wn);
    const dt = 1e-6;
    let last = 0;
    for (let t = dt; t < horizon; t += dt) if (Math.abs(response(t) - 1) > band) last = t;
    let lo = last, hi = last + dt;
    for (let k = 0; k < 40; k++) {
      const mid = (lo + hi) / 2;
      if (Math.abs(response(mid) - 1) > band) lo = mid;
      else hi = mid;
    }
    return (lo + hi) / 2;
  }

  it('a 30° step with ζ = 0.4, ωn = 2π·5 rad/s: overshoot, damping, settling and natural frequency', () => {
    const spec = synchroSpec({ type: 'step', fromDeg: 10, toDeg: 40, atS: 0.2, dampingRatio: zeta, naturalHz }, { durationS: 1.5 });
    const analysis = analyzeCapture(synthesizeCapture(spec).capture);
    const step = analysis.motion!.steps[0]!;
    expect(step).toBeDefined();
    // Ogata ch.5: maximum overshoot Mp = exp(−ζπ/√(1−ζ²)) (25.4 % for ζ = 0.4).
    const overshootPct = 100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta));
    expect(relErr(step.overshootPct, overshootPct)).toBeLessThan(0.1);
    expect(relErr(step.dampingRatio!, zeta)).toBeLessThan(0.1);
    expect(relErr(step.naturalHz!, naturalHz)).toBeLessThan(0.05);
    // 2 % settling computed from the closed-form response (tighter than the 4/(ζωn) envelope rule).
    expect(relErr(step.settlingS!, settlingTimeS(0.02))).toBeLessThan(0.15);
    expect(step.sizeDeg).toBeCloseTo(30, 1);
  });
});

describe('jitter of a still shaft', () => {
  const A_ARCMIN = 3;
  const F_HZ = 7;
  const wobble = (amplitudeArcmin: number, frequencyHz: number, phaseDeg = 0): MotionSpec => ({
    type: 'wobble', centreDeg: 0, amplitudeDeg: amplitudeArcmin / 60, frequencyHz, phaseDeg,
  });

  it('a 3′, 7 Hz wobble: RMS within 10 % of A/√2, tone within 2 % of f, and a hunting finding', () => {
    const motion: MotionSpec = { type: 'sum', parts: [{ type: 'static', deg: 30 }, wobble(A_ARCMIN, F_HZ)] };
    const analysis = analyzeCapture(synthesizeCapture(synchroSpec(motion, { durationS: 2 })).capture);
    const jitter = analysis.motion!.jitter!;
    // RMS of a sinusoid of peak A is A/√2 (definition of RMS).
    expect(relErr(jitter.rmsArcmin, A_ARCMIN / Math.SQRT2)).toBeLessThan(0.1);
    expect(relErr(jitter.dominantHz[0]!, F_HZ)).toBeLessThan(0.02);
    // A sustained oscillation about the commanded position is hunting (NEETS Module 15 p.1-68).
    expect(codes(analysis.findings)).toContain('hunting');
  });

  it('two tones (3′ at 7 Hz, 1.5′ at 23 Hz): both found', () => {
    const motion: MotionSpec = { type: 'sum', parts: [{ type: 'static', deg: 30 }, wobble(A_ARCMIN, F_HZ), wobble(1.5, 23, 40)] };
    const jitter = analyzeCapture(synthesizeCapture(synchroSpec(motion, { durationS: 2 })).capture).motion!.jitter!;
    const found = (f: number): boolean => jitter.dominantHz.some((d) => relErr(d, f) < 0.02);
    expect(found(7)).toBe(true);
    expect(found(23)).toBe(true);
    // RMS of two incoherent sinusoids: √(A₁² + A₂²)/√2.
    expect(relErr(jitter.rmsArcmin, Math.hypot(3, 1.5) / Math.SQRT2)).toBeLessThan(0.1);
  });
});

describe('stepped accuracy run (TM 11-4920-292-15 Table 7-2A: 15° steps through 360°)', () => {
  it('24 stops with a known 1st + 2nd harmonic error: errors within 0.5′ RMS, spread within 1′', () => {
    /** The unit's error at a heading, degrees: 2′ sin θ + 1′ sin(2θ + 0.5 rad) (our own choice). */
    const errorDeg = (deg: number): number => (2 * Math.sin((deg * Math.PI) / 180) + Math.sin((2 * deg * Math.PI) / 180 + 0.5)) / 60;
    const stops = 24;
    const dwellS = 0.5;
    // Staircase: a sum of damped steps whose levels are nominal + error (telescoping increments).
    const parts: MotionSpec[] = [{ type: 'static', deg: errorDeg(0) }];
    for (let k = 1; k < stops; k++) {
      const rise = 15 + errorDeg(15 * k) - errorDeg(15 * (k - 1));
      parts.push({ type: 'step', fromDeg: 0, toDeg: rise, atS: dwellS * k, dampingRatio: 0.7, naturalHz: 15 });
    }
    const spec = synchroSpec({ type: 'sum', parts }, { sampleRateHz: 20_000, durationS: dwellS * stops });
    const analysis = analyzeCapture(synthesizeCapture(spec).capture);
    const run = analysis.accuracy as AccuracyRun;
    expect(run?.mode).toBe('stepped');
    expect(run.incrementDeg).toBe(15);
    expect(run.positions.map((p) => p.nominalDeg)).toEqual(Array.from({ length: stops }, (_, k) => 15 * k));
    let sum2 = 0;
    for (const p of run.positions) sum2 += (p.errorArcmin - errorDeg(p.nominalDeg) * 60) ** 2;
    expect(Math.sqrt(sum2 / stops)).toBeLessThan(0.5);
    const truth = run.positions.map((p) => errorDeg(p.nominalDeg) * 60);
    expect(Math.abs(run.ppArcmin - (Math.max(...truth) - Math.min(...truth)))).toBeLessThan(1);
  });
});

describe('two-speed set (TM 55-1905-219-14-11 §5-117, 1X/36X)', () => {
  const motion: MotionSpec = { type: 'ramp', startDeg: 100, degPerS: 20 };
  const labelled = (prefix: string): SynthLineSpec[] =>
    THREE_LINES.map((l) => ({ ...l, label: `${prefix} ${l.role.replace(/^s(\d)s(\d)$/, 'S$1-S$2')}` }));
  const syn = synthesizeCapture(
    synchroSpec(motion, {
      durationS: 1,
      units: [
        { id: 'coarse', kind: 'synchro', transformationRatio: TR_26, phaseLeadDeg: 8, motion, lines: labelled('coarse') },
        { id: 'fine', kind: 'synchro', transformationRatio: TR_26, phaseLeadDeg: 6, motion, speed: 36, lines: labelled('fine') },
      ],
    }),
  );

  for (const [name, options, source] of [['given', { speedRatio: 36 }, 'given'], ['detected', {}, 'detected']] as const) {
    it(`ratio ${name}: combined angle within 0.01° RMS of the shaft, ratio 36`, () => {
      const analysis = analyzeCapture(syn.capture, options);
      expect(analysis.twoSpeed?.speedRatio).toBe(36);
      expect(analysis.twoSpeed?.speedRatioSource).toBe(source);
      expect(analysis.twoSpeed?.ambiguousCycles).toBe(0);
      // Truth: the shaft angle (the coarse unit's electrical angle at speed 1).
      expect(angleError(analysis.angle!, (t) => syn.angleDeg(t, 0), 2).rmsDeg).toBeLessThan(0.01);
    });
  }
});

describe('control transformer error signal (NEETS Module 15 p.1-36)', () => {
  it('CT output G·sin(θtx − θct)·sin(Φ + ψ): signed error and the null crossing at 0.5 s', () => {
    // Transmitter turning 20° → 30° over 1 s; CT rotor held at 25°, so correspondence at t = 0.5 s.
    const txMotion: MotionSpec = { type: 'ramp', startDeg: 20, degPerS: 10 };
    const ctDeg = 25;
    const maxOutputV = 22.5; // G, V RMS at 90° misalignment (our own choice for the synthetic CT)
    const leadDeg = 8;
    // The CT output is the generator's single sine winding at electrical angle θtx − θct with TR G/26
    // and the transmitter's time phase ψ: exactly G·√2·sin(θtx − θct)·sin(Φ + ψ).
    const syn = synthesizeCapture(
      synchroSpec(txMotion, {
        durationS: 1,
        units: [
          { kind: 'synchro', transformationRatio: TR_26, phaseLeadDeg: leadDeg, motion: txMotion, lines: THREE_LINES },
          { kind: 'resolver', transformationRatio: maxOutputV / 26, phaseLeadDeg: leadDeg, motion: { type: 'ramp', startDeg: 20 - ctDeg, degPerS: 10 }, lines: [{ role: 'sin', label: 'CT' }] },
        ],
      }),
    );
    const capture: Capture = syn.capture;
    // Gradient near null E_max·π/180 V per degree (derived from E = E_max·sin δ).
    const gradient = (maxOutputV * Math.PI) / 180;
    const analysis = analyzeCapture(capture, { ctGradientVPerDeg: gradient });
    const ct = analysis.units.find((u) => u.kind === 'ct')?.ctError;
    expect(ct).toBeDefined();
    const truthDeg = (t: number): number => 20 + 10 * t - ctDeg;
    // Sign: + when the transmitter is ahead of the CT (in time phase with the excitation).
    let checked = 0;
    for (let m = 0; m < ct!.tS.length; m++) {
      const d = truthDeg(ct!.tS[m]!);
      if (Math.abs(d) < 0.5 || Math.abs(d) > 4) continue;
      expect(Math.sign(ct!.errorDeg[m]!)).toBe(Math.sign(d));
      // Small-angle linear reading: sin δ/δ differs from 1 by < 0.1 % below 4°; allow 2 %.
      expect(Math.abs(ct!.errorDeg[m]! - d)).toBeLessThan(0.02 * Math.abs(d));
      checked++;
    }
    expect(checked).toBeGreaterThan(200);
    expect(ct!.nullCrossings.length).toBe(1);
    expect(ct!.nullCrossings[0]!.direction).toBe(1);
    // Within one carrier cycle (2.5 ms) of the true correspondence time.
    expect(Math.abs(ct!.nullCrossings[0]!.tS - 0.5)).toBeLessThan(1 / 400);
  });
});
