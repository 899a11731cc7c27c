import { SYNCHRO_LINE_OF } from '../model/roles.js';

/**
 * Angle patterns of stator lines (standard synchro equations, NEETS Module 15: E(S1−S3) ∝ sin θ,
 * E(S3−S2) ∝ sin(θ + 120°), E(S2−S1) ∝ sin(θ + 240°), reversed pairs negated; resolver windings
 * sin θ and cos θ), and the angle decoded back from fitted line models.
 */
/**
 * The angle pattern of a line role as p(θ) = α·sin θ + β·cos θ: [α, β], or undefined for a
 * role that is not a stator line.
 */
export function lineBasis(role: string): readonly [number, number] | undefined {
  const base = role.slice(role.lastIndexOf('.') + 1).toLowerCase();
  if (base === 'sin') return [1, 0];
  if (base === 'cos') return [0, 1];
  const map = SYNCHRO_LINE_OF[base];
  if (!map) return undefined;
  const shift = (map.line * 120 * Math.PI) / 180;
  return [map.sign * Math.cos(shift), map.sign * Math.sin(shift)];
}

/** The angle pattern p(θ) of a line role (θ in radians), or undefined for a role that is not a stator line. */
export function linePattern(role: string): ((thetaRad: number) => number) | undefined {
  const basis = lineBasis(role);
  if (!basis) return undefined;
  const [alpha, beta] = basis;
  return (theta) => alpha * Math.sin(theta) + beta * Math.cos(theta);
}

/** A line's fitted model z = (re + j·im)·p(θ) + (cRe + j·cIm), peak volts. */
export interface LineSlope {
  re: number;
  im: number;
  cRe: number;
  cIm: number;
}

/**
 * Decodes the angle of every cycle again from the regressed lines' models, in place. Returns
 * false (and leaves θ alone) when fewer than two independent lines were regressed.
 */
export function redecodeAngle(
  theta: Float64Array,
  lines: readonly { readonly inPhaseV: ArrayLike<number>; readonly quadratureV: ArrayLike<number> }[],
  bases: readonly (readonly [number, number])[],
  slopes: readonly (LineSlope | undefined)[],
): boolean {
  const used = slopes.map((s, k) => (s && Math.hypot(s.re, s.im) > 0 ? k : -1)).filter((k) => k >= 0);
  let aa = 0, ab = 0, bb = 0;
  for (const k of used) {
    const [alpha, beta] = bases[k]!;
    aa += alpha * alpha;
    ab += alpha * beta;
    bb += beta * beta;
  }
  const det = aa * bb - ab * ab;
  if (used.length < 2 || !(det > 1e-9 * (aa + bb) ** 2)) return false;
  for (let m = 0; m < theta.length; m++) {
    let ra = 0, rb = 0;
    let ok = true;
    for (const k of used) {
      const s = slopes[k]!;
      const zr = +lines[k]!.inPhaseV[m]! - s.cRe;
      const zi = +lines[k]!.quadratureV[m]! - s.cIm;
      if (!Number.isFinite(zr) || !Number.isFinite(zi)) {
        ok = false;
        break;
      }
      const r = (zr * s.re + zi * s.im) / (s.re * s.re + s.im * s.im);
      ra += bases[k]![0] * r;
      rb += bases[k]![1] * r;
    }
    if (!ok) continue;
    const x = (bb * ra - ab * rb) / det; // sin θ
    const y = (aa * rb - ab * ra) / det; // cos θ
    theta[m] = Math.atan2(x, y);
  }
  return true;
}
