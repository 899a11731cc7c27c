import { carrierPhaseAt, type CarrierTrack } from '../carrier/carrierTrack.js';
import type { CyclePhasors } from '../demod/demodulateCycles.js';
import { solveSymmetric } from '../dsp/linearSolve.js';
import { finding, type Finding } from '../model/findings.js';

const ARCMIN_PER_RAD = (180 * 60) / Math.PI;

/**
 * Mains hum on the channels of a capture, and the per-channel DC level that comes out of the same fit.
 */

/** Mains frequencies and their low harmonics. */
export const MAINS_FREQUENCIES_HZ: readonly number[] = [50, 60, 100, 120, 150, 180];
/** Block length of the hum fit: long enough to separate 50 Hz from 60 Hz (10 Hz apart needs > 0.1 s), short enough that a mains frequency off by 0.5 Hz loses < 2 %. */
const HUM_BLOCK_S = 0.2;
/** At most this many samples per channel go into the hum fit (spread over the record). */
const HUM_MAX_SAMPLES = 1 << 16;
/** Hum whose leak into the per-cycle phasor could move the angle (or carrier phase) by this much is a warning… */
export const HUM_WARNING_ARCMIN = 1;
/** …and by a tenth of that, an info. */
export const HUM_INFO_ARCMIN = 0.1;

export interface HumChannel {
  readonly role: string;
  readonly samples: ArrayLike<number>;
  /** Index of this channel in the phasor arrays. */
  readonly phasorChannel: number;
  /** Scale the channel is judged against, peak volts: its unit's stator maximum, or the excitation peak. */
  readonly scalePeakV: number;
  readonly isReference?: boolean;
}

export interface HumLevel {
  readonly role: string;
  /** Frequencies fitted (the mains list minus those too near the carrier or its harmonics, or above 0.45·fs). */
  readonly frequenciesHz: readonly number[];
  /** RMS amplitude at each fitted frequency, millivolts. */
  readonly rmsMv: readonly number[];
  /** Root-sum-square of rmsMv. */
  readonly totalRmsMv: number;
  /** Upper estimate of the angle error the hum leaks into one-cycle phasors, arc-minutes peak. */
  readonly angleErrorArcmin: number;
}

/**
 * Leak of a tone at f into a one-carrier-period least-squares phasor, relative to its amplitude:
 * the one-period window is a boxcar whose transfer function is sinc(f/fc), and mixing moves a tone
 * at f to fc ± f, so the leak is at most |sinc(1 − f/fc)| + |sinc(1 + f/fc)| with
 * sinc(x) = sin(πx)/(πx) (derived; for f ≪ fc this is ≈ 2f/fc).
 */
export function humLeakFraction(frequencyHz: number, carrierHz: number): number {
  const sinc = (x: number): number => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));
  const r = frequencyHz / carrierHz;
  return Math.abs(sinc(1 - r)) + Math.abs(sinc(1 + r));
}

export interface CarrierResidualFit {
  /** Frequencies fitted (the mains list minus those too near the carrier or its harmonics, or above 0.45·fs). */
  readonly frequenciesHz: readonly number[];
  /** Blocks that went into the fit. */
  readonly blocks: number;
  readonly channels: readonly {
    /** Bias-corrected RMS amplitude at each frequency, volts (0 when not above the noise). */
    readonly rmsV: readonly number[];
    /** RMS amplitude that white noise alone would show at one frequency, volts. */
    readonly noiseFloorV: number;
    /** Mean level of the residual (the constant of the fit), volts. */
    readonly dcV: number;
    /** Standard error of dcV from the block-to-block spread, volts (NaN with one block). */
    readonly dcStandardErrorV: number;
  }[];
}

/**
 * Fits mains tones and a constant to what is left of each channel once the carrier is removed.
 *
 * The carrier model is the demodulator's per-cycle phasor, I·sin Φ + Q·cos Φ, with I and Q
 * interpolated linearly between cycle centres so that a turning shaft's envelope is followed
 * within the cycle (a per-cycle constant leaves a staircase whose steps spread into the low
 * frequencies); the demodulator's DC term is not removed. The hum that leaks into each cycle's
 * phasor is then moved to fc ± f, so removing the carrier does not remove the hum at f. On the
 * residual, a joint least-squares fit of a constant and a cosine/sine pair per mains frequency
 * (IEEE Std 1057 three-parameter fits, solved jointly because 50 and 60 Hz are not orthogonal over
 * short blocks) is made in blocks of whole cycles about 0.2 s long, at most 2^16 samples per
 * channel spread over the record. The phasors took a leak of the hum (see humLeakFraction), and the
 * interpolated envelope puts part of it back at f (through the images of the interpolation), so
 * the leak of the fitted hum is computed per cycle with the cycle's own three-parameter fit, added
 * back to the residual, and the fit repeated twice. Power is averaged over blocks and the white-noise bias 2σ²/N (variance of an LS
 * sinusoid coefficient, Kay 1993 ch.3) is subtracted; a tone counts only when it stands 5 standard
 * deviations of that average above the bias.
 */
