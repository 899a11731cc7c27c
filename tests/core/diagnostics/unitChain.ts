/**
 * Test helper: runs a synthetic capture through carrier tracking, per-cycle demodulation and the
 * angle solver (the stages the diagnostics read), for one unit, without the pipeline.
 */
import { sinCosFromLines, type SinCosPhasors } from '../../../core/angle/sinCosFromLines.js';
import { solveAngle, type AngleSolution } from '../../../core/angle/solveAngle.js';
import { trackCarrier, type CarrierEstimate } from '../../../core/carrier/trackCarrier.js';
import { demodulateCycles, type CyclePhasors } from '../../../core/demod/demodulateCycles.js';
import type { BaseRole } from '../../../core/model/roles.js';
import { synthesizeCapture, type SynthCapture, type SynthSpec } from '../../../core/synth/synthesizeCapture.js';

export interface UnitChain {
  readonly syn: SynthCapture;
  readonly carrier: CarrierEstimate;
  readonly phasors: CyclePhasors;
  /** Stator channels in capture order (after the reference), their roles and phasor slots. */
  readonly lines: readonly { role: string; slot: number; samples: Float32Array }[];
  readonly sinCos: SinCosPhasors;
  readonly angle: AngleSolution;
  readonly refPeakV: number;
}

export function runUnitChain(spec: SynthSpec): UnitChain {
  const syn = synthesizeCapture(spec);
  const { capture, roles } = syn;
  const refIndex = roles.indexOf('ref');
  const carrier = trackCarrier([capture.channels[refIndex]!.samples], 'reference', capture.sampleRateHz, capture.sampleCount, ['ref']);
  const channels = capture.channels.map((c) => c.samples);
  const phasors = demodulateCycles(channels, carrier.track, capture.sampleCount);
  const lines = roles
    .map((role, i) => ({ role, slot: i, samples: capture.channels[i]!.samples }))
    .filter((l) => l.role !== 'ref');
  const kind = spec.units[0]!.kind;
  const sinCos = sinCosFromLines({ kind, lines: lines.map((l) => ({ base: l.role as BaseRole, channel: l.slot })) }, phasors)!;
  const angle = solveAngle(sinCos, phasors, capture.sampleRateHz);
  return { syn, carrier, phasors, lines, sinCos, angle, refPeakV: carrier.referenceRmsV * Math.SQRT2 };
}

