import { isFftSize, largestFftSizeAtMost, realFftMagnitudeSquared } from '../dsp/fftPlan.js';
import { hannWindow, windowGains } from '../dsp/windows.js';

/** Options of {@link welchPsd}. */
export interface WelchOptions {
  /** Segment length in points, a power of two ≥ 8 (default: {@link defaultWelchSegmentLength}). */
  readonly segmentLength?: number;
  /** Overlap between successive segments, points, 0 ≤ overlap < segmentLength (default half). */
  readonly overlap?: number;
  /** Per-segment detrending before the window (default 'linear'). */
  readonly detrend?: 'linear' | 'constant' | 'none';
}

/** A one-sided power spectral density. */
export interface WelchPsd {
  /** Bin frequencies k·fs/L, k = 0 … L/2, Hz. */
  readonly fHz: Float64Array;
  /** One-sided density, (input unit)² per Hz. */
  readonly density: Float64Array;
  /** Segment length L, points. */
  readonly segmentLength: number;
  readonly overlap: number;
  /** Number of periodograms averaged. */
  readonly segments: number;
  /** Bin spacing fs/L, Hz. */
  readonly binHz: number;
  /** Equivalent noise bandwidth of one bin, fs·Σw²/(Σw)², Hz. */
  readonly enbwHz: number;
}

/**
 * Default Welch segment length for a record of `n` points: the largest power of two ≤ n/4
 * (so that about seven 50 %-overlapped segments are averaged), between 8 and 65 536; for
 * 8 ≤ n < 32 the largest power of two ≤ n. Null when n < 8.
 */
export function defaultWelchSegmentLength(n: number): number | null {
  if (!(n >= 8)) return null;
  const target = n >= 32 ? n / 4 : n;
  return Math.min(65536, largestFftSizeAtMost(target));
}

/**
 * Power spectral density by Welch's method (P. D. Welch, "The use of fast Fourier transform for
 * the estimation of power spectra: a method based on time averaging over short, modified
 * periodograms", IEEE Trans. Audio Electroacoust. AU-15(2):70–73, 1967): segments of L points
 * starting every L − overlap points (trailing points that do not fill a segment are dropped),
 * each detrended (least-squares line by default), multiplied by the periodic Hann window w
 * (Harris 1978), transformed, and |X_k|²/(fs·Σw²) averaged over segments; bins 1 … L/2 − 1 are
 * doubled for the one-sided density, DC and Nyquist are not. This is the definition
 * scipy.signal.welch(x, fs, window='hann', nperseg=L, noverlap=overlap, detrend='linear',
 * scaling='density') computes, and ∫ density df equals the variance of a white record.
 *
 * For an angle trace produced one point per carrier cycle, the spectrum is the angle's spectrum
 * as seen through the demodulator (a one-cycle boxcar, |H(f)| = |sinc(f/fc)|, −3.9 dB at the
 * fc/2 Nyquist frequency); the demodulator response is not divided out.
 *
 * `x` must be finite (NaN would spread to every bin); a record shorter than the segment length
 * uses the largest power of two that fits. Throws RangeError for a bad rate, bad options,
 * non-finite samples or fewer than 8 points.
 */
export function welchPsd(x: ArrayLike<number>, fsHz: number, opts: WelchOptions = {}): WelchPsd {
  return welchPsdOfRecords([x], fsHz, opts);
}

/**
 * Welch PSD pooled over several records of the same rate (e.g. the stationary stretches of one
 * trace): the periodograms of all segments of all records are averaged together, exactly as if
 * each record were analysed by {@link welchPsd} and the results averaged with weights equal to
 * their segment counts. Records shorter than the segment length contribute nothing; the default
 * segment length is {@link defaultWelchSegmentLength} of the longest record.
 */
export function welchPsdOfRecords(records: readonly ArrayLike<number>[], fsHz: number, opts: WelchOptions = {}): WelchPsd {
  if (!(fsHz > 0) || !Number.isFinite(fsHz)) throw new RangeError(`welchPsd: fsHz must be a positive number, got ${fsHz}`);
  let longest = 0;
  for (const r of records) {
    longest = Math.max(longest, r.length);
    for (let i = 0; i < r.length; i++) if (!Number.isFinite(r[i]!)) throw new RangeError(`welchPsd: sample ${i} is not finite`);
  }
  if (longest < 8) throw new RangeError(`welchPsd: need at least 8 points, got ${longest}`);
  let len = opts.segmentLength ?? defaultWelchSegmentLength(longest)!;
  if (!isFftSize(len) || len < 8) throw new RangeError(`welchPsd: segmentLength must be a power of two >= 8, got ${len}`);
  const shortened = len > longest;
  if (shortened) len = largestFftSizeAtMost(longest);
  // A shortened segment keeps the default half overlap (the requested one may no longer fit).
  const overlap = shortened ? len / 2 : (opts.overlap ?? len / 2);
  if (!Number.isInteger(overlap) || overlap < 0 || overlap >= len) {
    throw new RangeError(`welchPsd: overlap must be an integer in [0, ${len}), got ${overlap}`);
  }
  const detrend = opts.detrend ?? 'linear';
  const w = hannWindow(len);
  const gains = windowGains(w);
  const step = len - overlap;
  const half = len / 2;
  const acc = new Float64Array(half + 1);
  const seg = new Float64Array(len);
  const mag = new Float64Array(half + 1);
  let count = 0;
  // Centred index coordinate for the per-segment line fit: Σ(i − c) = 0, Σ(i − c)² = L(L²−1)/12.
  const c = (len - 1) / 2;
  const sii = (len * (len * len - 1)) / 12;
  for (const r of records) {
    for (let s = 0; s + len <= r.length; s += step) {
      let mean = 0;
      for (let i = 0; i < len; i++) mean += r[s + i]!;
      mean /= len;
      let slope = 0;
      if (detrend === 'linear') {
        let sxi = 0;
        for (let i = 0; i < len; i++) sxi += (i - c) * (r[s + i]! - mean);
        slope = sxi / sii;
      }
      const m0 = detrend === 'none' ? 0 : mean;
      for (let i = 0; i < len; i++) seg[i] = (r[s + i]! - m0 - slope * (i - c)) * w[i]!;
      realFftMagnitudeSquared(seg, mag);
      for (let k = 0; k <= half; k++) acc[k] += mag[k]!;
      count++;
    }
  }
  const scale = 1 / (fsHz * gains.sumOfSquares * Math.max(count, 1));
  const density = new Float64Array(half + 1);
  const fHz = new Float64Array(half + 1);
  for (let k = 0; k <= half; k++) {
    density[k] = acc[k]! * scale * (k === 0 || k === half ? 1 : 2);
    fHz[k] = (k * fsHz) / len;
  }
  return {
    fHz,
    density,
    segmentLength: len,
    overlap,
    segments: count,
    binHz: fsHz / len,
    enbwHz: (fsHz * gains.sumOfSquares) / (gains.sum * gains.sum),
  };
}