export function fitCarrierResidual(
  channels: readonly HumChannel[],
  phasors: CyclePhasors,
  track: CarrierTrack,
  carrierHz: number,
): CarrierResidualFit | undefined {
  const fs = track.sampleRateHz;
  const cycles = phasors.cycleCount;
  if (cycles < 3) return undefined;
  const first = phasors.firstSample[0]!;
  const end = phasors.firstSample[cycles - 1]! + phasors.lengthSamples[cycles - 1]!;
  const cyclesPerBlock = Math.min(cycles, Math.max(1, Math.round(HUM_BLOCK_S * carrierHz)));
  const blockS = (cyclesPerBlock * fs) / carrierHz / fs;
  if (blockS < 0.1 || end - first < 0.1 * fs) return undefined;
  const guardHz = 1.5 / blockS;
  const freqs = MAINS_FREQUENCIES_HZ.filter((f) => {
    if (f >= 0.45 * fs) return false;
    for (let h = 1; h <= 5; h++) if (Math.abs(f - h * carrierHz) < guardHz) return false;
    return true;
  });
  const samplesPerBlock = (cyclesPerBlock * fs) / carrierHz;
  const nBlocksAll = Math.floor(cycles / cyclesPerBlock);
  const nBlocks = Math.max(1, Math.min(nBlocksAll, Math.floor(HUM_MAX_SAMPLES / samplesPerBlock)));
  const cycleStride = nBlocks > 1 ? Math.floor((cycles - cyclesPerBlock) / (nBlocks - 1)) : 0;
  const F = freqs.length;
  const cols = 1 + 2 * F;
  const nch = channels.length;
  const power = channels.map(() => new Float64Array(F));
  const noiseVar = new Float64Array(nch);
  const dcSum = new Float64Array(nch);
  const dcSq = new Float64Array(nch);
  const mat = new Float64Array(cols * cols);
  const row = new Float64Array(cols);
  const rhs = channels.map(() => new Float64Array(cols));
  const rhsCorr = channels.map(() => new Float64Array(cols));
  const sumSq = new Float64Array(nch);
  const cosF = new Float64Array(F);
  const sinF = new Float64Array(F);
  const stepC = freqs.map((f) => Math.cos((2 * Math.PI * f) / fs));
  const stepS = freqs.map((f) => Math.sin((2 * Math.PI * f) / fs));
  const centre = (m: number): number => phasors.firstSample[m]! + (phasors.lengthSamples[m]! - 1) / 2;
  // Per cycle of the block: the cycle's normal matrix of (sin Φ, cos Φ, 1) and the projections of
  // every tone basis function on those three columns, to find how much hum each cycle's phasor took.
  const normal = new Float64Array(cyclesPerBlock * 9);
  const proj = new Float64Array(cyclesPerBlock * 2 * F * 3);
  const leakI = channels.map(() => new Float64Array(cyclesPerBlock));
  const leakQ = channels.map(() => new Float64Array(cyclesPerBlock));
  let blocksUsed = 0;
  let samplesInBlocks = 0;

  /** One pass over the block's samples; `visit` sees the sample, its regressors, the carrier and the interpolation place. */
  const sweep = (m0: number, m1: number, visit: (n: number, sp: number, cp: number, m: number, t: number) => void): void => {
    const b0 = phasors.firstSample[m0]!;
    const b1 = phasors.firstSample[m1 - 1]! + phasors.lengthSamples[m1 - 1]!;
    for (let k = 0; k < F; k++) {
      const ph = (2 * Math.PI * freqs[k]! * b0) / fs;
      cosF[k] = Math.cos(ph);
      sinF[k] = Math.sin(ph);
    }
    let m = Math.max(0, m0 - 1);
    for (let n = b0; n < b1; n++) {
      while (m < cycles - 2 && n >= centre(m + 1)) m++;
      const c0 = centre(m);
      const t = (n - c0) / (centre(m + 1) - c0);
      row[0] = 1;
      for (let k = 0; k < F; k++) {
        row[1 + 2 * k] = cosF[k]!;
        row[2 + 2 * k] = sinF[k]!;
        const c = cosF[k]! * stepC[k]! - sinF[k]! * stepS[k]!;
        sinF[k] = sinF[k]! * stepC[k]! + cosF[k]! * stepS[k]!;
        cosF[k] = c;
      }
      const phase = carrierPhaseAt(track, n);
      visit(n, Math.sin(phase), Math.cos(phase), m, t);
    }
  };

  for (let b = 0; b < nBlocks; b++) {
    const m0 = b * cycleStride;
    const m1 = Math.min(cycles, m0 + cyclesPerBlock);
    mat.fill(0);
    sumSq.fill(0);
    normal.fill(0);
    proj.fill(0);
    for (const r of rhs) r.fill(0);
    // Pass 1: residual against the demodulator's phasors, interpolated between cycle centres.
    let own = m0;
    sweep(m0, m1, (n, sp, cp, m, t) => {
      while (own < m1 - 1 && n >= phasors.firstSample[own + 1]!) own++;
      for (let r = 0; r < cols; r++) for (let c = 0; c <= r; c++) mat[r * cols + c] += row[r]! * row[c]!;
      const o9 = (own - m0) * 9;
      normal[o9] += sp * sp;
      normal[o9 + 3] += sp * cp;
      normal[o9 + 6] += sp;
      normal[o9 + 4] += cp * cp;
      normal[o9 + 7] += cp;
      normal[o9 + 8] += 1;
      const base = (own - m0) * 2 * F * 3;
      for (let j = 0; j < 2 * F; j++) {
        const v = row[1 + j]!;
        const at = base + j * 3;
        proj[at] += v * sp;
        proj[at + 1] += v * cp;
        proj[at + 2] += v;
      }
      for (let ch = 0; ch < nch; ch++) {
        const pc = channels[ch]!.phasorChannel;
        const ip = phasors.inPhase[pc]!, qu = phasors.quadrature[pc]!;
        const resid = channels[ch]!.samples[n]! - ((ip[m]! + (ip[m + 1]! - ip[m]!) * t) * sp + (qu[m]! + (qu[m + 1]! - qu[m]!) * t) * cp);
        if (!Number.isFinite(resid)) continue;
        const r = rhs[ch]!;
        for (let k = 0; k < cols; k++) r[k] += row[k]! * resid;
        sumSq[ch] += resid * resid;
      }
    });
    let sols = rhs.map((r) => solveSymmetric(mat, r, cols, 1e-12));
    if (!sols.every((x) => x.ok)) continue;
    // Passes 2-3: the phasors took part of the hum (their leak), which the residual then lacks;
    // add it back, as fitted so far, and refit (the leak is a fraction of the hum, so this converges
    // geometrically; two rounds leave < 1 % at 180 Hz on a 400 Hz carrier, seen in tests).
    if (F > 0) {
      for (let round = 0; round < 2; round++) {
        for (let ch = 0; ch < nch; ch++) {
          const x = sols[ch]!.x;
          for (let o = 0; o < m1 - m0; o++) {
            const proj3 = [0, 0, 0];
            for (let j = 0; j < 2 * F; j++) for (let c = 0; c < 3; c++) proj3[c] += x[1 + j]! * proj[(o * 2 * F + j) * 3 + c]!;
            const sol = solveSymmetric(normal.subarray(o * 9, o * 9 + 9), proj3, 3, 1e-12);
            leakI[ch]![o] = sol.ok ? sol.x[0]! : 0;
            leakQ[ch]![o] = sol.ok ? sol.x[1]! : 0;
          }
          rhsCorr[ch]!.fill(0);
        }
        const span = m1 - m0;
        sweep(m0, m1, (_n, sp, cp, m, t) => {
          const o0 = m - m0;
          const in0 = o0 >= 0 && o0 < span;
          const in1 = o0 + 1 >= 0 && o0 + 1 < span;
          for (let ch = 0; ch < nch; ch++) {
            const li = leakI[ch]!, lq = leakQ[ch]!;
            const i0 = in0 ? li[o0]! : 0, i1 = in1 ? li[o0 + 1]! : 0;
            const q0 = in0 ? lq[o0]! : 0, q1 = in1 ? lq[o0 + 1]! : 0;
            const corr = (i0 + (i1 - i0) * t) * sp + (q0 + (q1 - q0) * t) * cp;
            const r = rhsCorr[ch]!;
            for (let k = 0; k < cols; k++) r[k] += row[k]! * corr;
          }
        });
        sols = rhs.map((r, ch) => solveSymmetric(mat, r.map((v, k) => v + rhsCorr[ch]![k]!), cols, 1e-12));
        if (!sols.every((x) => x.ok)) break;
      }
      if (!sols.every((x) => x.ok)) continue;
    }
    blocksUsed++;
    const blockLen = phasors.firstSample[m1 - 1]! + phasors.lengthSamples[m1 - 1]! - phasors.firstSample[m0]!;
    samplesInBlocks += blockLen;
    sols.forEach((sol, ch) => {
      const x = sol.x;
      let explained = 0;
      for (let k = 0; k < cols; k++) explained += x[k]! * rhs[ch]![k]!;
      noiseVar[ch] += Math.max(0, sumSq[ch]! - explained) / Math.max(1, blockLen - cols);
      dcSum[ch] += x[0]!;
      dcSq[ch] += x[0]! * x[0]!;
      for (let k = 0; k < F; k++) power[ch]![k] += (x[1 + 2 * k]! ** 2 + x[2 + 2 * k]! ** 2) / 2;
    });
  }
  if (blocksUsed === 0) return undefined;
  const used = blocksUsed;
  const meanBlockLen = samplesInBlocks / used;
  return {
    frequenciesHz: freqs,
    blocks: used,
    channels: channels.map((_, ch) => {
      const sigma2 = noiseVar[ch]! / used;
      const bias = (2 * sigma2) / meanBlockLen; // E[(a² + b²)/2] from noise alone
      const rmsV = Array.from(power[ch]!, (p) => {
        const mean = p / used - bias;
        return mean > (5 * bias) / Math.sqrt(used) ? Math.sqrt(mean) : 0;
      });
      const dcMean = dcSum[ch]! / used;
      const dcVar = used > 1 ? Math.max(0, dcSq[ch]! / used - dcMean * dcMean) * (used / (used - 1)) : NaN;
      return {
        rmsV,
        noiseFloorV: Math.sqrt(bias),
        dcV: dcMean,
        dcStandardErrorV: used > 1 ? Math.sqrt(dcVar / used) : Math.sqrt(sigma2 / meanBlockLen),
      };
    }),
  };
}

