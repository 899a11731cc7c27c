import { angleDiffDeg, unwrapDeg, wrapDeg } from '../angle/unwrapDeg.js';
import { finding, type Finding } from '../model/findings.js';

/**
 * Two-speed (coarse/fine) angle combination, e.g. a 1X/36X pair.
 *
 * The fine unit turns N times per coarse turn, so the fine angle fixes the position within one
 * of N sectors and the coarse angle picks the sector (TM 55-1905-219-14-11 and
 * TM 55-1905-220-14-11 para 5-117, 1X/36X course-indicator synchros; the analog systems switch
 * between the coarse and fine error signals, here the selection is done digitally):
 *
 *   n = round((N·θc − θf) / 360°),   θ = (360°·n + θf) / N, wrapped to [0°, 360°).
 *
 * It is right while the coarse error stays within ±180°/N (±5° for 36X). Remove any stick-off
 * (anti-stickoff) bias first: a deliberate rotation of the coarse zero, e.g. 5° for a 36X system
 * (TM 55-1905-220-14-11: 2.5 V of stick-off moves the 1X nulls 2.5°; the stator is then turned
 * 5°, equal to 180° of the 36X unit).
 *
 * A per-sample choice of n makes the combined angle jump by 360°/N wherever coarse noise or error
 * crosses the ±180°/N limit. Here n is chosen once for the whole trace instead: the fine trace is
 * unwrapped, and the cycle offset that the per-sample rule picks most often is applied to every
 * sample. The result equals the per-sample formula wherever the coarse error is inside the limit,
 * stays as smooth as the fine trace elsewhere, and the coarse error (coarse − combined) can then
 * be tested against the limit: samples beyond it are the ambiguous ones (derived; common
 * practice, no source for the tracking choice).
 */
export interface TwoSpeedAngle {
  /** Combined angle, coarse-shaft degrees in [0, 360). NaN where either input was NaN. */
  readonly deg: Float64Array;
  /** Combined angle unwrapped (coarse-shaft degrees). */
  readonly unwrappedDeg: Float64Array;
  /** Coarse (after stick-off removal) minus combined, wrapped, degrees. */
  readonly coarseErrorDeg: Float64Array;
  /** 180°/N, the largest coarse error the combination tolerates. */
  readonly limitDeg: number;
  /** Samples where |coarse error| > limit. */
  readonly ambiguousSamples: number;
  /** Largest |coarse error| (signed), degrees; NaN when no sample was usable. */
  readonly worstCoarseErrorDeg: number;
  readonly findings: readonly Finding[];
}

export interface TwoSpeedOptions {
  /** Deliberate coarse zero rotation to remove before combining, coarse degrees (subtracted). */
  readonly stickOffDeg?: number;
  readonly roles?: readonly string[];
}

/**
 * Combines per-cycle coarse and fine electrical angles (degrees) of a two-speed pair with speed
 * ratio N. Throws RangeError for arrays of different lengths or a ratio that is not an integer ≥ 1.
 */
