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

/** What fitCarrierResidual needs of a channel: its samples and its index in the phasor arrays. */
export type ResidualChannel = Pick<HumChannel, 'samples' | 'phasorChannel'>;

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
 *
 * Cost: the samples are visited once per block. The normal matrix of the tones is summed in closed
 * form (toneGram); the leak added back is linear in the per-cycle leaks, so its projection comes from
 * hat-weighted sums taken in the same pass; and every Σ q(n)·cos ω_k n is built from a few moments
 * of q per chunk of samples (chunkLength: Taylor series of the tone within the chunk, error
 * < 3e-11 relative), so the per-sample work no longer grows with the number of tones. The sums are
 * those of a per-sample fit up to rounding.
 */
export function fitCarrierResidual(
  channels: readonly ResidualChannel[],
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
  const rhs = channels.map(() => new Float64Array(cols));
  const rhsCorr = channels.map(() => new Float64Array(cols));
  const sumSq = new Float64Array(nch);
  const centre = (m: number): number => phasors.firstSample[m]! + (phasors.lengthSamples[m]! - 1) / 2;
  // Per cycle of the block: the cycle's normal matrix of (sin Φ, cos Φ, 1) and the projections of
  // every tone basis function on those three columns, to find how much hum each cycle's phasor took.
  const normal = new Float64Array(cyclesPerBlock * 9);
  const proj = new Float64Array(cyclesPerBlock * 2 * F * 3);
  const leakI = channels.map(() => new Float64Array(cyclesPerBlock));
  const leakQ = channels.map(() => new Float64Array(cyclesPerBlock));
  let blocksUsed = 0;
  let samplesInBlocks = 0;

  // Per cycle o of the block, the interpolated-envelope weights folded into the regressors: slot o + 1
  // holds Σ h_o(n)·row_k(n)·sin Φ(n) and Σ h_o(n)·row_k(n)·cos Φ(n), h_o the hat function of the linear
  // interpolation that peaks at cycle o's centre (slot 0 collects the parts of cycles outside the block).
  // The leak added back in passes 2-3 is linear in the per-cycle leaks, so its projection on the
  // regressors is Σ_o (leakI_o·hatS_o + leakQ_o·hatC_o), with no second pass over the samples.
  const hat = new Float64Array((cyclesPerBlock + 1) * cols * 2);
  const data = channels.map((c) => c.samples);
  const inPhase = channels.map((c) => phasors.inPhase[c.phasorChannel]!);
  const quad = channels.map((c) => phasors.quadrature[c.phasorChannel]!);
  const omega = freqs.map((f) => (2 * Math.PI * f) / fs);
  // Chunk moments: within a chunk of D samples, cos ω(c + u) = cos ωc·cos ωu − sin ωc·sin ωu with
  // cos ωu and sin ωu replaced by their Taylor series to u⁴ (u the offset from the chunk's reference
  // point c), so every regressor sum Σ q(n)·cos ω_k n over the chunk is a fixed combination of the
  // moments Σ q(n)·uᵖ, p = 0…4, shared by all frequencies (see chunkLength for the error bound).
  const D = chunkLength(omega);
  const scratch = new Float64Array(3 * D);
  const momCarrier = new Float64Array(5 * MOMENTS);
  const momR = new Float64Array(nch * MOMENTS);
  const tc = new Float64Array(F);
  const ts = new Float64Array(F);
  const sumRow = new Float64Array(cols);
  /** Σ row_k(n)·q(n) over the chunk, k = 0…cols−1, from q's moments at offset `at` (tc, ts: the tones at the reference point). */
  const rowSums = (mom: Float64Array, at: number): Float64Array => {
    const q0 = mom[at]!, q1 = mom[at + 1]!, q2 = mom[at + 2]!, q3 = mom[at + 3]!, q4 = mom[at + 4]!;
    sumRow[0] = q0;
    for (let k = 0; k < F; k++) {
      const w = omega[k]!, w2 = w * w;
      const cu = q0 - (w2 / 2) * q2 + ((w2 * w2) / 24) * q4; // Σ q·cos ωu
      const su = w * q1 - ((w2 * w) / 6) * q3; // Σ q·sin ωu
      sumRow[1 + 2 * k] = tc[k]! * cu - ts[k]! * su;
      sumRow[2 + 2 * k] = ts[k]! * cu + tc[k]! * su;
    }
    return sumRow;
  };
  const flushChunk = (ref: number, h0: number, h1: number, base: number): void => {
    for (let k = 0; k < F; k++) {
      tc[k] = Math.cos(omega[k]! * ref);
      ts[k] = Math.sin(omega[k]! * ref);
    }
    for (let ch = 0; ch < nch; ch++) {
      const sums = rowSums(momR, ch * MOMENTS);
      const r = rhs[ch]!;
      for (let k = 0; k < cols; k++) r[k] += sums[k]!;
    }
    let sums = rowSums(momCarrier, 0);
    for (let k = 0; k < cols; k++) {
      hat[h0 + 2 * k] += sums[k]!;
      if (k > 0) proj[base + (k - 1) * 3] += sums[k]!;
    }
    sums = rowSums(momCarrier, MOMENTS);
    for (let k = 0; k < cols; k++) {
      hat[h0 + 2 * k + 1] += sums[k]!;
      if (k > 0) proj[base + (k - 1) * 3 + 1] += sums[k]!;
    }
    sums = rowSums(momCarrier, 4 * MOMENTS);
    for (let k = 1; k < cols; k++) proj[base + (k - 1) * 3 + 2] += sums[k]!;
    sums = rowSums(momCarrier, 2 * MOMENTS);
    for (let k = 0; k < cols; k++) {
      hat[h0 + 2 * k] -= sums[k]!;
      hat[h1 + 2 * k] += sums[k]!;
    }
    sums = rowSums(momCarrier, 3 * MOMENTS);
    for (let k = 0; k < cols; k++) {
      hat[h0 + 2 * k + 1] -= sums[k]!;
      hat[h1 + 2 * k + 1] += sums[k]!;
    }
  };

  for (let b = 0; b < nBlocks; b++) {
    const m0 = b * cycleStride;
    const m1 = Math.min(cycles, m0 + cyclesPerBlock);
    const span = m1 - m0;
    const b0 = phasors.firstSample[m0]!;
    const b1 = phasors.firstSample[m1 - 1]! + phasors.lengthSamples[m1 - 1]!;
    toneGram(mat, omega, b0, b1 - b0);
    sumSq.fill(0);
    normal.fill(0);
    proj.fill(0);
    hat.fill(0);
    for (const r of rhs) r.fill(0);
    // Pass 1: residual against the demodulator's phasors, interpolated between cycle centres, summed
    // into chunk moments (see chunkLength); a chunk never straddles a cycle start or a cycle centre.
    let m = Math.max(0, m0 - 1);
    let own = m0;
    for (let n = b0; n < b1; ) {
      while (m < cycles - 2 && n >= centre(m + 1)) m++;
      while (own < m1 - 1 && n >= phasors.firstSample[own + 1]!) own++;
      let chunkEnd = Math.min(n + D, b1);
      if (m < cycles - 2) chunkEnd = Math.min(chunkEnd, Math.ceil(centre(m + 1)));
      if (own < m1 - 1) chunkEnd = Math.min(chunkEnd, Math.ceil(phasors.firstSample[own + 1]!));
      accumulateChunk(track, n, chunkEnd, m, centre(m), centre(m + 1), (D - 1) / 2, scratch, normal, (own - m0) * 9, momCarrier, data, inPhase, quad, momR, sumSq);
      flushChunk(n + (D - 1) / 2, hatSlot(m - m0, span) * cols * 2, hatSlot(m + 1 - m0, span) * cols * 2, (own - m0) * 2 * F * 3);
      n = chunkEnd;
    }
    let sols = rhs.map((r) => solveSymmetric(mat, r, cols, 1e-12));
    if (!sols.every((x) => x.ok)) continue;
    // Passes 2-3: the phasors took part of the hum (their leak), which the residual then lacks;
    // add it back, as fitted so far, and refit (the leak is a fraction of the hum, so this converges
    // geometrically; two rounds leave < 1 % at 180 Hz on a 400 Hz carrier, seen in tests).
    if (F > 0) {
      for (let round = 0; round < 2; round++) {
        for (let ch = 0; ch < nch; ch++) {
          const x = sols[ch]!.x;
          const li = leakI[ch]!, lq = leakQ[ch]!;
          for (let o = 0; o < span; o++) {
            const proj3 = [0, 0, 0];
            for (let j = 0; j < 2 * F; j++) for (let c = 0; c < 3; c++) proj3[c] += x[1 + j]! * proj[(o * 2 * F + j) * 3 + c]!;
            const sol = solveSymmetric(normal.subarray(o * 9, o * 9 + 9), proj3, 3, 1e-12);
            li[o] = sol.ok ? sol.x[0]! : 0;
            lq[o] = sol.ok ? sol.x[1]! : 0;
          }
          const rc = rhsCorr[ch]!;
          for (let k = 0; k < cols; k++) {
            let acc = 0;
            for (let o = 0; o < span; o++) {
              const at = ((o + 1) * cols + k) * 2;
              acc += li[o]! * hat[at]! + lq[o]! * hat[at + 1]!;
            }
            rc[k] = acc;
          }
        }
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

/** Moments Σ q·uᵖ kept per chunk, p = 0…MOMENTS−1. */
const MOMENTS = 5;
/** Largest |ω·u| allowed in a chunk (radians): the first Taylor terms left out are (ωu)⁵/5! and (ωu)⁶/6!, < 3e-11 relative here. */
const CHUNK_MAX_ARG_RAD = 0.02;

/**
 * Samples per chunk of the hum fit: the most for which |ω·u| ≤ CHUNK_MAX_ARG_RAD at the highest
 * fitted frequency (u ≤ (D − 1)/2 from the chunk's reference point), at most 64 and at least 1 (one
 * sample per chunk is the plain per-sample sum). Truncating the series of cos ωu and sin ωu after u⁴
 * leaves a relative error below (ωu)⁵/5! (Taylor remainder), ~3e-11 at the bound, so the chunked sums
 * equal the per-sample ones to rounding for any practical purpose.
 */
function chunkLength(omega: readonly number[]): number {
  const top = Math.max(0, ...omega);
  if (top === 0) return 64;
  return Math.max(1, Math.min(64, Math.floor(1 + (2 * CHUNK_MAX_ARG_RAD) / top)));
}

/**
 * One chunk of the sample loop of fitCarrierResidual: samples n0 … n1 − 1, all between the centres
 * c0 and c1 of cycles m and m + 1 and inside one cycle (normal matrix at o9). Adds the cycle's
 * (sin Φ, cos Φ, 1) normal matrix, the moments Σ q·uᵖ of q = sin Φ, cos Φ, t·sin Φ, t·cos Φ and 1
 * (t the interpolation place) into momCarrier, and per channel the moments of the residual (data
 * minus the interpolated phasor model; non-finite residuals are skipped) into momR and its square
 * into sumSq.
 */
function accumulateChunk(
  track: CarrierTrack,
  n0: number,
  n1: number,
  m: number,
  c0: number,
  c1: number,
  half: number,
  scratch: Float64Array,
  normal: Float64Array,
  o9: number,
  momCarrier: Float64Array,
  data: readonly ArrayLike<number>[],
  inPhase: readonly Float64Array[],
  quad: readonly Float64Array[],
  momR: Float64Array,
  sumSq: Float64Array,
): void {
  const len = n1 - n0;
  let nss = 0, nsc = 0, ns = 0, ncc = 0, nc = 0;
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0;
  let k0 = 0, k1 = 0, k2 = 0, k3 = 0, k4 = 0;
  let st0 = 0, st1 = 0, st2 = 0, st3 = 0, st4 = 0;
  let kt0 = 0, kt1 = 0, kt2 = 0, kt3 = 0, kt4 = 0;
  let e1 = 0, e2 = 0, e3 = 0, e4 = 0;
  for (let d = 0; d < len; d++) {
    const n = n0 + d;
    const t = (n - c0) / (c1 - c0);
    const phase = carrierPhaseAt(track, n);
    const sp = Math.sin(phase);
    const cp = Math.cos(phase);
    scratch[3 * d] = t;
    scratch[3 * d + 1] = sp;
    scratch[3 * d + 2] = cp;
    nss += sp * sp;
    nsc += sp * cp;
    ns += sp;
    ncc += cp * cp;
    nc += cp;
    const u = d - half, u2 = u * u, u3 = u2 * u, u4 = u2 * u2;
    const spt = sp * t, cpt = cp * t;
    s0 += sp; s1 += sp * u; s2 += sp * u2; s3 += sp * u3; s4 += sp * u4;
    k0 += cp; k1 += cp * u; k2 += cp * u2; k3 += cp * u3; k4 += cp * u4;
    st0 += spt; st1 += spt * u; st2 += spt * u2; st3 += spt * u3; st4 += spt * u4;
    kt0 += cpt; kt1 += cpt * u; kt2 += cpt * u2; kt3 += cpt * u3; kt4 += cpt * u4;
    e1 += u; e2 += u2; e3 += u3; e4 += u4;
  }
  normal[o9] += nss;
  normal[o9 + 3] += nsc;
  normal[o9 + 6] += ns;
  normal[o9 + 4] += ncc;
  normal[o9 + 7] += nc;
  normal[o9 + 8] += len;
  const put = (at: number, a0: number, a1: number, a2: number, a3: number, a4: number): void => {
    momCarrier[at] = a0;
    momCarrier[at + 1] = a1;
    momCarrier[at + 2] = a2;
    momCarrier[at + 3] = a3;
    momCarrier[at + 4] = a4;
  };
  put(0, s0, s1, s2, s3, s4);
  put(MOMENTS, k0, k1, k2, k3, k4);
  put(2 * MOMENTS, st0, st1, st2, st3, st4);
  put(3 * MOMENTS, kt0, kt1, kt2, kt3, kt4);
  put(4 * MOMENTS, len, e1, e2, e3, e4);
  for (let ch = 0; ch < data.length; ch++) {
    const x = data[ch]!;
    const ip = inPhase[ch]!, qu = quad[ch]!;
    const i0 = ip[m]!, di = ip[m + 1]! - i0, q0 = qu[m]!, dq = qu[m + 1]! - q0;
    let r0 = 0, r1 = 0, r2 = 0, r3 = 0, r4 = 0, sq = 0;
    for (let d = 0; d < len; d++) {
      const t = scratch[3 * d]!;
      const resid = x[n0 + d]! - ((i0 + di * t) * scratch[3 * d + 1]! + (q0 + dq * t) * scratch[3 * d + 2]!);
      if (!Number.isFinite(resid)) continue;
      const u = d - half, u2 = u * u;
      const ru = resid * u, ru2 = resid * u2;
      r0 += resid; r1 += ru; r2 += ru2; r3 += ru2 * u; r4 += ru2 * u2;
      sq += resid * resid;
    }
    const at = ch * MOMENTS;
    momR[at] = r0;
    momR[at + 1] = r1;
    momR[at + 2] = r2;
    momR[at + 3] = r3;
    momR[at + 4] = r4;
    sumSq[ch] += sq;
  }
}

/** Slot of cycle o (of span in the block) in the hat sums; slot 0 collects cycles outside the block. */
function hatSlot(o: number, span: number): number {
  return o >= 0 && o < span ? o + 1 : 0;
}

/** Σ cos(ωn) and Σ sin(ωn) over n = n0 … n0 + N − 1, in closed form (geometric series of e^{iωn}). */
function sumCosSin(omega: number, n0: number, count: number): [number, number] {
  if (omega === 0) return [count, 0];
  const ratio = Math.sin((count * omega) / 2) / Math.sin(omega / 2);
  const mid = omega * (n0 + (count - 1) / 2);
  return [ratio * Math.cos(mid), ratio * Math.sin(mid)];
}

/**
 * Normal matrix of the regressors (1, cos ω_k n, sin ω_k n, …) over n = n0 … n0 + N − 1, full and
 * symmetric, from the product-to-sum identities and sumCosSin (the same sums the sample loop would
 * accumulate, without visiting the samples).
 */
function toneGram(mat: Float64Array, omega: readonly number[], n0: number, count: number): void {
  const cols = 1 + 2 * omega.length;
  const put = (r: number, c: number, v: number): void => {
    mat[r * cols + c] = v;
    mat[c * cols + r] = v;
  };
  put(0, 0, count);
  for (let a = 0; a < omega.length; a++) {
    const [ca, sa] = sumCosSin(omega[a]!, n0, count);
    put(1 + 2 * a, 0, ca);
    put(2 + 2 * a, 0, sa);
    for (let b = 0; b <= a; b++) {
      const [cd, sd] = sumCosSin(omega[a]! - omega[b]!, n0, count);
      const [cs, ss] = sumCosSin(omega[a]! + omega[b]!, n0, count);
      put(1 + 2 * a, 1 + 2 * b, (cd + cs) / 2); // cos a·cos b
      put(2 + 2 * a, 2 + 2 * b, (cd - cs) / 2); // sin a·sin b
      put(2 + 2 * a, 1 + 2 * b, (ss + sd) / 2); // sin a·cos b
      if (b < a) put(1 + 2 * a, 2 + 2 * b, (ss - sd) / 2); // cos a·sin b
    }
  }
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

