import { solveSymmetric } from '../dsp/linearSolve.js';

/**
 * Heydemann correction of a quadrature signal pair.
 *
 * Method: P. L. M. Heydemann, "Determination and correction of quadrature fringe measurement
 * errors in interferometers", Applied Optics 20(19):3382–3384, 1981 (volume and pages from
 * memory). Model: u1 = x + p, u2 = (y·cos α − x·sin α)/r + q with (x, y) = R·(cos θ, sin θ):
 * offsets p, q, gain ratio r and phase error α. The conic A·u1² + B·u2² + C·u1·u2 + D·u1 +
 * E·u2 = 1 is fitted by linear least squares (5×5 normal equations, equilibrated Cholesky), and
 *   α = asin(C/√(4AB)),  r = √(B/A),
 *   p = (2BD − EC)/(C² − 4AB),  q = (2AE − DC)/(C² − 4AB)
 * (derived again here by completing the square). The "= 1" normalisation fails for a conic
 * through the origin, so the data are centred on their mean and scaled to unit RMS radius
 * first, and the offsets moved back afterwards.
 *
 * In the channel form of the sine/cosine plane (x = cos channel, y = sin channel,
 * y = b·sin(θ + φ)), u2 = (R/r)·sin(θ − α): the sin/cos gain ratio is 1/r and the skew φ = −α.
 */
export interface HeydemannFit {
  readonly ok: boolean;
  /** Offset of u1 and of u2, input units. */
  readonly p: number;
  readonly q: number;
  /** Gain ratio r (u1 scale over u2 scale). */
  readonly r: number;
  /** Phase error α, radians. */
  readonly alphaRad: number;
  /** Radius R of the corrected circle, input units. */
  readonly radius: number;
  readonly points: number;
}

export function heydemannFit(u1: ArrayLike<number>, u2: ArrayLike<number>): HeydemannFit {
  if (u1.length !== u2.length) throw new RangeError(`heydemannFit: u1 has ${u1.length} points, u2 ${u2.length}`);
  const fail = (points: number): HeydemannFit => ({ ok: false, p: NaN, q: NaN, r: NaN, alphaRad: NaN, radius: NaN, points });
  let n = 0;
  let m1 = 0;
  let m2 = 0;
  for (let i = 0; i < u1.length; i++) {
    const a = +u1[i]!, b = +u2[i]!;
    if (!Number.isFinite(a) || !Number.isFinite(b)) continue;
    n++;
    m1 += a;
    m2 += b;
  }
  if (n < 5) return fail(n);
  m1 /= n;
  m2 /= n;
  let r2 = 0;
  for (let i = 0; i < u1.length; i++) {
    const a = +u1[i]! - m1, b = +u2[i]! - m2;
    if (Number.isFinite(a) && Number.isFinite(b)) r2 += a * a + b * b;
  }
  const s = Math.sqrt(r2 / n);
  if (!(s > 0)) return fail(n);

  const normal = new Float64Array(25);
  const rhs = new Float64Array(5);
  const row = new Float64Array(5);
  for (let i = 0; i < u1.length; i++) {
    const a = (+u1[i]! - m1) / s, b = (+u2[i]! - m2) / s;
    if (!Number.isFinite(a) || !Number.isFinite(b)) continue;
    row[0] = a * a; row[1] = b * b; row[2] = a * b; row[3] = a; row[4] = b;
    for (let r = 0; r < 5; r++) {
      rhs[r] += row[r]!;
      for (let c = 0; c <= r; c++) normal[r * 5 + c] += row[r]! * row[c]!;
    }
  }
  const sol = solveSymmetric(normal, rhs, 5);
  if (!sol.ok) return fail(n);
  const [A, B, C, D, E] = sol.x as unknown as [number, number, number, number, number];
  const den = C * C - 4 * A * B;
  if (!(A > 0) || !(B > 0) || !(den < 0)) return fail(n);
  const sinAlpha = C / Math.sqrt(4 * A * B);
  const pn = (2 * B * D - E * C) / den;
  const qn = (2 * A * E - D * C) / den;
  const k = 1 + A * pn * pn + B * qn * qn + C * pn * qn;
  const cosAlpha = Math.sqrt(1 - sinAlpha * sinAlpha);
  return {
    ok: Math.abs(sinAlpha) < 1 && k > 0,
    p: m1 + s * pn,
    q: m2 + s * qn,
    r: Math.sqrt(B / A),
    alphaRad: Math.asin(Math.max(-1, Math.min(1, sinAlpha))),
    radius: (s * Math.sqrt(k / A)) / cosAlpha,
    points: n,
  };
}

/** Corrected pair: x = u1 − p, y = ((u1 − p)·sin α + r·(u2 − q))/cos α (Heydemann 1981). */
export function heydemannCorrect(fit: HeydemannFit, u1: ArrayLike<number>, u2: ArrayLike<number>): { x: Float64Array; y: Float64Array } {
  const n = Math.min(u1.length, u2.length);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const sa = Math.sin(fit.alphaRad);
  const ca = Math.cos(fit.alphaRad);
  for (let i = 0; i < n; i++) {
    const a = +u1[i]! - fit.p;
    x[i] = a;
    y[i] = (a * sa + fit.r * (+u2[i]! - fit.q)) / ca;
  }
  return { x, y };
}
