import { describe, expect, it } from 'vitest';
import { constantCarrierTrack } from '../../../core/carrier/carrierTrack.js';
import { demodulateCycles } from '../../../core/demod/demodulateCycles.js';
import {
  checkCaptureQuality,
  checkRecordLength,
  fitCarrierResidual,
  humLeakFraction,
  MIN_SAMPLES_PER_CYCLE,
  type CaptureQuality,
} from '../../../core/diagnostics/captureQuality.js';
import { checkSynchroLines } from '../../../core/diagnostics/wiringFaults.js';
import type { MotionSpec } from '../../../core/synth/motion.js';
import { synthesizeCapture, type SynthLineSpec, type SynthSpec } from '../../../core/synth/synthesizeCapture.js';
import { CARRIER_HZ, demodCase, FS, makeSpec, REF_PEAK_V, THREE_LINES, TR_26V } from './wiringFixtures.js';

const LINE_PEAK_V = TR_26V * REF_PEAK_V;
const TURN: MotionSpec = { type: 'ramp', startDeg: 10, degPerS: 720 };
const STATIC: MotionSpec = { type: 'static', deg: 37 };

function quality(spec: SynthSpec): { q: CaptureQuality; c: ReturnType<typeof demodCase> } {
  const c = demodCase(spec);
  const q = checkCaptureQuality({
    sampleCount: c.syn.capture.sampleCount,
    samplesPerCycle: FS / spec.carrier.frequencyHz,
    carrierHz: spec.carrier.frequencyHz,
    track: c.track,
    phasors: c.phasors,
    channels: c.syn.capture.channels.map((ch, i) => ({
      role: c.roles[i]!,
      samples: ch.samples,
      phasorChannel: i,
      scalePeakV: c.roles[i] === 'ref' ? REF_PEAK_V : LINE_PEAK_V,
      isReference: c.roles[i] === 'ref',
    })),
    units: [{ lines: c.unit, roleNames: c.unit.lines.map((l) => l.base) }],
  });
  return { q, c };
}
const codes = (q: CaptureQuality) => q.findings.map((f) => `${f.code}:${f.severity}:${f.roles.join(',')}`);

describe('checkRecordLength (moved from the pipeline; thresholds tied to the harmonics reported)', () => {
  it('8 samples per cycle keep the 3rd harmonic below Nyquist (sampling theorem); fewer warn, under 4 is an error', () => {
    expect(MIN_SAMPLES_PER_CYCLE).toBe(8);
    expect(checkRecordLength(8, 100)).toEqual([]);
    expect(checkRecordLength(7.9, 100).map((f) => `${f.code}:${f.severity}`)).toEqual(['low-sample-rate:warning']);
    expect(checkRecordLength(3.9, 100).map((f) => `${f.code}:${f.severity}`)).toEqual(['low-sample-rate:error']);
    expect(checkRecordLength(50, 9).map((f) => f.code)).toEqual(['short-record']);
    expect(checkRecordLength(50, 10)).toEqual([]);
  });
});

describe('humLeakFraction(f, fc)', () => {
  it('bounds the leak of a tone into one-cycle LS phasors, and is ≈ 2f/fc for f ≪ fc (derived; checked numerically)', () => {
    for (const f of [50, 60, 150]) {
      const n = 40_000;
      const x = Float64Array.from({ length: n }, (_, i) => Math.sin((2 * Math.PI * f * i) / FS + 0.3));
      const ph = demodulateCycles([x], constantCarrierTrack(FS, CARRIER_HZ, 0, n), n);
      let worst = 0;
      for (let m = 0; m < ph.cycleCount; m++) worst = Math.max(worst, Math.hypot(ph.inPhase[0]![m]!, ph.quadrature[0]![m]!));
      const bound = humLeakFraction(f, CARRIER_HZ);
      expect(worst).toBeLessThanOrEqual(bound * 1.02);
      expect(worst).toBeGreaterThan(0.5 * bound);
    }
    expect(humLeakFraction(10, 4000)).toBeCloseTo((2 * 10) / 4000, 5);
  });
});

