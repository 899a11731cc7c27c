import { it } from 'vitest';
import { analyzeCapture } from '../../../core/pipeline.js';
import { synthesizeCapture } from '../../../core/synth/synthesizeCapture.js';
import type { MotionSpec } from '../../../core/synth/motion.js';
import { angleError } from '../../helpers/angleError.js';
import { synchroSpec, THREE_LINES, TR_26 } from './fixtures.js';

it('explore motion', () => {
  let t0 = Date.now();
  const stepSpec = synchroSpec({ type: 'step', fromDeg: 10, toDeg: 40, atS: 0.2, dampingRatio: 0.4, naturalHz: 5 }, { durationS: 1.5 });
  let syn = synthesizeCapture(stepSpec);
  let a = analyzeCapture(syn.capture);
  const { fit, fromOvershoot, fromDecrement, ...s } = a.motion!.steps[0]!;
  console.log('step', Date.now() - t0, JSON.stringify(s), JSON.stringify({ fit, fromOvershoot, fromDecrement }), a.motion!.steps.length, a.findings.map((f) => f.code));
  t0 = Date.now();
  syn = synthesizeCapture(synchroSpec({ type: 'wobble', centreDeg: 30, amplitudeDeg: 3 / 60, frequencyHz: 7 }, { durationS: 2 }));
  a = analyzeCapture(syn.capture);
  console.log('jitter', Date.now() - t0, a.motion!.jitter!.rmsArcmin, a.motion!.jitter!.dominantHz, JSON.stringify(a.motion!.jitter!.tones), a.findings.map((f) => f.code));
  t0 = Date.now();
  syn = synthesizeCapture(synchroSpec({ type: 'sum', parts: [{ type: 'wobble', centreDeg: 30, amplitudeDeg: 3 / 60, frequencyHz: 7 }, { type: 'wobble', centreDeg: 0, amplitudeDeg: 1.5 / 60, frequencyHz: 23, phaseDeg: 40 }] }, { durationS: 2 }));
  a = analyzeCapture(syn.capture);
  console.log('2tones', Date.now() - t0, a.motion!.jitter!.rmsArcmin, a.motion!.jitter!.dominantHz, JSON.stringify(a.motion!.jitter!.tones), a.findings.map((f) => f.code));
  // accuracy
  t0 = Date.now();
  const err = (deg: number) => (2 * Math.sin((deg * Math.PI) / 180) + 1 * Math.sin((2 * deg * Math.PI) / 180 + 0.5)) / 60;
  const parts: MotionSpec[] = [{ type: 'static', deg: err(0) }];
  const dwell = 0.5;
  const N = 24;
  for (let k = 1; k < N; k++) parts.push({ type: 'step', fromDeg: 0, toDeg: 15 + err(15 * k) - err(15 * (k - 1)), atS: dwell * k, dampingRatio: 0.7, naturalHz: 15 });
  syn = synthesizeCapture(synchroSpec({ type: 'sum', parts }, { durationS: dwell * N, sampleRateHz: 20000 }));
  const t1 = Date.now();
  a = analyzeCapture(syn.capture);
  const acc = a.accuracy as any;
  console.log('acc', t1 - t0, Date.now() - t1, acc?.mode, acc?.incrementDeg, acc?.ppArcmin, JSON.stringify(acc?.positions?.map((p: any) => [p.nominalDeg, p.errorArcmin.toFixed(3), (err(p.nominalDeg) * 60).toFixed(3)])), a.findings.map((f) => f.code));
  // two speed
  t0 = Date.now();
  const motion: MotionSpec = { type: 'ramp', startDeg: 100, degPerS: 20 };
  const ts = synchroSpec(motion, { durationS: 1, units: [
    { id: 'coarse', kind: 'synchro', transformationRatio: TR_26, phaseLeadDeg: 8, motion, lines: THREE_LINES },
    { id: 'fine', kind: 'synchro', transformationRatio: TR_26, phaseLeadDeg: 6, motion, speed: 36, lines: THREE_LINES.map((l) => ({ ...l, label: `fine ${l.role}` })) },
  ] });
  syn = synthesizeCapture({ ...ts, units: [{ ...ts.units[0]!, lines: THREE_LINES.map((l) => ({ ...l, label: `coarse ${l.role.toUpperCase().replace(/(S\d)(S\d)/, '$1-$2')}` })) }, { ...ts.units[1]!, lines: THREE_LINES.map((l) => ({ ...l, label: `fine ${l.role.toUpperCase().replace(/(S\d)(S\d)/, '$1-$2')}` })) }] });
  console.log(syn.capture.channels.map((c) => c.label));
  for (const opts of [{ speedRatio: 36 }, {}]) {
    a = analyzeCapture(syn.capture, opts);
    console.log('2speed', Date.now() - t0, JSON.stringify({ ...a.twoSpeed, coarseErrorDeg: undefined }), angleError(a.angle!, (t) => syn.angleDeg(t, 0)).rmsDeg, a.findings.map((f) => f.code));
  }
  // CT
  t0 = Date.now();
  syn = synthesizeCapture(synchroSpec({ type: 'ramp', startDeg: 20, degPerS: 10 }, { durationS: 1, units: [
    { kind: 'synchro', transformationRatio: TR_26, phaseLeadDeg: 8, motion: { type: 'ramp', startDeg: 20, degPerS: 10 }, lines: THREE_LINES },
    { kind: 'resolver', transformationRatio: 22.5 / 26, phaseLeadDeg: 8, motion: { type: 'ramp', startDeg: -5, degPerS: 10 }, lines: [{ role: 'sin', label: 'CT' }] },
  ] }));
  a = analyzeCapture(syn.capture);
  const ct = a.units.find((u) => u.kind === 'ct')?.ctError;
  console.log('ct', Date.now() - t0, a.units.map((u) => u.id + ':' + u.kind), JSON.stringify(ct?.nullCrossings), ct?.gradientVPerDeg, ct?.gradientSource, ct && [ct.errorDeg[100], ct.tS[100], ct.errorDeg[300], ct.tS[300]], a.findings.map((f) => f.code));
});
