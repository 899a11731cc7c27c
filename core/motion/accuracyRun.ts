import { angleDiffDeg, wrapDeg } from '../angle/unwrapDeg.js';
import { finding, type Finding } from '../model/findings.js';
import { errorHarmonics, type ErrorHarmonic } from './errorHarmonics.js';
import { estimateAngleNoiseDeg } from './estimateAngleNoise.js';
import { estimateVelocity } from './estimateVelocity.js';
import { medianIntervalS, medianOf } from './robustStats.js';

/**
 * Stepped accuracy run: the shaft is moved by a dividing head (or turntable) in equal increments
 * and held at each stop; the electrical angle at each stop, minus the nominal shaft angle, is the
 * electrical error at that heading.
 *
 * Definitions (test procedure of a US Army compass/heading test-set manual, TM 11-4920-292-15,
 * Table 7-2A): a swing in 15° steps through 360° (24 headings); index error = algebraic mean of
 * the errors at equally spaced headings (the zero offset); one-cycle error = error at 0° minus
 * error at 180°. Spread = most positive minus most negative error (common practice, no source).
 *
 * Dwell detection (Savitzky & Golay, Analytical Chemistry 36(8), 1964, least-squares slope as the
 * velocity; settling = last exit from a band around the level, as in IEEE Std 181-2011):
 * 1. velocity = least-squares slope over a short centred window; noise level from the MAD of
 *    second differences (robust to constant-speed moves);
 * 2. candidate dwells = runs with |velocity| ≤ threshold lasting ≥ `minDwellS`;
 * 3. refine each on a smoothed trace (5-point running median, so single spikes do not cut a
 *    dwell, then a running mean over the velocity window, so the band can be tight): level0 =
 *    median of the central half, band = max(5 × robust spread of the smoothed central half,
 *    0.002°); the dwell ends at the first exit from the band after its centre and starts after
 *    the last exit before it. This drops the settling ringing;
 * 4. level = median, spread = 1.4826·MAD (F. R. Hampel, JASA 69(346), 1974, from memory) over the
 *    refined dwell; dwells closer than `minStepDeg` are merged (one stop).
 */
export interface AccuracyPosition {
  /** Nominal (commanded) shaft angle, degrees in [0, 360). */
  readonly nominalDeg: number;
  /** Measured electrical angle at the stop (median over the settled dwell), degrees in [0, 360). */
  readonly measuredDeg: number;
  /** measured − nominal, wrapped, arc-minutes. */
  readonly errorArcmin: number;
  /** Robust spread of the angle over the dwell (1.4826·MAD), arc-minutes. */
  readonly spreadArcmin: number;
  /** Settled part of the dwell, seconds from the first sample. */
  readonly startS: number;
  readonly endS: number;
  readonly samples: number;
}

export interface AccuracyRun {
  readonly mode: 'stepped';
  /** One entry per detected stop, in time order (a heading visited twice appears twice). */
  readonly positions: readonly AccuracyPosition[];
  /** Step between headings, degrees (detected or from the nominal list). */
  readonly incrementDeg: number;
  /** Mean of the per-heading errors (repeated visits averaged first), arcmin. */
  readonly indexErrorArcmin: number;
  /** Most positive minus most negative error over all stops, arcmin. */
  readonly ppArcmin: number;
  /** Largest |error| over all stops, arcmin. */
  readonly maxAbsArcmin: number;
  /** Error at 0° minus error at 180° (TM 11-4920-292-15 Table 7-2A); null unless both were visited. */
  readonly oneCycleErrorArcmin: number | null;
  /** Fourier series of the per-heading errors against the nominal angle (empty for less than a full turn). */
  readonly harmonics: readonly ErrorHarmonic[];
  /** True when the stops span a full turn. */
  readonly coversFullTurn: boolean;
  /** The ±class tested against, arcmin; null when none was given. */
  readonly classArcmin: number | null;
  /** Every |error − index error| ≤ class; null when no class was given (report, don't judge). */
  readonly pass: boolean | null;
  /** Nominal angles (degrees) of the stops outside the class, distinct, in visiting order. */
  readonly failingNominalDeg: readonly number[];
  /** Velocity threshold used for the dwell search, degrees per second. */
  readonly dwellThresholdDegPerS: number;
}

export interface AccuracyRunAnalysis {
  /** Null when too few stops were found. */
  readonly accuracy: AccuracyRun | null;
  readonly findings: readonly Finding[];
}

