import { estimateToneFrequency } from '../dsp/estimateToneFrequency.js';
import { fitSine3, fitSine4 } from '../dsp/sineFit.js';

/**
 * Tone refinement for the jitter analysis: frequency and amplitude of a spectral peak from the
 * record itself, and the amplitude of a known-frequency tone over part of a record.
 */

/**
 * Frequency and amplitude of the tone near `nearHz` in `x` (uniform rate `fsHz`): Grandke
 * estimate searched within ±1.5 Welch bins, then `fitSine4` from it; null unless the fit
 * converges within one record bin of the start.
 */
export function refineTone(x: Float64Array, fsHz: number, nearHz: number, welchBinHz: number): { frequencyHz: number; amplitude: number; a: number; b: number } | null {
  if (x.length < 16) return null;
  const coarse = estimateToneFrequency(x, fsHz, { minHz: Math.max(0, nearHz - 1.5 * welchBinHz), maxHz: nearHz + 1.5 * welchBinHz });
  if (!coarse || !(coarse.frequencyHz > 0 && coarse.frequencyHz < fsHz / 2)) return null;
  const fit = fitSine4(x, fsHz, coarse.frequencyHz);
  if (!fit.converged || !(Math.abs(fit.frequencyHz - coarse.frequencyHz) <= fsHz / x.length)) return null;
  return { frequencyHz: fit.frequencyHz, amplitude: fit.amplitude, a: fit.a, b: fit.b };
}

/**
 * Peak amplitude of the three-parameter least-squares sinusoid at `frequencyHz` (IEEE Std 1057)
 * over x[start, end) of a uniformly sampled record; 0 when the fit is singular.
 */
export function toneAmplitude(x: Float64Array, fsHz: number, start: number, end: number, frequencyHz: number): number {
  if (end - start < 4) return 0;
  const fit = fitSine3(x, fsHz, frequencyHz, start, end - start);
  return fit.converged && Number.isFinite(fit.amplitude) ? fit.amplitude : 0;
}
