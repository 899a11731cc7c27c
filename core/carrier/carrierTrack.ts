/**
 * The carrier's phase as a smooth function of the sample index: Φ(n) = Σ c_i·u^i with
 * u = (n − centreSample)/halfSpanSamples, so the excitation is ≈ A·sin Φ(n).
 *
 * A low-order polynomial in a centred, scaled variable is well conditioned and exact to
 * evaluate (no running phase accumulator; see IEEE Std 1057 fitting pitfalls). Degree 1 is a
 * constant frequency; higher degrees follow slow drift.
 */
export interface CarrierTrack {
  readonly sampleRateHz: number;
  readonly centreSample: number;
  readonly halfSpanSamples: number;
  /** Polynomial coefficients in radians, lowest order first. */
  readonly coefficients: readonly number[];
}

/** Carrier phase Φ(n) in radians at (fractional) sample index n. */
export function carrierPhaseAt(track: CarrierTrack, n: number): number {
  const u = (n - track.centreSample) / track.halfSpanSamples;
  const c = track.coefficients;
  let value = 0;
  for (let i = c.length - 1; i >= 0; i--) value = value * u + c[i]!;
  return value;
}

/** Instantaneous carrier frequency in rad/sample at sample index n (dΦ/dn). */
export function carrierRadPerSampleAt(track: CarrierTrack, n: number): number {
  const u = (n - track.centreSample) / track.halfSpanSamples;
  const c = track.coefficients;
  let value = 0;
  for (let i = c.length - 1; i >= 1; i--) value = value * u + i * c[i]!;
  return value / track.halfSpanSamples;
}

/** Instantaneous carrier frequency in hertz at sample index n. */
export function carrierFrequencyHzAt(track: CarrierTrack, n: number): number {
  return (carrierRadPerSampleAt(track, n) * track.sampleRateHz) / (2 * Math.PI);
}

/** A constant-frequency track: Φ(n) = phase0Rad + 2π·frequencyHz·n/sampleRateHz. */
export function constantCarrierTrack(
  sampleRateHz: number,
  frequencyHz: number,
  phase0Rad: number,
  sampleCount: number,
): CarrierTrack {
  const centre = (sampleCount - 1) / 2;
  const half = Math.max(centre, 1);
  const w = (2 * Math.PI * frequencyHz) / sampleRateHz;
  return {
    sampleRateHz,
    centreSample: centre,
    halfSpanSamples: half,
    coefficients: [phase0Rad + w * centre, w * half],
  };
}
