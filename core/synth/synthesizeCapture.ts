import type { Capture, CaptureChannel } from '../model/capture.js';
import { assertArgument } from '../model/errors.js';
import { motionAngleDeg, type MotionSpec } from './motion.js';
import { createRandom } from './random.js';

/**
 * Seeded synthetic captures of synchro and resolver units, with a known shaft angle.
 *
 * Signal model (ideal unit; conventions of the standard synchro equations, stated e.g. in
 * NEETS Module 15 and SAE AS20708B):
 *   excitation  r(t) = √2·Vref·sin Φ(t),  Φ(t) = 2π(f0·t + ½·drift·t²) + φ0
 *   E(S1−S3) = TR·√2·Vref·sin θ(t)        · sin(Φ(t) + ψ)
 *   E(S3−S2) = TR·√2·Vref·sin(θ(t)+120°)  · sin(Φ(t) + ψ)
 *   E(S2−S1) = TR·√2·Vref·sin(θ(t)+240°)  · sin(Φ(t) + ψ)
 *   resolver sin / cos: TR·√2·Vref·{sin θ, cos θ} · sin(Φ(t) + ψ)
 * ψ is the unit's phase lead. Reversed pairs (s3s1, s2s3, s1s2) are the negated voltages.
 * Each line may add a quadrature term q·cos(Φ+ψ), a 3rd carrier harmonic, a DC offset, a gain
 * error, mains hum, white noise and the quantisation of an N-bit scope channel.
 */
export interface SynthLineSpec {
  /** Role of the line: s1s3, s3s2, s2s1, s3s1, s2s3, s1s2, sin, cos. */
  readonly role: string;
  /** Column label written for this line; defaults to the trade name ("S1-S3", "SIN"). */
  readonly label?: string;
  /** Multiplies the line as a probe factor or broken winding would (1 = healthy, 0 = dead). */
  readonly gain?: number;
  readonly offsetV?: number;
  /** Quadrature (90° time phase) amplitude, peak volts. */
  readonly quadratureV?: number;
}

export interface SynthUnitSpec {
  readonly id?: string;
  readonly kind: 'synchro' | 'resolver';
  /** Stator maximum line-to-line over rotor voltage, e.g. 0.4538 for 26 V / 11.8 V. */
  readonly transformationRatio: number;
  readonly phaseLeadDeg: number;
  readonly motion: MotionSpec;
  /** Electrical degrees per shaft degree (speed ratio of a multispeed unit); default 1. */
  readonly speed?: number;
  readonly lines: readonly SynthLineSpec[];
  /** 3rd carrier harmonic on every line, as a fraction of the fundamental. */
  readonly thirdHarmonic?: number;
}

export interface SynthSpec {
  readonly seed: number;
  readonly sampleRateHz: number;
  readonly durationS: number;
  readonly carrier: {
    readonly frequencyHz: number;
    /** Excitation R1-R2, volts RMS. */
    readonly rmsV: number;
    readonly phaseDeg?: number;
    /** Linear frequency drift, Hz per second. */
    readonly driftHzPerS?: number;
  };
  /** Whether the excitation (R1-R2) channel is in the capture; default true. */
  readonly includeReference?: boolean;
  readonly referenceLabel?: string;
  readonly units: readonly SynthUnitSpec[];
  /** White noise added to every channel, volts RMS. */
  readonly noiseV?: number;
  readonly hum?: { readonly frequencyHz: number; readonly amplitudeV: number };
  /** Scope resolution; every channel is quantised to 2^bits levels over ±fullScale. */
  readonly quantization?: { readonly bits: number };
  /** Column order: a permutation of the generated channel indices (reference first). */
  readonly order?: readonly number[];
}

export interface SynthCapture {
  readonly capture: Capture;
  /** Role of each capture channel, in channel order ("ref", "s1s3", "fine.sin"...). */
  readonly roles: readonly string[];
  /** True electrical angle of unit `unitIndex` in degrees at time tS (not wrapped). */
  angleDeg(tS: number, unitIndex?: number): number;
}

const LINE_PHASE_DEG: Readonly<Record<string, { phaseDeg: number; sign: number; cos?: boolean }>> = {
  s1s3: { phaseDeg: 0, sign: 1 },
  s3s2: { phaseDeg: 120, sign: 1 },
  s2s1: { phaseDeg: 240, sign: 1 },
  s3s1: { phaseDeg: 0, sign: -1 },
  s2s3: { phaseDeg: 120, sign: -1 },
  s1s2: { phaseDeg: 240, sign: -1 },
  sin: { phaseDeg: 0, sign: 1 },
  cos: { phaseDeg: 90, sign: 1 },
};

