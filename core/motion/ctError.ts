import { angleDiffDeg } from '../angle/unwrapDeg.js';
import type { CyclePhasors } from '../demod/demodulateCycles.js';

/**
 * Control-transformer (CT) error signal and the tracking error between two units.
 *
 * A CT compares the electrical angle on its stator with its own shaft angle; its rotor output
 * has an amplitude ∝ sin(misalignment) and is in or out of time phase with the excitation
 * according to the direction, zero at correspondence and largest at 90° (NEETS Module 15,
 * NAVEDTRA 14187, p.1-36: 55 V at 90° in the 115 V CX–CT example). The signed error is the
 * in-phase part of the rotor phasor Z = I + jQ against the unit's time phase ψ:
 * Re(Z·e^{−jψ}) = I cos ψ + Q sin ψ; the quadrature part Im(Z·e^{−jψ}) is the residual that no
 * shaft position nulls. Near null the gradient is E_max·π/180 volts per degree (derived from
 * E = E_max·sin δ): 57.3 V → 1.000 V/°, 55 V → 0.960 V/°, 22.5 V → 0.393 V/°.
 */

/** Largest CT rotor output of a 115 V (90 V stator) system, V RMS (from memory). */
export const CT_MAX_OUTPUT_115V_V = 57.3;
/** Largest CT rotor output of a 26 V (11.8 V stator) system, V RMS (from memory). */
export const CT_MAX_OUTPUT_26V_V = 22.5;

/** Gradient near null, V RMS per degree, from the largest rotor output: E_max·π/180 (derived). */
export function ctGradientVPerDeg(maxOutputV: number): number {
  if (!(maxOutputV > 0)) throw new RangeError(`ctGradientVPerDeg: maxOutputV must be positive, got ${maxOutputV}`);
  return (maxOutputV * Math.PI) / 180;
}

/**
 * The from-memory largest CT output for a system with this excitation, V RMS: the 26 V family
 * below 60 V of excitation, the 115 V family above (common practice, no source for the split).
 */
export function defaultCtMaxOutputV(excitationRmsV: number | null | undefined): number {
  return excitationRmsV !== null && excitationRmsV !== undefined && excitationRmsV > 0 && excitationRmsV < 60 ? CT_MAX_OUTPUT_26V_V : CT_MAX_OUTPUT_115V_V;
}

export interface CtNullCrossing {
  /** Time of the zero of the in-phase error (linear interpolation between cycle centres), s. */
  readonly tS: number;
  /** +1 when the error goes from negative to positive, −1 the other way. */
  readonly direction: 1 | -1;
  /** Quadrature at the crossing (interpolated), mV RMS. */
  readonly quadratureMv: number;
}

export interface CtErrorSignal {
  /** Cycle centres, seconds from the first sample. */
  readonly tS: Float64Array;
  /** Signed in-phase error, V RMS (+ = in time phase with the unit's phase). */
  readonly inPhaseV: Float64Array;
  /** Quadrature against the unit's phase, mV RMS (signed). */
  readonly quadratureMv: Float64Array;
  /** Misalignment from the gradient, degrees (linear; good near null). */
  readonly errorDeg: Float64Array;
  readonly gradientVPerDeg: number;
  /** Where the gradient came from. */
  readonly gradientSource: 'given' | 'max-output' | 'default-115V-from-memory';
  readonly nullCrossings: readonly CtNullCrossing[];
}

export interface CtErrorOptions {
  /** Error gradient near null, V RMS per degree. */
  readonly gradientVPerDeg?: number;
  /** Largest rotor output, V RMS (gradient = E_max·π/180); used when no gradient is given. */
  readonly maxOutputV?: number;
  /**
   * Hysteresis for null crossings, mV RMS: a crossing counts only once the error has gone beyond
   * ±hysteresis on each side (Schmitt-trigger style), so noise around a static null does not
   * make a crossing every cycle. Default 0: every sign change.
   */
  readonly hysteresisMv?: number;
}

