import { describe, expect, it } from 'vitest';
import { estimateToneFrequency } from '../../../core/dsp/estimateToneFrequency.js';
import { fitSine3, fitSine4 } from '../../../core/dsp/sineFit.js';
import { toneCramerRaoBounds } from '../../../core/dsp/toneCramerRao.js';
import { createRandom } from '../../../core/synth/random.js';
import { referenceVectors } from './referenceVectors.js';

/** Wraps an angle difference to (−π, π]. */
function wrap(a: number): number {
  return Math.atan2(Math.sin(a), Math.cos(a));
}

function sine(n: number, fs: number, f: number, amplitude: number, phaseRad: number, offset = 0): Float64Array {
  return Float64Array.from({ length: n }, (_, k) => amplitude * Math.sin((2 * Math.PI * f * k) / fs + phaseRad) + offset);
}

describe('fitSine4 against scipy.optimize.least_squares (offline scipy vectors, same LS problem)', () => {
  for (const c of referenceVectors().sineFit) {
    it(`${c.name}: frequency to 1e-9 relative, a/b/c to 1e-8 absolute, started from the interpolated FFT`, () => {
      const est = estimateToneFrequency(c.x, c.sampleRateHz);
      expect(est).toBeDefined();
      const fit = fitSine4(c.x, c.sampleRateHz, est!.frequencyHz);
      expect(fit.converged).toBe(true);
      expect(fit.skippedSamples).toBe(0);
      const s = c.scipy;
      expect(Math.abs(fit.frequencyHz / s.frequencyHz - 1)).toBeLessThan(1e-9);
      expect(Math.abs(fit.a - s.a)).toBeLessThan(1e-8);
      expect(Math.abs(fit.b - s.b)).toBeLessThan(1e-8);
      expect(Math.abs(fit.offset - s.offset)).toBeLessThan(1e-8);
      expect(fit.residualRms / s.residualRms).toBeCloseTo(1, 9);
      expect(fit.amplitude).toBeCloseTo(Math.hypot(s.a, s.b), 8);
      // The estimate is also plausible against the truth: within 5 CRLB standard deviations
      // (Kay 1993 ch. 3 bound, evaluated offline), harmonics aside.
      expect(Math.abs(fit.frequencyHz - c.truth.frequencyHz)).toBeLessThan(5 * Math.sqrt(c.crlb.frequencyHz2));
    });
  }

  it('fitSine3 at scipy\'s frequency gives scipy\'s a, b, c (the linear sub-problem, IEEE Std 1057 3-parameter fit)', () => {
    for (const c of referenceVectors().sineFit) {
      const fit = fitSine3(c.x, c.sampleRateHz, c.scipy.frequencyHz);
      expect(fit.converged).toBe(true);
      expect(fit.iterations).toBe(0);
      expect(Math.abs(fit.a - c.scipy.a)).toBeLessThan(1e-8);
      expect(Math.abs(fit.b - c.scipy.b)).toBeLessThan(1e-8);
      expect(Math.abs(fit.offset - c.scipy.offset)).toBeLessThan(1e-8);
    }
  });
});

