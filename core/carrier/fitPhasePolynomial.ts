import { solveSymmetric } from '../dsp/linearSolve.js';
import { InvariantError } from '../model/errors.js';

/**
 * Weighted least-squares polynomial in a centred, scaled abscissa u ∈ [−1, 1] (normal equations
 * solved by the equilibrated Cholesky of core/dsp/linearSolve; the scaling keeps them well
 * conditioned up to the low degrees used here). Degree chosen by the Bayesian information criterion
 * (Schwarz, "Estimating the dimension of a model", Ann. Statist. 6(2), 1978) between minDegree
 * and maxDegree.
 */
export interface PolynomialFit {
  readonly coefficients: number[];
  readonly degree: number;
  /** Weighted residual RMS. */
  readonly residualRms: number;
}

export function fitPolynomial(
  u: ArrayLike<number>,
  y: ArrayLike<number>,
  weights: ArrayLike<number> | undefined,
  degree: number,
): PolynomialFit {
  const k = degree + 1;
  const ata = new Float64Array(k * k);
  const aty = new Float64Array(k);
  const powers = new Float64Array(2 * k);
  let wSum = 0;
  for (let i = 0; i < u.length; i++) {
    const w = weights ? weights[i]! : 1;
    const yi = y[i]!;
    if (!(w > 0) || !Number.isFinite(yi)) continue;
    wSum += w;
    let p = 1;
    for (let j = 0; j < 2 * k; j++) {
      powers[j] = p;
      p *= u[i]!;
    }
    for (let r = 0; r < k; r++) {
      aty[r] += w * powers[r]! * yi;
      for (let c = 0; c < k; c++) ata[r * k + c] += w * powers[r + c]!;
    }
  }
  const coefficients = Array.from(solveSymmetric(ata, aty, k).x);
  let rss = 0;
  for (let i = 0; i < u.length; i++) {
    const w = weights ? weights[i]! : 1;
    const yi = y[i]!;
    if (!(w > 0) || !Number.isFinite(yi)) continue;
    let v = 0;
    for (let j = k - 1; j >= 0; j--) v = v * u[i]! + coefficients[j]!;
    rss += w * (yi - v) ** 2;
  }
  return { coefficients, degree, residualRms: wSum > 0 ? Math.sqrt(rss / wSum) : NaN };
}

export function fitPolynomialBic(
  u: ArrayLike<number>,
  y: ArrayLike<number>,
  weights: ArrayLike<number> | undefined,
  minDegree: number,
  maxDegree: number,
): PolynomialFit {
  const n = u.length;
  let best: PolynomialFit | undefined;
  let bestScore = Infinity;
  for (let d = minDegree; d <= Math.min(maxDegree, n - 2); d++) {
    const fit = fitPolynomial(u, y, weights, d);
    const score = n * Math.log(Math.max(fit.residualRms ** 2, 1e-300)) + (d + 1) * Math.log(n);
    if (score < bestScore - 1e-9) {
      bestScore = score;
      best = fit;
    }
  }
  if (!best) throw new InvariantError('fitPolynomialBic needs at least minDegree + 2 points');
  return best;
}
