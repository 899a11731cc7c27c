import type { Finding } from './findings.js';

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
  /** The primary angle trace (first unit with an angle), one point per carrier cycle. */
  readonly angle: UnitAngle | null;
  readonly units: readonly UnitResult[];
  readonly findings: readonly Finding[];
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
    readonly inPhaseMv: number;
    readonly quadratureMv: number;
    readonly harmonicMv: number;
    readonly totalMv: number;
  }[];
  readonly angle: UnitAngle | null;
}
