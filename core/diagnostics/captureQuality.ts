import type { CarrierTrack } from '../carrier/carrierTrack.js';
import type { UnitLines } from '../angle/sinCosFromLines.js';
import type { CyclePhasors } from '../demod/demodulateCycles.js';
import { finding, type Finding } from '../model/findings.js';
import { clippedFraction } from './clippedFraction.js';
import { fitCarrierResidual, humFindings, measureMainsHum, type CarrierResidualFit, type HumChannel, type HumLevel } from './measureMainsHum.js';
import { measureLineSkew, type LineSkew } from './measureLineSkew.js';

export * from './measureMainsHum.js';
export * from './measureLineSkew.js';

/**
 * Capture-quality checks that do not depend on the unit: record length and sample rate, clipping,
 * mains hum, DC offset, and time skew between the stator channels of one unit. Uneven sampling
 * (import) and carrier drift (carrier tracking) are reported where they are measured.
 */

// ---------------------------------------------------------------------------------------------
// Record length and sample rate

/** Highest carrier harmonic the harmonic figures report (3rd: THD and the 3rd space harmonic). */
export const HIGHEST_REPORTED_HARMONIC = 3;
/**
 * Samples per carrier cycle below which harmonics up to HIGHEST_REPORTED_HARMONIC alias: the
 * per-cycle fit needs the Hth harmonic below Nyquist, P > 2H, hence P ≥ 2(H + 1) = 8 (sampling
 * theorem, e.g. Oppenheim & Schafer ch.4).
 */
export const MIN_SAMPLES_PER_CYCLE = 2 * (HIGHEST_REPORTED_HARMONIC + 1);
/**
 * Below 4 samples per cycle even the 2nd harmonic aliases onto the fundamental or DC and the
 * three-parameter fit per cycle (IEEE Std 1057 §4.1.3.1) has at most one spare sample: error.
 */
export const UNUSABLE_SAMPLES_PER_CYCLE = 4;
/**
 * Cycles below which the record is short: the carrier frequency and the per-unit figures
 * (transformation ratio, phase lead, nulls) are medians/fits over cycles, and fewer than 10 give
 * no robust median (common practice, no source).
 */
export const MIN_CYCLES = 10;

