import { describe, expect, it } from 'vitest';
import { checkSynchroLines, type LineFault } from '../../../core/diagnostics/wiringFaults.js';
import { repairLines } from '../../../core/diagnostics/repairLines.js';
import type { SynthLineSpec } from '../../../core/synth/synthesizeCapture.js';
import { demodCase, makeSpec, REF_PEAK_V, solvedAngleErrorDeg, THREE_LINES } from './wiringFixtures.js';

const TURN = { type: 'ramp', startDeg: 10, degPerS: 720 } as const; // one full turn in the 0.5 s record
const check = (c: ReturnType<typeof demodCase>, withRef = true) =>
  checkSynchroLines(c.unit, c.phasors, withRef ? { referencePeakV: REF_PEAK_V } : {});
const codes = (r: { findings: readonly { code: string; severity: string }[] }) => r.findings.map((f) => `${f.code}:${f.severity}`);

describe('checkSynchroLines: electrical zero is healthy (NEETS Module 15 p.1-49 zeroing values)', () => {
  for (const [name, refRmsV, tr, lineRmsV] of [
    ['26 V / 11.8 V', 26, 11.8 / 26, 10.2],
    ['115 V / 90 V', 115, 90 / 115, 78],
  ] as const) {
    it(`${name} at 0°: S1-S3 reads 0, S2-S3 reads ${lineRmsV} V, and no line is called dead or shorted`, () => {
      const spec = makeSpec({ type: 'static', deg: 0 }, THREE_LINES, { carrier: { frequencyHz: 400.13, rmsV: refRmsV, phaseDeg: 25 } }, { transformationRatio: tr });
      const c = demodCase(spec);
      const result = checkSynchroLines(c.unit, c.phasors, { referencePeakV: refRmsV * Math.SQRT2 });
      // NEETS p.1-49: 0 V between S1 and S3, 78 V (10.2 V) between S2 and S3 at electrical zero.
      const mag = (ch: number) => Math.hypot(c.phasors.inPhase[ch]![10]!, c.phasors.quadrature[ch]![10]!) / Math.SQRT2;
      expect(mag(1)).toBeLessThan(0.001 * lineRmsV); // s1s3
      expect(Math.abs(mag(2) - lineRmsV) / lineRmsV).toBeLessThan(0.005); // s3s2 (10.219 V / 77.942 V exactly)
      // Signs at 0° (standard equations, derived): S3-S2 in time phase with R1-R2, S2-S1 in anti-phase,
      // once the unit's 8° lead is removed.
      const lead = (8 * Math.PI) / 180;
      const inPhase = (ch: number) => (c.phasors.inPhase[ch]![10]! * Math.cos(lead) + c.phasors.quadrature[ch]![10]! * Math.sin(lead)) / Math.SQRT2;
      expect(inPhase(2)).toBeGreaterThan(0.995 * lineRmsV);
      expect(inPhase(3)).toBeLessThan(-0.995 * lineRmsV);
      expect(result.faults).toEqual([]);
      expect(result.findings).toEqual([]);
      // Two lines against the common lead S3 (S1-S3 and S2-S3): still healthy.
      const two = demodCase(makeSpec({ type: 'static', deg: 0 }, [{ role: 's1s3' }, { role: 's2s3' }], { carrier: { frequencyHz: 400.13, rmsV: refRmsV, phaseDeg: 25 } }, { transformationRatio: tr }));
      expect(checkSynchroLines(two.unit, two.phasors, { referencePeakV: refRmsV * Math.SQRT2 }).findings).toEqual([]);
    });
  }
});

