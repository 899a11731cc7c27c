import { describe, expect, it } from 'vitest';
import type { Capture } from '../../../core/model/capture.js';
import { analyzeCapture } from '../../../core/pipeline.js';
import type { MotionSpec } from '../../../core/synth/motion.js';
import { synthesizeCapture, type SynthLineSpec, type SynthSpec } from '../../../core/synth/synthesizeCapture.js';
import { angleError } from '../../helpers/angleError.js';
import { byCode, CARRIER_HZ, codes, problems, REF_115_V, synchroSpec, THREE_LINES, TR_115, TR_26 } from './fixtures.js';

// End-to-end acceptance of the unit and wiring diagnostics: seeded synthetic captures with one
// known fault each go through analyzeCapture, and the fault must come back by its finding code.
// Truth is the generator's own parameters.

const STATIC: MotionSpec = { type: 'static', deg: 37 };
/** 200°/s: half a degree per 400 Hz carrier cycle. */
const TURNING: MotionSpec = { type: 'ramp', startDeg: 10, degPerS: 200 };

const analyse = (spec: SynthSpec, options: Parameters<typeof analyzeCapture>[1] = {}) => {
  const syn = synthesizeCapture(spec);
  return { syn, analysis: analyzeCapture(syn.capture, options) };
};
const withLine = (role: string, line: Partial<SynthLineSpec>): SynthLineSpec[] =>
  THREE_LINES.map((l) => (l.role === role ? { ...l, ...line } : l));

