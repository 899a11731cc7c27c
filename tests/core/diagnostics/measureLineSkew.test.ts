import { describe, expect, it } from 'vitest';
import { measureLineSkew } from '../../../core/diagnostics/measureLineSkew.js';
import { phasorsFrom } from '../../helpers/phasorsFrom.js';

/**
 * Three synchro lines on a turning shaft, E_k = sin(θ − 120°·k) (the line voltages of a synchro,
 * 120° apart in shaft angle), with a common phase lead ψ, and line 1 delayed by δ radians of
 * carrier: Z_k = E_k·e^{j(ψ − δ_k)} (a delay τ multiplies a phasor by e^{−jωτ}).
 */
function turningLines(cycles: number, delayRad: number): { inPhase: number[][]; quadrature: number[][] } {
  const psi = 0.1;
  const inPhase: number[][] = [[], [], []];
  const quadrature: number[][] = [[], [], []];
  for (let m = 0; m < cycles; m++) {
    const theta = (2 * Math.PI * m) / 5000;
    for (let k = 0; k < 3; k++) {
      const e = 10 * Math.sin(theta - (2 * Math.PI * k) / 3);
      const phase = psi - (k === 1 ? delayRad : 0);
      inPhase[k]!.push(e * Math.cos(phase));
      quadrature[k]!.push(e * Math.sin(phase));
    }
  }
  return { inPhase, quadrature };
}

const UNIT = { kind: 'synchro' as const, lines: [{ base: 's1s3' as const, channel: 0 }, { base: 's3s2' as const, channel: 1 }, { base: 's2s1' as const, channel: 2 }] };

describe('measureLineSkew(unit, phasors, carrierHz)', () => {
  it('reads an injected 0.002 rad delay of one line as −0.1146° relative phase and τ = −Δφ/(2π·fc) (derived in the function\'s notes)', () => {
    const { inPhase, quadrature } = turningLines(20_000, 0.002);
    const got = measureLineSkew(UNIT, phasorsFrom(inPhase, quadrature), 400);
    expect(got.moving).toBe(true);
    expect(got.lines[1]!.relativePhaseDeg).toBeCloseTo((-0.002 * 180) / Math.PI, 3);
    expect(got.lines[1]!.skewUs).toBeCloseTo((0.002 / (2 * Math.PI * 400)) * 1e6, 1);
  });

  it('takes 150 000 cycles, more than a function call takes as arguments in V8 (a long record at a high carrier), and reads the same delay', () => {
    // 150 000 cycles: a 10 kHz excitation over 15 s. Spreading one argument per cycle into
    // Math.max overflowed the call stack here (seen on a 200 000-cycle capture).
    const { inPhase, quadrature } = turningLines(150_000, 0.002);
    const got = measureLineSkew(UNIT, phasorsFrom(inPhase, quadrature), 10_000);
    expect(got.lines[1]!.relativePhaseDeg).toBeCloseTo((-0.002 * 180) / Math.PI, 3);
  });
});
