import type { SinCosPhasors } from '../angle/sinCosFromLines.js';
import { ellipseFit } from './ellipseFit.js';

/**
 * The sine/cosine plane of a unit: the Lissajous of the resolver-equivalent in-phase pair
 * (for a synchro, the Scott-T pair), fitted with an ellipse to read the channel errors and
 * predict the angle-error harmonics they cause.
 *
 * Fit: Halíř & Flusser 1998 direct least squares (see `ellipseFit`), x = cos channel,
 * y = sin channel, channel form c = C₀ + a·cos θ, s = S₀ + b·sin(θ + φ).
 *
 * Coverage rule: an arc of the ellipse does not pin down its centre and axes (offset error
 * grows from ~2e-4 over a full turn to ~0.1 of the radius over 90°, at 0.2 % noise; an
 * algebraic-fit property, cf. Fitzgibbon et al. 1999 on partial arcs), so the fit runs only when
 * the capture covers at least `minCoverageDeg` (default 180°) of electrical angle; otherwise the
 * result says "not identifiable" with the coverage seen.
 *
 * Error harmonics (first-order expansion of atan2, derived and checked numerically; the
 * pattern offset → once per cycle and gain → twice per cycle ripple matches the sin/cos sensor
 * literature, e.g. Hanselman, IEEE Trans. Ind. Electron. 37(6), 1990, from memory), with offsets
 * o as fractions of the radius, gain mismatch γ = b/a − 1 and skew φ:
 *   e(θ) ≈ (γ/2)·sin 2θ + (φ/2)·(1 + cos 2θ) + o_s·cos θ − o_c·sin θ  [rad]
 * so the 1st harmonic is √(o_s² + o_c²), the 2nd ½·√(γ² + φ²), and the constant φ/2.
 */
export interface PlaneFigures {
  readonly identifiable: true;
  /** Electrical angle covered by the capture, degrees (360 − the largest gap). */
  readonly coverageDeg: number;
  readonly points: number;
  /** Centre of the ellipse as a percentage of the mean radius (cos channel, sin channel). */
  readonly cosOffsetPct: number;
  readonly sinOffsetPct: number;
  /** 100·(sin amplitude / cos amplitude − 1), percent. */
  readonly gainMismatchPct: number;
  /** Skew φ of the sin channel from true quadrature, degrees (positive: s = b·sin(θ + φ)). */
  readonly nonOrthogonalityDeg: number;
  /** Mean radius (a + b)/2, peak volts. */
  readonly radiusV: number;
  /** Angle-error harmonics predicted from the channel errors, arc-minutes (amplitudes). */
  readonly predicted: { readonly constantArcmin: number; readonly firstHarmonicArcmin: number; readonly secondHarmonicArcmin: number };
  /** The fitted ellipse in channel form, for drawing: c = centreCosV + cosAmplitudeV·cos t, s = centreSinV + sinAmplitudeV·sin(t + skew). */
  readonly ellipse: { readonly centreCosV: number; readonly centreSinV: number; readonly cosAmplitudeV: number; readonly sinAmplitudeV: number; readonly skewDeg: number };
}

export interface PlaneNotIdentifiable {
  readonly identifiable: false;
  readonly coverageDeg: number;
  readonly points: number;
  /** Why: too little of the circle covered, or the fit failed (too few or degenerate points). */
  readonly reason: 'coverage' | 'fit-failed';
}

export type SinCosPlane = PlaneFigures | PlaneNotIdentifiable;

export interface SinCosPlaneOptions {
  /** Smallest electrical angle coverage for the fit, degrees; default 180. */
  readonly minCoverageDeg?: number;
}

const ARCMIN_PER_RAD = (180 * 60) / Math.PI;