export interface AccuracyRunOptions {
  /** The commanded angles in visiting order (degrees). Without it the increment is detected. */
  readonly nominalDeg?: readonly number[];
  /** Nominal angle of the first stop (degrees); default: the multiple of the increment nearest its reading. */
  readonly startDeg?: number;
  /** Accuracy class ±N arcmin about the index error; omit to report without judging. */
  readonly accuracyClassArcmin?: number;
  /** Shortest stop, seconds (default 0.3). */
  readonly minDwellS?: number;
  /** Velocity threshold for a stop, degrees per second (default: max(0.2, 6 × the velocity noise)). */
  readonly dwellMaxDegPerS?: number;
  /** Velocity window, seconds (default 0.05, at least 5 samples). */
  readonly velocityWindowS?: number;
  /** Stops whose levels differ by less than this are one stop, degrees (default 0.5). */
  readonly minStepDeg?: number;
  /** Highest harmonic order fitted (default 4). */
  readonly maxHarmonicOrder?: number;
  /** Roles the findings name. */
  readonly roles?: readonly string[];
}

/**
 * Increments a dividing-head run is rounded to: "sensible" divisors of 360° (whole degrees that
 * divide 360, plus 1.5°, 2.5°, 7.5° and 22.5°; common practice, no source).
 */
export const STANDARD_INCREMENTS_DEG: readonly number[] = [
  1, 1.5, 2, 2.5, 3, 4, 5, 6, 7.5, 8, 9, 10, 12, 15, 18, 20, 22.5, 24, 30, 36, 40, 45, 60, 72, 90, 120, 180,
];

/** One stop: the settled sample ranges (inclusive) it was measured over, its level and spread. */
export interface Dwell {
  readonly start: number;
  readonly end: number;
  readonly parts: readonly (readonly [number, number])[];
  /** Median angle, unwrapped degrees. */
  readonly level: number;
  /** 1.4826·MAD, degrees. */
  readonly spread: number;
}

