import { describe, expect, it } from 'vitest';
import { detectSteps } from '../../../core/motion/detectSteps.js';
import type { MotionSegment } from '../../../core/motion/segmentMotion.js';

const t = Float64Array.from({ length: 100 }, (_, i) => i * 0.01);

function seg(a: number, b: number, kind: MotionSegment['kind']): MotionSegment {
  return { startIndex: a, endIndex: b, startS: t[a]!, endS: t[b - 1]!, kind, meanDeg: 0, degPerS: 0 };
}

describe('detectSteps(t, deg, segments)', () => {
  it('takes each level as the median of the second half of its stationary segment (state levels, IEEE Std 181-2011, median stand-in; clause from memory)', () => {
    const deg = Float64Array.from(t, (_, i) => (i < 40 ? 10 : i < 50 ? 10 + (i - 40) * 3 : i < 60 ? 50 - (i - 50) : 40));
    deg[5] = 99; // an outlier in the first half of the initial state is ignored
    deg[35] = NaN;
    const w = detectSteps(t, deg, [seg(0, 40, 'stationary'), seg(40, 55, 'moving'), seg(55, 100, 'stationary')]);
    expect(w.length).toBe(1);
    expect(w[0]!.fromDeg).toBe(10);
    expect(w[0]!.toDeg).toBe(40);
    expect(w[0]!.preStartIndex).toBe(20);
    expect(w[0]!.endIndex).toBe(100);
  });

  it('a move at a record end, next to a ramp, or without a level change is not a step', () => {
    const deg = Float64Array.from(t, (_, i) => (i < 50 ? 0 : 5));
    expect(detectSteps(t, deg, [seg(0, 50, 'stationary'), seg(50, 100, 'moving')])).toEqual([]);
    expect(detectSteps(t, deg, [seg(0, 30, 'ramp'), seg(30, 60, 'moving'), seg(60, 100, 'stationary')])).toEqual([]);
    const flat = new Float64Array(100).fill(3);
    expect(detectSteps(t, flat, [seg(0, 30, 'stationary'), seg(30, 60, 'moving'), seg(60, 100, 'stationary')])).toEqual([]);
  });
});
