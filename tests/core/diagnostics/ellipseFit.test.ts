import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ellipseFit } from '../../../core/diagnostics/ellipseFit.js';
import { createRandom } from '../../../core/synth/random.js';

const DEG = Math.PI / 180;

/** Points c = oc + a·cos t, s = os + b·sin(t + φ) over [t0, t0 + arc), with seeded white noise. */
function ellipsePoints(n: number, o: { oc: number; os: number; a: number; b: number; phi: number }, arcRad = 2 * Math.PI, noise = 0, seed = 1, t0 = 0.3) {
  const rnd = createRandom(seed);
  const c = new Float64Array(n);
  const s = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = t0 + (arcRad * i) / n;
    c[i] = o.oc + o.a * Math.cos(t) + noise * rnd.normal();
    s[i] = o.os + o.b * Math.sin(t + o.phi) + noise * rnd.normal();
  }
  return { c, s };
}

const vectors = JSON.parse(readFileSync(join(process.cwd(), 'tests', 'reference', 'harmonic-vectors.json'), 'utf8')) as {
  ellipse: { cos: number[]; sin: number[]; conic: number[]; truth: { cosOffset: number; sinOffset: number; cosAmplitude: number; sinAmplitude: number; skewRad: number } };
};

describe('ellipseFit(x, y) — Halíř & Flusser 1998 direct least squares', () => {
  it('noise-free: centre (0.02, −0.015), gain ratio 1.04 and skew 2.5° recovered to 1e-9 (channel-form model)', () => {
    const { c, s } = ellipsePoints(200, { oc: 0.02, os: -0.015, a: 1, b: 1.04, phi: 2.5 * DEG });
    const f = ellipseFit(c, s);
    expect(f.ok).toBe(true);
    expect(f.centreX).toBeCloseTo(0.02, 9);
    expect(f.centreY).toBeCloseTo(-0.015, 9);
    expect(f.amplitudeX).toBeCloseTo(1, 9);
    expect(f.amplitudeY).toBeCloseTo(1.04, 9);
    expect(f.skewRad).toBeCloseTo(2.5 * DEG, 9);
    // Every point lies on the returned conic (input units).
    const [A, B, C, D, E, F] = f.conic;
    for (let i = 0; i < c.length; i += 17) expect(A * c[i]! ** 2 + B * c[i]! * s[i]! + C * s[i]! ** 2 + D * c[i]! + E * s[i]! + F).toBeCloseTo(0, 9);
  });

  it('matches the same fit computed with numpy.linalg.eig (LAPACK) on a noisy vector (offline numpy vector)', () => {
    const v = vectors.ellipse;
    const f = ellipseFit(v.cos, v.sin);
    expect(f.ok).toBe(true);
    // Normalised conics agree to rounding (the TS conic is 4AC − B² = 1 in the centred, scaled frame, so compare up to scale).
    const scale = f.conic[0] / v.conic[0]!;
    f.conic.forEach((value, i) => expect(value / scale, `conic[${i}]`).toBeCloseTo(v.conic[i]!, 8));
    // And the recovered channel errors are near the generator's truth (noise 1e-3).
    expect(Math.abs(f.centreX - v.truth.cosOffset)).toBeLessThan(5e-4);
    expect(Math.abs(f.centreY - v.truth.sinOffset)).toBeLessThan(5e-4);
    expect(Math.abs(f.amplitudeY / f.amplitudeX - v.truth.sinAmplitude / v.truth.cosAmplitude)).toBeLessThan(5e-4);
    expect(Math.abs(f.skewRad - v.truth.skewRad) / DEG).toBeLessThan(0.03);
  });

  it('scale and translation invariance: volts-sized data (x 16.7, offset 3 V) give the same ratio and skew', () => {
    const { c, s } = ellipsePoints(300, { oc: 3, os: -2, a: 16.7, b: 16.7 * 0.995, phi: -0.4 * DEG }, 2 * Math.PI, 1e-3, 4);
    const f = ellipseFit(c, s);
    expect(f.amplitudeY / f.amplitudeX).toBeCloseTo(0.995, 5);
    expect(f.skewRad / DEG).toBeCloseTo(-0.4, 3);
    expect(f.centreX).toBeCloseTo(3, 3);
  });

  it('degenerate input (collinear points, fewer than 6 points) gives ok = false, never a throw', () => {
    expect(ellipseFit([0, 1, 2, 3, 4, 5, 6], [0, 1, 2, 3, 4, 5, 6]).ok).toBe(false);
    expect(ellipseFit([1, 0, -1], [0, 1, 0]).ok).toBe(false);
    expect(() => ellipseFit([1, 2], [1])).toThrow(RangeError);
  });
});
