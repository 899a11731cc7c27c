import type { UnitLines } from '../angle/sinCosFromLines.js';
import type { CyclePhasors } from '../demod/demodulateCycles.js';
import { finding, type Finding } from '../model/findings.js';
import { canonicalLineValues, maxAbsOver, spanOver, type CanonicalLines } from './canonicalLineValues.js';
import { detectFoldBack, peakAnglesDeg } from './detectFoldBack.js';
import { fitPairScale } from './fitPairScale.js';
import { selectKth } from '../dsp/selectKth.js';

/**
 * Stator wiring and probe faults of one unit, read from its per-cycle line phasors.
 *
 * Facts used (standard synchro equations, NEETS Module 15 pp.1-57…1-60; signatures derived from
 * them):
 * - The three line-to-line voltages of a synchro always sum to zero (Kirchhoff's voltage law
 *   around S1, S2, S3). In a simultaneous three-line capture a non-zero sum is a probe, scale or
 *   channel problem, not a synchro fault. When one line explains the sum, its factor g is the
 *   least-squares slope of that line on −(sum of the other two).
 * - With two lines (or a resolver) Kirchhoff gives nothing; a mis-scaled line shows instead as an
 *   ellipse in the plane of the two envelopes: two healthy lines x = K·sin(θ+φx), y = K·sin(θ+φy)
 *   satisfy x² − 2xy·cos Δ + y² = K²·sin²Δ (Δ = φy − φx), so x read g times too large satisfies
 *   u·x² − 2w·xy·cos Δ + y² = R with u = 1/g², w = 1/g; both are fitted linearly (least squares)
 *   and u ≈ w² is required. A resolver (Δ = 90°) gives only |g|.
 * - Stator lines shorted together: the shorted pair reads ≈ 0 at every angle and the other two
 *   are equal and opposite, so the decoded angle sticks at that pair's nulls: S1–S2 → 120°/300°,
 *   S2–S3 → 60°/240°, S1–S3 → 0°/180° (NEETS p.1-57: the receiver sits on one reading for half a
 *   turn, then jumps to the opposite one).
 * - Stator lead open: only the line that avoids the open lead is valid. A floating lead sits at
 *   the mean of the other two, so both lines through it read −½ of the valid line (the angle
 *   sticks at the valid line's peaks); fed back from a receiver, all three lines follow the
 *   receiver, which folds back at the valid line's peaks (NEETS p.1-57: turns smoothly one way,
 *   then reverses). Peaks: S1 open → 150°/330°, S2 open → 90°/270°, S3 open → 30°/210°.
 * Faults that leave a static capture looking like a healthy unit at some angle (a short, a line at
 * its null) are not reported from a static capture: at electrical zero S1−S3 is 0 by design.
 */

/** A line whose carrier is below this fraction of the unit's largest line is "dead" (see checks). */
export const DEAD_LEVEL_FRACTION = 0.02;
/** The shaft "moved" when some line's envelope spans more than this fraction of the largest line. */
export const MOTION_SPAN_FRACTION = 0.1;
/** Kirchhoff residual (RMS of the sum over the RMS stator maximum) above which the lines disagree. */
export const KIRCHHOFF_TOLERANCE = 0.02;
/** Relative misfit allowed for a single-line scale hypothesis. */
const FIT_TOLERANCE = 0.03;
/** A factor within this relative distance of a probe factor is snapped to it. */
const SNAP_TOLERANCE = 0.05;
/** Gain differences below this are left to the unit-figure diagnostics (probe tolerance). */
const HEALTHY_SCALE_TOLERANCE = 0.05;
/**
 * Transformation ratios (stator maximum over excitation, peak over peak) outside this range are
 * not taken as a real unit when choosing between hypotheses. Standard synchros lie 0.45–0.8
 * (26 V/11.8 V, 115 V/90 V; NEETS Module 15 p.1-60); the bounds are wide on purpose
 * (common practice, no source).
 */
const PLAUSIBLE_RATIO: readonly [number, number] = [0.05, 3];
/** Likely probe-factor mistakes, most likely first (common practice, no source). */
export const PROBE_FACTORS: readonly number[] = [10, 0.1, 2, 0.5, -1, 100, 0.01, -10, -0.1];

