/**
 * Cramér–Rao lower bounds for a real sinusoid A·cos(ωn + φ) + white Gaussian noise of variance
 * σ², with amplitude, frequency and phase unknown: S. M. Kay, "Fundamentals of Statistical
 * Signal Processing: Estimation Theory", Prentice Hall 1993, ch. 3 (real-sinusoid example,
 * large-N forms); cf. D. C. Rife & R. R. Boorstyn, IEEE Trans. Inf. Theory 20(5), 1974 for the
 * complex tone. They hold above the SNR threshold; below it the estimator's outliers dominate.
 */
export interface ToneBounds {
  /** Lower bound on var(f̂), Hz². */
  frequencyHz2: number;
  /** Lower bound on var(φ̂) with φ referred to the first sample, rad². */
  phaseAtStartRad2: number;
  /** Lower bound on var(φ̂) with φ referred to the record centre, rad² (≈ 1/(ηN)). */
  phaseAtCentreRad2: number;
  /** Lower bound on var(Â), signal units² (2σ²/N). */
  amplitude2: number;
}

/**
 * @param samples record length N (≥ 2)
 * @param snr η = A²/(2σ²), linear (not dB)
 * @param sampleRateHz fs
 * @param amplitude A (only needed for the amplitude bound; default 1)
 */
export function toneCramerRaoBounds(samples: number, snr: number, sampleRateHz: number, amplitude = 1): ToneBounds {
  if (!(samples >= 2) || !(snr > 0) || !(sampleRateHz > 0)) {
    throw new RangeError(`toneCramerRaoBounds: need samples >= 2, snr > 0, sampleRateHz > 0`);
  }
  const n = samples;
  const sigma2 = (amplitude * amplitude) / (2 * snr);
  return {
    frequencyHz2: (12 / ((2 * Math.PI) ** 2 * snr * n * (n * n - 1))) * sampleRateHz * sampleRateHz,
    phaseAtStartRad2: (2 * (2 * n - 1)) / (snr * n * (n + 1)),
    phaseAtCentreRad2: 1 / (snr * n),
    amplitude2: (2 * sigma2) / n,
  };
}
