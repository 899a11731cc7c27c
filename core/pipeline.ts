import { analyzeAccuracy } from './analyzeAccuracy.js';
import { analyzeUnit, type UnitAnalysis, type UnitGroup } from './analyzeUnit.js';
import { trackCarrier } from './carrier/trackCarrier.js';
import { combineUnits } from './combineUnits.js';
import { demodulateCycles, type CycleDemodulator, type CyclePhasors } from './demod/demodulateCycles.js';
import { checkCaptureQuality, type CarrierResidualFit, type ResidualChannel } from './diagnostics/captureQuality.js';
import type { CarrierTrack } from './carrier/carrierTrack.js';
import { clippedFraction } from './diagnostics/clippedFraction.js';
import { measureSampleExtremes, mergeSampleExtremes, type SampleExtremes } from './diagnostics/sampleExtremes.js';
import { checkShaftFacts } from './diagnostics/shaftFacts.js';
import type { Analysis } from './model/analysis.js';
import type { Capture } from './model/capture.js';
import { CaptureError } from './model/errors.js';
import { finding, type Finding } from './model/findings.js';
import { formatRole, type Role } from './model/roles.js';
import { analyzeMotion } from './motion/analyzeMotion.js';
import { assignRoles } from './roles/assignRoles.js';
import type { AnalyzeOptions } from './model/analyzeOptions.js';

export type { AnalyzeOptions };

const STATOR_BASES = new Set(['s1s3', 's3s2', 's2s1', 's3s1', 's2s3', 's1s2', 'sin', 'cos', 'ct']);

/** How the pipeline runs its heaviest kernels (the default: on this thread). */
export interface AnalysisEngine {
  /** Per-cycle demodulation (the carrier track's pass and every channel's). */
  readonly demodulate?: CycleDemodulator;
  /**
   * Starts fitCarrierResidual (the mains-hum and DC check's pass over the samples) elsewhere,
   * e.g. on another thread while the units are analysed here, and returns a function that gives
   * its result; undefined when it cannot (the fit is then made here).
   */
  readonly startCarrierResidual?: (
    channels: readonly ResidualChannel[],
    phasors: CyclePhasors,
    track: CarrierTrack,
    carrierHz: number,
  ) => (() => CarrierResidualFit | undefined) | undefined;
}

/**
 * The whole pipeline on one imported capture: roles → carrier → per-cycle phasors → each unit
 * (wiring, angle, unit figures, motion, harmonics, nulls, plane; a CT's error) → units together
 * (two-speed, tracking) → accuracy run → shaft facts → capture quality. Bad data becomes
 * findings; a capture that cannot be analysed throws one CaptureError. `engine` may run the
 * demodulation and the carrier residual fit elsewhere (another thread); it must give the
 * results this thread would.
 */