const DEG = Math.PI / 180;
const SQRT3 = Math.sqrt(3);
/** Canonical line phases in degrees: E(S1−S3) ∝ sin θ, E(S3−S2) ∝ sin(θ+120°), E(S2−S1) ∝ sin(θ+240°). */
const SYNCHRO_PHASE_DEG = [0, 120, 240] as const;
const RESOLVER_PHASE_DEG = [0, 90] as const;
/** The two leads of each canonical line, and the lead it avoids. */
const LINE_PAIR = ['s1s3', 's2s3', 's1s2'] as const;
const LINE_NAME = ['S1-S3', 'S3-S2', 'S2-S1'] as const;
const AVOIDED_LEAD = ['s2', 's1', 's3'] as const;

export type LeadPair = (typeof LINE_PAIR)[number];
export type Lead = 's1' | 's2' | 's3';

export type LineFault =
  | {
      readonly kind: 'dead';
      /** Index into unit.lines. */
      readonly line: number;
      /** Carrier level of the line over the unit's largest line. */
      readonly levelRatio: number;
      /** True when the other two lines of a three-line synchro capture can stand in for it. */
      readonly rebuildable: boolean;
    }
  | {
      readonly kind: 'scale';
      readonly line: number;
      /** Least-squares estimate of the factor the line was read with (measured = factor × true). */
      readonly factor: number;
      /** The probe factor it snaps to, or null when it is not a usual one. */
      readonly likelyFactor: number | null;
      /** True when another line could equally carry the inverse factor (two-line and resolver captures). */
      readonly ambiguous: boolean;
    }
  | { readonly kind: 'shorted'; readonly leads: LeadPair; readonly stickDeg: readonly [number, number] }
  | {
      readonly kind: 'open';
      readonly lead: Lead;
      readonly pattern: 'stuck' | 'fold-back';
      readonly foldDeg: readonly [number, number];
    };

export interface LineCheckOptions {
  /** Excitation (R1-R2) peak volts; omit or NaN when there is no reference channel. */
  readonly referencePeakV?: number;
  /** Role names for messages, parallel to unit.lines (default: the base roles). */
  readonly roleNames?: readonly string[];
}

export interface LineCheck {
  readonly faults: readonly LineFault[];
  readonly findings: readonly Finding[];
  /** The unit's common phase lead used to take in-phase envelopes, radians. */
  readonly phaseLeadRad: number;
  /** RMS Kirchhoff residual over the RMS stator maximum (three-line synchro captures; NaN otherwise). */
  readonly kirchhoffResidualRatio: number;
  /** Whether the shaft moved enough during the record for the pattern checks. */
  readonly moving: boolean;
}

/**
 * Checks the measured lines of one synchro or resolver unit for dead channels, mis-scaled lines,
 * shorted lines and open leads. `unit` and `phasors` are what the angle solver receives.
 */
