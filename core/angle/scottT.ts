/**
 * Synchro line-to-line voltages to resolver-equivalent sine and cosine (Scott-T / Clarke).
 *
 * With A = E(S1−S3), B = E(S3−S2), C = E(S2−S1) following the standard synchro equations
 * (A = K·sin θ, B = K·sin(θ+120°), C = K·sin(θ+240°); NEETS Module 15 voltage tables,
 * SAE AS20708B phase order), the least-squares projections onto sin θ and cos θ are
 *   K·sin θ = (2/3)·(A − (B + C)/2),   K·cos θ = (B − C)/√3,
 * which reduce to the textbook Scott-T relations (K·sin θ = A) whenever A + B + C = 0 (Kirchhoff),
 * and average the noise of all three lines when all three are measured.
 */
export function linesToSin(a: number, b: number, c: number): number {
  return (2 / 3) * (a - (b + c) / 2);
}

export function linesToCos(b: number, c: number): number {
  return (b - c) / Math.sqrt(3);
}

/**
 * Fills the one unmeasured line of a synchro from the other two: the three line-to-line voltages
 * sum to zero (Kirchhoff's voltage law around S1, S2, S3).
 */
export function missingLine(x: number, y: number): number {
  return -(x + y);
}