/** Electrical angle covered by a set of angles: 360° minus the largest gap between them (degrees). */
export function angleCoverageDeg(angleDeg: ArrayLike<number>): number {
  const all = new Float64Array(angleDeg.length);
  let n = 0;
  for (let i = 0; i < angleDeg.length; i++) {
    const v = +angleDeg[i]!;
    if (Number.isFinite(v)) all[n++] = ((v % 360) + 360) % 360;
  }
  if (n === 0) return 0;
  // Numeric typed-array sort: one angle per carrier cycle (a comparator sort took ~0.2 s on 5e5).
  const a = all.subarray(0, n).sort();
  let gap = a[0]! + 360 - a[n - 1]!;
  for (let i = 1; i < n; i++) gap = Math.max(gap, a[i]! - a[i - 1]!);
  return 360 - gap;
}

/**
 * In-phase parts of the resolver-equivalent pair against the unit's phase:
 * Re(S·e^{−jψ}), Re(C·e^{−jψ}), peak volts per cycle.
 */
export function inPhasePair(p: SinCosPhasors, phaseLeadDeg: number): { sinIn: Float64Array; cosIn: Float64Array } {
  const psi = (phaseLeadDeg * Math.PI) / 180;
  const c = Math.cos(psi);
  const s = Math.sin(psi);
  const n = p.sinRe.length;
  const sinIn = new Float64Array(n);
  const cosIn = new Float64Array(n);
  for (let m = 0; m < n; m++) {
    sinIn[m] = p.sinRe[m]! * c + p.sinIm[m]! * s;
    cosIn[m] = p.cosRe[m]! * c + p.cosIm[m]! * s;
  }
  return { sinIn, cosIn };
}

/**
 * @param sinIn in-phase sine-channel amplitude per cycle, peak volts (signed envelope)
 * @param cosIn in-phase cosine-channel amplitude per cycle, peak volts
 * @param angleDeg decoded electrical angle per cycle, degrees (for the coverage rule)
 */
export function sinCosPlane(
  sinIn: ArrayLike<number>,
  cosIn: ArrayLike<number>,
  angleDeg: ArrayLike<number>,
  options: SinCosPlaneOptions = {},
): SinCosPlane {
  if (sinIn.length !== cosIn.length || angleDeg.length !== sinIn.length) {
    throw new RangeError(`sinCosPlane: sinIn, cosIn and angleDeg must have equal lengths (${sinIn.length}, ${cosIn.length}, ${angleDeg.length})`);
  }
  const minCoverage = options.minCoverageDeg ?? 180;
  const coverageDeg = angleCoverageDeg(angleDeg);
  if (coverageDeg < minCoverage) return { identifiable: false, coverageDeg, points: sinIn.length, reason: 'coverage' };
  const fit = ellipseFit(cosIn, sinIn);
  if (!fit.ok) return { identifiable: false, coverageDeg, points: fit.points, reason: 'fit-failed' };
  const radius = (fit.amplitudeX + fit.amplitudeY) / 2;
  const oc = fit.centreX / radius;
  const os = fit.centreY / radius;
  const gamma = fit.amplitudeY / fit.amplitudeX - 1;
  const phi = fit.skewRad;
  return {
    identifiable: true,
    coverageDeg,
    points: fit.points,
    cosOffsetPct: 100 * oc,
    sinOffsetPct: 100 * os,
    gainMismatchPct: 100 * gamma,
    nonOrthogonalityDeg: (phi * 180) / Math.PI,
    radiusV: radius,
    predicted: {
      constantArcmin: (phi / 2) * ARCMIN_PER_RAD,
      firstHarmonicArcmin: Math.hypot(os, oc) * ARCMIN_PER_RAD,
      secondHarmonicArcmin: 0.5 * Math.hypot(gamma, phi) * ARCMIN_PER_RAD,
    },
    ellipse: {
      centreCosV: fit.centreX,
      centreSinV: fit.centreY,
      cosAmplitudeV: fit.amplitudeX,
      sinAmplitudeV: fit.amplitudeY,
      skewDeg: (phi * 180) / Math.PI,
    },
  };
}
