import { describe, expect, it } from 'vitest';
import { analyzeAccuracyRun, nearestIncrement } from '../../../core/motion/accuracyRun.js';
import { secondOrderStep } from '../../../core/synth/motion.js';
import { createRandom } from '../../../core/synth/random.js';

const RAD = Math.PI / 180;
const RATE_HZ = 400; // one angle per carrier cycle of a 400 Hz system

/** Known error curve, arcmin: 2′ offset + 3′ 1st harmonic (phase 30°) + 1.72′ 2nd harmonic (sin 2θ). */
const knownError = (shaftDeg: number): number => 2 + 3 * Math.cos((shaftDeg - 30) * RAD) + 1.72 * Math.sin(2 * shaftDeg * RAD);

interface RunSpec {
  startDeg?: number;
  stepDeg: number;
  stops: number;
  dwellS?: number;
  noiseDeg?: number;
  seed?: number;
  spikes?: boolean;
  error?: (shaftDeg: number) => number;
}

/**
 * A dividing-head run built directly: the shaft steps by `stepDeg` every `dwellS` seconds with a
 * second-order settling response (ζ = 0.3, 5 Hz: visible ringing), the electrical angle is the shaft
 * angle plus the error curve plus white noise, sampled at 400 per second.
 */
function steppedRun(spec: RunSpec): { t: Float64Array; deg: Float64Array; nominal: number[] } {
  const dwellS = spec.dwellS ?? 2;
  const start = spec.startDeg ?? 0;
  const rnd = createRandom(spec.seed ?? 1);
  const error = spec.error ?? knownError;
  const n = Math.round(spec.stops * dwellS * RATE_HZ);
  const t = new Float64Array(n);
  const deg = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const ti = i / RATE_HZ;
    let shaft = start;
    for (let j = 1; j < spec.stops; j++) shaft += spec.stepDeg * secondOrderStep(ti - j * dwellS, 0.3, 2 * Math.PI * 5);
    t[i] = ti;
    deg[i] = shaft + error(shaft) / 60 + (spec.noiseDeg ?? 0.02) * rnd.normal();
    if (spec.spikes && i % Math.round(dwellS * RATE_HZ) === Math.round(1.5 * RATE_HZ)) deg[i] += 5; // one 5° glitch per stop
  }
  const nominal = Array.from({ length: spec.stops }, (_, k) => start + k * spec.stepDeg);
  return { t, deg, nominal };
}

const wrap = (d: number): number => ((d % 360) + 360) % 360;
const rmsDiff = (a: readonly number[], b: readonly number[]): number => Math.sqrt(a.reduce((s, v, i) => s + (v - b[i]!) ** 2, 0) / a.length);