describe('sine-fit model and properties (IEEE Std 1057 model; invariances as in its test methods)', () => {
  const fs = 10000;
  const f = 123.4567;
  const n = 4000;

  it('recovers a noise-free tone exactly: phase is that of amplitude·sin(ωt + φ) at the first fitted sample', () => {
    const x = sine(n, fs, f, 1.7, 0.6, -0.25);
    const fit = fitSine4(x, fs, f * 1.002);
    expect(fit.converged).toBe(true);
    expect(fit.frequencyHz).toBeCloseTo(f, 10);
    expect(fit.amplitude).toBeCloseTo(1.7, 12);
    expect(fit.phaseRad).toBeCloseTo(0.6, 11);
    expect(fit.offset).toBeCloseTo(-0.25, 12);
    expect(fit.a).toBeCloseTo(1.7 * Math.sin(0.6), 12);
    expect(fit.b).toBeCloseTo(1.7 * Math.cos(0.6), 12);
    expect(fit.residualRms).toBeLessThan(1e-12);
  });

  it('time origin: the same samples fitted at another index give the same fit; a later start shifts the phase by exactly ω·m/fs', () => {
    const rnd = createRandom(11);
    const x = Float64Array.from(sine(n, fs, f, 1, 0.2), (v) => v + 0.01 * rnd.normal());
    const m = 777;
    const a = fitSine4(x, fs, f, { start: 0, length: 3000 });
    const shifted = new Float64Array(n + m);
    shifted.set(x, m);
    const d = fitSine4(shifted, fs, f, { start: m, length: 3000 });
    expect(d.frequencyHz).toBeCloseTo(a.frequencyHz, 10);
    expect(d.phaseRad).toBeCloseTo(a.phaseRad, 10);
    expect(d.residualRms).toBeCloseTo(a.residualRms, 14);
    // Noise-free tone: the tail's phase is the head's advanced by ω·m/fs.
    const clean = sine(n, fs, f, 1, 0.2);
    const head = fitSine4(clean, fs, f * 1.001, { start: 0, length: 3000 });
    const tail = fitSine4(clean, fs, f * 1.001, { start: m, length: 3000 });
    expect(wrap(tail.phaseRad - head.phaseRad - (2 * Math.PI * f * m) / fs)).toBeCloseTo(0, 10);
  });

  it('adding a constant changes only the offset; scaling scales a, b, c and the residual', () => {
    const rnd = createRandom(12);
    const x = Float64Array.from(sine(n, fs, f, 1, 1.0), (v) => v + 0.02 * rnd.normal());
    const base = fitSine4(x, fs, f);
    const plus = fitSine4(Float64Array.from(x, (v) => v + 5), fs, f);
    expect(plus.frequencyHz / base.frequencyHz - 1).toBeLessThan(1e-12);
    expect(plus.offset - base.offset).toBeCloseTo(5, 10);
    expect(plus.a).toBeCloseTo(base.a, 10);
    const scaled = fitSine4(Float64Array.from(x, (v) => v * 1e-3), fs, f);
    expect(scaled.frequencyHz / base.frequencyHz - 1).toBeLessThan(1e-12);
    expect(scaled.b / base.b).toBeCloseTo(1e-3, 12);
    expect(scaled.residualRms / base.residualRms).toBeCloseTo(1e-3, 12);
  });

  it('accepts Float32Array samples and skips NaN samples, counting them', () => {
    const x = new Float32Array(sine(n, fs, f, 1, -2.0, 0.1));
    const clean = fitSine4(x, fs, f * 0.999);
    x[10] = NaN;
    x[2000] = NaN;
    x[3999] = Infinity;
    const gappy = fitSine4(x, fs, f * 0.999);
    expect(gappy.converged).toBe(true);
    expect(gappy.skippedSamples).toBe(3);
    expect(Number.isFinite(gappy.residualRms)).toBe(true);
    // Float32 storage error is ~3e-8; dropping 3 samples leaves the fit essentially unchanged.
    expect(Math.abs(gappy.frequencyHz - clean.frequencyHz)).toBeLessThan(1e-6);
    expect(gappy.amplitude).toBeCloseTo(1, 6);
  });

  it('runs in a centred, scaled frame: a 2^20-sample record still converges to the bound-level answer', () => {
    const big = 1 << 20;
    const rnd = createRandom(13);
    const fsBig = 1e6;
    const fBig = 400.37;
    const x = new Float32Array(big);
    for (let k = 0; k < big; k++) x[k] = Math.sin((2 * Math.PI * fBig * k) / fsBig + 0.3) + 0.01 * rnd.normal();
    const est = estimateToneFrequency(x, fsBig)!;
    const fit = fitSine4(x, fsBig, est.frequencyHz);
    expect(fit.converged).toBe(true);
    const crlb = toneCramerRaoBounds(big, 0.5 / 1e-4, fsBig);
    expect(Math.abs(fit.frequencyHz - fBig)).toBeLessThan(5 * Math.sqrt(crlb.frequencyHz2));
    expect(fit.phaseRad).toBeCloseTo(0.3, 3);
  });

  it('reports converged = false instead of diverging from 1 bin or more away (basin about ±0.7 bin, computed for N = 1000, 12.3 cycles)', () => {
    const nn = 1000;
    const x = Float64Array.from({ length: nn }, (_, k) => Math.cos((2 * Math.PI * 12.3 * k) / nn + 0.4));
    for (const off of [-0.7, -0.5, 0.5, 0.7]) {
      const fit = fitSine4(x, nn, 12.3 + off);
      expect(fit.converged, `offset ${off}`).toBe(true);
      expect(fit.frequencyHz).toBeCloseTo(12.3, 12);
    }
    for (const off of [-1.9, -1, 1, 1.5]) {
      const fit = fitSine4(x, nn, 12.3 + off);
      expect(fit.converged, `offset ${off}`).toBe(false);
      expect(Number.isFinite(fit.frequencyHz)).toBe(true);
      // The returned fit stays near the start (never runs off), and is a valid 3-parameter fit there.
      expect(Math.abs(fit.frequencyHz - (12.3 + off))).toBeLessThanOrEqual(2);
      const check = fitSine3(x, nn, fit.frequencyHz);
      expect(fit.a).toBeCloseTo(check.a, 12);
    }
  });

  it('maxIterations bounds the work and reports converged = false when it runs out', () => {
    const rnd = createRandom(14);
    const x = Float64Array.from(sine(1024, 1024, 50.3, 1, 0), (v) => v + 0.1 * rnd.normal());
    const one = fitSine4(x, 1024, 50.6, { maxIterations: 1 });
    expect(one.iterations).toBe(1);
    expect(one.converged).toBe(false);
    const zero = fitSine4(x, 1024, 50.6, { maxIterations: 0 });
    expect(zero.frequencyHz).toBeCloseTo(50.6, 12);
    expect(zero.converged).toBe(false);
    const full = fitSine4(x, 1024, 50.6);
    expect(full.converged).toBe(true);
    expect(full.iterations).toBeLessThan(10);
  });

  it('singular cases come back flagged, not thrown: too few samples, frequency 0', () => {
    expect(fitSine3([1, 2], 100, 10).converged).toBe(false);
    expect(fitSine3(sine(100, 100, 10, 1, 0), 100, 0).converged).toBe(false);
    const nanOnly = fitSine4(new Float64Array(64).fill(NaN), 100, 10);
    expect(nanOnly.converged).toBe(false);
    expect(nanOnly.skippedSamples).toBe(64);
    expect(Number.isNaN(nanOnly.amplitude)).toBe(true);
  });

  it('throws RangeError for bad arguments from code', () => {
    const x = sine(100, 100, 10, 1, 0);
    expect(() => fitSine4(x, 100, 60)).toThrow(RangeError);
    expect(() => fitSine4(x, 100, 0)).toThrow(RangeError);
    expect(() => fitSine4(x, -1, 10)).toThrow(RangeError);
    expect(() => fitSine3(x, 100, NaN)).toThrow(RangeError);
    expect(() => fitSine3(x, 100, 10, 50, 51)).toThrow(RangeError);
  });
});

