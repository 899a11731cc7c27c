import { describe, expect, it } from 'vitest';
import { unitFigures, type UnitFiguresInput } from '../../../core/diagnostics/unitFigures.js';
import type { SynthLineSpec, SynthSpec } from '../../../core/synth/synthesizeCapture.js';
import type { MotionSpec } from '../../../core/synth/motion.js';
import { runUnitChain, type UnitChain } from './unitChain.js';

const FS = 100_000;
const SYNCHRO_LINES: SynthLineSpec[] = [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }];

function synchro(over: { motion: MotionSpec; ratio?: number; rmsV?: number; frequencyHz?: number; leadDeg?: number; lines?: SynthLineSpec[]; noiseV?: number }): SynthSpec {
  return {
    seed: 1057,
    sampleRateHz: FS,
    durationS: 1,
    carrier: { frequencyHz: over.frequencyHz ?? 400.13, rmsV: over.rmsV ?? 26, phaseDeg: 25 },
    units: [{ kind: 'synchro', transformationRatio: over.ratio ?? 11.8 / 26, phaseLeadDeg: over.leadDeg ?? 8, motion: over.motion, lines: over.lines ?? SYNCHRO_LINES }],
    noiseV: over.noiseV ?? 0.01,
    quantization: { bits: 12 },
  };
}

function figuresOf(chain: UnitChain, kind: 'synchro' | 'resolver', extra: Partial<UnitFiguresInput> = {}) {
  return unitFigures({
    kind,
    lines: chain.lines.map((l) => ({ role: l.role, inPhaseV: chain.phasors.inPhase[l.slot]!, quadratureV: chain.phasors.quadrature[l.slot]! })),
    angleDeg: chain.angle.deg,
    referencePeakV: chain.refPeakV,
    frequencyHz: chain.carrier.frequencyHz,
    centrePhaseRad: chain.phasors.centrePhaseRad,
    ...extra,
  });
}

