import { sinCosFromLines, type UnitLines } from './angle/sinCosFromLines.js';
import { solveAngle } from './angle/solveAngle.js';
import { trackCarrier } from './carrier/trackCarrier.js';
import { demodulateCycles, type CyclePhasors } from './demod/demodulateCycles.js';
import { clippedFraction } from './diagnostics/clippedFraction.js';
import type { Analysis, LineResult, UnitResult } from './model/analysis.js';
import type { Capture } from './model/capture.js';
import { CaptureError } from './model/errors.js';
import { finding, type Finding } from './model/findings.js';
import { formatRole, type Role } from './model/roles.js';
import { assignRoles, type RoleOptions } from './roles/assignRoles.js';

/** What the user can tell the analysis beyond the capture itself (all optional). */
export interface AnalyzeOptions extends RoleOptions {
  /** Two-speed sets: fine turns per coarse turn (detected when omitted). */
  readonly speedRatio?: number;
  /** Two-speed sets: deliberate stick-off rotation of the coarse unit, degrees. */
  readonly stickOffDeg?: number;
  /** What the shaft did during the capture, to expose swapped leads or a reversed rotor. */
  readonly shaftFacts?: { readonly atElectricalZero?: boolean; readonly turned?: 'ccw' | 'cw' };
  /** Stepped accuracy runs: accuracy class ±N′, the step between stops, or the list of stops. */
  readonly accuracy?: { readonly classArcmin?: number; readonly stepDeg?: number; readonly nominalDeg?: readonly number[] };
  /** Null-voltage limit, mV RMS ("report, don't judge" when omitted). */
  readonly nullLimitMv?: number;
  /** Tolerance for matching a standard transformation ratio, percent. */
  readonly ratioTolerancePct?: number;
  /** Control-transformer error gradient, V per degree. */
  readonly ctGradientVPerDeg?: number;
}

const STATOR_BASES = new Set(['s1s3', 's3s2', 's2s1', 's3s1', 's2s3', 's1s2', 'sin', 'cos', 'ct']);

/**
 * The whole pipeline on one imported capture: roles → carrier → per-cycle phasors → angle per
 * unit. Bad data becomes findings; a capture that cannot be analysed throws one CaptureError.
 */
export function analyzeCapture(capture: Capture, options: AnalyzeOptions = {}): Analysis {
  const assignment = assignRoles(capture, options);
  const findings: Finding[] = [...assignment.findings];
  const roles = assignment.roles;

  const refIndex = roles.findIndex((r) => r?.base === 'ref' && r.unit === '');
  const statorIndices = roles
    .map((r, i) => (r && STATOR_BASES.has(r.base) ? i : -1))
    .filter((i) => i >= 0);
  if (statorIndices.length === 0) {
    throw new CaptureError(
      `no stator channel found among ${capture.channels.map((c) => `"${c.label}"`).join(', ')}; label the columns (S1-S3, SIN...) or set them with --roles`,
    );
  }

  const sources = refIndex >= 0 ? [capture.channels[refIndex]!.samples] : statorIndices.map((i) => capture.channels[i]!.samples);
  const sourceRoles = refIndex >= 0 ? ['ref'] : statorIndices.map((i) => formatRole(roles[i]!));
  const carrier = trackCarrier(sources, refIndex >= 0 ? 'reference' : 'stators', capture.sampleRateHz, capture.sampleCount, sourceRoles);
  findings.push(...carrier.findings);
  if (refIndex < 0) {
    findings.push(
      finding('no-reference', 'warning', 'The capture has no excitation (R1-R2) channel; the carrier was recovered from the stator lines.', {
        advice:
          'Without the excitation the sign of the stator voltages is unknown, so the angle is known only modulo 180° (the half-plane was kept continuous from the first cycle); capture R1-R2 as well to settle it. Transformation ratio and phase lead need the excitation too.',
        roles: sourceRoles,
      }),
    );
  }

  const used = roles.map((r, i) => (r && r.base !== 'ignore' ? i : -1)).filter((i) => i >= 0);
  const phasors = demodulateCycles(used.map((i) => capture.channels[i]!.samples), carrier.track, capture.sampleCount);
  const slot = (channel: number): number => used.indexOf(channel);
  const samplesPerCycle = (capture.sampleRateHz / carrier.frequencyHz);
  checkRecord(phasors, samplesPerCycle, findings);

  const refPeakV = refIndex >= 0 ? carrier.referenceRmsV * Math.SQRT2 : NaN;
  const units = groupUnits(roles).map((group) => solveUnit(group, phasors, slot, capture, refPeakV, carrier.source, findings));
  const primary = units.find((u) => u.angle !== null)?.angle ?? null;

  return {
    input: {
      sampleRateHz: capture.sampleRateHz,
      samples: capture.sampleCount,
      startS: capture.startS,
      channels: capture.channels.map((c, i) => ({
        column: c.column,
        label: c.label,
        role: roles[i] ? formatRole(roles[i]!) : null,
        unit: c.unit,
        clippedFraction: clippedFraction(c.samples, capture.sampleCount, samplesPerCycle),
      })),
    },
    carrier: {
      source: carrier.source,
      frequencyHz: carrier.frequencyHz,
      startHz: carrier.startHz,
      endHz: carrier.endHz,
      sineFitHz: Number.isFinite(carrier.sineFitHz) ? carrier.sineFitHz : null,
      referenceRmsV: Number.isFinite(carrier.referenceRmsV) ? carrier.referenceRmsV : null,
      cycles: phasors.cycleCount,
      samplesPerCycle,
    },
    angle: primary,
    units,
    findings,
  };
}

