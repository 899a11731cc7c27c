/**
 * The per-cycle sample loops of demodulateCycleRange (IEEE Std 1057 three-parameter fit per
 * carrier cycle): the sine/cosine table with the normal-matrix sums, and the projection of two
 * channels on it (an odd one goes with itself), which also keeps each channel's running extremes (the clipping check's
 * first pass, see CyclePhasors.extremes). Small functions called once per cycle, so that each is
 * optimised whole after a few calls (see demodulateCycleRange).
 */

/** Doubles per channel of the running extremes: lo, hi, countLo, countHi. */
export const EXTREMES_STATE = 4;

/**
 * sin and cos of startPhase + i·w for i < length into the tables, stepped by a rotation, and
 * the normal-matrix sums Σs², Σsc, Σc², Σs, Σc into sums[0..5).
 */
export function fillCycleTable(startPhase: number, w: number, length: number, sinBuf: Float64Array, cosBuf: Float64Array, sums: Float64Array): void {
  const cw = Math.cos(w);
  const sw = Math.sin(w);
  let s = Math.sin(startPhase);
  let c = Math.cos(startPhase);
  let ss = 0, sc = 0, cc = 0, s1 = 0, c1 = 0;
  for (let i = 0; i < length; i++) {
    sinBuf[i] = s;
    cosBuf[i] = c;
    ss += s * s;
    sc += s * c;
    cc += c * c;
    s1 += s;
    c1 += c;
    const sNext = s * cw + c * sw;
    c = c * cw - s * sw;
    s = sNext;
  }
  sums[0] = ss;
  sums[1] = sc;
  sums[2] = cc;
  sums[3] = s1;
  sums[4] = c1;
}

/**
 * Σx·sin, Σx·cos, Σx and the same for y over one cycle's samples, into sums[0..6); the running
 * extremes of x and y in ext[o..o+8) (lo, hi, countLo, countHi each; NaN samples are skipped,
 * as measureSampleExtremes does).
 */
export function projectPair(
  x: ArrayLike<number>, y: ArrayLike<number>, start: number, length: number,
  sinBuf: Float64Array, cosBuf: Float64Array, sums: Float64Array, ext: Float64Array, o: number,
): void {
  let xs = 0, xc = 0, x1 = 0, ys = 0, yc = 0, y1 = 0;
  let xLo = ext[o]!, xHi = ext[o + 1]!, xNLo = ext[o + 2]!, xNHi = ext[o + 3]!;
  let yLo = ext[o + 4]!, yHi = ext[o + 5]!, yNLo = ext[o + 6]!, yNHi = ext[o + 7]!;
  for (let i = 0; i < length; i++) {
    const si = sinBuf[i]!;
    const ci = cosBuf[i]!;
    const v = x[start + i]!;
    const u = y[start + i]!;
    xs += v * si;
    xc += v * ci;
    x1 += v;
    ys += u * si;
    yc += u * ci;
    y1 += u;
    if (v <= xLo) {
      if (v < xLo) {
        xLo = v;
        xNLo = 0;
      }
      xNLo++;
    }
    if (v >= xHi) {
      if (v > xHi) {
        xHi = v;
        xNHi = 0;
      }
      xNHi++;
    }
    if (u <= yLo) {
      if (u < yLo) {
        yLo = u;
        yNLo = 0;
      }
      yNLo++;
    }
    if (u >= yHi) {
      if (u > yHi) {
        yHi = u;
        yNHi = 0;
      }
      yNHi++;
    }
  }
  sums[0] = xs;
  sums[1] = xc;
  sums[2] = x1;
  sums[3] = ys;
  sums[4] = yc;
  sums[5] = y1;
  ext[o] = xLo;
  ext[o + 1] = xHi;
  ext[o + 2] = xNLo;
  ext[o + 3] = xNHi;
  ext[o + 4] = yLo;
  ext[o + 5] = yHi;
  ext[o + 6] = yNLo;
  ext[o + 7] = yNHi;
}
