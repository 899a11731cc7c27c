/**
 * Standard excitation / output families of synchros and resolvers, and the match of a measured
 * transformation ratio against them.
 *
 * The transformation ratio (TR) is the stator maximum line-to-line voltage over the rotor
 * excitation, both fundamental RMS (or both peak: the ratio is the same). Stator maxima scale
 * with the excitation (NEETS Module 15 p.1-60), so a unit is matched by its ratio, not by its
 * absolute volts; the excitation and carrier frequency only break ties between families with
 * the same ratio.
 */
export type FamilyKind = 'synchro' | 'resolver';

export interface StandardFamily {
  /** Short name shown to the user, e.g. "26 V / 11.8 V, 400 Hz". */
  readonly name: string;
  readonly kind: FamilyKind;
  /** Rated rotor excitation, volts RMS. */
  readonly excitationRmsV: number;
  /** Stator maximum output (line-to-line for a synchro, per winding for a resolver), volts RMS. */
  readonly outputMaxRmsV: number;
  /** outputMaxRmsV / excitationRmsV. */
  readonly nominalRatio: number;
  /** Rated excitation frequency, hertz. */
  readonly frequencyHz: number;
  /** Where the figures come from. */
  readonly source: string;
}

function family(
  name: string,
  kind: FamilyKind,
  excitationRmsV: number,
  outputMaxRmsV: number,
  frequencyHz: number,
  source: string,
): StandardFamily {
  return { name, kind, excitationRmsV, outputMaxRmsV, nominalRatio: outputMaxRmsV / excitationRmsV, frequencyHz, source };
}

/** The standard families (ratios follow from the voltages: 90/115 = 0.783, 11.8/26 = 0.454). */
export const STANDARD_FAMILIES: readonly StandardFamily[] = [
  family('115 V / 90 V, 400 Hz', 'synchro', 115, 90, 400, 'NEETS Module 15 p.1-60 (90 V maximum line-to-line on 115 V excitation) and p.1-65 (115 V or 26 V, 60 Hz or 400 Hz)'),
  family('115 V / 90 V, 60 Hz', 'synchro', 115, 90, 60, 'NEETS Module 15 p.1-60 and p.1-65 (60 Hz and 400 Hz synchros both exist)'),
  family('26 V / 11.8 V, 400 Hz', 'synchro', 26, 11.8, 400, 'NEETS Module 15 p.1-60 (11.8 V maximum on 26 V excitation) and p.1-65'),
  family('26 V / 11.8 V, 400 Hz (TR 0.454)', 'resolver', 26, 11.8, 400, 'from memory (synchro-compatible resolvers)'),
  family('26 V / 26 V, 400 Hz (TR 1.0)', 'resolver', 26, 26, 400, 'from memory (computing resolvers)'),
];

/** Default tolerance on the ratio, percent (from memory / common practice: catalogue TRs are held to a few percent). */
export const DEFAULT_RATIO_TOLERANCE_PCT = 3;

export interface FamilyMatch {
  readonly family: StandardFamily;
  /** (measured / nominal − 1)·100, percent. */
  readonly deviationPct: number;
}

export interface FamilyQuery {
  readonly kind: FamilyKind;
  /** Measured excitation, volts RMS (optional; breaks ties between families of equal ratio). */
  readonly excitationRmsV?: number;
  /** Measured carrier frequency, hertz (optional; breaks ties, e.g. 60 Hz against 400 Hz). */
  readonly frequencyHz?: number;
  /** Largest |deviation| accepted, percent; default {@link DEFAULT_RATIO_TOLERANCE_PCT}. */
  readonly tolerancePct?: number;
  /** A table to use instead of {@link STANDARD_FAMILIES} (e.g. with a user's own families). */
  readonly families?: readonly StandardFamily[];
}

/**
 * A family is matched only at a carrier within this factor of its own frequency, when the
 * carrier is known: a 10 kHz resolver of ratio 0.454 is not a "400 Hz" family's unit (common
 * practice, no source).
 */
export const FAMILY_FREQUENCY_FACTOR = 2;

/**
 * The standard family nearest in ratio to `ratio` (same kind) within the tolerance, and within
 * FAMILY_FREQUENCY_FACTOR of the measured frequency when one is given, or null. Among families
 * whose ratios are equally near (e.g. 115 V / 90 V at 60 Hz and at 400 Hz), the one closest in
 * log-frequency, then in log-excitation, wins.
 */
export function matchStandardFamily(ratio: number, query: FamilyQuery): FamilyMatch | null {
  if (!(ratio > 0) || !Number.isFinite(ratio)) return null;
  const tolerance = query.tolerancePct ?? DEFAULT_RATIO_TOLERANCE_PCT;
  if (!(tolerance >= 0)) throw new RangeError(`matchStandardFamily: tolerancePct must be >= 0, got ${tolerance}`);
  const logGap = (a: number | undefined, b: number): number => (a !== undefined && a > 0 ? Math.abs(Math.log(a / b)) : 0);
  let best: FamilyMatch | null = null;
  let bestKey: [number, number, number] | null = null;
  for (const f of query.families ?? STANDARD_FAMILIES) {
    if (f.kind !== query.kind) continue;
    const deviationPct = (ratio / f.nominalRatio - 1) * 100;
    if (Math.abs(deviationPct) > tolerance) continue;
    if (logGap(query.frequencyHz, f.frequencyHz) > Math.log(FAMILY_FREQUENCY_FACTOR)) continue;
    // Ratios within 1e-9 count as equal, so the tie-breakers decide.
    const key: [number, number, number] = [Math.round(Math.abs(deviationPct) * 1e9), logGap(query.frequencyHz, f.frequencyHz), logGap(query.excitationRmsV, f.excitationRmsV)];
    if (!bestKey || key[0] < bestKey[0] || (key[0] === bestKey[0] && (key[1] < bestKey[1] || (key[1] === bestKey[1] && key[2] < bestKey[2])))) {
      best = { family: f, deviationPct };
      bestKey = key;
    }
  }
  return best;
}