describe('checkSynchroLines: dead channel', () => {
  it('three lines, one dead (static at 37°): named, rebuildable; Kirchhoff residual large', () => {
    const c = demodCase(makeSpec({ type: 'static', deg: 37 }, [{ role: 's1s3' }, { role: 's3s2', gain: 0 }, { role: 's2s1' }]));
    const r = check(c);
    expect(codes(r)).toEqual(['dead-channel:warning']);
    expect(r.findings[0]!.roles).toEqual(['s3s2']);
    expect(r.faults).toEqual([expect.objectContaining({ kind: 'dead', line: 1, rebuildable: true })]);
    // Kirchhoff (the three line voltages sum to zero) is broken by the missing line: a sum of K·sin(37°+120°)
    expect(r.kirchhoffResidualRatio).toBeGreaterThan(0.3);
  });

  it('three lines, one dead, shaft turning', () => {
    const c = demodCase(makeSpec(TURN, [{ role: 's1s3', gain: 0 }, { role: 's3s2' }, { role: 's2s1' }]));
    const r = check(c, false);
    expect(codes(r)).toEqual(['dead-channel:warning']);
    expect(r.faults[0]).toMatchObject({ kind: 'dead', line: 0, rebuildable: true });
  });

  it('two lines, one dead, shaft turning: error, not rebuildable', () => {
    const c = demodCase(makeSpec(TURN, [{ role: 's1s2' }, { role: 's3s2', gain: 0 }]));
    const r = check(c);
    expect(codes(r)).toEqual(['dead-channel:error']);
    expect(r.faults[0]).toMatchObject({ kind: 'dead', line: 1, rebuildable: false });
  });

  it('resolver with a dead cosine winding, shaft turning', () => {
    const c = demodCase(makeSpec(TURN, [{ role: 'sin' }, { role: 'cos', gain: 0 }]));
    expect(codes(check(c))).toEqual(['dead-channel:error']);
  });

  it('all stator lines silent with the excitation present: the rotor-open signature (NEETS Module 15 p.1-57)', () => {
    const c = demodCase(makeSpec({ type: 'static', deg: 37 }, [{ role: 's1s3', gain: 0 }, { role: 's3s2', gain: 0 }, { role: 's2s1', gain: 0 }]));
    const r = check(c);
    expect(codes(r)).toEqual(['dead-channel:error']);
    expect(r.faults).toHaveLength(3);
  });

  it('a two-line static capture with one line at ~0 is not called dead: it may be at that line\'s null (0°, 180°)', () => {
    const c = demodCase(makeSpec({ type: 'static', deg: 180 }, [{ role: 's1s3' }, { role: 's3s2' }]));
    expect(check(c).findings).toEqual([]);
  });
});