export function analyzeCapture(capture: Capture, options: AnalyzeOptions = {}, engine: AnalysisEngine = {}): Analysis {
  const demodulate = engine.demodulate ?? demodulateCycles;
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

  const hasRef = refIndex >= 0;
  const carrierChannels = hasRef ? [refIndex] : statorIndices.filter((i) => roles[i]!.base !== 'ct');
  if (carrierChannels.length === 0) {
    throw new CaptureError('a control-transformer output alone does not give the carrier phase; capture the excitation (R1-R2) as well');
  }
  const sourceRoles = carrierChannels.map((i) => formatRole(roles[i]!));
  const carrier = trackCarrier(
    carrierChannels.map((i) => capture.channels[i]!.samples),
    hasRef ? 'reference' : 'stators',
    capture.sampleRateHz,
    capture.sampleCount,
    sourceRoles,
    demodulate,
  );
  findings.push(...carrier.findings);
  if (!hasRef) {
    findings.push(
      finding('no-reference', 'warning', 'The capture has no excitation (R1-R2) channel; the carrier was recovered from the stator lines.', {
        advice:
          'Without the excitation the sign of the stator voltages is unknown, so the angle is known only modulo 180° (the half-plane was kept continuous from the first cycle); capture R1-R2 as well to settle it. Transformation ratio and phase lead need the excitation too.',
        roles: sourceRoles,
      }),
    );
  }

  const used = roles.map((r, i) => (r && r.base !== 'ignore' ? i : -1)).filter((i) => i >= 0);
  const phasors = demodulate(used.map((i) => capture.channels[i]!.samples), carrier.track, capture.sampleCount);
  const slot = (channel: number): number => used.indexOf(channel);
  const samplesPerCycle = capture.sampleRateHz / carrier.frequencyHz;
  const refPeakV = hasRef ? carrier.referenceRmsV * Math.SQRT2 : NaN;
  // The quality check's channels are `used`, in order (phasor slot k); its residual fit needs
  // only the phasors, so it may run elsewhere while the units are analysed.
  const residual = engine.startCarrierResidual?.(
    used.map((ch, k) => ({ samples: capture.channels[ch]!.samples, phasorChannel: k })),
    phasors,
    carrier.track,
    carrier.frequencyHz,
  );
  const clipped = capture.channels.map((c, i) =>
    clippedFraction(c.samples, capture.sampleCount, samplesPerCycle, slot(i) >= 0 ? wholeChannelExtremes(c.samples, capture.sampleCount, phasors, slot(i)) : undefined),
  );

  // Stator units first (a CT's error is read against its transmitter's phase lead).
  const ctx = { capture, phasors, slot, carrier, refPeakV, options };
  const groups = groupUnits(roles);
  const analysed = new Map<UnitGroup, UnitAnalysis>();
  for (const group of groups.filter((g) => !isCt(g))) analysed.set(group, analyzeUnit(ctx, group, null));
  const transmitterLead = [...analysed.values()].find((u) => u.result.phaseLeadDeg !== null)?.result.phaseLeadDeg ?? null;
  for (const group of groups.filter(isCt)) analysed.set(group, analyzeUnit(ctx, group, transmitterLead));
  const unitAnalyses = groups.map((g) => analysed.get(g)!);
  const units = unitAnalyses.map((u) => u.result);
  for (const u of unitAnalyses) findings.push(...u.findings);

  // The primary trace: a two-speed set's combined angle, else the first unit with an angle.
  const combined = combineUnits(units, options);
  findings.push(...combined.findings);
  const firstWithAngle =
    unitAnalyses.find((u) => u.result.angle !== null && u.result.angleValid) ?? unitAnalyses.find((u) => u.result.angle !== null);
  const primary = combined.angle ?? firstWithAngle?.result.angle ?? null;
  const motion = combined.angle ? analyzeMotion(combined.angle.t, combined.angle.unwrappedDeg, { roles: firstWithAngle?.result.roles ?? [] }) : firstWithAngle?.motion ?? null;
  if (combined.angle && motion) findings.push(...motion.findings);

  let accuracy: Analysis['accuracy'] = null;
  if (primary && motion) {
    const result = analyzeAccuracy(primary, motion, options.accuracy ?? {}, firstWithAngle?.result.roles ?? []);
    accuracy = result.accuracy;
    findings.push(...result.findings);
  }
  if (primary && options.shaftFacts && firstWithAngle?.result.kind === 'synchro') {
    const facts = checkShaftFacts(primary, options.shaftFacts.atElectricalZero !== undefined || options.shaftFacts.turned !== undefined
      ? { ...(options.shaftFacts.atElectricalZero ? { atZero: true } : {}), ...(options.shaftFacts.turned ? { turned: options.shaftFacts.turned } : {}) }
      : {}, { roles: firstWithAngle.result.roles });
    findings.push(...facts.findings);
  }

  const quality = checkCaptureQuality({
    sampleCount: capture.sampleCount,
    samplesPerCycle,
    carrierHz: carrier.frequencyHz,
    track: carrier.track,
    phasors,
    channels: used.map((ch, k) => ({
      role: formatRole(roles[ch]!),
      samples: capture.channels[ch]!.samples,
      phasorChannel: k,
      scalePeakV: ch === refIndex ? refPeakV : unitScalePeakV(units, formatRole(roles[ch]!)),
      isReference: ch === refIndex,
    })),
    units: unitAnalyses
      .filter((u) => u.lines !== null)
      .map((u) => ({ lines: u.lines!, roleNames: u.lines!.lines.map((l) => formatRole(roles[used[l.channel]!]!)) })),
    clippedFractions: used.map((ch) => clipped[ch]!),
    ...(residual ? { carrierResidual: residual } : {}),
  });
  findings.push(...quality.findings);
  explainMainsOscillation(findings, carrier.frequencyHz);

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
        clippedFraction: clipped[i]!,
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
    motion,
    accuracy,
    twoSpeed: combined.twoSpeed,
    tracking: combined.tracking,
    findings,
  };
}

