/**
 * Small dense symmetric positive-definite solve for least-squares normal equations.
 *
 * Method: symmetric (Jacobi) equilibration M̃ = D^{−½} M D^{−½} with D = diag(M), which is the
 * same as scaling every design column to unit norm, followed by the Cholesky factorisation
 * M̃ = L Lᵀ and two triangular solves (Golub & Van Loan, "Matrix Computations", 4th ed.,
 * §4.2 and §3.5.2). Bad data (a rank-deficient or numerically singular system) never throws:
 * the result carries `ok = false` and a reciprocal-condition estimate instead, in the manner of
 * a quality flag on a factorisation.
 */

export interface SymmetricSolve {
  /** Solution vector (length n); NaN-filled when `ok` is false because factorisation failed. */
  x: Float64Array;
  /** False when the matrix is not numerically positive definite or is too ill-conditioned. */
  ok: boolean;
  /**
   * Cheap estimate of 1/cond₂ of the equilibrated matrix: (min L_ii / max L_ii)². It is an
   * order-of-magnitude indicator (common practice, no source for this exact estimator), 0 when
   * the factorisation broke down.
   */
  reciprocalCondition: number;
}

/** Default threshold below which {@link solveSymmetric} reports `ok = false`. */
export const MIN_RECIPROCAL_CONDITION = 1e-13;

/**
 * Solves M x = r for symmetric positive-definite M (n×n, row-major; only the lower triangle,
 * j ≤ i, is read). Neither argument is modified. Throws RangeError only for inconsistent sizes.
 */
export function solveSymmetric(
  m: ArrayLike<number>,
  r: ArrayLike<number>,
  n: number,
  minReciprocalCondition: number = MIN_RECIPROCAL_CONDITION,
): SymmetricSolve {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`solveSymmetric: n must be a positive integer, got ${n}`);
  if (m.length < n * n || r.length < n) {
    throw new RangeError(`solveSymmetric: need ${n * n} matrix and ${n} rhs entries, got ${m.length} and ${r.length}`);
  }
  const fail = (): SymmetricSolve => ({ x: new Float64Array(n).fill(NaN), ok: false, reciprocalCondition: 0 });

  // Equilibration factors s_i = 1/sqrt(M_ii).
  const s = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const d = m[i * n + i];
    if (!(d > 0) || !Number.isFinite(d)) return fail();
    s[i] = 1 / Math.sqrt(d);
  }
  // Cholesky of the scaled matrix, lower triangle into l.
  const l = new Float64Array(n * n);
  let minDiag = Infinity;
  let maxDiag = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = m[i * n + j] * s[i] * s[j];
      for (let k = 0; k < j; k++) sum -= l[i * n + k] * l[j * n + k];
      if (i === j) {
        // Breakdown tolerance: the scaled diagonal is 1, so a pivot of order eps is numerically zero.
        if (!(sum > 64 * Number.EPSILON)) return fail();
        const d = Math.sqrt(sum);
        l[i * n + i] = d;
        if (d < minDiag) minDiag = d;
        if (d > maxDiag) maxDiag = d;
      } else {
        l[i * n + j] = sum / l[j * n + j];
      }
    }
  }
  // Forward then back substitution on the scaled right-hand side.
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sum = r[i] * s[i];
    for (let k = 0; k < i; k++) sum -= l[i * n + k] * y[k];
    y[i] = sum / l[i * n + i];
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let sum = y[i];
    for (let k = i + 1; k < n; k++) sum -= l[k * n + i] * x[k];
    x[i] = sum / l[i * n + i];
  }
  for (let i = 0; i < n; i++) x[i] *= s[i];
  const rc = (minDiag / maxDiag) ** 2;
  let finite = true;
  for (let i = 0; i < n; i++) if (!Number.isFinite(x[i])) finite = false;
  return { x, ok: finite && rc >= minReciprocalCondition, reciprocalCondition: rc };
}
