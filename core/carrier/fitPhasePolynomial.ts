import { InvariantError } from '../model/errors.js';

/**
 * Weighted least-squares polynomial in a centred, scaled abscissa u ∈ [−1, 1] (normal equations
 * solved by Gaussian elimination with partial pivoting; the scaling keeps them well conditioned
 * up to the low degrees used here). Degree chosen by the Bayesian information criterion
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
  const coefficients = solveSquare(ata, aty, k);
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

function solveSquare(a: Float64Array, b: Float64Array, k: number): number[] {
  const m = Float64Array.from(a);
  const x = Float64Array.from(b);
  for (let col = 0; col < k; col++) {
    let pivot = col;
    for (let r = col + 1; r < k; r++) if (Math.abs(m[r * k + col]!) > Math.abs(m[pivot * k + col]!)) pivot = r;
    if (pivot !== col) {
      for (let c = 0; c < k; c++) {
        const t = m[col * k + c]!;
        m[col * k + c] = m[pivot * k + c]!;
        m[pivot * k + c] = t;
      }
      const t = x[col]!;
      x[col] = x[pivot]!;
      x[pivot] = t;
    }
    const d = m[col * k + col]!;
    if (d === 0) return new Array<number>(k).fill(NaN);
    for (let r = col + 1; r < k; r++) {
      const f = m[r * k + col]! / d;
      if (f === 0) continue;
      for (let c = col; c < k; c++) m[r * k + c] -= f * m[col * k + c]!;
      x[r] -= f * x[col]!;
    }
  }
  const out = new Array<number>(k).fill(0);
  for (let r = k - 1; r >= 0; r--) {
    let s = x[r]!;
    for (let c = r + 1; c < k; c++) s -= m[r * k + c]! * out[c]!;
    out[r] = s / m[r * k + r]!;
  }
  return out;
}
