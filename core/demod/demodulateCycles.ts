import { carrierPhaseAt, carrierRadPerSampleAt, type CarrierTrack } from '../carrier/carrierTrack.js';
import { mergeSampleExtremes, type SampleExtremes } from '../diagnostics/sampleExtremes.js';
import { EXTREMES_STATE, fillCycleTable, projectPair } from './cycleKernels.js';

/**
 * One complex phasor per carrier cycle per channel.
 *
 * Method: a per-window three-parameter least-squares fit (IEEE Std 1057 §4.1.3.1 "three-parameter
 * sine fit", applied per window) of y[n] ≈ I·sin Φ(n) + Q·cos Φ(n) + D over each carrier cycle,
 * where Φ is the tracked excitation phase. A cycle is the run of samples whose carrier phase lies
 * in [2πm, 2π(m+1)); the fit is exact for any non-integer number of samples per period (no 2f
 * ripple) and rejects DC offsets. I is the signed in-phase amplitude (peak volts; positive = in
 * time phase with R1-R2), Q the quadrature amplitude; a unit whose output leads the excitation by
 * ψ gives I + jQ = A·e^{jψ}.
 *
 * Sines and cosines are computed exactly at each window start and stepped by a rotation within
 * the window (≤ one period of steps, so rounding stays ~1e-14); no phase is accumulated across
 * windows.
 */
export interface CyclePhasors {
  readonly cycleCount: number;
  /** Centre of each window in seconds from the first sample (midpoint of its first and last sample). */
  readonly centreS: Float64Array;
  /** First sample index of each window. */
  readonly firstSample: Float64Array;
  /** Number of samples in each window. */
  readonly lengthSamples: Float64Array;
  /** Local carrier frequency of each window, rad/sample. */
  readonly radPerSample: Float64Array;
  /** Carrier phase at each window centre, radians in [0, 2π) (≈ π for a reference-aligned cycle). */
  readonly centrePhaseRad: Float64Array;
  /** Per channel: in-phase amplitude (peak V), quadrature amplitude (peak V), DC level (V). NaN where a window held a NaN sample. */
  readonly inPhase: readonly Float64Array[];
  readonly quadrature: readonly Float64Array[];
  readonly dc: readonly Float64Array[];
  /**
   * Per channel, the extremes of the samples the cycles cover (firstSample[0] up to the end of
   * the last cycle): the clipping check's first pass, taken in the same pass over the samples
   * (a separate pass cost ~1.4 ns/sample here against ~0.35 ns/sample in the demodulation's
   * loop, measured).
   */
  readonly extremes: readonly SampleExtremes[];
}

/** Window boundaries: boundary[m] = smallest sample index n with Φ(n) ≥ 2π(m0 + m). */
export function cycleBoundaries(track: CarrierTrack, sampleCount: number): Float64Array {
  const twoPi = 2 * Math.PI;
  const out: number[] = [];
  const phase0 = carrierPhaseAt(track, 0);
  let target = Math.ceil(phase0 / twoPi) * twoPi;
  let x = 0;
  for (;;) {
    // Newton steps on the continuous phase, then settle on the integer boundary.
    for (let k = 0; k < 3; k++) {
      const w = carrierRadPerSampleAt(track, x);
      if (!(w > 0)) return Float64Array.from(out);
      x += (target - carrierPhaseAt(track, x)) / w;
    }
    let n = Math.ceil(x);
    while (n > 0 && carrierPhaseAt(track, n - 1) >= target) n--;
    while (carrierPhaseAt(track, n) < target) n++;
    if (n >= sampleCount) break;
    out.push(n);
    target += twoPi;
  }
  return Float64Array.from(out);
}

/** Signature of demodulateCycles, for a caller that supplies its own (e.g. spread over threads). */
export type CycleDemodulator = (channels: readonly ArrayLike<number>[], track: CarrierTrack, sampleCount: number) => CyclePhasors;

export function demodulateCycles(
  channels: readonly ArrayLike<number>[],
  track: CarrierTrack,
  sampleCount: number,
): CyclePhasors {
  return demodulateCycleRange(channels, track, cycleBoundaries(track, sampleCount));
}

/**
 * The phasors of the cycles between consecutive `bounds` (a run of cycleBoundaries, any part of
 * it): each cycle depends only on its own samples, so ranges demodulated apart (one per thread)
 * and joined (joinCyclePhasors) equal demodulateCycles bit for bit.
 */
