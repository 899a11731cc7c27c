/**
 * Turns a decimal mantissa (an integer of at most 19 significant digits) and a power-of-ten
 * exponent into a double.
 *
 * Positive exponents: for a mantissa below 2^53 and exponent <= 22 both factors are exact, so
 * the one IEEE 754 multiplication is correctly rounded (Clinger, "How to read floating point
 * numbers accurately", PLDI 1990, the "fast path"). Negative exponents multiply by the correctly
 * rounded 10^-k from a table instead of dividing by 10^k (division is several times slower in
 * the hot loop): two roundings, so the result is within about one unit in the last place of
 * Number() on the same text (relative error below 2.3e-16, checked in the tests). Samples are
 * stored as Float32, whose unit in the last place is 2^29 times coarser.
 */
export const POW10: Float64Array = (() => {
  const t = new Float64Array(309);
  for (let k = 0; k <= 308; k++) t[k] = Number(`1e${k}`);
  return t;
})();

/** NEG_POW10[k] = 10^-k, correctly rounded (from the decimal literal), k = 0..323. */
export const NEG_POW10: Float64Array = (() => {
  const t = new Float64Array(324);
  for (let k = 0; k <= 323; k++) t[k] = Number(`1e-${k}`);
  return t;
})();

export function composeDecimal(mantissa: number, exponent10: number): number {
  if (exponent10 < 0) {
    if (exponent10 >= -308) return mantissa * NEG_POW10[-exponent10];
    return exponent10 >= -340 ? mantissa * NEG_POW10[308] * NEG_POW10[-exponent10 - 308] : 0;
  }
  if (exponent10 === 0) return mantissa;
  return exponent10 <= 308 ? mantissa * POW10[exponent10] : mantissa === 0 ? 0 : Infinity;
}

/** 10^exponent10 for any exponent (used for the printed resolution of a time stamp). */
export function powerOfTen(exponent10: number): number {
  if (exponent10 >= 0) return exponent10 <= 308 ? POW10[exponent10] : Infinity;
  return -exponent10 <= 323 ? NEG_POW10[-exponent10] : 0;
}

/**
 * A power-of-ten exponent clamped to the int16 range, for storing in an Int16Array (which would
 * wrap it instead); clamping changes nothing, since powerOfTen() saturates beyond ±324.
 */
export function int16Exponent(exponent10: number): number {
  return exponent10 > 32767 ? 32767 : exponent10 < -32768 ? -32768 : exponent10;
}