describe('each synthetic fault is reported by its code', () => {
  it('dead-channel: one of three lines at gain 0; the angle is solved from the other two', () => {
    // Line-to-line voltages sum to zero (Kirchhoff; the standard synchro equations, NEETS Module 15
    // p.1-60), so a dead third line can be rebuilt.
    const { syn, analysis } = analyse(synchroSpec(TURNING, {}, { lines: withLine('s3s2', { gain: 0 }) }));
    const dead = byCode(analysis.findings, 'dead-channel');
    expect(dead).toBeDefined();
    expect(dead!.roles).toEqual(['s3s2']);
    // Acceptance bound 0.02° RMS (issue "Unit and wiring diagnostics"); truth: the generator's angle.
    expect(angleError(analysis.angle!, (t) => syn.angleDeg(t), 2).rmsDeg).toBeLessThan(0.02);
  });

  it('scale-mismatch: one line at gain 10 (a ×10 probe set to ×1) gives the likely factor 10', () => {
    const { syn, analysis } = analyse(synchroSpec(TURNING, {}, { lines: withLine('s2s1', { gain: 10 }) }));
    const scale = byCode(analysis.findings, 'scale-mismatch');
    expect(scale).toBeDefined();
    expect(scale!.roles).toContain('s2s1');
    // The generator's gain (10) is the truth for the factor.
    expect(scale!.figures!.likelyFactor).toBe(10);
    expect(scale!.figures!.factor).toBeCloseTo(10, 2);
    expect(angleError(analysis.angle!, (t) => syn.angleDeg(t), 2).rmsDeg).toBeLessThan(0.02);
  });

  it('shorted-lines: S1 and S2 joined on a turning shaft (NEETS Module 15 p.1-57/1-59)', () => {
    const { analysis } = analyse(synchroSpec(TURNING, {}, { statorFault: { type: 'shorted', leads: 's1s2' } }));
    const f = byCode(analysis.findings, 'shorted-lines');
    expect(f).toBeDefined();
    expect(f!.severity).toBe('error');
    expect(analysis.units[0]!.angleValid).toBe(false);
  });

  it('open-lead: S3 open on a turning shaft (NEETS Module 15 p.1-57)', () => {
    const { analysis } = analyse(synchroSpec(TURNING, {}, { statorFault: { type: 'open', lead: 's3' } }));
    expect(codes(analysis.findings)).toContain('open-lead');
    expect(analysis.units[0]!.angleValid).toBe(false);
  });

  it('clipping: S1-S3 clipped at 14 V, below its 16.7 V peak', () => {
    // 11.8 V RMS stator maximum = 16.69 V peak (NEETS Module 15 p.1-60); clipV 14 V cuts it.
    const { analysis } = analyse(synchroSpec(TURNING, {}, { lines: withLine('s1s3', { clipV: 14 }) }));
    const f = byCode(analysis.findings, 'clipping');
    expect(f).toBeDefined();
    expect(f!.roles).toEqual(['s1s3']);
    expect(analysis.input.channels.find((c) => c.role === 's1s3')!.clippedFraction).toBeGreaterThan(0);
  });

  it('mains-hum: 0.2 V of 50 Hz on every channel', () => {
    const { analysis } = analyse(synchroSpec(STATIC, { hum: { frequencyHz: 50, amplitudeV: 0.2 } }));
    const hum = analysis.findings.filter((f) => f.code === 'mains-hum');
    expect(hum.length).toBeGreaterThan(0);
    // 0.2 V peak = 141.4 mV RMS (truth from the generator's amplitude); allow 5 %.
    for (const f of hum) expect(Math.abs(f.figures!.hum50HzMv! - 200 / Math.SQRT2)).toBeLessThan(0.05 * 200 / Math.SQRT2);
    expect(hum.some((f) => f.severity === 'warning')).toBe(true);
    // The hum also shakes the angle at 50 Hz; that is pickup, not a hunting receiver, so it must
    // not be raised as a hunting warning (common practice, no source).
    for (const f of analysis.findings.filter((x) => x.code === 'hunting')) expect(f.severity).toBe('info');
  });

  it('dc-offset: 2 V of DC on S1-S3 (12 % of its scale)', () => {
    const { analysis } = analyse(synchroSpec(STATIC, {}, { lines: withLine('s1s3', { offsetV: 2 }) }));
    const f = byCode(analysis.findings, 'dc-offset');
    expect(f).toBeDefined();
    expect(f!.roles).toEqual(['s1s3']);
    expect(f!.figures!.dcMv).toBeCloseTo(2000, -1);
  });

  it('low-sample-rate: 6 samples per carrier cycle', () => {
    // Sampling theorem (Oppenheim & Schafer ch.4): the 3rd harmonic needs more than 6 samples per cycle.
    const { analysis } = analyse(synchroSpec(STATIC, { sampleRateHz: 6 * CARRIER_HZ }));
    const f = byCode(analysis.findings, 'low-sample-rate');
    expect(f).toBeDefined();
    expect(f!.figures!.samplesPerCycle).toBeCloseTo(6, 3);
  });

  it('short-record: 8 carrier cycles (20 ms)', () => {
    // Fewer than 10 cycles give no robust median (common practice, no source).
    const { analysis } = analyse(synchroSpec(STATIC, { durationS: 0.02 }));
    const f = byCode(analysis.findings, 'short-record');
    expect(f).toBeDefined();
    expect(f!.figures!.cycles).toBeLessThan(10);
  });

  it('channel-skew: S3-S2 recorded 3 samples (75 µs) late on a turning shaft', () => {
    const { analysis } = analyse(synchroSpec(TURNING, {}, { lines: withLine('s3s2', { skewSamples: 3 }) }));
    const f = analysis.findings.find((x) => x.code === 'channel-skew' && x.roles.includes('s3s2'));
    expect(f).toBeDefined();
    expect(f!.severity).toBe('warning');
    // Truth: 3 samples at 40 kS/s = 75 µs, the line lagging (positive); allow 5 %.
    expect(Math.abs(f!.figures!.skewUs! - 75)).toBeLessThan(0.05 * 75);
  });

  it('high-quadrature: 0.3 V peak (212 mV RMS) quadrature on every line, shaft near the S1-S3 null', () => {
    // SAE AS20708B: the null is where the in-phase part vanishes; quadrature remains.
    const lines = THREE_LINES.map((l) => ({ ...l, quadratureV: 0.3 }));
    const { analysis } = analyse(synchroSpec({ type: 'ramp', startDeg: -0.5, degPerS: 2 }, {}, { lines }));
    const f = byCode(analysis.findings, 'high-quadrature');
    expect(f).toBeDefined();
    expect(f!.roles).toEqual(['s1s3']);
    expect(Math.abs(f!.figures!.quadratureMv!)).toBeCloseTo(300 / Math.SQRT2, -1);
  });

  it('ratio-off-standard: transformation ratio 0.6 matches no family', () => {
    // Families 26 V / 11.8 V (0.454) and 115 V / 90 V (0.783), NEETS Module 15 p.1-60.
    const { analysis } = analyse(synchroSpec(STATIC, {}, { transformationRatio: 0.6 }));
    const f = byCode(analysis.findings, 'ratio-off-standard');
    expect(f).toBeDefined();
    expect(f!.figures!.transformationRatio).toBeCloseTo(0.6, 3);
    expect(analysis.units[0]!.family).toBeNull();
  });

  it('carrier-drift: 4 Hz/s, 2 Hz over the record', () => {
    const { analysis } = analyse(synchroSpec(TURNING, { carrier: { frequencyHz: CARRIER_HZ, rmsV: 26, phaseDeg: 25, driftHzPerS: 4 } }));
    const f = byCode(analysis.findings, 'carrier-drift');
    expect(f).toBeDefined();
    // Truth: f(t) = f0 + 4 Hz/s · t over 0.5 s; the figures are at the first and last cycle centres.
    expect(f!.figures!.driftHz).toBeGreaterThan(1.9);
    expect(f!.figures!.driftHz).toBeLessThan(2.0);
  });

  it('no-reference: the excitation channel left out', () => {
    const { analysis } = analyse(synchroSpec(TURNING, { includeReference: false }));
    expect(codes(analysis.findings)).toContain('no-reference');
    expect(analysis.carrier.source).toBe('stators');
  });

  // NEETS Module 15 p.1-59, table 1-6: S1 and S3 swapped makes the receiver (here, the decoded angle)
  // turn the wrong way from the right zero; R1/R2 reversed puts it 180° off, turning the right way.
  it('wiring-swapped: leads S1 and S3 exchanged at the terminals, shaft from electrical zero turned CCW', () => {
    // The terminal labelled S1 carries lead S3 and vice versa, so the channel the scope labels
    // "S1-S3" records E(S3-S1), "S3-S2" records E(S1-S2) and "S2-S1" records E(S2-S3).
    const lines: SynthLineSpec[] = [
      { role: 's3s1', label: 'S1-S3' },
      { role: 's1s2', label: 'S3-S2' },
      { role: 's2s3', label: 'S2-S1' },
    ];
    const ccw: MotionSpec = { type: 'ramp', startDeg: 0, degPerS: 60 };
    const { analysis } = analyse(synchroSpec(ccw, {}, { lines }), { shaftFacts: { atElectricalZero: true, turned: 'ccw' } });
    const f = byCode(analysis.findings, 'wiring-swapped');
    expect(f).toBeDefined();
    expect(f!.figures!.likelySense).toBe(-1);
    expect(f!.figures!.likelyOffsetDeg).toBe(0);
    expect(f!.advice).toMatch(/S1 and S3/);
    expect(codes(analysis.findings)).not.toContain('rotor-reversed');
  });

  it('rotor-reversed: R1 and R2 exchanged at the reference probe, shaft from electrical zero turned CCW', () => {
    const ccw: MotionSpec = { type: 'ramp', startDeg: 0, degPerS: 60 };
    const syn = synthesizeCapture(synchroSpec(ccw));
    const refIndex = syn.roles.indexOf('ref');
    const reversed: Capture = {
      ...syn.capture,
      channels: syn.capture.channels.map((c, i) => (i === refIndex ? { ...c, samples: c.samples.map((v) => -v) } : c)),
    };
    const options = { shaftFacts: { atElectricalZero: true, turned: 'ccw' } } as const;
    const analysis = analyzeCapture(reversed, options);
    const f = byCode(analysis.findings, 'rotor-reversed');
    expect(f).toBeDefined();
    expect(f!.figures!.likelyOffsetDeg).toBe(180);
    expect(f!.figures!.likelySense).toBe(1);
    // The same capture as wired: no wiring finding.
    const asWired = codes(analyzeCapture(syn.capture, options).findings);
    expect(asWired).not.toContain('rotor-reversed');
    expect(asWired).not.toContain('wiring-swapped');
  });
});

