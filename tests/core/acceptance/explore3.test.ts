import { it } from 'vitest';
import { analyzeCapture } from '../../../core/pipeline.js';
import { synthesizeCapture } from '../../../core/synth/synthesizeCapture.js';
import { synchroSpec, THREE_LINES } from './fixtures.js';

it('explore 3', () => {
  const ramp = { type: 'ramp', startDeg: 0, degPerS: 60 } as const;
  let syn = synthesizeCapture(synchroSpec(ramp, {}, { lines: [{ role: 's3s1', label: 'S1-S3' }, { role: 's1s2', label: 'S3-S2' }, { role: 's2s3', label: 'S2-S1' }] }));
  let a = analyzeCapture(syn.capture, { shaftFacts: { atElectricalZero: true, turned: 'ccw' } });
  console.log('swap', a.findings.map((f) => `${f.code}:${f.severity}:${f.message}:${f.advice}`));
  syn = synthesizeCapture(synchroSpec(ramp));
  const cap = { ...syn.capture, channels: syn.capture.channels.map((c, i) => (i === 0 ? { ...c, samples: c.samples.map((v) => -v) } : c)) };
  a = analyzeCapture(cap, { shaftFacts: { atElectricalZero: true, turned: 'ccw' } });
  console.log('rotor', a.findings.map((f) => `${f.code}:${f.severity}:${f.message}`));
  a = analyzeCapture(syn.capture, { shaftFacts: { atElectricalZero: true, turned: 'ccw' } });
  console.log('asis', a.findings.map((f) => `${f.code}:${f.severity}`));
  const q = [{ role: 's1s3', quadratureV: 0.05 }, { role: 's3s2', quadratureV: -0.03 }, { role: 's2s1', quadratureV: 0.02 }];
  for (const m of [{ type: 'static', deg: 37 }, { type: 'ramp', startDeg: 10, degPerS: 200 }] as const) {
    for (const lead of [8, 20]) {
      syn = synthesizeCapture(synchroSpec(m, {}, { lines: q, phaseLeadDeg: lead }));
      a = analyzeCapture(syn.capture);
      console.log('figs', m.type, lead, a.units[0]!.transformationRatio, a.units[0]!.phaseLeadDeg, a.units[0]!.lines.map((l) => l.quadratureMv), a.findings.map((f) => `${f.code}:${f.severity}`));
    }
  }
  syn = synthesizeCapture(synchroSpec({ type: 'static', deg: 0.05 }, { noiseV: 0.001, quantization: undefined }, { lines: [{ role: 's1s3', quadratureV: 0.02, thirdHarmonicV: 0.015 }, { role: 's3s2' }, { role: 's2s1' }] }));
  a = analyzeCapture(syn.capture);
  console.log('null', JSON.stringify(a.units[0]!.nulls), a.findings.map((f) => `${f.code}:${f.severity}:${JSON.stringify(f.figures)}`));
  syn = synthesizeCapture(synchroSpec({ type: 'static', deg: 0.05 }, { noiseV: 0.001, quantization: {bits: 16} }, { lines: [{ role: 's1s3', quadratureV: 0.02, thirdHarmonicV: 0.015 }, { role: 's3s2' }, { role: 's2s1' }] }));
  a = analyzeCapture(syn.capture);
  console.log('null16', JSON.stringify(a.units[0]!.nulls));
});
