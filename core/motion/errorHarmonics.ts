import { solveSymmetric } from '../dsp/linearSolve.js';

/**
 * Fourier series of an electrical-error curve against angle, fitted by linear least squares.
 *
 * Model: e(θ) ≈ a₀ + Σ_{k=1}^{K} (a_k cos kθ + b_k sin kθ), θ the (electrical) angle in degrees,
 * e in arc-minutes. Each order is reported as A_k·cos(kθ − φ_k) with A_k = √(a_k² + b_k²) (peak,
 * arcmin) and φ_k = atan2(b_k, a_k) (degrees); order 0 is A₀ = |a₀| with φ₀ = 0° for a positive
 * and 180° for a negative mean, so every order reads the same way. Least squares (rather than a
 * DFT) handles unequally spaced or repeated positions and a partial set of headings; on equally
 * spaced headings it equals the DFT coefficients.
 *
 * Order = cycles of error per electrical turn. The usual causes (several share an order, so they
 * are hints, not diagnoses):
 * - 0: zero (index) offset: electrical-zero setting, mounting;
 * - 1: an offset (DC or in-phase carrier leakage) in one channel, rotor eccentricity or coupling
 *   run-out (Hwang, Kim, Kim, Jang, "Signal compensation for analog rotor position errors due to
 *   nonideal sinusoidal encoder signals", J. Power Electronics 14(1), 2014; Lee et al.,
 *   "Classification and compensation of DC offset error and scale error in resolver signals",
 *   J. Power Electronics 16(3), 2016; Tootoonchian, Abbaszadeh, Ardebili, Measurement Science
 *   Review 12(1), 2012, for eccentricity);
 * - 2: gain (transformation-ratio) imbalance between channels, non-orthogonal windings, unequal
 *   phase shifts (D. C. Hanselman, "Resolver signal requirements for high accuracy
 *   resolver-to-digital conversion", IEEE Trans. Ind. Electron. 37(6), 1990, from memory; Hwang
 *   et al. 2014; Lee et al. 2016; Heydemann, Applied Optics 1981, for the offset/gain/quadrature
 *   triple);
 * - 4: a 3rd space harmonic in the windings (the counter-rotating 3rd harmonic of the sin/cos pair
 *   beats with the fundamental at 4θ: S. Kuntz, R. Dauth, G. Gerlach, P. Ott, S. Fella, "Harmonic
 *   analysis of the arctangent function regarding the angular error introduced by superimposed
 *   Fourier series ...", arXiv:2205.08472, 2022);
 * - 3 and ≥ 5: slot/tooth ripple, other winding harmonics, noise (common practice, no source).
 *
 * First-order models (derived by expanding atan2, checked numerically): offset o on the sine
 * channel → o·cos θ rad; gain +ε on the sine channel → (ε/2)·sin 2θ rad; sine axis skewed by δ →
 * (δ/2)(1 + cos 2θ) rad.
 */
export interface ErrorHarmonic {
  /** Cycles per electrical turn, 0 … K. */
  readonly order: number;
  /** Peak amplitude A_k in arc-minutes (order 0: magnitude of the mean). */
  readonly amplitudeArcmin: number;
  /** φ_k in A_k·cos(kθ − φ_k), degrees in (−180, 180]. */
  readonly phaseDeg: number;
  /** The usual cause of an error at this order, one short plain phrase. */
  readonly meaning: string;
}

export interface ErrorHarmonicsFit {
  /** Orders 0 … maxOrderFitted, in order. Empty when no usable point was given. */
  readonly harmonics: readonly ErrorHarmonic[];
  /** Signed order-0 coefficient a₀ (the mean error over the fitted model), arcmin. */
  readonly meanArcmin: number;
  /** RMS of the residual after the fitted series, arcmin. */
  readonly residualRmsArcmin: number;
  /** Highest order actually fitted; lower than requested when the points cannot support it. */
  readonly maxOrderFitted: number;
  /** Finite (angle, error) pairs used. */
  readonly pointsUsed: number;
}

/** The usual meaning of an error harmonic of this order (see {@link ErrorHarmonic}). */
export function harmonicMeaning(order: number): string {
  switch (order) {
    case 0:
      return 'zero (index) offset: electrical-zero setting or mounting';
    case 1:
      return 'offset in one channel, or rotor eccentricity / coupling run-out';
    case 2:
      return 'gain imbalance between channels, non-orthogonal windings or unequal phase shifts';
    case 4:
      return '3rd space harmonic in the windings';
    default:
      return 'slot/tooth ripple, other winding harmonics or noise';
  }
}

const DEG = Math.PI / 180;

