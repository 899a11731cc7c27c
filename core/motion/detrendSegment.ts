/**
 * Residuals of trace segments for the jitter analysis: the segment less its fitted line, in
 * arc-minutes, and NaN gaps bridged for spectral analysis.
 */
const ARCMIN_PER_DEG = 60;

/**
 * Residual of a trace segment about its least-squares line in time, arc-minutes (NaN where the
 * input is NaN), with the time of each point and the span of the finite ones. Ordinary least
 * squares in centred coordinates (e.g. Press et al., Numerical Recipes 3rd ed., ch. 15; from memory).
 */
export function detrendSegmentArcmin(t: ArrayLike<number>, deg: ArrayLike<number>, start: number, end: number): { values: Float64Array; times: Float64Array; durationS: number } {
  let n = 0;
  let st = 0;
  let sx = 0;
  for (let i = start; i < end; i++) {
    if (!Number.isFinite(t[i]!) || !Number.isFinite(deg[i]!)) continue;
    n++;
    st += t[i]!;
    sx += deg[i]!;
  }
  const mt = st / n;
  const mx = sx / n;
  let stt = 0;
  let stx = 0;
  for (let i = start; i < end; i++) {
    if (!Number.isFinite(t[i]!) || !Number.isFinite(deg[i]!)) continue;
    const dt = t[i]! - mt;
    stt += dt * dt;
    stx += dt * (deg[i]! - mx);
  }
  const slope = stt > 0 ? stx / stt : 0;
  const values = new Float64Array(end - start);
  const times = new Float64Array(end - start);
  let first = Infinity;
  let last = -Infinity;
  for (let i = start; i < end; i++) {
    const ti = t[i]!;
    times[i - start] = ti;
    if (!Number.isFinite(ti) || !Number.isFinite(deg[i]!)) {
      values[i - start] = NaN;
      continue;
    }
    if (ti < first) first = ti;
    if (ti > last) last = ti;
    values[i - start] = (deg[i]! - mx - slope * (ti - mt)) * ARCMIN_PER_DEG;
  }
  return { values, times, durationS: last > first ? last - first : 0 };
}

/**
 * Drops leading and trailing NaN points and fills interior ones by linear interpolation in
 * index (the spacing is uniform); null when fewer than 2 finite points remain.
 */
export function bridgeNaN(values: Float64Array, times: Float64Array): { values: Float64Array; times: Float64Array } | null {
  let a = 0;
  let b = values.length - 1;
  while (a <= b && !(Number.isFinite(values[a]!) && Number.isFinite(times[a]!))) a++;
  while (b >= a && !(Number.isFinite(values[b]!) && Number.isFinite(times[b]!))) b--;
  if (b - a + 1 < 2) return null;
  const v = values.slice(a, b + 1);
  const tt = times.slice(a, b + 1);
  let prev = 0;
  for (let i = 1; i < v.length; i++) {
    if (Number.isFinite(v[i]!) && Number.isFinite(tt[i]!)) {
      if (i - prev > 1) {
        for (let j = prev + 1; j < i; j++) {
          const u = (j - prev) / (i - prev);
          v[j] = v[prev]! + u * (v[i]! - v[prev]!);
          tt[j] = tt[prev]! + u * (tt[i]! - tt[prev]!);
        }
      }
      prev = i;
    }
  }
  return { values: v, times: tt };
}
