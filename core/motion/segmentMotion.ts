import { estimateAngleNoiseDeg } from './estimateAngleNoise.js';
import { estimateVelocity, velocityWindowPoints } from './estimateVelocity.js';
import { fitLine } from './fitLine.js';
import { medianIntervalS, medianOf, scaledMadOf } from './robustStats.js';

/** What the shaft does over one segment of an angle trace. */
export type MotionKind = 'stationary' | 'moving' | 'ramp';

/** One segment of an angle trace: points `[startIndex, endIndex)` (end exclusive, as `subarray`). */
export interface MotionSegment {
  readonly startIndex: number;
  readonly endIndex: number;
  /** Time of the first and of the last point of the segment, s. */
  readonly startS: number;
  readonly endS: number;
  readonly kind: MotionKind;
  /** Mean of the finite angles in the segment, degrees. */
  readonly meanDeg: number;
  /** Least-squares slope over the segment, degrees per second (near 0 when stationary). */
  readonly degPerS: number;
}

/** Options of {@link segmentMotion}; every threshold is derived from the trace unless given. */
export interface SegmentOptions {
  /** Velocity smoothing window, seconds (default 0.05 s, at least 5 points). */
  readonly velocityWindowS?: number;
  /** Angle noise per point, degrees RMS (default: {@link estimateAngleNoiseDeg} of the trace). */
  readonly noiseDeg?: number;
  /** |velocity| above which a stationary shaft starts moving, deg/s (default max(6 σ_v, 3 s_v), see {@link motionThresholds}). */
  readonly onDegPerS?: number;
  /** |velocity| below which a moving shaft may stop, deg/s (default half of `onDegPerS`). */
  readonly offDegPerS?: number;
  /** A pause shorter than this between two moves belongs to the move, s (default 0.1 s). */
  readonly minStationaryS?: number;
  /** A move must change the level by at least this much, degrees (default max(20 σ, 0.1°)). */
  readonly minExcursionDeg?: number;
  /**
   * A back-and-forth run with no net move is kept as motion (not jitter) when its range
   * exceeds this, degrees (default 2°).
   */
  readonly maxOscillationDeg?: number;
}

/** The thresholds {@link segmentMotion} used, all derived from the trace unless overridden. */
export interface MotionThresholds {
  /** Typical point spacing, s. */
  readonly intervalS: number;
  /** Angle noise per point, degrees RMS. */
  readonly noiseDeg: number;
  /** Velocity window, points. */
  readonly velocityPoints: number;
  /** Noise of the velocity estimate, deg/s RMS: σ·√(12/(M(M²−1)))/Δt (least-squares slope variance). */
  readonly velocityNoiseDegPerS: number;
  /** Robust spread of the velocity over the trace, 1.4826·MAD, deg/s. */
  readonly velocitySpreadDegPerS: number;
  readonly onDegPerS: number;
  readonly offDegPerS: number;
  readonly minStationaryS: number;
  readonly minExcursionDeg: number;
  readonly maxOscillationDeg: number;
}

/** Default velocity window of the segmentation, seconds. */
export const SEGMENT_VELOCITY_WINDOW_S = 0.05;

/**
 * Thresholds for {@link segmentMotion} on this trace (null when the trace has too few finite
 * points to estimate its noise). Velocity thresholds: enter "moving" above
 * max(6 σ_v, 3 s_v) and leave below half of that (hysteresis). σ_v is the velocity noise that
 * white angle noise σ produces; s_v = 1.4826·MAD of the velocity itself is its robust spread,
 * which is larger when the angle oscillates (hunting): a sinusoid of peak velocity V has
 * s_v ≈ 1.05 V, so an oscillation never starts a move by itself. The Gaussian tail beyond 6 σ is
 * 2·10⁻⁹, so noise alone practically never starts one either (common practice, no source for
 * the factors).
 */
export function motionThresholds(t: ArrayLike<number>, deg: ArrayLike<number>, opts: SegmentOptions = {}): MotionThresholds | null {
  return deriveThresholds(t, deg, opts)?.thresholds ?? null;
}

