import { COS_SIN_BLOCK, CosSinBlocks } from './cosSinTable.js';
import { solveSymmetric } from './linearSolve.js';
import { checkSampleRate, resolveSampleRange } from './sampleRange.js';

/**
 * Three- and four-parameter least-squares sine fits, IEEE Std 1057-2017 §4.1.4 and
 * IEEE Std 1241-2010 §4.1.4.3 (section numbers from memory); J. Blair, "Sine-fitting software
 * for IEEE Standards 1057 and 1241", IMTC 1999.
 *
 * Model: x[n] = a·cos(ω t) + b·sin(ω t) + c,  t = (n − start)/fs,  ω = 2π·frequencyHz,
 * equivalently amplitude·sin(ω t + phaseRad) + c with a = amplitude·sin(phaseRad),
 * b = amplitude·cos(phaseRad).
 *
 * Numerics: internally time is counted in samples from the centre of the fitted range, so the
 * frequency column of the four-parameter Jacobian is orthogonal to the others and, after the
 * column scaling done in {@link solveSymmetric}, the normal matrix has condition ≈ 1 (instead
 * of growing like N² with t counted from the start). Coefficients are rotated back to the
 * t = 0 reference at the end. cos/sin are evaluated from ω·n directly (see CosSinBlocks).
 * Non-finite samples are skipped and counted; they never enter the sums.
 */
export interface SineFit {
  frequencyHz: number;
  /** Coefficient of cos(ω t) (signal units). */
  a: number;
  /** Coefficient of sin(ω t) (signal units). */
  b: number;
  /** Constant term c (signal units). */
  offset: number;
  /** √(a² + b²), peak (not rms), signal units. */
  amplitude: number;
  /** phase of amplitude*sin(w t + phaseRad) at t = 0 (the first fitted sample), rad in (−π, π]. */
  phaseRad: number;
  /** √(mean squared residual) over the samples used, signal units. */
  residualRms: number;
  /** Gauss–Newton steps taken (0 for the three-parameter fit). */
  iterations: number;
  /**
   * Three-parameter fit: the normal equations were solvable. Four-parameter fit: the frequency
   * iteration settled (|Δf| fell below the tolerance or stopped shrinking at rounding level).
   * When false the other fields hold the last trustworthy three-parameter fit, or NaN if even
   * that was singular (e.g. fewer than 3 finite samples, or ω at 0 or Nyquist).
   */
  converged: boolean;
  /** Non-finite samples in the range, skipped. */
  skippedSamples: number;
}

/** Running sums of one pass over the range. */
interface Pass {
  /** 3×3 normal matrix for columns [cos θ, sin θ, 1], row-major. */
  m: Float64Array;
  /** Its right-hand side Σx·[cos θ, sin θ, 1]. */
  r: Float64Array;
  /** τ-weighted sums for the frequency column, see {@link frequencySystem}. */
  t: Float64Array;
  used: number;
}

const TWO_PI = 2 * Math.PI;

/**
 * One pass of running sums over finite samples, θ = ωτ, τ = n − centre (samples):
 * the three-parameter normal equations and, when `withFrequency`, the ten τ-weighted sums
 * Στc², Στcs, Στs², Στc, Στs, Στ²c², Στ²cs, Στ²s², Σxτc, Σxτs from which the Gauss–Newton
 * frequency column d = τ(B cos θ − A sin θ) is assembled for any A, B after the pass.
 */
function accumulate(x: ArrayLike<number>, start: number, length: number, omega: number, centre: number, withFrequency: boolean): Pass {
  const blocks = new CosSinBlocks(omega, centre);
  const cb = blocks.cos;
  const sb = blocks.sin;
  let scc = 0, scs = 0, sss = 0, sc = 0, ss = 0, s1 = 0;
  let rxc = 0, rxs = 0, rx = 0;
  let tcc = 0, tcs = 0, tss = 0, tc = 0, ts = 0, ttcc = 0, ttcs = 0, ttss = 0, xtc = 0, xts = 0;
  const end = start + length;
  for (let n0 = start; n0 < end; n0 += COS_SIN_BLOCK) {
    const count = Math.min(COS_SIN_BLOCK, end - n0);
    blocks.fill(n0, count);
    for (let j = 0; j < count; j++) {
      const v = +x[n0 + j];
      if (!Number.isFinite(v)) continue;
      const c = cb[j];
      const s = sb[j];
      const cc = c * c;
      const cs = c * s;
      const ss2 = s * s;
      scc += cc;
      scs += cs;
      sss += ss2;
      sc += c;
      ss += s;
      s1 += 1;
      rxc += v * c;
      rxs += v * s;
      rx += v;
      if (withFrequency) {
        const tau = n0 + j - centre;
        const tau2 = tau * tau;
        tcc += tau * cc;
        tcs += tau * cs;
        tss += tau * ss2;
        tc += tau * c;
        ts += tau * s;
        ttcc += tau2 * cc;
        ttcs += tau2 * cs;
        ttss += tau2 * ss2;
        xtc += v * tau * c;
        xts += v * tau * s;
      }
    }
  }
  return {
    m: Float64Array.of(scc, scs, sc, scs, sss, ss, sc, ss, s1),
    r: Float64Array.of(rxc, rxs, rx),
    t: Float64Array.of(tcc, tcs, tss, tc, ts, ttcc, ttcs, ttss, xtc, xts),
    used: s1,
  };
}

