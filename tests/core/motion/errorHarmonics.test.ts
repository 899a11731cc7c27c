import { describe, expect, it } from 'vitest';
import { angleDiffDeg } from '../../../core/angle/unwrapDeg.js';
import { errorHarmonics, harmonicMeaning } from '../../../core/motion/errorHarmonics.js';
import { createRandom } from '../../../core/synth/random.js';

const RAD = Math.PI / 180;

/** atan2 error in arcmin of a sin/cos pair built with an imperfection, over equally spaced angles. */
function atan2Error(stepDeg: number, pair: (thetaRad: number) => [s: number, c: number]): { angle: number[]; error: number[] } {
  const angle: number[] = [];
  const error: number[] = [];
  for (let deg = 0; deg < 360; deg += stepDeg) {
    const [s, c] = pair(deg * RAD);
    angle.push(deg);
    error.push(angleDiffDeg(Math.atan2(s, c) / RAD, deg) * 60);
  }
  return { angle, error };
}

const order = (fit: ReturnType<typeof errorHarmonics>, k: number) => fit.harmonics.find((h) => h.order === k)!;

describe('errorHarmonics(angleDeg, errorArcmin, maxOrder) on the channel-imperfection models', () => {
  // First-order atan2 error models: gain +ε on the sine channel → (ε/2)·sin 2θ rad, offset o on the sine
  // channel → o·cos θ rad (offset → once-per-cycle, gain → twice-per-cycle ripple: Hwang et al.,
  // J. Power Electronics 14(1), 2014; Lee et al., J. Power Electronics 16(3), 2016; amplitude/phase
  // imbalance analysis: Hanselman, IEEE Trans. Ind. Electron. 37(6), 1990, from memory).
  it('0.1 % gain imbalance gives a 1.72′ 2nd harmonic (0.0005 rad = 1.7189′)', () => {
    const { angle, error } = atan2Error(1, (th) => [1.001 * Math.sin(th), Math.cos(th)]);
    const fit = errorHarmonics(angle, error, 4);
    expect(order(fit, 2).amplitudeArcmin).toBeCloseTo(1.7189, 2);
    expect(order(fit, 2).phaseDeg).toBeCloseTo(90, 0); // (ε/2) sin 2θ = (ε/2) cos(2θ − 90°)
    expect(order(fit, 1).amplitudeArcmin).toBeLessThan(1e-6);
    expect(order(fit, 0).amplitudeArcmin).toBeLessThan(1e-6);
    expect(order(fit, 4).amplitudeArcmin).toBeLessThan(0.002); // second-order term ε²/4 rad
  });

  it('0.1 % offset on the sine channel gives a 3.44′ 1st harmonic (0.001 rad = 3.4377′)', () => {
    const { angle, error } = atan2Error(1, (th) => [Math.sin(th) + 0.001, Math.cos(th)]);
    const fit = errorHarmonics(angle, error, 4);
    expect(order(fit, 1).amplitudeArcmin).toBeCloseTo(3.4377, 2);
    expect(Math.abs(order(fit, 1).phaseDeg)).toBeLessThan(0.5); // o·cos θ
    expect(order(fit, 2).amplitudeArcmin).toBeLessThan(0.005); // second-order term o²/2 rad
  });

  it('0.1 % offset on the cosine channel gives a 3.44′ 1st harmonic in sine phase (−o·sin θ)', () => {
    const { angle, error } = atan2Error(15, (th) => [Math.sin(th), Math.cos(th) + 0.001]);
    const fit = errorHarmonics(angle, error, 4);
    expect(order(fit, 1).amplitudeArcmin).toBeCloseTo(3.4377, 2);
    expect(order(fit, 1).phaseDeg).toBeCloseTo(-90, 0);
  });

  // Non-orthogonality δ → (δ/2)(1 + cos 2θ) (three-parameter offset/gain/quadrature model: Heydemann,
  // Applied Optics 1981; the ½ factor derived by expanding atan2, checked numerically).
  it('0.1° skew of the sine axis gives a 3′ mean and a 3′ 2nd harmonic (6′ peak-to-peak)', () => {
    const { angle, error } = atan2Error(15, (th) => [Math.sin(th + 0.1 * RAD), Math.cos(th)]);
    const fit = errorHarmonics(angle, error, 4);
    expect(fit.meanArcmin).toBeCloseTo(3, 2);
    expect(order(fit, 2).amplitudeArcmin).toBeCloseTo(3, 2);
    expect(Math.abs(order(fit, 2).phaseDeg)).toBeLessThan(0.5);
    expect(Math.max(...error) - Math.min(...error)).toBeCloseTo(6, 1);
  });

  // A counter-rotating 3rd space harmonic h beats with the fundamental at 4θ, amplitude h rad (harmonic
  // framework for atan2 error: Kuntz, Dauth, Gerlach, Ott, Fella, arXiv:2205.08472, 2022).
  it('0.1 % 3rd space harmonic gives a 3.44′ 4th harmonic', () => {
    const h = 0.001;
    const { angle, error } = atan2Error(1, (th) => [Math.sin(th) - h * Math.sin(3 * th), Math.cos(th) + h * Math.cos(3 * th)]);
    const fit = errorHarmonics(angle, error, 6);
    expect(order(fit, 4).amplitudeArcmin).toBeCloseTo(3.4377, 2);
    expect(Math.abs(order(fit, 4).phaseDeg)).toBeCloseTo(90, 0);
    expect(order(fit, 2).amplitudeArcmin).toBeLessThan(0.005);
  });
});