describe('checkSynchroLines: scale mismatch (probe factor)', () => {
  const cases: { name: string; motion: typeof TURN | { type: 'static'; deg: number }; lines: SynthLineSpec[]; line: number; factor: number; ambiguous?: boolean }[] = [
    { name: 'three lines, S2-S1 read ×10, turning', motion: TURN, lines: [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1', gain: 10 }], line: 2, factor: 10 },
    { name: 'three lines, S1-S3 read ×1/10, static', motion: { type: 'static', deg: 37 }, lines: [{ role: 's1s3', gain: 0.1 }, { role: 's3s2' }, { role: 's2s1' }], line: 0, factor: 0.1 },
    { name: 'three lines, S3-S2 read ×2, static at 200°', motion: { type: 'static', deg: 200 }, lines: [{ role: 's1s3' }, { role: 's3s2', gain: 2 }, { role: 's2s1' }], line: 1, factor: 2 },
    { name: 'three lines, S3-S2 inverted, turning', motion: TURN, lines: [{ role: 's1s3' }, { role: 's3s2', gain: -1 }, { role: 's2s1' }], line: 1, factor: -1 },
    { name: 'two lines against S2, S1-S2 read ×10, turning', motion: TURN, lines: [{ role: 's1s2', gain: 10 }, { role: 's3s2' }], line: 0, factor: 10 },
    { name: 'resolver, cos read ×1/10, turning', motion: TURN, lines: [{ role: 'sin' }, { role: 'cos', gain: 0.1 }], line: 1, factor: 0.1 },
  ];
  for (const t of cases) {
    it(`${t.name}: factor found and snapped`, () => {
      const c = demodCase(makeSpec(t.motion, t.lines));
      const r = check(c);
      expect(codes(r)).toEqual(['scale-mismatch:warning']);
      const f = r.faults[0] as Extract<LineFault, { kind: 'scale' }>;
      expect(f.kind).toBe('scale');
      expect(f.line).toBe(t.line);
      expect(f.likelyFactor).toBe(t.factor);
      expect(Math.abs(f.factor / t.factor - 1)).toBeLessThan(0.01);
      expect(r.findings[0]!.figures!.likelyFactor).toBe(t.factor);
    });
  }

  it('a 3 % gain difference between probes is left alone (probe tolerance, for the unit-figure diagnostics)', () => {
    const c = demodCase(makeSpec(TURN, [{ role: 's1s3' }, { role: 's3s2', gain: 1.03 }, { role: 's2s1' }]));
    expect(check(c).findings).toEqual([]);
  });
});

describe('checkSynchroLines: shorted lines (NEETS Module 15 p.1-57; stick values derived from the standard equations)', () => {
  const STICK: Record<string, [number, number]> = { s1s2: [120, 300], s2s3: [60, 240], s1s3: [0, 180] };
  for (const leads of ['s1s2', 's2s3', 's1s3'] as const) {
    it(`${leads.toUpperCase()} shorted, shaft turning: named, decoded angle sticks at ${STICK[leads]!.join('°/')}°`, () => {
      const c = demodCase(makeSpec(TURN, THREE_LINES, {}, { statorFault: { type: 'shorted', leads } }));
      const r = check(c);
      expect(codes(r)).toEqual(['shorted-lines:error']);
      expect(r.faults[0]).toEqual({ kind: 'shorted', leads, stickDeg: STICK[leads] });
      // The decoded angle (as the solver would give it) sits on one of the two values.
      const { deg } = solvedAngleErrorDeg(c.unit, c.phasors, () => 0);
      const near = Array.from(deg).filter((d) => STICK[leads]!.some((s) => Math.abs(((d - s + 540) % 360) - 180) < 1)).length;
      expect(near / deg.length).toBeGreaterThan(0.9);
      expect(repairLines(c.unit, c.phasors, r).angleValid).toBe(false);
    });
  }

  it('two lines against S3 with S1-S2 shorted: the computed third line is the one at 0', () => {
    const c = demodCase(makeSpec(TURN, [{ role: 's1s3' }, { role: 's2s3' }], {}, { statorFault: { type: 'shorted', leads: 's1s2' } }));
    const r = check(c);
    expect(codes(r)).toEqual(['shorted-lines:error']);
    expect(r.faults[0]).toMatchObject({ kind: 'shorted', leads: 's1s2' });
  });

  it('a static capture of a shorted pair looks like a healthy unit at that pair\'s null and is not flagged', () => {
    const c = demodCase(makeSpec({ type: 'static', deg: 75 }, THREE_LINES, {}, { statorFault: { type: 'shorted', leads: 's1s2' } }));
    expect(check(c).findings).toEqual([]);
  });
});

describe('checkSynchroLines: open lead (NEETS Module 15 p.1-57: turns one way, then reverses)', () => {
  const PEAKS: Record<string, [number, number]> = { s1: [150, 330], s2: [90, 270], s3: [30, 210] };
  for (const lead of ['s1', 's2', 's3'] as const) {
    it(`${lead.toUpperCase()} open, floating: the two lines through it read −½ of the third; angle stuck at ${PEAKS[lead]!.join('°/')}°`, () => {
      const c = demodCase(makeSpec(TURN, THREE_LINES, {}, { statorFault: { type: 'open', lead } }));
      const r = check(c);
      expect(codes(r)).toEqual(['open-lead:error']);
      expect(r.faults[0]).toEqual({ kind: 'open', lead, pattern: 'stuck', foldDeg: PEAKS[lead] });
    });

    it(`${lead.toUpperCase()} open, fed back from a receiver: the decoded angle folds back at ${PEAKS[lead]!.join('°/')}°`, () => {
      const c = demodCase(makeSpec(TURN, THREE_LINES, {}, { statorFault: { type: 'open', lead, feed: 'receiver' } }));
      const r = check(c);
      expect(codes(r)).toEqual(['open-lead:warning']);
      expect(r.faults[0]).toEqual({ kind: 'open', lead, pattern: 'fold-back', foldDeg: PEAKS[lead] });
      // The decoded trace really runs forward then backward (negative control for the detector).
      const { deg } = solvedAngleErrorDeg(c.unit, c.phasors, () => 0);
      let forward = 0, backward = 0;
      for (let m = 1; m < deg.length; m++) {
        const d = ((deg[m]! - deg[m - 1]! + 540) % 360) - 180;
        if (d > 0.5) forward++;
        if (d < -0.5) backward++;
      }
      expect(forward).toBeGreaterThan(20);
      expect(backward).toBeGreaterThan(20);
    });
  }

  it('a shaft that wobbles (smooth reversals) is not taken for a fold-back', () => {
    const c = demodCase(makeSpec({ type: 'wobble', centreDeg: 120, amplitudeDeg: 90, frequencyHz: 2 }));
    expect(check(c).findings).toEqual([]);
  });
});
