import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { sinCosFromLines } from '../../../core/angle/sinCosFromLines.js';
import { solveAngle } from '../../../core/angle/solveAngle.js';
import { angleDiffDeg } from '../../../core/angle/unwrapDeg.js';
import { constantCarrierTrack } from '../../../core/carrier/carrierTrack.js';
import { cycleBoundaries, demodulateCycleRange, demodulateCycles, joinCyclePhasors } from '../../../core/demod/demodulateCycles.js';
import { createRandom } from '../../../core/synth/random.js';
import { synthesizeCapture, type SynthSpec } from '../../../core/synth/synthesizeCapture.js';

const DEG = Math.PI / 180;

describe('demodulateCycles(channels, track, n)', () => {
  for (const P of [50.5, 50.25, 243.25, 1000.5, 97.3]) {
    it(`recovers amplitude and phase exactly (no 2f ripple) at ${P} samples per period`, () => {
      const fs = 100_000;
      const f = fs / P;
      const n = Math.round(P * 40);
      const x = new Float64Array(n);
      const A = 3.7;
      const psi = 0.3;
      const phi0 = 1.1;
      for (let i = 0; i < n; i++) x[i] = A * Math.sin(2 * Math.PI * f * (i / fs) + phi0 + psi) + 0.25;
      const out = demodulateCycles([x], constantCarrierTrack(fs, f, phi0, n), n);
      expect(out.cycleCount).toBeGreaterThan(35);
      for (let m = 0; m < out.cycleCount; m++) {
        // I + jQ = A·e^{jψ} for A·sin(Φ + ψ) (the model of IEEE Std 1057's three-parameter fit)
        expect(out.inPhase[0]![m]).toBeCloseTo(A * Math.cos(psi), 11);
        expect(out.quadrature[0]![m]).toBeCloseTo(A * Math.sin(psi), 11);
        expect(out.dc[0]![m]).toBeCloseTo(0.25, 11);
      }
      // Negative control: a plain boxcar of round(P) samples leaves a 2f ripple of about
      // (L − P)/L of the amplitude (lock-in boxcar analysis; e.g. Scofield 1994 frequency view).
      if (P % 1 !== 0) {
        const L = Math.round(P);
        const ripple: number[] = [];
        for (let start = 0; start + L <= n; start += L) {
          let s = 0;
          for (let i = start; i < start + L; i++) s += x[i]! * Math.sin(2 * Math.PI * f * (i / fs) + phi0) * 2;
          ripple.push(s / L);
        }
        const spread = Math.max(...ripple) - Math.min(...ripple);
        expect(spread).toBeGreaterThan((0.1 * Math.abs(L - P) * A) / L);
      }
    });
  }

  it('gives each channel the phasors it gets alone, bit for bit, with 1 to 5 channels (channels go through in pairs)', () => {
    // Oracle: the same function on one channel at a time (the single-channel loop).
    const fs = 50_000;
    const n = 4000;
    const track = constantCarrierTrack(fs, 401.3, 0.7, n);
    const random = createRandom(20261202);
    const channels = [0, 1, 2, 3, 4].map((k) => Float32Array.from({ length: n }, (_, i) => (k + 1) * Math.sin(2 * Math.PI * 401.3 * (i / fs) + 0.7 + k) + 0.01 * random.normal()));
    const alone = channels.map((c) => demodulateCycles([c], track, n));
    for (let count = 1; count <= 5; count++) {
      const together = demodulateCycles(channels.slice(0, count), track, n);
      for (let ch = 0; ch < count; ch++) {
        expect(together.inPhase[ch]).toEqual(alone[ch]!.inPhase[0]);
        expect(together.quadrature[ch]).toEqual(alone[ch]!.quadrature[0]);
        expect(together.dc[ch]).toEqual(alone[ch]!.dc[0]);
      }
    }
  });

  it('gives each channel the extremes of the samples its cycles cover, with NaNs skipped and ties counted (oracle: a direct min/max and count over that range)', () => {
    const fs = 50_000;
    const n = 5000;
    const track = constantCarrierTrack(fs, 401.3, 0.7, n);
    const random = createRandom(20261204);
    // Quantised to a coarse step so that several samples tie on each extreme; one in 500 is NaN.
    const channels = [0, 1, 2, 3, 4].map((k) =>
      Float32Array.from({ length: n }, (_, i) => (random.uniform() < 0.002 ? NaN : Math.round(4 * (k + 1) * Math.sin(2 * Math.PI * 401.3 * (i / fs) + k)) / 4)),
    );
    for (let count = 1; count <= 5; count++) {
      const out = demodulateCycles(channels.slice(0, count), track, n);
      const first = out.firstSample[0]!;
      const end = out.firstSample[out.cycleCount - 1]! + out.lengthSamples[out.cycleCount - 1]!;
      for (let ch = 0; ch < count; ch++) {
        const covered = Array.from(channels[ch]!.subarray(first, end)).filter((v) => !Number.isNaN(v));
        const lo = covered.reduce((a, b) => Math.min(a, b), Infinity);
        const hi = covered.reduce((a, b) => Math.max(a, b), -Infinity);
        expect(out.extremes[ch]).toEqual({ sampleCount: end - first, lo, hi, countLo: covered.filter((v) => v === lo).length, countHi: covered.filter((v) => v === hi).length });
        expect(out.extremes[ch]!.countHi).toBeGreaterThan(1);
      }
    }
  });

  it('cycle ranges demodulated apart and joined equal the whole pass bit for bit, cut anywhere', () => {
    // Oracle: demodulateCycles over the whole record (each cycle depends on its own samples only).
    const fs = 50_000;
    const n = 6000;
    const track = constantCarrierTrack(fs, 397.1, 0.2, n);
    const random = createRandom(20261203);
    const channels = [0, 1, 2].map((k) => Float32Array.from({ length: n }, (_, i) => Math.sin(2 * Math.PI * 397.1 * (i / fs) + 0.2 + k) + 0.01 * random.normal()));
    const whole = demodulateCycles(channels, track, n);
    const bounds = cycleBoundaries(track, n);
    for (const cut of [0, 1, 17, whole.cycleCount - 1, whole.cycleCount]) {
      const joined = joinCyclePhasors([
        demodulateCycleRange(channels, track, bounds.subarray(0, cut + 1)),
        demodulateCycleRange(channels, track, bounds.subarray(cut)),
      ]);
      expect(joined).toEqual(whole);
    }
  });

  it('windows tile the record, each one carrier period long to within one sample', () => {
    const fs = 97_300;
    const track = constantCarrierTrack(fs, 400, 0.7, 97_300);
    const b = cycleBoundaries(track, 97_300);
    for (let m = 1; m < b.length; m++) expect(Math.abs(b[m]! - b[m - 1]! - 243.25)).toBeLessThanOrEqual(1);
    expect(b.length).toBeGreaterThanOrEqual(399);
  });

  it('angle noise matches sqrt(2/Nw)·σ/(kE) within 10 % (LS amplitude variance 2σ²/N, Kay 1993 ch.3, through atan2)', () => {
    const fs = 100_000;
    const f = 400; // 250 samples per window
    const kE = 10;
    const sigma = 0.01;
    const thetaDeg = 33;
    const n = 250 * 2000;
    const rnd = createRandom(20261201);
    const s = new Float64Array(n);
    const c = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const carrier = Math.sin(2 * Math.PI * f * (i / fs));
      s[i] = kE * Math.sin(thetaDeg * DEG) * carrier + sigma * rnd.normal();
      c[i] = kE * Math.cos(thetaDeg * DEG) * carrier + sigma * rnd.normal();
    }
    const ph = demodulateCycles([s, c], constantCarrierTrack(fs, f, 0, n), n);
    const sc = sinCosFromLines({ kind: 'resolver', lines: [{ base: 'sin', channel: 0 }, { base: 'cos', channel: 1 }] }, ph)!;
    const sol = solveAngle(sc, ph, fs, 0);
    let sum = 0;
    let sum2 = 0;
    for (const d of sol.deg) {
      const e = angleDiffDeg(d, thetaDeg) * DEG;
      sum += e;
      sum2 += e * e;
    }
    const m = sol.deg.length;
    const sd = Math.sqrt(sum2 / m - (sum / m) ** 2);
    const predicted = Math.sqrt(2 / 250) * (sigma / kE);
    expect(sd / predicted).toBeGreaterThan(0.9);
    expect(sd / predicted).toBeLessThan(1.1);
  });
});