/**
 * The 4×4 Gauss–Newton normal equations for [A, B, C, Δω] at the pass's ω, with the frequency
 * column d = τ(B cos θ − A sin θ) formed from the given (A, B): Σc·d = BΣτc² − AΣτcs,
 * Σs·d = BΣτcs − AΣτs², Σd = BΣτc − AΣτs, Σd² = B²Στ²c² − 2ABΣτ²cs + A²Στ²s²,
 * Σx·d = BΣxτc − AΣxτs.
 */
function frequencySystem(p: Pass, a: number, b: number): { m: Float64Array; r: Float64Array } {
  const [tcc, tcs, tss, tc, ts, ttcc, ttcs, ttss, xtc, xts] = p.t;
  const m3 = p.m;
  const cd = b * tcc - a * tcs;
  const sd = b * tcs - a * tss;
  const d1 = b * tc - a * ts;
  const dd = b * b * ttcc - 2 * a * b * ttcs + a * a * ttss;
  const xd = b * xtc - a * xts;
  return {
    m: Float64Array.of(m3[0], m3[1], m3[2], cd, m3[3], m3[4], m3[5], sd, m3[6], m3[7], m3[8], d1, cd, sd, d1, dd),
    r: Float64Array.of(p.r[0], p.r[1], p.r[2], xd),
  };
}

/** √(mean of (x − A cos θ − B sin θ − C)²) over finite samples. */
function residualRms(x: ArrayLike<number>, start: number, length: number, omega: number, centre: number, a: number, b: number, c0: number): number {
  const blocks = new CosSinBlocks(omega, centre);
  let sum = 0;
  let used = 0;
  const end = start + length;
  for (let n0 = start; n0 < end; n0 += COS_SIN_BLOCK) {
    const count = Math.min(COS_SIN_BLOCK, end - n0);
    blocks.fill(n0, count);
    for (let j = 0; j < count; j++) {
      const v = +x[n0 + j];
      if (!Number.isFinite(v)) continue;
      const e = v - a * blocks.cos[j] - b * blocks.sin[j] - c0;
      sum += e * e;
      used++;
    }
  }
  return used > 0 ? Math.sqrt(sum / used) : NaN;
}

/** Three-parameter solve in the centred frame; NaN coefficients when singular. */
function solve3(x: ArrayLike<number>, start: number, length: number, omega: number, centre: number): { a: number; b: number; c: number; ok: boolean; used: number } {
  const p = accumulate(x, start, length, omega, centre, false);
  if (p.used < 3) return { a: NaN, b: NaN, c: NaN, ok: false, used: p.used };
  const sol = solveSymmetric(p.m, p.r, 3);
  return { a: sol.x[0], b: sol.x[1], c: sol.x[2], ok: sol.ok, used: p.used };
}

/** Builds the public result: rotates centred-frame (A, B) back to t = 0 and adds the residual. */
function finish(x: ArrayLike<number>, start: number, length: number, omega: number, centre: number, fit: { a: number; b: number; c: number },
  sampleRateHz: number, iterations: number, converged: boolean, skipped: number): SineFit {
  // θ at the first sample is −ω(centre − start); cos(ωτ) = cos(ωt − θc) with θc = ω(centre − start).
  const thetaC = omega * (centre - start);
  const cc = Math.cos(thetaC);
  const sc = Math.sin(thetaC);
  const a = fit.a * cc - fit.b * sc;
  const b = fit.a * sc + fit.b * cc;
  const ok = Number.isFinite(a) && Number.isFinite(b) && Number.isFinite(fit.c);
  return {
    frequencyHz: (omega * sampleRateHz) / TWO_PI,
    a,
    b,
    offset: fit.c,
    amplitude: Math.hypot(a, b),
    phaseRad: Math.atan2(a, b),
    residualRms: ok ? residualRms(x, start, length, omega, centre, fit.a, fit.b, fit.c) : NaN,
    iterations,
    converged: converged && ok,
    skippedSamples: skipped,
  };
}

/**
 * Three-parameter sine fit at a known frequency (IEEE Std 1057 / 1241): linear least squares
 * for a, b, c over x[start … start + length − 1]. O(N), one pass plus a residual pass.
 *
 * @param sampleRateHz samples per second (> 0)
 * @param frequencyHz the known frequency, Hz (finite, ≥ 0; 0 or fs/2 give a singular system,
 *   reported as converged = false)
 */
export function fitSine3(x: ArrayLike<number>, sampleRateHz: number, frequencyHz: number, start?: number, length?: number): SineFit {
  checkSampleRate(sampleRateHz, 'fitSine3');
  if (!Number.isFinite(frequencyHz) || frequencyHz < 0) throw new RangeError(`fitSine3: frequencyHz must be finite and >= 0, got ${frequencyHz}`);
  const range = resolveSampleRange(x.length, start, length, 'fitSine3');
  const omega = (TWO_PI * frequencyHz) / sampleRateHz;
  const centre = range.start + (range.length - 1) / 2;
  const fit = solve3(x, range.start, range.length, omega, centre);
  return finish(x, range.start, range.length, omega, centre, fit, sampleRateHz, 0, fit.ok, range.length - fit.used);
}

