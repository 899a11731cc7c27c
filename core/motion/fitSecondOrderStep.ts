import { solveSymmetric } from '../dsp/linearSolve.js';

/**
 * Unit step response of the standard second-order system ωn²/(s² + 2ζωn s + ωn²) at time
 * `tauS` after the step (0 before it). Closed forms for the underdamped, critically damped and
 * overdamped cases as given in K. Ogata, Modern Control Engineering, 5th ed., ch. 5 (§5-3, section from memory):
 *   ζ < 1: 1 − e^{−ζωnτ}/√(1−ζ²) · sin(ωd τ + arccos ζ),  ωd = ωn√(1−ζ²)
 *   ζ = 1: 1 − e^{−ωnτ}(1 + ωnτ)
 *   ζ > 1: 1 − (p₂e^{−p₁τ} − p₁e^{−p₂τ})/(p₂ − p₁),  p₁,₂ = ωn(ζ ∓ √(ζ²−1))
 * Within 1e-7 of ζ = 1 the critical form is used (the others lose digits there).
 */
export function secondOrderUnitStep(tauS: number, dampingRatio: number, omegaNRadPerS: number): number {
  if (!(tauS > 0)) return 0;
  const z = dampingRatio;
  const w = omegaNRadPerS;
  if (Math.abs(z - 1) < 1e-7) return 1 - Math.exp(-w * tauS) * (1 + w * tauS);
  if (z < 1) {
    const r = Math.sqrt(1 - z * z);
    return 1 - (Math.exp(-z * w * tauS) / r) * Math.sin(w * r * tauS + Math.acos(z));
  }
  const s = Math.sqrt(z * z - 1);
  const p1 = w * (z - s);
  const p2 = w * (z + s);
  return 1 - (p2 * Math.exp(-p1 * tauS) - p1 * Math.exp(-p2 * tauS)) / (p2 - p1);
}

/** Unit impulse response (time derivative of {@link secondOrderUnitStep}), 1/s. Same source. */
export function secondOrderUnitImpulse(tauS: number, dampingRatio: number, omegaNRadPerS: number): number {
  if (!(tauS > 0)) return 0;
  const z = dampingRatio;
  const w = omegaNRadPerS;
  if (Math.abs(z - 1) < 1e-7) return w * w * tauS * Math.exp(-w * tauS);
  if (z < 1) {
    const r = Math.sqrt(1 - z * z);
    return ((w / r) * Math.exp(-z * w * tauS)) * Math.sin(w * r * tauS);
  }
  const s = Math.sqrt(z * z - 1);
  const p1 = w * (z - s);
  const p2 = w * (z + s);
  return (w * w * (Math.exp(-p1 * tauS) - Math.exp(-p2 * tauS))) / (p2 - p1);
}

/** A starting point for {@link fitSecondOrderStep}. */
export interface StepFitStart {
  readonly t0S: number;
  readonly fromDeg: number;
  readonly toDeg: number;
  readonly dampingRatio: number;
  readonly omegaNRadPerS: number;
}

/** Least-squares second-order step fit. */
export interface StepFit {
  /** Fitted instant the step starts, s. */
  readonly t0S: number;
  readonly fromDeg: number;
  readonly toDeg: number;
  readonly dampingRatio: number;
  readonly naturalHz: number;
  /** RMS of the fit residual, degrees. */
  readonly residualRmsDeg: number;
  /** Points used (after striding). */
  readonly points: number;
  readonly iterations: number;
  /** True when the relative cost change fell below 1e-10 before the iteration limit. */
  readonly converged: boolean;
}

/** Options of {@link fitSecondOrderStep}. */
export interface StepFitOptions {
  /** Use every `stride`-th point (default: enough to keep ≤ 4000 points). */
  readonly stride?: number;
  readonly maxIterations?: number;
  /** Bounds of ωn, rad/s (default 1e-3 … 1e6). */
  readonly minOmegaN?: number;
  readonly maxOmegaN?: number;
}

const MIN_ZETA = 0.005;
const MAX_ZETA = 50;

/**
 * Fits x(t) = from + (to − from)·u(t − t0; ζ, ωn), u = {@link secondOrderUnitStep}, to the
 * points `[start, end)` by Levenberg–Marquardt (K. Levenberg, Q. Appl. Math. 2, 1944;
 * D. W. Marquardt, J. SIAM 11(2), 1963; damping λ·diag(JᵀJ)), parameters t0, from, to, ln ζ,
 * ln ωn (logs keep ζ and ωn positive; ζ is bounded to [0.005, 50]). The Jacobian is analytic
 * except for ζ (central difference, h = 1e-6 in ln ζ): ∂x/∂t0 = −Δ·g(τ) and ∂x/∂ln ωn = Δ·τ·g(τ)
 * with g the impulse response, because u depends on ωn only through ωnτ. Every start is run
 * and the lowest cost wins. NaN points are skipped. Returns null when fewer than 8 points are
 * usable or no start yields a finite fit.
 */
