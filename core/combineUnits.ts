import { finding, type Finding } from './model/findings.js';
import type { TrackingResult, TwoSpeedResult, UnitAngle, UnitResult } from './model/analysis.js';
import { combineTwoSpeed, detectSpeedRatio } from './motion/combineTwoSpeed.js';
import { trackingError } from './motion/ctError.js';

export interface CombinedUnits {
  readonly twoSpeed: TwoSpeedResult | null;
  /** The combined angle of a two-speed set, else null. */
  readonly angle: UnitAngle | null;
  readonly tracking: TrackingResult | null;
  readonly findings: Finding[];
}

/**
 * Relates the units of one capture. A coarse/fine pair (unit ids "coarse"/"fine", or speeds such as
 * "1x"/"36x") is combined into one angle (two-speed rule of the ship's-course-indicator manuals
 * TM 55-1905-219/220-14-11 §5-117); any other pair of units with angles is compared as a
 * transmitter and its follower (tracking error).
 */
export function combineUnits(
  units: readonly UnitResult[],
  options: { readonly speedRatio?: number; readonly stickOffDeg?: number },
): CombinedUnits {
  const withAngle = units.filter((u) => u.angle !== null);
  const none: CombinedUnits = { twoSpeed: null, angle: null, tracking: null, findings: [] };
  if (withAngle.length < 2) return none;
  const speedOf = (id: string): number | undefined => {
    const m = /^(\d{1,3})x$/.exec(id);
    return m ? Number(m[1]) : undefined;
  };
  let coarse = withAngle.find((u) => u.id === 'coarse');
  let fine = withAngle.find((u) => u.id === 'fine');
  let labelRatio: number | undefined;
  if (!coarse || !fine) {
    const speeds = withAngle.filter((u) => speedOf(u.id) !== undefined).sort((a, b) => speedOf(a.id)! - speedOf(b.id)!);
    if (speeds.length >= 2) {
      coarse = speeds[0];
      fine = speeds[speeds.length - 1];
      labelRatio = speedOf(fine!.id)! / speedOf(coarse!.id)!;
    }
  }
  if (coarse && fine) {
    const detected = detectSpeedRatio(coarse.angle!.unwrappedDeg, fine.angle!.unwrappedDeg);
    const speedRatio = options.speedRatio ?? labelRatio ?? detected;
    if (speedRatio === undefined) {
      return {
        ...none,
        findings: [
          finding('two-speed-ratio-unknown', 'warning', `Units "${coarse.id}" and "${fine.id}" look like a two-speed set, but the coarse unit turned too little to tell the speed ratio.`, {
            advice: 'Give the ratio with --speed-ratio (e.g. 36), or capture while the shaft turns at least 10°.',
            roles: [...coarse.roles, ...fine.roles],
          }),
        ],
      };
    }
    const source: TwoSpeedResult['speedRatioSource'] = options.speedRatio !== undefined ? 'given' : labelRatio !== undefined ? 'label' : 'detected';
    const combined = combineTwoSpeed(coarse.angle!.deg, fine.angle!.deg, speedRatio, {
      ...(options.stickOffDeg !== undefined ? { stickOffDeg: options.stickOffDeg } : {}),
      roles: [...coarse.roles, ...fine.roles],
    });
    return {
      twoSpeed: {
        coarseId: coarse.id,
        fineId: fine.id,
        speedRatio,
        speedRatioSource: source,
        stickOffDeg: options.stickOffDeg ?? 0,
        limitDeg: combined.limitDeg,
        ambiguousCycles: combined.ambiguousSamples,
        worstCoarseErrorDeg: combined.worstCoarseErrorDeg,
        coarseErrorDeg: combined.coarseErrorDeg,
      },
      angle: { t: coarse.angle!.t, deg: combined.deg, unwrappedDeg: combined.unwrappedDeg, ambiguous180: coarse.angle!.ambiguous180 },
      tracking: null,
      findings: [...combined.findings],
    };
  }
  const [a, b] = withAngle;
  const err = trackingError(b!.angle!.deg, a!.angle!.deg); // b − a: the follower minus the first unit
  return {
    ...none,
    tracking: { a: a!.id, b: b!.id, meanArcmin: err.meanArcmin, rmsArcmin: err.rmsArcmin, maxAbsArcmin: err.maxAbsArcmin, diffDeg: err.diffDeg },
  };
}
