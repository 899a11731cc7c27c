import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { heydemannCorrect, heydemannFit } from '../../../core/diagnostics/heydemann.js';
import { createRandom } from '../../../core/synth/random.js';

const DEG = Math.PI / 180;
const vectors = JSON.parse(readFileSync(join(process.cwd(), 'tests', 'reference', 'harmonic-vectors.json'), 'utf8')) as {
  heydemann: { u1: number[]; u2: number[]; truth: { p: number; q: number; r: number; alphaRad: number }; lstsq: { p: number; q: number; r: number; alphaRad: number }; lstsqCentred: { p: number; q: number; r: number; alphaRad: number } };
};

/** Heydemann 1981 model: u1 = x + p, u2 = (y cos α − x sin α)/r + q, (x, y) = (cos θ, sin θ). */
function heydemannPoints(n: number, seed: number, noise: number) {
  const rnd = createRandom(seed);
  const p = 0.05, q = -0.03, r = 1.08, alpha = 3 * DEG;
  const u1 = new Float64Array(n);
  const u2 = new Float64Array(n);
  const theta = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const th = (2 * Math.PI * i) / n;
    theta[i] = th;
    const x = Math.cos(th), y = Math.sin(th);
    u1[i] = x + p + noise * rnd.normal();
    u2[i] = (y * Math.cos(alpha) - x * Math.sin(alpha)) / r + q + noise * rnd.normal();
  }
  return { u1, u2, theta };
}

describe('heydemannFit(u1, u2) — Heydemann 1981', () => {
  it('p = 0.05, q = −0.03, r = 1.08, α = 3°, noise 1e-3: every parameter within 5e-4 (α in radians)', () => {
    const { u1, u2 } = heydemannPoints(1000, 1981, 1e-3);
    const f = heydemannFit(u1, u2);
    expect(f.ok).toBe(true);
    expect(Math.abs(f.p - 0.05)).toBeLessThan(5e-4);
    expect(Math.abs(f.q + 0.03)).toBeLessThan(5e-4);
    expect(Math.abs(f.r - 1.08)).toBeLessThan(5e-4);
    expect(Math.abs(f.alphaRad - 3 * DEG)).toBeLessThan(5e-4);
    expect(f.radius).toBeCloseTo(1, 3);
  });

  it('agrees with numpy.linalg.lstsq of the same conic on the same centred, scaled points to 1e-9, and with the uncentred fit to 1e-5 (offline numpy vector)', () => {
    const v = vectors.heydemann;
    const f = heydemannFit(v.u1, v.u2);
    for (const key of ['p', 'q', 'r', 'alphaRad'] as const) {
      expect(Math.abs(f[key] - v.lstsqCentred[key]), key).toBeLessThan(1e-9);
      // The "= 1" algebraic criterion is not translation invariant: the raw-frame fit differs slightly.
      expect(Math.abs(f[key] - v.lstsq[key]), key).toBeLessThan(1e-5);
    }
  });

  it('correction brings the angle error from ~9° p-p down to the noise floor', () => {
    const { u1, u2, theta } = heydemannPoints(1000, 7, 1e-3);
    const f = heydemannFit(u1, u2);
    const { x, y } = heydemannCorrect(f, u1, u2);
    let rawMax = -Infinity, rawMin = Infinity, fixMax = -Infinity, fixMin = Infinity;
    for (let i = 0; i < theta.length; i++) {
      const wrap = (d: number) => d - 2 * Math.PI * Math.round(d / (2 * Math.PI));
      const raw = wrap(Math.atan2(u2[i]!, u1[i]!) - theta[i]!);
      const fix = wrap(Math.atan2(y[i]!, x[i]!) - theta[i]!);
      rawMax = Math.max(rawMax, raw); rawMin = Math.min(rawMin, raw);
      fixMax = Math.max(fixMax, fix); fixMin = Math.min(fixMin, fix);
    }
    expect((rawMax - rawMin) / DEG).toBeGreaterThan(8);
    // Noise floor: 1e-3 per channel → σθ ≈ 1e-3 rad; ±4σ p-p ≈ 0.46°.
    expect((fixMax - fixMin) / DEG).toBeLessThan(0.5);
  });
});
