import { describe, expect, it } from 'vitest';
import { splitDelimitedRecords } from '../../../core/import/splitDelimitedRecords.js';

const fieldsOf = (text: string, d: string): string[][] => splitDelimitedRecords(text, d).map((r) => r.fields);

describe('splitDelimitedRecords(text, delimiter)', () => {
  it('splits fields and records (RFC 4180 §2 rules 1 and 4)', () => {
    expect(fieldsOf('a,b,c\r\nd,e,f\r\n', ',')).toEqual([['a', 'b', 'c'], ['d', 'e', 'f']]);
  });
  it('accepts a last record without a line break (RFC 4180 §2 rule 2)', () => {
    const r = splitDelimitedRecords('a,b\nc,d', ',');
    expect(r.map((x) => [x.fields, x.terminated])).toEqual([[['a', 'b'], true], [['c', 'd'], false]]);
  });
  it('keeps the delimiter and line breaks inside quotes (RFC 4180 §2 rule 6)', () => {
    const r = splitDelimitedRecords('"R1-R2, excitation","two\r\nlines",x\r\nnext,1,2\r\n', ',');
    expect(r[0].fields).toEqual(['R1-R2, excitation', 'two\r\nlines', 'x']);
    expect(r[0].quoted).toEqual([true, true, false]);
    expect([r[0].line, r[0].lineSpan, r[1].line]).toEqual([1, 2, 3]);
  });
  it('reads a doubled quote inside quotes as one quote (RFC 4180 §2 rule 7)', () => {
    expect(fieldsOf('"a ""b"" c",""\n', ',')).toEqual([['a "b" c', '']]);
  });
  it('keeps empty fields, including a trailing one (RFC 4180 §2 rule 4 allows empty fields)', () => {
    expect(fieldsOf('1,,3,\n', ',')).toEqual([['1', '', '3', '']]);
  });
  it('counts LF, CRLF and CR each as one line break', () => {
    expect(splitDelimitedRecords('a\nb\r\nc\rd', ';').map((r) => r.line)).toEqual([1, 2, 3, 4]);
  });
  it('collapses runs of blanks for the space delimiter', () => {
    expect(fieldsOf('  1.5   2  \n3 4\n', ' ')).toEqual([['1.5', '2'], ['3', '4']]);
  });
  it('keeps tabs as delimiters under the tab delimiter', () => {
    expect(fieldsOf('a\t\tb\n', '\t')).toEqual([['a', '', 'b']]);
  });
});
