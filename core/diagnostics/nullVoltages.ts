import type { CarrierTrack } from '../carrier/carrierTrack.js';
import { finding, type Finding } from '../model/findings.js';
import { carrierPhaseFn, defaultHarmonicCount, segmentHarmonicSums } from './lineHarmonics.js';
import { nullAnglesDeg } from './nullAngles.js';

export { nullAnglesDeg };

/**
 * Null voltages of each stator line at its nulls: a static null (the shaft parked at, or within
 * `maxOffsetDeg` of, a null), and every null crossing of a slowly turning shaft.
 *
 * Nulls (standard synchro equations, NEETS Module 15): E(S1−S3) at 0°/180°, E(S3−S2) at
 * 60°/240°, E(S2−S1) at 120°/300° (the reversed pairs null at the same angles); resolver sine
 * winding at 0°/180°, cosine winding at 90°/270°.
 *
 * Components, per the null-voltage definition of SAE AS20708B (the null is where the in-phase
 * fundamental vanishes; what remains is quadrature and harmonics, read with a phase-sensitive
 * voltmeter referenced to the excitation and a true-RMS meter for the total):
 * - in-phase I: fundamental in phase with the unit's own output phase (excitation phase plus
 *   the unit's phase lead ψ), mV RMS, signed; a residual I is the rotor standing off the null
 *   by I/gradient;
 * - quadrature Q: fundamental at 90° to it, mV RMS, signed;
 * - harmonics H: root-sum-square of harmonics 2 … H, mV RMS;
 * - total: RMS of the samples about their DC level over the null cycles, mV (everything left:
 *   √(I² + Q² + H² + noise); DC is dropped as an AC-coupled true-RMS meter would).
 * All from one multi-harmonic least-squares fit (IEEE Std 1057 extended, see `fitHarmonics`) per
 * block of ≤ ~10 cycles at the local carrier frequency.
 *
 * Speed limit. A CT's output is never zero while the shafts turn (a speed-dependent residual;
 * Naval Ordnance Laboratory analysis), and the lock-in itself sees the envelope move inside the
 * window: an envelope sweeping through the null by Δ radians over one cycle of a line with peak
 * K leaves about K·Δ/√24 RMS of unmodelled ramp (derived: ramp K·Δ·(t/T − ½) times the carrier,
 * RMS K·Δ/√12/√2) and a speed voltage of order K·Δ/(2π). So a null is evaluated only over
 * cycles whose angle excursion (integrated velocity, each cycle's own travel included) stays
 * within `maxSweepDeg`, default 0.01° electrical: for a 11.8 V line (K = 16.7 V peak) the ramp
 * is then ≤ 0.6 mV, for a 90 V line ≤ 4.5 mV, a tenth or less of the typical limits
 * (derived; limits from memory). At 400 Hz that is a shaft slower than 4°/s for a single-cycle
 * crossing. Faster crossings are skipped and counted. Pass a smoothed velocity (e.g. the motion stage's
 * Savitzky–Golay derivative, estimateVelocity): a raw first difference of a noisy angle inflates
 * the excursion.
 *
 * Limits: report, don't judge. Nothing is judged against a total-null limit unless the caller
 * sets `nullLimitMv` ({@link TYPICAL_NULL_LIMITS_MV} lists typical values, from memory, for a
 * UI to offer). Quadrature is always checked (`high-quadrature`, warning): against
 * `quadratureLimitMv`, else `nullLimitMv`, else `quadratureFraction` (default 0.5 %) of the
 * line's maximum RMS. Why 0.5 %: typical total nulls are about 0.2–0.35 % of the stator maximum
 * (20–40 mV on 11.8 V, 50–150 mV on 90 V, from memory), so a quadrature above 0.5 % alone
 * exceeds a whole healthy null; it also equals a 0.29° tilt of the phase lead (q/K = 0.005 rad)
 * if read at a static angle, the size at which quadrature starts to corrupt a phase-lead
 * reading (derived).
 */
export interface NullLineInput {
  /** Line role, optionally with a unit prefix: "s1s3", "s2s3", "sin", "fine.cos"... */
  readonly role: string;
  /** The line's samples, volts (Capture channel samples). */
  readonly samples: ArrayLike<number>;
  /** The line's maximum fundamental, volts RMS (for the quadrature-fraction rule); optional. */
  readonly maxRmsV?: number;
}

