import type { CyclePhasors } from '../../core/demod/demodulateCycles.js';

/** Builds CyclePhasors from per-channel in-phase values (quadrature optional), for angle tests. */
export function phasorsFrom(inPhase: number[][], quadrature?: number[][]): CyclePhasors {
  const n = inPhase[0]!.length;
  return {
    cycleCount: n,
    centreS: Float64Array.from({ length: n }, (_, i) => i / 400),
    firstSample: new Float64Array(n),
    lengthSamples: new Float64Array(n).fill(250),
    radPerSample: new Float64Array(n).fill((2 * Math.PI) / 250),
    centrePhaseRad: new Float64Array(n).fill(Math.PI),
    inPhase: inPhase.map((c) => Float64Array.from(c)),
    quadrature: (quadrature ?? inPhase.map((c) => c.map(() => 0))).map((c) => Float64Array.from(c)),
    dc: inPhase.map(() => new Float64Array(n)),
    extremes: inPhase.map(() => ({ sampleCount: 0, lo: Infinity, hi: -Infinity, countLo: 0, countHi: 0 })),
  };
}