describe('Monte Carlo: four-parameter fit against the Cramér–Rao bound (Kay 1993 ch. 3; Rife & Boorstyn 1974)', () => {
  // N = 256, 2000 trials per SNR (seeded), tone at 20.3 cycles with a random phase. Estimator
  // chain: Hann/Grandke start, then fitSine4. Ratios must lie in [0.8, 1.5]: a ratio well below
  // 1 would mean the bound is computed wrong (no unbiased estimator beats it). Sampling error
  // of a variance from 2000 trials is about ±3 % (1σ). Outliers (|Δf| > 6 σ_CRLB, the
  // threshold effect, Rife & Boorstyn 1974) are counted separately and excluded.
  const n = 256;
  const fs = 1000;
  const trials = 2000;
  for (const snrDb of [10, 20, 40]) {
    it(`SNR ${snrDb} dB: var(f̂)/CRLB and var(φ̂ at the record centre)/CRLB within [0.8, 1.5], no outliers`, () => {
      const eta = 10 ** (snrDb / 10);
      const sigma = 1 / Math.sqrt(2 * eta);
      const f = (20.3 * fs) / n;
      const bound = toneCramerRaoBounds(n, eta, fs);
      const rnd = createRandom(1000 + snrDb);
      const x = new Float64Array(n);
      const tc = (n - 1) / 2 / fs;
      let sf = 0;
      let sp = 0;
      let kept = 0;
      let outliers = 0;
      let notConverged = 0;
      for (let t = 0; t < trials; t++) {
        const phi = 2 * Math.PI * rnd.uniform();
        for (let k = 0; k < n; k++) x[k] = Math.sin((2 * Math.PI * f * k) / fs + phi) + sigma * rnd.normal();
        const est = estimateToneFrequency(x, fs)!;
        const fit = fitSine4(x, fs, est.frequencyHz);
        if (!fit.converged) notConverged++;
        const df = fit.frequencyHz - f;
        if (Math.abs(df) > 6 * Math.sqrt(bound.frequencyHz2)) {
          outliers++;
          continue;
        }
        const dp = wrap(fit.phaseRad + 2 * Math.PI * fit.frequencyHz * tc - (phi + 2 * Math.PI * f * tc));
        sf += df * df;
        sp += dp * dp;
        kept++;
      }
      const ratioF = sf / kept / bound.frequencyHz2;
      const ratioP = sp / kept / bound.phaseAtCentreRad2;
      expect({ outliers, notConverged }).toEqual({ outliers: 0, notConverged: 0 });
      expect(ratioF).toBeGreaterThan(0.8);
      expect(ratioF).toBeLessThan(1.5);
      expect(ratioP).toBeGreaterThan(0.8);
      expect(ratioP).toBeLessThan(1.5);
    });
  }
});
