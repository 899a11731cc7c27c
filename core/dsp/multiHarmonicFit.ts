import { COS_SIN_BLOCK, CosSinBlocks } from './cosSinTable.js';
import { solveSymmetric } from './linearSolve.js';
import { checkSampleRate, resolveSampleRange } from './sampleRange.js';

/**
 * Result of {@link fitHarmonics}. Arrays are indexed by harmonic number h = 1 … H and have
 * length H + 1; element 0 is 0 (there is no harmonic 0: the DC term is `offset`).
 */
export interface HarmonicFit {
  /** √(a_h² + b_h²), peak, signal units. */
  amplitudes: Float64Array;
  /** Coefficient of cos(h ω t), t = (n − start)/fs (in-phase part against the fundamental's time origin). */
  a: Float64Array;
  /** Coefficient of sin(h ω t) (quadrature part). */
  b: Float64Array;
  /** DC term, signal units. */
  offset: number;
  /** √(Σ_{h=2}^{H} A_h²) / A_1 (a ratio, not percent; 0 when H = 1), IEEE Std 1241 definition with H stated. */
  thd: number;
  /** √(mean squared residual) over the samples used. */
  residualRms: number;
  /** False when the normal equations were singular or ill-conditioned (then values are NaN or untrustworthy). */
  ok: boolean;
  /** Non-finite samples in the range, skipped. */
  skippedSamples: number;
}

const TWO_PI = 2 * Math.PI;

/**
 * Multi-harmonic least-squares fit at a known fundamental: x[n] ≈ c + Σ_{h=1}^{H} a_h cos(hωt)
 * + b_h sin(hωt): the IEEE Std 1057 three-parameter sine fit with cos/sin columns added for
 * harmonics 2 … H, solved as ordinary linear least squares (multiharmonic sine fitting as in
 * P. M. Ramos et al., "Multiharmonic sine-fitting algorithm", IEEE IMTC 2006, citation from
 * memory). Exact under non-coherent sampling when the frequency is right, unlike windowed
 * spectra. One O(N·H²) pass of (2H+1)(2H+2)/2 running sums, a scaled Cholesky solve, and an
 * O(N·H) residual pass.
 *
 * cos/sin of the fundamental come from ω·n directly (CosSinBlocks); harmonic h is formed by
 * h − 1 complex multiplications by e^{iωτ} for that same sample, so its error is O(h·eps) and
 * does not grow along the record. Time is centred on the range for conditioning and the
 * coefficients are rotated back to t = 0 (the first sample). Non-finite samples are skipped.
 * Harmonics at or above fs/2 alias; the caller should keep H·f < fs/2.
 */
export function fitHarmonics(
  x: ArrayLike<number>,
  sampleRateHz: number,
  frequencyHz: number,
  harmonics: number,
  start?: number,
  length?: number,
): HarmonicFit {
  checkSampleRate(sampleRateHz, 'fitHarmonics');
  if (!(frequencyHz > 0) || !Number.isFinite(frequencyHz)) throw new RangeError(`fitHarmonics: frequencyHz must be finite and > 0, got ${frequencyHz}`);
  if (!Number.isInteger(harmonics) || harmonics < 1 || harmonics > 200) throw new RangeError(`fitHarmonics: harmonics must be an integer in 1 … 200, got ${harmonics}`);
  const { start: s0, length: len } = resolveSampleRange(x.length, start, length, 'fitHarmonics');
  const H = harmonics;
  const P = 2 * H + 1;
  const omega = (TWO_PI * frequencyHz) / sampleRateHz;
  const centre = s0 + (len - 1) / 2;

  // Lower triangle of the normal matrix, packed row by row; column order [1, c1, s1, …, cH, sH].
  const tri = new Float64Array((P * (P + 1)) / 2);
  const rhs = new Float64Array(P);
  const v = new Float64Array(P);
  const blocks = new CosSinBlocks(omega, centre);
  const end = s0 + len;
  let used = 0;
  for (let n0 = s0; n0 < end; n0 += COS_SIN_BLOCK) {
    const count = Math.min(COS_SIN_BLOCK, end - n0);
    blocks.fill(n0, count);
    for (let j = 0; j < count; j++) {
      const xv = +x[n0 + j];
      if (!Number.isFinite(xv)) continue;
      used++;
      fillRow(v, blocks.cos[j], blocks.sin[j], H);
      let q = 0;
      for (let r = 0; r < P; r++) {
        const vr = v[r];
        rhs[r] += xv * vr;
        for (let c = 0; c <= r; c++) tri[q++] += vr * v[c];
      }
    }
  }

  const a = new Float64Array(H + 1);
  const b = new Float64Array(H + 1);
  const amplitudes = new Float64Array(H + 1);
  const skippedSamples = len - used;
  if (used < P) {
    a.fill(NaN, 1);
    b.fill(NaN, 1);
    amplitudes.fill(NaN, 1);
    return { amplitudes, a, b, offset: NaN, thd: NaN, residualRms: NaN, ok: false, skippedSamples };
  }
  const m = new Float64Array(P * P);
  let q = 0;
  for (let r = 0; r < P; r++) {
    for (let c = 0; c <= r; c++) {
      m[r * P + c] = tri[q];
      m[c * P + r] = tri[q];
      q++;
    }
  }
  const sol = solveSymmetric(m, rhs, P);
  const coef = sol.x; // centred-frame coefficients

  // Residual pass in the centred frame.
  let sse = 0;
  for (let n0 = s0; n0 < end; n0 += COS_SIN_BLOCK) {
    const count = Math.min(COS_SIN_BLOCK, end - n0);
    blocks.fill(n0, count);
    for (let j = 0; j < count; j++) {
      const xv = +x[n0 + j];
      if (!Number.isFinite(xv)) continue;
      fillRow(v, blocks.cos[j], blocks.sin[j], H);
      let model = 0;
      for (let r = 0; r < P; r++) model += coef[r] * v[r];
      const e = xv - model;
      sse += e * e;
    }
  }

  // Rotate harmonic h back to t = 0: cos(hωτ) = cos(hωt − hθc), θc = ω(centre − start).
  const thetaC = omega * (centre - s0);
  let h2 = 0;
  for (let h = 1; h <= H; h++) {
    const ac = coef[2 * h - 1];
    const bc = coef[2 * h];
    const ch = Math.cos(h * thetaC);
    const sh = Math.sin(h * thetaC);
    a[h] = ac * ch - bc * sh;
    b[h] = ac * sh + bc * ch;
    amplitudes[h] = Math.hypot(a[h], b[h]);
    if (h >= 2) h2 += amplitudes[h] * amplitudes[h];
  }
  return {
    amplitudes,
    a,
    b,
    offset: coef[0],
    thd: Math.sqrt(h2) / amplitudes[1],
    residualRms: Math.sqrt(sse / used),
    ok: sol.ok,
    skippedSamples,
  };
}

/** Design row [1, cos θ, sin θ, cos 2θ, sin 2θ, …] from cos θ, sin θ by repeated rotation. */
function fillRow(v: Float64Array, c1: number, s1: number, H: number): void {
  v[0] = 1;
  let c = c1;
  let s = s1;
  v[1] = c;
  v[2] = s;
  for (let h = 2; h <= H; h++) {
    const cn = c * c1 - s * s1;
    const sn = s * c1 + c * s1;
    c = cn;
    s = sn;
    v[2 * h - 1] = c;
    v[2 * h] = s;
  }
}
