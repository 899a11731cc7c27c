import { wrapDeg } from '../angle/unwrapDeg.js';
import { solveSymmetric } from '../dsp/linearSolve.js';
import { finding, type Finding } from '../model/findings.js';
import { basisRow, errorHarmonics, type ErrorHarmonic } from './errorHarmonics.js';

/**
 * Electrical error from a constant-speed drive (the shaft turned steadily by a motor through at
 * least one full turn, instead of being stepped).
 *
 * Method: the shaft angle is taken as a straight line φ(t) = a + b·t. Fitting that line alone lets
 * the error curve leak into a and b when the record is not a whole number of turns, so the line
 * and the error harmonics 1 … K are fitted jointly by linear least squares,
 * θ(t) ≈ a + b·t + Σ_k (c_k cos kφ + s_k sin kφ), re-evaluating φ with the updated line three
 * times (Gauss–Newton on the only non-linear part; the harmonic terms are arc-minutes, so it
 * converges at once). The error is θ − φ in arc-minutes, binned by the wrapped shaft angle φ with
 * the mean per bin; the harmonics come from {@link errorHarmonics} on every sample.
 *
 * Limits (common practice, no source): the zero offset is not observable (the line's offset
 * absorbs it, so order 0 is ≈ 0 here; use a stepped run for the index error), and any speed
 * variation that repeats once per turn is indistinguishable from a 1st-harmonic error.
 */
export interface ContinuousAccuracyBin {
  /** Bin centre, shaft degrees in [0, 360). */
  readonly nominalDeg: number;
  /** Bin centre plus the mean error, degrees in [0, 360). */
  readonly measuredDeg: number;
  /** Mean error of the samples in the bin, arc-minutes. */
  readonly errorArcmin: number;
  readonly samples: number;
}

export interface ContinuousAccuracy {
  readonly mode: 'continuous';
  /** One entry per bin that holds samples, in angle order. */
  readonly positions: readonly ContinuousAccuracyBin[];
  readonly binWidthDeg: number;
  /** Fitted drive speed, degrees per second (signed). */
  readonly speedDegPerS: number;
  /** Turns covered by the trace. */
  readonly turns: number;
  /** Most positive minus most negative bin mean, arcmin. */
  readonly ppArcmin: number;
  /** Largest |bin mean|, arcmin. */
  readonly maxAbsArcmin: number;
  /** RMS of the per-sample error, arcmin. */
  readonly rmsArcmin: number;
  /** RMS left after the line and the harmonics (noise and higher orders), arcmin. */
  readonly residualRmsArcmin: number;
  readonly harmonics: readonly ErrorHarmonic[];
}

export interface ContinuousAccuracyAnalysis {
  /** Null when the trace covers less than a full turn. */
  readonly accuracy: ContinuousAccuracy | null;
  readonly findings: readonly Finding[];
  /** Per-sample error (arcmin; NaN where the angle was NaN), for plots; empty when accuracy is null. */
  readonly errorArcmin: Float64Array;
}

export interface ContinuousAccuracyOptions {
  /** Number of angle bins over the turn (default 36, i.e. 10° bins). */
  readonly bins?: number;
  /** Highest harmonic order fitted (default 4). */
  readonly maxHarmonicOrder?: number;
  readonly roles?: readonly string[];
}

const DEG = Math.PI / 180;

