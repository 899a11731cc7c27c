import type { Finding } from './findings.js';
import type { LineRepairAction } from '../diagnostics/repairLines.js';
import type { SinCosPlane } from '../diagnostics/sinCosPlane.js';
import type { MotionAnalysis } from '../motion/analyzeMotion.js';
import type { AccuracyRun } from '../motion/accuracyRun.js';
import type { ContinuousAccuracy } from '../motion/continuousAccuracy.js';
import type { CtErrorSignal } from '../motion/ctError.js';

/** Everything one analysis produced; the JSON report (schema statorscope.analysis/1) is built from it. */
export interface Analysis {
  readonly input: {
    readonly sampleRateHz: number;
    readonly samples: number;
    readonly startS: number;
    readonly channels: readonly {
      readonly column: number;
      readonly label: string;
      readonly role: string | null;
      readonly unit: string;
      readonly clippedFraction: number;
    }[];
  };
  readonly carrier: {
    readonly source: 'reference' | 'stators';
    readonly frequencyHz: number;
    readonly startHz: number;
    readonly endHz: number;
    /** IEEE 1057 four-parameter fit on the reference (null without a reference). */
    readonly sineFitHz: number | null;
    readonly referenceRmsV: number | null;
    readonly cycles: number;
    readonly samplesPerCycle: number;
  };
  /** The primary angle trace (first unit with an angle, or a two-speed set's combined angle), one point per carrier cycle. */
  readonly angle: UnitAngle | null;
  readonly units: readonly UnitResult[];
  /** Motion of the primary angle trace: segments, velocity, jitter, steps. */
  readonly motion: MotionAnalysis | null;
  /** Accuracy run over the primary trace (stepped stops or a constant-speed turn), when the capture holds one. */
  readonly accuracy: AccuracyRun | ContinuousAccuracy | null;
  /** A coarse/fine pair combined into one angle. */
  readonly twoSpeed: TwoSpeedResult | null;
  /** Two units that are not a two-speed pair: how well the second follows the first. */
  readonly tracking: TrackingResult | null;
  readonly findings: readonly Finding[];
}

export interface TrackingResult {
  readonly a: string;
  readonly b: string;
  readonly meanArcmin: number;
  readonly rmsArcmin: number;
  readonly maxAbsArcmin: number;
  /** b minus a per cycle, wrapped, degrees. */
  readonly diffDeg: Float64Array;
}

export interface TwoSpeedResult {
  readonly coarseId: string;
  readonly fineId: string;
  readonly speedRatio: number;
  readonly speedRatioSource: 'given' | 'label' | 'detected';
  readonly stickOffDeg: number;
  /** 180°/N: the largest coarse error the combination tolerates, degrees. */
  readonly limitDeg: number;
  readonly ambiguousCycles: number;
  readonly worstCoarseErrorDeg: number;
  /** Coarse minus combined, degrees, per cycle. */
  readonly coarseErrorDeg: Float64Array;
}

export interface UnitAngle {
  /** Time of each estimate, seconds from the first sample. */
  readonly t: Float64Array;
  /** Electrical angle, degrees CCW from electrical zero, in [0, 360). */
  readonly deg: Float64Array;
  readonly unwrappedDeg: Float64Array;
  /** True when the angle is known only modulo 180° (no reference channel). */
  readonly ambiguous180: boolean;
}

export interface LineResult {
  readonly role: string;
  /** Largest RMS amplitude of the line's fundamental over the record, volts. */
  readonly maxRmsV: number;
  /** Median quadrature of the line against the unit's phase, mV RMS (signed). */
  readonly quadratureMv: number;
  /** Harmonic content and THD: measured by the diagnostics stage; null until then. */
  readonly harmonicMv: number | null;
  readonly thdPct: number | null;
}

export interface UnitResult {
  readonly id: string;
  readonly kind: 'synchro' | 'resolver' | 'ct';
  readonly roles: readonly string[];
  /** Stator maximum line-to-line over excitation, fundamental RMS ratio; null without reference. */
  readonly transformationRatio: number | null;
  /** Time-phase lead of the stator output over the excitation, degrees; null without reference. */
  readonly phaseLeadDeg: number | null;
  /** How the sine/cosine pair was formed: three-lines, two-lines, resolver; null for a CT. */
  readonly method: string | null;
  readonly lines: readonly LineResult[];
  readonly nulls: readonly {
    readonly role: string;
    readonly angleDeg: number;
    readonly tS: number;
    readonly inPhaseMv: number;
    readonly quadratureMv: number;
    readonly harmonicMv: number;
    readonly totalMv: number;
  }[];
  readonly angle: UnitAngle | null;
  /** The standard family the transformation ratio matches, if any. */
  readonly family: { readonly name: string; readonly nominalRatio: number; readonly deviationPct: number } | null;
  /** Sine/cosine plane (Lissajous) figures, when the capture covers enough angle. */
  readonly plane: SinCosPlane | null;
  /** Lines dropped or rescaled before the angle was solved (dead line, wrong probe factor). */
  readonly repairs: readonly LineRepairAction[];
  /** False when wiring faults leave the decoded angle meaningless (shorted lines, open lead). */
  readonly angleValid: boolean;
  /** A control transformer's error output, per cycle. */
  readonly ctError: CtErrorSignal | null;
}