export function demodulateCycleRange(
  channels: readonly ArrayLike<number>[],
  track: CarrierTrack,
  bounds: Float64Array,
): CyclePhasors {
  const cycles = Math.max(0, bounds.length - 1);
  const centreS = new Float64Array(cycles);
  const firstSample = new Float64Array(cycles);
  const lengthSamples = new Float64Array(cycles);
  const radPerSample = new Float64Array(cycles);
  const centrePhaseRad = new Float64Array(cycles);
  const inPhase = channels.map(() => new Float64Array(cycles));
  const quadrature = channels.map(() => new Float64Array(cycles));
  const dc = channels.map(() => new Float64Array(cycles));

  let maxLength = 0;
  for (let m = 0; m < cycles; m++) maxLength = Math.max(maxLength, bounds[m + 1]! - bounds[m]!);
  const sinBuf = new Float64Array(maxLength);
  const cosBuf = new Float64Array(maxLength);
  const sums = new Float64Array(6);
  // Per channel: lowest and highest sample so far and how many sit on each (see projectPair),
  // and a spare slot for the copy of an odd last channel (below).
  const ext = new Float64Array(EXTREMES_STATE * (channels.length + 1));
  for (let ch = 0; ch <= channels.length; ch++) ext.set([Infinity, -Infinity, 0, 0], EXTREMES_STATE * ch);

  // The loops over samples are small functions called once per cycle: one function holding
  // them all was compiled on stack (OSR) with no type feedback for the code after its loops,
  // deoptimised there and recompiled several times on a 10^7-sample record, running slow
  // meanwhile (seen with --trace-deopt); small ones are optimised whole after a few calls.
  for (let m = 0; m < cycles; m++) {
    const start = bounds[m]!;
    const length = bounds[m + 1]! - start;
    const startPhase = carrierPhaseAt(track, start);
    const endPhase = carrierPhaseAt(track, start + length - 1);
    const w = length > 1 ? (endPhase - startPhase) / (length - 1) : carrierRadPerSampleAt(track, start);
    fillCycleTable(startPhase, w, length, sinBuf, cosBuf, sums);
    const ss = sums[0]!, sc = sums[1]!, cc = sums[2]!, s1 = sums[3]!, c1 = sums[4]!;
    // Inverse of the symmetric 3x3 normal matrix [[ss, sc, s1], [sc, cc, c1], [s1, c1, L]].
    const L = length;
    const a00 = cc * L - c1 * c1;
    const a01 = -(sc * L - s1 * c1);
    const a02 = sc * c1 - s1 * cc;
    const a11 = ss * L - s1 * s1;
    const a12 = -(ss * c1 - sc * s1);
    const a22 = ss * cc - sc * sc;
    const det = ss * a00 + sc * a01 + s1 * a02;
    const inv = 1 / det;

    // Two channels per pass share the table loads and interleave two sets of independent sums
    // (each channel's sums keep their order, so the result is the same as one channel per pass).
    // An odd last channel goes through with itself as the second (its copy's sums are dropped,
    // its extremes land in the spare slot): the carrier track's one-channel pass then runs and
    // warms the same kernel as the pass over all channels, for a little more than a one-channel
    // kernel costs (a pair took ~23 ms per 10^7 samples in a microbenchmark, the whole one-channel
    // pass with its table ~50); a second kernel met cold in that pass ran slow until compiled.
    for (let ch = 0; ch < channels.length; ch += 2) {
      const x = channels[ch]!;
      projectPair(x, ch + 1 < channels.length ? channels[ch + 1]! : x, start, length, sinBuf, cosBuf, sums, ext, EXTREMES_STATE * ch);
      const xs = sums[0]!, xc = sums[1]!, x1 = sums[2]!, ys = sums[3]!, yc = sums[4]!, y1 = sums[5]!;
      inPhase[ch]![m] = (a00 * xs + a01 * xc + a02 * x1) * inv;
      quadrature[ch]![m] = (a01 * xs + a11 * xc + a12 * x1) * inv;
      dc[ch]![m] = (a02 * xs + a12 * xc + a22 * x1) * inv;
      if (ch + 1 === channels.length) continue;
      inPhase[ch + 1]![m] = (a00 * ys + a01 * yc + a02 * y1) * inv;
      quadrature[ch + 1]![m] = (a01 * ys + a11 * yc + a12 * y1) * inv;
      dc[ch + 1]![m] = (a02 * ys + a12 * yc + a22 * y1) * inv;
    }
    firstSample[m] = start;
    lengthSamples[m] = length;
    radPerSample[m] = w;
    const centre = start + (length - 1) / 2;
    centreS[m] = centre / track.sampleRateHz;
    const phase = carrierPhaseAt(track, centre) % (2 * Math.PI);
    centrePhaseRad[m] = phase < 0 ? phase + 2 * Math.PI : phase;
  }
  const covered = cycles > 0 ? bounds[cycles]! - bounds[0]! : 0;
  const extremes = channels.map((_, ch): SampleExtremes => {
    const o = EXTREMES_STATE * ch;
    return { sampleCount: covered, lo: ext[o]!, hi: ext[o + 1]!, countLo: ext[o + 2]!, countHi: ext[o + 3]! };
  });
  return { cycleCount: cycles, centreS, firstSample, lengthSamples, radPerSample, centrePhaseRad, inPhase, quadrature, dc, extremes };
}


/** Phasors of consecutive cycle ranges (same channels, in order) joined into one. */
export function joinCyclePhasors(parts: readonly CyclePhasors[]): CyclePhasors {
  const cycleCount = parts.reduce((n, p) => n + p.cycleCount, 0);
  const join = (pick: (p: CyclePhasors) => Float64Array): Float64Array => {
    const out = new Float64Array(cycleCount);
    let at = 0;
    for (const p of parts) {
      out.set(pick(p).subarray(0, p.cycleCount), at);
      at += p.cycleCount;
    }
    return out;
  };
  const channels = parts.length ? parts[0]!.inPhase.length : 0;
  const perChannel = (pick: (p: CyclePhasors) => readonly Float64Array[]): Float64Array[] =>
    Array.from({ length: channels }, (_, ch) => join((p) => pick(p)[ch]!));
  return {
    cycleCount,
    centreS: join((p) => p.centreS),
    firstSample: join((p) => p.firstSample),
    lengthSamples: join((p) => p.lengthSamples),
    radPerSample: join((p) => p.radPerSample),
    centrePhaseRad: join((p) => p.centrePhaseRad),
    inPhase: perChannel((p) => p.inPhase),
    quadrature: perChannel((p) => p.quadrature),
    dc: perChannel((p) => p.dc),
    extremes: Array.from({ length: channels }, (_, ch) => parts.map((p) => p.extremes[ch]!).reduce(mergeSampleExtremes)),
  };
}