export function checkSynchroLines(unit: UnitLines, phasors: CyclePhasors, options: LineCheckOptions = {}): LineCheck {
  const cl = canonicalLineValues(unit, phasors);
  const names = (i: number): string => options.roleNames?.[i] ?? unit.lines[i]!.base;
  const refPeakV = options.referencePeakV !== undefined && options.referencePeakV > 0 ? options.referencePeakV : NaN;
  const slots = cl.lineIndex.length;
  const measured = cl.lineIndex.map((i, k) => (i >= 0 ? k : -1)).filter((k) => k >= 0);
  const empty: LineCheck = { faults: [], findings: [], phaseLeadRad: cl.phaseLeadRad, kirchhoffResidualRatio: NaN, moving: false };
  if (measured.length < 2) return empty;
  let validCount = 0;
  for (let m = 0; m < cl.cycleCount; m++) validCount += cl.valid[m]!;
  if (validCount < 2) return empty;

  const faults: LineFault[] = [];
  const findings: Finding[] = [];
  const level = (k: number): number => maxAbsOver(cl.magnitudeV[k]!, cl.valid);
  const levels = measured.map(level);
  const kMax = Math.max(...levels);
  const moving = measured.some((k) => spanOver(cl.inPhaseV[k]!, cl.valid) > MOTION_SPAN_FRACTION * kMax);
  const roleOf = (k: number): string => names(cl.lineIndex[k]!);
  const lineLabel = (k: number): string => (cl.kind === 'synchro' ? LINE_NAME[k]! : k === 0 ? 'SIN' : 'COS');

  // All lines silent while the excitation is present: the transmitter's rotor is open or unexcited.
  if (Number.isFinite(refPeakV) && kMax < 1e-3 * refPeakV) {
    measured.forEach((k) => faults.push({ kind: 'dead', line: cl.lineIndex[k]!, levelRatio: NaN, rebuildable: false }));
    findings.push(
      finding('dead-channel', 'error', `No stator line carries the carrier (largest ${(kMax * 1000).toFixed(1)} mV peak against ${refPeakV.toFixed(1)} V peak excitation).`, {
        advice:
          "The excitation is present but the stator is silent: the transmitter's rotor circuit is probably open or not connected to the supply (NEETS Module 15 p.1-57), or every probe is off; check R1-R2 at the unit and the stator probes.",
        roles: measured.map(roleOf),
        figures: { largestLinePeakV: kMax, referencePeakV: refPeakV },
      }),
    );
    return { faults, findings, phaseLeadRad: cl.phaseLeadRad, kirchhoffResidualRatio: NaN, moving };
  }

  // Working copy of the canonical envelopes, corrected as faults are found.
  const vals: Float64Array[] = [];
  for (let k = 0; k < slots; k++) vals.push(cl.inPhaseV[k] ? Float64Array.from(cl.inPhaseV[k]!) : new Float64Array(cl.cycleCount));
  let kirchhoffResidualRatio = NaN;
  let unusable = false;

  if (cl.kind === 'synchro' && measured.length === 3) {
    kirchhoffResidualRatio = kirchhoffRatio(vals, cl.valid);
    if (kirchhoffResidualRatio > KIRCHHOFF_TOLERANCE) {
      const choice = chooseThreeLineHypothesis(vals, cl.valid, levels, kMax, refPeakV, moving);
      if (choice === 'within-tolerance') {
        // One line a few per cent off: probe tolerance, left to the unit-figure diagnostics.
      } else if (!choice) {
        findings.push(
          finding('lines-inconsistent', 'warning', `The three line voltages do not sum to zero (residual ${(100 * kirchhoffResidualRatio).toFixed(1)} % of the stator maximum) and no single line's scale explains it.`, {
            advice:
              'Line-to-line voltages always sum to zero, so this is a measurement problem: check that every probe ground is on the same point, that the probe factors and channel gains are right, and that the channels were captured simultaneously.',
            roles: measured.map(roleOf),
            figures: { kirchhoffResidualRatio },
          }),
        );
      } else if (choice.dead) {
        const k = choice.slot;
        faults.push({ kind: 'dead', line: cl.lineIndex[k]!, levelRatio: levels[k]! / kMax, rebuildable: true });
        findings.push(
          finding('dead-channel', 'warning', `${roleOf(k)} carries almost no carrier (${(levels[k]! * 1000).toFixed(1)} mV peak against ${kMax.toFixed(2)} V on the other lines) and the three lines do not sum to zero.`, {
            advice: `The probe, its ground lead or the channel is probably off (or the ${lineLabel(k)} terminal is not connected); the angle was solved from the other two lines, since the three line voltages sum to zero.${choice.ambiguous ? ' The capture is static, so a wrong probe factor on another line cannot be ruled out.' : ''}`,
            roles: [roleOf(k)],
            figures: { levelPeakV: levels[k]!, otherLinesPeakV: kMax, kirchhoffResidualRatio },
          }),
        );
        const [i, j] = others(k);
        for (let m = 0; m < cl.cycleCount; m++) vals[k]![m] = -(vals[i]![m]! + vals[j]![m]!);
      } else {
        const k = choice.slot;
        faults.push({ kind: 'scale', line: cl.lineIndex[k]!, factor: choice.factor, likelyFactor: choice.likely, ambiguous: choice.ambiguous });
        findings.push(scaleFinding(roleOf(k), 'what the other two lines imply', choice.factor, choice.likely, choice.ambiguous, { kirchhoffResidualRatio }));
        const f = choice.likely ?? choice.factor;
        for (let m = 0; m < cl.cycleCount; m++) vals[k]![m] = vals[k]![m]! / f;
      }
    }
  } else {
    // Two synchro lines, or a resolver's sine and cosine.
    const [p, q] = measured as [number, number];
    const dead = [p, q].find((k) => level(k) < DEAD_LEVEL_FRACTION * kMax);
    const live = dead === p ? q : p;
    if (dead !== undefined && spanOver(vals[live]!, cl.valid) > MOTION_SPAN_FRACTION * kMax) {
      faults.push({ kind: 'dead', line: cl.lineIndex[dead]!, levelRatio: level(dead) / kMax, rebuildable: false });
      findings.push(
        finding('dead-channel', 'error', `${roleOf(dead)} carries almost no carrier (${(level(dead) * 1000).toFixed(1)} mV peak) while ${roleOf(live)} swings up to ${kMax.toFixed(2)} V as the shaft moves.`, {
          advice:
            cl.kind === 'synchro'
              ? `The probe or channel is probably off, the ${lineLabel(dead)} leads are shorted together, or a lead is open; with one valid line the angle is known only through one sinusoid and cannot be solved. Measure the third line as well, or fix the connection.`
              : `The probe or channel is probably off, or that winding is open or shorted; the angle cannot be solved from one winding.`,
          roles: [roleOf(dead)],
          figures: { levelPeakV: level(dead), otherLinePeakV: kMax },
        }),
      );
      unusable = true;
    } else if (moving) {
      const ratio = fitPairScale(vals[p]!, vals[q]!, cl.valid, cl.kind === 'synchro' ? (SYNCHRO_PHASE_DEG[q]! - SYNCHRO_PHASE_DEG[p]!) * DEG : (RESOLVER_PHASE_DEG[q]! - RESOLVER_PHASE_DEG[p]!) * DEG);
      if (ratio && Math.abs(ratio.factor - 1) > HEALTHY_SCALE_TOLERANCE) {
        // p reads `factor` × q's scale: either p is off by factor or q by 1/factor.
        const likelyP = snapFactor(ratio.factor);
        const likelyQ = snapFactor(1 / ratio.factor);
        let slot = p;
        let factor = ratio.factor;
        let likely = likelyP;
        let ambiguous = true;
        if (Number.isFinite(refPeakV)) {
          const radius = ratio.radiusOfQScaleV; // radius with q's scale taken as right
          const okP = plausible(radius / refPeakV);
          const okQ = plausible((radius * Math.abs(ratio.factor)) / refPeakV);
          if (okQ && !okP) {
            slot = q;
            factor = 1 / ratio.factor;
            likely = likelyQ;
            ambiguous = false;
          } else if (okP && !okQ) {
            ambiguous = false;
          }
        }
        faults.push({ kind: 'scale', line: cl.lineIndex[slot]!, factor, likelyFactor: likely, ambiguous });
        const other = slot === p ? q : p;
        findings.push(scaleFinding(roleOf(slot), `${roleOf(other)} (from the shape of the two envelopes over the turn)`, factor, likely, ambiguous, {}, roleOf(other)));
        const f = likely ?? factor;
        for (let m = 0; m < cl.cycleCount; m++) vals[slot]![m] = vals[slot]![m]! / f;
      }
    }
    if (cl.kind === 'synchro' && !unusable) {
      const missing = [0, 1, 2].find((k) => cl.lineIndex[k]! < 0)!;
      const [i, j] = others(missing);
      for (let m = 0; m < cl.cycleCount; m++) vals[missing]![m] = -(vals[i]![m]! + vals[j]![m]!);
    }
  }

  if (cl.kind === 'synchro' && !unusable && moving && !faults.some((f) => f.kind === 'dead' && !f.rebuildable)) {
    findings.push(...checkStatorPatterns(vals, cl, faults, measured.map(roleOf)));
  }
  return { faults, findings, phaseLeadRad: cl.phaseLeadRad, kirchhoffResidualRatio, moving };
}

