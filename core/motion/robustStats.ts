/**
 * Small robust statistics used by the motion analysis: median, median absolute deviation and
 * the typical sample interval of a time axis. NaN values are skipped everywhere.
 */

import { selectKth } from '../dsp/selectKth.js';

/** Median of the finite values of `x[start, end)`; NaN when there are none. */
export function medianOf(x: ArrayLike<number>, start = 0, end = x.length): number {
  const lo = Math.max(0, start);
  const hi = Math.min(x.length, end);
  const v = new Float64Array(Math.max(0, hi - lo));
  let n = 0;
  for (let i = lo; i < hi; i++) {
    const xi = x[i]!;
    if (Number.isFinite(xi)) v[n++] = xi;
  }
  if (n === 0) return NaN;
  const s = v.subarray(0, n);
  const m = n >> 1;
  const upper = selectKth(s, m);
  if (n % 2 === 1) return upper;
  // After the selection every value before m is at most s[m]: the lower middle is their largest.
  let lower = -Infinity;
  for (let i = 0; i < m; i++) if (s[i]! > lower) lower = s[i]!;
  return 0.5 * (lower + upper);
}


/**
 * Scaled median absolute deviation, 1.4826 · median(|x − median x|): a consistent estimate of
 * the standard deviation for Gaussian data that ignores a minority of outliers (Hampel,
 * "The influence curve and its role in robust estimation", JASA 69, 1974; constant
 * 1/Φ⁻¹(3/4) = 1.4826). NaN when there are no finite values.
 */
export function scaledMadOf(x: ArrayLike<number>): number {
  const med = medianOf(x);
  if (!Number.isFinite(med)) return NaN;
  const d = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) d[i] = Math.abs(x[i]! - med);
  return 1.482602218505602 * medianOf(d);
}

/**
 * Typical spacing of a time axis in seconds: the median of the finite positive successive
 * differences (robust to a few dropped or repeated stamps). NaN when there is no such pair.
 */
export function medianIntervalS(t: ArrayLike<number>): number {
  const d: number[] = [];
  for (let i = 1; i < t.length; i++) {
    const v = t[i]! - t[i - 1]!;
    if (Number.isFinite(v) && v > 0) d.push(v);
  }
  return medianOf(d);
}
