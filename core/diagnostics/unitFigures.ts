import { solveSymmetric } from '../dsp/linearSolve.js';
import { finding, type Finding } from '../model/findings.js';
import { lineBasis, redecodeAngle, type LineSlope } from './linePatterns.js';
import { removeMotionQuadrature, type UnitLinePhasors } from './removeMotionQuadrature.js';
import { DEFAULT_RATIO_TOLERANCE_PCT, matchStandardFamily, STANDARD_FAMILIES, type StandardFamily } from './standardFamilies.js';

/**
 * Transformation ratio and phase lead of one unit, estimated so that quadrature is not taken
 * for phase.
 *
 * Signal model per line k and carrier cycle m (complex phasor against the excitation, I + jQ,
 * peak volts, as produced by the per-cycle lock-in): z_km = s_k·p_k(θ_m) + c_k + noise, where
 * p_k is the line's angle pattern (sin θ, sin(θ + 120°), sin(θ + 240°) for E(S1−S3), E(S3−S2),
 * E(S2−S1), negated for the reversed pairs; sin θ and cos θ for a resolver; standard synchro
 * equations, NEETS Module 15), s_k = kE_k·e^{jψ} and c_k a constant residual. A quadrature
 * q_k (90° time phase against the unit's own phase) sits in c_k as j·q_k·e^{jψ}.
 *
 * - Rotation (the line's pattern p_k(θ_m) varies over the record, standard deviation ≥
 *   `minPatternSpread`): each line is regressed on its own pattern (ordinary least squares,
 *   complex slope and intercept). The slope gives kE·e^{jψ} free of the constant quadrature,
 *   the intercept gives the quadrature, c_k·e^{−jψ} = i_k + j·q_k. The unit's phase is the
 *   precision-weighted mean slope (weights n_k·var(p_k), the inverse variances of the slopes).
 *   The naive estimate ψ = ½·arg Σ(S² + C²) is biased by about q·mean(sin θ)/K whenever the
 *   rotation does not average the pattern to zero (a partial turn, a dwell); the regression is
 *   not.
 * - Static angle (no line varies enough): quadrature and phase cannot be told apart in a line
 *   that carries signal, so ψ is taken from the large lines, a = Σ p_k z_k / Σ p_k² (each line
 *   weighted by its pattern, so a line at its null does not steer ψ), and the small lines'
 *   quadrature is read against it. The large lines' own quadrature is then inside ψ; their
 *   `interceptQuadratureV` is ≈ 0 by construction, and in-phase intercepts are not
 *   identifiable (null).
 *
 * Method: in-phase/quadrature separation by regression over a rotation and by the large
 * channel at a static angle (phase-sensitive null measurement practice of SAE AS20708B; the
 * regression is ordinary least squares, e.g. Kay 1993 ch.4 linear model).
 */
export type { UnitLinePhasors };

export interface UnitFiguresInput {
  readonly kind: 'synchro' | 'resolver';
  readonly lines: readonly UnitLinePhasors[];
  /** Decoded electrical angle per cycle, degrees (AngleSolution.deg or .unwrappedDeg). */
  readonly angleDeg: ArrayLike<number>;
  /** Excitation (R1-R2) fundamental, peak volts; omit or NaN without a reference (no ratio then). */
  readonly referencePeakV?: number;
  /**
   * Carrier phase at each window centre, radians (CyclePhasors.centrePhaseRad). When given, the
   * quadrature that a moving envelope leaves in a one-period window is removed before the
   * regression (see removeMotionQuadrature.ts); strongly recommended for turning shafts.
   */
  readonly centrePhaseRad?: ArrayLike<number>;
  /** Carrier frequency, hertz (breaks ties between standard families; optional). */
  readonly frequencyHz?: number;
  /** Tolerance for the standard-family match, percent; default 3 (from memory / common practice). */
  readonly ratioTolerancePct?: number;
  readonly families?: readonly StandardFamily[];
  /**
   * Smallest standard deviation of a line's pattern p_k(θ) (dimensionless, full scale 1) for the
   * line to be regressed; default 0.1 (about a ±10° swing through the line's null). Below it the
   * slope and the intercept are too collinear to separate (common practice, no source).
   */
  readonly minPatternSpread?: number;
  /** Roles to name in findings (defaults to the line roles). */
  readonly findingRoles?: readonly string[];
}

export interface LineFigure {
  readonly role: string;
  /** Complex slope kE_k·e^{jψ_k}, peak volts; null when the line carries too little signal to tell. */
  readonly slopeRe: number | null;
  readonly slopeIm: number | null;
  /** Constant in-phase residual against the unit's phase, peak volts; null when not identifiable (static angle). */
  readonly interceptInPhaseV: number | null;
  /** Constant quadrature against the unit's phase, peak volts (signed). */
  readonly interceptQuadratureV: number;
  /** Standard deviation of the line's pattern over the cycles used (0 for a static shaft). */
  readonly patternSpread: number;
  /** True when the line was regressed (rotation), false when read against ψ (static). */
  readonly regressed: boolean;
  /** Cycles used (finite phasor and angle). */
  readonly cycles: number;
}