/** The other two canonical slots. */
function others(k: number): [number, number] {
  return [(k + 1) % 3, (k + 2) % 3];
}

function plausible(ratio: number): boolean {
  return ratio >= PLAUSIBLE_RATIO[0] && ratio <= PLAUSIBLE_RATIO[1];
}

/** The probe factor `g` is within SNAP_TOLERANCE of, or null. */
export function snapFactor(g: number): number | null {
  for (const f of PROBE_FACTORS) if (Math.abs(g / f - 1) < SNAP_TOLERANCE) return f;
  return null;
}

/** RMS of A + B + C over the RMS stator maximum K = √(⅔·(A² + B² + C²)). */
function kirchhoffRatio(vals: readonly Float64Array[], valid: Uint8Array): number {
  let sum2 = 0;
  let k2 = 0;
  for (let m = 0; m < valid.length; m++) {
    if (!valid[m]) continue;
    const a = vals[0]![m]!, b = vals[1]![m]!, c = vals[2]![m]!;
    sum2 += (a + b + c) ** 2;
    k2 += (2 / 3) * (a * a + b * b + c * c);
  }
  return k2 > 0 ? Math.sqrt(sum2 / k2) : 0;
}

interface ThreeLineChoice {
  readonly slot: number;
  readonly dead: boolean;
  readonly factor: number;
  readonly likely: number | null;
  readonly ambiguous: boolean;
}

