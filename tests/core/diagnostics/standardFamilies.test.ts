import { describe, expect, it } from 'vitest';
import { matchStandardFamily, STANDARD_FAMILIES } from '../../../core/diagnostics/standardFamilies.js';

describe('matchStandardFamily(ratio, query)', () => {
  it('the table’s synchro ratios follow from NEETS Module 15 p.1-60: 90/115 = 0.783, 11.8/26 = 0.454', () => {
    const ratios = STANDARD_FAMILIES.filter((f) => f.kind === 'synchro').map((f) => Number(f.nominalRatio.toFixed(3)));
    expect(ratios).toEqual([0.783, 0.783, 0.454]);
    for (const f of STANDARD_FAMILIES) expect(f.source.length).toBeGreaterThan(5);
  });

  it('115 V / 90 V: the frequency picks 400 Hz or 60 Hz (NEETS Module 15 p.1-65: both exist)', () => {
    expect(matchStandardFamily(0.7826, { kind: 'synchro', frequencyHz: 400.1 })!.family.name).toBe('115 V / 90 V, 400 Hz');
    expect(matchStandardFamily(0.7826, { kind: 'synchro', frequencyHz: 59.9 })!.family.name).toBe('115 V / 90 V, 60 Hz');
  });

  it('26 V / 11.8 V synchro within tolerance, with the signed deviation in percent', () => {
    const m = matchStandardFamily(0.4538 * 1.02, { kind: 'synchro', frequencyHz: 400 })!;
    expect(m.family.excitationRmsV).toBe(26);
    expect(m.deviationPct).toBeCloseTo(((0.4538 * 1.02) / (11.8 / 26) - 1) * 100, 9);
    expect(m.deviationPct).toBeCloseTo(1.99, 2);
  });

  it('tolerance: +2.5 % matches at the default 3 %, not at 2 %; a ratio between families matches nothing', () => {
    expect(matchStandardFamily((90 / 115) * 1.025, { kind: 'synchro' })).not.toBeNull();
    expect(matchStandardFamily((90 / 115) * 1.025, { kind: 'synchro', tolerancePct: 2 })).toBeNull();
    expect(matchStandardFamily(0.6, { kind: 'synchro' })).toBeNull();
    expect(matchStandardFamily(Number.NaN, { kind: 'synchro' })).toBeNull();
    expect(() => matchStandardFamily(0.78, { kind: 'synchro', tolerancePct: -1 })).toThrow(RangeError);
  });

  it('resolvers (from memory): TR 0.454 and TR 1.0 families; a synchro ratio of 1.0 matches nothing', () => {
    expect(matchStandardFamily(0.998, { kind: 'resolver' })!.family.nominalRatio).toBe(1);
    expect(matchStandardFamily(0.455, { kind: 'resolver' })!.family.outputMaxRmsV).toBe(11.8);
    expect(matchStandardFamily(1.0, { kind: 'synchro' })).toBeNull();
  });

  it('a family is matched only near its own carrier: the 400 Hz TR 0.454 resolver family at 380 Hz and 790 Hz, not at 10 kHz or 60 Hz (its frequency is part of what it is)', () => {
    const at = (frequencyHz: number) => matchStandardFamily(0.4538, { kind: 'resolver', frequencyHz })?.family.name ?? null;
    expect(at(380)).toBe('26 V / 11.8 V, 400 Hz (TR 0.454)');
    expect(at(790)).toBe('26 V / 11.8 V, 400 Hz (TR 0.454)');
    expect(at(10_000)).toBeNull();
    expect(at(60)).toBeNull();
    // Without a measured frequency the ratio alone decides, as before.
    expect(matchStandardFamily(0.4538, { kind: 'resolver' })!.family.name).toBe('26 V / 11.8 V, 400 Hz (TR 0.454)');
  });
});