describe('checkCaptureQuality: each fault from a synthetic capture', () => {
  it('clipping: a line clipped at ±14 V by the scope range', () => {
    const { q } = quality(makeSpec(TURN, [{ role: 's1s3', clipV: 14 }, { role: 's3s2' }, { role: 's2s1' }]));
    expect(codes(q)).toEqual(['clipping:warning:s1s3']);
    // A 16.69 V peak sine clipped at 14 V spends 2·acos(14/16.69)/π ≈ 36.7 % of a cycle flat on a
    // steady maximum; over a turn the envelope exceeds 14 V only near its peaks (derived): a few per cent.
    expect(q.clippedFractions[1]).toBeGreaterThan(0.01);
    expect(q.clippedFractions[2]).toBe(0);
  });

  for (const [f, peakV] of [[50, 0.05], [60, 0.02], [100, 0.02], [150, 0.01], [180, 0.01]] as const) {
    it(`mains-hum: ${peakV * 1000} mV peak at ${f} Hz measured within 2 % (RMS ${(peakV * 707.1).toFixed(1)} mV)`, () => {
      const { q } = quality(makeSpec(TURN, THREE_LINES, { hum: { frequencyHz: f, amplitudeV: peakV } }));
      for (const h of q.hum) {
        const k = h.frequenciesHz.indexOf(f);
        expect(Math.abs(h.rmsMv[k]! / ((peakV * 1000) / Math.SQRT2) - 1)).toBeLessThan(0.02);
        h.rmsMv.forEach((mv, j) => j !== k && expect(mv).toBeLessThan(0.05 * h.rmsMv[k]!));
      }
      const hum = q.findings.filter((x) => x.code === 'mains-hum');
      expect(hum.length).toBe(4);
      // Expected angle effect: A·leak/K, e.g. 50 mV·0.247/16.7 V = 2.5′ → warning on the stator lines.
      const worst = Math.max(...q.hum.slice(1).map((h) => h.angleErrorArcmin));
      expect(hum.find((x) => x.roles[0] === 's1s3')!.severity).toBe(worst >= 1 ? 'warning' : 'info');
      expect(hum.find((x) => x.roles[0] === 'ref')!.severity).toBe('info');
    });
  }

  it('dc-offset: 0.5 V (3 % of the line scale) → info; 1.2 V (7 %) → warning; the angle is not affected', () => {
    const small = quality(makeSpec(STATIC, [{ role: 's1s3', offsetV: 0.5 }, { role: 's3s2' }, { role: 's2s1' }]));
    expect(codes(small.q)).toEqual(['dc-offset:info:s1s3']);
    expect(small.q.dc[1]!.dcMv).toBeCloseTo(500, 0);
    const big = quality(makeSpec(TURN, [{ role: 's1s3' }, { role: 's3s2', offsetV: -1.2 }, { role: 's2s1' }]));
    expect(codes(big.q)).toEqual(['dc-offset:warning:s3s2']);
    expect(big.q.dc[2]!.dcMv).toBeCloseTo(-1200, 0);
  });

  it('channel-skew: a 2-sample (20 µs) delay on S3-S2 is measured within 1 % on a turning shaft', () => {
    const { q } = quality(makeSpec(TURN, [{ role: 's1s3' }, { role: 's3s2', skewSamples: 2 }, { role: 's2s1' }]));
    expect(codes(q)).toEqual(['channel-skew:warning:s3s2']);
    expect(q.skew[0]![1]!.skewUs).toBeCloseTo(20, 0);
    expect(Math.abs(q.skew[0]![1]!.skewUs - 20) / 20).toBeLessThan(0.01);
    // 20 µs at 400.13 Hz = 2.88° of carrier (Δφ = 2π·f·τ).
    expect(q.skew[0]![1]!.relativePhaseDeg).toBeCloseTo(-360 * CARRIER_HZ * 20e-6, 1);
  });

  it('channel-skew on a static shaft is only an info (quadrature and skew cannot be told apart at one angle)', () => {
    const { q } = quality(makeSpec(STATIC, [{ role: 's1s3', skewSamples: -1.5 }, { role: 's3s2' }, { role: 's2s1' }]));
    expect(codes(q)).toEqual(['channel-skew:info:s1s3']);
    expect(q.skew[0]![0]!.skewUs).toBeCloseTo(-15, 0);
  });

  it('channel-skew is not fooled by a constant null quadrature on a turning shaft', () => {
    const { q } = quality(makeSpec(TURN, [{ role: 's1s3', quadratureV: 0.05 }, { role: 's3s2' }, { role: 's2s1' }]));
    expect(q.findings).toEqual([]);
  });
});

