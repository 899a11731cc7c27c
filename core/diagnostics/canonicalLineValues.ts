import type { UnitLines } from '../angle/sinCosFromLines.js';
import type { CyclePhasors } from '../demod/demodulateCycles.js';
import { SYNCHRO_LINE_OF } from '../model/roles.js';

/**
 * The measured stator lines of one unit as signed real envelopes per carrier cycle, in canonical
 * orientation: synchro slots 0 = E(S1−S3), 1 = E(S3−S2), 2 = E(S2−S1) (a reversed pair is
 * negated); resolver slots 0 = sin, 1 = cos.
 *
 * The unit's common phase ψ = ½·arg Σ_lines Σ_cycles Z² (an ideal unit's line phasors are all
 * collinear with e^{jψ}, so Z² = a²·e^{2jψ} whatever the sign of the envelope a; the same
 * estimator as the angle solver's, taken here over the lines rather than over S and C). A dead
 * line contributes nothing to it. The in-phase envelope is Re(Z·e^{−jψ}).
 */
export interface CanonicalLines {
  readonly kind: 'synchro' | 'resolver';
  readonly cycleCount: number;
  readonly phaseLeadRad: number;
  /** Per slot: index into unit.lines, or −1 when the slot was not measured. */
  readonly lineIndex: readonly number[];
  /** Per slot: in-phase envelope (peak V) per cycle; undefined when not measured. */
  readonly inPhaseV: readonly (Float64Array | undefined)[];
  /** Per slot: phasor magnitude |Z| (peak V) per cycle; undefined when not measured. */
  readonly magnitudeV: readonly (Float64Array | undefined)[];
  /** Cycles where every measured slot is finite. */
  readonly valid: Uint8Array;
}

export function canonicalLineValues(unit: UnitLines, phasors: CyclePhasors): CanonicalLines {
  const n = phasors.cycleCount;
  const slots = unit.kind === 'synchro' ? 3 : 2;
  const lineIndex = new Array<number>(slots).fill(-1);
  const sign = new Array<number>(slots).fill(1);
  unit.lines.forEach((line, i) => {
    if (unit.kind === 'synchro') {
      const map = SYNCHRO_LINE_OF[line.base];
      if (map && lineIndex[map.line] === -1) {
        lineIndex[map.line] = i;
        sign[map.line] = map.sign;
      }
    } else {
      const slot = line.base === 'sin' ? 0 : line.base === 'cos' ? 1 : -1;
      if (slot >= 0 && lineIndex[slot] === -1) lineIndex[slot] = i;
    }
  });
  const valid = new Uint8Array(n);
  for (let m = 0; m < n; m++) {
    let ok = 1;
    for (let k = 0; k < slots; k++) {
      if (lineIndex[k]! < 0) continue;
      const ch = unit.lines[lineIndex[k]!]!.channel;
      if (!Number.isFinite(phasors.inPhase[ch]![m]!) || !Number.isFinite(phasors.quadrature[ch]![m]!)) ok = 0;
    }
    valid[m] = ok;
  }
  let sumRe = 0;
  let sumIm = 0;
  for (let k = 0; k < slots; k++) {
    if (lineIndex[k]! < 0) continue;
    const ch = unit.lines[lineIndex[k]!]!.channel;
    const re = phasors.inPhase[ch]!;
    const im = phasors.quadrature[ch]!;
    for (let m = 0; m < n; m++) {
      if (!valid[m]) continue;
      sumRe += re[m]! * re[m]! - im[m]! * im[m]!;
      sumIm += 2 * re[m]! * im[m]!;
    }
  }
  const psi = 0.5 * Math.atan2(sumIm, sumRe);
  const c = Math.cos(psi);
  const s = Math.sin(psi);
  const inPhaseV: (Float64Array | undefined)[] = [];
  const magnitudeV: (Float64Array | undefined)[] = [];
  for (let k = 0; k < slots; k++) {
    if (lineIndex[k]! < 0) {
      inPhaseV.push(undefined);
      magnitudeV.push(undefined);
      continue;
    }
    const ch = unit.lines[lineIndex[k]!]!.channel;
    const re = phasors.inPhase[ch]!;
    const im = phasors.quadrature[ch]!;
    const a = new Float64Array(n);
    const mag = new Float64Array(n);
    for (let m = 0; m < n; m++) {
      a[m] = sign[k]! * (re[m]! * c + im[m]! * s);
      mag[m] = Math.hypot(re[m]!, im[m]!);
    }
    inPhaseV.push(a);
    magnitudeV.push(mag);
  }
  return { kind: unit.kind, cycleCount: n, phaseLeadRad: psi, lineIndex, inPhaseV, magnitudeV, valid };
}

/** Largest value of |x| over the valid cycles (0 when there are none). */
export function maxAbsOver(x: Float64Array, valid: Uint8Array): number {
  let best = 0;
  for (let m = 0; m < x.length; m++) if (valid[m] && Math.abs(x[m]!) > best) best = Math.abs(x[m]!);
  return best;
}

/** max − min of x over the valid cycles (0 when there are none). */
export function spanOver(x: Float64Array, valid: Uint8Array): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (let m = 0; m < x.length; m++) {
    if (!valid[m]) continue;
    if (x[m]! < lo) lo = x[m]!;
    if (x[m]! > hi) hi = x[m]!;
  }
  return hi > lo ? hi - lo : 0;
}
