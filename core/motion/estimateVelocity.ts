import { medianIntervalS } from './robustStats.js';

/** Options of {@link estimateVelocity}. */
export interface VelocityOptions {
  /** Window length in points (odd integer ≥ 3). Overrides `windowS`. */
  readonly points?: number;
  /** Window length in seconds; rounded to the nearest odd number of points (at least 3). Default 0.02 s. */
  readonly windowS?: number;
}

/** Default smoothing window of {@link estimateVelocity}, seconds. */
export const DEFAULT_VELOCITY_WINDOW_S = 0.02;

/**
 * Odd window length in points for a window of `windowS` seconds at spacing `intervalS`
 * (at least 3 points).
 */
export function velocityWindowPoints(windowS: number, intervalS: number): number {
  if (!(windowS > 0) || !(intervalS > 0)) return 3;
  const half = Math.round(windowS / intervalS / 2);
  return Math.max(3, 2 * half + 1);
}

/**
 * Angular velocity of an angle trace, degrees per second: at every point, the slope of the
 * least-squares straight line through the M points centred on it. For uniform spacing this is
 * the first-derivative Savitzky–Golay filter of polynomial order 1 or 2 (A. Savitzky,
 * M. J. E. Golay, "Smoothing and differentiation of data by simplified least squares
 * procedures", Analytical Chemistry 36(8):1627–1639, 1964); its noise variance is
 * 12σ²/(Δt²·M(M² − 1)) for white angle noise σ (the variance of a least-squares slope). The
 * actual time stamps are used, so slightly uneven spacing is handled exactly.
 *
 * Edges: the first and last M/2 points use the first (last) full window, i.e. the slope of
 * the nearest full-length fit (a line's slope is the same everywhere in its window).
 * NaN angles are skipped inside a window; a window with fewer than max(2, ⌈M/2⌉) finite
 * points gives NaN. Records shorter than M use one window over the whole record.
 *
 * Computation: the five sums of the fit slide along the record (O(N)); they are rebuilt from
 * scratch every M steps around a local origin, so rounding cannot accumulate.
 *
 * @param t   time of each point, s
 * @param deg angle of each point, degrees (unwrapped)
 * @returns   velocity of each point, degrees per second
 */
export function estimateVelocity(t: ArrayLike<number>, deg: ArrayLike<number>, opts: VelocityOptions = {}): Float64Array {
  if (t.length !== deg.length) throw new RangeError(`estimateVelocity: t and deg lengths differ (${t.length} vs ${deg.length})`);
  const n = deg.length;
  const out = new Float64Array(n).fill(NaN);
  let m: number;
  if (opts.points !== undefined) {
    if (!Number.isInteger(opts.points) || opts.points < 3 || opts.points % 2 === 0) {
      throw new RangeError(`estimateVelocity: points must be an odd integer >= 3, got ${opts.points}`);
    }
    m = opts.points;
  } else {
    const windowS = opts.windowS ?? DEFAULT_VELOCITY_WINDOW_S;
    if (!(windowS > 0)) throw new RangeError(`estimateVelocity: windowS must be > 0, got ${windowS}`);
    m = velocityWindowPoints(windowS, medianIntervalS(t));
  }
  if (n < 2) return out;
  if (m > n) m = n;
  const need = Math.max(2, Math.ceil(m / 2));

  // Sliding sums over the window [lo, lo + m) in coordinates relative to (ta, xa).
  let ta = 0;
  let xa = 0;
  let c = 0;
  let s1 = 0;
  let sx = 0;
  let stt = 0;
  let stx = 0;
  const add = (i: number, sign: number): void => {
    const ti = t[i]!;
    const xi = deg[i]!;
    if (!Number.isFinite(ti) || !Number.isFinite(xi)) return;
    const u = ti - ta;
    const v = xi - xa;
    c += sign;
    s1 += sign * u;
    sx += sign * v;
    stt += sign * u * u;
    stx += sign * u * v;
  };
  const rebuild = (lo: number): void => {
    ta = t[lo]!;
    xa = NaN;
    for (let i = lo; i < lo + m && !Number.isFinite(xa); i++) if (Number.isFinite(deg[i]!) && Number.isFinite(t[i]!)) xa = deg[i]!;
    if (!Number.isFinite(ta)) {
      for (let i = lo; i < lo + m; i++) if (Number.isFinite(t[i]!)) { ta = t[i]!; break; }
    }
    if (!Number.isFinite(xa)) xa = 0;
    if (!Number.isFinite(ta)) ta = 0;
    c = 0;
    s1 = 0;
    sx = 0;
    stt = 0;
    stx = 0;
    for (let i = lo; i < lo + m; i++) add(i, 1);
  };
  const slope = (): number => {
    if (c < need) return NaN;
    const den = c * stt - s1 * s1;
    return den > 0 ? (c * stx - s1 * sx) / den : NaN;
  };

  const h = (m - 1) >> 1;
  const lastLo = n - m;
  const slopes = new Float64Array(lastLo + 1);
  for (let lo = 0; lo <= lastLo; lo++) {
    if (lo % m === 0) {
      rebuild(lo);
    } else {
      add(lo - 1, -1);
      add(lo + m - 1, 1);
    }
    slopes[lo] = slope();
  }
  for (let i = 0; i < n; i++) {
    const lo = Math.min(Math.max(i - h, 0), lastLo);
    out[i] = slopes[lo]!;
  }
  return out;
}