/** A small static or turning resolver capture for the property tests. */
function resolverSpec(thetaDeg: number, extra: Partial<SynthSpec> = {}, leadDeg = 6): SynthSpec {
  return {
    seed: 11,
    sampleRateHz: 40_000,
    durationS: 0.05,
    carrier: { frequencyHz: 400, rmsV: 26 },
    units: [{ kind: 'resolver', transformationRatio: 0.4538, phaseLeadDeg: leadDeg, motion: { type: 'static', deg: thetaDeg }, lines: [{ role: 'sin' }, { role: 'cos' }] }],
    noiseV: 0.002,
    ...extra,
  };
}

function decode(spec: SynthSpec, tweak?: (channels: Float64Array[]) => Float64Array[]): Float64Array {
  const syn = synthesizeCapture(spec);
  let channels: Float64Array[] = syn.capture.channels.map((ch) => Float64Array.from(ch.samples));
  if (tweak) channels = tweak(channels);
  const n = syn.capture.sampleCount;
  const ph = demodulateCycles(channels, constantCarrierTrack(spec.sampleRateHz, spec.carrier.frequencyHz, 0, n), n);
  const sc = sinCosFromLines({ kind: 'resolver', lines: [{ base: 'sin', channel: 1 }, { base: 'cos', channel: 2 }] }, ph)!;
  return solveAngle(sc, ph, spec.sampleRateHz).deg;
}