// No warning or error on clean synthetic captures: static and rotating; three lines, two lines,
// resolver; 8- and 12-bit scopes (common practice, no source: a clean capture must not alarm).
describe('fitCarrierResidual at a high sample rate (the regressor sums are taken over multi-sample chunks)', () => {
  // Reference: the tone and offset injected by the synthesiser; 2 % is the tolerance of the 100 kS/s
  // hum checks above (common practice, no source).
  it('1 MS/s: 30 mV peak at 60 Hz measured within 2 % on every channel, and a 0.2 V offset within 0.5 mV', () => {
    const fs = 1_000_000;
    const spec = makeSpec(TURN, [{ role: 's1s3', offsetV: 0.2 }, { role: 's3s2' }, { role: 's2s1' }], {
      sampleRateHz: fs,
      durationS: 0.25,
      hum: { frequencyHz: 60, amplitudeV: 0.03 },
    });
    const syn = synthesizeCapture(spec);
    const n = syn.capture.sampleCount;
    const track = constantCarrierTrack(fs, CARRIER_HZ, ((spec.carrier.phaseDeg ?? 0) * Math.PI) / 180, n);
    const phasors = demodulateCycles(syn.capture.channels.map((c) => c.samples), track, n);
    const fit = fitCarrierResidual(
      syn.capture.channels.map((ch, i) => ({ role: syn.roles[i]!, samples: ch.samples, phasorChannel: i, scalePeakV: LINE_PEAK_V })),
      phasors,
      track,
      CARRIER_HZ,
    )!;
    expect(fit.blocks).toBe(1); // 0.2 s at 1 MS/s is above the 2^16-sample cap: one block
    const k = fit.frequenciesHz.indexOf(60);
    expect(k).toBeGreaterThanOrEqual(0);
    for (const ch of fit.channels) {
      expect(Math.abs(ch.rmsV[k]! / (0.03 / Math.SQRT2) - 1)).toBeLessThan(0.02);
      ch.rmsV.forEach((v, j) => j !== k && expect(v).toBeLessThan(0.05 * ch.rmsV[k]!));
    }
    expect(Math.abs(fit.channels[1]!.dcV - 0.2)).toBeLessThan(5e-4);
    expect(Math.abs(fit.channels[2]!.dcV)).toBeLessThan(5e-4);
  });
});

describe('clean synthetic captures raise no warning or error (wiring and capture quality)', () => {
  const layouts: Record<string, SynthLineSpec[]> = {
    'three lines': THREE_LINES,
    'two lines against S2': [{ role: 's1s2' }, { role: 's3s2' }],
    'two lines against S3': [{ role: 's1s3' }, { role: 's2s3' }],
    resolver: [{ role: 'sin' }, { role: 'cos' }],
  };
  const motions: Record<string, MotionSpec> = {
    'static at 0°': { type: 'static', deg: 0 },
    'static at 203.7°': { type: 'static', deg: 203.7 },
    'slow partial turn': { type: 'ramp', startDeg: 10, degPerS: 60 },
    'fast turn': { type: 'ramp', startDeg: 300, degPerS: 1440 },
    'damped step': { type: 'step', fromDeg: 20, toDeg: 110, atS: 0.1, dampingRatio: 0.4, naturalHz: 8 },
  };
  for (const bits of [8, 12]) {
    for (const [layoutName, lines] of Object.entries(layouts)) {
      for (const [motionName, motion] of Object.entries(motions)) {
        it(`${bits}-bit, ${layoutName}, ${motionName}`, () => {
          const spec = makeSpec(motion, lines, { quantization: { bits } });
          const { q, c } = quality(spec);
          const w = checkSynchroLines(c.unit, c.phasors, { referencePeakV: REF_PEAK_V });
          const alarms = [...q.findings, ...w.findings].filter((f) => f.severity !== 'info');
          expect(alarms).toEqual([]);
          expect(w.faults).toEqual([]);
        });
      }
    }
  }
});