export function fitSecondOrderStep(
  t: ArrayLike<number>,
  deg: ArrayLike<number>,
  start: number,
  end: number,
  starts: readonly StepFitStart[],
  opts: StepFitOptions = {},
): StepFit | null {
  const lo = Math.max(0, start);
  const hi = Math.min(deg.length, end);
  const stride = opts.stride ?? Math.max(1, Math.ceil((hi - lo) / 4000));
  const ts: number[] = [];
  const xs: number[] = [];
  for (let i = lo; i < hi; i += stride) {
    if (Number.isFinite(t[i]!) && Number.isFinite(deg[i]!)) {
      ts.push(t[i]!);
      xs.push(deg[i]!);
    }
  }
  const n = ts.length;
  if (n < 8) return null;
  const minLw = Math.log(opts.minOmegaN ?? 1e-3);
  const maxLw = Math.log(opts.maxOmegaN ?? 1e6);
  const maxIt = opts.maxIterations ?? 100;
  const clampP = (p: Float64Array): void => {
    p[3] = Math.min(Math.log(MAX_ZETA), Math.max(Math.log(MIN_ZETA), p[3]!));
    p[4] = Math.min(maxLw, Math.max(minLw, p[4]!));
  };
  const cost = (p: Float64Array): number => {
    const z = Math.exp(p[3]!);
    const w = Math.exp(p[4]!);
    let c = 0;
    for (let i = 0; i < n; i++) {
      const r = xs[i]! - (p[1]! + (p[2]! - p[1]!) * secondOrderUnitStep(ts[i]! - p[0]!, z, w));
      c += r * r;
    }
    return c;
  };

  let best: StepFit | null = null;
  let bestCost = Infinity;
  const jrow = new Float64Array(5);
  for (const s0 of starts) {
    const p = Float64Array.from([s0.t0S, s0.fromDeg, s0.toDeg, Math.log(s0.dampingRatio), Math.log(s0.omegaNRadPerS)]);
    if (!p.every(Number.isFinite)) continue;
    clampP(p);
    let c = cost(p);
    if (!Number.isFinite(c)) continue;
    let lambda = 1e-3;
    let it = 0;
    let converged = false;
    const a = new Float64Array(25);
    const g = new Float64Array(5);
    const m = new Float64Array(25);
    for (; it < maxIt && !converged; it++) {
      a.fill(0);
      g.fill(0);
      const z = Math.exp(p[3]!);
      const w = Math.exp(p[4]!);
      const dz = 1e-6;
      const zp = Math.exp(p[3]! + dz);
      const zm = Math.exp(p[3]! - dz);
      const size = p[2]! - p[1]!;
      for (let i = 0; i < n; i++) {
        const tau = ts[i]! - p[0]!;
        const u = secondOrderUnitStep(tau, z, w);
        const gi = secondOrderUnitImpulse(tau, z, w);
        jrow[0] = -size * gi;
        jrow[1] = 1 - u;
        jrow[2] = u;
        jrow[3] = (size * (secondOrderUnitStep(tau, zp, w) - secondOrderUnitStep(tau, zm, w))) / (2 * dz);
        jrow[4] = size * (tau > 0 ? tau : 0) * gi;
        const r = xs[i]! - (p[1]! + size * u);
        for (let j = 0; j < 5; j++) {
          g[j] += jrow[j]! * r;
          for (let k = 0; k <= j; k++) a[j * 5 + k] += jrow[j]! * jrow[k]!;
        }
      }
      let accepted = false;
      while (!accepted && lambda < 1e12) {
        m.set(a);
        for (let j = 0; j < 5; j++) m[j * 5 + j] = a[j * 5 + j]! * (1 + lambda) + 1e-300;
        const sol = solveSymmetric(m, g, 5, 0);
        if (sol.x.every(Number.isFinite)) {
          const q = Float64Array.from(p, (v, j) => v + sol.x[j]!);
          clampP(q);
          const cq = cost(q);
          if (Number.isFinite(cq) && cq <= c) {
            const rel = (c - cq) / Math.max(c, 1e-300);
            p.set(q);
            c = cq;
            lambda = Math.max(lambda / 3, 1e-12);
            accepted = true;
            if (rel < 1e-10) converged = true;
            break;
          }
        }
        lambda *= 4;
      }
      if (!accepted) {
        converged = true; // no downhill step left: at a (local) minimum to working precision
      }
    }
    if (c < bestCost) {
      bestCost = c;
      best = {
        t0S: p[0]!,
        fromDeg: p[1]!,
        toDeg: p[2]!,
        dampingRatio: Math.exp(p[3]!),
        naturalHz: Math.exp(p[4]!) / (2 * Math.PI),
        residualRmsDeg: Math.sqrt(c / n),
        points: n,
        iterations: it,
        converged,
      };
    }
  }
  return best;
}

/**
 * 10 %–90 % rise time of the unit second-order step at ωn = 1 rad/s (so t_r = value/ωn),
 * found on a fine grid with linear interpolation.
 */
export function unitRiseTime(dampingRatio: number): number {
  const dtau = 0.002 * Math.min(1, 1 / dampingRatio);
  let t10 = NaN;
  let prev = 0;
  for (let k = 1; k < 5e6; k++) {
    const tau = k * dtau;
    const u = secondOrderUnitStep(tau, dampingRatio, 1);
    if (Number.isNaN(t10) && u >= 0.1) t10 = tau - dtau * ((u - 0.1) / (u - prev));
    if (u >= 0.9) return tau - dtau * ((u - 0.9) / (u - prev)) - t10;
    prev = u;
  }
  return NaN;
}
