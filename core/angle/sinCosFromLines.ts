import { SYNCHRO_LINE_OF, type BaseRole } from '../model/roles.js';
import type { CyclePhasors } from '../demod/demodulateCycles.js';
import { linesToCos, linesToSin, missingLine } from './scottT.js';

/** The stator channels of one unit: which phasor channel carries which role. */
export interface UnitLines {
  readonly kind: 'synchro' | 'resolver';
  readonly lines: readonly { readonly base: BaseRole; readonly channel: number }[];
}

/** Complex resolver-equivalent signals per cycle: S = K·sin θ·e^{jψ}, C = K·cos θ·e^{jψ}. */
export interface SinCosPhasors {
  readonly sinRe: Float64Array;
  readonly sinIm: Float64Array;
  readonly cosRe: Float64Array;
  readonly cosIm: Float64Array;
  /** How the pair was formed. */
  readonly method: 'three-lines' | 'two-lines' | 'resolver';
  /** For two measured synchro lines: the canonical line (0 = S1-S3, 1 = S3-S2, 2 = S2-S1) that was computed. */
  readonly computedLine?: 0 | 1 | 2;
}

/**
 * Forms S and C for a unit. Synchro: each measured line is mapped to its canonical pair
 * (E(S1−S3), E(S3−S2), E(S2−S1); a reversed pair is negated); with two lines the third follows
 * from Kirchhoff's law, which covers every "two lines against a common lead" wiring; then the
 * Scott-T relations. Resolver: the sin and cos windings directly.
 * Returns undefined when the unit lacks the lines to solve an angle.
 */
export function sinCosFromLines(unit: UnitLines, phasors: CyclePhasors): SinCosPhasors | undefined {
  const n = phasors.cycleCount;
  if (unit.kind === 'resolver') {
    const s = unit.lines.find((l) => l.base === 'sin');
    const c = unit.lines.find((l) => l.base === 'cos');
    if (!s || !c) return undefined;
    return {
      sinRe: phasors.inPhase[s.channel]!,
      sinIm: phasors.quadrature[s.channel]!,
      cosRe: phasors.inPhase[c.channel]!,
      cosIm: phasors.quadrature[c.channel]!,
      method: 'resolver',
    };
  }
  const canonical: ({ channel: number; sign: number } | undefined)[] = [undefined, undefined, undefined];
  for (const line of unit.lines) {
    const map = SYNCHRO_LINE_OF[line.base];
    if (map && canonical[map.line] === undefined) canonical[map.line] = { channel: line.channel, sign: map.sign };
  }
  const present = canonical.filter((c) => c !== undefined).length;
  if (present < 2) return undefined;
  const missing = canonical.findIndex((c) => c === undefined);

  const build = (parts: readonly Float64Array[]): { s: Float64Array; c: Float64Array } => {
    const s = new Float64Array(n);
    const c = new Float64Array(n);
    const get = (k: number, m: number): number => {
      const entry = canonical[k]!;
      return entry.sign * parts[entry.channel]![m]!;
    };
    for (let m = 0; m < n; m++) {
      let a: number, b: number, cc: number;
      if (missing === 0) {
        b = get(1, m); cc = get(2, m); a = missingLine(b, cc);
      } else if (missing === 1) {
        a = get(0, m); cc = get(2, m); b = missingLine(a, cc);
      } else if (missing === 2) {
        a = get(0, m); b = get(1, m); cc = missingLine(a, b);
      } else {
        a = get(0, m); b = get(1, m); cc = get(2, m);
      }
      s[m] = linesToSin(a, b, cc);
      c[m] = linesToCos(b, cc);
    }
    return { s, c };
  };
  const re = build(phasors.inPhase);
  const im = build(phasors.quadrature);
  return {
    sinRe: re.s,
    sinIm: im.s,
    cosRe: re.c,
    cosIm: im.c,
    method: present === 3 ? 'three-lines' : 'two-lines',
    ...(missing >= 0 ? { computedLine: missing as 0 | 1 | 2 } : {}),
  };
}
