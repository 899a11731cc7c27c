/**
 * Shaft motions for synthetic captures, as plain data (so a spec can be saved as JSON).
 * All angles are electrical degrees, counter-clockwise positive; times in seconds from the
 * first sample.
 */
export type MotionSpec =
  | { readonly type: 'static'; readonly deg: number }
  | { readonly type: 'ramp'; readonly startDeg: number; readonly degPerS: number }
  | {
      readonly type: 'step';
      readonly fromDeg: number;
      readonly toDeg: number;
      readonly atS: number;
      /** Second-order response: damping ratio and natural frequency (Hz). Omit for an ideal step. */
      readonly dampingRatio?: number;
      readonly naturalHz?: number;
    }
  | {
      readonly type: 'wobble';
      readonly centreDeg: number;
      readonly amplitudeDeg: number;
      readonly frequencyHz: number;
      readonly phaseDeg?: number;
    }
  | { readonly type: 'sum'; readonly parts: readonly MotionSpec[] };

/** Electrical angle in degrees (not wrapped) at time `tS`. */
export function motionAngleDeg(spec: MotionSpec, tS: number): number {
  switch (spec.type) {
    case 'static':
      return spec.deg;
    case 'ramp':
      return spec.startDeg + spec.degPerS * tS;
    case 'step': {
      if (tS < spec.atS) return spec.fromDeg;
      const size = spec.toDeg - spec.fromDeg;
      if (spec.dampingRatio === undefined || spec.naturalHz === undefined) return spec.toDeg;
      return spec.fromDeg + size * secondOrderStep(tS - spec.atS, spec.dampingRatio, 2 * Math.PI * spec.naturalHz);
    }
    case 'wobble':
      return (
        spec.centreDeg +
        spec.amplitudeDeg * Math.sin(2 * Math.PI * spec.frequencyHz * tS + ((spec.phaseDeg ?? 0) * Math.PI) / 180)
      );
    case 'sum': {
      let total = 0;
      for (const part of spec.parts) total += motionAngleDeg(part, tS);
      return total;
    }
  }
}

/**
 * Unit step response of a second-order system with damping ratio `zeta` and natural
 * frequency `omegaN` (rad/s); standard closed forms (e.g. Ogata, Modern Control Engineering, ch. 5).
 */
export function secondOrderStep(tS: number, zeta: number, omegaN: number): number {
  if (tS <= 0) return 0;
  if (zeta < 1) {
    const wd = omegaN * Math.sqrt(1 - zeta * zeta);
    const phi = Math.acos(zeta);
    return 1 - (Math.exp(-zeta * omegaN * tS) / Math.sqrt(1 - zeta * zeta)) * Math.sin(wd * tS + phi);
  }
  if (zeta === 1) return 1 - Math.exp(-omegaN * tS) * (1 + omegaN * tS);
  const s = Math.sqrt(zeta * zeta - 1);
  const p1 = omegaN * (zeta - s);
  const p2 = omegaN * (zeta + s);
  return 1 - (p2 * Math.exp(-p1 * tS) - p1 * Math.exp(-p2 * tS)) / (p2 - p1);
}
