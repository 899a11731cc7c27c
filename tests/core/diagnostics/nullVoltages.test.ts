import { describe, expect, it } from 'vitest';
import { estimateVelocity } from '../../../core/motion/estimateVelocity.js';
import { nullVoltages, type NullOptions } from '../../../core/diagnostics/nullVoltages.js';
import { unitFigures } from '../../../core/diagnostics/unitFigures.js';
import type { SynthLineSpec, SynthSpec } from '../../../core/synth/synthesizeCapture.js';
import type { MotionSpec } from '../../../core/synth/motion.js';
import { runUnitChain, type UnitChain } from './unitChain.js';

const FS = 100_000;
const DEG = Math.PI / 180;

function spec(motion: MotionSpec, lines: SynthLineSpec[], over: Partial<SynthSpec> = {}, ratio = 11.8 / 26, rmsV = 26): SynthSpec {
  return {
    seed: 225,
    sampleRateHz: FS,
    durationS: 0.5,
    carrier: { frequencyHz: 400.07, rmsV, phaseDeg: 70 },
    units: [{ kind: 'synchro', transformationRatio: ratio, phaseLeadDeg: 9, motion, lines }],
    noiseV: 0.002,
    quantization: { bits: 16 },
    ...over,
  };
}

function nullsOf(chain: UnitChain, options: NullOptions = {}, kind: 'synchro' | 'resolver' = 'synchro') {
  const fig = unitFigures({
    kind,
    lines: chain.lines.map((l) => ({ role: l.role, inPhaseV: chain.phasors.inPhase[l.slot]!, quadratureV: chain.phasors.quadrature[l.slot]! })),
    angleDeg: chain.angle.deg,
    referencePeakV: chain.refPeakV,
    centrePhaseRad: chain.phasors.centrePhaseRad,
  });
  return nullVoltages({
    lines: chain.lines.map((l) => ({ role: l.role, samples: l.samples, maxRmsV: fig.outputMaxRmsV })),
    sampleRateHz: chain.syn.capture.sampleRateHz,
    carrier: chain.carrier.track,
    phaseLeadDeg: fig.phaseLeadDeg,
    cycles: chain.phasors,
    angleDeg: chain.angle.deg,
    velocityDegPerS: estimateVelocity(chain.angle.tS, chain.angle.unwrappedDeg),
    options,
  });
}

/** Within 10 % or 1 mV of the truth. */
function near(actual: number, truth: number, what: string): void {
  expect(Math.abs(actual - truth), `${what}: ${actual} vs ${truth}`).toBeLessThanOrEqual(Math.max(1, 0.1 * Math.abs(truth)));
}

