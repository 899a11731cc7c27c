import { finding, type Finding } from '../model/findings.js';
import { bridgeNaN, detrendSegmentArcmin } from './detrendSegment.js';
import { findSpectralPeaks } from './findSpectralPeaks.js';
import { refineTone, toneAmplitude } from './refineTone.js';
import type { MotionKind, MotionSegment } from './segmentMotion.js';
import { medianIntervalS, medianOf } from './robustStats.js';
import { welchPsdOfRecords } from './welchPsd.js';

/** Options of {@link analyzeJitter}. */
export interface JitterOptions {
  /** A spectral peak counts as a tone when it is this far above the median PSD, dB (default 10). */
  readonly minProminenceDb?: number;
  /** Hunting needs the tone's peak amplitude ≥ this many times the RMS of the rest (default 3). */
  readonly huntingAmplitudeRatio?: number;
  /** Hunting needs the tone's amplitude in each half of the record within this ratio (default 0.5). */
  readonly huntingSustainedRatio?: number;
  /** At most this many tones are reported (default 5). */
  readonly maxTones?: number;
  /** Segments shorter than this many finite points are ignored (default 32). */
  readonly minSegmentPoints?: number;
}

/** One tone of the jitter. */
export interface JitterTone {
  readonly frequencyHz: number;
  /** Peak (not RMS) amplitude, arc-minutes (four-parameter sine fit; else from the PSD power). */
  readonly amplitudeArcmin: number;
  /** Peak density over the median density, dB. */
  readonly prominenceDb: number;
}

/** A sustained oscillation that passed the hunting rule of {@link analyzeJitter}. */
export interface HuntingTone extends JitterTone {
  /** RMS of the jitter without this tone, arc-minutes. */
  readonly restRmsArcmin: number;
  /** Smaller over larger of the tone's amplitudes fitted on the two halves of the longest stretch. */
  readonly sustainedRatio: number;
  /** Cycles of the tone in the longest analysed stretch. */
  readonly cycles: number;
}

/** Jitter of the angle where the shaft is at rest (or turning at constant speed). */
export interface JitterResult {
  /** RMS of the residual angle, arc-minutes (1′ = 1/60°). */
  readonly rmsArcmin: number;
  /** Peak-to-peak of the residual angle, arc-minutes. */
  readonly ppArcmin: number;
  /** Frequencies of the significant tones, strongest first, Hz ([] for a featureless spectrum). */
  readonly dominantHz: number[];
  readonly tones: JitterTone[];
  /**
   * Welch PSD of the residual in arcmin²/Hz, one-sided, as seen through the demodulator (the
   * one-cycle boxcar's |sinc(f/fc)| response is not divided out). Absent when the stretches are
   * too short (< 16 points).
   */
  readonly psd?: { readonly fHz: Float64Array; readonly arcmin2PerHz: Float64Array };
  /** √(∫PSD df), arc-minutes (null without a PSD). */
  readonly bandRmsArcmin: number | null;
  /** Median of the PSD, arcmin²/Hz (null without a PSD). */
  readonly noiseFloorArcmin2PerHz: number | null;
  /** Periodograms averaged in the PSD (0 without one) and their length in points. */
  readonly welchSegments: number;
  readonly welchSegmentLength: number;
  /** Which segments were analysed: stationary ones, or constant-speed ones when no stationary stretch was usable. */
  readonly source: Extract<MotionKind, 'stationary' | 'ramp'>;
  readonly segmentsUsed: number;
  /** Finite points analysed and their total duration, s. */
  readonly samples: number;
  readonly durationS: number;
  /** The hunting tone, or null when no tone passes the rule. */
  readonly hunting: HuntingTone | null;
}

/**
 * Jitter of an angle trace over its stationary segments (or, when there is none of at least
 * `minSegmentPoints` (32) points, over its constant-speed 'ramp' segments).
 *
 * Residual: on each segment the least-squares line in time is removed, i.e. the mean and any
 * slow drift (on a ramp segment, the fitted ramp). RMS and peak-to-peak pool the residuals of
 * all segments used. PSD: Welch (1967) on the residuals in arc-minutes ({@link welchPsdOfRecords}),
 * periodic Hann, 50 % overlap, linear detrend per segment, with the largest power-of-two segment
 * length that still averages ≥ 4 periodograms (16 … 65 536 points); interior NaN points are
 * bridged by linear interpolation for the PSD only. The PSD is as seen through the demodulator
 * (see {@link JitterResult.psd}). Tones: {@link findSpectralPeaks} at ≥ 10 dB above the median
 * PSD, each then refined on the longest stretch (Grandke-interpolated FFT, T. Grandke, IEEE
 * Trans. Instrum. Meas. 32(2), 1983, then the IEEE Std 1057 four-parameter sine fit), which
 * gives its frequency and peak amplitude; without a converged fit, the PSD peak frequency and
 * √(2·P), P the tone's power over ±3 bins above the median floor. Tones below about two Welch
 * bins (≈ 5/T for a record of T seconds) are not resolved.
 *
 * Hunting rule (our own; common practice, no source): the strongest tone that (1) stands
 * ≥ `minProminenceDb` (10 dB) above the median PSD, (2) has a peak amplitude ≥
 * `huntingAmplitudeRatio` (3) times the RMS of everything else, (3) completes ≥ 3 cycles in the
 * longest stretch and keeps its amplitude in both halves of it (ratio ≥ 0.5), with (4) at least
 * 4 averaged periodograms behind the PSD. White noise never passes (2): a noise peak holds a
 * few bins' worth of the variance.
 *
 * Returns null when no segment is usable. Never throws on data.
 */
