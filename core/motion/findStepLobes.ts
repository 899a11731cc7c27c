/**
 * Helpers of the step measurement: the alternating lobes of a normalised step response about
 * its final level, their refined extremes, and the damped frequency they imply.
 */

/** One lobe of the response about its final level. */
export interface Lobe {
  readonly index: number;
  /** Signed extreme of y − 1 (units of the step). */
  readonly value: number;
  readonly tS: number;
}

/**
 * Damped angular frequency ωd from the lobe extremes, which sit at t0 + kπ/ωd (k = 1, 2, …) for
 * a second-order step: with a known t0, the weighted least-squares slope through the origin of
 * (t_k − t0) against k; without, the weighted slope with an intercept (≥ 2 lobes) or π/(t₁ − t_dep)
 * (one lobe). Weights a_k²: a lobe's timing error scales as noise/(a_k ωd²). NaN without lobes.
 */
export function dampedOmega(lobes: readonly Lobe[], t0: number | null, tDep: number): number {
  if (lobes.length === 0) return NaN;
  if (t0 !== null) {
    let num = 0;
    let den = 0;
    lobes.forEach((l, i) => {
      const wk = l.value * l.value;
      num += wk * (i + 1) * (l.tS - t0);
      den += wk * (i + 1) * (i + 1);
    });
    return num > 0 ? (Math.PI * den) / num : NaN;
  }
  if (lobes.length === 1) return Math.PI / (lobes[0]!.tS - tDep);
  let sw = 0, sk = 0, st = 0, skk = 0, skt = 0;
  lobes.forEach((l, i) => {
    const wk = l.value * l.value;
    sw += wk; sk += wk * i; st += wk * l.tS; skk += wk * i * i; skt += wk * i * l.tS;
  });
  const half = (sw * skt - sk * st) / (sw * skk - sk * sk);
  return half > 0 ? Math.PI / half : NaN;
}

/**
 * Alternating lobes of y − 1 from `start` (where y is still below 1): a lobe begins when y − 1
 * passes +hyst (after a negative lobe or the approach) or −hyst (after a positive one), and
 * its extreme point is kept. The approach before the first positive lobe is not a lobe.
 */
export function findLobes(t: ArrayLike<number>, y: (i: number) => number, ok: (i: number) => boolean, start: number, end: number, hyst: number): Lobe[] {
  const lobes: Lobe[] = [];
  let sign = -1;
  let current: { index: number; value: number } | null = null;
  for (let i = start; i < end; i++) {
    if (!ok(i)) continue;
    const e = y(i) - 1;
    if ((sign < 0 && e > hyst) || (sign > 0 && e < -hyst)) {
      if (current) lobes.push({ index: current.index, value: current.value, tS: t[current.index]! });
      sign = -sign;
      current = { index: i, value: e };
    } else if (current && sign * e > sign * current.value) {
      current = { index: i, value: e };
    }
  }
  if (current) lobes.push({ index: current.index, value: current.value, tS: t[current.index]! });
  return lobes;
}

/**
 * Vertex of the least-squares parabola through the points around `index` whose |y − 1| is at
 * least 80 % of the sample extreme (at least the neighbours on each side).
 */
export function refinePeak(
  t: ArrayLike<number>,
  y: (i: number) => number,
  ok: (i: number) => boolean,
  index: number,
  start: number,
  end: number,
): { tS: number; value: number } {
  const peak = y(index) - 1;
  const keep = (i: number): boolean => ok(i) && (y(i) - 1) * Math.sign(peak) >= 0.8 * Math.abs(peak);
  let a = index;
  let b = index;
  while (a - 1 >= start && keep(a - 1)) a--;
  while (b + 1 < end && keep(b + 1)) b++;
  if (a === index && index - 1 >= start) a = index - 1;
  if (b === index && index + 1 < end) b = index + 1;
  const tc = t[index]!;
  // Fit y = c0 + c1 u + c2 u², u = t − tc.
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, r0 = 0, r1 = 0, r2 = 0;
  for (let i = a; i <= b; i++) {
    if (!ok(i)) continue;
    const u = t[i]! - tc;
    const v = y(i);
    const u2 = u * u;
    s0 += 1; s1 += u; s2 += u2; s3 += u2 * u; s4 += u2 * u2;
    r0 += v; r1 += v * u; r2 += v * u2;
  }
  const raw = { tS: tc, value: y(index) };
  if (s0 < 3) return raw;
  // Solve the 3×3 normal equations by Cramer's rule (well conditioned in centred u).
  const det = (m: number[]): number =>
    m[0]! * (m[4]! * m[8]! - m[5]! * m[7]!) - m[1]! * (m[3]! * m[8]! - m[5]! * m[6]!) + m[2]! * (m[3]! * m[7]! - m[4]! * m[6]!);
  const M = [s0, s1, s2, s1, s2, s3, s2, s3, s4];
  const D = det(M);
  if (!(Math.abs(D) > 0)) return raw;
  const c0 = det([r0, s1, s2, r1, s2, s3, r2, s3, s4]) / D;
  const c1 = det([s0, r0, s2, s1, r1, s3, s2, r2, s4]) / D;
  const c2 = det([s0, s1, r0, s1, s2, r1, s2, s3, r2]) / D;
  if (!(c2 * Math.sign(peak) < 0)) return raw;
  const u = -c1 / (2 * c2);
  if (!(t[a]! - tc <= u && u <= t[b]! - tc)) return raw;
  return { tS: tc + u, value: c0 + c1 * u + c2 * u * u };
}