describe('unitFigures — transformation ratio and phase lead', () => {
  it('clean 26 V / 11.8 V 400 Hz synchro, turning: TR 0.4538 within 0.5 %, lead within 0.3°, family found, no ratio-off-standard (NEETS Module 15 p.1-60)', () => {
    const chain = runUnitChain(synchro({ motion: { type: 'ramp', startDeg: 12, degPerS: 360 } }));
    const f = figuresOf(chain, 'synchro');
    expect(f.method).toBe('regression');
    expect(Math.abs(f.transformationRatio! / (11.8 / 26) - 1)).toBeLessThan(0.005);
    expect(Math.abs(f.phaseLeadDeg - 8)).toBeLessThan(0.3);
    expect(f.family?.name).toBe('26 V / 11.8 V, 400 Hz');
    expect(f.findings.map((x) => x.code)).not.toContain('ratio-off-standard');
    for (const line of f.perLine) expect(Math.abs(line.interceptQuadratureV)).toBeLessThan(2e-3);
  });

  it('clean 115 V / 90 V 60 Hz synchro, turning: matches the 60 Hz family, no ratio-off-standard (NEETS Module 15 p.1-60, p.1-65)', () => {
    const chain = runUnitChain({ ...synchro({ motion: { type: 'ramp', startDeg: -40, degPerS: 400 }, ratio: 90 / 115, rmsV: 115, frequencyHz: 60.02, leadDeg: 15, noiseV: 0.05 }), durationS: 1.5 });
    const f = figuresOf(chain, 'synchro');
    expect(Math.abs(f.transformationRatio! / (90 / 115) - 1)).toBeLessThan(0.005);
    expect(Math.abs(f.phaseLeadDeg - 15)).toBeLessThan(0.3);
    expect(f.family?.name).toBe('115 V / 90 V, 60 Hz');
    expect(f.findings).toEqual([]);
  });

  it('quadrature on the lines over a partial turn: regression stays within 0.3° and 0.5 %; the naive ½·arg Σ(S²+C²) lead is biased (negative control)', () => {
    // Line quadratures sum to zero, as the line voltages do (Kirchhoff's voltage law round S1, S2, S3).
    const q = [0.3, -0.1, -0.2];
    const lines = SYNCHRO_LINES.map((l, i) => ({ ...l, quadratureV: q[i]! }));
    const chain = runUnitChain(synchro({ motion: { type: 'ramp', startDeg: 10, degPerS: 90 }, lines }));
    const f = figuresOf(chain, 'synchro');
    expect(f.method).toBe('regression');
    expect(Math.abs(f.phaseLeadDeg - 8)).toBeLessThan(0.3);
    expect(Math.abs(f.transformationRatio! / (11.8 / 26) - 1)).toBeLessThan(0.005);
    f.perLine.forEach((line, i) => expect(Math.abs(line.interceptQuadratureV - q[i]!), line.role).toBeLessThan(0.01 * Math.abs(q[i]!) + 2e-3));
    // Negative control: predicted bias ≈ (q_S·mean sin θ + q_C·mean cos θ)/K ≈ 0.86° here (derived).
    const naiveBias = Math.abs(chain.angle.phaseLeadDeg - 8);
    expect(naiveBias).toBeGreaterThan(0.5);
    expect(naiveBias).toBeGreaterThan(10 * Math.abs(f.phaseLeadDeg - 8));
  });

  it('a turning envelope leaves quadrature −(g₁/2)·cos 2(Φc+ψ) in a one-period window (derived); without removing it the partial-turn quadrature is off by > 4 mV (negative control)', () => {
    const q = [0.3, -0.1, -0.2];
    const lines = SYNCHRO_LINES.map((l, i) => ({ ...l, quadratureV: q[i]! }));
    const chain = runUnitChain(synchro({ motion: { type: 'ramp', startDeg: 10, degPerS: 90 }, lines, noiseV: 0 }));
    const withFix = figuresOf(chain, 'synchro');
    const noFix = unitFigures({
      kind: 'synchro',
      lines: chain.lines.map((l) => ({ role: l.role, inPhaseV: chain.phasors.inPhase[l.slot]!, quadratureV: chain.phasors.quadrature[l.slot]! })),
      angleDeg: chain.angle.deg,
      referencePeakV: chain.refPeakV, // no centrePhaseRad: no motion-quadrature removal
    });
    expect(Math.abs(noFix.perLine[0]!.interceptQuadratureV - q[0]!)).toBeGreaterThan(4e-3);
    withFix.perLine.forEach((line, i) => expect(Math.abs(line.interceptQuadratureV - q[i]!), line.role).toBeLessThan(1e-3));
  });

  it('static resolver near electrical zero: lead from the large (cos) winding, the small winding’s quadrature read against it', () => {
    const spec: SynthSpec = {
      seed: 11,
      sampleRateHz: FS,
      durationS: 0.5,
      carrier: { frequencyHz: 400, rmsV: 26, phaseDeg: -60 },
      units: [{ kind: 'resolver', transformationRatio: 11.8 / 26, phaseLeadDeg: 12, motion: { type: 'static', deg: 0.05 }, lines: [{ role: 'sin', quadratureV: 0.04 }, { role: 'cos' }] }],
      noiseV: 0.005,
      quantization: { bits: 14 },
    };
    const chain = runUnitChain(spec);
    const f = figuresOf(chain, 'resolver');
    expect(f.method).toBe('static');
    expect(Math.abs(f.phaseLeadDeg - 12)).toBeLessThan(0.3);
    const sin = f.perLine.find((l) => l.role === 'sin')!;
    expect(Math.abs(sin.interceptQuadratureV - 0.04)).toBeLessThan(1e-3);
    expect(sin.interceptInPhaseV).toBeNull();
    expect(f.family?.name).toBe('26 V / 11.8 V, 400 Hz (TR 0.454)');
  });

  it('a 10:1 probe left at 1:1 on the stator (ratio ×10) raises ratio-off-standard as a warning with the figures', () => {
    const chain = runUnitChain(synchro({ motion: { type: 'ramp', startDeg: 0, degPerS: 360 }, ratio: 11.8 / 26 / 10 }));
    const f = figuresOf(chain, 'synchro');
    const off = f.findings.find((x) => x.code === 'ratio-off-standard')!;
    expect(off.severity).toBe('warning');
    expect(off.figures!.transformationRatio).toBeCloseTo(0.04538, 3);
    expect(f.family).toBeNull();
    // The tolerance is the caller's: at 95 % the same ratio is accepted (as a −90 % deviation).
    expect(figuresOf(chain, 'synchro', { ratioTolerancePct: 95 }).findings).toEqual([]);
  });

  it('without a reference there is no ratio and no ratio finding; a role that is not a line is a RangeError', () => {
    const chain = runUnitChain(synchro({ motion: { type: 'ramp', startDeg: 0, degPerS: 360 } }));
    const f = figuresOf(chain, 'synchro', { referencePeakV: NaN });
    expect(f.transformationRatio).toBeNull();
    expect(f.findings).toEqual([]);
    expect(() => unitFigures({ kind: 'synchro', lines: [{ role: 'ref', inPhaseV: [1], quadratureV: [0] }], angleDeg: [0] })).toThrow(RangeError);
  });
});
