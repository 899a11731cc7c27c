import { solveSymmetric } from '../dsp/linearSolve.js';

/**
 * Direct least-squares ellipse fit.
 *
 * Method: R. Halíř & J. Flusser, "Numerically stable direct least squares fitting of
 * ellipses", WSCG 1998 — the ellipse-specific fit of Fitzgibbon, Pilu & Fisher (IEEE PAMI
 * 21(5), 1999) with the design matrix split into quadratic [x², xy, y²] and linear [x, y, 1]
 * blocks: the linear part is eliminated (a₂ = −S₃⁻¹S₂ᵀa₁) and the 3×3 eigenproblem
 * C₁⁻¹(S₁ − S₂S₃⁻¹S₂ᵀ)a₁ = λa₁ is solved, keeping the eigenvector with 4a₁₀a₁₂ − a₁₁² > 0.
 * As Fitzgibbon et al. advise, the points are first centred on their mean and scaled to unit
 * RMS radius (one scale for both axes, so gain ratio and skew are unchanged).
 *
 * Channel form (derived): the fitted ellipse is written as x = x₀ + a·cos t, y = y₀ + b·sin(t + φ);
 * its quadratic part is then proportional to x²/a² + y²/b² − 2·sinφ·xy/(ab), so
 * b/a = √(A/C) and sinφ = −B/(2√(AC)) for the x², xy, y² coefficients A, B, C.
 */
export interface EllipseFit {
  /** False when the points do not determine an ellipse (too few, collinear, singular). */
  readonly ok: boolean;
  /** Conic coefficients [A, B, C, D, E, F] of A x² + B xy + C y² + D x + E y + F = 0 in the input units, scaled so that 4AC − B² = 1 in the normalised frame (A > 0). */
  readonly conic: readonly [number, number, number, number, number, number];
  /** Centre (x₀, y₀), input units. */
  readonly centreX: number;
  readonly centreY: number;
  /** Amplitudes a (x) and b (y) of the channel form, input units. */
  readonly amplitudeX: number;
  readonly amplitudeY: number;
  /** Skew φ of the channel form y = y₀ + b·sin(t + φ) against x = x₀ + a·cos t, radians (0 for orthogonal channels). */
  readonly skewRad: number;
  readonly points: number;
}

const FAILED: EllipseFit = { ok: false, conic: [NaN, NaN, NaN, NaN, NaN, NaN], centreX: NaN, centreY: NaN, amplitudeX: NaN, amplitudeY: NaN, skewRad: NaN, points: 0 };

export function ellipseFit(x: ArrayLike<number>, y: ArrayLike<number>): EllipseFit {
  if (x.length !== y.length) throw new RangeError(`ellipseFit: x has ${x.length} points, y ${y.length}`);
  // Centre and scale.
  let n = 0;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < x.length; i++) {
    const xi = +x[i]!, yi = +y[i]!;
    if (!Number.isFinite(xi) || !Number.isFinite(yi)) continue;
    n++;
    mx += xi;
    my += yi;
  }
  if (n < 6) return { ...FAILED, points: n };
  mx /= n;
  my /= n;
  let r2 = 0;
  for (let i = 0; i < x.length; i++) {
    const xi = +x[i]! - mx, yi = +y[i]! - my;
    if (Number.isFinite(xi) && Number.isFinite(yi)) r2 += xi * xi + yi * yi;
  }
  const s = Math.sqrt(r2 / n);
  if (!(s > 0)) return { ...FAILED, points: n };

  // Scatter blocks S1 = D1ᵀD1, S2 = D1ᵀD2, S3 = D2ᵀD2 (row-major 3×3).
  const S1 = new Float64Array(9);
  const S2 = new Float64Array(9);
  const S3 = new Float64Array(9);
  const d1 = new Float64Array(3);
  const d2 = new Float64Array(3);
  for (let i = 0; i < x.length; i++) {
    const u = (+x[i]! - mx) / s;
    const v = (+y[i]! - my) / s;
    if (!Number.isFinite(u) || !Number.isFinite(v)) continue;
    d1[0] = u * u; d1[1] = u * v; d1[2] = v * v;
    d2[0] = u; d2[1] = v; d2[2] = 1;
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) {
        S1[r * 3 + c] += d1[r]! * d1[c]!;
        S2[r * 3 + c] += d1[r]! * d2[c]!;
        S3[r * 3 + c] += d2[r]! * d2[c]!;
      }
    }
  }
  // T = −S3⁻¹ S2ᵀ, column by column (S3 is symmetric positive definite for non-collinear points).
  const T = new Float64Array(9);
  for (let c = 0; c < 3; c++) {
    const rhs = [S2[c * 3]!, S2[c * 3 + 1]!, S2[c * 3 + 2]!]; // column c of S2ᵀ = row c of S2
    const sol = solveSymmetric(S3, rhs, 3);
    if (!sol.ok) return { ...FAILED, points: n };
    for (let r = 0; r < 3; r++) T[r * 3 + c] = -sol.x[r]!;
  }
  // M = S1 + S2·T (reduced scatter), then C1⁻¹·M with C1 = [[0,0,2],[0,−1,0],[2,0,0]].
  const M = new Float64Array(9);
  for (let r = 0; r < 3; r++) {
    for (let c = 0; c < 3; c++) {
      let v = S1[r * 3 + c]!;
      for (let k = 0; k < 3; k++) v += S2[r * 3 + k]! * T[k * 3 + c]!;
      M[r * 3 + c] = v;
    }
  }
  const N = new Float64Array(9);
  for (let c = 0; c < 3; c++) {
    N[c] = M[6 + c]! / 2;
    N[3 + c] = -M[3 + c]!;
    N[6 + c] = M[c]! / 2;
  }
  const a1 = ellipseEigenvector(N);
  if (!a1) return { ...FAILED, points: n };
  const a2 = [0, 0, 0];
  for (let r = 0; r < 3; r++) a2[r] = T[r * 3]! * a1[0]! + T[r * 3 + 1]! * a1[1]! + T[r * 3 + 2]! * a1[2]!;

  // Normalise: 4AC − B² = 1, A > 0 (normalised frame).
  let A = a1[0]!, B = a1[1]!, C = a1[2]!, D = a2[0]!, E = a2[1]!, F = a2[2]!;
  const k = 4 * A * C - B * B;
  if (!(k > 0)) return { ...FAILED, points: n };
  const scale = (A < 0 ? -1 : 1) / Math.sqrt(k);
  A *= scale; B *= scale; C *= scale; D *= scale; E *= scale; F *= scale;

  // Centre: [2A B; B 2C]·[x0; y0] = −[D; E]; value of the quadratic form there.
  const det = 4 * A * C - B * B;
  const x0 = (-2 * C * D + B * E) / det;
  const y0 = (-2 * A * E + B * D) / det;
  const f0 = A * x0 * x0 + B * x0 * y0 + C * y0 * y0 - F;
  const sinPhi = -B / (2 * Math.sqrt(A * C));
  const cos2 = 1 - sinPhi * sinPhi;
  if (!(f0 > 0) || !(cos2 > 0)) return { ...FAILED, points: n };
  const ax = Math.sqrt(f0 / (A * cos2));
  const by = Math.sqrt(f0 / (C * cos2));

  // Conic in input units: substitute u = (x − mx)/s, v = (y − my)/s.
  const s2 = s * s;
  const Ao = A / s2, Bo = B / s2, Co = C / s2;
  const Do = D / s - 2 * Ao * mx - Bo * my;
  const Eo = E / s - 2 * Co * my - Bo * mx;
  const Fo = Ao * mx * mx + Bo * mx * my + Co * my * my - (D * mx + E * my) / s + F;
  return {
    ok: true,
    conic: [Ao, Bo, Co, Do, Eo, Fo],
    centreX: mx + s * x0,
    centreY: my + s * y0,
    amplitudeX: s * ax,
    amplitudeY: s * by,
    skewRad: Math.asin(sinPhi),
    points: n,
  };
}

