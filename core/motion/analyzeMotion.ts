import { finding, type Finding } from '../model/findings.js';
import { analyzeJitter, huntingFinding, type JitterOptions, type JitterResult } from './analyzeJitter.js';
import { detectSteps } from './detectSteps.js';
import { estimateVelocity } from './estimateVelocity.js';
import { measureStep, type StepOptions, type StepResult } from './measureStep.js';
import { segmentMotionDetailed, type MotionSegment, type MotionThresholds, type SegmentOptions } from './segmentMotion.js';

/** Options of {@link analyzeMotion}. */
export interface MotionOptions {
  /** Channel roles the findings concern (e.g. the unit's stator roles). */
  readonly roles?: readonly string[];
  /** Window of the reported velocity, seconds (default 0.02 s, at least 3 points). */
  readonly velocityWindowS?: number;
  readonly segment?: SegmentOptions;
  readonly jitter?: JitterOptions;
  readonly step?: Omit<StepOptions, 'noiseDeg'>;
}

/** Motion analysis of one angle trace, as plain data. */
export interface MotionAnalysis {
  /** Stationary / moving / ramp segments tiling the trace. */
  readonly segments: MotionSegment[];
  /** Velocity of every point, deg/s (least-squares slope, {@link estimateVelocity}); NaN where unknown. */
  readonly velocityDegPerS: Float64Array;
  /** Jitter over the stationary part (null when there is none long enough). */
  readonly jitter: JitterResult | null;
  readonly steps: StepResult[];
  /** The thresholds the segmentation derived from the trace (null for a trace too short to tell). */
  readonly thresholds: MotionThresholds | null;
  readonly findings: Finding[];
}

/**
 * Motion analysis of an angle trace (one point per carrier cycle): velocity, segmentation into
 * stationary / moving / constant-speed parts ({@link segmentMotion}), step-response figures of
 * every step between two stationary levels ({@link detectSteps}, {@link measureStep}), and
 * jitter of the stationary part ({@link analyzeJitter}) with a `hunting` finding for a
 * sustained oscillation.
 *
 * Jitter after a step leaves out the ringing tail: the stationary segment that follows a step
 * is analysed from tS + settlingS·max(1, ln(|step|/σ)/ln(1/band)) on (for an exponential decay
 * that is where the envelope, 2 % of the step at the settling time, has fallen to the noise σ;
 * common practice, no source), and not at all when the step never settles.
 *
 * Spectra are as seen through the demodulator (its one-cycle boxcar is not divided out).
 * Never throws on data: short, empty or NaN-laden traces give empty lists and null figures.
 * Throws RangeError only when `t` and `unwrappedDeg` differ in length.
 *
 * @param t            time of each point, s
 * @param unwrappedDeg electrical angle of each point, degrees, unwrapped (NaN for bad cycles)
 */
export function analyzeMotion(t: ArrayLike<number>, unwrappedDeg: ArrayLike<number>, opts: MotionOptions = {}): MotionAnalysis {
  if (t.length !== unwrappedDeg.length) {
    throw new RangeError(`analyzeMotion: t and unwrappedDeg lengths differ (${t.length} vs ${unwrappedDeg.length})`);
  }
  const roles = opts.roles ?? [];
  const velocityDegPerS = estimateVelocity(t, unwrappedDeg, opts.velocityWindowS !== undefined ? { windowS: opts.velocityWindowS } : {});
  const { segments, thresholds } = segmentMotionDetailed(t, unwrappedDeg, opts.segment);
  const findings: Finding[] = [];
  if (segments.length === 0 || thresholds === null) {
    return { segments, velocityDegPerS, jitter: null, steps: [], thresholds, findings };
  }

  const steps: StepResult[] = [];
  const jitterSegments: (MotionSegment | null)[] = segments.slice();
  for (const w of detectSteps(t, unwrappedDeg, segments)) {
    const step = measureStep(t, unwrappedDeg, w, { ...opts.step, noiseDeg: thresholds.noiseDeg });
    const after = segments[w.afterSegment]!;
    if (step === null) {
      jitterSegments[w.afterSegment] = null;
      continue;
    }
    steps.push(step);
    if (step.settlingS === null) {
      jitterSegments[w.afterSegment] = null;
      findings.push(
        finding('step-unsettled', 'info', `The step at ${step.tS.toFixed(3)} s from ${step.fromDeg.toFixed(2)}° to ${step.toDeg.toFixed(2)}° does not stay within ±${step.settlingBandPct} % of its size before the record ends.`, {
          advice: 'Record longer after the step to measure its settling time.',
          roles,
          figures: { tS: step.tS, fromDeg: step.fromDeg, toDeg: step.toDeg },
        }),
      );
      continue;
    }
    const band = step.settlingBandPct / 100;
    const decay = Math.log(Math.abs(step.sizeDeg) / thresholds.noiseDeg) / Math.log(1 / band);
    const guardEndS = step.tS + step.settlingS * Math.max(1, decay);
    let k = after.startIndex;
    while (k < after.endIndex && !(t[k]! >= guardEndS)) k++;
    jitterSegments[w.afterSegment] = k < after.endIndex ? { ...after, startIndex: k, startS: t[k]! } : null;
  }
  const jitter = analyzeJitter(
    t,
    unwrappedDeg,
    jitterSegments.filter((s): s is MotionSegment => s !== null),
    opts.jitter,
  );
  if (jitter?.hunting) findings.push(huntingFinding(jitter.hunting, roles, jitter.source));
  return { segments, velocityDegPerS, jitter, steps, thresholds, findings };
}
