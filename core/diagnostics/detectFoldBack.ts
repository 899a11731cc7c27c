import { selectKth } from '../dsp/selectKth.js';
/** Canonical line phases in degrees: E(S1−S3) ∝ sin θ, E(S3−S2) ∝ sin(θ+120°), E(S2−S1) ∝ sin(θ+240°). */
const SYNCHRO_PHASE_DEG = [0, 120, 240] as const;

function wrapDeg(d: number): number {
  const r = d % 360;
  return r < 0 ? r + 360 : r + 0;
}

function angleDistDeg(a: number, b: number): number {
  return Math.abs(((a - b + 540) % 360) - 180);
}

/** Angles where canonical line v peaks: sin(θ + φv) = ±1. */
export function peakAnglesDeg(v: number): [number, number] {
  const p = wrapDeg(90 - SYNCHRO_PHASE_DEG[v]!);
  const q = wrapDeg(p + 180);
  return p < q ? [p, q] : [q, p];
}

/**
 * A fold-back trace: the shaft travels at least 90° in total; it reverses at least once; every
 * reversal is sharp (the mean step over the 4 cycles before and after it, skipping 2 cycles at
 * the tip, is at least half the typical step and of opposite sign, so the shaft did not slow down
 * to turn) and lies within 3° of the two peaks of one canonical line; and all points stay in the
 * closed half-turn between those peaks (±3°). Heuristic (common practice, no source).
 */
export function detectFoldBack(deg: readonly number[]): { line: number; peaks: [number, number]; reversals: number } | undefined {
  const n = deg.length;
  if (n < 16) return undefined;
  const step: number[] = [];
  for (let m = 1; m < n; m++) step.push(((deg[m]! - deg[m - 1]! + 540) % 360) - 180);
  const typical = selectKth(Float64Array.from(step, Math.abs), step.length >> 1);
  let travel = 0;
  for (const d of step) travel += Math.abs(d);
  if (!(typical > 0.05) || travel < 90) return undefined;
  const W = 4;
  const GAP = 2;
  const reversals: number[] = [];
  let lastSign = 0;
  for (let m = 0; m < step.length; m++) {
    const d = step[m]!;
    if (Math.abs(d) < 0.25 * typical) continue;
    const sign = Math.sign(d);
    if (lastSign !== 0 && sign !== lastSign) {
      // step[m] is the first step back: deg[m] is the tip.
      if (m - GAP - W < 0 || m + GAP + W > step.length) return undefined;
      let before = 0;
      let after = 0;
      for (let i = 0; i < W; i++) {
        before += step[m - GAP - 1 - i]!;
        after += step[m + GAP + i]!;
      }
      before /= W;
      after /= W;
      if (Math.sign(before) === Math.sign(after) || Math.abs(before) < 0.5 * typical || Math.abs(after) < 0.5 * typical) return undefined;
      reversals.push(deg[m]!);
    }
    lastSign = sign;
  }
  if (reversals.length === 0) return undefined;
  for (let v = 0; v < 3; v++) {
    const peaks = peakAnglesDeg(v);
    if (!reversals.every((r) => Math.min(angleDistDeg(r, peaks[0]), angleDistDeg(r, peaks[1])) < 3)) continue;
    // The half-turn: both halves between the peaks are candidates; the trace must stay in one.
    const inLower = deg.every((d) => d >= peaks[0] - 3 && d <= peaks[1] + 3);
    const inUpper = deg.every((d) => d >= peaks[1] - 3 || d <= peaks[0] + 3);
    if (inLower || inUpper) return { line: v, peaks, reversals: reversals.length };
  }
  return undefined;
}
