import { describe, expect, it } from 'vitest';
import { analyzeCapture } from '../../core/pipeline.js';
import { parseCaptureBytes, createCaptureParser } from '../../core/import/captureParser.js';
import { CSV_LAYOUTS, formatCaptureCsv } from '../../core/synth/formatCaptureCsv.js';
import { synthesizeCapture, type SynthSpec } from '../../core/synth/synthesizeCapture.js';
import type { MotionSpec } from '../../core/synth/motion.js';
import { createRandom } from '../../core/synth/random.js';
import { angleError, angleNoiseBoundDeg } from '../helpers/angleError.js';

const FS = 100_000;
const LINE_PEAK_V = 11.8 * Math.SQRT2; // 26 V / 11.8 V synchro: stator maximum 11.8 V RMS (NEETS Module 15 p.1-60)

function spec(motion: MotionSpec, over: Partial<SynthSpec> = {}, driftHzPerS = 0): SynthSpec {
  return {
    seed: 77,
    sampleRateHz: FS,
    durationS: 1,
    carrier: { frequencyHz: 400.13, rmsV: 26, phaseDeg: 25, driftHzPerS },
    units: [{ kind: 'synchro', transformationRatio: 11.8 / 26, phaseLeadDeg: 8, motion, lines: [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }] }],
    noiseV: 0.01,
    quantization: { bits: 12 },
    ...over,
  };
}

function toBytes(syn: ReturnType<typeof synthesizeCapture>, layoutName: string): Uint8Array {
  const layout = CSV_LAYOUTS[layoutName]!;
  const channels = syn.capture.channels.map((c) => ({ label: c.label, samples: c.samples }));
  const parts: Buffer[] = [];
  for (const chunk of formatCaptureCsv({ sampleRateHz: syn.capture.sampleRateHz, startS: 0, channels }, layout)) parts.push(Buffer.from(chunk, 'utf8'));
  return Buffer.concat(parts);
}

const MOTIONS: Record<string, MotionSpec> = {
  static: { type: 'static', deg: 203.7 },
  rotating: { type: 'ramp', startDeg: 12, degPerS: 120 },
};

// End to end: synthetic captures written in every CSV layout, parsed, analysed, and compared
// with the angle they were generated from. Acceptance bound: within 2× the per-cycle lock-in
// noise limit (a least-squares lock-in's, about 0.003° at 10 mV on 11.8 V lines), carrier within
// 0.002 Hz.
describe('analyzeCapture on every CSV layout (12-bit, 10 mV noise)', () => {
  for (const layoutName of Object.keys(CSV_LAYOUTS)) {
    for (const [motionName, motion] of Object.entries(MOTIONS)) {
      it(`${layoutName}, ${motionName} shaft: angle within 2× the noise bound, carrier within 0.002 Hz`, () => {
        const syn = synthesizeCapture(spec(motion));
        const imported = parseCaptureBytes(toBytes(syn, layoutName));
        const analysis = analyzeCapture(imported.capture);
        expect(Math.abs(analysis.carrier.frequencyHz - 400.13)).toBeLessThan(0.002);
        const err = angleError(analysis.angle!, (t) => syn.angleDeg(t));
        const bound = angleNoiseBoundDeg(FS / 400.13, 0.01, LINE_PEAK_V, 12);
        expect(err.rmsDeg).toBeLessThan(2 * bound);
        expect(analysis.units[0]!.transformationRatio).toBeCloseTo(11.8 / 26, 3);
        expect(analysis.units[0]!.phaseLeadDeg).toBeCloseTo(8, 1);
        // Without labels the stator line order can only come from column order, which the
        // analysis must say (roles-guessed); with labels nothing above info level is expected.
        const warnings = [...imported.findings, ...analysis.findings].filter((f) => f.severity !== 'info').map((f) => f.code);
        expect(warnings).toEqual(CSV_LAYOUTS[layoutName]!.header === 'none' ? ['roles-guessed'] : []);
      });
    }
  }
});