export function checkRecordLength(samplesPerCycle: number, cycleCount: number): Finding[] {
  const out: Finding[] = [];
  if (samplesPerCycle < MIN_SAMPLES_PER_CYCLE) {
    out.push(
      finding('low-sample-rate', samplesPerCycle < UNUSABLE_SAMPLES_PER_CYCLE ? 'error' : 'warning', `Only ${samplesPerCycle.toFixed(1)} samples per carrier cycle.`, {
        advice: `Per-cycle amplitudes and harmonics up to the ${HIGHEST_REPORTED_HARMONIC}rd need at least ${MIN_SAMPLES_PER_CYCLE} (better 20 or more) samples per cycle; raise the scope sample rate.`,
        figures: { samplesPerCycle, minSamplesPerCycle: MIN_SAMPLES_PER_CYCLE },
      }),
    );
  }
  if (cycleCount < MIN_CYCLES) {
    out.push(
      finding('short-record', 'warning', `The record holds only ${cycleCount} whole carrier cycles.`, {
        advice: `Capture at least ${MIN_CYCLES} cycles (better 100 or more) so the carrier and the unit figures are well determined.`,
        figures: { cycles: cycleCount, minCycles: MIN_CYCLES },
      }),
    );
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Clipping

export interface NamedSamples {
  readonly role: string;
  readonly samples: Float32Array;
}

/**
 * Flat tops at a channel's range ends (clippedFraction: runs of at least max(4, P/20) equal
 * samples at the channel's extreme values). Any clipped run corrupts the fundamental of the cycles
 * it touches (the fit sees a compressed peak), so any non-zero fraction is a warning.
 */
export function checkClipping(
  channels: readonly NamedSamples[],
  sampleCount: number,
  samplesPerCycle: number,
  precomputed?: readonly number[],
): { fractions: number[]; findings: Finding[] } {
  const fractions = channels.map((c, i) => precomputed?.[i] ?? clippedFraction(c.samples, sampleCount, samplesPerCycle));
  const findings: Finding[] = [];
  channels.forEach((c, i) => {
    const f = fractions[i]!;
    if (f > 0) {
      findings.push(
        finding('clipping', 'warning', `${c.role} sits flat at its range ends on ${(100 * f).toFixed(2)} % of the samples.`, {
          advice: 'The scope channel is clipping: its amplitudes (and any angle that uses them) are wrong on those cycles. Set a larger volts/division or a probe with more attenuation, and recapture.',
          roles: [c.role],
          figures: { clippedFraction: f },
        }),
      );
    }
  });
  return { fractions, findings };
}

// ---------------------------------------------------------------------------------------------
// DC offset

/** DC above this fraction of the channel's scale is an info finding… */
export const DC_INFO_FRACTION = 0.01;
/** …and above this, a warning: it eats a twentieth of the range on one side and hints at a probe or coupling fault. */
export const DC_WARNING_FRACTION = 0.05;

export interface DcLevel {
  readonly role: string;
  /** Mean of the per-cycle DC terms, millivolts. */
  readonly dcMv: number;
  /** Standard error of that mean from the cycle-to-cycle spread, millivolts. */
  readonly standardErrorMv: number;
  readonly fractionOfScale: number;
}

/**
 * DC offset per channel. The phasors reject DC exactly (IEEE Std 1057 three-parameter fit), so an
 * offset does not bias the angle; it matters as lost headroom and as a sign of a probe zero error,
 * a DC-coupled bias or a leaky coupling path (common practice, no source for the thresholds).
 * With a carrier residual fit the level is its constant term; otherwise the mean of the
 * demodulator's per-cycle DC terms. (On a turning shaft the per-cycle DC term also takes up part
 * of the envelope's change within the cycle, a bias of order K·Δθ per cycle / 10 that the
 * interpolated residual does not have; derived, seen in synthetic captures.)
 */
export function measureDcOffsets(channels: readonly HumChannel[], phasors: CyclePhasors, residual?: CarrierResidualFit): DcLevel[] {
  return channels.map((c, ch) => {
    const scale = (v: number): number => (c.scalePeakV > 0 ? Math.abs(v) / c.scalePeakV : NaN);
    if (residual) {
      const r = residual.channels[ch]!;
      return { role: c.role, dcMv: r.dcV * 1000, standardErrorMv: r.dcStandardErrorV * 1000, fractionOfScale: scale(r.dcV) };
    }
    const dc = phasors.dc[c.phasorChannel]!;
    let s = 0, s2 = 0, n = 0;
    for (let m = 0; m < phasors.cycleCount; m++) {
      const v = dc[m]!;
      if (!Number.isFinite(v)) continue;
      s += v;
      s2 += v * v;
      n++;
    }
    const mean = n ? s / n : NaN;
    const sd = n > 1 ? Math.sqrt(Math.max(0, s2 / n - mean * mean) * (n / (n - 1))) : NaN;
    return { role: c.role, dcMv: mean * 1000, standardErrorMv: (sd / Math.sqrt(n)) * 1000, fractionOfScale: scale(mean) };
  });
}

export function dcFindings(levels: readonly DcLevel[]): Finding[] {
  const out: Finding[] = [];
  for (const d of levels) {
    if (!(d.fractionOfScale >= DC_INFO_FRACTION) || !(Math.abs(d.dcMv) > 3 * d.standardErrorMv)) continue;
    const severity = d.fractionOfScale >= DC_WARNING_FRACTION ? 'warning' : 'info';
    out.push(
      finding('dc-offset', severity, `${d.role} sits ${d.dcMv.toFixed(1)} mV off zero (${(100 * d.fractionOfScale).toFixed(1)} % of its scale).`, {
        advice: 'The angle is not affected (the per-cycle fit removes DC), but a transformer output has no DC: check the scope channel offset and probe zero, AC/DC coupling, and that the probe ground is on the unit, not on a biased point.',
        roles: [d.role],
        figures: { dcMv: d.dcMv, fractionOfScale: d.fractionOfScale },
      }),
    );
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// All of the above

export interface CaptureQualityInput {
  readonly sampleCount: number;
  readonly samplesPerCycle: number;
  readonly carrierHz: number;
  readonly track: CarrierTrack;
  readonly phasors: CyclePhasors;
  /** Every analysed channel (reference and stator lines), with its phasor index and scale. */
  readonly channels: readonly (HumChannel & { readonly samples: Float32Array })[];
  /** The stator units, for the skew check (lines index the phasor arrays). */
  readonly units?: readonly { readonly lines: UnitLines; readonly roleNames: readonly string[] }[];
  /** clippedFraction per channel if already computed (the pipeline does, for input.channels). */
  readonly clippedFractions?: readonly number[];
  /**
   * Gives fitCarrierResidual of input.channels if it was started elsewhere (another thread, see
   * AnalysisEngine.startCarrierResidual); otherwise it is fitted here.
   */
  readonly carrierResidual?: () => CarrierResidualFit | undefined;
}

export interface CaptureQuality {
  readonly clippedFractions: readonly number[];
  readonly hum: readonly HumLevel[];
  readonly dc: readonly DcLevel[];
  readonly skew: readonly (readonly LineSkew[])[];
  readonly findings: readonly Finding[];
}

export function checkCaptureQuality(input: CaptureQualityInput): CaptureQuality {
  const findings: Finding[] = [...checkRecordLength(input.samplesPerCycle, input.phasors.cycleCount)];
  const clip = checkClipping(input.channels, input.sampleCount, input.samplesPerCycle, input.clippedFractions);
  findings.push(...clip.findings);
  const residual = input.carrierResidual ? input.carrierResidual() : fitCarrierResidual(input.channels, input.phasors, input.track, input.carrierHz);
  const hum = measureMainsHum(input.channels, input.phasors, input.track, input.carrierHz, residual);
  findings.push(...humFindings(hum, input.channels));
  const dc = measureDcOffsets(input.channels, input.phasors, residual);
  findings.push(...dcFindings(dc));
  const skew = (input.units ?? []).map((u) => {
    const r = measureLineSkew(u.lines, input.phasors, input.carrierHz, u.roleNames);
    findings.push(...r.findings);
    return r.lines;
  });
  return { clippedFractions: clip.fractions, hum, dc, skew, findings };
}