const DEFAULT_LABEL: Readonly<Record<string, string>> = {
  s1s3: 'S1-S3', s3s2: 'S3-S2', s2s1: 'S2-S1', s3s1: 'S3-S1', s2s3: 'S2-S3', s1s2: 'S1-S2',
  sin: 'SIN', cos: 'COS',
};

const DEG = Math.PI / 180;

export function synthesizeCapture(spec: SynthSpec): SynthCapture {
  assertArgument(spec.sampleRateHz > 0 && spec.durationS > 0, 'sample rate and duration must be positive');
  const n = Math.round(spec.sampleRateHz * spec.durationS);
  const fs = spec.sampleRateHz;
  const random = createRandom(spec.seed);
  const peakRef = Math.SQRT2 * spec.carrier.rmsV;
  const phi0 = (spec.carrier.phaseDeg ?? 0) * DEG;
  const drift = spec.carrier.driftHzPerS ?? 0;
  const f0 = spec.carrier.frequencyHz;
  const carrierPhase = (tS: number): number => 2 * Math.PI * (f0 * tS + 0.5 * drift * tS * tS) + phi0;

  const columns: { label: string; role: string; data: Float64Array }[] = [];
  if (spec.includeReference ?? true) {
    const data = new Float64Array(n);
    for (let i = 0; i < n; i++) data[i] = peakRef * Math.sin(carrierPhase(i / fs));
    columns.push({ label: spec.referenceLabel ?? 'R1-R2', role: 'ref', data });
  }

  spec.units.forEach((unit) => {
    const prefix = unit.id ? `${unit.id}.` : '';
    const amp = unit.transformationRatio * peakRef;
    const lead = unit.phaseLeadDeg * DEG;
    const speed = unit.speed ?? 1;
    const h3 = unit.thirdHarmonic ?? 0;
    const theta = new Float64Array(n);
    for (let i = 0; i < n; i++) theta[i] = speed * motionAngleDeg(unit.motion, i / fs) * DEG;
    for (const line of unit.lines) {
      const shape = LINE_PHASE_DEG[line.role];
      assertArgument(shape !== undefined, `unknown line role ${line.role}`);
      const gain = (line.gain ?? 1) * shape.sign * amp;
      const q = line.quadratureV ?? 0;
      const offset = line.offsetV ?? 0;
      const data = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        const carrier = carrierPhase(i / fs) + lead;
        const envelope = gain * Math.sin(theta[i]! + shape.phaseDeg * DEG);
        data[i] =
          envelope * (Math.sin(carrier) + h3 * Math.sin(3 * carrier)) + q * Math.cos(carrier) + offset;
      }
      columns.push({ label: line.label ?? DEFAULT_LABEL[line.role]!, role: prefix + line.role, data });
    }
  });

  const noise = spec.noiseV ?? 0;
  const hum = spec.hum;
  for (const column of columns) {
    const humPhase = random.uniform() * 2 * Math.PI;
    for (let i = 0; i < n; i++) {
      let v = column.data[i]!;
      if (noise > 0) v += noise * random.normal();
      if (hum) v += hum.amplitudeV * Math.sin(2 * Math.PI * hum.frequencyHz * (i / fs) + humPhase);
      column.data[i] = v;
    }
  }

  const order = spec.order ?? columns.map((_, i) => i);
  assertArgument(order.length === columns.length, 'order must list every generated channel once');
  const channels: CaptureChannel[] = [];
  const roles: string[] = [];
  order.forEach((index, column) => {
    const source = columns[index];
    assertArgument(source !== undefined, `order names channel ${index}, which does not exist`);
    const samples = new Float32Array(n);
    const bits = spec.quantization?.bits;
    if (bits !== undefined) {
      let peak = 0;
      for (let i = 0; i < n; i++) peak = Math.max(peak, Math.abs(source.data[i]!));
      // A scope set to a sensible range: full scale 10 % above the largest excursion.
      const lsb = (2 * 1.1 * (peak || 1)) / 2 ** bits;
      for (let i = 0; i < n; i++) samples[i] = Math.round(source.data[i]! / lsb) * lsb;
    } else {
      samples.set(source.data);
    }
    channels.push({ column, label: source.label, unit: 'V', samples });
    roles.push(source.role);
  });

  return {
    capture: { sampleRateHz: fs, startS: 0, sampleCount: n, channels },
    roles,
    angleDeg: (tS: number, unitIndex = 0) => {
      const unit = spec.units[unitIndex];
      assertArgument(unit !== undefined, `no unit ${unitIndex}`);
      return (unit.speed ?? 1) * motionAngleDeg(unit.motion, tS);
    },
  };
}
