/**
 * Strict classification of one CSV cell given as text (the sniffer and the parser's slow path
 * use it; the byte-level fast path implements the same grammar).
 *
 * Grammar: optional sign (`+`, `-`, or U+2212 MINUS SIGN), digits with at most one decimal mark
 * (the file's: `.` or `,`; SI Brochure, 9th ed. 2019, §5.4.4 allows either), at least one digit,
 * optional exponent `e`/`E` (or Fortran `d`/`D`) with optional sign and at least one digit.
 * Leading and trailing blanks are allowed. Everything else is not a number: `Number()` would
 * silently read `""` as 0 and `"0x10"` as 16, and `parseFloat` reads `"1,5"` as 1 (Node.js
 * Number()/parseFloat behaviour), so neither is applied to raw fields.
 *
 * Overrange markers: SCPI instruments encode "not a number" as 9.91E37 and +/-infinity as
 * +/-9.9E37 (SCPI-1999 Vol. 1 §7.2.1.5, from memory); any magnitude >= 9.8e37 is treated as such a
 * marker, as are the words inf/infinity/∞, `--`, OVER, OVERLOAD, OL, NaN.
 */
export type CellKind = 'number' | 'empty' | 'overrange' | 'invalid';

export interface CellValue {
  readonly kind: CellKind;
  /** The value (NaN unless kind is 'number'). */
  readonly value: number;
  /** Power of ten of the last printed digit ("1.230E-03" -> -6); 0 unless kind is 'number'. */
  readonly lastDigitExponent: number;
}

/** Magnitudes at or above this are SCPI overrange / not-a-number codes. */
export const OVERRANGE_MAGNITUDE = 9.8e37;

const MARKERS = new Set([
  'inf', '+inf', '-inf', 'infinity', '+infinity', '-infinity', '∞', '+∞', '-∞', '−∞',
  '--', '---', '----', 'over', 'overload', 'ovld', 'ovfl', 'ol', '+ol', '-ol', 'nan', '-nan', '+nan',
  'overrange', 'under', 'underrange', '****', '*****',
]);

const EMPTY: CellValue = { kind: 'empty', value: NaN, lastDigitExponent: 0 };
const OVER: CellValue = { kind: 'overrange', value: NaN, lastDigitExponent: 0 };
const INVALID: CellValue = { kind: 'invalid', value: NaN, lastDigitExponent: 0 };

/** Removes RFC 4180 quoting (surrounding quotes, doubled inner quotes) and surrounding blanks. */
export function unquoteCell(text: string): string {
  let s = text.trim();
  if (s.length >= 2 && s.charCodeAt(0) === 34 && s.charCodeAt(s.length - 1) === 34) {
    s = s.slice(1, -1).replace(/""/g, '"').trim();
  }
  return s;
}

export function parseNumberText(raw: string, decimalMark: '.' | ','): CellValue {
  const s = raw.trim();
  if (s === '') return EMPTY;
  let i = 0;
  const n = s.length;
  let c = s.charCodeAt(0);
  let negative = false;
  if (c === 43 || c === 45 || c === 0x2212) {
    negative = c !== 43;
    i++;
  }
  const dec = decimalMark.charCodeAt(0);
  let mantissa = '';
  let fractionDigits = 0;
  let digits = 0;
  for (; i < n; i++) {
    c = s.charCodeAt(i);
    if (c < 48 || c > 57) break;
    mantissa += s[i];
    digits++;
  }
  if (i < n && s.charCodeAt(i) === dec) {
    for (i++; i < n; i++) {
      c = s.charCodeAt(i);
      if (c < 48 || c > 57) break;
      mantissa += s[i];
      digits++;
      fractionDigits++;
    }
  }
  let exponent = 0;
  let ok = digits > 0;
  if (ok && i < n) {
    c = s.charCodeAt(i) | 32;
    if (c === 101 || c === 100) {
      i++;
      let expText = '';
      if (i < n && (s[i] === '+' || s[i] === '-')) expText += s[i++];
      let expDigits = 0;
      for (; i < n; i++) {
        c = s.charCodeAt(i);
        if (c < 48 || c > 57) break;
        expText += s[i];
        expDigits++;
      }
      ok = expDigits > 0;
      exponent = ok ? Number(expText) : 0;
    }
  }
  if (!ok || i !== n) {
    return MARKERS.has(s.toLowerCase()) ? OVER : INVALID;
  }
  // The text now matches the grammar; Number() on the normalised form is exact.
  const value = Number(`${negative ? '-' : ''}${mantissa.slice(0, digits - fractionDigits) || '0'}.${mantissa.slice(digits - fractionDigits)}e${exponent}`);
  if (!(Math.abs(value) < OVERRANGE_MAGNITUDE)) return OVER;
  return { kind: 'number', value, lastDigitExponent: exponent - fractionDigits };
}