interface UnitGroup {
  readonly id: string;
  readonly members: { readonly channel: number; readonly role: Role }[];
}

function groupUnits(roles: readonly (Role | undefined)[]): UnitGroup[] {
  const groups = new Map<string, UnitGroup>();
  roles.forEach((role, channel) => {
    if (!role || !STATOR_BASES.has(role.base)) return;
    const id = role.unit || 'unit';
    if (!groups.has(id)) groups.set(id, { id, members: [] });
    (groups.get(id)!.members as { channel: number; role: Role }[]).push({ channel, role });
  });
  return [...groups.values()];
}

function solveUnit(
  group: UnitGroup,
  phasors: CyclePhasors,
  slot: (channel: number) => number,
  capture: Capture,
  refPeakV: number,
  source: 'reference' | 'stators',
  findings: Finding[],
): UnitResult {
  const bases = group.members.map((m) => m.role.base);
  const kind: UnitResult['kind'] = bases.includes('ct') ? 'ct' : bases.includes('sin') || bases.includes('cos') ? 'resolver' : 'synchro';
  const roleNames = group.members.map((m) => formatRole(m.role));
  const base = { id: group.id, kind, roles: roleNames, nulls: [] };
  const unitLines: UnitLines = {
    kind: kind === 'resolver' ? 'resolver' : 'synchro',
    lines: group.members.map((m) => ({ base: m.role.base, channel: slot(m.channel) })),
  };
  const sinCos = kind === 'ct' ? undefined : sinCosFromLines(unitLines, phasors);
  if (!sinCos) {
    if (kind !== 'ct') {
      findings.push(
        finding('angle-unsolvable', 'error', `Unit "${group.id}" has too few stator signals to solve an angle (${roleNames.join(', ')}).`, {
          advice: 'A synchro needs two or three line-to-line voltages, a resolver both its sine and cosine windings.',
          roles: roleNames,
        }),
      );
    }
    const psi = 0;
    return {
      ...base,
      transformationRatio: null,
      phaseLeadDeg: null,
      method: null,
      lines: group.members.map((m) => lineResult(m, phasors, slot, psi)),
      angle: null,
    };
  }
  const solution = solveAngle(sinCos, phasors, capture.sampleRateHz);
  const psiRad = (solution.phaseLeadDeg * Math.PI) / 180;
  const radius = Array.from(solution.radiusV).filter(Number.isFinite).sort((a, b) => a - b);
  const medianRadius = radius.length ? radius[radius.length >> 1]! : NaN;
  const hasRef = source === 'reference';
  return {
    ...base,
    transformationRatio: hasRef && refPeakV > 0 ? medianRadius / refPeakV : null,
    phaseLeadDeg: hasRef ? solution.phaseLeadDeg : null,
    method: sinCos.method,
    lines: group.members.map((m) => lineResult(m, phasors, slot, psiRad)),
    angle: { t: solution.tS, deg: solution.deg, unwrappedDeg: solution.unwrappedDeg, ambiguous180: !hasRef },
  };
}

function lineResult(
  member: { channel: number; role: Role },
  phasors: CyclePhasors,
  slot: (channel: number) => number,
  psiRad: number,
): LineResult {
  const k = slot(member.channel);
  const re = phasors.inPhase[k]!;
  const im = phasors.quadrature[k]!;
  const c = Math.cos(psiRad);
  const s = Math.sin(psiRad);
  let maxPeak = 0;
  const quad: number[] = [];
  for (let m = 0; m < phasors.cycleCount; m++) {
    const q = im[m]! * c - re[m]! * s;
    const mag = Math.hypot(re[m]!, im[m]!);
    if (Number.isFinite(mag)) {
      maxPeak = Math.max(maxPeak, mag);
      quad.push(q);
    }
  }
  quad.sort((a, b) => a - b);
  return {
    role: formatRole(member.role),
    maxRmsV: maxPeak / Math.SQRT2,
    quadratureMv: quad.length ? (quad[quad.length >> 1]! / Math.SQRT2) * 1000 : NaN,
    harmonicMv: null,
    thdPct: null,
  };
}

function checkRecord(phasors: CyclePhasors, samplesPerCycle: number, findings: Finding[]): void {
  if (samplesPerCycle < 8) {
    findings.push(
      finding('low-sample-rate', samplesPerCycle < 4 ? 'error' : 'warning', `Only ${samplesPerCycle.toFixed(1)} samples per carrier cycle.`, {
        advice: 'Per-cycle amplitudes and harmonics need at least 8 (better 20 or more) samples per cycle; raise the scope sample rate.',
        figures: { samplesPerCycle },
      }),
    );
  }
  if (phasors.cycleCount < 10) {
    findings.push(
      finding('short-record', 'warning', `The record holds only ${phasors.cycleCount} whole carrier cycles.`, {
        advice: 'Capture at least 10 cycles (better 100 or more) so the carrier and the unit figures are well determined.',
        figures: { cycles: phasors.cycleCount },
      }),
    );
  }
}
