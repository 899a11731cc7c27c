import { describe, expect, it } from 'vitest';
import { parseNumberText, unquoteCell } from '../../../core/import/parseNumberText.js';

// Grammar table: what Node.js Number() and parseFloat do with each text (Node.js
// Number()/parseFloat behaviour, checked in Node 20), and what a sample cell must read as.
describe('parseNumberText(text, decimalMark)', () => {
  const table: [string, '.' | ',', number | 'empty' | 'invalid' | 'overrange', string][] = [
    ['1.5', '.', 1.5, 'plain'],
    ['-.5', '.', -0.5, 'no integer digits'],
    ['+1.5E-03', '.', 1.5e-3, 'leading + and exponent'],
    ['1.5e+2', '.', 150, 'exponent with +'],
    ['1.0E-003', '.', 1e-3, 'three-digit exponent'],
    ['2d3', '.', 2000, 'Fortran D exponent'],
    ['5.', '.', 5, 'trailing decimal mark'],
    ['1,5', ',', 1.5, 'decimal comma (SI Brochure 9th ed. §5.4.4)'],
    ['−1,0', ',', -1, 'U+2212 minus sign (Number() gives NaN; accepted here on purpose)'],
    ['\u202F1', '.', 1, 'narrow no-break space is trimmed as Number() does'],
    ['', '.', 'empty', 'Number("") is 0: must be missing instead'],
    ['   ', '.', 'empty', 'Number("  ") is 0: must be missing instead'],
    ['1,5', '.', 'invalid', 'parseFloat("1,5") is 1: silently wrong'],
    ['0x10', '.', 'invalid', 'Number("0x10") is 16'],
    ['1.2.3', '.', 'invalid', 'parseFloat gives 1.2'],
    ['12k', '.', 'invalid', 'parseFloat gives 12'],
    ['3.3mV', '.', 'invalid', 'parseFloat gives 3.3'],
    ['1.234,56', ',', 'invalid', 'digit groups with dots are not SI (§5.4.4)'],
    ['1e', '.', 'invalid', 'parseFloat gives 1'],
    ['Infinity', '.', 'overrange', 'Number("Infinity") is Infinity'],
    ['9.91E37', '.', 'overrange', 'SCPI not-a-number code (from memory)'],
    ['-9.9E37', '.', 'overrange', 'SCPI minus-infinity code (from memory)'],
    ['--', '.', 'overrange', 'common dash marker'],
    ['OVER', '.', 'overrange', 'common word marker'],
    ['nan', '.', 'overrange', 'invalid-sample marker'],
  ];
  for (const [text, mark, want, why] of table) {
    it(`reads ${JSON.stringify(text)} with "${mark}" as ${String(want)} (${why})`, () => {
      const v = parseNumberText(text, mark);
      if (typeof want === 'number') {
        expect(v.kind).toBe('number');
        expect(v.value).toBe(want);
      } else {
        expect(v.kind).toBe(want);
        expect(v.value).toBeNaN();
      }
    });
  }
  it('gives the power of ten of the last printed digit', () => {
    expect(parseNumberText('1.230E-03', '.').lastDigitExponent).toBe(-6);
    expect(parseNumberText('0,0500', ',').lastDigitExponent).toBe(-4);
    expect(parseNumberText('1200', '.').lastDigitExponent).toBe(0);
  });
  it('unquoteCell removes RFC 4180 quoting (RFC 4180 §2 rule 7: "" stands for ")', () => {
    expect(unquoteCell(' "say ""hi""" ')).toBe('say "hi"');
    expect(unquoteCell('"1.5"')).toBe('1.5');
    expect(unquoteCell('plain')).toBe('plain');
  });
});