/** Options of {@link fitSine4}. */
export interface FitSine4Options {
  start?: number;
  length?: number;
  /** Gauss–Newton step limit (default 30). */
  maxIterations?: number;
  /** Stop when |Δf| ≤ this, Hz (default 1e-9 of a DFT bin, i.e. 1e-9·fs/length). */
  toleranceHz?: number;
}

/**
 * Four-parameter sine fit (IEEE Std 1057 / 1241): Gauss–Newton on [a, b, c, ω] from
 * `initialHz`, each step one O(N) pass of 19 running sums, then a 3×3 and a 4×4 scaled Cholesky solve.
 *
 * Start it from the interpolated-FFT estimate (`estimateToneFrequency`): the iteration
 * converges from about ±0.7 DFT bin and can diverge from ±1 bin (Kollár & Blair 2004 discuss
 * the basin). Stops when |Δf| ≤ toleranceHz, or when |Δf| stops shrinking (then converged
 * only if |Δf| is at rounding level, ≤ 1e-8 bin). It never follows a diverging iteration: if a
 * step leaves (0, fs/2), moves more than 2 bins from `initialHz`, or the normal equations are
 * singular, it returns the last accepted frequency's three-parameter fit with converged = false.
 * In Gaussian noise above threshold its frequency and phase variances reach the Cramér–Rao
 * bounds (Händel, IEEE Trans. Instrum. Meas. 49(6), 2000).
 *
 * @param initialHz starting frequency, Hz, in (0, fs/2)
 */
export function fitSine4(x: ArrayLike<number>, sampleRateHz: number, initialHz: number, opts: FitSine4Options = {}): SineFit {
  checkSampleRate(sampleRateHz, 'fitSine4');
  if (!(initialHz > 0 && initialHz < sampleRateHz / 2)) {
    throw new RangeError(`fitSine4: initialHz must be in (0, sampleRateHz/2), got ${initialHz}`);
  }
  const { start: s0, length: len } = resolveSampleRange(x.length, opts.start, opts.length, 'fitSine4');
  const maxIterations = opts.maxIterations ?? 30;
  if (!Number.isInteger(maxIterations) || maxIterations < 0) throw new RangeError(`fitSine4: maxIterations must be a non-negative integer`);
  const binRad = len > 0 ? TWO_PI / len : Infinity; // one DFT bin in rad/sample
  const toHz = sampleRateHz / TWO_PI;
  const tolRad = opts.toleranceHz !== undefined ? opts.toleranceHz / toHz : 1e-9 * binRad;
  if (!(tolRad >= 0)) throw new RangeError(`fitSine4: toleranceHz must be >= 0`);
  const floorRad = Math.max(tolRad, 1e-8 * binRad);
  const centre = s0 + (len - 1) / 2;
  const omega0 = initialHz / toHz;
  let omega = omega0;
  let fit = { a: NaN, b: NaN, c: NaN, ok: false, used: 0 };
  let fitOmega = NaN; // ω at which `fit` is the exact three-parameter solution
  let skipped = len;
  let converged = false;
  let iterations = 0;
  let prevStep = Infinity;
  for (;;) {
    // One pass: exact (A, B, C) at the current ω, then the Gauss–Newton step for ω built with
    // them (A, B re-solved every step, so the iteration is one-dimensional in ω and its steps
    // shrink monotonically near the minimum).
    const p = accumulate(x, s0, len, omega, centre, true);
    skipped = len - p.used;
    if (p.used < 4) break;
    const lin = solveSymmetric(p.m, p.r, 3);
    if (!lin.ok) break;
    fit = { a: lin.x[0], b: lin.x[1], c: lin.x[2], ok: true, used: p.used };
    fitOmega = omega;
    if (iterations >= maxIterations) break;
    iterations++;
    const sys = frequencySystem(p, fit.a, fit.b);
    const sol = solveSymmetric(sys.m, sys.r, 4);
    if (!sol.ok) break;
    const dOmega = sol.x[3];
    const step = Math.abs(dOmega);
    const next = omega + dOmega;
    if (!(next > 0 && next < Math.PI) || Math.abs(next - omega0) > 2 * binRad) break;
    // No longer shrinking: either at rounding level (done) or oscillating (not converged).
    if (step >= prevStep) {
      converged = step <= floorRad;
      break;
    }
    omega = next;
    if (step <= tolRad) {
      converged = true;
      break;
    }
    prevStep = step;
  }
  if (fitOmega !== omega) {
    const last = solve3(x, s0, len, omega, centre);
    if (last.ok || !fit.ok) fit = last;
    else omega = fitOmega;
  }
  return finish(x, s0, len, omega, centre, fit, sampleRateHz, iterations, converged && fit.ok, skipped);
}