/** Analyses a stepped accuracy run on an unwrapped electrical-angle trace (degrees, one value per carrier cycle). */
export function analyzeAccuracyRun(t: ArrayLike<number>, unwrappedDeg: ArrayLike<number>, opts: AccuracyRunOptions = {}): AccuracyRunAnalysis {
  if (t.length !== unwrappedDeg.length) throw new RangeError(`analyzeAccuracyRun: t and angle differ in length (${t.length} vs ${unwrappedDeg.length})`);
  const cls = opts.accuracyClassArcmin;
  if (cls !== undefined && !(cls > 0)) throw new RangeError(`analyzeAccuracyRun: accuracyClassArcmin must be positive, got ${cls}`);
  const roles = opts.roles ?? [];
  const findings: Finding[] = [];

  const { dwells, thresholdDegPerS } = findRunStops(t, unwrappedDeg, opts);
  if (dwells.length < 3) {
    findings.push(
      finding('accuracy-run-incomplete', 'info', `Found ${dwells.length} stop(s) in the angle trace; an accuracy run needs at least 3.`, {
        advice: 'Hold the shaft still at each heading for longer than the minimum dwell time, or record more headings.',
        roles,
        figures: { stops: dwells.length, minDwellS: opts.minDwellS ?? 0.3 },
      }),
    );
    return { accuracy: null, findings };
  }

  // Nominal angles (unwrapped, in the same turn count as the levels where detected).
  const nominal = new Float64Array(dwells.length);
  let incrementDeg: number;
  if (opts.nominalDeg !== undefined) {
    const list = opts.nominalDeg;
    if (list.length === dwells.length) {
      for (let k = 0; k < dwells.length; k++) nominal[k] = list[k]!;
    } else {
      findings.push(
        finding('accuracy-positions-mismatch', 'warning', `Found ${dwells.length} stops but ${list.length} nominal angles were given; each stop was matched to the nearest nominal angle.`, {
          advice: 'Check the list of commanded angles against the run, or trim the capture to the run.',
          roles,
          figures: { stops: dwells.length, nominalAngles: list.length },
        }),
      );
      for (let k = 0; k < dwells.length; k++) nominal[k] = nearestOnCircle(dwells[k]!.level, list);
    }
    incrementDeg = medianGapDeg(Array.from(nominal));
  } else {
    const steps: number[] = [];
    for (let k = 1; k < dwells.length; k++) steps.push(Math.abs(dwells[k]!.level - dwells[k - 1]!.level));
    const raw = medianOf(steps);
    incrementDeg = nearestIncrement(raw);
    const anchor = opts.startDeg ?? incrementDeg * Math.round(dwells[0]!.level / incrementDeg);
    let irregular = 0;
    for (let k = 0; k < dwells.length; k++) {
      const rel = (dwells[k]!.level - dwells[0]!.level) / incrementDeg;
      const idx = Math.round(rel);
      if (Math.abs(rel - idx) > 0.25) irregular++;
      nominal[k] = anchor + idx * incrementDeg;
    }
    if (Math.abs(raw - incrementDeg) > 0.05 * incrementDeg || irregular > 0) {
      findings.push(
        finding('accuracy-steps-irregular', 'info', `The steps between stops (median ${raw.toFixed(3)}°) do not fit a ${incrementDeg}° increment well (${irregular} stop(s) off the grid).`, {
          advice: 'Give the commanded angles explicitly if the run did not use equal increments.',
          roles,
          figures: { medianStepDeg: raw, incrementDeg, offGrid: irregular },
        }),
      );
    }
  }

  const positions: AccuracyPosition[] = dwells.map((d, k) => ({
    nominalDeg: wrapDeg(nominal[k]!),
    measuredDeg: wrapDeg(d.level),
    errorArcmin: angleDiffDeg(d.level, nominal[k]!) * 60,
    spreadArcmin: d.spread * 60,
    startS: t[d.start]!,
    endS: t[d.end]!,
    samples: d.parts.reduce((sum, [a, b]) => sum + b - a + 1, 0),
  }));

  // Per heading: repeated visits averaged.
  const headings = new Map<number, { deg: number; sum: number; n: number }>();
  for (const p of positions) {
    const key = headingKey(p.nominalDeg);
    const h = headings.get(key) ?? { deg: p.nominalDeg, sum: 0, n: 0 };
    h.sum += p.errorArcmin;
    h.n++;
    headings.set(key, h);
  }
  const headingDeg: number[] = [];
  const headingErr: number[] = [];
  for (const h of headings.values()) {
    headingDeg.push(h.deg);
    headingErr.push(h.sum / h.n);
  }
  const indexErrorArcmin = headingErr.reduce((a, b) => a + b, 0) / headingErr.length;
  let lo = Infinity;
  let hi = -Infinity;
  let maxAbs = 0;
  for (const p of positions) {
    lo = Math.min(lo, p.errorArcmin);
    hi = Math.max(hi, p.errorArcmin);
    maxAbs = Math.max(maxAbs, Math.abs(p.errorArcmin));
  }
  const at0 = headings.get(headingKey(0));
  const at180 = headings.get(headingKey(180));
  const oneCycleErrorArcmin = at0 && at180 ? at0.sum / at0.n - at180.sum / at180.n : null;

  let minLevel = Infinity;
  let maxLevel = -Infinity;
  for (const d of dwells) {
    minLevel = Math.min(minLevel, d.level);
    maxLevel = Math.max(maxLevel, d.level);
  }
  const gap = medianGapDeg(headingDeg);
  const coversFullTurn = maxLevel - minLevel + gap >= 360 - 0.5 * gap;
  const harmonics = coversFullTurn ? errorHarmonics(headingDeg, headingErr, opts.maxHarmonicOrder ?? 4).harmonics : [];
  if (!coversFullTurn) {
    findings.push(
      finding('accuracy-run-incomplete', 'info', `The stops cover ${(maxLevel - minLevel).toFixed(1)}° (${headings.size} headings), less than a full turn; error harmonics were not fitted.`, {
        advice: 'Step through the whole turn (e.g. 24 headings 15° apart) for index error, spread and harmonics over 360°.',
        roles,
        figures: { coveredDeg: maxLevel - minLevel, headings: headings.size, incrementDeg },
      }),
    );
  }

  const failing: number[] = [];
  let worst = 0;
  if (cls !== undefined) {
    const seen = new Set<number>();
    for (const p of positions) {
      const dev = p.errorArcmin - indexErrorArcmin;
      if (Math.abs(dev) > cls) {
        if (Math.abs(dev) > Math.abs(worst)) worst = dev;
        const key = headingKey(p.nominalDeg);
        if (!seen.has(key)) {
          seen.add(key);
          failing.push(p.nominalDeg);
        }
      }
    }
    if (failing.length > 0) {
      findings.push(
        finding('accuracy-out-of-class', 'warning', `${failing.length} heading(s) exceed ±${cls}′ about the index error: ${failing.map((d) => `${+d.toFixed(3)}°`).join(', ')} (worst ${worst.toFixed(2)}′).`, {
          advice: 'Check the unit against its accuracy class; a 1st-harmonic error points to a channel offset or eccentricity, a 2nd-harmonic error to gain imbalance or winding skew.',
          roles,
          figures: { classArcmin: cls, failingHeadings: failing.length, worstArcmin: worst, indexErrorArcmin },
        }),
      );
    }
  }

  return {
    accuracy: {
      mode: 'stepped',
      positions,
      incrementDeg,
      indexErrorArcmin,
      ppArcmin: hi - lo,
      maxAbsArcmin: maxAbs,
      oneCycleErrorArcmin,
      harmonics,
      coversFullTurn,
      classArcmin: cls ?? null,
      pass: cls === undefined ? null : failing.length === 0,
      failingNominalDeg: failing,
      dwellThresholdDegPerS: thresholdDegPerS,
    },
    findings,
  };
}

