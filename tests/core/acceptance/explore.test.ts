import { it } from 'vitest';
import { analyzeCapture } from '../../../core/pipeline.js';
import { synthesizeCapture } from '../../../core/synth/synthesizeCapture.js';
import { angleError } from '../../helpers/angleError.js';
import { synchroSpec, THREE_LINES } from './fixtures.js';

const ramp = { type: 'ramp', startDeg: 10, degPerS: 200 } as const;
const slow = { type: 'ramp', startDeg: 10, degPerS: 50 } as const;
const stat = { type: 'static', deg: 37 } as const;
const cases: Record<string, any> = {
  drift2_ramp: synchroSpec(ramp, { carrier: { frequencyHz: 400.13, rmsV: 26, driftHzPerS: 2 } }),
  drift10_slow: synchroSpec(slow, { carrier: { frequencyHz: 400.13, rmsV: 26, driftHzPerS: 10 } }),
  drift10_static: synchroSpec(stat, { carrier: { frequencyHz: 400.13, rmsV: 26, driftHzPerS: 10 } }),
  drift10_ramp_nonoise: synchroSpec(ramp, { noiseV: 0, quantization: undefined, carrier: { frequencyHz: 400.13, rmsV: 26, driftHzPerS: 10 } }),
  ramp_nonoise: synchroSpec(ramp, { noiseV: 0, quantization: undefined }),
  ramp_360: synchroSpec({ type: 'ramp', startDeg: 10, degPerS: 360 }),
  quad_null: synchroSpec({ type: 'static', deg: 0.3 }, {}, { lines: THREE_LINES.map((l) => ({ ...l, quadratureV: 0.3 })) }),
  quad_cross: synchroSpec({ type: 'ramp', startDeg: -0.5, degPerS: 2 }, {}, { lines: THREE_LINES.map((l) => ({ ...l, quadratureV: 0.3 })) }),
  quad_small_ramp: synchroSpec(ramp, {}, { lines: [{ role: 's1s3', quadratureV: 0.05 }, { role: 's3s2', quadratureV: -0.03 }, { role: 's2s1', quadratureV: 0.02 }] }),
  twoLines: synchroSpec(ramp, {}, { lines: [{ role: 's2s3' }, { role: 's1s3' }] }),
  twoLines_static: synchroSpec(stat, {}, { lines: [{ role: 's2s3' }, { role: 's1s3' }] }),
  resolver: synchroSpec(ramp, {}, { kind: 'resolver', lines: [{ role: 'sin' }, { role: 'cos' }] }),
  resolver_static: synchroSpec(stat, {}, { kind: 'resolver', lines: [{ role: 'sin' }, { role: 'cos' }] }),
  s115_400: synchroSpec(ramp, { carrier: { frequencyHz: 400.13, rmsV: 115, phaseDeg: 10 } }, { transformationRatio: 90 / 115 }),
  s115_60: synchroSpec({ type: 'ramp', startDeg: 10, degPerS: 30 }, { carrier: { frequencyHz: 60.02, rmsV: 115, phaseDeg: 10 } }, { transformationRatio: 90 / 115, phaseLeadDeg: 15 }),
  s115_60_static: synchroSpec(stat, { carrier: { frequencyHz: 60.02, rmsV: 115, phaseDeg: 10 } }, { transformationRatio: 90 / 115, phaseLeadDeg: 15 }),
  b8: synchroSpec(ramp, { quantization: { bits: 8 } }),
  b8_static: synchroSpec(stat, { quantization: { bits: 8 } }),
};
it('explore', () => {
  for (const [name, spec] of Object.entries(cases)) {
    const syn = synthesizeCapture(spec);
    try {
      const a = analyzeCapture(syn.capture);
      const err = a.angle ? angleError(a.angle, (t) => syn.angleDeg(t), 2).rmsDeg : NaN;
      console.log(name, 'err', err.toFixed(4), 'TR', a.units[0]?.transformationRatio?.toFixed(5), 'lead', a.units[0]?.phaseLeadDeg?.toFixed(4), 'fam', a.units[0]?.family?.name, a.findings.map((f) => `${f.code}:${f.severity}${f.figures ? JSON.stringify(f.figures) : ''}`).join(' | '));
      if (name.startsWith('quad')) console.log(JSON.stringify(a.units[0]!.nulls), JSON.stringify(a.units[0]!.lines.map(l=>l.quadratureMv)));
    } catch (e) {
      console.log(name, 'THREW', (e as Error).message);
    }
  }
});
