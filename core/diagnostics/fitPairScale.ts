import { solveSymmetric } from '../dsp/linearSolve.js';

/** Misfit allowed for the ellipse of two envelopes (relative, on the squared quantity). */
const FIT_TOLERANCE = 0.03;

export interface PairScale {
  /** Scale of the first line over the second's. */
  readonly factor: number;
  /** The stator maximum implied with the second line's scale taken as right, peak V. */
  readonly radiusOfQScaleV: number;
}

/**
 * Ratio of the scales of two envelopes x, y of one unit from the ellipse they trace over a turn.
 * Two healthy envelopes x = K·sin(θ+φx), y = K·sin(θ+φy) satisfy x² − 2xy·cos Δ + y² = K²·sin²Δ
 * (Δ = φy − φx; derived, the Lissajous ellipse of two sinusoids). With x read g times too large,
 * u·x² − 2w·xy·cos Δ + y² = R with u = 1/g², w = 1/g: (u, w, R) by linear least squares
 * (normal equations, equilibrated Cholesky) and u ≈ w² is required. For Δ = 90° (a resolver)
 * only u, hence |g|, is identifiable. Returns undefined when the record does not cover enough angle
 * (|mean e^{2jθ}| ≥ 0.85, roughly a span under 55°), the fit is ill-conditioned, or the shape is
 * not that of a pure scale error.
 */
export function fitPairScale(x: Float64Array, y: Float64Array, valid: Uint8Array, deltaRad: number): PairScale | undefined {
  const cosD = Math.cos(deltaRad);
  const resolverLike = Math.abs(cosD) < 1e-9;
  const n = resolverLike ? 2 : 3;
  const mat = new Float64Array(n * n);
  const rhs = new Float64Array(n);
  const row = new Float64Array(n);
  let count = 0;
  for (let m = 0; m < valid.length; m++) {
    if (!valid[m]) continue;
    const xm = x[m]!, ym = y[m]!;
    row[0] = xm * xm;
    if (resolverLike) row[1] = -1;
    else {
      row[1] = -2 * cosD * xm * ym;
      row[2] = -1;
    }
    const t = -ym * ym;
    for (let r = 0; r < n; r++) {
      rhs[r] += row[r]! * t;
      for (let c = 0; c <= r; c++) mat[r * n + c] += row[r]! * row[c]!;
    }
    count++;
  }
  if (count < n + 2) return undefined;
  const sol = solveSymmetric(mat, rhs, n, 1e-10);
  if (!sol.ok) return undefined;
  const u = sol.x[0]!;
  const w = resolverLike ? Math.sign(u) * Math.sqrt(Math.abs(u)) : sol.x[1]!;
  const big = sol.x[n - 1]!; // R = K'²·sin²Δ with q's scale
  if (!(u > 0) || !(big > 0) || w === 0) return undefined;
  if (!resolverLike && Math.abs(u / (w * w) - 1) > 0.1) return undefined;
  const factor = 1 / w;
  // Coverage and misfit with the corrected envelopes.
  let c2 = 0, s2 = 0, misfit = 0;
  const sinD = Math.sin(deltaRad);
  for (let m = 0; m < valid.length; m++) {
    if (!valid[m]) continue;
    const xm = x[m]! / factor, ym = y[m]!;
    // Recover θ from the two corrected envelopes: x = K sin θ' , y = K sin(θ' + Δ) (θ' = θ + φx).
    const kc = (ym - xm * cosD) / sinD; // K cos θ'
    const th = Math.atan2(xm, kc);
    c2 += Math.cos(2 * th);
    s2 += Math.sin(2 * th);
    misfit += (xm * xm - 2 * xm * ym * cosD + ym * ym - big) ** 2;
  }
  if (Math.hypot(c2, s2) / count >= 0.85) return undefined;
  if (Math.sqrt(misfit / count) / big > 2 * FIT_TOLERANCE) return undefined;
  return { factor, radiusOfQScaleV: Math.sqrt(big) / Math.abs(sinD) };
}

