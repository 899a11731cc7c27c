import type { MotionSegment } from './segmentMotion.js';
import { medianOf } from './robustStats.js';

/** Where one step lies in the trace (indices into the trace; ends exclusive). */
export interface StepWindow {
  /** Index into the segment list of the stationary segment before, the move, and the stationary segment after. */
  readonly beforeSegment: number;
  readonly movingSegment: number;
  readonly afterSegment: number;
  /** First point of the initial-level window (the second half of the segment before). */
  readonly preStartIndex: number;
  readonly moveStartIndex: number;
  readonly moveEndIndex: number;
  /** End of the segment after (exclusive): the response is followed up to here. */
  readonly endIndex: number;
  /** Initial and final state levels, degrees. */
  readonly fromDeg: number;
  readonly toDeg: number;
}

/**
 * The steps of a segmented trace: every 'moving' segment with a stationary segment on each
 * side (a move at either end of the record, or next to a constant-speed segment, is not a step).
 *
 * State levels (IEEE Std 181-2011 takes them from the histogram of each state, clause from
 * memory; here the median of the settled part stands in for it, common practice, no source):
 * the initial level
 * is the median of the second half of the segment before, the final level the median of the
 * second half of the segment after (the first half may still ring). Never throws on data.
 */
export function detectSteps(t: ArrayLike<number>, deg: ArrayLike<number>, segments: readonly MotionSegment[]): StepWindow[] {
  const out: StepWindow[] = [];
  for (let k = 1; k + 1 < segments.length; k++) {
    const move = segments[k]!;
    const before = segments[k - 1]!;
    const after = segments[k + 1]!;
    if (move.kind !== 'moving' || before.kind !== 'stationary' || after.kind !== 'stationary') continue;
    if (move.startIndex >= t.length || after.endIndex > deg.length) continue;
    const preStart = before.startIndex + Math.floor((before.endIndex - before.startIndex) / 2);
    const fromDeg = medianOf(deg, preStart, before.endIndex);
    const toDeg = medianOf(deg, after.startIndex + Math.floor((after.endIndex - after.startIndex) / 2), after.endIndex);
    if (!Number.isFinite(fromDeg) || !Number.isFinite(toDeg) || fromDeg === toDeg) continue;
    out.push({
      beforeSegment: k - 1,
      movingSegment: k,
      afterSegment: k + 1,
      preStartIndex: preStart,
      moveStartIndex: move.startIndex,
      moveEndIndex: move.endIndex,
      endIndex: after.endIndex,
      fromDeg,
      toDeg,
    });
  }
  return out;
}