// Procedure and definitions: US Army compass test-set manual TM 11-4920-292-15, Table 7-2A — a swing in
// 15° steps (24 headings), index error = algebraic mean of the errors at equally spaced headings,
// one-cycle error = error at 0° minus error at 180°.
describe('analyzeAccuracyRun(t, unwrappedDeg) on a 24-heading swing in 15° steps', () => {
  const run = steppedRun({ stepDeg: 15, stops: 25 }); // 0°, 15°, …, 345°, back at 360°
  const { accuracy, findings } = analyzeAccuracyRun(run.t, run.deg);

  it('finds every stop and the 15° increment', () => {
    expect(accuracy).not.toBeNull();
    expect(accuracy!.positions).toHaveLength(25);
    expect(accuracy!.incrementDeg).toBe(15);
    expect(new Set(accuracy!.positions.map((p) => p.nominalDeg)).size).toBe(24);
    expect(accuracy!.positions.map((p) => p.nominalDeg)).toEqual(run.nominal.map(wrap));
    expect(accuracy!.coversFullTurn).toBe(true);
    expect(findings).toEqual([]);
  });

  it('measures the error at each heading within 0.5′ RMS of the truth and the spread within 1′', () => {
    const truth = run.nominal.map(knownError);
    const measured = accuracy!.positions.map((p) => p.errorArcmin);
    expect(rmsDiff(measured, truth)).toBeLessThan(0.5);
    const ppTruth = Math.max(...truth) - Math.min(...truth);
    expect(Math.abs(accuracy!.ppArcmin - ppTruth)).toBeLessThan(1);
    expect(Math.abs(accuracy!.maxAbsArcmin - Math.max(...truth.map(Math.abs)))).toBeLessThan(1);
    for (const p of accuracy!.positions) expect(p.spreadArcmin).toBeCloseTo(0.02 * 60, 0); // the 0.02° noise
  });

  it('gives the index error (2′) and the one-cycle error e(0°) − e(180°) = 6·cos 30° = 5.196′', () => {
    expect(accuracy!.indexErrorArcmin).toBeCloseTo(2, 0);
    expect(Math.abs(accuracy!.indexErrorArcmin - 2)).toBeLessThan(0.3);
    expect(Math.abs(accuracy!.oneCycleErrorArcmin! - 6 * Math.cos(30 * RAD))).toBeLessThan(0.5);
  });

  it('recovers the error harmonics: 3′ at order 1 (phase 30°), 1.72′ at order 2 (phase 90°)', () => {
    const h = accuracy!.harmonics;
    expect(h.map((x) => x.order)).toEqual([0, 1, 2, 3, 4]);
    expect(Math.abs(h[0]!.amplitudeArcmin - 2)).toBeLessThan(0.3);
    expect(Math.abs(h[1]!.amplitudeArcmin - 3)).toBeLessThan(0.3);
    expect(Math.abs(h[1]!.phaseDeg - 30)).toBeLessThan(6);
    expect(Math.abs(h[2]!.amplitudeArcmin - 1.72)).toBeLessThan(0.3);
    expect(Math.abs(h[2]!.phaseDeg - 90)).toBeLessThan(10);
    expect(h[3]!.amplitudeArcmin).toBeLessThan(0.3);
    expect(h[4]!.amplitudeArcmin).toBeLessThan(0.3);
  });

  it('reports without judging when no class is given', () => {
    expect(accuracy!.pass).toBeNull();
    expect(accuracy!.classArcmin).toBeNull();
    expect(accuracy!.failingNominalDeg).toEqual([]);
  });
});

describe('analyzeAccuracyRun pass/fail against an accuracy class (±N′ about the index error)', () => {
  const run = steppedRun({ stepDeg: 15, stops: 24, seed: 2 });
  const truthDev = run.nominal.map((d) => knownError(d) - 2);

  it('lists exactly the headings beyond ±3.4′ with an accuracy-out-of-class warning', () => {
    // guard: no heading within 0.3′ of the limit, so the noise cannot move one across it
    for (const d of truthDev) expect(Math.abs(Math.abs(d) - 3.4)).toBeGreaterThan(0.3);
    const expected = run.nominal.filter((_, k) => Math.abs(truthDev[k]!) > 3.4);
    expect(expected.length).toBeGreaterThan(0);
    const { accuracy, findings } = analyzeAccuracyRun(run.t, run.deg, { accuracyClassArcmin: 3.4, roles: ['s1s3', 's3s2'] });
    expect(accuracy!.pass).toBe(false);
    expect(accuracy!.failingNominalDeg).toEqual(expected);
    const f = findings.find((x) => x.code === 'accuracy-out-of-class')!;
    expect(f.severity).toBe('warning');
    expect(f.roles).toEqual(['s1s3', 's3s2']);
    expect(f.figures!.failingHeadings).toBe(expected.length);
    for (const d of expected) expect(f.message).toContain(`${d}°`);
  });

  it('passes a ±6′ class', () => {
    const { accuracy, findings } = analyzeAccuracyRun(run.t, run.deg, { accuracyClassArcmin: 6 });
    expect(accuracy!.pass).toBe(true);
    expect(findings.filter((x) => x.code === 'accuracy-out-of-class')).toEqual([]);
  });
});