/**
 * For each line k, the hypothesis "k was read g times its true value, the others are right":
 * g = Σ a_k·E_k / Σ E_k² with E_k = −(sum of the other two) (least squares), misfit
 * √(Σ(a_k − g·E_k)² / Σ E_k²). Hypotheses that fit are ranked: a line with no carrier (dead),
 * then snapped probe factors in PROBE_FACTORS order, then raw factors; with a reference, a
 * hypothesis whose corrected transformation ratio is implausible is dropped.
 */
function chooseThreeLineHypothesis(
  vals: readonly Float64Array[],
  valid: Uint8Array,
  levels: readonly number[],
  kMax: number,
  refPeakV: number,
  moving: boolean,
): ThreeLineChoice | 'within-tolerance' | undefined {
  const candidates: (ThreeLineChoice & { rank: number })[] = [];
  let withinTolerance = false;
  for (let k = 0; k < 3; k++) {
    const [i, j] = others(k);
    let se = 0, sa = 0, ee = 0;
    const radii: number[] = [];
    for (let m = 0; m < valid.length; m++) {
      if (!valid[m]) continue;
      const e = -(vals[i]![m]! + vals[j]![m]!);
      const a = vals[k]![m]!;
      se += a * e;
      ee += e * e;
      sa += a * a;
      radii.push(Math.sqrt((2 / 3) * (vals[i]![m]! ** 2 + vals[j]![m]! ** 2 + e * e)));
    }
    if (!(ee > 0)) continue;
    const g = se / ee;
    const misfit = Math.sqrt(Math.max(0, sa - 2 * g * se + g * g * ee) / ee);
    if (misfit > FIT_TOLERANCE) continue;
    const radiusV = selectKth(Float64Array.from(radii), radii.length >> 1);
    if (Number.isFinite(refPeakV) && !plausible(radiusV / refPeakV)) continue;
    const dead = levels[k] !== undefined && levels[k]! < DEAD_LEVEL_FRACTION * kMax && Math.abs(g) < DEAD_LEVEL_FRACTION * 2;
    if (!dead && Math.abs(g - 1) < HEALTHY_SCALE_TOLERANCE) {
      if (moving) withinTolerance = true; // a static point fits any line, so only a turn settles it
      continue;
    }
    const likely = dead ? null : snapFactor(g);
    const rank = dead ? 0 : likely !== null ? 1 + PROBE_FACTORS.indexOf(likely) : 100;
    candidates.push({ slot: k, dead, factor: g, likely, ambiguous: false, rank });
  }
  if (withinTolerance || (candidates.length === 0 && !moving && kirchhoffRatio(vals, valid) < 2 * HEALTHY_SCALE_TOLERANCE)) return 'within-tolerance';
  if (candidates.length === 0) return undefined;
  candidates.sort((x, y) => x.rank - y.rank);
  const best = candidates[0]!;
  // A moving capture leaves one hypothesis; a static one (one point) may leave several, but an
  // unsnapped factor on another line is far less likely than an exact probe factor.
  const ambiguous = candidates.some((c) => c !== best && (c.rank === best.rank || (!moving && c.rank < 100)));
  if (best.rank === 100 && candidates.length > 1) return undefined;
  return { ...best, ambiguous };
}