/**
 * Real eigenvectors of the 3×3 matrix N (row-major) whose conic constraint 4v₀v₂ − v₁² is
 * positive; returns the one with the largest normalised constraint. The eigenvalues are real
 * (the pencil of a positive semi-definite scatter and the constraint matrix); they are the roots of
 * the characteristic cubic by the trigonometric method, polished by Newton steps, and each
 * eigenvector is the largest cross product of two rows of N − λI.
 */
function ellipseEigenvector(N: Float64Array): number[] | undefined {
  const [n00, n01, n02, n10, n11, n12, n20, n21, n22] = N as unknown as number[];
  const tr = n00! + n11! + n22!;
  const c1 = n00! * n11! - n01! * n10! + n00! * n22! - n02! * n20! + n11! * n22! - n12! * n21!;
  const det =
    n00! * (n11! * n22! - n12! * n21!) - n01! * (n10! * n22! - n12! * n20!) + n02! * (n10! * n21! - n11! * n20!);
  // λ³ − tr·λ² + c1·λ − det = 0; λ = t + tr/3 → t³ + p·t + q = 0.
  const p = c1 - (tr * tr) / 3;
  const q = (-2 * tr * tr * tr) / 27 + (tr * c1) / 3 - det;
  const roots: number[] = [];
  if (p < 0) {
    const m = 2 * Math.sqrt(-p / 3);
    const arg = Math.max(-1, Math.min(1, ((3 * q) / (p * m))));
    const theta = Math.acos(arg) / 3;
    for (let k = 0; k < 3; k++) roots.push(m * Math.cos(theta - (2 * Math.PI * k) / 3) + tr / 3);
  } else {
    // One real root (Cardano); only reached for degenerate input.
    const d = Math.sqrt(Math.max(0, (q * q) / 4 + (p * p * p) / 27));
    roots.push(Math.cbrt(-q / 2 + d) + Math.cbrt(-q / 2 - d) + tr / 3);
  }
  const poly = (l: number): number => ((l - tr) * l + c1) * l - det;
  const dpoly = (l: number): number => (3 * l - 2 * tr) * l + c1;
  let best: number[] | undefined;
  let bestScore = 0;
  for (let lambda of roots) {
    for (let it = 0; it < 3; it++) {
      const d = dpoly(lambda);
      if (d === 0) break;
      const step = poly(lambda) / d;
      if (!Number.isFinite(step)) break;
      lambda -= step;
    }
    const r0 = [n00! - lambda, n01!, n02!];
    const r1 = [n10!, n11! - lambda, n12!];
    const r2 = [n20!, n21!, n22! - lambda];
    let v: number[] | undefined;
    let vn = 0;
    for (const [a, b] of [[r0, r1], [r0, r2], [r1, r2]] as const) {
      const c = [a[1]! * b[2]! - a[2]! * b[1]!, a[2]! * b[0]! - a[0]! * b[2]!, a[0]! * b[1]! - a[1]! * b[0]!];
      const norm = Math.hypot(c[0]!, c[1]!, c[2]!);
      if (norm > vn) {
        vn = norm;
        v = c;
      }
    }
    if (!v || !(vn > 0)) continue;
    const score = (4 * v[0]! * v[2]! - v[1]! * v[1]!) / (vn * vn);
    if (score > bestScore) {
      bestScore = score;
      best = v.map((e) => e / vn);
    }
  }
  return best;
}
