import { medianOf } from './robustStats.js';

/** One peak of a power spectral density. */
export interface SpectralPeak {
  /** Interpolated peak frequency, Hz. */
  readonly frequencyHz: number;
  /** Index of the local-maximum bin. */
  readonly bin: number;
  /** Interpolated peak density, (unit)²/Hz. */
  readonly density: number;
  /** Peak density over the median density of the spectrum (bins ≥ minBin), dB. */
  readonly prominenceDb: number;
}

/** Options of {@link findSpectralPeaks}. */
export interface SpectralPeakOptions {
  /** Lowest bin a peak may sit in (default 2: bins 0–1 are shaped by the per-segment detrend). */
  readonly minBin?: number;
  /** Keep peaks at least this far above the median density, dB (default 10). */
  readonly minProminenceDb?: number;
  /** A peak within this many bins of a stronger one is not reported (default 3: the Hann main lobe is ±2 bins). */
  readonly minSeparationBins?: number;
  /** At most this many peaks, strongest first (default 8). */
  readonly maxPeaks?: number;
}

/**
 * Local maxima of a PSD, strongest first, with the frequency refined by fitting a parabola to
 * the logarithm of the three bins around each maximum: offset p = ½(α − γ)/(α − 2β + γ) bins
 * and peak ln P = β − ¼(α − γ)p, with α, β, γ the log densities of bins k−1, k, k+1 (quadratic
 * interpolation on a log spectrum, exact for a Gaussian-shaped peak; J. O. Smith, Spectral Audio
 * Signal Processing, 2011, "Quadratic Interpolation of Spectral Peaks", from memory). The
 * reference level for prominence is the median density (robust against the peaks themselves).
 * Only strict local maxima count (P_k > P_{k−1} and P_k ≥ P_{k+1}); the last bin never does.
 */
export function findSpectralPeaks(fHz: ArrayLike<number>, density: ArrayLike<number>, opts: SpectralPeakOptions = {}): SpectralPeak[] {
  const n = density.length;
  if (fHz.length !== n) throw new RangeError(`findSpectralPeaks: fHz and density lengths differ (${fHz.length} vs ${n})`);
  const minBin = Math.max(1, opts.minBin ?? 2);
  const minProm = opts.minProminenceDb ?? 10;
  const sep = opts.minSeparationBins ?? 3;
  const maxPeaks = opts.maxPeaks ?? 8;
  if (n < 3 || minBin >= n - 1) return [];
  const floor = medianOf(density, minBin, n);
  if (!(floor > 0)) return [];
  const binHz = n > 1 ? fHz[1]! - fHz[0]! : 0;
  const candidates: SpectralPeak[] = [];
  for (let k = minBin; k < n - 1; k++) {
    const b = density[k]!;
    if (!(b > density[k - 1]!) || !(b >= density[k + 1]!)) continue;
    const a = density[k - 1]!;
    const g = density[k + 1]!;
    let p = 0;
    let peak = b;
    if (a > 0 && g > 0) {
      const la = Math.log(a);
      const lb = Math.log(b);
      const lg = Math.log(g);
      const den = la - 2 * lb + lg;
      if (den < 0) {
        p = Math.max(-0.5, Math.min(0.5, (0.5 * (la - lg)) / den));
        peak = Math.exp(lb - 0.25 * (la - lg) * p);
      }
    }
    const prominenceDb = 10 * Math.log10(peak / floor);
    if (prominenceDb < minProm) continue;
    candidates.push({ frequencyHz: fHz[k]! + p * binHz, bin: k, density: peak, prominenceDb });
  }
  candidates.sort((x, y) => y.density - x.density);
  const out: SpectralPeak[] = [];
  for (const c of candidates) {
    if (out.length >= maxPeaks) break;
    if (out.some((o) => Math.abs(o.bin - c.bin) <= sep)) continue;
    out.push(c);
  }
  return out;
}
