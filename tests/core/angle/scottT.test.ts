import { describe, expect, it } from 'vitest';
import { linesToCos, linesToSin, missingLine } from '../../../core/angle/scottT.js';
import { sinCosFromLines } from '../../../core/angle/sinCosFromLines.js';
import { solveAngle } from '../../../core/angle/solveAngle.js';
import { angleDiffDeg } from '../../../core/angle/unwrapDeg.js';
import type { BaseRole } from '../../../core/model/roles.js';
import { phasorsFrom } from '../../helpers/phasorsFrom.js';

const atan2Deg = (s: number, c: number): number => ((Math.atan2(s, c) * 180) / Math.PI + 360) % 360;

// Signed stator line voltages (V RMS, + = in time phase with R1-R2) at each shaft angle, from the
// standard synchro equations E(S1-S3) = TR·E·sinθ, E(S3-S2) = TR·E·sin(θ+120°),
// E(S2-S1) = TR·E·sin(θ+240°). Zero and maximum headings per NEETS Module 15 (NAVEDTRA 14187)
// p.1-60 voltage-testing table; magnitudes 10.2 V / 78 V at electrical zero per NEETS p.1-49;
// stator maxima 11.8 V (26 V units) and 90 V (115 V units) per NEETS p.1-60.
const TABLE_26V: [number, number, number, number][] = [
  [0, 0.0, 10.219, -10.219], [15, 3.054, 8.344, -11.398], [30, 5.9, 5.9, -11.8],
  [45, 8.344, 3.054, -11.398], [60, 10.219, 0.0, -10.219], [90, 11.8, -5.9, -5.9],
  [120, 10.219, -10.219, 0.0], [180, 0.0, -10.219, 10.219], [210, -5.9, -5.9, 11.8],
  [270, -11.8, 5.9, 5.9], [300, -10.219, 10.219, 0.0], [330, -5.9, 11.8, -5.9],
];
const TABLE_115V: [number, number, number, number][] = [
  [0, 0.0, 77.942, -77.942], [15, 23.294, 63.64, -86.933], [30, 45.0, 45.0, -90.0],
  [45, 63.64, 23.294, -86.933], [60, 77.942, 0.0, -77.942], [90, 90.0, -45.0, -45.0],
  [135, 63.64, -86.933, 23.294], [180, 0.0, -77.942, 77.942], [225, -63.64, -23.294, 86.933],
  [270, -90.0, 45.0, 45.0], [330, -45.0, 90.0, -45.0],
];

describe('Scott-T relations on the synchro check tables', () => {
  for (const [name, table, maxV] of [['26 V / 11.8 V', TABLE_26V, 11.8], ['115 V / 90 V', TABLE_115V, 90]] as const) {
    it(`decodes every heading of the ${name} table (tolerance from 1e-3 V rounding)`, () => {
      for (const [deg, a, b, c] of table) {
        const s = linesToSin(a, b, c);
        const k = linesToCos(b, c);
        expect(Math.abs(angleDiffDeg(atan2Deg(s, k), deg))).toBeLessThan(0.01);
        // radius = stator maximum line-to-line at every angle (derived from the equations)
        expect(Math.hypot(s, k)).toBeCloseTo(maxV, 2);
        // Kirchhoff: the three line voltages sum to zero
        expect(Math.abs(a + b + c)).toBeLessThan(2e-3);
      }
    });
  }

  it('electrical zero: S1-S3 null and S3-S2 = -S2-S1 = 10.219 V for 26 V units (NEETS p.1-49: 10.2 V)', () => {
    const [, a, b, c] = TABLE_26V[0]!;
    expect(a).toBe(0);
    expect(b).toBeCloseTo(10.2, 1);
    expect(missingLine(a, b)).toBeCloseTo(c, 3);
  });
});