export function combineTwoSpeed(
  coarseDeg: ArrayLike<number>,
  fineDeg: ArrayLike<number>,
  speedRatio: number,
  opts: TwoSpeedOptions = {},
): TwoSpeedAngle {
  if (coarseDeg.length !== fineDeg.length) throw new RangeError(`combineTwoSpeed: coarse and fine differ in length (${coarseDeg.length} vs ${fineDeg.length})`);
  if (!Number.isInteger(speedRatio) || speedRatio < 1) throw new RangeError(`combineTwoSpeed: speedRatio must be an integer ≥ 1, got ${speedRatio}`);
  const n = coarseDeg.length;
  const N = speedRatio;
  const stick = opts.stickOffDeg ?? 0;
  const limitDeg = 180 / N;

  // Fine trace unwrapped only over samples where both inputs are usable.
  const fineUsable = new Float64Array(n);
  for (let i = 0; i < n; i++) fineUsable[i] = Number.isFinite(coarseDeg[i]!) && Number.isFinite(fineDeg[i]!) ? fineDeg[i]! : NaN;
  const fineUnwrapped = unwrapDeg(fineUsable);

  // Per-sample cycle offsets k_i = (360·n_i + θf_i − F_i)/360 relative to the unwrapped fine trace.
  const votes = new Map<number, number>();
  for (let i = 0; i < n; i++) {
    const f = fineUsable[i]!;
    if (Number.isNaN(f)) continue;
    const c = coarseDeg[i]! - stick;
    const cycle = Math.round((N * c - f) / 360);
    const k = Math.round((360 * cycle + f - fineUnwrapped[i]!) / 360);
    votes.set(k, (votes.get(k) ?? 0) + 1);
  }
  let best = 0;
  let bestCount = -1;
  for (const [k, count] of votes) {
    if (count > bestCount || (count === bestCount && k < best)) {
      best = k;
      bestCount = count;
    }
  }

  const deg = new Float64Array(n);
  const unwrapped = new Float64Array(n);
  const coarseError = new Float64Array(n);
  let ambiguous = 0;
  let worst = NaN;
  for (let i = 0; i < n; i++) {
    const F = fineUnwrapped[i]!;
    if (Number.isNaN(F)) {
      deg[i] = NaN;
      unwrapped[i] = NaN;
      coarseError[i] = NaN;
      continue;
    }
    const u = (F + 360 * best) / N;
    unwrapped[i] = u;
    deg[i] = wrapDeg(u);
    const e = angleDiffDeg(coarseDeg[i]! - stick, u);
    coarseError[i] = e;
    if (Math.abs(e) > limitDeg) ambiguous++;
    if (!(Math.abs(e) <= Math.abs(worst))) worst = e;
  }

  const findings: Finding[] = [];
  if (ambiguous > 0) {
    findings.push(
      finding('two-speed-ambiguous', 'warning', `The coarse angle differs from the combined angle by more than ±${+limitDeg.toFixed(3)}° (180°/${N}) in ${ambiguous} cycle(s), worst ${worst.toFixed(2)}°: the fine sector may be wrong there.`, {
        advice: 'Check the coarse unit\'s zero, any stick-off bias and the speed ratio; the coarse error must stay within 180°/N for a two-speed reading.',
        roles: opts.roles ?? [],
        figures: { ambiguousCycles: ambiguous, worstCoarseErrorDeg: worst, limitDeg, speedRatio: N },
      }),
    );
  }
  return { deg, unwrappedDeg: unwrapped, coarseErrorDeg: coarseError, limitDeg, ambiguousSamples: ambiguous, worstCoarseErrorDeg: worst, findings };
}

/**
 * Speed ratio of a two-speed pair from the angles both travelled: the least-squares slope of the
 * unwrapped fine angle against the unwrapped coarse angle, rounded to an integer. Undefined when
 * the coarse travelled less than `minCoarseTravelDeg` (default 10°), when the slope is not
 * positive, or when it is not within 0.25 of an integer (common practice, no source).
 */
export function detectSpeedRatio(coarseUnwrappedDeg: ArrayLike<number>, fineUnwrappedDeg: ArrayLike<number>, minCoarseTravelDeg = 10): number | undefined {
  if (coarseUnwrappedDeg.length !== fineUnwrappedDeg.length) {
    throw new RangeError(`detectSpeedRatio: coarse and fine differ in length (${coarseUnwrappedDeg.length} vs ${fineUnwrappedDeg.length})`);
  }
  let count = 0, sc = 0, sf = 0;
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < coarseUnwrappedDeg.length; i++) {
    const c = coarseUnwrappedDeg[i]!;
    const f = fineUnwrappedDeg[i]!;
    if (!Number.isFinite(c) || !Number.isFinite(f)) continue;
    count++;
    sc += c;
    sf += f;
    lo = Math.min(lo, c);
    hi = Math.max(hi, c);
  }
  if (count < 2 || hi - lo < minCoarseTravelDeg) return undefined;
  const cm = sc / count;
  const fm = sf / count;
  let num = 0, den = 0;
  for (let i = 0; i < coarseUnwrappedDeg.length; i++) {
    const c = coarseUnwrappedDeg[i]!;
    const f = fineUnwrappedDeg[i]!;
    if (!Number.isFinite(c) || !Number.isFinite(f)) continue;
    num += (c - cm) * (f - fm);
    den += (c - cm) * (c - cm);
  }
  const ratio = num / den;
  if (!(ratio > 0.75)) return undefined;
  const r = Math.round(ratio);
  return Math.abs(ratio - r) <= 0.25 ? r : undefined;
}