export interface NullCycles {
  /** CyclePhasors.firstSample, .lengthSamples, .centreS. */
  readonly firstSample: ArrayLike<number>;
  readonly lengthSamples: ArrayLike<number>;
  readonly centreS: ArrayLike<number>;
}

export interface NullOptions {
  /** Total null limit, mV RMS; unset = report only. */
  readonly nullLimitMv?: number;
  /** Quadrature limit, mV RMS; unset = nullLimitMv, else quadratureFraction of the line max. */
  readonly quadratureLimitMv?: number;
  /** Fraction of the line's maximum RMS above which quadrature is flagged; default 0.005. */
  readonly quadratureFraction?: number;
  /** Largest angle excursion over the cycles used for one null, electrical degrees; default 0.01. */
  readonly maxSweepDeg?: number;
  /** Largest distance from the null angle of the cycles used, electrical degrees; default 1. */
  readonly maxOffsetDeg?: number;
  /** Highest harmonic fitted; default min(7, ⌊0.45·fs/f⌋). */
  readonly harmonics?: number;
}

export interface NullVoltagesInput {
  readonly lines: readonly NullLineInput[];
  readonly sampleRateHz: number;
  /** The carrier phase track (CarrierEstimate.track). */
  readonly carrier: CarrierTrack;
  /** The unit's phase lead, degrees (from unitFigures). */
  readonly phaseLeadDeg: number;
  readonly cycles: NullCycles;
  /** Decoded electrical angle per cycle, degrees (AngleSolution.deg). */
  readonly angleDeg: ArrayLike<number>;
  /** Angular velocity per cycle, electrical degrees per second (smoothed). */
  readonly velocityDegPerS: ArrayLike<number>;
  readonly options?: NullOptions;
}

export interface NullReading {
  readonly role: string;
  /** The nominal null angle, electrical degrees (0, 60, 90, 120, 180, 240, 270 or 300). */
  readonly angleDeg: number;
  /** Mean decoded angle over the cycles used, minus the null angle, arc-minutes. */
  readonly offsetArcmin: number;
  /** Centre of the cycles used, seconds from the first sample. */
  readonly tS: number;
  readonly cycles: number;
  /** Angle excursion over the cycles used, electrical degrees. */
  readonly sweepDeg: number;
  /** The null components, mV RMS (in-phase and quadrature signed; see above). */
  readonly inPhaseMv: number; readonly quadratureMv: number; readonly harmonicMv: number; readonly totalMv: number;
}

export interface NullVoltages {
  readonly nulls: readonly NullReading[];
  /** Null crossings passed too fast to measure, per role. */
  readonly skipped: readonly { readonly role: string; readonly angleDeg: number; readonly tS: number; readonly sweepDeg: number }[];
  readonly findings: readonly Finding[];
  /** The limits applied, mV RMS (null = not judged). */
  readonly limits: { readonly nullLimitMv: number | null; readonly quadratureLimitMv: readonly (number | null)[] };
}

/** Typical total null limits, mV RMS (from memory, not applied unless the user chooses them). */
export const TYPICAL_NULL_LIMITS_MV: Readonly<Record<string, { readonly lowMv: number; readonly highMv: number; readonly source: string }>> = {
  '26 V / 11.8 V': { lowMv: 20, highMv: 40, source: 'from memory' },
  '115 V / 90 V': { lowMv: 50, highMv: 150, source: 'from memory' },
};

const wrap180 = (d: number): number => d - 360 * Math.round(d / 360);

/** Fraction of maxOffsetDeg by which the angle may stray past it before a run at a null ends (common practice, no source). */
const NULL_WINDOW_HYSTERESIS = 0.25;