describe('nullVoltages — in-phase, quadrature, harmonics and total at the nulls', () => {
  // Truth by construction (SAE AS20708B null components): a rotor 0.05° off the S1-S3 null
  // gives I = K·sin 0.05° (K = 11.8·√2 V peak); quadrature and a constant 3rd harmonic as set.
  const K = 11.8 * Math.SQRT2;
  const q1 = 0.02;
  const h1 = 0.015;
  const lines: SynthLineSpec[] = [{ role: 's1s3', quadratureV: q1, thirdHarmonicV: h1 }, { role: 's3s2', quadratureV: -q1 / 2 }, { role: 's2s1', quadratureV: -q1 / 2 }];

  it('static null of S1-S3 at 0° (rotor 0.05° off): each component within 10 % or 1 mV of the truth', () => {
    const chain = runUnitChain(spec({ type: 'static', deg: 0.05 }, lines));
    const r = nullsOf(chain);
    const n = r.nulls.filter((x) => x.role === 's1s3');
    expect(n).toHaveLength(1);
    const reading = n[0]!;
    expect(reading.angleDeg).toBe(0);
    expect(reading.cycles).toBeGreaterThan(150);
    const inPhase = (K * Math.sin(0.05 * DEG) / Math.SQRT2) * 1000;
    const quad = (q1 / Math.SQRT2) * 1000;
    const harm = (h1 / Math.SQRT2) * 1000;
    near(reading.inPhaseMv, inPhase, 'in-phase');
    near(reading.quadratureMv, quad, 'quadrature');
    near(reading.harmonicMv, harm, 'harmonics');
    // Total: √(I² + Q² + H² + noise²), noise 2 mV RMS white (plus 16-bit quantisation, negligible).
    near(reading.totalMv, Math.sqrt(inPhase ** 2 + quad ** 2 + harm ** 2 + 2 ** 2), 'total');
    expect(reading.offsetArcmin).toBeCloseTo(3, 0);
    // The other two lines are far from their nulls (60°/240°, 120°/300°): no readings.
    expect(r.nulls.every((x) => x.role === 's1s3')).toBe(true);
    // Healthy quadrature (14 mV < 0.5 % of 11.8 V = 59 mV): no finding; no limits set: report only.
    expect(r.findings).toEqual([]);
    expect(r.limits.nullLimitMv).toBeNull();
  });

  it('slow turn (2°/s) through 0°: the crossing is measured over the cycles within 0.01°, components within 10 % or 1 mV', () => {
    const chain = runUnitChain(spec({ type: 'ramp', startDeg: -0.5, degPerS: 2 }, lines));
    const r = nullsOf(chain);
    const n = r.nulls.filter((x) => x.role === 's1s3');
    expect(n).toHaveLength(1);
    const reading = n[0]!;
    expect(reading.tS).toBeCloseTo(0.25, 2);
    expect(reading.sweepDeg).toBeLessThanOrEqual(0.01);
    expect(reading.cycles).toBeGreaterThanOrEqual(1);
    near(reading.inPhaseMv, 0, 'in-phase at the crossing');
    near(reading.quadratureMv, (q1 / Math.SQRT2) * 1000, 'quadrature');
    near(reading.harmonicMv, (h1 / Math.SQRT2) * 1000, 'harmonics');
  });

  it('one crossing gives one null when the angle flickers across the edge of the window around it (noise at maxOffsetDeg)', () => {
    // The slow turn above through a ±0.3° window; two cycles just past its edge are moved back
    // inside by 0.0005°, as angle noise does. One crossing took place (by construction).
    const chain = runUnitChain(spec({ type: 'ramp', startDeg: -0.5, degPerS: 2 }, lines));
    // Angles come wrapped to [0°, 360°): −0.5° reads 359.5°.
    const deg = Float64Array.from(chain.angle.deg, (d) => d - 360 * Math.round(d / 360));
    const edge = deg.findIndex((d, i) => i > 0 && d > 0.3 && deg[i - 1]! <= 0.3);
    expect(edge).toBeGreaterThan(0);
    deg[edge + 1] = 0.2995;
    deg[edge + 2] = 0.2998;
    const flickering = { ...chain, angle: { ...chain.angle, deg } };
    const n = nullsOf(flickering, { maxOffsetDeg: 0.3 }).nulls.filter((x) => x.role === 's1s3');
    expect(n).toHaveLength(1);
    near(n[0]!.inPhaseMv, 0, 'in-phase at the crossing');
  });

  it('fast turn (120°/s, 0.3° per cycle): every crossing is skipped and an info finding says why', () => {
    const chain = runUnitChain(spec({ type: 'ramp', startDeg: 5, degPerS: 120 }, lines, { durationS: 3.2 }));
    const r = nullsOf(chain);
    expect(r.nulls).toEqual([]);
    // 3.2 s × 120°/s = 384°: S1-S3 crosses 180° and 360°, S3-S2 60° and 240°, S2-S1 120° and 300°.
    expect(r.skipped).toHaveLength(6);
    expect(r.findings.map((f) => f.code)).toEqual(['nulls-too-fast']);
    expect(r.findings[0]!.severity).toBe('info');
  });

  it('resolver turning at 1.5°/s through 90°: the cosine winding’s null is found at 90°, the sine winding has none', () => {
    const resolver: SynthSpec = { ...spec({ type: 'ramp', startDeg: 89.7, degPerS: 1.5 }, []), durationS: 0.4 };
    const chain = runUnitChain({ ...resolver, units: [{ kind: 'resolver', transformationRatio: 11.8 / 26, phaseLeadDeg: 6, motion: { type: 'ramp', startDeg: 89.7, degPerS: 1.5 }, lines: [{ role: 'sin' }, { role: 'cos', quadratureV: 0.01 }] }] });
    const r = nullsOf(chain, {}, 'resolver');
    expect(r.nulls.map((x) => [x.role, x.angleDeg])).toEqual([['cos', 90]]);
    expect(r.nulls[0]!.tS).toBeCloseTo(0.2, 2);
    near(r.nulls[0]!.inPhaseMv, 0, 'in-phase');
    near(r.nulls[0]!.quadratureMv, (0.01 / Math.SQRT2) * 1000, 'quadrature');
  });

  it('high quadrature (150 mV peak on S1-S3, 106 mV RMS > 0.5 % of 11.8 V): a high-quadrature warning on that line only', () => {
    const bad: SynthLineSpec[] = [{ role: 's1s3', quadratureV: 0.15 }, { role: 's3s2', quadratureV: -0.075 }, { role: 's2s1', quadratureV: -0.075 }];
    const chain = runUnitChain(spec({ type: 'static', deg: 180.01 }, bad));
    const r = nullsOf(chain);
    const reading = r.nulls.find((x) => x.role === 's1s3')!;
    expect(reading.angleDeg).toBe(180);
    // Signed against cos(Φ + ψ): the same sign at either null of the line.
    near(reading.quadratureMv, (0.15 / Math.SQRT2) * 1000, 'quadrature at 180°');
    const hq = r.findings.filter((f) => f.code === 'high-quadrature');
    expect(hq).toHaveLength(1);
    expect(hq[0]!.severity).toBe('warning');
    expect(hq[0]!.roles).toEqual(['s1s3']);
    expect(hq[0]!.figures!.limitMv).toBeCloseTo(0.005 * 11.8 * 1000, 0);
  });

  it('limits are the user’s: with nullLimitMv = 10 mV the 20 mV null is flagged (null-over-limit, high-quadrature against the set limit); unset, nothing is judged', () => {
    const chain = runUnitChain(spec({ type: 'static', deg: 0.05 }, lines));
    const judged = nullsOf(chain, { nullLimitMv: 10 });
    expect(judged.findings.map((f) => f.code).sort()).toEqual(['high-quadrature', 'null-over-limit']);
    expect(judged.limits.nullLimitMv).toBe(10);
    const loose = nullsOf(chain, { nullLimitMv: 40 });
    expect(loose.findings).toEqual([]);
  });

  it('clean 115 V / 90 V unit parked at the S2-S1 null (120°): no high-quadrature', () => {
    const chain = runUnitChain(spec({ type: 'static', deg: 120.002 }, [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }], { noiseV: 0.02 }, 90 / 115, 115));
    const r = nullsOf(chain);
    const reading = r.nulls.find((x) => x.role === 's2s1')!;
    expect(reading.angleDeg).toBe(120);
    expect(Math.abs(reading.quadratureMv)).toBeLessThan(2);
    expect(r.findings).toEqual([]);
  });

  it('bad arguments: a role without nulls, or arrays of different lengths, are RangeErrors', () => {
    const chain = runUnitChain(spec({ type: 'static', deg: 0 }, lines, { durationS: 0.05 }));
    const base = { sampleRateHz: FS, carrier: chain.carrier.track, phaseLeadDeg: 9, cycles: chain.phasors, angleDeg: chain.angle.deg, velocityDegPerS: new Float64Array(chain.angle.deg.length) };
    expect(() => nullVoltages({ ...base, lines: [{ role: 'ref', samples: chain.lines[0]!.samples }] })).toThrow(RangeError);
    expect(() => nullVoltages({ ...base, velocityDegPerS: [0], lines: [{ role: 's1s3', samples: chain.lines[0]!.samples }] })).toThrow(RangeError);
  });
});
