/**
 * Least-squares straight line deg ≈ a + b·(t − t̄) over `[start, end)` of a trace, skipping
 * samples whose time or value is NaN (ordinary least squares, e.g. Press et al., Numerical
 * Recipes 3rd ed., ch. 15; from memory). Coordinates are centred on the mean time and value
 * first, so long records and large angles keep full precision.
 */
export interface LineFit {
  /** Number of finite points used. */
  readonly count: number;
  /** Mean time of the points used, s. */
  readonly meanT: number;
  /** Mean value of the points used (the line's value at `meanT`), degrees. */
  readonly meanDeg: number;
  /** Slope, degrees per second (0 when fewer than two distinct times). */
  readonly degPerS: number;
  /** RMS of the residual about the line, degrees (NaN when count = 0). */
  readonly residualRmsDeg: number;
}

export function fitLine(t: ArrayLike<number>, deg: ArrayLike<number>, start = 0, end = deg.length): LineFit {
  const lo = Math.max(0, start);
  const hi = Math.min(deg.length, t.length, end);
  let n = 0;
  let st = 0;
  let sx = 0;
  for (let i = lo; i < hi; i++) {
    const ti = t[i]!;
    const xi = deg[i]!;
    if (!Number.isFinite(ti) || !Number.isFinite(xi)) continue;
    n++;
    st += ti;
    sx += xi;
  }
  if (n === 0) return { count: 0, meanT: NaN, meanDeg: NaN, degPerS: NaN, residualRmsDeg: NaN };
  const mt = st / n;
  const mx = sx / n;
  let stt = 0;
  let stx = 0;
  for (let i = lo; i < hi; i++) {
    const ti = t[i]!;
    const xi = deg[i]!;
    if (!Number.isFinite(ti) || !Number.isFinite(xi)) continue;
    const dt = ti - mt;
    const dx = xi - mx;
    stt += dt * dt;
    stx += dt * dx;
  }
  const slope = stt > 0 ? stx / stt : 0;
  // Residual from a third pass: sxx − slope·stx cancels badly on long, steep ramps.
  let ss = 0;
  for (let i = lo; i < hi; i++) {
    const ti = t[i]!;
    const xi = deg[i]!;
    if (!Number.isFinite(ti) || !Number.isFinite(xi)) continue;
    const r = xi - mx - slope * (ti - mt);
    ss += r * r;
  }
  return { count: n, meanT: mt, meanDeg: mx, degPerS: slope, residualRmsDeg: Math.sqrt(ss / n) };
}
