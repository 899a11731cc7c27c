import { estimateToneFrequency } from '../dsp/estimateToneFrequency.js';
import { fitSine4 } from '../dsp/sineFit.js';
import { demodulateCycles, type CycleDemodulator } from '../demod/demodulateCycles.js';
import { CaptureError } from '../model/errors.js';
import { finding, type Finding } from '../model/findings.js';
import { carrierFrequencyHzAt, carrierPhaseAt, constantCarrierTrack, type CarrierTrack } from './carrierTrack.js';
import { fitPolynomialBic } from './fitPhasePolynomial.js';
import { selectKth } from '../dsp/selectKth.js';

/**
 * Carrier (excitation) frequency and phase over the whole record.
 *
 * 1. Start: Hann-windowed FFT with Grandke's ratio interpolation (Grandke 1983) on the strongest
 *    source channel.
 * 2. IEEE Std 1057 four-parameter sine fit on a segment of the reference (up to 2^20 samples),
 *    started from (1), which lies well inside its ±0.7-bin basin.
 * 3. Per-cycle drift tracking: a three-parameter fit per carrier cycle at that frequency gives one
 *    phase per cycle; the unwrapped phases are fitted with a low-order polynomial in time
 *    (degree by BIC, 1 = constant frequency), which becomes the phase track Φ(n) that every
 *    channel is demodulated against.
 * Without a reference, the source is the set of stator lines: each cycle's carrier phase is
 * ½·arg Σ Z², which does not flip when a line's envelope changes sign, so the track is
 * continuous, but any angle read against it is known only modulo 180°.
 */
export interface CarrierEstimate {
  readonly track: CarrierTrack;
  readonly source: 'reference' | 'stators';
  /** Mean frequency over the record (total phase over total time). */
  readonly frequencyHz: number;
  readonly startHz: number;
  readonly endHz: number;
  /** IEEE 1057 four-parameter fit on the reference segment (NaN without a reference). */
  readonly sineFitHz: number;
  /** RMS of the reference's fundamental (median over cycles), volts; NaN without a reference. */
  readonly referenceRmsV: number;
  /** Degree of the phase polynomial (1 = no drift detected). */
  readonly driftDegree: number;
  /** RMS of the per-cycle phase about the track, radians (noise and jitter of the carrier). */
  readonly phaseResidualRad: number;
  readonly findings: Finding[];
}

const MIN_CYCLES = 3;
/**
 * The IEEE 1057 fit runs on at most this many samples: it only has to set the cycle length for
 * the per-cycle track, which refines the frequency over the whole record (on the bench capture,
 * 26 cycles of 400 Hz at 1 MS/s and 12 bits, the 2^16-sample fit is 1.2e-5 Hz off; 2^18 samples
 * cost ~40 ms more on a cold start; both measured).
 */
const MAX_FIT_SAMPLES = 1 << 16;
const START_FFT_SAMPLES = 1 << 16;
/**
 * Fewest carrier cycles the start FFT must hold, else a longer one is taken: the Grandke
 * interpolator (Grandke 1983) is within 6e-5 bin of a real Hann-windowed tone of ~10 cycles and
 * lands inside the sine fit's ±0.7-bin basin at 12 cycles and 10 dB SNR (both checked in
 * estimateToneFrequency's tests); 16 leaves a margin.
 */
const MIN_START_CYCLES = 16;

