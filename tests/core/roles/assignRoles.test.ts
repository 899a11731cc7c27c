import { describe, expect, it } from 'vitest';
import type { Capture } from '../../../core/model/capture.js';
import { formatRole } from '../../../core/model/roles.js';
import { assignRoles } from '../../../core/roles/assignRoles.js';
import { synthesizeCapture, type SynthSpec } from '../../../core/synth/synthesizeCapture.js';

const base = (over: Partial<SynthSpec> = {}): SynthSpec => ({
  seed: 9,
  sampleRateHz: 20_000,
  durationS: 0.1,
  carrier: { frequencyHz: 400, rmsV: 26 },
  units: [{ kind: 'synchro', transformationRatio: 0.4538, phaseLeadDeg: 8, motion: { type: 'ramp', startDeg: 0, degPerS: 900 }, lines: [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }] }],
  noiseV: 0.005,
  ...over,
});

const relabel = (capture: Capture, labels: string[]): Capture => ({
  ...capture,
  channels: capture.channels.map((c, i) => ({ ...c, label: labels[i]! })),
});

const rolesOf = (capture: Capture, options = {}): (string | undefined)[] =>
  assignRoles(capture, options).roles.map((r) => (r ? formatRole(r) : undefined));

describe('assignRoles(capture, options)', () => {
  it('takes roles from labels in any column order, with no finding', () => {
    const syn = synthesizeCapture(base({ order: [2, 0, 3, 1] }));
    const result = assignRoles(syn.capture);
    expect(result.roles.map((r) => r && formatRole(r))).toEqual(syn.roles);
    expect(result.findings).toHaveLength(0);
  });

  it('unlabelled: the three lines that sum to zero (Kirchhoff) are the stator, the steady largest channel the reference', () => {
    const syn = synthesizeCapture(base({ order: [1, 2, 0, 3] }));
    const capture = relabel(syn.capture, ['CH1', 'CH2', 'CH3', 'CH4']);
    const result = assignRoles(capture);
    expect(result.roles.map((r) => r && formatRole(r))).toEqual(['s1s3', 's3s2', 'ref', 's2s1']);
    expect(result.findings.map((f) => f.code)).toEqual(['roles-guessed']);
    expect(result.findings[0]!.severity).toBe('warning'); // line order rests on column order
  });

  it('unlabelled resolver with reference: ref by signal, sin/cos by column order', () => {
    const syn = synthesizeCapture(base({ units: [{ kind: 'resolver', transformationRatio: 0.4538, phaseLeadDeg: 5, motion: { type: 'ramp', startDeg: 0, degPerS: 900 }, lines: [{ role: 'sin' }, { role: 'cos' }] }] }));
    const capture = relabel(syn.capture, ['CH1', 'CH2', 'CH3']);
    expect(rolesOf(capture)).toEqual(['ref', 'sin', 'cos']);
  });

  it('--roles overrides labels and accepts labels, chN and column numbers', () => {
    const syn = synthesizeCapture(base());
    const capture = relabel(syn.capture, ['A', 'B', 'C', 'D']);
    expect(rolesOf(capture, { overrides: { ref: 'a', s1s3: 'ch2', s3s2: '3', s2s1: 'D' } })).toEqual(['ref', 's1s3', 's3s2', 's2s1']);
  });

  it('bad --roles give one clear CaptureError naming the problem', () => {
    const syn = synthesizeCapture(base());
    expect(() => assignRoles(syn.capture, { overrides: { s9s9: 'ch1' } })).toThrow(/not a role/);
    expect(() => assignRoles(syn.capture, { overrides: { ref: 'ch9' } })).toThrow(/no channel "ch9".*ch1 "R1-R2"/);
    expect(() => assignRoles(syn.capture, { overrides: { s1s3: 'ch2', s3s2: 'ch2' } })).toThrow(/two roles/);
    expect(() => assignRoles(syn.capture, { overrides: { s1s3: 'ch3' } })).toThrow(/2 channels have the role s1s3/); // ch2 keeps its S1-S3 label
  });
});
