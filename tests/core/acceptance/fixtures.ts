import type { Finding } from '../../../core/model/findings.js';
import type { MotionSpec } from '../../../core/synth/motion.js';
import type { SynthLineSpec, SynthSpec, SynthUnitSpec } from '../../../core/synth/synthesizeCapture.js';

/**
 * Shared specs of the end-to-end acceptance tests. The truth of every check is the generator's own
 * parameters (seeded synthesis, core/synth/synthesizeCapture.ts).
 */

/** Sample rate of most acceptance captures: 100 samples per 400 Hz carrier cycle. */
export const FS = 40_000;
/** A carrier a little off 400 Hz, so nothing lines up with whole samples by accident. */
export const CARRIER_HZ = 400.13;
/** 26 V / 11.8 V synchro family: excitation 26 V RMS, stator maximum 11.8 V RMS (NEETS Module 15 p.1-60). */
export const REF_26_V = 26;
export const TR_26 = 11.8 / 26;
/** 115 V / 90 V synchro family: excitation 115 V RMS, stator maximum 90 V RMS (NEETS Module 15 p.1-60). */
export const REF_115_V = 115;
export const TR_115 = 90 / 115;

export const THREE_LINES: readonly SynthLineSpec[] = [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }];

/** A 26 V / 11.8 V synchro, 0.5 s at 40 kS/s, 5 mV noise, 12-bit scope; `over` and `unit` replace parts. */
export function synchroSpec(motion: MotionSpec, over: Partial<SynthSpec> = {}, unit: Partial<SynthUnitSpec> = {}): SynthSpec {
  return {
    seed: 2024,
    sampleRateHz: FS,
    durationS: 0.5,
    carrier: { frequencyHz: CARRIER_HZ, rmsV: REF_26_V, phaseDeg: 25 },
    units: [{ kind: 'synchro', transformationRatio: TR_26, phaseLeadDeg: 8, motion, lines: THREE_LINES, ...unit }],
    noiseV: 0.005,
    quantization: { bits: 12 },
    ...over,
  };
}

export const codes = (findings: readonly Finding[]): string[] => findings.map((f) => f.code);
/** Codes of the findings above info level. */
export const problems = (findings: readonly Finding[]): string[] => findings.filter((f) => f.severity !== 'info').map((f) => f.code);
export const byCode = (findings: readonly Finding[], code: string): Finding | undefined => findings.find((f) => f.code === code);
