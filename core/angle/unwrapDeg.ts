/**
 * Phase unwrapping (Itoh, "Analysis of the phase unwrapping algorithm", Applied Optics 21(14),
 * 1982): add ±360° whenever successive values differ by more than 180°. NaN values are carried
 * through and skipped when comparing.
 */
export function unwrapDeg(wrapped: ArrayLike<number>, out = new Float64Array(wrapped.length)): Float64Array {
  let offset = 0;
  let previous = NaN;
  for (let i = 0; i < wrapped.length; i++) {
    const v = wrapped[i]!;
    if (Number.isNaN(v)) {
      out[i] = NaN;
      continue;
    }
    if (!Number.isNaN(previous)) {
      const d = v + offset - previous;
      offset -= 360 * Math.round(d / 360);
    }
    out[i] = v + offset;
    previous = out[i]!;
  }
  return out;
}

/** Wraps degrees into [0, 360). */
export function wrapDeg(deg: number): number {
  const w = deg % 360;
  const r = w < 0 ? w + 360 : w;
  return r === 360 ? 0 : r;
}

/** Signed smallest difference a − b in degrees, in (−180, 180]. */
export function angleDiffDeg(a: number, b: number): number {
  let d = (a - b) % 360;
  if (d <= -180) d += 360;
  if (d > 180) d -= 360;
  return d;
}