/**
 * An angle oscillation at a mains frequency (or its alias through the one-per-cycle angle rate)
 * while the lines carry mains hum is pickup leaking through the demodulator, not a hunting
 * receiver: the hunting finding becomes an info that says so.
 */
function explainMainsOscillation(findings: Finding[], carrierHz: number): void {
  if (!findings.some((f) => f.code === 'mains-hum')) return;
  for (let i = 0; i < findings.length; i++) {
    const f = findings[i]!;
    const hz = f.figures?.frequencyHz;
    if (f.code !== 'hunting' || hz === undefined) continue;
    const nearMains = [50, 60].some((mains) =>
      [1, 2, 3].some((k) => {
        const tone = k * mains;
        const alias = Math.abs(tone - carrierHz * Math.round(tone / carrierHz));
        return Math.abs(hz - tone) < 1 || Math.abs(hz - alias) < 1;
      }),
    );
    if (!nearMains) continue;
    findings[i] = finding('hunting', 'info', `${f.message} It sits at a mains frequency, and the lines carry mains hum.`, {
      advice: 'This is most likely hum leaking into the angle rather than a receiver hunting: remove the ground loop or shield the leads (see the mains-hum finding), then recapture.',
      roles: f.roles,
      ...(f.figures ? { figures: { ...f.figures } } : {}),
    });
  }
}

/**
 * A channel's extremes over the whole record: the demodulation's (over the samples its cycles
 * cover) merged with those of the samples before the first cycle and after the last.
 */
function wholeChannelExtremes(samples: Float32Array, sampleCount: number, phasors: CyclePhasors, channel: number): SampleExtremes {
  const m = phasors.cycleCount;
  if (m === 0) return measureSampleExtremes(samples, 0, sampleCount);
  const first = phasors.firstSample[0]!;
  const end = phasors.firstSample[m - 1]! + phasors.lengthSamples[m - 1]!;
  const before = measureSampleExtremes(samples, 0, first);
  return mergeSampleExtremes(mergeSampleExtremes(before, phasors.extremes[channel]!), measureSampleExtremes(samples, end, sampleCount));
}

const isCt = (g: UnitGroup): boolean => g.members.some((m) => m.role.base === 'ct');

/** One group per unit prefix; a CT output is a unit of its own. */
function groupUnits(roles: readonly (Role | undefined)[]): UnitGroup[] {
  const groups = new Map<string, { id: string; members: { channel: number; role: Role }[] }>();
  roles.forEach((role, channel) => {
    if (!role || !STATOR_BASES.has(role.base)) return;
    const id = role.base === 'ct' ? (role.unit ? `${role.unit}.ct` : 'ct') : role.unit || 'unit';
    if (!groups.has(id)) groups.set(id, { id, members: [] });
    groups.get(id)!.members.push({ channel, role });
  });
  return [...groups.values()];
}

/** The stator maximum (peak volts) of the unit a role belongs to. */
function unitScalePeakV(units: Analysis['units'], role: string): number {
  const unit = units.find((u) => u.roles.includes(role));
  const max = unit ? Math.max(...unit.lines.map((l) => l.maxRmsV)) : NaN;
  return max * Math.SQRT2;
}
