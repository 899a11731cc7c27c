import type { UnitLines } from '../../../core/angle/sinCosFromLines.js';
import { sinCosFromLines } from '../../../core/angle/sinCosFromLines.js';
import { solveAngle } from '../../../core/angle/solveAngle.js';
import { angleDiffDeg } from '../../../core/angle/unwrapDeg.js';
import { constantCarrierTrack, type CarrierTrack } from '../../../core/carrier/carrierTrack.js';
import { demodulateCycles, type CyclePhasors } from '../../../core/demod/demodulateCycles.js';
import type { BaseRole } from '../../../core/model/roles.js';
import type { MotionSpec } from '../../../core/synth/motion.js';
import { synthesizeCapture, type SynthLineSpec, type SynthSpec, type SynthUnitSpec } from '../../../core/synth/synthesizeCapture.js';

export const FS = 100_000;
export const CARRIER_HZ = 400.13;
export const CARRIER_PHASE_DEG = 25;
/** 26 V / 11.8 V synchro (NEETS Module 15 p.1-60): excitation 26 V RMS, stator maximum 11.8 V RMS. */
export const REF_RMS_V = 26;
export const TR_26V = 11.8 / 26;
export const REF_PEAK_V = REF_RMS_V * Math.SQRT2;

export const THREE_LINES: SynthLineSpec[] = [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }];

export interface DemodCase {
  readonly syn: ReturnType<typeof synthesizeCapture>;
  readonly phasors: CyclePhasors;
  readonly track: CarrierTrack;
  readonly unit: UnitLines;
  /** Role per capture channel ("ref", "s1s3"...). */
  readonly roles: readonly string[];
}

export function makeSpec(
  motion: MotionSpec,
  lines: readonly SynthLineSpec[] = THREE_LINES,
  over: Partial<SynthSpec> = {},
  unitOver: Partial<SynthUnitSpec> = {},
): SynthSpec {
  const kind = lines.some((l) => l.role === 'sin' || l.role === 'cos') ? 'resolver' : 'synchro';
  return {
    seed: 4242,
    sampleRateHz: FS,
    durationS: 0.5,
    carrier: { frequencyHz: CARRIER_HZ, rmsV: REF_RMS_V, phaseDeg: CARRIER_PHASE_DEG },
    units: [{ kind, transformationRatio: TR_26V, phaseLeadDeg: 8, motion, lines, ...unitOver }],
    noiseV: 0.01,
    quantization: { bits: 12 },
    ...over,
  };
}

/** Synthesises a capture and demodulates every channel against the known carrier (constant track). */
export function demodCase(spec: SynthSpec): DemodCase {
  const syn = synthesizeCapture(spec);
  const n = syn.capture.sampleCount;
  const track = constantCarrierTrack(FS, spec.carrier.frequencyHz, ((spec.carrier.phaseDeg ?? 0) * Math.PI) / 180, n);
  const phasors = demodulateCycles(syn.capture.channels.map((c) => c.samples), track, n);
  const kind = spec.units[0]!.kind;
  const lines = syn.roles.map((r, i) => ({ base: r as BaseRole, channel: i })).filter((l) => l.base !== 'ref');
  return { syn, phasors, track, unit: { kind, lines }, roles: syn.roles };
}

/** RMS and worst wrapped angle error of the solved trace against the synthetic truth, degrees (edge cycles skipped). */
export function solvedAngleErrorDeg(unit: UnitLines, phasors: CyclePhasors, truth: (tS: number) => number): { rmsDeg: number; maxDeg: number; deg: Float64Array } {
  const sc = sinCosFromLines(unit, phasors)!;
  const sol = solveAngle(sc, phasors, FS);
  let worst = 0;
  let sum2 = 0;
  let n = 0;
  for (let m = 1; m < sol.deg.length - 1; m++) {
    const e = angleDiffDeg(sol.deg[m]!, truth(sol.tS[m]!));
    worst = Math.max(worst, Math.abs(e));
    sum2 += e * e;
    n++;
  }
  return { rmsDeg: Math.sqrt(sum2 / n), maxDeg: worst, deg: sol.deg };
}