describe('clean captures give no warning or error', () => {
  const resolverLines: SynthLineSpec[] = [{ role: 'sin' }, { role: 'cos' }];
  // Two lines against the common lead S2: E(S1-S2) and E(S3-S2).
  const againstS2: SynthLineSpec[] = [{ role: 's1s2' }, { role: 's3s2' }];
  const on115 = (motion: MotionSpec, frequencyHz: number, phaseLeadDeg: number): SynthSpec =>
    synchroSpec(motion, { carrier: { frequencyHz, rmsV: REF_115_V, phaseDeg: 10 } }, { transformationRatio: TR_115, phaseLeadDeg });
  const cases: Record<string, SynthSpec> = {
    '26 V / 11.8 V, 400 Hz, three lines, static': synchroSpec(STATIC),
    '26 V / 11.8 V, 400 Hz, three lines, turning': synchroSpec(TURNING),
    '26 V / 11.8 V, two lines against S2, static': synchroSpec(STATIC, {}, { lines: againstS2 }),
    '26 V / 11.8 V, two lines against S2, turning': synchroSpec(TURNING, {}, { lines: againstS2 }),
    'resolver TR 0.454, static': synchroSpec(STATIC, {}, { kind: 'resolver', lines: resolverLines }),
    'resolver TR 0.454, turning': synchroSpec(TURNING, {}, { kind: 'resolver', lines: resolverLines }),
    '115 V / 90 V, 400 Hz, turning': on115(TURNING, CARRIER_HZ, 8),
    '115 V / 90 V, 60 Hz, static': on115(STATIC, 60.02, 15),
    '115 V / 90 V, 60 Hz, turning': on115({ type: 'ramp', startDeg: 10, degPerS: 30 }, 60.02, 15),
    '8-bit scope, static': synchroSpec(STATIC, { quantization: { bits: 8 } }),
    '8-bit scope, turning': synchroSpec(TURNING, { quantization: { bits: 8 } }),
    '12-bit scope, turning': synchroSpec(TURNING, { quantization: { bits: 12 } }),
  };
  for (const [name, spec] of Object.entries(cases)) {
    it(name, () => {
      const { analysis } = analyse(spec);
      // Common practice, no source: a healthy unit on a sound bench raises nothing above info.
      expect(problems(analysis.findings)).toEqual([]);
      const unit = analysis.units[0]!;
      // Matching family (NEETS Module 15 p.1-60 ratios) and ratio within 0.5 % of the generator's.
      expect(unit.family).not.toBeNull();
      expect(Math.abs(unit.transformationRatio! / spec.units[0]!.transformationRatio - 1)).toBeLessThan(0.005);
    });
  }
});