describe('analyzeAccuracyRun on other runs', () => {
  it('handles a clockwise run (decreasing angles) that crosses zero', () => {
    const run = steppedRun({ startDeg: 90, stepDeg: -10, stops: 37, dwellS: 1.5, seed: 4 });
    const { accuracy } = analyzeAccuracyRun(run.t, run.deg);
    expect(accuracy!.incrementDeg).toBe(10);
    expect(accuracy!.positions.map((p) => p.nominalDeg)).toEqual(run.nominal.map(wrap));
    expect(rmsDiff(accuracy!.positions.map((p) => p.errorArcmin), run.nominal.map(knownError))).toBeLessThan(0.5);
    expect(accuracy!.coversFullTurn).toBe(true);
  });

  it('anchors the first stop at startDeg and detects a 22.5° increment', () => {
    const run = steppedRun({ startDeg: 45, stepDeg: 22.5, stops: 16, seed: 6 });
    const { accuracy } = analyzeAccuracyRun(run.t, run.deg, { startDeg: 45 });
    expect(accuracy!.incrementDeg).toBe(22.5);
    expect(accuracy!.positions[0]!.nominalDeg).toBe(45);
    expect(rmsDiff(accuracy!.positions.map((p) => p.errorArcmin), run.nominal.map(knownError))).toBeLessThan(0.5);
  });

  it('uses a given nominal list, and warns when its length does not match the stops', () => {
    const run = steppedRun({ startDeg: 5, stepDeg: 30, stops: 12, seed: 7 });
    const { accuracy, findings } = analyzeAccuracyRun(run.t, run.deg, { nominalDeg: run.nominal });
    expect(accuracy!.positions.map((p) => p.nominalDeg)).toEqual(run.nominal);
    expect(findings).toEqual([]);
    const short = analyzeAccuracyRun(run.t, run.deg, { nominalDeg: run.nominal.slice(0, 10) });
    expect(short.findings.map((f) => f.code)).toContain('accuracy-positions-mismatch');
    expect(short.accuracy!.positions).toHaveLength(12);
  });

  it('is not split by single-sample glitches (median level, merged stops)', () => {
    const run = steppedRun({ stepDeg: 15, stops: 24, spikes: true, seed: 8 });
    const { accuracy } = analyzeAccuracyRun(run.t, run.deg);
    expect(accuracy!.positions).toHaveLength(24);
    expect(rmsDiff(accuracy!.positions.map((p) => p.errorArcmin), run.nominal.map(knownError))).toBeLessThan(0.5);
  });

  it('reports an incomplete run (half a turn) with an info finding and no harmonics', () => {
    const run = steppedRun({ stepDeg: 15, stops: 12, seed: 9 }); // 0° … 165°
    const { accuracy, findings } = analyzeAccuracyRun(run.t, run.deg);
    expect(accuracy!.positions).toHaveLength(12);
    expect(accuracy!.coversFullTurn).toBe(false);
    expect(accuracy!.harmonics).toEqual([]);
    expect(accuracy!.oneCycleErrorArcmin).toBeNull(); // 180° never visited
    const f = findings.find((x) => x.code === 'accuracy-run-incomplete')!;
    expect(f.severity).toBe('info');
  });

  it('returns null with an info finding for a trace without stops', () => {
    const t = Float64Array.from({ length: 4000 }, (_, i) => i / RATE_HZ);
    const ramp = Float64Array.from(t, (x) => 40 * x);
    const { accuracy, findings } = analyzeAccuracyRun(t, ramp);
    expect(accuracy).toBeNull();
    expect(findings[0]!.code).toBe('accuracy-run-incomplete');
    expect(() => analyzeAccuracyRun(t, ramp.subarray(1))).toThrow(RangeError);
    expect(() => analyzeAccuracyRun(t, ramp, { accuracyClassArcmin: 0 })).toThrow(RangeError);
  });
});

describe('nearestIncrement(stepDeg)', () => {
  it('rounds a measured step to a divisor of 360° (common practice, no source)', () => {
    expect(nearestIncrement(15.04)).toBe(15);
    expect(nearestIncrement(22.4)).toBe(22.5);
    expect(nearestIncrement(7.46)).toBe(7.5);
    expect(nearestIncrement(2.51)).toBe(2.5);
    expect(nearestIncrement(44.9)).toBe(45);
    for (const inc of [1, 2, 2.5, 5, 7.5, 10, 15, 20, 22.5, 30, 45, 60, 90]) expect(360 % inc).toBe(0);
  });
});