/** Mains hum per channel from the carrier residual (see fitCarrierResidual), with its possible effect on the angle. */
export function measureMainsHum(
  channels: readonly HumChannel[],
  phasors: CyclePhasors,
  track: CarrierTrack,
  carrierHz: number,
  residual: CarrierResidualFit | undefined = fitCarrierResidual(channels, phasors, track, carrierHz),
): HumLevel[] {
  if (!residual || residual.frequenciesHz.length === 0) {
    return channels.map((c) => ({ role: c.role, frequenciesHz: [], rmsMv: [], totalRmsMv: NaN, angleErrorArcmin: NaN }));
  }
  const freqs = residual.frequenciesHz;
  return channels.map((c, ch) => {
    const rmsV = residual.channels[ch]!.rmsV;
    let leak = 0;
    rmsV.forEach((v, k) => (leak += v * Math.SQRT2 * humLeakFraction(freqs[k]!, carrierHz)));
    return {
      role: c.role,
      frequenciesHz: freqs,
      rmsMv: rmsV.map((v) => v * 1000),
      totalRmsMv: Math.hypot(...rmsV) * 1000,
      angleErrorArcmin: c.scalePeakV > 0 ? (leak / c.scalePeakV) * ARCMIN_PER_RAD : NaN,
    };
  });
}