export function analyzeJitter(
  t: ArrayLike<number>,
  deg: ArrayLike<number>,
  segments: readonly MotionSegment[],
  opts: JitterOptions = {},
): JitterResult | null {
  const minPoints = opts.minSegmentPoints ?? 32;
  const finiteCount = (s: MotionSegment): number => {
    let c = 0;
    for (let i = s.startIndex; i < s.endIndex; i++) if (Number.isFinite(deg[i]!) && Number.isFinite(t[i]!)) c++;
    return c;
  };
  let source: 'stationary' | 'ramp' = 'stationary';
  let used = segments.filter((s) => s.kind === 'stationary' && finiteCount(s) >= minPoints);
  if (used.length === 0) {
    source = 'ramp';
    used = segments.filter((s) => s.kind === 'ramp' && finiteCount(s) >= minPoints);
  }
  if (used.length === 0) return null;
  const intervalS = medianIntervalS(t);
  if (!(intervalS > 0)) return null;
  const fsHz = 1 / intervalS;

  // Residuals (arcmin) per segment, NaN kept for now.
  const records: Float64Array[] = [];
  const recordTimes: Float64Array[] = [];
  let sum2 = 0;
  let count = 0;
  let lo = Infinity;
  let hi = -Infinity;
  let durationS = 0;
  for (const s of used) {
    const r = detrendSegmentArcmin(t, deg, s.startIndex, s.endIndex);
    for (const v of r.values) {
      if (!Number.isFinite(v)) continue;
      sum2 += v * v;
      count++;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    durationS += r.durationS;
    const bridged = bridgeNaN(r.values, r.times);
    if (bridged) {
      records.push(bridged.values);
      recordTimes.push(bridged.times);
    }
  }
  if (count === 0) return null;
  const variance = sum2 / count;
  const rmsArcmin = Math.sqrt(variance);
  const ppArcmin = hi - lo;

  const base = {
    rmsArcmin,
    ppArcmin,
    source,
    segmentsUsed: used.length,
    samples: count,
    durationS,
  };
  const lengths = records.map((r) => r.length);
  const segLen = chooseSegmentLength(lengths);
  if (segLen === null) {
    return { ...base, dominantHz: [], tones: [], bandRmsArcmin: null, noiseFloorArcmin2PerHz: null, welchSegments: 0, welchSegmentLength: 0, hunting: null };
  }
  const psd = welchPsdOfRecords(records, fsHz, { segmentLength: segLen });
  const floor = medianOf(psd.density, 2);
  let total = 0;
  for (let k = 0; k < psd.density.length; k++) total += psd.density[k]!;
  const bandRms = Math.sqrt(total * psd.binHz);

  const peaks = findSpectralPeaks(psd.fHz, psd.density, {
    minProminenceDb: opts.minProminenceDb ?? 10,
    maxPeaks: opts.maxTones ?? 5,
  });
  // Refine each tone on the longest stretch, strongest first: Grandke-interpolated FFT within
  // ±1.5 Welch bins of the peak, then the IEEE 1057 four-parameter fit; the fitted sinusoid is
  // subtracted before the next tone is fitted. Falls back to the PSD figures when a fit fails.
  let longest = 0;
  for (let i = 1; i < records.length; i++) if (records[i]!.length > records[longest]!.length) longest = i;
  const work = records[longest]!.slice();
  const tones: JitterTone[] = [];
  for (const p of peaks) {
    let power = 0;
    for (let k = Math.max(0, p.bin - 3); k <= Math.min(psd.density.length - 1, p.bin + 3); k++) {
      power += Math.max(0, psd.density[k]! - floor) * psd.binHz;
    }
    let tone: JitterTone = { frequencyHz: p.frequencyHz, amplitudeArcmin: Math.sqrt(2 * power), prominenceDb: p.prominenceDb };
    const refined = refineTone(work, fsHz, p.frequencyHz, psd.binHz);
    if (refined) {
      tone = { frequencyHz: refined.frequencyHz, amplitudeArcmin: refined.amplitude, prominenceDb: p.prominenceDb };
      const w = 2 * Math.PI * refined.frequencyHz;
      for (let i = 0; i < work.length; i++) {
        const ti = i / fsHz;
        work[i] -= refined.a * Math.cos(w * ti) + refined.b * Math.sin(w * ti);
      }
    }
    // A "tone" more than 60 dB below the jitter's total power is window leakage of a stronger
    // one on a noise-free record, not a feature of the data (common practice, no source).
    if ((tone.amplitudeArcmin * tone.amplitudeArcmin) / 2 >= 1e-6 * variance) tones.push(tone);
  }

  // Hunting rule.
  let hunting: HuntingTone | null = null;
  if (psd.segments >= 4) {
    const rec = records[longest]!;
    const times = recordTimes[longest]!;
    const spanS = times[times.length - 1]! - times[0]!;
    const ratioNeeded = opts.huntingAmplitudeRatio ?? 3;
    const sustainedNeeded = opts.huntingSustainedRatio ?? 0.5;
    for (const tone of tones) {
      const rest = Math.sqrt(Math.max(0, variance - (tone.amplitudeArcmin * tone.amplitudeArcmin) / 2));
      if (!(tone.amplitudeArcmin >= ratioNeeded * rest)) continue;
      const cycles = spanS * tone.frequencyHz;
      if (!(cycles >= 3)) continue;
      const mid = rec.length >> 1;
      const a1 = toneAmplitude(rec, fsHz, 0, mid, tone.frequencyHz);
      const a2 = toneAmplitude(rec, fsHz, mid, rec.length, tone.frequencyHz);
      const sustained = Math.min(a1, a2) / Math.max(a1, a2);
      if (!(sustained >= sustainedNeeded)) continue;
      hunting = { ...tone, restRmsArcmin: rest, sustainedRatio: sustained, cycles };
      break;
    }
  }

  return {
    ...base,
    dominantHz: tones.map((x) => x.frequencyHz),
    tones,
    psd: { fHz: psd.fHz, arcmin2PerHz: psd.density },
    bandRmsArcmin: bandRms,
    noiseFloorArcmin2PerHz: floor,
    welchSegments: psd.segments,
    welchSegmentLength: psd.segmentLength,
    hunting,
  };
}

/**
 * The `hunting` finding (design vocabulary) for a tone found by {@link analyzeJitter}, worded for
 * the records it was found on (at rest, or turning at a steady speed).
 */
export function huntingFinding(h: HuntingTone, roles: readonly string[] = [], source: JitterResult['source'] = 'stationary'): Finding {
  const expected = source === 'ramp' ? 'turn at a steady speed' : 'be at rest';
  return finding(
    'hunting',
    'warning',
    `The angle oscillates at ${h.frequencyHz.toFixed(2)} Hz with ${h.amplitudeArcmin.toFixed(2)}′ peak amplitude while the shaft should ${expected} (${h.prominenceDb.toFixed(0)} dB above the noise floor, sustained over ${Math.floor(h.cycles)} cycles).`,
    {
      advice:
        'A receiver that oscillates about its commanded angle is hunting: check its damper (electrical or inertia damper), the load and the servo loop gain.',
      roles,
      figures: {
        frequencyHz: h.frequencyHz,
        amplitudeArcmin: h.amplitudeArcmin,
        prominenceDb: h.prominenceDb,
        restRmsArcmin: h.restRmsArcmin,
        sustainedRatio: h.sustainedRatio,
      },
    },
  );
}

/**
 * Welch segment length for records of the given lengths: the largest power of two
 * (16 … 65 536) that yields ≥ 4 half-overlapped segments over all records (resolution first:
 * hunting sits at a few hertz; four averages already put a 10 dB noise excursion below 1e-6 per
 * bin), failing that the one with the most segments. Null when the longest record is shorter
 * than 16 points.
 */
function chooseSegmentLength(lengths: readonly number[]): number | null {
  const longest = lengths.reduce((a, b) => Math.max(a, b), 0);
  if (longest < 16) return null;
  let best: { len: number; count: number } | null = null;
  for (let len = 65536; len >= 16; len /= 2) {
    if (len > longest) continue;
    let count = 0;
    for (const l of lengths) if (l >= len) count += Math.floor((l - len / 2) / (len / 2));
    if (count >= 4) return len;
    if (!best || count > best.count) best = { len, count };
  }
  return best ? best.len : null;
}
