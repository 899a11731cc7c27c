import { describe, expect, it } from 'vitest';
import { checkShaftFacts, decodeMiswiredDeg, undoWiringDeg, WIRING_HYPOTHESES } from '../../../core/diagnostics/shaftFacts.js';
import { analyzeCapture } from '../../../core/pipeline.js';
import { synthesizeCapture, type SynthLineSpec } from '../../../core/synth/synthesizeCapture.js';
import { makeSpec } from './wiringFixtures.js';

const diff = (a: number, b: number) => ((a - b + 540) % 360) - 180;

// NEETS Module 15 p.1-59, table 1-6 (wrong connections; transmitter set to 0° and turned CCW):
// what the receiver reads at the start and which way it turns. Receiver terminal ← transmitter lead.
const NEETS_TABLE_1_6: { row: string; perm: [number, number, number]; rotor: boolean; startDeg: number; turns: 'ccw' | 'cw' }[] = [
  { row: 'S1 and S3 reversed', perm: [2, 1, 0], rotor: false, startDeg: 0, turns: 'cw' },
  { row: 'S1 and S2 reversed', perm: [1, 0, 2], rotor: false, startDeg: 240, turns: 'cw' },
  { row: 'S2 and S3 reversed', perm: [0, 2, 1], rotor: false, startDeg: 120, turns: 'cw' },
  // TX S1→RX S2, S2→S3, S3→S1: RX S1 carries TX S3, RX S2 carries S1, RX S3 carries S2.
  { row: 'leads rotated (TX S1→RX S2, S2→S3, S3→S1)', perm: [2, 0, 1], rotor: false, startDeg: 120, turns: 'ccw' },
  { row: 'leads rotated the other way', perm: [1, 2, 0], rotor: false, startDeg: 240, turns: 'ccw' },
  { row: 'rotor R1/R2 reversed', perm: [0, 1, 2], rotor: true, startDeg: 180, turns: 'ccw' },
  { row: 'S1 and S2 reversed with the rotor reversed', perm: [1, 0, 2], rotor: true, startDeg: 60, turns: 'cw' },
];

describe('decodeMiswiredDeg and the twelve wirings (NEETS Module 15 p.1-59, table 1-6)', () => {
  for (const t of NEETS_TABLE_1_6) {
    it(`${t.row}: reads ${t.startDeg}° at 0° and turns ${t.turns}`, () => {
      expect(Math.abs(diff(decodeMiswiredDeg(0, t.perm, t.rotor), t.startDeg))).toBeLessThan(1e-9);
      const step = diff(decodeMiswiredDeg(10, t.perm, t.rotor), decodeMiswiredDeg(0, t.perm, t.rotor));
      expect(step).toBeCloseTo(t.turns === 'ccw' ? 10 : -10, 9);
    });
  }

  it('gives twelve distinct (sense, offset) pairs, each a multiple of 60°, and undoWiringDeg inverts each', () => {
    expect(WIRING_HYPOTHESES).toHaveLength(12);
    const keys = new Set(WIRING_HYPOTHESES.map((h) => `${h.sense}/${h.offsetDeg}`));
    expect(keys.size).toBe(12);
    for (const h of WIRING_HYPOTHESES) {
      expect(h.offsetDeg % 60).toBeCloseTo(0, 9);
      const perm = (['s1', 's2', 's3'] as const).map((k) => ['s1', 's2', 's3'].indexOf(h.leadOnTerminal[k])) as [number, number, number];
      for (const theta of [0, 33, 150, 299]) {
        const decoded = decodeMiswiredDeg(theta, perm, h.rotorReversed);
        expect(Math.abs(diff(undoWiringDeg(h, decoded), theta))).toBeLessThan(1e-9);
      }
    }
    // The rules of the wrong-connection table, as the analyser decodes them (derived from the standard equations).
    const rule = (id: string) => WIRING_HYPOTHESES.find((h) => h.id === id)!.rule;
    expect(rule('s1-s3-swapped')).toBe("θ' = −θ");
    expect(rule('s1-s2-swapped')).toBe("θ' = 240° − θ");
    expect(rule('s2-s3-swapped')).toBe("θ' = 120° − θ");
    expect(rule('rotor-reversed')).toBe("θ' = θ + 180°");
  });
});