/**
 * Signed CT error per carrier cycle from the demodulated rotor channel `ctChannel` (an index into
 * `phasors.inPhase`), with ψ = `phaseRad` the unit's time-phase lead. Throws RangeError for a bad
 * channel index or gradient.
 */
export function ctErrorSignal(phasors: CyclePhasors, ctChannel: number, phaseRad: number, opts: CtErrorOptions = {}): CtErrorSignal {
  if (!Number.isInteger(ctChannel) || ctChannel < 0 || ctChannel >= phasors.inPhase.length) {
    throw new RangeError(`ctErrorSignal: channel ${ctChannel} is not one of the ${phasors.inPhase.length} demodulated channels`);
  }
  let gradient: number;
  let source: CtErrorSignal['gradientSource'];
  if (opts.gradientVPerDeg !== undefined) {
    if (!(opts.gradientVPerDeg > 0)) throw new RangeError(`ctErrorSignal: gradientVPerDeg must be positive, got ${opts.gradientVPerDeg}`);
    gradient = opts.gradientVPerDeg;
    source = 'given';
  } else if (opts.maxOutputV !== undefined) {
    gradient = ctGradientVPerDeg(opts.maxOutputV);
    source = 'max-output';
  } else {
    gradient = ctGradientVPerDeg(CT_MAX_OUTPUT_115V_V);
    source = 'default-115V-from-memory';
  }
  const hysteresisV = (opts.hysteresisMv ?? 0) / 1000;
  if (!(hysteresisV >= 0)) throw new RangeError(`ctErrorSignal: hysteresisMv must be ≥ 0, got ${opts.hysteresisMv}`);

  const count = phasors.cycleCount;
  const re = phasors.inPhase[ctChannel]!;
  const im = phasors.quadrature[ctChannel]!;
  const c = Math.cos(phaseRad);
  const s = Math.sin(phaseRad);
  const inPhaseV = new Float64Array(count);
  const quadratureMv = new Float64Array(count);
  const errorDeg = new Float64Array(count);
  for (let m = 0; m < count; m++) {
    const i = (re[m]! * c + im[m]! * s) / Math.SQRT2;
    const q = (im[m]! * c - re[m]! * s) / Math.SQRT2;
    inPhaseV[m] = i;
    quadratureMv[m] = q * 1000;
    errorDeg[m] = i / gradient;
  }
  const tS = Float64Array.from(phasors.centreS.subarray(0, count));
  return { tS, inPhaseV, quadratureMv, errorDeg, gradientVPerDeg: gradient, gradientSource: source, nullCrossings: nullCrossings(tS, inPhaseV, quadratureMv, hysteresisV) };
}

/**
 * Zero crossings of `v` with linearly interpolated times; NaN cycles are skipped. A crossing is
 * reported when the signal, having been beyond the hysteresis on one side, gets beyond it on the
 * other; its time is that of the last sign change in between.
 */
function nullCrossings(t: Float64Array, v: Float64Array, qMv: Float64Array, hysteresisV: number): CtNullCrossing[] {
  const out: CtNullCrossing[] = [];
  let side = 0; // side of the last excursion beyond the hysteresis (0: none yet)
  let prev = -1; // last finite sample
  let pending: CtNullCrossing | undefined; // last sign change since that excursion
  for (let m = 0; m < v.length; m++) {
    const x = v[m]!;
    if (!Number.isFinite(x) || !Number.isFinite(t[m]!)) continue;
    if (prev >= 0) {
      const x0 = v[prev]!;
      if ((x0 < 0 && x >= 0) || (x0 > 0 && x <= 0)) {
        const f = x0 / (x0 - x);
        pending = {
          tS: t[prev]! + f * (t[m]! - t[prev]!),
          direction: x0 < 0 ? 1 : -1,
          quadratureMv: qMv[prev]! + f * (qMv[m]! - qMv[prev]!),
        };
      }
    }
    prev = m;
    const sign = x > hysteresisV ? 1 : x < -hysteresisV ? -1 : 0;
    if (sign !== 0) {
      if (side !== 0 && sign !== side && pending !== undefined && pending.direction === sign) out.push(pending);
      side = sign;
      pending = undefined;
    }
  }
  return out;
}

