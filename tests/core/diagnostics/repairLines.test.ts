import { describe, expect, it } from 'vitest';
import { checkSynchroLines } from '../../../core/diagnostics/wiringFaults.js';
import { repairLines } from '../../../core/diagnostics/repairLines.js';
import type { MotionSpec } from '../../../core/synth/motion.js';
import type { SynthLineSpec } from '../../../core/synth/synthesizeCapture.js';
import { angleNoiseBoundDeg } from '../../helpers/angleError.js';
import { CARRIER_HZ, demodCase, FS, makeSpec, REF_PEAK_V, solvedAngleErrorDeg, TR_26V } from './wiringFixtures.js';

const TURN: MotionSpec = { type: 'ramp', startDeg: 10, degPerS: 720 };
const STATIC: MotionSpec = { type: 'static', deg: 37 };
const LINE_PEAK_V = TR_26V * REF_PEAK_V;

function repaired(motion: MotionSpec, lines: SynthLineSpec[]) {
  const c = demodCase(makeSpec(motion, lines));
  const check = checkSynchroLines(c.unit, c.phasors, { referencePeakV: REF_PEAK_V });
  const before = c.phasors.inPhase.map((a) => Float64Array.from(a));
  const fix = repairLines(c.unit, c.phasors, check);
  // The input phasors are never modified.
  c.phasors.inPhase.forEach((a, ch) => expect(Array.from(a)).toEqual(Array.from(before[ch]!)));
  return { c, fix, err: solvedAngleErrorDeg(fix.unit, fix.phasors, (t) => c.syn.angleDeg(t)) };
}

// Issue acceptance: the dead-line and wrong-probe captures still give the angle within 0.02°
// (12-bit, 10 mV noise, 26 V / 11.8 V unit).
describe('repairLines(unit, phasors, check)', () => {
  for (const [name, motion] of [['static', STATIC], ['turning', TURN]] as const) {
    it(`drops a dead line of a three-line capture (${name}); angle within 0.02°`, () => {
      const { fix, err } = repaired(motion, [{ role: 's1s3' }, { role: 's3s2', gain: 0 }, { role: 's2s1' }]);
      expect(fix.actions).toEqual([{ action: 'dropped', base: 's3s2', channel: 2, reason: 'dead' }]);
      expect(fix.unit.lines.map((l) => l.base)).toEqual(['s1s3', 's2s1']);
      expect(fix.angleValid).toBe(true);
      expect(err.rmsDeg).toBeLessThan(0.02);
    });

    it(`divides a line read ×10 by 10 (${name}); angle within 0.02°`, () => {
      const { fix, err } = repaired(motion, [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1', gain: 10 }]);
      expect(fix.actions).toEqual([{ action: 'rescaled', base: 's2s1', channel: 3, dividedBy: 10, ambiguous: false }]);
      expect(err.rmsDeg).toBeLessThan(0.02);
    });

    it(`multiplies a line read ×1/10 by 10 (${name}); angle within 2× the noise bound of that line`, () => {
      const { fix, err } = repaired(motion, [{ role: 's1s3', gain: 0.1 }, { role: 's3s2' }, { role: 's2s1' }]);
      expect(fix.actions).toMatchObject([{ action: 'rescaled', base: 's1s3', dividedBy: 0.1 }]);
      // After the ×10 correction that line carries 10× the 10 mV noise; the bound (Kay 1993 ch.3
      // LS amplitude variance through atan2) with 100 mV is about 0.017°.
      expect(err.rmsDeg).toBeLessThan(2 * angleNoiseBoundDeg(FS / CARRIER_HZ, 0.1, LINE_PEAK_V, 12));
    });
  }

  it('without a repair the ×10 capture is far off (negative control)', () => {
    const c = demodCase(makeSpec(STATIC, [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1', gain: 10 }]));
    expect(solvedAngleErrorDeg(c.unit, c.phasors, (t) => c.syn.angleDeg(t)).rmsDeg).toBeGreaterThan(1);
  });

  it('two lines against a common lead, one read ×10: the ratio is fixed and the angle is right', () => {
    const { fix, err } = repaired(TURN, [{ role: 's1s2', gain: 10 }, { role: 's3s2' }]);
    expect(fix.actions).toMatchObject([{ action: 'rescaled', base: 's1s2', dividedBy: 10 }]);
    expect(err.rmsDeg).toBeLessThan(0.02);
  });

  it('marks the angle invalid for a dead line in a two-line capture and for shorted lines', () => {
    expect(repaired(TURN, [{ role: 's1s2' }, { role: 's3s2', gain: 0 }]).fix.angleValid).toBe(false);
    const c = demodCase(makeSpec(TURN, undefined, {}, { statorFault: { type: 'shorted', leads: 's2s3' } }));
    const fix = repairLines(c.unit, c.phasors, checkSynchroLines(c.unit, c.phasors));
    expect(fix.angleValid).toBe(false);
    expect(fix.actions).toEqual([]);
  });

  it('changes nothing on a healthy capture', () => {
    const { fix, c } = repaired(TURN, [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }]);
    expect(fix.actions).toEqual([]);
    expect(fix.phasors).toBe(c.phasors);
    expect(fix.unit.lines).toEqual(c.unit.lines);
  });
});
