import { largestFftSizeAtMost, realFftMagnitudeSquared } from './fftPlan.js';
import { checkSampleRate, resolveSampleRange } from './sampleRange.js';
import { hannWindow } from './windows.js';

/** Coarse single-tone estimate from an interpolated FFT. */
export interface ToneEstimate {
  /** (peakBin + binOffset)·fs/fftLength, Hz. */
  frequencyHz: number;
  /** Peak amplitude (signal units), corrected for the Hann coherent gain and scalloping. */
  amplitude: number;
  /** Fractional bin offset δ from the Grandke ratio, normally in [−0.5, 0.5]. */
  binOffset: number;
  /** Index of the largest |X_k|² in the searched band, in the FFT of `fftLength` points. */
  peakBin: number;
  /** FFT length used: the largest power of two ≤ the number of samples in the range. */
  fftLength: number;
}

/** Options of {@link estimateToneFrequency}. */
export interface EstimateToneOptions {
  /** Lower edge of the peak search, Hz (default: bin 2). */
  minHz?: number;
  /** Upper edge of the peak search, Hz (default: bin fftLength/2 − 2). */
  maxHz?: number;
  start?: number;
  length?: number;
}

/** Fewest samples accepted (an FFT of 16 points still leaves bins 2 … 6 to search). */
const MIN_SAMPLES = 16;

/**
 * Frequency of the strongest tone: periodic Hann window, FFT, and the Grandke ratio
 * interpolator, T. Grandke, "Interpolation algorithms for discrete Fourier transforms of
 * weighted signals", IEEE Trans. Instrum. Meas. 32(2):350–355, 1983 (pages from memory).
 *
 * With the larger neighbour X_{k±1} of the peak bin k and α = |X_{k±1}|/|X_k|, the offset is
 * δ = ±(2α − 1)/(α + 1). For a Hann window that spans the whole DFT this is exact for a
 * complex tone up to O(1/N²) (the kernel's main lobe ratio is (1 + δ)/(2 − δ)); on a real tone
 * the negative-frequency image adds a small bias (about 5e-5 bin at 10 cycles). Intended as
 * the start of `fitSine4` (its basin is about ±0.7 bin).
 *
 * The FFT uses the central fftLength samples of the range (the largest power of two ≤ length),
 * because zero padding would break the window-kernel shape the ratio formula assumes. The
 * mean of the finite samples is removed and non-finite samples are set to it. Bins 0, 1 and the
 * top two are never searched (DC and Nyquist leakage).
 *
 * Amplitude: A = 2|X_k|/Σw · (1 − δ²)·πδ/sin(πδ), the Hann kernel's scalloping loss undone
 * (Harris 1978, Hann kernel W(δ) ∝ sinc(δ)/(1 − δ²)).
 *
 * @returns undefined when there is no tone to find: fewer than 16 finite samples, a zero
 *   spectrum in the band (all-zero or constant input; a peak more than 240 dB below the
 *   record's rms counts as zero), or an empty band.
 */
export function estimateToneFrequency(x: ArrayLike<number>, sampleRateHz: number, opts: EstimateToneOptions = {}): ToneEstimate | undefined {
  checkSampleRate(sampleRateHz, 'estimateToneFrequency');
  const range = resolveSampleRange(x.length, opts.start, opts.length, 'estimateToneFrequency');
  if (opts.minHz !== undefined && !(opts.minHz >= 0)) throw new RangeError(`estimateToneFrequency: minHz must be >= 0`);
  if (opts.maxHz !== undefined && !(opts.maxHz >= 0)) throw new RangeError(`estimateToneFrequency: maxHz must be >= 0`);
  if (range.length < MIN_SAMPLES) return undefined;
  const m = largestFftSizeAtMost(range.length);
  const first = range.start + Math.floor((range.length - m) / 2);

  let sum = 0;
  let sumSq = 0;
  let used = 0;
  for (let i = 0; i < m; i++) {
    const v = +x[first + i];
    if (Number.isFinite(v)) {
      sum += v;
      sumSq += v * v;
      used++;
    }
  }
  if (used < MIN_SAMPLES) return undefined;
  const mean = sum / used;
  const w = hannWindow(m);
  const buf = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    const v = +x[first + i];
    buf[i] = Number.isFinite(v) ? (v - mean) * w[i] : 0;
  }
  const p = realFftMagnitudeSquared(buf);

  const binHz = sampleRateHz / m;
  const kLo = Math.max(2, opts.minHz !== undefined ? Math.ceil(opts.minHz / binHz) : 2);
  const kHi = Math.min(m / 2 - 2, opts.maxHz !== undefined ? Math.floor(opts.maxHz / binHz) : m / 2 - 2);
  if (kHi < kLo) return undefined;
  let k = kLo;
  for (let i = kLo + 1; i <= kHi; i++) if (p[i] > p[k]) k = i;
  if (!(p[k] > 0)) return undefined;

  const magK = Math.sqrt(p[k]);
  const up = p[k + 1] >= p[k - 1];
  const alpha = Math.sqrt(up ? p[k + 1] : p[k - 1]) / magK;
  const delta = ((up ? 1 : -1) * (2 * alpha - 1)) / (alpha + 1);

  // Hann Σw = m/2; scalloping correction of the Hann kernel at offset δ.
  const pd = Math.PI * delta;
  const sinc = Math.abs(delta) < 1e-12 ? 1 : Math.sin(pd) / pd;
  const amplitude = ((2 * magK) / (m / 2)) * ((1 - delta * delta) / sinc);
  // A "tone" 240 dB below the record's rms is rounding left by the mean removal (constant input).
  if (!(amplitude > 1e-12 * Math.sqrt(sumSq / used))) return undefined;
  return { frequencyHz: (k + delta) * binHz, amplitude, binOffset: delta, peakBin: k, fftLength: m };
}
