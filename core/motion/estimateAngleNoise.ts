import { scaledMadOf } from './robustStats.js';

/**
 * Smallest angle noise this analysis assumes, degrees (0.006′), about the angle resolution of a
 * 16-bit digitiser on a full-scale signal. Keeps thresholds finite on noise-free synthetic
 * traces (common practice, no source).
 */
export const ANGLE_NOISE_FLOOR_DEG = 1e-4;

/**
 * White-noise level of an angle trace, degrees RMS per point, from the robust spread of its
 * second differences: d_i = θ_{i+1} − 2θ_i + θ_{i−1} has variance 6σ² for white noise, while a
 * ramp cancels exactly and smooth motion (steps, slow oscillation) contributes only
 * θ''·Δt², and the median ignores the few large differences at fast transitions. σ is the
 * scaled median absolute deviation of d divided by √6 (Hampel 1974 for the MAD; the 6σ² is the
 * variance of the filter [1, −2, 1] on white noise). Triples that touch a NaN are skipped; with
 * fewer than 5 finite triples the first differences are used instead (variance 2σ²). Returns
 * NaN when even fewer than 5 finite pairs exist; never less than {@link ANGLE_NOISE_FLOOR_DEG}
 * otherwise.
 */
export function estimateAngleNoiseDeg(deg: ArrayLike<number>): number {
  const d: number[] = [];
  for (let i = 1; i + 1 < deg.length; i++) {
    const v = deg[i + 1]! - 2 * deg[i]! + deg[i - 1]!;
    if (Number.isFinite(v)) d.push(v);
  }
  if (d.length >= 5) return Math.max(ANGLE_NOISE_FLOOR_DEG, scaledMadOf(d) / Math.sqrt(6));
  // Too many NaN points to find three finite in a row: first differences (variance 2σ²; the MAD
  // about their median also ignores a constant speed).
  const d1: number[] = [];
  for (let i = 1; i < deg.length; i++) {
    const v = deg[i]! - deg[i - 1]!;
    if (Number.isFinite(v)) d1.push(v);
  }
  if (d1.length < 5) return NaN;
  return Math.max(ANGLE_NOISE_FLOOR_DEG, scaledMadOf(d1) / Math.SQRT2);
}