// Two lines measured against a common lead: the formulas of the two-line table, each written
// out by hand from the standard equations (derived), against the Kirchhoff route the code takes.
describe('two lines against a common lead', () => {
  const cases: { common: string; roles: [BaseRole, BaseRole]; sin: (p: number, q: number) => number; cos: (p: number, q: number) => number }[] = [
    { common: 'S2', roles: ['s1s2', 's3s2'], sin: (p, q) => p - q, cos: (p, q) => (p + q) / Math.sqrt(3) },
    { common: 'S3', roles: ['s1s3', 's2s3'], sin: (p) => p, cos: (p, q) => (p - 2 * q) / Math.sqrt(3) },
    { common: 'S1', roles: ['s2s1', 's3s1'], sin: (_p, q) => -q, cos: (p, q) => (q - 2 * p) / Math.sqrt(3) },
  ];
  const lineOf = (role: BaseRole, deg: number): number => {
    const t = (deg * Math.PI) / 180;
    const lines: Record<string, number> = {
      s1s3: Math.sin(t), s3s2: Math.sin(t + (2 * Math.PI) / 3), s2s1: Math.sin(t + (4 * Math.PI) / 3),
    };
    lines.s3s1 = -lines.s1s3!; lines.s2s3 = -lines.s3s2!; lines.s1s2 = -lines.s2s1!;
    return lines[role]!;
  };
  for (const c of cases) {
    it(`common lead ${c.common} (${c.roles.join(', ')}) decodes 0..345° in 15° steps`, () => {
      const degs = Array.from({ length: 24 }, (_, i) => i * 15);
      const p = degs.map((d) => 11.8 * lineOf(c.roles[0], d));
      const q = degs.map((d) => 11.8 * lineOf(c.roles[1], d));
      const sc = sinCosFromLines(
        { kind: 'synchro', lines: [{ base: c.roles[0], channel: 0 }, { base: c.roles[1], channel: 1 }] },
        phasorsFrom([p, q]),
      )!;
      expect(sc.method).toBe('two-lines');
      degs.forEach((d, i) => {
        expect(sc.sinRe[i]).toBeCloseTo(c.sin(p[i]!, q[i]!), 9);
        expect(sc.cosRe[i]).toBeCloseTo(c.cos(p[i]!, q[i]!), 9);
        expect(Math.abs(angleDiffDeg(atan2Deg(sc.sinRe[i]!, sc.cosRe[i]!), d))).toBeLessThan(1e-9);
      });
    });
  }
});

// NEETS Module 15 table 1-6 (p.1-59), wrong stator connections with the rotor wiring correct, and
// the rotor-reversal rule of p.1-69: what a receiver (here: the analyser) reads when the
// transmitter is at 0° and turned CCW.
describe('wrong connections decode per NEETS table 1-6', () => {
  // Lead seen by the analyser's S1, S2, S3 probes -> transmitter lead index (0 = S1, 1 = S2, 2 = S3)
  const rows: { fault: string; leads: [number, number, number]; rotorReversed?: boolean; start: number; ccw: boolean }[] = [
    { fault: 'S1 and S3 swapped', leads: [2, 1, 0], start: 0, ccw: false },
    { fault: 'S1 and S2 swapped', leads: [1, 0, 2], start: 240, ccw: false },
    { fault: 'S2 and S3 swapped', leads: [0, 2, 1], start: 120, ccw: false },
    { fault: 'cyclic shift TX S1->RX S2, S2->S3, S3->S1', leads: [2, 0, 1], start: 120, ccw: true },
    { fault: 'cyclic shift TX S1->RX S3, S2->S1, S3->S2', leads: [1, 2, 0], start: 240, ccw: true },
    { fault: 'rotor reversed', leads: [0, 1, 2], rotorReversed: true, start: 180, ccw: true },
    { fault: 'S1 and S2 swapped with rotor reversed', leads: [1, 0, 2], rotorReversed: true, start: 60, ccw: false },
  ];
  // Stator lead potentials of a Y winding at shaft angle θ (derived from the line equations):
  // V(S1) - V(S3) = sinθ, V(S3) - V(S2) = sin(θ+120°), V(S2) - V(S1) = sin(θ+240°).
  // Taking V(S3) = 0: V(S1) = sinθ, V(S2) = -sin(θ+120°).
  const leadPotentials = (deg: number): [number, number, number] => {
    const t = (deg * Math.PI) / 180;
    return [Math.sin(t), -Math.sin(t + (2 * Math.PI) / 3), 0];
  };
  for (const row of rows) {
    it(`${row.fault}: reads ${row.start}° at 0° and turns ${row.ccw ? 'CCW' : 'CW'}`, () => {
      const degs = [0, 10, 20];
      const measured = degs.map((d) => {
        const v = leadPotentials(d);
        const sign = row.rotorReversed ? -1 : 1;
        const s1 = v[row.leads[0]]!, s2 = v[row.leads[1]]!, s3 = v[row.leads[2]]!;
        return [sign * (s1 - s3), sign * (s3 - s2), sign * (s2 - s1)];
      });
      const sc = sinCosFromLines(
        { kind: 'synchro', lines: [{ base: 's1s3', channel: 0 }, { base: 's3s2', channel: 1 }, { base: 's2s1', channel: 2 }] },
        phasorsFrom([0, 1, 2].map((k) => measured.map((m) => 10 * m[k]!))),
      )!;
      // phase lead fixed at 0: the rotor reversal must show as 180°, not be absorbed into the lead
      const sol = solveAngle(sc, phasorsFrom([[0, 0, 0]]), 100_000, 0);
      expect(Math.abs(angleDiffDeg(sol.deg[0]!, row.start))).toBeLessThan(1e-9);
      const turn = angleDiffDeg(sol.deg[1]!, sol.deg[0]!);
      expect(turn).toBeCloseTo(row.ccw ? 10 : -10, 9);
    });
  }
});
