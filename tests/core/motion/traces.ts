/**
 * Seeded synthetic angle traces for the motion tests: one point per carrier cycle, t_i = i/fc,
 * angle from a closed-form motion plus white Gaussian noise (core/synth/random.ts).
 */
import { createRandom } from '../../../core/synth/random.js';

export const ARCMIN = 1 / 60;

export interface Trace {
  t: Float64Array;
  deg: Float64Array;
}

export function makeTrace(cycleHz: number, durationS: number, angleDeg: (tS: number) => number, noiseDeg: number, seed: number): Trace {
  const n = Math.round(cycleHz * durationS);
  const t = new Float64Array(n);
  const deg = new Float64Array(n);
  const rnd = createRandom(seed);
  for (let i = 0; i < n; i++) {
    t[i] = i / cycleHz;
    deg[i] = angleDeg(t[i]!) + noiseDeg * rnd.normal();
  }
  return { t, deg };
}

/** Adds `f(t)` to every point of a trace (a new trace). */
export function addTo(tr: Trace, f: (tS: number) => number): Trace {
  return { t: tr.t, deg: tr.deg.map((v, i) => v + f(tr.t[i]!)) };
}

/**
 * Exact last exit of a unit step response `u` from the band |u − 1| ≤ band, found on a 1 µs
 * grid scanned back from `horizonS` and refined by bisection (the definition of settling time,
 * K. Ogata, Modern Control Engineering, 5th ed., ch. 5; section from memory).
 */
export function exactSettlingS(u: (tS: number) => number, band: number, horizonS: number): number {
  const dt = 1e-5;
  let k = Math.round(horizonS / dt);
  while (k > 0 && Math.abs(u(k * dt) - 1) <= band) k--;
  let a = k * dt;
  let b = (k + 1) * dt;
  for (let i = 0; i < 60; i++) {
    const m = 0.5 * (a + b);
    if (Math.abs(u(m) - 1) > band) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}

/** First instant a monotone-at-first unit step response `u` reaches `level` (bisection). */
export function exactCrossingS(u: (tS: number) => number, level: number, horizonS: number): number {
  const dt = 1e-4;
  let k = 0;
  while (k * dt < horizonS && u(k * dt) < level) k++;
  let a = (k - 1) * dt;
  let b = k * dt;
  for (let i = 0; i < 60; i++) {
    const m = 0.5 * (a + b);
    if (u(m) < level) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}