function deriveThresholds(t: ArrayLike<number>, deg: ArrayLike<number>, opts: SegmentOptions): { thresholds: MotionThresholds; velocity: Float64Array } | null {
  const n = deg.length;
  const intervalS = medianIntervalS(t);
  const noiseDeg = opts.noiseDeg ?? estimateAngleNoiseDeg(deg);
  if (!(intervalS > 0) || !(noiseDeg > 0) || n < 3) return null;
  const points = Math.max(5, velocityWindowPoints(opts.velocityWindowS ?? SEGMENT_VELOCITY_WINDOW_S, intervalS));
  const velocity = estimateVelocity(t, deg, { points: Math.min(points, n % 2 === 1 ? n : n - 1) });
  const velocityNoise = (noiseDeg * Math.sqrt(12 / (points * (points * points - 1)))) / intervalS;
  const spread = scaledMadOf(velocity);
  const on = opts.onDegPerS ?? Math.max(6 * velocityNoise, Number.isFinite(spread) ? 3 * spread : 0);
  const off = opts.offDegPerS ?? on / 2;
  return {
    velocity,
    thresholds: {
      intervalS,
      noiseDeg,
      velocityPoints: points,
      velocityNoiseDegPerS: velocityNoise,
      velocitySpreadDegPerS: spread,
      onDegPerS: on,
      offDegPerS: Math.min(off, on),
      minStationaryS: opts.minStationaryS ?? 0.1,
      minExcursionDeg: opts.minExcursionDeg ?? Math.max(20 * noiseDeg, 0.1),
      maxOscillationDeg: opts.maxOscillationDeg ?? 2,
    },
  };
}

interface Run {
  start: number;
  end: number;
  moving: boolean;
}

/**
 * Splits an angle trace into stationary, moving and constant-speed ('ramp') segments.
 *
 * 1. Velocity: least-squares slope over a 50 ms window ({@link estimateVelocity}).
 * 2. Hysteresis: a point starts a move when |v| > on and the move lasts until |v| < off
 *    (thresholds from {@link motionThresholds}; NaN points keep the current state).
 * 3. A pause shorter than `minStationaryS` between two moves joins them (ringing after a step
 *    slows through zero velocity at every peak); so does one at either end of the record (too
 *    short to hold a level, so a step that close to an end is not measured).
 * 4. A move that changes the level by less than `minExcursionDeg` is not a move: it is an
 *    oscillation about a stationary level (jitter, hunting), unless its range exceeds
 *    `maxOscillationDeg`. The levels before and after are the medians of up to
 *    `minStationaryS / 2` of the neighbouring stationary points (the run's own mean at an end
 *    of the record). Conversely a stationary stretch whose range exceeds `maxOscillationDeg`
 *    is motion.
 * 5. A move that lasts at least max(0.5 s, `minStationaryS`, four velocity windows) and is
 *    straight — its line fit leaves an RMS residual below max(3 σ, 2 % of its travel), or the slopes
 *    fitted to each quarter of it are all within ±30 % of the overall slope (a constant-speed
 *    drive with jitter on it) — is a 'ramp'; a stationary stretch whose fitted drift reaches
 *    `minExcursionDeg` with a residual below max(3 σ, 5 % of the drift) is a slow 'ramp' too.
 * (Velocity thresholding with hysteresis and a minimum duration: common practice, no source;
 * the factors were tuned on synthetic traces.)
 *
 * Adjacent segments tile the trace: the first starts at 0, each ends where the next starts,
 * the last ends at N. Returns [] when the trace has fewer than 8 finite points. Never throws on
 * data; throws RangeError only when `t` and `deg` differ in length.
 */
export function segmentMotion(t: ArrayLike<number>, deg: ArrayLike<number>, opts: SegmentOptions = {}): MotionSegment[] {
  return segmentMotionDetailed(t, deg, opts).segments;
}

