import type { StepWindow } from './detectSteps.js';
import { estimateAngleNoiseDeg } from './estimateAngleNoise.js';
import { findLobes, dampedOmega, refinePeak, type Lobe } from './findStepLobes.js';
import { fitSecondOrderStep, unitRiseTime, type StepFitStart } from './fitSecondOrderStep.js';
import { medianIntervalS } from './robustStats.js';

const ARCMIN_PER_DEG = 60;

/** Damping ratio and natural frequency from one method. */
export interface DampingEstimate {
  readonly dampingRatio: number;
  readonly naturalHz: number;
}

/** Step-response figures of one step. Times in seconds, angles in degrees unless named otherwise. */
export interface StepResult {
  /** Start of the step, s: the fitted t0 of the second-order model, else the last point near the initial level. */
  readonly tS: number;
  readonly fromDeg: number;
  readonly toDeg: number;
  /** toDeg − fromDeg (signed). */
  readonly sizeDeg: number;
  /** Largest excursion beyond the final level in the first lobe, % of the step (0 when none is significant). */
  readonly overshootPct: number;
  /** Time of that peak after tS, s (null without overshoot). */
  readonly peakTimeS: number | null;
  /** 10 %–90 % transition duration, s (IEEE Std 181-2011; linear interpolation between points). */
  readonly riseTimeS: number | null;
  /** Time after tS of the last exit from the settling band, s (null if it never stays inside). */
  readonly settlingS: number | null;
  readonly settlingBandPct: number;
  /** The settling band half-width in arc-minutes (settlingBandPct % of |sizeDeg|). */
  readonly settlingBandArcmin: number;
  /** Primary damping ratio and natural frequency (from `dampingSource`). */
  readonly dampingRatio: number | null;
  readonly naturalHz: number | null;
  readonly dampingSource: 'fit' | 'decrement' | 'overshoot' | null;
  /** RMS of the deviation from the final level after settling, arc-minutes (noise included). */
  readonly residualArcmin: number | null;
  /** Least-squares second-order fit (null when it failed or does not describe the step). */
  readonly fit: (DampingEstimate & { readonly t0S: number; readonly residualArcmin: number }) | null;
  /** ζ from the overshoot and ωn from the damped period (null without overshoot). */
  readonly fromOvershoot: DampingEstimate | null;
  /** ζ from the logarithmic decrement over the observed peaks (null with fewer than two). */
  readonly fromDecrement: (DampingEstimate & { readonly periods: number }) | null;
  /** Trace indices the measurement used, [startIndex, endIndex). */
  readonly startIndex: number;
  readonly endIndex: number;
}

/** Options of {@link measureStep}. */
export interface StepOptions {
  /** Angle noise, degrees RMS per point (default: estimated from the step's window). */
  readonly noiseDeg?: number;
  /** Settling band half-width, % of the step (default 2). */
  readonly settlingBandPct?: number;
}

/**
 * Measures one step found by `detectSteps`.
 *
 * Definitions (IEEE Std 181-2011, *Transitions, pulses and related waveforms*): the trace is
 * normalised y = (θ − from)/(to − from); the 10 % and 90 % reference instants are the first
 * crossings, linearly interpolated; rise time = t90 − t10; overshoot = the largest y − 1 in
 * the first lobe beyond the final level (the lobe ends when y falls 3 σ below 1), its peak
 * located by a least-squares parabola through the points within 80 % of it. Settling: the
 * last exit from the ±2 % band about the final level (interpolated), measured from tS.
 *
 * Damping, three ways (second-order closed forms, K. Ogata, Modern Control Engineering, 5th ed.,
 * ch. 5):
 * (a) overshoot: ζ = −ln Mp / √(π² + ln² Mp);
 * (b) logarithmic decrement over the K significant lobes (alternate peaks about the final
 *     level, n = (K−1)/2 periods): δ = (1/n) ln(x₀/x_n), ζ = δ/√(4π² + δ²);
 *     in (a) and (b) ωn = ωd/√(1−ζ²) with ωd from the damped period (lobe spacing = Td/2, or
 *     Td = 2·peak time with a single lobe);
 * (c) a Levenberg–Marquardt fit of the step response ({@link fitSecondOrderStep}); these are
 *     the primary values when the fit is valid (ζ and ωn inside their bounds, RMS residual
 *     ≤ max(3 σ, 5 % of the step)); otherwise (b), then (a).
 * An overdamped step has overshootPct 0, null (a) and (b), and ζ from the fit only.
 *
 * Returns null when the step is too short or too noisy to cross 10 % and 90 %. Never throws.
 */