/** Analyses a constant-speed accuracy run on an unwrapped electrical-angle trace (degrees). */
export function analyzeContinuousAccuracy(
  t: ArrayLike<number>,
  unwrappedDeg: ArrayLike<number>,
  opts: ContinuousAccuracyOptions = {},
): ContinuousAccuracyAnalysis {
  if (t.length !== unwrappedDeg.length) throw new RangeError(`analyzeContinuousAccuracy: t and angle differ in length (${t.length} vs ${unwrappedDeg.length})`);
  const bins = opts.bins ?? 36;
  if (!Number.isInteger(bins) || bins < 4) throw new RangeError(`analyzeContinuousAccuracy: bins must be an integer ≥ 4, got ${bins}`);
  const order = opts.maxHarmonicOrder ?? 4;
  if (!Number.isInteger(order) || order < 0) throw new RangeError(`analyzeContinuousAccuracy: maxHarmonicOrder must be a non-negative integer, got ${order}`);
  const roles = opts.roles ?? [];
  const none = (message: string, figures: Record<string, number>): ContinuousAccuracyAnalysis => ({
    accuracy: null,
    findings: [
      finding('accuracy-run-incomplete', 'info', message, {
        advice: 'Drive the shaft at a steady speed through at least one full turn for a continuous error curve.',
        roles,
        figures,
      }),
    ],
    errorArcmin: new Float64Array(0),
  });

  const idx: number[] = [];
  let lo = Infinity;
  let hi = -Infinity;
  let tSum = 0;
  let aSum = 0;
  for (let i = 0; i < t.length; i++) {
    const a = unwrappedDeg[i]!;
    const ti = t[i]!;
    if (!Number.isFinite(a) || !Number.isFinite(ti)) continue;
    idx.push(i);
    lo = Math.min(lo, a);
    hi = Math.max(hi, a);
    tSum += ti;
    aSum += a;
  }
  const covered = idx.length ? hi - lo : 0;
  if (covered < 360) return none(`The angle trace covers ${covered.toFixed(1)}°, less than a full turn; no continuous error curve.`, { coveredDeg: covered });

  // Joint fit of the line and harmonics 1 … K, centred on the means of t and θ.
  const tm = tSum / idx.length;
  const am = aSum / idx.length;
  const k = order;
  const row = new Float64Array(2 * k + 1);
  let a0 = 0;
  let b0 = 0;
  let harm = new Float64Array(2 * k + 1);
  for (let iter = 0; iter < 4; iter++) {
    const kk = iter === 0 ? 0 : k; // first pass: the line alone
    const nn = 2 * kk + 2;
    const m = new Float64Array(nn * nn);
    const r = new Float64Array(nn);
    const x = new Float64Array(nn);
    for (const i of idx) {
      const tau = t[i]! - tm;
      const y = unwrappedDeg[i]! - am;
      x[0] = 1;
      x[1] = tau;
      if (kk > 0) {
        basisRow((am + a0 + b0 * tau) * DEG, kk, row);
        for (let j = 1; j <= 2 * kk; j++) x[j + 1] = row[j]!;
      }
      for (let p = 0; p < nn; p++) {
        r[p] += x[p]! * y;
        for (let q = 0; q <= p; q++) m[p * nn + q] += x[p]! * x[q]!;
      }
    }
    const sol = solveSymmetric(m, r, nn);
    if (!sol.ok) {
      if (iter === 0) return none('The angle trace could not be fitted with a constant-speed line.', { coveredDeg: covered });
      break; // keep the previous iteration's line
    }
    a0 = sol.x[0]!;
    b0 = sol.x[1]!;
    harm = new Float64Array(2 * k + 1);
    for (let j = 1; j <= 2 * kk; j++) harm[j] = sol.x[j + 1]!;
  }

  const error = new Float64Array(t.length).fill(NaN);
  const shaft: number[] = [];
  const errs: number[] = [];
  const binSum = new Float64Array(bins);
  const binN = new Float64Array(bins);
  const width = 360 / bins;
  let ss = 0;
  let rs = 0;
  for (const i of idx) {
    const tau = t[i]! - tm;
    const phi = am + a0 + b0 * tau;
    const e = (unwrappedDeg[i]! - phi) * 60;
    error[i] = e;
    const w = wrapDeg(phi);
    shaft.push(w);
    errs.push(e);
    const b = Math.min(bins - 1, Math.floor(w / width));
    binSum[b] += e;
    binN[b]++;
    ss += e * e;
    basisRow(phi * DEG, k, row);
    let model = 0;
    for (let j = 1; j <= 2 * k; j++) model += harm[j]! * row[j]!;
    const res = e - model * 60;
    rs += res * res;
  }

  const positions: ContinuousAccuracyBin[] = [];
  let bLo = Infinity;
  let bHi = -Infinity;
  let maxAbs = 0;
  for (let b = 0; b < bins; b++) {
    if (binN[b] === 0) continue;
    const mean = binSum[b]! / binN[b]!;
    const centre = (b + 0.5) * width;
    positions.push({ nominalDeg: centre, measuredDeg: wrapDeg(centre + mean / 60), errorArcmin: mean, samples: binN[b]! });
    bLo = Math.min(bLo, mean);
    bHi = Math.max(bHi, mean);
    maxAbs = Math.max(maxAbs, Math.abs(mean));
  }

  return {
    accuracy: {
      mode: 'continuous',
      positions,
      binWidthDeg: width,
      speedDegPerS: b0,
      turns: covered / 360,
      ppArcmin: bHi - bLo,
      maxAbsArcmin: maxAbs,
      rmsArcmin: Math.sqrt(ss / idx.length),
      residualRmsArcmin: Math.sqrt(rs / idx.length),
      harmonics: errorHarmonics(shaft, errs, k).harmonics,
    },
    findings: [],
    errorArcmin: error,
  };
}
