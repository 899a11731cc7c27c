import { describe, expect, it } from 'vitest';
import { composeDecimal, int16Exponent, powerOfTen } from '../../../core/import/composeDecimal.js';
import { createRandom } from '../../../core/synth/random.js';

/** Mantissa and exponent the way the byte parser forms them (digits accumulated in a double). */
function decompose(text: string): { mantissa: number; exponent: number } {
  const m = /^(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/.exec(text)!;
  const digits = (m[1] ?? '') + (m[2] ?? '');
  let mantissa = 0;
  for (const d of digits) mantissa = mantissa * 10 + (d.charCodeAt(0) - 48);
  return { mantissa, exponent: Number(m[3] ?? 0) - (m[2] ?? '').length };
}

describe('composeDecimal(mantissa, exponent10)', () => {
  it('is exact on the Clinger fast path (mantissa < 2^53, 0 <= exponent <= 22) against Node.js Number()', () => {
    for (const text of ['1', '15e1', '123456789012345e22', '9007199254740991', '42e0']) {
      const { mantissa, exponent } = decompose(text);
      expect(composeDecimal(mantissa, exponent)).toBe(Number(text));
    }
  });

  it('is within 1e-15 relative of Node.js Number() on the same text for seeded random numbers', () => {
    const rnd = createRandom(2024);
    let worst = 0;
    for (let i = 0; i < 200000; i++) {
      const v = rnd.uniform() * 10 ** Math.floor(rnd.uniform() * 80 - 40);
      const digits = 1 + Math.floor(rnd.uniform() * 19);
      const text = i % 2 === 0 ? v.toExponential(Math.min(digits, 19) - 1 > 20 ? 20 : Math.min(digits - 1, 20)) : v.toPrecision(Math.min(digits, 21));
      const plain = text.replace('+', '');
      const { mantissa, exponent } = decompose(plain);
      if (plain.replace(/e.*/, '').replace('.', '').replace(/^0+/, '').length > 19) continue;
      const want = Number(plain);
      const got = composeDecimal(mantissa, exponent);
      const rel = want === 0 ? Math.abs(got) : Math.abs(got / want - 1);
      if (rel > worst) worst = rel;
    }
    expect(worst).toBeLessThan(1e-15);
  });

  it('handles the ends of the double range', () => {
    expect(composeDecimal(0, 400)).toBe(0);
    expect(composeDecimal(1, 400)).toBe(Infinity);
    expect(Math.abs(composeDecimal(17, -320) / 1.7e-319 - 1)).toBeLessThan(1e-3); // subnormal
    expect(composeDecimal(17, -330)).toBe(0); // below the smallest subnormal, as Number('17e-330')
    expect(composeDecimal(1, -400)).toBe(0);
    expect(powerOfTen(-6)).toBe(1e-6);
    expect(powerOfTen(3)).toBe(1000);
  });

  it('int16Exponent clamps to the int16 range, where powerOfTen already saturates (IEEE 754 binary64 range, common practice)', () => {
    expect([-40000, -32769, -32768, -7, 0, 32767, 99999].map(int16Exponent)).toEqual([-32768, -32768, -32768, -7, 0, 32767, 32767]);
    for (const e of [-40000, 99999]) expect(powerOfTen(int16Exponent(e))).toBe(powerOfTen(e));
  });
});