export interface UnitFigures {
  /** Stator maximum over excitation (fundamental); null without a reference or without signal. */
  readonly transformationRatio: number | null;
  /** Time-phase lead of the stator output over the excitation, degrees; NaN when no line carries signal. */
  readonly phaseLeadDeg: number;
  /** 'regression' when at least one line was regressed over a rotation, else 'static'. */
  readonly method: 'regression' | 'static';
  /** |kE| of the unit, volts RMS (the stator maximum output). */
  readonly outputMaxRmsV: number;
  readonly perLine: readonly LineFigure[];
  readonly family: { readonly name: string; readonly nominalRatio: number; readonly deviationPct: number } | null;
  readonly findings: readonly Finding[];
}

const DEG = Math.PI / 180;

/** Running sums of one line over the cycles: count, Σp, Σp², Σz, Σp·z (z = re + j·im). */
interface LineSums { n: number; sp: number; spp: number; szr: number; szi: number; spzr: number; spzi: number }

export function unitFigures(input: UnitFiguresInput): UnitFigures {
  const minSpread = input.minPatternSpread ?? 0.1;
  if (!(minSpread > 0)) throw new RangeError(`unitFigures: minPatternSpread must be > 0, got ${minSpread}`);
  const nCycles = input.angleDeg.length;
  const bases = input.lines.map((line) => {
    const basis = lineBasis(line.role);
    if (!basis) throw new RangeError(`unitFigures: "${line.role}" is not a stator line role`);
    if (line.inPhaseV.length !== nCycles || line.quadratureV.length !== nCycles) {
      throw new RangeError(`unitFigures: line "${line.role}" has ${line.inPhaseV.length} cycles, the angle trace ${nCycles}`);
    }
    return basis;
  });
  const solve = (lines: readonly UnitLinePhasors[]) => {
    const theta = new Float64Array(nCycles);
    for (let m = 0; m < nCycles; m++) theta[m] = +input.angleDeg[m]! * DEG;
    // sin θ and cos θ once per pass for all the lines, not once per line (the same values).
    const sinTheta = new Float64Array(nCycles);
    const cosTheta = new Float64Array(nCycles);

    const accumulate = (): LineSums[] => {
      for (let m = 0; m < nCycles; m++) {
        sinTheta[m] = Math.sin(theta[m]!);
        cosTheta[m] = Math.cos(theta[m]!);
      }
      return lines.map((line, k) => {
        const [alpha, beta] = bases[k]!;
        const s: LineSums = { n: 0, sp: 0, spp: 0, szr: 0, szi: 0, spzr: 0, spzi: 0 };
        for (let m = 0; m < nCycles; m++) {
          const zr = +line.inPhaseV[m]!;
          const zi = +line.quadratureV[m]!;
          const t = theta[m]!;
          if (!Number.isFinite(zr) || !Number.isFinite(zi) || !Number.isFinite(t)) continue;
          const p = alpha * sinTheta[m]! + beta * cosTheta[m]!;
          s.n++;
          s.sp += p;
          s.spp += p * p;
          s.szr += zr;
          s.szi += zi;
          s.spzr += p * zr;
          s.spzi += p * zi;
        }
        return s;
      });
    };

    // Rotation: per-line regression z = slope·p + intercept (normal equations, equilibrated
    // Cholesky). The angle the patterns are evaluated at was decoded with the naive phase, which
    // the quadrature tilts; so the angle is decoded again from the fitted line models
    // (Re((z − c)·conj(s))/|s|² = α sin θ + β cos θ, least squares over the lines) and the
    // regression repeated (alternating least squares, two refinements).
    let sums = accumulate();
    let spread: number[] = [];
    let slopes: (LineSlope | undefined)[] = [];
    for (let pass = 0; ; pass++) {
      spread = sums.map((s) => (s.n > 1 ? Math.sqrt(Math.max(0, s.spp / s.n - (s.sp / s.n) ** 2)) : 0));
      slopes = sums.map((s, k) => {
        if (!(s.n >= 3 && spread[k]! >= minSpread)) return undefined;
        const normal = [s.spp, s.sp, s.sp, s.n];
        const re = solveSymmetric(normal, [s.spzr, s.szr], 2);
        const im = solveSymmetric(normal, [s.spzi, s.szi], 2);
        if (!re.ok || !im.ok) return undefined;
        return { re: re.x[0]!, im: im.x[0]!, cRe: re.x[1]!, cIm: im.x[1]! };
      });
      if (pass === 2 || !redecodeAngle(theta, lines, bases, slopes)) break;
      sums = accumulate();
    }
    const useRegression = slopes.some((s) => s !== undefined);

    let aRe = 0, aIm = 0;
    if (useRegression) {
      let w = 0;
      sums.forEach((s, k) => {
        const slope = slopes[k];
        if (!slope) return;
        const weight = s.n * spread[k]! ** 2;
        aRe += weight * slope.re;
        aIm += weight * slope.im;
        w += weight;
      });
      aRe /= w;
      aIm /= w;
    } else {
      let spp = 0;
      for (const s of sums) {
        aRe += s.spzr;
        aIm += s.spzi;
        spp += s.spp;
      }
      aRe = spp > 0 ? aRe / spp : NaN;
      aIm = spp > 0 ? aIm / spp : NaN;
    }
    return { sums, spread, slopes, useRegression, aRe, aIm };
  };

  // Pass 1 on the phasors as measured; pass 2 after removing the motion quadrature (below).
  let lines = input.lines;
  let sol = solve(lines);
  if (input.centrePhaseRad && Number.isFinite(Math.atan2(sol.aIm, sol.aRe))) {
    lines = removeMotionQuadrature(lines, Math.atan2(sol.aIm, sol.aRe), input.centrePhaseRad);
    sol = solve(lines);
  }
  const { sums, spread, slopes, useRegression, aRe, aIm } = sol;
  const psi = Math.atan2(aIm, aRe);
  const gainPeakV = Math.hypot(aRe, aIm);
  const hasSignal = Number.isFinite(psi) && gainPeakV > 0;
  const cosPsi = Math.cos(psi), sinPsi = Math.sin(psi);

  const perLine: LineFigure[] = lines.map((line, k) => {
    const s = sums[k]!;
    const slope = slopes[k];
    if (slope && useRegression) {
      // Intercept rotated by −ψ: (cRe + j·cIm)·e^{−jψ}.
      return {
        role: line.role,
        slopeRe: slope.re,
        slopeIm: slope.im,
        interceptInPhaseV: slope.cRe * cosPsi + slope.cIm * sinPsi,
        interceptQuadratureV: slope.cIm * cosPsi - slope.cRe * sinPsi,
        patternSpread: spread[k]!,
        regressed: true,
        cycles: s.n,
      };
    }
    // Read against ψ: in-phase along ψ is the signal, the mean of the part at 90° is the quadrature.
    const meanRe = s.n ? s.szr / s.n : NaN, meanIm = s.n ? s.szi / s.n : NaN;
    const quadrature = hasSignal ? meanIm * cosPsi - meanRe * sinPsi : NaN;
    const rms = s.n ? Math.sqrt(s.spp / s.n) : 0;
    const along = hasSignal && rms >= minSpread ? (s.spzr * cosPsi + s.spzi * sinPsi) / s.spp : NaN;
    return {
      role: line.role,
      slopeRe: Number.isFinite(along) ? along * cosPsi : null,
      slopeIm: Number.isFinite(along) ? along * sinPsi : null,
      interceptInPhaseV: null,
      interceptQuadratureV: quadrature,
      patternSpread: spread[k]!,
      regressed: false,
      cycles: s.n,
    };
  });

  const refPeak = input.referencePeakV;
  const ratio = hasSignal && refPeak !== undefined && refPeak > 0 && Number.isFinite(refPeak) ? gainPeakV / refPeak : null;
  const tolerancePct = input.ratioTolerancePct ?? DEFAULT_RATIO_TOLERANCE_PCT;
  const findings: Finding[] = [];
  let family: UnitFigures['family'] = null;
  if (ratio !== null) {
    const match = matchStandardFamily(ratio, {
      kind: input.kind,
      tolerancePct,
      ...(input.frequencyHz !== undefined ? { frequencyHz: input.frequencyHz } : {}),
      excitationRmsV: refPeak! / Math.SQRT2,
      ...(input.families ? { families: input.families } : {}),
    });
    if (match) {
      family = { name: match.family.name, nominalRatio: match.family.nominalRatio, deviationPct: match.deviationPct };
    } else {
      const nearest = nearestFamily(ratio, input.kind, input.families ?? STANDARD_FAMILIES);
      findings.push(
        finding(
          'ratio-off-standard',
          'warning',
          `The transformation ratio ${ratio.toFixed(4)} matches no standard ${input.kind} family within ±${tolerancePct} %` +
            (nearest ? ` (nearest: ${nearest.name}, ${nearest.nominalRatio.toFixed(4)}).` : '.'),
          {
            advice:
              'Check the probe attenuation settings of the stator and excitation channels, that the stator is unloaded, and the unit’s rated voltages; a shorted or open winding also changes the ratio.',
            roles: input.findingRoles ?? input.lines.map((l) => l.role),
            figures: {
              transformationRatio: ratio,
              tolerancePct,
              ...(nearest ? { nearestNominalRatio: nearest.nominalRatio, deviationPct: (ratio / nearest.nominalRatio - 1) * 100 } : {}),
            },
          },
        ),
      );
    }
  }

  return {
    transformationRatio: ratio,
    phaseLeadDeg: hasSignal ? psi / DEG : NaN,
    method: useRegression ? 'regression' : 'static',
    outputMaxRmsV: hasSignal ? gainPeakV / Math.SQRT2 : NaN,
    perLine,
    family,
    findings,
  };
}

function nearestFamily(ratio: number, kind: 'synchro' | 'resolver', families: readonly StandardFamily[]): StandardFamily | undefined {
  let best: StandardFamily | undefined;
  for (const f of families) {
    if (f.kind !== kind) continue;
    if (!best || Math.abs(Math.log(ratio / f.nominalRatio)) < Math.abs(Math.log(ratio / best.nominalRatio))) best = f;
  }
  return best;
}