describe('errorHarmonics(angleDeg, errorArcmin, maxOrder) as a least-squares Fourier series', () => {
  it('equals the DFT coefficients on equally spaced headings (discrete orthogonality, Oppenheim & Schafer ch.8)', () => {
    const rnd = createRandom(11);
    const angle = Array.from({ length: 24 }, (_, i) => i * 15);
    const error = angle.map(() => rnd.normal() * 3);
    const fit = errorHarmonics(angle, error, 6);
    for (let k = 0; k <= 6; k++) {
      let a = 0, b = 0;
      for (let i = 0; i < 24; i++) {
        a += error[i]! * Math.cos(k * angle[i]! * RAD);
        b += error[i]! * Math.sin(k * angle[i]! * RAD);
      }
      const scale = k === 0 ? 1 / 24 : 2 / 24;
      expect(order(fit, k).amplitudeArcmin).toBeCloseTo(Math.hypot(a, b) * scale, 10);
      if (k > 0) expect(angleDiffDeg(order(fit, k).phaseDeg, Math.atan2(b, a) / RAD)).toBeCloseTo(0, 8);
    }
  });

  it('recovers a known series exactly at random, unequally spaced angles (common practice, no source)', () => {
    const rnd = createRandom(5);
    const truth = [-2, 3, 30, 1.5, -60, 0.4, 120]; // mean, then (amplitude, phaseDeg) for orders 1..3
    const angle: number[] = [];
    const error: number[] = [];
    for (let i = 0; i < 50; i++) {
      const a = rnd.uniform() * 720 - 180; // also outside [0, 360)
      angle.push(a);
      let e = truth[0]!;
      for (let k = 1; k <= 3; k++) e += truth[2 * k - 1]! * Math.cos(k * a * RAD - truth[2 * k]! * RAD);
      error.push(e);
    }
    const fit = errorHarmonics(angle, error, 3);
    expect(fit.meanArcmin).toBeCloseTo(-2, 9);
    expect(order(fit, 0).phaseDeg).toBe(180);
    for (let k = 1; k <= 3; k++) {
      expect(order(fit, k).amplitudeArcmin).toBeCloseTo(truth[2 * k - 1]!, 9);
      expect(angleDiffDeg(order(fit, k).phaseDeg, truth[2 * k]!)).toBeCloseTo(0, 7);
    }
    expect(fit.residualRmsArcmin).toBeLessThan(1e-9);
  });

  it('drops orders the points cannot support and skips non-finite pairs', () => {
    expect(errorHarmonics([0, 72, 144, 216, 288], [1, 2, 3, 4, 5], 4).maxOrderFitted).toBe(2);
    const uniform = Array.from({ length: 24 }, (_, i) => i * 15);
    // order 12 on 24 equally spaced headings is sin 12θ ≡ 0 there: not identifiable
    expect(errorHarmonics(uniform, uniform.map((a) => Math.cos(3 * a * RAD)), 12).maxOrderFitted).toBe(11);
    const fit = errorHarmonics([0, 90, NaN, 180, 270], [1, 1, 5, 1, NaN], 1);
    expect(fit.pointsUsed).toBe(3);
    expect(fit.meanArcmin).toBeCloseTo(1, 12);
    expect(errorHarmonics([], [], 3).harmonics).toEqual([]);
  });

  it('names the usual cause of each order (error-harmonic table of Hwang et al. 2014, Lee et al. 2016, Kuntz et al. 2022)', () => {
    expect(harmonicMeaning(0)).toMatch(/index|zero/);
    expect(harmonicMeaning(1)).toMatch(/offset/);
    expect(harmonicMeaning(1)).toMatch(/eccentric/);
    expect(harmonicMeaning(2)).toMatch(/gain/);
    expect(harmonicMeaning(4)).toMatch(/3rd space harmonic/);
    expect(harmonicMeaning(7)).toMatch(/slot/);
    expect(errorHarmonics([0, 120, 240], [0, 1, 2], 1).harmonics[1]!.meaning).toBe(harmonicMeaning(1));
  });

  it('throws RangeError for a bad order or mismatched arrays', () => {
    expect(() => errorHarmonics([0], [0], -1)).toThrow(RangeError);
    expect(() => errorHarmonics([0], [0], 1.5)).toThrow(RangeError);
    expect(() => errorHarmonics([0, 1], [0], 1)).toThrow(RangeError);
  });
});