export function nullVoltages(input: NullVoltagesInput): NullVoltages {
  const o = input.options ?? {};
  const maxSweep = o.maxSweepDeg ?? 0.01;
  const maxOffset = o.maxOffsetDeg ?? 1;
  const fraction = o.quadratureFraction ?? 0.005;
  if (!(maxSweep > 0) || !(maxOffset > 0) || !(fraction > 0)) throw new RangeError('nullVoltages: maxSweepDeg, maxOffsetDeg and quadratureFraction must be > 0');
  const fs = input.sampleRateHz;
  const { firstSample, lengthSamples, centreS } = input.cycles;
  const nCycles = input.angleDeg.length;
  if (firstSample.length !== nCycles || lengthSamples.length !== nCycles || input.velocityDegPerS.length !== nCycles) {
    throw new RangeError('nullVoltages: cycles, angleDeg and velocityDegPerS must have one entry per cycle');
  }
  const phaseAt = carrierPhaseFn(input.carrier, fs);
  const fHz = ((phaseAt(1) - phaseAt(0)) * fs) / (2 * Math.PI);
  const H = o.harmonics ?? defaultHarmonicCount(fs, fHz);
  const psi = (input.phaseLeadDeg * Math.PI) / 180;
  const cosPsi = Math.cos(psi), sinPsi = Math.sin(psi);

  // Travel of each cycle and the integrated path (prefix sums of v·T), degrees.
  const travel = new Float64Array(nCycles);
  const path = new Float64Array(nCycles + 1);
  for (let m = 0; m < nCycles; m++) {
    const v = +input.velocityDegPerS[m]!;
    const d = (v * lengthSamples[m]!) / fs;
    travel[m] = Number.isFinite(d) ? d : NaN;
    path[m + 1] = path[m]! + (Number.isFinite(d) ? d : 0);
  }
  const nulls: NullReading[] = [];
  const skipped: { role: string; angleDeg: number; tS: number; sweepDeg: number }[] = [];
  const findings: Finding[] = [], quadLimits: (number | null)[] = [];

  for (const line of input.lines) {
    const angles = nullAnglesDeg(line.role);
    if (!angles) throw new RangeError(`nullVoltages: "${line.role}" is not a stator line role`);
    // Which null each cycle is nearer (-1: no angle) and how far off it is.
    const which = new Int8Array(nCycles).fill(-1);
    const offset = new Float64Array(nCycles);
    for (let m = 0; m < nCycles; m++) {
      const t = +input.angleDeg[m]!;
      if (!Number.isFinite(t) || !Number.isFinite(travel[m]!)) continue;
      const d = wrap180(t - angles[0]);
      const k = Math.abs(d) <= 90 ? 0 : 1;
      which[m] = k;
      offset[m] = k === 0 ? d : wrap180(d - 180);
    }
    // A run of cycles at one null starts within maxOffset of it and lasts until the angle leaves
    // maxOffset·(1 + NULL_WINDOW_HYSTERESIS): with one threshold, angle noise at the window's edge
    // split a crossing into a second, spurious "null" read ~maxOffset off (seen on a 10 kHz
    // crossing at 36°/s: 204 mV of in-phase at 0.99°).
    const stayOffset = maxOffset * (1 + NULL_WINDOW_HYSTERESIS);
    const lineNulls: NullReading[] = [];
    let m = 0;
    while (m < nCycles) {
      if (which[m] === -1 || Math.abs(offset[m]!) > maxOffset) {
        m++;
        continue;
      }
      let end = m;
      while (end + 1 < nCycles && which[end + 1] === which[m] && Math.abs(offset[end + 1]!) <= stayOffset) end++;
      const k = which[m]!;
      // Seed at the cycle nearest the null; grow towards the nearer neighbour while still slow.
      let seed = m;
      for (let j = m; j <= end; j++) if (Math.abs(offset[j]!) < Math.abs(offset[seed]!)) seed = j;
      const seedSweep = Math.abs(travel[seed]!);
      if (seedSweep > maxSweep) {
        skipped.push({ role: line.role, angleDeg: angles[k]!, tS: +centreS[seed]!, sweepDeg: seedSweep });
        m = end + 1;
        continue;
      }
      // The path points of cycles lo … hi are path[lo] … path[hi + 1]; keep their range.
      let lo = seed, hi = seed;
      let pMin = Math.min(path[seed]!, path[seed + 1]!), pMax = Math.max(path[seed]!, path[seed + 1]!);
      for (;;) {
        const left = lo > m ? lo - 1 : -1;
        const right = hi < end ? hi + 1 : -1;
        const order = [left, right].filter((j) => j >= 0).sort((a, b) => Math.abs(offset[a]!) - Math.abs(offset[b]!));
        let grown = false;
        for (const j of order) {
          const point = j < lo ? path[j]! : path[j + 1]!;
          const nMin = Math.min(pMin, point);
          const nMax = Math.max(pMax, point);
          if (nMax - nMin <= maxSweep) {
            if (j < lo) lo = j;
            else hi = j;
            [pMin, pMax] = [nMin, nMax];
            grown = true;
            break;
          }
        }
        if (!grown) break;
      }
      const start = firstSample[lo]!;
      const stop = firstSample[hi]! + lengthSamples[hi]!;
      const sums = segmentHarmonicSums(line.samples, fs, phaseAt, [{ startSample: start, lengthSamples: stop - start }], H);
      if (sums.blocks > 0) {
        const iE = sums.meanInPhase[1]!, qE = sums.meanQuadrature[1]!;
        let hp = 0;
        for (let h = 2; h <= H; h++) hp += sums.meanPower[h]!;
        let offSum = 0;
        for (let j = lo; j <= hi; j++) offSum += offset[j]!;
        lineNulls.push({
          role: line.role,
          angleDeg: angles[k]!,
          offsetArcmin: (offSum / (hi - lo + 1)) * 60,
          tS: (+centreS[lo]! + +centreS[hi]!) / 2,
          cycles: hi - lo + 1,
          sweepDeg: pMax - pMin,
          // (iE + j·qE)·e^{−jψ}: in phase with and at 90° to the unit's own output.
          inPhaseMv: ((iE * cosPsi + qE * sinPsi) / Math.SQRT2) * 1000,
          quadratureMv: ((qE * cosPsi - iE * sinPsi) / Math.SQRT2) * 1000,
          harmonicMv: Math.sqrt(hp / 2) * 1000,
          totalMv: Math.sqrt(sums.meanSquareAc) * 1000,
        });
      }
      m = end + 1;
    }
    for (const n of lineNulls) nulls.push(n);

    const fromLine = line.maxRmsV !== undefined && line.maxRmsV > 0 ? fraction * line.maxRmsV * 1000 : null;
    const quadLimit = o.quadratureLimitMv ?? o.nullLimitMv ?? fromLine;
    quadLimits.push(quadLimit);
    if (quadLimit !== null) {
      const over = lineNulls.filter((r) => Math.abs(r.quadratureMv) > quadLimit);
      if (over.length) {
        const worst = over.reduce((a, b) => (Math.abs(b.quadratureMv) > Math.abs(a.quadratureMv) ? b : a));
        const basis = o.quadratureLimitMv !== undefined || o.nullLimitMv !== undefined ? 'the set limit' : `${(fraction * 100).toFixed(2)} % of the line maximum`;
        findings.push(
          finding('high-quadrature', 'warning', `Line ${line.role} has ${Math.abs(worst.quadratureMv).toFixed(1)} mV of quadrature at its ${worst.angleDeg}° null, above ${basis} (${quadLimit.toFixed(1)} mV).`, {
            advice:
              'Quadrature at the null comes from the unit itself (winding capacitance, shorted turns, unequal phase shifts) or from stator loading; it cannot be nulled by turning the rotor. Check the unit unloaded, and compare its nulls with a known good unit.',
            roles: [line.role],
            figures: { quadratureMv: worst.quadratureMv, limitMv: quadLimit, angleDeg: worst.angleDeg, nullsOver: over.length, nulls: lineNulls.length },
          }),
        );
      }
    }
    if (o.nullLimitMv !== undefined) {
      const limit = o.nullLimitMv;
      const over = lineNulls.filter((r) => r.totalMv > limit);
      if (over.length) {
        const worst = over.reduce((a, b) => (b.totalMv > a.totalMv ? b : a));
        findings.push(
          finding('null-over-limit', 'warning', `Line ${line.role} has a total null of ${worst.totalMv.toFixed(1)} mV at ${worst.angleDeg}°, above the set limit of ${limit} mV.`, {
            advice: 'Check the in-phase part first (the rotor may not sit at the null); quadrature and harmonics that exceed the limit point at the unit.',
            roles: [line.role],
            figures: { totalMv: worst.totalMv, limitMv: limit, angleDeg: worst.angleDeg, nullsOver: over.length },
          }),
        );
      }
    }
  }

  if (nulls.length === 0 && skipped.length > 0) {
    const fastest = skipped.reduce((a, b) => (b.sweepDeg > a.sweepDeg ? b : a));
    findings.push(
      finding('nulls-too-fast', 'info', `${skipped.length === 1 ? '1 null crossing was' : `${skipped.length} null crossings were`} passed too fast to measure their null voltage (up to ${fastest.sweepDeg.toFixed(3)}° per cycle, limit ${maxSweep}°).`, {
        advice: 'Null voltages need a still shaft: park the rotor at electrical zero, or turn it slowly (well under a few degrees per second).',
        roles: [...new Set(skipped.map((s) => s.role))],
        figures: { skipped: skipped.length, maxSweepDeg: maxSweep },
      }),
    );
  }

  return { nulls, skipped, findings, limits: { nullLimitMv: o.nullLimitMv ?? null, quadratureLimitMv: quadLimits } };
}