/**
 * Time-phase lead of a CT rotor output from its own phasors, radians in (−π/2, π/2]: the
 * principal axis of the (I, Q) points, ½·atan2(2ΣIQ, Σ(I² − Q²)) (a signed error signal lies on
 * one line through the origin; total least squares through the origin, Pearson 1901, from memory).
 * The axis is known only modulo π, so a lead under 90° is assumed (synchro leads are a few
 * degrees to tens of degrees). Undefined when the output never leaves the noise enough to show an
 * axis (the two principal spreads within 10 % of each other).
 */
export function estimateCtPhaseRad(phasors: CyclePhasors, ctChannel: number): number | undefined {
  if (!Number.isInteger(ctChannel) || ctChannel < 0 || ctChannel >= phasors.inPhase.length) {
    throw new RangeError(`estimateCtPhaseRad: channel ${ctChannel} is not one of the ${phasors.inPhase.length} demodulated channels`);
  }
  const re = phasors.inPhase[ctChannel]!;
  const im = phasors.quadrature[ctChannel]!;
  let sii = 0, sqq = 0, siq = 0;
  for (let m = 0; m < phasors.cycleCount; m++) {
    const i = re[m]!;
    const q = im[m]!;
    if (!Number.isFinite(i) || !Number.isFinite(q)) continue;
    sii += i * i;
    sqq += q * q;
    siq += i * q;
  }
  const diff = sii - sqq;
  const r = Math.hypot(diff, 2 * siq); // λ1 − λ2
  const total = sii + sqq; // λ1 + λ2
  if (!(total > 0) || r < 0.1 * total) return undefined;
  let psi = 0.5 * Math.atan2(2 * siq, diff);
  if (psi <= -Math.PI / 2) psi += Math.PI;
  return psi;
}

export interface TrackingError {
  /** a − b per cycle, wrapped to (−180, 180], degrees. */
  readonly diffDeg: Float64Array;
  readonly meanArcmin: number;
  /** RMS of the difference (mean included), arcmin. */
  readonly rmsArcmin: number;
  /** Largest |difference|, arcmin. */
  readonly maxAbsArcmin: number;
  /** Cycles where both angles were finite. */
  readonly samples: number;
}

/**
 * Tracking (correspondence) error between two units in one capture, e.g. a transmitter and the
 * receiver following it: the wrapped difference a − b per cycle (degrees), with mean, RMS and
 * largest value in arc-minutes (common practice, no source).
 */
export function trackingError(angleADeg: ArrayLike<number>, angleBDeg: ArrayLike<number>): TrackingError {
  if (angleADeg.length !== angleBDeg.length) throw new RangeError(`trackingError: traces differ in length (${angleADeg.length} vs ${angleBDeg.length})`);
  const diffDeg = new Float64Array(angleADeg.length);
  let n = 0, sum = 0, sum2 = 0, max = 0;
  for (let i = 0; i < angleADeg.length; i++) {
    const d = angleDiffDeg(angleADeg[i]!, angleBDeg[i]!);
    diffDeg[i] = d;
    if (!Number.isFinite(d)) continue;
    n++;
    sum += d;
    sum2 += d * d;
    max = Math.max(max, Math.abs(d));
  }
  return {
    diffDeg,
    meanArcmin: n ? (sum / n) * 60 : NaN,
    rmsArcmin: n ? Math.sqrt(sum2 / n) * 60 : NaN,
    maxAbsArcmin: n ? max * 60 : NaN,
    samples: n,
  };
}