/**
 * Least-squares Fourier series of `errorArcmin` against `angleDeg`, orders 0 … `maxOrder`.
 * Non-finite pairs are skipped. When the points cannot determine every order (fewer than
 * 2K + 1 distinct angles, or an ill-conditioned system, e.g. K = P/2 on P equally spaced
 * headings) the highest orders are dropped until the fit is well posed; `maxOrderFitted` says
 * where it stopped. Throws RangeError only for a bad `maxOrder` or arrays of different lengths.
 */
export function errorHarmonics(angleDeg: ArrayLike<number>, errorArcmin: ArrayLike<number>, maxOrder: number): ErrorHarmonicsFit {
  if (!Number.isInteger(maxOrder) || maxOrder < 0) throw new RangeError(`errorHarmonics: maxOrder must be a non-negative integer, got ${maxOrder}`);
  if (angleDeg.length !== errorArcmin.length) {
    throw new RangeError(`errorHarmonics: angle and error arrays differ in length (${angleDeg.length} vs ${errorArcmin.length})`);
  }
  const theta: number[] = [];
  const err: number[] = [];
  const distinct = new Set<number>();
  for (let i = 0; i < angleDeg.length; i++) {
    const a = angleDeg[i]!;
    const e = errorArcmin[i]!;
    if (!Number.isFinite(a) || !Number.isFinite(e)) continue;
    let w = a % 360;
    if (w < 0) w += 360;
    theta.push(w * DEG);
    err.push(e);
    distinct.add(Math.round(w * 1e6) % 360000000);
  }
  const p = theta.length;
  if (p === 0) return { harmonics: [], meanArcmin: NaN, residualRmsArcmin: NaN, maxOrderFitted: -1, pointsUsed: 0 };

  let order = Math.min(maxOrder, Math.floor((distinct.size - 1) / 2));
  for (; order >= 0; order--) {
    const coef = fitSeries(theta, err, order);
    if (!coef) continue;
    const harmonics: ErrorHarmonic[] = [];
    const a0 = coef[0]!;
    harmonics.push({ order: 0, amplitudeArcmin: Math.abs(a0), phaseDeg: a0 < 0 ? 180 : 0, meaning: harmonicMeaning(0) });
    for (let k = 1; k <= order; k++) {
      const a = coef[2 * k - 1]!;
      const b = coef[2 * k]!;
      harmonics.push({ order: k, amplitudeArcmin: Math.hypot(a, b), phaseDeg: Math.atan2(b, a) / DEG, meaning: harmonicMeaning(k) });
    }
    let ss = 0;
    for (let i = 0; i < p; i++) {
      const r = err[i]! - evaluateSeries(coef, order, theta[i]!);
      ss += r * r;
    }
    return { harmonics, meanArcmin: a0, residualRmsArcmin: Math.sqrt(ss / p), maxOrderFitted: order, pointsUsed: p };
  }
  return { harmonics: [], meanArcmin: NaN, residualRmsArcmin: NaN, maxOrderFitted: -1, pointsUsed: p };
}

/** Evaluates a₀ + Σ (a_k cos kθ + b_k sin kθ) for coefficients laid out [a₀, a₁, b₁, a₂, b₂, …]. */
export function evaluateSeries(coef: ArrayLike<number>, order: number, thetaRad: number): number {
  let v = coef[0]!;
  const c1 = Math.cos(thetaRad);
  const s1 = Math.sin(thetaRad);
  let c = 1;
  let s = 0;
  for (let k = 1; k <= order; k++) {
    const cn = c * c1 - s * s1;
    s = s * c1 + c * s1;
    c = cn;
    v += coef[2 * k - 1]! * c + coef[2 * k]! * s;
  }
  return v;
}

/** Normal equations of the series of order K; undefined when the system is not well posed. */
function fitSeries(theta: readonly number[], err: readonly number[], order: number): Float64Array | undefined {
  const n = 2 * order + 1;
  const m = new Float64Array(n * n);
  const r = new Float64Array(n);
  const row = new Float64Array(n);
  for (let i = 0; i < theta.length; i++) {
    basisRow(theta[i]!, order, row);
    const e = err[i]!;
    for (let j = 0; j < n; j++) {
      const rj = row[j]!;
      r[j] += rj * e;
      for (let l = 0; l <= j; l++) m[j * n + l] += rj * row[l]!;
    }
  }
  const solved = solveSymmetric(m, r, n, 1e-10);
  return solved.ok ? solved.x : undefined;
}

/** [1, cos θ, sin θ, cos 2θ, sin 2θ, …] by the angle-addition recurrence (error O(k·eps)). */
export function basisRow(thetaRad: number, order: number, out: Float64Array): void {
  out[0] = 1;
  const c1 = Math.cos(thetaRad);
  const s1 = Math.sin(thetaRad);
  let c = 1;
  let s = 0;
  for (let k = 1; k <= order; k++) {
    const cn = c * c1 - s * s1;
    s = s * c1 + c * s1;
    c = cn;
    out[2 * k - 1] = c;
    out[2 * k] = s;
  }
}
