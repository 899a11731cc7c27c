import { sinCosFromLines, type UnitLines } from './angle/sinCosFromLines.js';
import { solveAngle } from './angle/solveAngle.js';
import type { CarrierEstimate } from './carrier/trackCarrier.js';
import type { CyclePhasors } from './demod/demodulateCycles.js';
import { lineHarmonics, type SampleSegment } from './diagnostics/lineHarmonics.js';
import { nullVoltages } from './diagnostics/nullVoltages.js';
import { repairLines } from './diagnostics/repairLines.js';
import { inPhasePair, sinCosPlane } from './diagnostics/sinCosPlane.js';
import { unitFigures } from './diagnostics/unitFigures.js';
import { checkSynchroLines } from './diagnostics/wiringFaults.js';
import type { LineResult, UnitResult } from './model/analysis.js';
import type { Capture } from './model/capture.js';
import { finding, type Finding } from './model/findings.js';
import { formatRole, type Role } from './model/roles.js';
import { analyzeMotion, type MotionAnalysis } from './motion/analyzeMotion.js';
import { ctErrorSignal, defaultCtMaxOutputV, estimateCtPhaseRad } from './motion/ctError.js';
import type { AnalyzeOptions } from './model/analyzeOptions.js';
import { selectKth } from './dsp/selectKth.js';

const HARMONIC_SAMPLES = 1 << 18;

/** What every unit of one capture shares. */
export interface UnitContext {
  readonly capture: Capture;
  readonly phasors: CyclePhasors;
  /** Index of a capture channel in the phasor arrays. */
  readonly slot: (channel: number) => number;
  readonly carrier: CarrierEstimate;
  /** Excitation peak volts (NaN without a reference channel). */
  readonly refPeakV: number;
  readonly options: AnalyzeOptions;
}

export interface UnitGroup {
  readonly id: string;
  readonly members: readonly { readonly channel: number; readonly role: Role }[];
}

export interface UnitAnalysis {
  readonly result: UnitResult;
  /** Motion of this unit's angle trace (null without an angle). */
  readonly motion: MotionAnalysis | null;
  /** The lines the angle was solved from, after repairs (indices into the phasor arrays). */
  readonly lines: UnitLines | null;
  readonly findings: Finding[];
}

/**
 * One unit from its per-cycle phasors: wiring check and repair, angle, unit figures (ratio and
 * phase lead by regression, so quadrature is not taken for phase), angle again with that lead,
 * motion of the trace, line harmonics on the still parts, null voltages, the sine/cosine plane.
 * A control transformer's rotor output is read as a signed error signal instead.
 */