const meanAngle = (deg: Float64Array): number => {
  let s = 0;
  let c = 0;
  for (const d of deg) {
    s += Math.sin(d * DEG);
    c += Math.cos(d * DEG);
  }
  return ((Math.atan2(s, c) / DEG) + 360) % 360;
};

// Properties of the resolver equations θ = atan2(S, C) (common practice, no source for the
// property form; each follows from the trigonometry of the standard equations).
describe('demodulation properties (fast-check, seeded)', () => {
  const params = { seed: 42, numRuns: 12 };
  const angle = fc.double({ min: 0, max: 359.9, noNaN: true });

  it('a gain on the reference leaves θ unchanged', () => {
    fc.assert(
      fc.property(angle, fc.double({ min: 0.05, max: 20, noNaN: true }), (theta, gain) => {
        const base = meanAngle(decode(resolverSpec(theta)));
        const scaled = meanAngle(decode(resolverSpec(theta), (ch) => [ch[0]!.map((v) => v * gain), ch[1]!, ch[2]!]));
        return Math.abs(angleDiffDeg(base, scaled)) < 1e-6;
      }),
      params,
    );
  });

  it('swapping S and C gives 90° − θ', () => {
    fc.assert(
      fc.property(angle, (theta) => {
        const swapped = meanAngle(decode(resolverSpec(theta), (ch) => [ch[0]!, ch[2]!, ch[1]!]));
        return Math.abs(angleDiffDeg(swapped, 90 - theta)) < 0.01;
      }),
      params,
    );
  });

  it('negating S gives −θ', () => {
    fc.assert(
      fc.property(angle, (theta) => {
        const negated = meanAngle(decode(resolverSpec(theta), (ch) => [ch[0]!, ch[1]!.map((v) => -v), ch[2]!]));
        return Math.abs(angleDiffDeg(negated, -theta)) < 0.01;
      }),
      params,
    );
  });

  it('a common phase shift up to ±80° leaves θ unchanged once the lead is estimated', () => {
    fc.assert(
      fc.property(angle, fc.double({ min: -80, max: 80, noNaN: true }), (theta, lead) => {
        const got = meanAngle(decode(resolverSpec(theta, {}, lead)));
        return Math.abs(angleDiffDeg(got, theta)) < 0.01;
      }),
      params,
    );
  });
});

describe('time stamps of a turning shaft', () => {
  it('stamps each estimate at the instant it represents (error < 1e-4° at 90°/s with an 8° lead)', () => {
    const spec: SynthSpec = {
      seed: 3,
      sampleRateHz: 97_300,
      durationS: 0.3,
      carrier: { frequencyHz: 400, rmsV: 26, phaseDeg: 30 },
      units: [{ kind: 'synchro', transformationRatio: 0.4538, phaseLeadDeg: 8, motion: { type: 'ramp', startDeg: 10, degPerS: 90 }, lines: [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }] }],
    };
    const syn = synthesizeCapture(spec);
    const n = syn.capture.sampleCount;
    const ph = demodulateCycles(syn.capture.channels.map((c) => c.samples), constantCarrierTrack(97_300, 400, 30 * DEG, n), n);
    const sc = sinCosFromLines(
      { kind: 'synchro', lines: [{ base: 's1s3', channel: 1 }, { base: 's3s2', channel: 2 }, { base: 's2s1', channel: 3 }] },
      ph,
    )!;
    const sol = solveAngle(sc, ph, 97_300);
    let worst = 0;
    let worstCentre = 0;
    for (let m = 0; m < sol.deg.length; m++) {
      worst = Math.max(worst, Math.abs(angleDiffDeg(sol.deg[m]!, syn.angleDeg(sol.tS[m]!))));
      worstCentre = Math.max(worstCentre, Math.abs(angleDiffDeg(sol.deg[m]!, syn.angleDeg(ph.centreS[m]!))));
    }
    expect(worst).toBeLessThan(1e-4);
    // Negative control: stamping at the window centre is off by about lead/(360 f) · 90°/s = 0.005°.
    expect(worstCentre).toBeGreaterThan(0.004);
  });
});