describe('unit figures with per-line quadrature present', () => {
  // Quadrature 35, −21 and 14 mV RMS: a real unit's, well under 0.5 % of the 11.8 V maximum.
  const lines: SynthLineSpec[] = [
    { role: 's1s3', quadratureV: 0.05 },
    { role: 's3s2', quadratureV: -0.03 },
    { role: 's2s1', quadratureV: 0.02 },
  ];
  for (const [name, motion] of [['static', STATIC], ['turning', TURNING]] as const) {
    for (const lead of [8, 20]) {
      it(`${name} shaft, phase lead ${lead}°: ratio within 0.5 %, lead within 0.3°`, () => {
        const { analysis } = analyse(synchroSpec(motion, {}, { lines, phaseLeadDeg: lead }));
        const unit = analysis.units[0]!;
        // Truth: the generator's TR (11.8/26, NEETS Module 15 p.1-60) and lead ψ.
        expect(Math.abs(unit.transformationRatio! / TR_26 - 1)).toBeLessThan(0.005);
        expect(Math.abs(unit.phaseLeadDeg! - lead)).toBeLessThan(0.3);
      });
    }
  }
});

describe('null components at a static null (SAE AS20708B null definition)', () => {
  // Shaft at 0.05°: S1-S3 = 11.8 V·sin(0.05°) in phase (standard synchro equations, NEETS Module 15
  // p.1-60), plus 20 mV peak quadrature and 15 mV peak 3rd harmonic added on that line, 1 mV noise.
  const shaftDeg = 0.05;
  const q = 0.02, h3 = 0.015, noise = 0.001;
  const spec = synchroSpec({ type: 'static', deg: shaftDeg }, { noiseV: noise, quantization: { bits: 16 } }, { lines: withLine('s1s3', { quadratureV: q, thirdHarmonicV: h3 }) });
  // Truth, mV RMS, from the generator's parameters.
  const inPhaseMv = 11.8 * Math.sin((shaftDeg * Math.PI) / 180) * 1000;
  const quadratureMv = (q / Math.SQRT2) * 1000;
  const harmonicMv = (h3 / Math.SQRT2) * 1000;
  // True-RMS total: everything left, noise included (AS20708B total null).
  const totalMv = Math.hypot(inPhaseMv, quadratureMv, harmonicMv, noise * 1000);
  const within = (got: number, truth: number): void => {
    // Acceptance: within 10 % or 1 mV, whichever is larger (issue "Unit and wiring diagnostics").
    expect(Math.abs(got - truth)).toBeLessThanOrEqual(Math.max(0.1 * Math.abs(truth), 1));
  };

  it('in-phase, quadrature, 3rd harmonic and total within 10 % or 1 mV', () => {
    const { analysis } = analyse(spec);
    const n = analysis.units[0]!.nulls.find((x) => x.role === 's1s3' && x.angleDeg === 0);
    expect(n).toBeDefined();
    within(n!.inPhaseMv, inPhaseMv);
    within(Math.abs(n!.quadratureMv), quadratureMv);
    within(n!.harmonicMv, harmonicMv);
    within(n!.totalMv, totalMv);
  });

  // The high-quadrature rule is a fraction of the unit's stator maximum (0.5 % of 11.8 V = 59 mV),
  // not of the line's own largest reading, which on a shaft parked at a null is the null itself.
  it('a 14 mV null quadrature (0.12 % of the 11.8 V stator maximum) raises no high-quadrature warning', () => {
    const { analysis } = analyse(spec);
    expect(codes(analysis.findings)).not.toContain('high-quadrature');
  });
});
