import FFT from 'fft.js';

/**
 * Real-input FFT on top of fft.js (indutny/fft.js 4.0.4, radix-4, float64, power-of-two sizes).
 *
 * Plan cache: an fft.js instance precomputes a twiddle table of 2·N doubles and a bit-reversal
 * table in its constructor, which costs about as much as one transform and, at N = 2^20, holds
 * about 16 MB. Analyses call the FFT over and over at a few sizes (one per segment length), so
 * plans are kept, but in a small least-recently-used cache of {@link MAX_CACHED_PLANS} entries:
 * an unbounded map keyed by size would pin tens of megabytes for sizes used once (a long
 * capture analysed a single time), and the renderer and workers run with modest heaps.
 * Plans are stateless between calls (fft.js keeps only scratch references during a call), so
 * sharing one per size is safe in single-threaded JavaScript.
 */
const MAX_CACHED_PLANS = 4;

const plans = new Map<number, FFT>();

/** True when `n` is an integer power of two, 2 or larger (the sizes fft.js accepts). */
export function isFftSize(n: number): boolean {
  return Number.isInteger(n) && n >= 2 && n <= 2 ** 30 && (n & (n - 1)) === 0;
}

/** Largest power of two ≤ `n` (n ≥ 2), the FFT length used for an n-sample record. */
export function largestFftSizeAtMost(n: number): number {
  if (!(n >= 2)) throw new RangeError(`largestFftSizeAtMost: n must be >= 2, got ${n}`);
  let p = 2;
  while (p * 2 <= n && p < 2 ** 30) p *= 2;
  return p;
}

/** The cached fft.js plan for `size` (a power of two), built on first use. */
export function getFftPlan(size: number): FFT {
  if (!isFftSize(size)) throw new RangeError(`FFT size must be a power of two >= 2, got ${size}`);
  let plan = plans.get(size);
  if (plan !== undefined) {
    // Refresh recency: Map iteration order is insertion order.
    plans.delete(size);
    plans.set(size, plan);
    return plan;
  }
  plan = new FFT(size);
  plans.set(size, plan);
  while (plans.size > MAX_CACHED_PLANS) {
    const oldest = plans.keys().next().value as number;
    plans.delete(oldest);
  }
  return plan;
}

/** Number of plans currently cached (for tests of the bound). */
export function cachedFftPlanCount(): number {
  return plans.size;
}

/**
 * Forward DFT of a real sequence, X_k = Σ_n x_n e^{−2πi kn/N}, bins k = 0 … N/2 (the same sign
 * convention and bin range as numpy.fft.rfft). Returns interleaved re/im, length N + 2.
 * `x.length` must be a power of two ≥ 2. `out`, when given, must have length ≥ 2N (fft.js
 * writes scratch into the upper half); the result occupies its first N + 2 entries.
 */
export function realFft(x: Float64Array, out?: Float64Array): Float64Array {
  const n = x.length;
  const plan = getFftPlan(n);
  const buf = out ?? new Float64Array(2 * n);
  if (buf.length < 2 * n) throw new RangeError(`realFft: out needs length >= ${2 * n}, got ${buf.length}`);
  plan.realTransform(buf, x);
  return buf.subarray(0, n + 2);
}

/**
 * |X_k|² for k = 0 … N/2 of the real input `x` (power-of-two length), as from {@link realFft}.
 * `out` (length ≥ N/2 + 1) is filled and returned when given.
 */
export function realFftMagnitudeSquared(x: Float64Array, out?: Float64Array): Float64Array {
  const n = x.length;
  const spec = realFft(x);
  const half = n / 2;
  const res = out ?? new Float64Array(half + 1);
  if (res.length < half + 1) throw new RangeError(`realFftMagnitudeSquared: out needs length >= ${half + 1}`);
  for (let k = 0; k <= half; k++) {
    const re = spec[2 * k];
    const im = spec[2 * k + 1];
    res[k] = re * re + im * im;
  }
  return res;
}