describe('analyzeCapture on harder captures', () => {
  it('a drifting carrier (0.8 Hz over the record) with a turning shaft', () => {
    const syn = synthesizeCapture(spec(MOTIONS.rotating!, {}, 0.8));
    const analysis = analyzeCapture(syn.capture);
    const err = angleError(analysis.angle!, (t) => syn.angleDeg(t));
    expect(err.rmsDeg).toBeLessThan(2 * angleNoiseBoundDeg(FS / 400.5, 0.01, LINE_PEAK_V, 12));
    expect(analysis.carrier.startHz).toBeCloseTo(400.13, 2);
    expect(analysis.carrier.endHz).toBeCloseTo(400.93, 2);
  });

  it('an 8-bit scope with 50 Hz hum: error stays near its (larger) noise bound', () => {
    const syn = synthesizeCapture(spec(MOTIONS.rotating!, { quantization: { bits: 8 }, hum: { frequencyHz: 50, amplitudeV: 0.05 } }));
    const analysis = analyzeCapture(syn.capture);
    const err = angleError(analysis.angle!, (t) => syn.angleDeg(t));
    // hum at 50 Hz is not orthogonal to one 400 Hz cycle; it leaks about 2·0.05/8 V per window (derived)
    expect(err.rmsDeg).toBeLessThan(2 * angleNoiseBoundDeg(FS / 400.13, Math.hypot(0.01, 0.05 / 4), LINE_PEAK_V, 8));
  });

  it('a resolver, and two lines against a common lead, in any column order', () => {
    const resolver = synthesizeCapture(
      spec(MOTIONS.rotating!, {
        order: [2, 0, 1],
        units: [{ kind: 'resolver', transformationRatio: 0.5, phaseLeadDeg: 5, motion: MOTIONS.rotating!, lines: [{ role: 'sin' }, { role: 'cos' }] }],
      }),
    );
    const r = analyzeCapture(resolver.capture);
    expect(angleError(r.angle!, (t) => resolver.angleDeg(t)).rmsDeg).toBeLessThan(2 * angleNoiseBoundDeg(FS / 400.13, 0.01, 13 * Math.SQRT2, 12));
    const twoLine = synthesizeCapture(
      spec(MOTIONS.static!, {
        units: [{ kind: 'synchro', transformationRatio: 11.8 / 26, phaseLeadDeg: 8, motion: MOTIONS.static!, lines: [{ role: 's2s3' }, { role: 's1s3' }] }],
      }),
    );
    const t = analyzeCapture(twoLine.capture);
    expect(t.units[0]!.method).toBe('two-lines');
    // two lines carry more noise than three: sin = P − Q doubles the variance (derived)
    expect(angleError(t.angle!, (x) => twoLine.angleDeg(x)).rmsDeg).toBeLessThan(2 * Math.SQRT2 * angleNoiseBoundDeg(FS / 400.13, 0.01, LINE_PEAK_V, 12));
  });

  it('no reference: angle correct modulo 180°, no-reference finding', () => {
    const syn = synthesizeCapture(spec(MOTIONS.rotating!, { includeReference: false }));
    const analysis = analyzeCapture(syn.capture);
    expect(analysis.findings.map((f) => f.code)).toContain('no-reference');
    expect(analysis.angle!.ambiguous180).toBe(true);
    const direct = angleError(analysis.angle!, (t) => syn.angleDeg(t));
    const flipped = angleError(analysis.angle!, (t) => syn.angleDeg(t) + 180);
    expect(Math.min(direct.rmsDeg, flipped.rmsDeg)).toBeLessThan(2 * angleNoiseBoundDeg(FS / 400.13, 0.01, LINE_PEAK_V, 12));
    expect(analysis.units[0]!.transformationRatio).toBeNull();
  });

  it('streaming in random chunk sizes gives the same analysis as one buffer', () => {
    const syn = synthesizeCapture(spec(MOTIONS.rotating!, { durationS: 0.2 }));
    const bytes = toBytes(syn, Object.keys(CSV_LAYOUTS)[0]!);
    const whole = analyzeCapture(parseCaptureBytes(bytes).capture);
    const parser = createCaptureParser();
    const rnd = createRandom(5);
    for (let at = 0; at < bytes.length; ) {
      const size = 1 + Math.floor(rnd.uniform() * 70_000);
      parser.push(bytes.subarray(at, at + size));
      at += size;
    }
    const chunked = analyzeCapture(parser.finish().capture);
    expect(Array.from(chunked.angle!.deg)).toEqual(Array.from(whole.angle!.deg));
  });
});

describe('analyzeCapture refusals', () => {
  it('a CT output without the excitation is one clear CaptureError, not a crash', () => {
    const syn = synthesizeCapture(spec(MOTIONS.static!, { includeReference: false }));
    const capture = { ...syn.capture, channels: [{ ...syn.capture.channels[0]!, label: 'CT' }] };
    expect(() => analyzeCapture(capture)).toThrow(/control-transformer output alone/);
  });

  it('no stator channel at all is one clear CaptureError naming the channels', () => {
    const syn = synthesizeCapture(spec(MOTIONS.static!));
    const capture = { ...syn.capture, channels: [syn.capture.channels[0]!] };
    expect(() => analyzeCapture(capture)).toThrow(/no stator channel found among "R1-R2"/);
  });
});