/** The standard increment nearest (in ratio) to a measured step, degrees. */
export function nearestIncrement(stepDeg: number): number {
  let best = STANDARD_INCREMENTS_DEG[0]!;
  let bestCost = Infinity;
  for (const inc of STANDARD_INCREMENTS_DEG) {
    const cost = Math.abs(Math.log(stepDeg / inc));
    if (cost < bestCost) {
      bestCost = cost;
      best = inc;
    }
  }
  return best;
}

/** Finds the stops of a stepped run (see {@link AccuracyRun} for the method). */
export function findRunStops(t: ArrayLike<number>, deg: ArrayLike<number>, opts: AccuracyRunOptions = {}): { dwells: Dwell[]; thresholdDegPerS: number } {
  const n = deg.length;
  const minDwellS = opts.minDwellS ?? 0.3;
  const minStepDeg = opts.minStepDeg ?? 0.5;
  if (n < 5) return { dwells: [], thresholdDegPerS: NaN };

  // Velocity window and threshold: LS slope variance 12σ²/(Δt² M(M²−1)) (Savitzky–Golay first
  // derivative) with σ the white angle noise from second differences.
  const dt = medianIntervalS(t);
  if (!(dt > 0)) return { dwells: [], thresholdDegPerS: NaN };
  const half = Math.max(2, Math.round((opts.velocityWindowS ?? 0.05) / dt / 2));
  const m = 2 * half + 1;
  const sigma = estimateAngleNoiseDeg(deg);
  const sigmaV = Number.isFinite(sigma) ? Math.sqrt((12 * sigma * sigma) / (dt * dt * m * (m * m - 1))) : 0;
  const threshold = opts.dwellMaxDegPerS ?? Math.max(0.2, 6 * sigmaV);
  const velocity = estimateVelocity(t, deg, { points: m });
  const still = new Uint8Array(n);
  for (let i = 0; i < n; i++) if (Number.isFinite(deg[i]!) && Math.abs(velocity[i]!) <= threshold) still[i] = 1;

  // Candidate runs of low velocity.
  const candidates: [number, number][] = [];
  for (let i = 0; i < n; ) {
    if (!still[i]) {
      i++;
      continue;
    }
    let j = i;
    while (j + 1 < n && still[j + 1]) j++;
    if (t[j]! - t[i]! >= minDwellS) candidates.push([i, j]);
    i = j + 1;
  }

  // Refine each candidate on the settled band, tested on a smoothed trace (5-point running median
  // against spikes, then a running mean over the velocity window against noise) so the band can be
  // tight relative to the settling ringing.
  const refined: Dwell[] = [];
  const scratch = new Float64Array(5);
  for (const [a, b] of candidates) {
    const len = b - a + 1;
    const lo = Math.floor(len / 4);
    const hi = len - 1 - lo;
    const core = finiteSlice(deg, a + lo, a + hi);
    if (core.length < 3) continue;
    const level0 = medianOf(core);
    const med = new Float64Array(len);
    for (let i = 0; i < len; i++) med[i] = median5(deg, a + i, a, b, scratch);
    const smooth = runningMean(med, half);
    const smoothCore = finiteSlice(smooth, lo, hi);
    const band = Math.max(5 * 1.4826 * medianOf(smoothCore.map((v) => Math.abs(v - level0))), 0.002);
    const outside = (i: number): boolean => Math.abs(smooth[i - a]! - level0) > band; // NaN: not outside
    const mid = (a + b) >> 1;
    let end = b;
    for (let i = mid; i <= b; i++) {
      if (outside(i)) {
        end = i - 1;
        break;
      }
    }
    let start = a;
    for (let i = mid; i >= a; i--) {
      if (outside(i)) {
        start = i + 1;
        break;
      }
    }
    if (end - start + 1 < 5 || t[end]! - t[start]! < minDwellS / 2) continue;
    refined.push(levelOf(deg, [[start, end]]));
  }

  // Merge neighbours that are one stop.
  const merged: Dwell[] = [];
  for (const d of refined) {
    const prev = merged[merged.length - 1];
    if (prev && Math.abs(d.level - prev.level) < minStepDeg) {
      merged[merged.length - 1] = levelOf(deg, [...prev.parts, ...d.parts]);
    } else {
      merged.push(d);
    }
  }
  return { dwells: merged, thresholdDegPerS: threshold };
}

