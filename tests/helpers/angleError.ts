import { angleDiffDeg } from '../../core/angle/unwrapDeg.js';
import type { UnitAngle } from '../../core/model/analysis.js';

/** RMS and worst wrapped difference between a decoded angle trace and the truth, degrees. */
export function angleError(angle: UnitAngle, truthDeg: (tS: number) => number, skipEdgeCycles = 0): { rmsDeg: number; maxDeg: number; meanDeg: number } {
  let sum = 0;
  let sum2 = 0;
  let max = 0;
  let n = 0;
  for (let m = skipEdgeCycles; m < angle.deg.length - skipEdgeCycles; m++) {
    const e = angleDiffDeg(angle.deg[m]!, truthDeg(angle.t[m]!));
    sum += e;
    sum2 += e * e;
    max = Math.max(max, Math.abs(e));
    n++;
  }
  return { rmsDeg: Math.sqrt(sum2 / n), maxDeg: max, meanDeg: sum / n };
}

/**
 * The per-cycle lock-in noise limit √(2/Nw)·σ/(kE) in degrees (least-squares amplitude variance
 * 2σ²/N of Kay 1993 ch.3, propagated through atan2), with σ the white noise plus the uniform
 * quantisation noise LSB/√12 of the stator channels.
 */
export function angleNoiseBoundDeg(samplesPerCycle: number, noiseV: number, peakV: number, bits?: number): number {
  const lsb = bits === undefined ? 0 : (2 * 1.1 * peakV) / 2 ** bits;
  const sigma = Math.hypot(noiseV, lsb / Math.sqrt(12));
  return Math.sqrt(2 / samplesPerCycle) * (sigma / peakV) * (180 / Math.PI);
}