function scaleFinding(
  role: string,
  against: string,
  factor: number,
  likely: number | null,
  ambiguous: boolean,
  figures: Record<string, number>,
  otherRole?: string,
): Finding {
  const shown = likely ?? factor;
  const factorText =
    shown === -1 ? 'the opposite sign of' : Math.abs(shown) < 1 ? `${fmtFactor(shown)} of` : `${fmtFactor(shown)} times`;
  const message = `${role} reads ${factorText} ${against}.`;
  const fix =
    likely === -1
      ? `The probe leads on that pair are probably reversed (or the channel is really the reversed pair); the line was inverted before solving the angle.`
      : likely !== null
        ? `A probe factor is probably set wrong on that channel (e.g. a ×10 probe with the scope set to ×1, or the reverse); the line was divided by ${fmtFactor(likely)} before solving the angle. Check the probe attenuation setting.`
        : `This is not a usual probe factor: check the channel's gain, probe compensation and attenuation setting; the line was divided by ${fmtFactor(factor)} before solving the angle.`;
  const either = ambiguous
    ? otherRole
      ? ` Equally, ${otherRole} may read ${fmtFactor(1 / shown)} times its true value; the angle is the same either way, only the transformation ratio depends on which.`
      : ' The capture cannot tell which line is wrong for certain.'
    : '';
  return finding('scale-mismatch', 'warning', message, {
    advice: fix + either,
    roles: otherRole ? [role, otherRole] : [role],
    figures: { factor, likelyFactor: likely ?? NaN, ...figures },
  });
}

function fmtFactor(f: number): string {
  const a = Math.abs(f);
  const text = a >= 1 ? (Number.isInteger(a) ? a.toFixed(0) : a.toFixed(2)) : Math.abs(1 / a - Math.round(1 / a)) < 1e-9 ? `1/${Math.round(1 / a)}` : a.toFixed(3);
  return f < 0 ? `−${text}` : text;
}

/** Decoded angle from three canonical envelopes (Scott-T, least-squares sine), degrees in [0, 360). */
function decodeDeg(a: number, b: number, c: number): number {
  const s = (2 / 3) * (a - (b + c) / 2);
  const k = (b - c) / SQRT3;
  const d = (Math.atan2(s, k) * 180) / Math.PI;
  return d < 0 ? d + 360 : d;
}

function wrapDeg(d: number): number {
  const r = d % 360;
  return r < 0 ? r + 360 : r + 0; // + 0 turns −0 into 0
}