/** Median level and 1.4826·MAD over the given inclusive sample ranges. */
function levelOf(deg: ArrayLike<number>, parts: readonly (readonly [number, number])[]): Dwell {
  const values = parts.flatMap(([a, b]) => finiteSlice(deg, a, b));
  const level = medianOf(values);
  const spread = 1.4826 * medianOf(values.map((v) => Math.abs(v - level)));
  return { start: parts[0]![0], end: parts[parts.length - 1]![1], parts, level, spread };
}

function finiteSlice(deg: ArrayLike<number>, from: number, to: number): number[] {
  const out: number[] = [];
  for (let i = from; i <= to; i++) if (Number.isFinite(deg[i]!)) out.push(deg[i]!);
  return out;
}

/** Centred running mean of half-width h over the finite values (NaN where none). */
function runningMean(x: Float64Array, h: number): Float64Array {
  const n = x.length;
  const sum = new Float64Array(n + 1);
  const cnt = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) {
    const v = x[i]!;
    const ok = Number.isFinite(v);
    sum[i + 1] = sum[i]! + (ok ? v : 0);
    cnt[i + 1] = cnt[i]! + (ok ? 1 : 0);
  }
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const from = Math.max(0, i - h);
    const to = Math.min(n, i + h + 1);
    const c = cnt[to]! - cnt[from]!;
    out[i] = c > 0 ? (sum[to]! - sum[from]!) / c : NaN;
  }
  return out;
}

/** Median of the finite samples among the up-to-5 centred on i, kept inside [lo, hi] (NaN if none). */
function median5(deg: ArrayLike<number>, i: number, lo: number, hi: number, w: Float64Array): number {
  let k = 0;
  for (let j = Math.max(lo, i - 2); j <= Math.min(hi, i + 2); j++) {
    const v = deg[j]!;
    if (!Number.isFinite(v)) continue;
    let p = k++;
    while (p > 0 && w[p - 1]! > v) {
      w[p] = w[p - 1]!;
      p--;
    }
    w[p] = v;
  }
  if (k === 0) return NaN;
  return k % 2 ? w[k >> 1]! : (w[(k >> 1) - 1]! + w[k >> 1]!) / 2;
}


function headingKey(deg: number): number {
  return Math.round(wrapDeg(deg) * 1e6) % 360000000;
}

/** Median circular gap between the distinct headings (degrees), 360 for a single heading. */
function medianGapDeg(anglesDeg: readonly number[]): number {
  const keys = [...new Set(anglesDeg.map(headingKey))].sort((x, y) => x - y).map((k) => k / 1e6);
  if (keys.length < 2) return 360;
  const gaps: number[] = [];
  for (let i = 1; i < keys.length; i++) gaps.push(keys[i]! - keys[i - 1]!);
  gaps.push(keys[0]! + 360 - keys[keys.length - 1]!);
  return medianOf(gaps);
}

/** The list entry nearest to an angle on the circle, returned in the angle's own turn. */
function nearestOnCircle(levelDeg: number, list: readonly number[]): number {
  let best = list[0]!;
  let bestDist = Infinity;
  for (const v of list) {
    const d = Math.abs(angleDiffDeg(levelDeg, v));
    if (d < bestDist) {
      bestDist = d;
      best = v;
    }
  }
  return levelDeg - angleDiffDeg(levelDeg, best);
}
