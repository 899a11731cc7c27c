import type { SinCosPhasors } from './sinCosFromLines.js';
import { unwrapDeg, wrapDeg } from './unwrapDeg.js';

/**
 * Shaft angle per carrier cycle from resolver-equivalent phasors.
 *
 * 1. The unit's phase lead ψ: an ideal unit's stator phasors are collinear, S = K·sin θ·e^{jψ},
 *    C = K·cos θ·e^{jψ}, so S² + C² = K²·e^{2jψ} whatever θ is; ψ = ½·arg Σ(S² + C²), taken on
 *    the branch |ψ| ≤ 90° (a unit's lead is a few degrees to a few tens; an R1/R2 reversal
 *    at the probe then reads as θ + 180°, as it should).
 * 2. Rotate by −ψ: in-phase parts Re(S·e^{−jψ}), Re(C·e^{−jψ}) carry the signed envelopes;
 *    Im(·) are the quadrature parts, which must not be mistaken for phase.
 * 3. θ = atan2(S_I, C_I), counter-clockwise positive, wrapped to [0, 360).
 * 4. Time stamps: a one-period window centred at carrier phase Φc sees a moving rotor at its
 *    centre minus sin(2(Φc + ψ))/(2ω) samples (for a reference-aligned cycle Φc ≈ π, so ≈
 *    lead/(360·f)); the stamp is moved there, so a turning shaft is not reported early
 *    (derivation in DEVELOPERS.md).
 */
export interface AngleSolution {
  readonly phaseLeadDeg: number;
  readonly tS: Float64Array;
  readonly deg: Float64Array;
  readonly unwrappedDeg: Float64Array;
  /** Radius K = |(S_I, C_I)| per cycle, peak volts (the stator maximum line-to-line). */
  readonly radiusV: Float64Array;
  /** Quadrature of S and C against the unit's phase, peak volts. */
  readonly sinQuadratureV: Float64Array;
  readonly cosQuadratureV: Float64Array;
}

export function estimatePhaseLeadRad(p: SinCosPhasors): number {
  let re = 0;
  let im = 0;
  for (let m = 0; m < p.sinRe.length; m++) {
    const sr = p.sinRe[m]!, si = p.sinIm[m]!, cr = p.cosRe[m]!, ci = p.cosIm[m]!;
    const r = sr * sr - si * si + cr * cr - ci * ci;
    const i = 2 * (sr * si + cr * ci);
    if (Number.isFinite(r) && Number.isFinite(i)) {
      re += r;
      im += i;
    }
  }
  return 0.5 * Math.atan2(im, re); // in (−π/2, π/2]
}

/** The window facts solveAngle needs (a subset of CyclePhasors). */
export interface CycleWindows {
  readonly centreS: Float64Array;
  readonly radPerSample: Float64Array;
  readonly centrePhaseRad: Float64Array;
}

export function solveAngle(
  p: SinCosPhasors,
  windows: CycleWindows,
  sampleRateHz: number,
  phaseLeadRad = estimatePhaseLeadRad(p),
): AngleSolution {
  const { centreS, radPerSample, centrePhaseRad } = windows;
  const n = p.sinRe.length;
  const cosPsi = Math.cos(phaseLeadRad);
  const sinPsi = Math.sin(phaseLeadRad);
  const deg = new Float64Array(n);
  const tS = new Float64Array(n);
  const radiusV = new Float64Array(n);
  const sinQuadratureV = new Float64Array(n);
  const cosQuadratureV = new Float64Array(n);
  for (let m = 0; m < n; m++) {
    // (x + jy)·e^{−jψ} = (x cosψ + y sinψ) + j(y cosψ − x sinψ)
    const sI = p.sinRe[m]! * cosPsi + p.sinIm[m]! * sinPsi;
    const cI = p.cosRe[m]! * cosPsi + p.cosIm[m]! * sinPsi;
    sinQuadratureV[m] = p.sinIm[m]! * cosPsi - p.sinRe[m]! * sinPsi;
    cosQuadratureV[m] = p.cosIm[m]! * cosPsi - p.cosRe[m]! * sinPsi;
    deg[m] = wrapDeg((Math.atan2(sI, cI) * 180) / Math.PI);
    radiusV[m] = Math.hypot(sI, cI);
    const shiftSamples = Math.sin(2 * (centrePhaseRad[m]! + phaseLeadRad)) / (2 * radPerSample[m]!);
    tS[m] = centreS[m]! - shiftSamples / sampleRateHz;
  }
  return {
    phaseLeadDeg: (phaseLeadRad * 180) / Math.PI,
    tS,
    deg,
    unwrappedDeg: unwrapDeg(deg),
    radiusV,
    sinQuadratureV,
    cosQuadratureV,
  };
}
