import type { UnitAngle } from './model/analysis.js';
import type { Finding } from './model/findings.js';
import { analyzeAccuracyRun, type AccuracyRun } from './motion/accuracyRun.js';
import type { MotionAnalysis } from './motion/analyzeMotion.js';
import { analyzeContinuousAccuracy, type ContinuousAccuracy } from './motion/continuousAccuracy.js';

export interface AccuracyOptions {
  readonly classArcmin?: number;
  readonly stepDeg?: number;
  readonly nominalDeg?: readonly number[];
}

/**
 * The accuracy run a capture holds, if any: stops of a dividing head (stepped run), else a
 * constant-speed turn of at least 360° (continuous run). Static or irregular traces give null and
 * no findings.
 */
export function analyzeAccuracy(
  angle: UnitAngle,
  motion: MotionAnalysis,
  options: AccuracyOptions,
  roles: readonly string[],
): { accuracy: AccuracyRun | ContinuousAccuracy | null; findings: Finding[] } {
  const kinds = new Set(motion.segments.map((s) => s.kind));
  const stationary = motion.segments.filter((s) => s.kind === 'stationary').length;
  if (stationary >= 3 && kinds.has('moving')) {
    const run = (nominal?: readonly number[]) =>
      analyzeAccuracyRun(angle.t, angle.unwrappedDeg, {
        ...(nominal ? { nominalDeg: nominal } : {}),
        ...(options.classArcmin !== undefined ? { accuracyClassArcmin: options.classArcmin } : {}),
        roles,
      });
    let result = run(options.nominalDeg);
    if (result.accuracy && !options.nominalDeg && options.stepDeg !== undefined) {
      // A given increment: stops at whole multiples of it, in the direction the run went.
      const step = options.stepDeg;
      const positions = result.accuracy.positions;
      const direction = positions.length > 1 && positions[positions.length - 1]!.measuredDeg < positions[0]!.measuredDeg ? -1 : 1;
      const start = Math.round(positions[0]!.measuredDeg / step) * step;
      result = run(positions.map((_, k) => (((start + direction * k * step) % 360) + 360) % 360));
    }
    if (result.accuracy) return { accuracy: result.accuracy, findings: [...result.findings] };
  }
  if (kinds.has('ramp')) {
    const continuous = analyzeContinuousAccuracy(angle.t, angle.unwrappedDeg, { roles });
    if (continuous.accuracy) return { accuracy: continuous.accuracy, findings: [...continuous.findings] };
  }
  return { accuracy: null, findings: [] };
}