export function analyzeUnit(ctx: UnitContext, group: UnitGroup, transmitterLeadDeg: number | null): UnitAnalysis {
  const findings: Finding[] = [];
  const { capture, phasors, slot, carrier, refPeakV, options } = ctx;
  const hasRef = carrier.source === 'reference';
  const fs = capture.sampleRateHz;
  const bases = group.members.map((m) => m.role.base);
  const roleNames = group.members.map((m) => formatRole(m.role));
  const kind: UnitResult['kind'] = bases.includes('ct') ? 'ct' : bases.includes('sin') || bases.includes('cos') ? 'resolver' : 'synchro';
  const empty = {
    id: group.id, kind, roles: roleNames, nulls: [], family: null, plane: null, repairs: [], ctError: null,
    transformationRatio: null, phaseLeadDeg: null, method: null, angle: null, angleValid: false,
  };

  if (kind === 'ct') {
    const k = slot(group.members[0]!.channel);
    const psi = transmitterLeadDeg !== null ? (transmitterLeadDeg * Math.PI) / 180 : estimateCtPhaseRad(phasors, k) ?? 0;
    const ct = ctErrorSignal(phasors, k, psi, {
      ...(options.ctGradientVPerDeg !== undefined ? { gradientVPerDeg: options.ctGradientVPerDeg } : { maxOutputV: defaultCtMaxOutputV(carrier.referenceRmsV) }),
      hysteresisMv: 5,
    });
    const lines = group.members.map((m) => plainLine(m, phasors, slot(m.channel), psi));
    return { result: { ...empty, lines, ctError: ct }, motion: null, lines: null, findings };
  }

  const unitLines: UnitLines = {
    kind: kind === 'resolver' ? 'resolver' : 'synchro',
    lines: group.members.map((m) => ({ base: m.role.base, channel: slot(m.channel) })),
  };
  const check = checkSynchroLines(unitLines, phasors, { ...(hasRef ? { referencePeakV: refPeakV } : {}), roleNames });
  findings.push(...check.findings);
  const repair = repairLines(unitLines, phasors, check);
  const sinCos = sinCosFromLines(repair.unit, repair.phasors);
  if (!sinCos) {
    findings.push(
      finding('angle-unsolvable', 'error', `Unit "${group.id}" has too few live stator signals to solve an angle (${roleNames.join(', ')}).`, {
        advice: 'A synchro needs two or three line-to-line voltages, a resolver both its sine and cosine windings.',
        roles: roleNames,
      }),
    );
    const lines = group.members.map((m) => plainLine(m, phasors, slot(m.channel), check.phaseLeadRad));
    return { result: { ...empty, lines, repairs: repair.actions }, motion: null, lines: null, findings };
  }

  // First pass with the collinear-phasor lead, then the regression figures, then the final angle.
  const first = solveAngle(sinCos, repair.phasors, fs);
  const solvedMembers = group.members.filter((m) => repair.unit.lines.some((l) => l.channel === slot(m.channel)));
  const figs = unitFigures({
    kind: unitLines.kind,
    lines: solvedMembers.map((m) => ({
      role: m.role.base,
      inPhaseV: repair.phasors.inPhase[slot(m.channel)]!,
      quadratureV: repair.phasors.quadrature[slot(m.channel)]!,
    })),
    angleDeg: first.deg,
    ...(hasRef ? { referencePeakV: refPeakV } : {}),
    centrePhaseRad: phasors.centrePhaseRad,
    frequencyHz: carrier.frequencyHz,
    ...(options.ratioTolerancePct !== undefined ? { ratioTolerancePct: options.ratioTolerancePct } : {}),
    findingRoles: roleNames,
  });
  if (hasRef) findings.push(...figs.findings);
  const leadRad = (figs.phaseLeadDeg * Math.PI) / 180;
  const solution = solveAngle(sinCos, repair.phasors, fs, leadRad);
  const motion = analyzeMotion(solution.tS, solution.unwrappedDeg, { roles: roleNames });

  // Harmonics on the still parts, on at most HARMONIC_SAMPLES samples: the multi-harmonic fit is
  // O(N·H²), and a few hundred thousand samples pin the harmonic levels far below a millivolt.
  const still: SampleSegment[] = [];
  let budget = HARMONIC_SAMPLES;
  for (const seg of motion.segments) {
    if (seg.kind !== 'stationary' || seg.endIndex - seg.startIndex < 3 || budget <= 0) continue;
    const startSample = phasors.firstSample[seg.startIndex]!;
    let last = seg.endIndex - 1;
    while (last > seg.startIndex + 2 && phasors.firstSample[last]! + phasors.lengthSamples[last]! - startSample > budget) last--;
    const lengthSamples = phasors.firstSample[last]! + phasors.lengthSamples[last]! - startSample;
    still.push({ startSample, lengthSamples });
    budget -= lengthSamples;
  }

  const lines: LineResult[] = group.members.map((m) => {
    const k = slot(m.channel);
    const base = plainLine(m, repair.phasors, k, leadRad);
    const fig = figs.perLine.find((p) => p.role === m.role.base);
    const rescaled = repair.actions.find((a) => a.channel === k && a.action === 'rescaled');
    let harmonicMv: number | null = null;
    let thdPct: number | null = null;
    if (still.length > 0 && !rescaled) {
      const h = lineHarmonics(capture.channels[m.channel]!.samples, fs, carrier.track, still);
      // THD is meaningless on a line that sits near its null (its fundamental is ~0).
      if (h.ok) {
        harmonicMv = h.harmonicMv;
        thdPct = h.fundamentalRmsV > 0.05 * base.maxRmsV ? h.thdPct : null;
      }
    }
    return {
      ...base,
      quadratureMv: fig ? (fig.interceptQuadratureV / Math.SQRT2) * 1000 : base.quadratureMv,
      harmonicMv,
      thdPct,
    };
  });

  const nulls = nullVoltages({
    lines: solvedMembers.map((m) => ({
      role: formatRole(m.role),
      samples: capture.channels[m.channel]!.samples,
      // The stator maximum of the unit, not the line's own largest reading: a line parked at its
      // null never reaches its maximum, and the quadrature limit is a fraction of the maximum.
      maxRmsV: figs.outputMaxRmsV,
    })),
    sampleRateHz: fs,
    carrier: carrier.track,
    phaseLeadDeg: figs.phaseLeadDeg,
    cycles: phasors,
    angleDeg: solution.deg,
    velocityDegPerS: motion.velocityDegPerS,
    ...(options.nullLimitMv !== undefined ? { options: { nullLimitMv: options.nullLimitMv } } : {}),
  });
  findings.push(...nulls.findings);

  const pair = inPhasePair(sinCos, figs.phaseLeadDeg);
  const plane = sinCosPlane(pair.sinIn, pair.cosIn, solution.deg);
  findings.push(...motion.findings);

  return {
    result: {
      ...empty,
      transformationRatio: hasRef ? figs.transformationRatio : null,
      phaseLeadDeg: hasRef ? figs.phaseLeadDeg : null,
      method: sinCos.method,
      lines,
      nulls: nulls.nulls.map((n) => ({
        role: n.role, angleDeg: n.angleDeg, tS: n.tS, inPhaseMv: n.inPhaseMv, quadratureMv: n.quadratureMv, harmonicMv: n.harmonicMv, totalMv: n.totalMv,
      })),
      angle: { t: solution.tS, deg: solution.deg, unwrappedDeg: solution.unwrappedDeg, ambiguous180: !hasRef },
      family: hasRef ? figs.family : null,
      plane,
      repairs: repair.actions,
      angleValid: repair.angleValid,
    },
    motion,
    lines: repair.unit,
    findings,
  };
}

/** Largest fundamental RMS and median quadrature of one line against the phase ψ. */
function plainLine(member: { role: Role }, phasors: CyclePhasors, k: number, psiRad: number): LineResult {
  const re = phasors.inPhase[k]!;
  const im = phasors.quadrature[k]!;
  const c = Math.cos(psiRad);
  const s = Math.sin(psiRad);
  let maxPeak = 0;
  const quad: number[] = [];
  for (let m = 0; m < phasors.cycleCount; m++) {
    const mag = Math.hypot(re[m]!, im[m]!);
    if (!Number.isFinite(mag)) continue;
    maxPeak = Math.max(maxPeak, mag);
    quad.push(im[m]! * c - re[m]! * s);
  }
  // The upper median by selection (one quadrature per carrier cycle: 5e5 of them on a long
  // record at a high carrier; a comparator sort of them took ~0.1 s, measured).
  const median = quad.length ? selectKth(Float64Array.from(quad), quad.length >> 1) : NaN;
  return {
    role: formatRole(member.role),
    maxRmsV: maxPeak / Math.SQRT2,
    quadratureMv: (median / Math.SQRT2) * 1000,
    harmonicMv: null,
    thdPct: null,
  };
}
