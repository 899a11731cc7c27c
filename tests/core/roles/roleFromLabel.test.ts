import { describe, expect, it } from 'vitest';
import { roleFromLabel } from '../../../core/roles/roleFromLabel.js';

// Terminal names of the trade: R1-R2 rotor (excitation), S1..S3 synchro stator, line-to-line
// pairs as "Sa-Sb" (NEETS Module 15 §"Synchro terminal markings"); resolver stator windings
// S1-S3 and S2-S4 (common practice, no source).
describe('roleFromLabel(label)', () => {
  const cases: [string, string | undefined][] = [
    ['R1-R2', 'ref'], ['r1 - r2', 'ref'], ['REF', 'ref'], ['Excitation (R1-R2)', 'ref'], ['Reference', 'ref'],
    ['S1-S3', 's1s3'], ['S3-S2', 's3s2'], ['S2 - S1', 's2s1'], ['s1s2', 's1s2'], ['V(S3,S1)', 's3s1'], ['S2/S3', 's2s3'],
    ['SIN', 'sin'], ['Sine', 'sin'], ['cos', 'cos'], ['COSINE winding', 'cos'], ['S2-S4', 's2s4'],
    ['CT', 'ct'], ['CH1', undefined], ['Channel 2', undefined], ['Time', undefined], ['S1-S1', undefined], ['S5-S1', undefined],
  ];
  for (const [label, expected] of cases) {
    it(`"${label}" → ${expected ?? 'no role'}`, () => {
      expect(roleFromLabel(label)?.base).toBe(expected);
    });
  }

  it('reads unit prefixes: "coarse S1-S3", "fine.sin", "36X S2-S1"', () => {
    expect(roleFromLabel('coarse S1-S3')).toEqual({ unit: 'coarse', base: 's1s3' });
    expect(roleFromLabel('fine.sin')).toEqual({ unit: 'fine', base: 'sin' });
    expect(roleFromLabel('36X S2-S1')).toEqual({ unit: '36x', base: 's2s1' });
    expect(roleFromLabel('1xS1-S3')).toEqual({ unit: '1x', base: 's1s3' });
  });
});