/** Findings for measured hum: warning when it could move the angle by ≥ 1′ (info ≥ 0.1′; the reference only ever info). */
export function humFindings(levels: readonly HumLevel[], channels: readonly HumChannel[]): Finding[] {
  const out: Finding[] = [];
  levels.forEach((h, i) => {
    if (!(h.angleErrorArcmin >= HUM_INFO_ARCMIN)) return;
    const isRef = channels[i]?.isReference ?? false;
    const severity = !isRef && h.angleErrorArcmin >= HUM_WARNING_ARCMIN ? 'warning' : 'info';
    const biggest = Math.max(...h.rmsMv);
    const parts = h.frequenciesHz
      .map((f, k) => ({ f, mv: h.rmsMv[k]! }))
      .filter((p) => p.mv >= 0.1 * biggest)
      .map((p) => `${p.f} Hz ${p.mv.toFixed(1)} mV`);
    const figures: Record<string, number> = { totalRmsMv: h.totalRmsMv, angleErrorArcmin: h.angleErrorArcmin };
    h.frequenciesHz.forEach((f, k) => (figures[`hum${f}HzMv`] = h.rmsMv[k]!));
    out.push(
      finding('mains-hum', severity, `${h.role} carries ${h.totalRmsMv.toFixed(1)} mV RMS of mains hum (${parts.join(', ')}).`, {
        advice: isRef
          ? 'Hum on the excitation channel barely affects the carrier fit (it is fitted over the whole record), but it points to a ground loop or an unshielded lead.'
          : `Leaking into the per-cycle phasors it could move the angle by up to ${h.angleErrorArcmin.toFixed(2)}′; look for a ground loop (several probe grounds on different points), long ground leads or unshielded wiring near mains cables.`,
        roles: [h.role],
        figures,
      }),
    );
  });
  return out;
}

