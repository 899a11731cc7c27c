import type { UnitLines } from '../angle/sinCosFromLines.js';
import type { CyclePhasors } from '../demod/demodulateCycles.js';
import type { LineCheck } from './wiringFaults.js';

/** What was done to one measured line before the angle was solved. */
export type LineRepairAction =
  | {
      readonly action: 'dropped';
      /** Base role of the line (e.g. "s3s2") and its phasor channel. */
      readonly base: string;
      readonly channel: number;
      readonly reason: 'dead';
    }
  | {
      readonly action: 'rescaled';
      readonly base: string;
      readonly channel: number;
      /** The line's phasors were divided by this factor (the snapped probe factor when there is one). */
      readonly dividedBy: number;
      /** True when the factor could equally belong to the other line (the angle is the same either way). */
      readonly ambiguous: boolean;
    };

export interface LineRepair {
  /** The line set to give sinCosFromLines (a dropped line is simply absent: the solver rebuilds it by Kirchhoff). */
  readonly unit: UnitLines;
  /** The phasors to give sinCosFromLines and solveAngle: the input, with rescaled channels replaced by scaled copies. */
  readonly phasors: CyclePhasors;
  readonly actions: readonly LineRepairAction[];
  /**
   * False when the faults leave no valid angle (a dead line in a two-line or resolver capture,
   * shorted lines, an open lead): the pipeline should still report the findings but not present
   * the angle as a measurement.
   */
  readonly angleValid: boolean;
}

/**
 * The corrected line set for the angle solver, from the faults `checkSynchroLines` found:
 * a dead line of a three-line synchro capture is dropped (the three line voltages sum to zero, so
 * the other two determine it); a mis-scaled line is divided by its factor. Nothing else is
 * changed; the input arrays are never modified.
 */
export function repairLines(unit: UnitLines, phasors: CyclePhasors, check: LineCheck): LineRepair {
  const actions: LineRepairAction[] = [];
  const drop = new Set<number>();
  const scaled = new Map<number, number>();
  let angleValid = true;
  for (const fault of check.faults) {
    switch (fault.kind) {
      case 'dead': {
        const line = unit.lines[fault.line]!;
        if (fault.rebuildable) {
          drop.add(fault.line);
          actions.push({ action: 'dropped', base: line.base, channel: line.channel, reason: 'dead' });
        } else angleValid = false;
        break;
      }
      case 'scale': {
        const line = unit.lines[fault.line]!;
        const dividedBy = fault.likelyFactor ?? fault.factor;
        if (Number.isFinite(dividedBy) && dividedBy !== 0) {
          scaled.set(line.channel, dividedBy);
          actions.push({ action: 'rescaled', base: line.base, channel: line.channel, dividedBy, ambiguous: fault.ambiguous });
        }
        break;
      }
      case 'shorted':
      case 'open':
        angleValid = false;
        break;
    }
  }
  if (unit.kind === 'synchro' && unit.lines.length - drop.size < 2) angleValid = false;
  const lines = unit.lines.filter((_, i) => !drop.has(i));
  let out = phasors;
  if (scaled.size > 0) {
    const inPhase = phasors.inPhase.map((a, ch) => (scaled.has(ch) ? divide(a, scaled.get(ch)!) : a));
    const quadrature = phasors.quadrature.map((a, ch) => (scaled.has(ch) ? divide(a, scaled.get(ch)!) : a));
    const dc = phasors.dc.map((a, ch) => (scaled.has(ch) ? divide(a, scaled.get(ch)!) : a));
    out = { ...phasors, inPhase, quadrature, dc };
  }
  return { unit: { kind: unit.kind, lines }, phasors: out, actions, angleValid };
}

function divide(a: Float64Array, f: number): Float64Array {
  const out = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i]! / f;
  return out;
}