/** Shorted lines, floating open lead, receiver fold-back, on the (corrected) canonical envelopes. */
function checkStatorPatterns(vals: readonly Float64Array[], cl: CanonicalLines, faults: LineFault[], roles: readonly string[]): Finding[] {
  const valid = cl.valid;
  const out: Finding[] = [];
  const lv = [0, 1, 2].map((k) => maxAbsOver(vals[k]!, valid));
  const kc = Math.max(...lv);
  if (!(kc > 0)) return out;

  // Shorted pair: one line ≈ 0 all the time while the other two swing.
  for (let k = 0; k < 3; k++) {
    const [i, j] = others(k);
    if (lv[k]! < DEAD_LEVEL_FRACTION * kc && spanOver(vals[i]!, valid) > MOTION_SPAN_FRACTION * kc && spanOver(vals[j]!, valid) > MOTION_SPAN_FRACTION * kc) {
      const nulls = [wrapDeg(-SYNCHRO_PHASE_DEG[k]!), wrapDeg(180 - SYNCHRO_PHASE_DEG[k]!)].sort((x, y) => x - y);
      const stick: [number, number] = [nulls[0]!, nulls[1]!];
      const leads = LINE_PAIR[k]!;
      faults.push({ kind: 'shorted', leads, stickDeg: stick });
      const [l1, l2] = [leads.slice(0, 2).toUpperCase(), leads.slice(2).toUpperCase()];
      out.push(
        finding('shorted-lines', 'error', `${LINE_NAME[k]} stays near 0 V at every angle (at most ${(lv[k]! * 1000).toFixed(1)} mV against ${kc.toFixed(2)} V) while the other two lines swing equal and opposite, so the decoded angle sticks at ${stick[0].toFixed(0)}° or ${stick[1].toFixed(0)}°.`, {
          advice: `Stator leads ${l1} and ${l2} are probably shorted together (NEETS Module 15 p.1-57: the receiver sits on one reading for half a turn, then jumps to the opposite one, and both units hum and heat); with the supply off, check the wiring and terminal board between ${l1} and ${l2}. The angle from this capture is not valid.`,
          roles,
          figures: { shortedLinePeakV: lv[k]!, otherLinesPeakV: kc, stickLowDeg: stick[0], stickHighDeg: stick[1] },
        }),
      );
      return out;
    }
  }

  // Floating open lead: the two lines through it equal each other and −½ of the valid line.
  for (let v = 0; v < 3; v++) {
    const [i, j] = others(v);
    if (spanOver(vals[v]!, valid) <= MOTION_SPAN_FRACTION * kc) continue;
    let d1 = 0, d2 = 0, count = 0;
    for (let m = 0; m < valid.length; m++) {
      if (!valid[m]) continue;
      d1 += (vals[i]![m]! - vals[j]![m]!) ** 2;
      d2 += (vals[i]![m]! + vals[v]![m]! / 2) ** 2;
      count++;
    }
    if (Math.sqrt(d1 / count) < FIT_TOLERANCE * kc && Math.sqrt(d2 / count) < FIT_TOLERANCE * kc) {
      const lead = AVOIDED_LEAD[v]!;
      const fold = peakAnglesDeg(v);
      faults.push({ kind: 'open', lead, pattern: 'stuck', foldDeg: fold });
      out.push(openLeadFinding(lead, v, fold, 'stuck', roles, `${LINE_NAME[i]} and ${LINE_NAME[j]} read the same, each −½ of ${LINE_NAME[v]}, instead of their own sine patterns, so the decoded angle sticks at ${fold[0].toFixed(0)}° or ${fold[1].toFixed(0)}°.`));
      return out;
    }
  }

  // Receiver fold-back: the decoded angle reverses sharply at one valid line's two peaks and never
  // leaves the half-turn between them.
  const deg: number[] = [];
  for (let m = 0; m < valid.length; m++) if (valid[m]) deg.push(decodeDeg(vals[0]![m]!, vals[1]![m]!, vals[2]![m]!));
  const fold = detectFoldBack(deg);
  if (fold) {
    faults.push({ kind: 'open', lead: AVOIDED_LEAD[fold.line]!, pattern: 'fold-back', foldDeg: fold.peaks });
    out.push(
      openLeadFinding(
        AVOIDED_LEAD[fold.line]!,
        fold.line,
        fold.peaks,
        'fold-back',
        roles,
        `The decoded angle runs one way and then back, reversing sharply ${fold.reversals} time${fold.reversals > 1 ? 's' : ''} at ${fold.peaks[0].toFixed(0)}° or ${fold.peaks[1].toFixed(0)}° and never leaving the half-turn between them.`,
      ),
    );
  }
  return out;
}

function openLeadFinding(lead: Lead, valid: number, fold: readonly [number, number], pattern: 'stuck' | 'fold-back', roles: readonly string[], seen: string): Finding {
  const L = lead.toUpperCase();
  return finding('open-lead', pattern === 'stuck' ? 'error' : 'warning', seen, {
    advice: `Stator lead ${L} is probably open: only ${LINE_NAME[valid]} (the line without ${L}) carries the angle, which then is known only through one sinusoid and folds back at its peaks (NEETS Module 15 p.1-57: the receiver turns smoothly one way, then reverses). With the supply off, check ${L} for continuity from the unit to the terminal board and the probe.${pattern === 'fold-back' ? ' A shaft that really reverses at exactly these angles would look the same: confirm with what the shaft did.' : ''} The angle from this capture is not valid.`,
    roles,
    figures: { foldLowDeg: fold[0], foldHighDeg: fold[1] },
  });
}
