import { describe, expect, it } from 'vitest';
import { fitSecondOrderStep, secondOrderUnitImpulse, secondOrderUnitStep } from '../../../core/motion/fitSecondOrderStep.js';
import { secondOrderStep } from '../../../core/synth/motion.js';
import { createRandom } from '../../../core/synth/random.js';

describe('secondOrderUnitStep / secondOrderUnitImpulse (Ogata, Modern Control Engineering, ch. 5 closed forms)', () => {
  it('agrees with the synthetic-capture generator (the same textbook closed form, written separately) for under-, critically and overdamped systems', () => {
    for (const z of [0.05, 0.2, 0.7, 1, 1.8, 6]) {
      for (const tau of [0, 0.003, 0.05, 0.2, 1.3]) {
        expect(secondOrderUnitStep(tau, z, 2 * Math.PI * 4)).toBeCloseTo(secondOrderStep(tau, z, 2 * Math.PI * 4), 12);
      }
    }
  });

  it('is continuous through ζ = 1 and its impulse response is its time derivative (central difference)', () => {
    for (const tau of [0.01, 0.1, 0.4]) {
      const c = secondOrderUnitStep(tau, 1, 30);
      // Both branches meet the critical form: the symmetric second difference in ζ is O(h²), so
      // a mismatch between the under- and overdamped formulas would show far above 1e-9.
      const h = 1e-6;
      expect(Math.abs(secondOrderUnitStep(tau, 1 - h, 30) + secondOrderUnitStep(tau, 1 + h, 30) - 2 * c)).toBeLessThan(1e-9);
      for (const z of [0.3, 1, 2.5]) {
        const h = 1e-6;
        const numeric = (secondOrderUnitStep(tau + h, z, 30) - secondOrderUnitStep(tau - h, z, 30)) / (2 * h);
        expect(secondOrderUnitImpulse(tau, z, 30)).toBeCloseTo(numeric, 5);
      }
    }
    expect(secondOrderUnitStep(-1, 0.5, 10)).toBe(0);
  });
});

describe('fitSecondOrderStep(t, deg, start, end, starts)', () => {
  it('recovers t0, levels, ζ and ωn of a noise-free step to 1e-6 from a start 20 % off (Levenberg–Marquardt least squares)', () => {
    const fs = 400;
    const t = Float64Array.from({ length: 800 }, (_, i) => i / fs);
    const deg = Float64Array.from(t, (x) => -5 + 12 * secondOrderStep(x - 0.3137, 0.27, 2 * Math.PI * 6.5));
    const fit = fitSecondOrderStep(t, deg, 0, 800, [{ t0S: 0.33, fromDeg: -5.2, toDeg: 7.3, dampingRatio: 0.33, omegaNRadPerS: 2 * Math.PI * 5.5 }])!;
    expect(fit.converged).toBe(true);
    expect(fit.t0S).toBeCloseTo(0.3137, 6);
    expect(fit.fromDeg).toBeCloseTo(-5, 6);
    expect(fit.toDeg).toBeCloseTo(7, 6);
    expect(fit.dampingRatio).toBeCloseTo(0.27, 6);
    expect(fit.naturalHz).toBeCloseTo(6.5, 6);
    expect(fit.residualRmsDeg).toBeLessThan(1e-6);
  });

  it('fits an overdamped step with noise (ζ = 2.2) within 5 % and reports the noise as its residual', () => {
    const fs = 1000;
    const rnd = createRandom(12);
    const t = Float64Array.from({ length: 3000 }, (_, i) => i / fs);
    const deg = Float64Array.from(t, (x) => 30 * secondOrderStep(x - 0.5, 2.2, 2 * Math.PI * 3) + 0.01 * rnd.normal());
    const fit = fitSecondOrderStep(t, deg, 0, 3000, [{ t0S: 0.52, fromDeg: 0, toDeg: 30, dampingRatio: 1.3, omegaNRadPerS: 2 * Math.PI * 2 }])!;
    expect(Math.abs(fit.dampingRatio / 2.2 - 1)).toBeLessThan(0.05);
    expect(Math.abs(fit.naturalHz / 3 - 1)).toBeLessThan(0.05);
    expect(fit.residualRmsDeg / 0.01).toBeCloseTo(1, 1);
  });

  it('returns null with fewer than 8 usable points or no finite start', () => {
    expect(fitSecondOrderStep([0, 1, 2], [0, 1, 1], 0, 3, [{ t0S: 0, fromDeg: 0, toDeg: 1, dampingRatio: 1, omegaNRadPerS: 1 }])).toBeNull();
    const t = Float64Array.from({ length: 20 }, (_, i) => i);
    expect(fitSecondOrderStep(t, t, 0, 20, [{ t0S: NaN, fromDeg: 0, toDeg: 1, dampingRatio: 1, omegaNRadPerS: 1 }])).toBeNull();
  });
});
