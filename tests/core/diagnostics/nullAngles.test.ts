import { describe, expect, it } from 'vitest';
import { nullAnglesDeg } from '../../../core/diagnostics/nullAngles.js';

describe('nullAnglesDeg(role)', () => {
  it('gives the null angles of the standard synchro equations (NEETS Module 15): S1-S3 0/180, S3-S2 60/240, S2-S1 120/300, reversed pairs the same', () => {
    expect(nullAnglesDeg('s1s3')).toEqual([0, 180]);
    expect(nullAnglesDeg('s3s2')).toEqual([60, 240]);
    expect(nullAnglesDeg('s2s1')).toEqual([120, 300]);
    expect(nullAnglesDeg('s3s1')).toEqual([0, 180]);
    expect(nullAnglesDeg('s2s3')).toEqual([60, 240]);
    expect(nullAnglesDeg('s1s2')).toEqual([120, 300]);
  });

  it('gives a resolver sine winding 0/180 and cosine winding 90/270, ignores a unit prefix, and has none for the excitation', () => {
    expect(nullAnglesDeg('sin')).toEqual([0, 180]);
    expect(nullAnglesDeg('fine.cos')).toEqual([90, 270]);
    expect(nullAnglesDeg('ref')).toBeUndefined();
  });
});