/** {@link segmentMotion} together with the thresholds it derived (null when it returned []). */
export function segmentMotionDetailed(
  t: ArrayLike<number>,
  deg: ArrayLike<number>,
  opts: SegmentOptions = {},
): { segments: MotionSegment[]; thresholds: MotionThresholds | null } {
  if (t.length !== deg.length) throw new RangeError(`segmentMotion: t and deg lengths differ (${t.length} vs ${deg.length})`);
  const n = deg.length;
  let finite = 0;
  for (let i = 0; i < n; i++) if (Number.isFinite(deg[i]!) && Number.isFinite(t[i]!)) finite++;
  if (finite < 8) return { segments: [], thresholds: null };
  const derived = deriveThresholds(t, deg, opts);
  if (derived === null) return { segments: [], thresholds: null };
  const th = derived.thresholds;
  const v = derived.velocity;

  // 2. Hysteresis.
  const runs: Run[] = [];
  let state = false;
  for (let i = 0; i < n; i++) {
    const a = Math.abs(v[i]!);
    if (Number.isFinite(a) && Number.isFinite(deg[i]!)) {
      if (!state && a > th.onDegPerS) state = true;
      else if (state && a < th.offDegPerS) state = false;
    }
    const last = runs[runs.length - 1];
    if (last && last.moving === state) last.end = i + 1;
    else runs.push({ start: i, end: i + 1, moving: state });
  }

  // 3. Short pauses between moves join the moves.
  const durationS = (r: Run): number => spanS(t, r.start, r.end);
  for (let k = 1; k + 1 < runs.length; k++) {
    const r = runs[k]!;
    if (!r.moving && runs[k - 1]!.moving && runs[k + 1]!.moving && durationS(r) < th.minStationaryS) r.moving = true;
  }
  // A pause at either end of the record too short to hold a level joins the move next to it.
  if (runs.length > 1) {
    const first = runs[0]!;
    const last = runs[runs.length - 1]!;
    if (!first.moving && runs[1]!.moving && durationS(first) < th.minStationaryS) first.moving = true;
    if (!last.moving && runs[runs.length - 2]!.moving && durationS(last) < th.minStationaryS) last.moving = true;
  }
  let merged = mergeRuns(runs);

  // 4. Moves without a net change of level are oscillations about a stationary level.
  const levelPoints = Math.max(3, Math.round((0.5 * th.minStationaryS) / th.intervalS));
  for (let k = 0; k < merged.length; k++) {
    const r = merged[k]!;
    if (!r.moving) continue;
    const prev = merged[k - 1];
    const next = merged[k + 1];
    const own = fitLine(t, deg, r.start, r.end).meanDeg;
    const before = prev ? medianOf(deg, Math.max(prev.start, prev.end - levelPoints), prev.end) : own;
    const after = next ? medianOf(deg, next.start, Math.min(next.end, next.start + levelPoints)) : own;
    const net = Math.abs(after - before);
    if (!(net >= th.minExcursionDeg) && !(rangeOf(deg, r.start, r.end) > th.maxOscillationDeg)) r.moving = false;
  }
  // A "pause" whose angle spans more than maxOscillationDeg is not at rest (a slow drive, a
  // large sweep): it is motion.
  for (const r of merged) if (!r.moving && rangeOf(deg, r.start, r.end) > th.maxOscillationDeg) r.moving = true;
  merged = mergeRuns(merged);

  // 5. Kinds and figures.
  // A straight move shorter than this between two rests is a slew: measured as a step.
  const minRampS = Math.max(0.5, th.minStationaryS, 4 * th.velocityPoints * th.intervalS);
  const segments = merged.map((r): MotionSegment => {
    const line = fitLine(t, deg, r.start, r.end);
    const dur = durationS(r);
    const travel = Math.abs(line.degPerS) * dur;
    let kind: MotionKind;
    if (r.moving) {
      const straight = line.residualRmsDeg <= Math.max(3 * th.noiseDeg, 0.02 * travel) || steadySlope(t, deg, r.start, r.end, line.degPerS);
      kind = dur >= minRampS && straight ? 'ramp' : 'moving';
    } else {
      kind = travel >= th.minExcursionDeg && line.residualRmsDeg <= Math.max(3 * th.noiseDeg, 0.05 * travel) ? 'ramp' : 'stationary';
    }
    return {
      startIndex: r.start,
      endIndex: r.end,
      startS: t[r.start]!,
      endS: t[r.end - 1]!,
      kind,
      meanDeg: line.meanDeg,
      degPerS: line.count >= 2 ? line.degPerS : 0,
    };
  });
  return { segments, thresholds: th };
}

function mergeRuns(runs: readonly Run[]): Run[] {
  const out: Run[] = [];
  for (const r of runs) {
    const last = out[out.length - 1];
    if (last && last.moving === r.moving) last.end = r.end;
    else out.push({ ...r });
  }
  return out;
}

function spanS(t: ArrayLike<number>, start: number, end: number): number {
  let a = NaN;
  let b = NaN;
  for (let i = start; i < end; i++) if (Number.isFinite(t[i]!)) { a = t[i]!; break; }
  for (let i = end - 1; i >= start; i--) if (Number.isFinite(t[i]!)) { b = t[i]!; break; }
  return Number.isFinite(a) && Number.isFinite(b) ? b - a : 0;
}

function rangeOf(x: ArrayLike<number>, start: number, end: number): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = start; i < end; i++) {
    const v = x[i]!;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return hi >= lo ? hi - lo : 0;
}

/** True when the least-squares slopes of the four quarters of [start, end) are all within ±30 % of `slope`. */
function steadySlope(t: ArrayLike<number>, deg: ArrayLike<number>, start: number, end: number, slope: number): boolean {
  if (!(Math.abs(slope) > 0) || end - start < 16) return false;
  for (let q = 0; q < 4; q++) {
    const a = start + Math.floor(((end - start) * q) / 4);
    const b = start + Math.floor(((end - start) * (q + 1)) / 4);
    const s = fitLine(t, deg, a, b).degPerS;
    if (!(Math.abs(s - slope) <= 0.3 * Math.abs(slope))) return false;
  }
  return true;
}
