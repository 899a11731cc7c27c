/**
 * Periodic ("DFT-even") cosine-sum windows for spectral analysis, w[n] = Σ_k (−1)^k a_k cos(2πkn/N),
 * n = 0 … N−1, as defined by F. J. Harris, "On the use of windows for harmonic analysis with the
 * discrete Fourier transform", Proc. IEEE 66(1):51–83, 1978. Periodic windows (period N, not
 * N−1) are the ones whose DFT is exactly a few bins wide, which the interpolators and the
 * coherent-gain bookkeeping assume. Each cosine is evaluated directly from its argument.
 */

function cosineSum(n: number, coefficients: readonly number[], name: string): Float64Array {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${name}: n must be a non-negative integer, got ${n}`);
  const w = new Float64Array(n);
  // A one-sample window is the identity (scipy.signal.windows does the same).
  if (n === 1) {
    w[0] = 1;
    return w;
  }
  for (let i = 0; i < n; i++) {
    const x = (2 * Math.PI * i) / n;
    let v = 0;
    for (let k = 0; k < coefficients.length; k++) {
      const term = coefficients[k] * Math.cos(k * x);
      v += k % 2 === 0 ? term : -term;
    }
    w[i] = v;
  }
  return w;
}

/** Periodic Hann window, w[n] = ½ − ½cos(2πn/N) (Harris 1978). Coherent gain 0.5, NENBW 1.5 bins. */
export function hannWindow(n: number): Float64Array {
  return cosineSum(n, [0.5, 0.5], 'hannWindow');
}

/** Coefficients of the minimum 4-term Blackman–Harris window (Harris 1978, −92 dB sidelobes). */
export const BLACKMAN_HARRIS_4_COEFFICIENTS: readonly number[] = [0.35875, 0.48829, 0.14128, 0.01168];

/** Periodic 4-term Blackman–Harris window (Harris 1978). Coherent gain 0.359, NENBW 2.004 bins. */
export function blackmanHarris4Window(n: number): Float64Array {
  return cosineSum(n, BLACKMAN_HARRIS_4_COEFFICIENTS, 'blackmanHarris4Window');
}

/**
 * Coefficients of the 5-term flat-top window as defined by scipy.signal.windows.flattop
 * (the SciPy documentation cites D'Antona & Ferrero, "Digital Signal Processing for
 * Measurement Systems", Springer 2006, p. 70; citation from memory).
 */
export const FLAT_TOP_COEFFICIENTS: readonly number[] = [
  0.21557895, 0.41663158, 0.277263158, 0.083578947, 0.006947368,
];

/**
 * Periodic flat-top window with scipy.signal.windows.flattop's coefficients (the values of
 * `flattop(n, sym=False)`). Coherent gain 0.216, NENBW 3.770 bins; amplitude error within
 * ±½ bin about 0.01 dB, so peak bins read amplitudes directly.
 */
export function flatTopWindow(n: number): Float64Array {
  return cosineSum(n, FLAT_TOP_COEFFICIENTS, 'flatTopWindow');
}

/** Gain figures of a window (Harris 1978 §III; Heinzel, Rüdiger & Schilling 2002 §§10–11). */
export interface WindowGains {
  /** Σw / N: factor by which a bin-centred tone's peak magnitude shrinks (amplitude = 2|X_k| / Σw). */
  coherentGain: number;
  /** Normalised equivalent noise bandwidth N·Σw² / (Σw)², in bins. */
  nenbwBins: number;
  /** Σw. */
  sum: number;
  /** Σw². */
  sumOfSquares: number;
}

/** Coherent gain and NENBW of the window `w` (any length ≥ 1). */
export function windowGains(w: ArrayLike<number>): WindowGains {
  const n = w.length;
  if (n === 0) throw new RangeError('windowGains: empty window');
  let s1 = 0;
  let s2 = 0;
  for (let i = 0; i < n; i++) {
    s1 += w[i];
    s2 += w[i] * w[i];
  }
  return { coherentGain: s1 / n, nenbwBins: (n * s2) / (s1 * s1), sum: s1, sumOfSquares: s2 };
}