export function measureStep(t: ArrayLike<number>, deg: ArrayLike<number>, w: StepWindow, opts: StepOptions = {}): StepResult | null {
  const start = Math.max(0, w.preStartIndex);
  const end = Math.min(deg.length, t.length, w.endIndex);
  const from = w.fromDeg;
  const to = w.toDeg;
  const size = to - from;
  if (!(Math.abs(size) > 0) || end - start < 8) return null;
  const dt = medianIntervalS(sliceOf(t, start, end));
  if (!(dt > 0)) return null;
  const sigma = opts.noiseDeg ?? estimateAngleNoiseDeg(sliceOf(deg, start, end));
  const sig = Number.isFinite(sigma) ? sigma : 0;
  const bandPct = opts.settlingBandPct ?? 2;
  const band = bandPct / 100;
  const y = (i: number): number => (deg[i]! - from) / size;
  const ok = (i: number): boolean => Number.isFinite(deg[i]!) && Number.isFinite(t[i]!);

  // Reference-level crossings.
  const i10 = firstAtOrAbove(y, ok, start, end, 0.1);
  if (i10 < 0) return null;
  const i90 = firstAtOrAbove(y, ok, i10, end, 0.9);
  if (i90 < 0) return null;
  const t10 = crossingTime(t, y, ok, i10, 0.1);
  const t90 = crossingTime(t, y, ok, i90, 0.9);
  const riseTimeS = t90 - t10;

  // Departure from the initial level (start guess for t0, and tS when the fit fails).
  const near = Math.max((3 * sig) / Math.abs(size), 0.01);
  let iDep = i10;
  for (let i = i10; i >= start; i--) {
    if (!ok(i)) continue;
    iDep = i;
    if (Math.abs(y(i)) <= near) break;
  }
  const tDep = t[iDep]!;

  // Lobes of y − 1 after the 90 % crossing, with hysteresis.
  const hyst = Math.max((3 * sig) / Math.abs(size), 1e-4);
  const significant = Math.max((5 * sig) / Math.abs(size), 1e-3);
  const lobes = findLobes(t, y, ok, i90, end, hyst);
  // Each lobe's extreme is refined by a parabola (less noise bias than the largest sample).
  const sigLobes: Lobe[] = [];
  for (const l of lobes) {
    if (Math.abs(l.value) < significant) break;
    const r = refinePeak(t, y, ok, l.index, start, end);
    sigLobes.push({ index: l.index, value: r.value - 1, tS: r.tS });
  }
  const hasOvershoot = sigLobes.length > 0 && sigLobes[0]!.value > 0;
  const overshoot = hasOvershoot ? Math.max(0, sigLobes[0]!.value) : 0;
  const tPeak = hasOvershoot ? sigLobes[0]!.tS : NaN;
  // The decrement uses only lobes well clear of the noise (≥ 10 σ), whose extremes are not inflated by it.
  const decayLobes: Lobe[] = [];
  for (const l of sigLobes) {
    if (Math.abs(l.value) < Math.max((10 * sig) / Math.abs(size), 1e-3)) break;
    decayLobes.push(l);
  }

  // Settling: last exit from the band.
  let lastOut = -1;
  let lastFinite = -1;
  // The scan reaches back to the last finite point before the 10 % crossing (outside the band
  // by construction), so an instant step settles between that point and the next.
  let scanFrom = i10 - 1;
  while (scanFrom > start && !ok(scanFrom)) scanFrom--;
  for (let i = end - 1; i >= Math.max(start, scanFrom); i--) {
    if (!ok(i)) continue;
    if (lastFinite < 0) lastFinite = i;
    if (Math.abs(y(i) - 1) > band) {
      lastOut = i;
      break;
    }
  }
  let tSettle = NaN;
  let settleIndex = -1;
  if (lastOut >= 0 && lastOut < lastFinite) {
    let j = lastOut + 1;
    while (j < end && !ok(j)) j++;
    const ea = Math.abs(y(lastOut) - 1);
    const eb = Math.abs(y(j) - 1);
    const s = ea > eb ? (ea - band) / (ea - eb) : 0;
    tSettle = t[lastOut]! + Math.min(1, Math.max(0, s)) * (t[j]! - t[lastOut]!);
    settleIndex = j;
  }

  // (a) and (b), with ωd from the lobe instants (see dampedOmega); a first pass seeds the fit.
  const estimates = (t0: number | null): { os: DampingEstimate | null; dec: (DampingEstimate & { periods: number }) | null } => {
    const omegaD = dampedOmega(sigLobes, t0, tDep);
    let os: DampingEstimate | null = null;
    if (hasOvershoot && overshoot > 0 && Number.isFinite(omegaD)) {
      const lnM = Math.log(overshoot);
      const z = -lnM / Math.sqrt(Math.PI * Math.PI + lnM * lnM);
      if (z > 0 && z < 1) os = { dampingRatio: z, naturalHz: omegaD / Math.sqrt(1 - z * z) / (2 * Math.PI) };
    }
    let dec: (DampingEstimate & { periods: number }) | null = null;
    if (decayLobes.length >= 2 && Number.isFinite(omegaD)) {
      const first = Math.abs(decayLobes[0]!.value);
      const last = Math.abs(decayLobes[decayLobes.length - 1]!.value);
      const periods = (decayLobes.length - 1) / 2;
      const delta = Math.log(first / last) / periods;
      const z = delta / Math.sqrt(4 * Math.PI * Math.PI + delta * delta);
      if (z > 0 && z < 1) dec = { dampingRatio: z, naturalHz: omegaD / Math.sqrt(1 - z * z) / (2 * Math.PI), periods };
    }
    return { os, dec };
  };
  const seed = estimates(null);

  // Least-squares fit of the second-order response.
  const minPre = Math.max(10, 2 * (i90 - i10) + 1, Math.round(0.05 / dt));
  const fitStart = Math.max(start, iDep - minPre);
  const moveLen = Math.max(1, w.moveEndIndex - w.moveStartIndex);
  let fitEnd = Math.min(end, w.moveEndIndex + 3 * moveLen + Math.round(0.5 / dt));
  if (settleIndex > 0) fitEnd = Math.min(end, Math.max(fitEnd, settleIndex + Math.round(0.2 / dt)));
  const starts: StepFitStart[] = [];
  const guessFrom = (z: number, wn: number): StepFitStart => ({ t0S: tDep, fromDeg: from, toDeg: to, dampingRatio: z, omegaNRadPerS: wn });
  if (seed.dec) starts.push(guessFrom(seed.dec.dampingRatio, 2 * Math.PI * seed.dec.naturalHz));
  if (seed.os) starts.push(guessFrom(seed.os.dampingRatio, 2 * Math.PI * seed.os.naturalHz));
  if (starts.length === 0 && riseTimeS > 0) {
    for (const z of [0.8, 1.3, 3]) starts.push(guessFrom(z, unitRiseTime(z) / riseTimeS));
  }
  const maxOmega = Math.PI / dt;
  const spanS = t[end - 1]! - t[start]!;
  const fitRaw = fitSecondOrderStep(t, deg, fitStart, fitEnd, starts, { minOmegaN: Math.PI / Math.max(spanS, dt), maxOmegaN: maxOmega });
  const fitValid =
    fitRaw !== null &&
    fitRaw.dampingRatio > 0.0051 &&
    fitRaw.dampingRatio < 49 &&
    2 * Math.PI * fitRaw.naturalHz < 0.99 * maxOmega &&
    fitRaw.residualRmsDeg <= Math.max(3 * sig, 0.05 * Math.abs(size));
  const fit = fitValid
    ? { dampingRatio: fitRaw.dampingRatio, naturalHz: fitRaw.naturalHz, t0S: fitRaw.t0S, residualArcmin: fitRaw.residualRmsDeg * ARCMIN_PER_DEG }
    : null;

  const { os: fromOvershoot, dec: fromDecrement } = fit ? estimates(fit.t0S) : seed;
  const tS = fit ? fit.t0S : tDep;
  let residualArcmin: number | null = null;
  if (settleIndex >= 0) {
    let s2 = 0;
    let c = 0;
    for (let i = settleIndex; i < end; i++) {
      if (!ok(i)) continue;
      const e = deg[i]! - to;
      s2 += e * e;
      c++;
    }
    if (c > 0) residualArcmin = Math.sqrt(s2 / c) * ARCMIN_PER_DEG;
  }
  const primary = fit ?? fromDecrement ?? fromOvershoot;
  return {
    tS,
    fromDeg: from,
    toDeg: to,
    sizeDeg: size,
    overshootPct: 100 * overshoot,
    peakTimeS: hasOvershoot ? tPeak - tS : null,
    riseTimeS: Number.isFinite(riseTimeS) ? riseTimeS : null,
    settlingS: Number.isFinite(tSettle) ? tSettle - tS : null,
    settlingBandPct: bandPct,
    settlingBandArcmin: band * Math.abs(size) * ARCMIN_PER_DEG,
    dampingRatio: primary ? primary.dampingRatio : null,
    naturalHz: primary ? primary.naturalHz : null,
    dampingSource: fit ? 'fit' : fromDecrement ? 'decrement' : fromOvershoot ? 'overshoot' : null,
    residualArcmin,
    fit,
    fromOvershoot,
    fromDecrement,
    startIndex: start,
    endIndex: end,
  };
}

function sliceOf(x: ArrayLike<number>, start: number, end: number): Float64Array {
  const out = new Float64Array(Math.max(0, end - start));
  for (let i = start; i < end; i++) out[i - start] = x[i]!;
  return out;
}

function firstAtOrAbove(y: (i: number) => number, ok: (i: number) => boolean, start: number, end: number, level: number): number {
  for (let i = start; i < end; i++) if (ok(i) && y(i) >= level) return i;
  return -1;
}

/** Instant y crosses `level` between the last finite point before `i` and `i` (linear interpolation). */
function crossingTime(t: ArrayLike<number>, y: (i: number) => number, ok: (i: number) => boolean, i: number, level: number): number {
  let j = i - 1;
  while (j >= 0 && !ok(j)) j--;
  if (j < 0) return t[i]!;
  const a = y(j);
  const b = y(i);
  if (!(b > a)) return t[i]!;
  return t[j]! + ((level - a) / (b - a)) * (t[i]! - t[j]!);
}
