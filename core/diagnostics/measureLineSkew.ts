import { removeMotionQuadrature } from './removeMotionQuadrature.js';
import type { UnitLines } from '../angle/sinCosFromLines.js';
import type { CyclePhasors } from '../demod/demodulateCycles.js';
import { finding, type Finding } from '../model/findings.js';

/** Skew whose phase is at least this many degrees of carrier is a warning on a turning shaft… */
export const SKEW_WARNING_DEG = 0.1;
/** …and at least this, an info. */
export const SKEW_INFO_DEG = 0.02;

export interface LineSkew {
  readonly role: string;
  /** Phase of the line relative to the unit's other lines, degrees of carrier (NaN when the line is too small to tell). */
  readonly relativePhaseDeg: number;
  /** The same as a time: positive = the line lags (is recorded late), microseconds. */
  readonly skewUs: number;
}

/**
 * Per-line time skew of one unit. The lines of a healthy unit are collinear in the complex plane
 * (all Z = a·e^{jψ}, a real), so after rotating by the common phase ψ the quadrature part of each
 * line should be constant (a null quadrature) whatever its in-phase envelope does. A channel delayed
 * by τ multiplies its phasor by e^{−jωτ}: its quadrature then grows in proportion to its in-phase
 * envelope. On a turning shaft the slope of quadrature on in-phase (least squares with an
 * intercept) is tan Δφ and the intercept is the null quadrature (the regression remedy for
 * separating quadrature from phase, e.g. as in lock-in phase calibration; derived). On a static
 * shaft only the ratio is available and a null quadrature cannot be told from skew, so only an info
 * is given. The skew is relative: the median line (three lines) or the first line (two) is the
 * reference. τ = −Δφ/(2π·fc).
 */
export function measureLineSkew(
  unit: UnitLines,
  phasors: CyclePhasors,
  carrierHz: number,
  roleNames: readonly string[] = unit.lines.map((l) => l.base),
): { lines: LineSkew[]; moving: boolean; findings: Finding[] } {
  let sr = 0, si = 0;
  for (const line of unit.lines) {
    const re = phasors.inPhase[line.channel]!, im = phasors.quadrature[line.channel]!;
    for (let m = 0; m < phasors.cycleCount; m++) {
      if (!Number.isFinite(re[m]!) || !Number.isFinite(im[m]!)) continue;
      sr += re[m]! * re[m]! - im[m]! * im[m]!;
      si += 2 * re[m]! * im[m]!;
    }
  }
  const psi = 0.5 * Math.atan2(si, sr);
  const cp = Math.cos(psi), sp = Math.sin(psi);
  // A turning shaft leaves a false quadrature in each one-period window (removeMotionQuadrature);
  // take it out first, or it reads as a skew on a partial turn.
  const cleaned = removeMotionQuadrature(
    unit.lines.map((line) => ({ role: line.base, inPhaseV: phasors.inPhase[line.channel]!, quadratureV: phasors.quadrature[line.channel]! })),
    psi,
    phasors.centrePhaseRad,
  );
  const uv = cleaned.map((line) => {
    const re = line.inPhaseV, im = line.quadratureV;
    const u: number[] = [], v: number[] = [];
    for (let m = 0; m < phasors.cycleCount; m++) {
      if (!Number.isFinite(re[m]!) || !Number.isFinite(im[m]!)) continue;
      u.push(re[m]! * cp + im[m]! * sp);
      v.push(im[m]! * cp - re[m]! * sp);
    }
    return { u, v };
  });
  // Folds, not Math.max(...u): one argument per cycle overflows the call stack past ~1e5 cycles.
  const maxAbsOf = (u: readonly number[]): number => u.reduce((a, b) => Math.max(a, Math.abs(b)), 0);
  const kMax = uv.reduce((a, { u }) => Math.max(a, maxAbsOf(u)), 0);
  const spanOf = (u: readonly number[]): number =>
    u.length ? u.reduce((a, b) => Math.max(a, b), -Infinity) - u.reduce((a, b) => Math.min(a, b), Infinity) : 0;
  const moving = uv.some(({ u }) => spanOf(u) > 0.2 * kMax);
  const phase = uv.map(({ u, v }) => {
    if (u.length < 2 || !(kMax > 0)) return NaN;
    if (moving) {
      if (spanOf(u) < 0.2 * kMax) return NaN;
      const n = u.length;
      const mu = u.reduce((a, b) => a + b, 0) / n;
      const mv = v.reduce((a, b) => a + b, 0) / n;
      let suu = 0, suv = 0;
      for (let m = 0; m < n; m++) {
        suu += (u[m]! - mu) ** 2;
        suv += (u[m]! - mu) * (v[m]! - mv);
      }
      return Math.atan(suv / suu);
    }
    const maxU = maxAbsOf(u);
    if (maxU < 0.1 * kMax) return NaN;
    let suu = 0, suv = 0;
    for (let m = 0; m < u.length; m++) {
      suu += u[m]! * u[m]!;
      suv += u[m]! * v[m]!;
    }
    return Math.atan(suv / suu);
  });
  const finite = phase.filter(Number.isFinite).sort((a, b) => a - b);
  const refPhase = finite.length >= 3 ? finite[finite.length >> 1]! : phase.find(Number.isFinite) ?? NaN;
  const omega = 2 * Math.PI * carrierHz;
  const lines: LineSkew[] = unit.lines.map((_, i) => {
    const d = phase[i]! - refPhase;
    return { role: roleNames[i] ?? unit.lines[i]!.base, relativePhaseDeg: (d * 180) / Math.PI, skewUs: (-d / omega) * 1e6 };
  });
  const findings: Finding[] = [];
  const refRole = finite.length >= 3 ? 'the other lines' : lines.find((l) => Number.isFinite(l.relativePhaseDeg))?.role ?? '';
  for (const l of lines) {
    const a = Math.abs(l.relativePhaseDeg);
    if (!(a >= SKEW_INFO_DEG)) continue;
    if (!moving && a < SKEW_WARNING_DEG) continue;
    const severity = moving && a >= SKEW_WARNING_DEG ? 'warning' : 'info';
    const quadPct = 100 * Math.sin((a * Math.PI) / 180);
    findings.push(
      finding('channel-skew', severity, `${l.role} is ${Math.abs(l.skewUs).toFixed(2)} µs ${l.skewUs > 0 ? 'behind' : 'ahead of'} ${refRole} (${l.relativePhaseDeg.toFixed(3)}° of carrier), a phase difference no synchro makes between its lines.`, {
        advice: moving
          ? `The channels are not sampled at the same instant (probe or cable delay, deskew setting, a multiplexed ADC); it adds a false quadrature of ${quadPct.toFixed(2)} % of the line amplitude. Deskew the channels or use matched probes.`
          : `On a static shaft a null quadrature on this line looks the same as a skew; turn the shaft during the capture to tell them apart. If it is a skew (probe delay, deskew setting, multiplexed ADC), it adds a false quadrature of ${quadPct.toFixed(2)} % of the line amplitude.`,
        roles: [l.role],
        figures: { skewUs: l.skewUs, relativePhaseDeg: l.relativePhaseDeg },
      }),
    );
  }
  return { lines, moving, findings };
}