/** A capture whose terminal labels carry the physical leads perm[0..2] (label Sx ← lead S(perm+1)). */
function miswiredCapture(perm: [number, number, number], degPerS: number, extraLeadDeg = 0) {
  const lead = (i: number) => `s${perm[i]! + 1}`;
  const line = (a: number, b: number, label: string): SynthLineSpec => ({ role: `${lead(a)}${lead(b)}`, label });
  const lines = [line(0, 2, 'S1-S3'), line(2, 1, 'S3-S2'), line(1, 0, 'S2-S1')];
  const spec = makeSpec({ type: 'ramp', startDeg: 0, degPerS }, lines, { durationS: 0.4 }, { phaseLeadDeg: 8 + extraLeadDeg });
  return analyzeCapture(synthesizeCapture(spec).capture);
}

describe('checkShaftFacts on analysed captures (shaft set at 0° and turned CCW)', () => {
  it('S1 and S2 swapped → wiring-swapped naming S1/S2 (reads 240°, runs CW)', () => {
    const a = miswiredCapture([1, 0, 2], 90);
    const r = checkShaftFacts(a.angle!, { atZero: true, turned: 'ccw' });
    expect(Math.abs(diff(r.observedStartDeg, 240))).toBeLessThan(2); // mean of the first 8 cycles of a 90°/s turn
    expect(r.observedTravelDeg).toBeLessThan(-30);
    expect(r.consistent.map((h) => h.id)).toEqual(['s1-s2-swapped']);
    expect(r.findings.map((f) => f.code)).toEqual(['wiring-swapped']);
    expect(r.findings[0]!.advice).toContain('S1 and S2');
  });

  it('leads rotated one place → reads 120°, runs CCW', () => {
    const r = checkShaftFacts(miswiredCapture([2, 0, 1], 90).angle!, { startDeg: 0, turned: 'ccw' });
    expect(r.consistent.map((h) => h.id)).toEqual(['leads-rotated-120']);
    expect(r.findings.map((f) => f.code)).toEqual(['wiring-swapped']);
  });

  it('R1/R2 reversed (the stator 180° out of time phase with the reference) → rotor-reversed', () => {
    const r = checkShaftFacts(miswiredCapture([0, 1, 2], 90, 180).angle!, { atZero: true, turned: 'ccw' });
    expect(r.consistent.map((h) => h.id)).toEqual(['rotor-reversed']);
    expect(r.findings.map((f) => f.code)).toEqual(['rotor-reversed']);
  });

  it('correct wiring → no finding', () => {
    const r = checkShaftFacts(miswiredCapture([0, 1, 2], 90).angle!, { atZero: true, turned: 'ccw' });
    expect(r.consistent.map((h) => h.id)).toEqual(['as-labelled']);
    expect(r.findings).toEqual([]);
  });

  it('static capture, start stated only: both wirings that read 240° are listed, simplest first', () => {
    const r = checkShaftFacts(miswiredCapture([1, 0, 2], 0).angle!, { atZero: true });
    expect(r.consistent.map((h) => h.id).sort()).toEqual(['leads-rotated-240', 's1-s2-swapped']);
    expect(r.findings).toHaveLength(1);
    expect(r.findings[0]!.advice).toMatch(/Equally simple/);
  });

  it('a 37° offset with the right direction is a zeroing problem, not a swap (NEETS Module 15 p.1-57)', () => {
    const ramp = Float64Array.from({ length: 200 }, (_, m) => 37 + 0.05 * m);
    const trace = { deg: ramp, unwrappedDeg: ramp };
    const r = checkShaftFacts(trace, { atZero: true, turned: 'ccw' });
    expect(r.consistent).toEqual([]);
    expect(r.findings.map((f) => f.code)).toEqual(['zero-offset']);
    expect(r.findings[0]!.figures!.offsetDeg).toBeCloseTo(37, 0);
  });

  it('says so when the shaft was said to turn but the trace did not move', () => {
    const trace = { deg: new Float64Array(50).fill(12), unwrappedDeg: new Float64Array(50).fill(12) };
    expect(checkShaftFacts(trace, { turned: 'cw' }).findings.map((f) => f.code)).toEqual(['shaft-facts-unchecked']);
  });
});