export function trackCarrier(
  sources: readonly ArrayLike<number>[],
  sourceKind: 'reference' | 'stators',
  sampleRateHz: number,
  sampleCount: number,
  sourceRoles: readonly string[],
  demodulate: CycleDemodulator = demodulateCycles,
): CarrierEstimate {
  const findings: Finding[] = [];
  const strongest = sources.length === 1 ? 0 : strongestChannel(sources, sampleCount);
  // The FFT start needs only to land inside the sine fit's basin: a 2^16-sample segment does, as
  // long as it holds enough carrier cycles for Grandke's interpolation (else a longer one).
  const band = { minHz: 20, maxHz: sampleRateHz * 0.45 };
  let start = estimateToneFrequency(sources[strongest]!, sampleRateHz, { ...band, length: Math.min(sampleCount, START_FFT_SAMPLES) });
  if (start && sampleCount > START_FFT_SAMPLES && (start.frequencyHz * START_FFT_SAMPLES) / sampleRateHz < MIN_START_CYCLES) {
    const needed = Math.ceil((MIN_START_CYCLES * sampleRateHz) / start.frequencyHz);
    start = estimateToneFrequency(sources[strongest]!, sampleRateHz, { ...band, length: Math.min(sampleCount, 2 ** Math.ceil(Math.log2(needed))) });
  }
  if (!start) {
    throw new CaptureError(
      `no carrier found in ${sourceKind === 'reference' ? 'the reference channel' : 'any stator channel'}: the signal is flat or empty; check the channel roles and that the excitation was on`,
    );
  }
  if (start.frequencyHz * sampleCount < MIN_CYCLES * sampleRateHz) {
    throw new CaptureError(
      `the record holds only ${((start.frequencyHz * sampleCount) / sampleRateHz).toFixed(1)} carrier cycles at ${start.frequencyHz.toFixed(1)} Hz; at least ${MIN_CYCLES} are needed (record longer)`,
    );
  }

  let firstHz = start.frequencyHz;
  let sineFitHz = NaN;
  if (sourceKind === 'reference') {
    const fit = fitSine4(sources[0]!, sampleRateHz, start.frequencyHz, {
      start: 0,
      length: Math.min(sampleCount, MAX_FIT_SAMPLES),
    });
    if (fit.converged && Math.abs(fit.frequencyHz - start.frequencyHz) < sampleRateHz / Math.min(sampleCount, MAX_FIT_SAMPLES)) {
      firstHz = fit.frequencyHz;
      sineFitHz = fit.frequencyHz;
    }
  }

  const linear = constantCarrierTrack(sampleRateHz, firstHz, 0, sampleCount);
  const cycles = demodulate(sources, linear, sampleCount);
  if (cycles.cycleCount < MIN_CYCLES) {
    throw new CaptureError(`the record holds fewer than ${MIN_CYCLES} whole carrier cycles; capture a longer record`);
  }

  // Per-cycle phase (doubled for stator sources, see above) and weight.
  const m = cycles.cycleCount;
  const phase = new Float64Array(m);
  const weight = new Float64Array(m);
  const u = new Float64Array(m);
  const factor = sourceKind === 'reference' ? 1 : 2;
  const amplitudes: number[] = [];
  for (let k = 0; k < m; k++) {
    let re = 0;
    let im = 0;
    let power = 0;
    for (let ch = 0; ch < sources.length; ch++) {
      const a = cycles.inPhase[ch]![k]!;
      const b = cycles.quadrature[ch]![k]!;
      if (factor === 1) {
        re += a;
        im += b;
      } else {
        re += a * a - b * b;
        im += 2 * a * b;
      }
      power += a * a + b * b;
    }
    phase[k] = Math.atan2(im, re);
    weight[k] = Number.isFinite(power) ? power : 0;
    const centre = cycles.firstSample[k]! + (cycles.lengthSamples[k]! - 1) / 2;
    u[k] = (centre - linear.centreSample) / linear.halfSpanSamples;
    if (sourceKind === 'reference' && Number.isFinite(power)) amplitudes.push(Math.sqrt(power));
  }
  unwrapInPlace(phase, weight);

  const poly = fitPolynomialBic(u, phase, sourceKind === 'reference' ? undefined : weight, 1, Math.min(3, m - 2));
  // The fitted phase is that of the signal against sin(ω n) at the linear track (radians).
  const coefficients = linear.coefficients.slice();
  poly.coefficients.forEach((c, i) => {
    coefficients[i] = (coefficients[i] ?? 0) + c / factor;
  });
  const track: CarrierTrack = { ...linear, coefficients };

  const last = sampleCount - 1;
  const frequencyHz = ((carrierPhaseAt(track, last) - carrierPhaseAt(track, 0)) / last) * sampleRateHz / (2 * Math.PI);
  const firstCentre = cycles.firstSample[0]! + (cycles.lengthSamples[0]! - 1) / 2;
  const lastCentre = cycles.firstSample[m - 1]! + (cycles.lengthSamples[m - 1]! - 1) / 2;
  const startHz = carrierFrequencyHzAt(track, firstCentre);
  const endHz = carrierFrequencyHzAt(track, lastCentre);
  // The upper median by selection: one amplitude per cycle (see plainLine in analyzeUnit).
  const referenceRmsV = amplitudes.length ? selectKth(Float64Array.from(amplitudes), amplitudes.length >> 1) / Math.SQRT2 : NaN;

  if (poly.degree > 1 && Math.abs(endHz - startHz) > 0.01) {
    findings.push(
      finding('carrier-drift', Math.abs(endHz - startHz) > 0.005 * frequencyHz ? 'warning' : 'info',
        `The carrier frequency moved from ${startHz.toFixed(3)} Hz to ${endHz.toFixed(3)} Hz during the record.`,
        {
          advice: 'The demodulator follows the drift; if it is large, check the excitation source (an inverter or generator under changing load).',
          roles: sourceRoles,
          figures: { startHz, endHz, driftHz: endHz - startHz },
        }),
    );
  }

  return {
    track,
    source: sourceKind,
    frequencyHz,
    startHz,
    endHz,
    sineFitHz,
    referenceRmsV,
    driftDegree: poly.degree,
    phaseResidualRad: poly.residualRms / factor,
    findings,
  };
}

function strongestChannel(sources: readonly ArrayLike<number>[], sampleCount: number): number {
  let best = 0;
  let bestPower = -1;
  const step = Math.max(1, Math.floor(sampleCount / 200_000));
  sources.forEach((x, ch) => {
    let mean = 0;
    let sq = 0;
    let count = 0;
    for (let i = 0; i < sampleCount; i += step) {
      const v = x[i]!;
      if (!Number.isFinite(v)) continue;
      mean += v;
      sq += v * v;
      count++;
    }
    const power = count ? sq / count - (mean / count) ** 2 : 0;
    if (power > bestPower) {
      bestPower = power;
      best = ch;
    }
  });
  return best;
}

/** Unwraps a phase sequence (radians), skipping cycles with zero weight. */
function unwrapInPlace(phase: Float64Array, weight: Float64Array): void {
  let previous = NaN;
  let offset = 0;
  for (let k = 0; k < phase.length; k++) {
    if (!(weight[k]! > 0) || !Number.isFinite(phase[k]!)) {
      phase[k] = NaN;
      continue;
    }
    let v = phase[k]! + offset;
    if (!Number.isNaN(previous)) {
      const jump = Math.round((v - previous) / (2 * Math.PI));
      offset -= jump * 2 * Math.PI;
      v -= jump * 2 * Math.PI;
    }
    phase[k] = v;
    previous = v;
  }
}
