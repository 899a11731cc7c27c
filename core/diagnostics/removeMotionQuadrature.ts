
/** One line's per-cycle phasors, as the unit-figure regression takes them. */
export interface UnitLinePhasors {
  /** Role of the line, optionally with a unit prefix: "s1s3", "s3s1", "sin", "coarse.cos"... */
  readonly role: string;
  /** In-phase amplitude per cycle against sin Φ of the excitation, peak volts (CyclePhasors.inPhase[k]). */
  readonly inPhaseV: ArrayLike<number>;
  /** Quadrature amplitude per cycle against cos Φ, peak volts (CyclePhasors.quadrature[k]). */
  readonly quadratureV: ArrayLike<number>;
}

/**
 * Removes the quadrature that a moving envelope leaves in a one-carrier-period lock-in window.
 *
 * Derived here: for y = g(x)·sin(Φc + x + ψ) with a linear envelope g = g₀ + g₁·x over the window
 * x ∈ [−π, π) (g₁ per radian of carrier), the projections onto sin Φ and cos Φ give
 * z·e^{−jψ} = g₀ − (g₁/2)·[sin 2(Φc + ψ) + j·cos 2(Φc + ψ)]. The real part is the envelope at a
 * shifted instant (the time-stamp correction the angle solver applies); the imaginary part is a
 * spurious quadrature −(g₁/2)·cos 2(Φc + ψ), about 5 mV on an 11.8 V line turning at 90°/s at
 * 400 Hz, which a regression over a partial turn would take for line quadrature. g₁ is
 * estimated per cycle from the neighbouring cycles' in-phase parts (2π of carrier apart), and
 * only the imaginary part is corrected, so the in-phase part stays consistent with the decoded
 * angle's time stamp.
 */
export function removeMotionQuadrature(
  lines: readonly UnitLinePhasors[],
  phaseLeadRad: number,
  centrePhaseRad: ArrayLike<number>,
): UnitLinePhasors[] {
  const c = Math.cos(phaseLeadRad);
  const s = Math.sin(phaseLeadRad);
  return lines.map((line) => {
    const n = line.inPhaseV.length;
    if (centrePhaseRad.length !== n) throw new RangeError(`unitFigures: centrePhaseRad has ${centrePhaseRad.length} cycles, line "${line.role}" ${n}`);
    const re = new Float64Array(n);
    const im = new Float64Array(n);
    const g = new Float64Array(n);
    for (let m = 0; m < n; m++) {
      re[m] = +line.inPhaseV[m]!;
      im[m] = +line.quadratureV[m]!;
      g[m] = re[m]! * c + im[m]! * s;
    }
    for (let m = 0; m < n; m++) {
      const lo = m > 0 && Number.isFinite(g[m - 1]!) ? m - 1 : m;
      const hi = m + 1 < n && Number.isFinite(g[m + 1]!) ? m + 1 : m;
      if (hi === lo || !Number.isFinite(g[m]!)) continue;
      const g1 = (g[hi]! - g[lo]!) / (2 * Math.PI * (hi - lo));
      const dq = (g1 / 2) * Math.cos(2 * (+centrePhaseRad[m]! + phaseLeadRad));
      if (!Number.isFinite(dq)) continue;
      // Add +dq to the imaginary part in the unit frame: Δz = j·dq·e^{jψ} = dq·(−sin ψ + j cos ψ).
      re[m] = re[m]! - dq * s;
      im[m] = im[m]! + dq * c;
    }
    return { role: line.role, inPhaseV: re, quadratureV: im };
  });
}
