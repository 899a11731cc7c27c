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
 * Each line may add a quadrature term q·cos(Φ+ψ), a 3rd carrier harmonic (proportional to the
 * envelope for the unit, or constant per line), a DC offset, a gain
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
  /**
   * A constant 3rd carrier harmonic on this line, peak volts, h3·sin(3(Φ+ψ)); unlike the unit's
   * `thirdHarmonic` it does not scale with the angle envelope, so it stays at the null. Default 0.
   */
  readonly thirdHarmonicV?: number;
  /**
   * Time skew of this channel in samples (may be fractional): the channel records the line as it
   * was `skewSamples` samples earlier, as a delaying probe path or a multiplexed ADC would
   * (positive = the line lags the others). Default 0.
   */
  readonly skewSamples?: number;
  /** Scope input range: the recorded signal is clipped to ±clipV volts (flat tops). Default: none. */
  readonly clipV?: number;
}

/**
 * A stator wiring fault of a synchro, applied to the lead potentials before the line voltages are
 * formed (derived from the Y-connected stator; the leads' potentials V1, V2, V3 are taken with zero
 * sum):
 * - `shorted`: the two leads are joined; with equal winding impedances both sit at the mean of
 *   their open-circuit potentials, so their line reads 0 and the other two lines are equal and
 *   opposite.
 * - `open` with `feed: 'floating'` (default): the lead is open and floats at the mean of the other
 *   two (a symmetric high-impedance load); the two lines through it each read −½ of the third.
 * - `open` with `feed: 'receiver'`: measured at a torque receiver whose lead is open at the far end;
 *   the receiver settles where its line that avoids the open lead matches the transmitter's, so
 *   every line follows the receiver's angle, which folds back at the two peaks of that line (NEETS
 *   Module 15 p.1-57: "turns smoothly one way then reverses"). Which half-turn is the stable one is
 *   not modelled: the half starting at the first peak is used.
 */
export type SynthStatorFault =
  | { readonly type: 'shorted'; readonly leads: 's1s2' | 's2s3' | 's1s3' }
  | { readonly type: 'open'; readonly lead: 's1' | 's2' | 's3'; readonly feed?: 'floating' | 'receiver' };

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
  /** A stator wiring fault (synchro only); default none. */
  readonly statorFault?: SynthStatorFault;
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

  const columns: { label: string; role: string; data: Float64Array; clipV?: number | undefined }[] = [];
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
    const fault = unit.statorFault;
    assertArgument(fault === undefined || unit.kind === 'synchro', 'statorFault applies to synchro units only');
    for (const line of unit.lines) {
      const shape = LINE_PHASE_DEG[line.role];
      assertArgument(shape !== undefined, `unknown line role ${line.role}`);
      const gain = (line.gain ?? 1) * shape.sign * amp;
      const q = line.quadratureV ?? 0;
      const offset = line.offsetV ?? 0;
      const h3v = line.thirdHarmonicV ?? 0;
      const skew = line.skewSamples ?? 0;
      const data = new Float64Array(n);
      if (skew === 0 && fault === undefined) {
        for (let i = 0; i < n; i++) {
          const carrier = carrierPhase(i / fs) + lead;
          const envelope = gain * Math.sin(theta[i]! + shape.phaseDeg * DEG);
          data[i] =
            envelope * (Math.sin(carrier) + h3 * Math.sin(3 * carrier)) + q * Math.cos(carrier) + h3v * Math.sin(3 * carrier) + offset;
        }
      } else {
        assertArgument(Number.isFinite(skew), 'skewSamples must be finite');
        for (let i = 0; i < n; i++) {
          const tS = (i - skew) / fs;
          const carrier = carrierPhase(tS) + lead;
          const th = skew === 0 ? theta[i]! : speed * motionAngleDeg(unit.motion, tS) * DEG;
          const unitEnvelope =
            fault === undefined ? Math.sin(th + shape.phaseDeg * DEG) : faultyLineEnvelope(fault, th, line.role);
          const envelope = (line.gain ?? 1) * amp * (fault === undefined ? shape.sign : 1) * unitEnvelope;
          data[i] =
            envelope * (Math.sin(carrier) + h3 * Math.sin(3 * carrier)) + q * Math.cos(carrier) + h3v * Math.sin(3 * carrier) + offset;
        }
      }
      columns.push({ label: line.label ?? DEFAULT_LABEL[line.role]!, role: prefix + line.role, data, clipV: line.clipV });
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
    const clip = column.clipV;
    if (clip !== undefined) {
      assertArgument(clip > 0, 'clipV must be positive');
      for (let i = 0; i < n; i++) column.data[i] = Math.max(-clip, Math.min(clip, column.data[i]!));
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

const LEAD_INDEX: Readonly<Record<string, number>> = { s1: 0, s2: 1, s3: 2 };
/** The pair of leads (potential of the first minus the second) behind each line role. */
const LINE_LEADS: Readonly<Record<string, readonly [number, number]>> = {
  s1s3: [0, 2], s3s2: [2, 1], s2s1: [1, 0], s3s1: [2, 0], s2s3: [1, 2], s1s2: [0, 1],
};

/**
 * Envelope (per unit of the stator maximum) of one line of a synchro with a stator fault at
 * electrical angle `thetaRad`. Lead potentials of the healthy unit, with zero sum:
 * V1 = (A − C)/3, V2 = (C − B)/3, V3 = (B − A)/3 for A = sin θ, B = sin(θ+120°), C = sin(θ+240°)
 * (then V1 − V3 = A, V3 − V2 = B, V2 − V1 = C; derived).
 */
function faultyLineEnvelope(fault: SynthStatorFault, thetaRad: number, role: string): number {
  const leads = LINE_LEADS[role];
  assertArgument(leads !== undefined, `statorFault needs line-to-line roles, got ${role}`);
  let th = thetaRad;
  if (fault.type === 'open' && fault.feed === 'receiver') {
    // The line that avoids the open lead: lead S3 open → S2−S1 (phase 240°), S1 → S3−S2 (120°),
    // S2 → S1−S3 (0°). Its peaks sit at θp = 90° − phase and θp + 180°; the receiver's angle
    // stays in [θp, θp + 180°], mirrored about the peaks (sin(θ + phase) is unchanged).
    const phaseRad = [120, 0, 240][LEAD_INDEX[fault.lead]!]! * DEG;
    const peak = Math.PI / 2 - phaseRad;
    const x = ((th - peak) % (2 * Math.PI) + 2 * Math.PI) % (2 * Math.PI);
    th = x < Math.PI ? peak + x : peak - x;
  }
  const a = Math.sin(th);
  const b = Math.sin(th + 120 * DEG);
  const c = Math.sin(th + 240 * DEG);
  const v = [(a - c) / 3, (c - b) / 3, (b - a) / 3];
  if (fault.type === 'shorted') {
    const [p, q] = fault.leads === 's1s2' ? [0, 1] : fault.leads === 's2s3' ? [1, 2] : [0, 2];
    const mean = (v[p]! + v[q]!) / 2;
    v[p] = mean;
    v[q] = mean;
  } else if ((fault.feed ?? 'floating') === 'floating') {
    const k = LEAD_INDEX[fault.lead]!;
    v[k] = (v[(k + 1) % 3]! + v[(k + 2) % 3]!) / 2;
  }
  return v[leads[0]]! - v[leads[1]]!;
}
