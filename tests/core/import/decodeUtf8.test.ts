import { describe, expect, it } from 'vitest';
import { decodeUtf8 } from '../../../core/import/decodeUtf8.js';
import { Utf16ToUtf8 } from '../../../core/import/transcodeUtf16.js';
import { createRandom } from '../../../core/synth/random.js';

// Reference decoder: Node.js Buffer#toString('utf8'), which replaces maximal ill-formed subparts
// with U+FFFD as the Unicode Standard §3.9 (Table 3-7) describes.
describe('decodeUtf8(bytes)', () => {
  it('matches Node.js Buffer decoding on well-formed text', () => {
    const text = 'Time,S1-S3 (mV),Ω,µs,μV,€,𝄞 end';
    expect(decodeUtf8(new Uint8Array(Buffer.from(text, 'utf8'))).text).toBe(text);
  });
  it('matches Node.js Buffer decoding on seeded random bytes, ill-formed sequences included', () => {
    const rnd = createRandom(17);
    for (let trial = 0; trial < 200; trial++) {
      const bytes = new Uint8Array(64);
      for (let i = 0; i < bytes.length; i++) bytes[i] = rnd.uniform() < 0.5 ? 0x20 + Math.floor(rnd.uniform() * 90) : Math.floor(rnd.uniform() * 256);
      expect(decodeUtf8(bytes).text).toBe(Buffer.from(bytes).toString('utf8'));
    }
  });
  it('counts invalid sequences and decodes a sub-range', () => {
    const bytes = new Uint8Array([0x41, 0xff, 0xc0, 0xaf, 0x42]);
    expect(decodeUtf8(bytes)).toEqual({ text: 'A\ufffd\ufffd\ufffdB', invalidCount: 3 });
    expect(decodeUtf8(bytes, 4, 5).text).toBe('B');
  });
});

describe('Utf16ToUtf8.push(chunk)', () => {
  it('matches Node.js utf16le decoding for chunks split at every offset, surrogate pairs included', () => {
    const text = 'Zeit;Ω;𝄞;µV\r\n0;1,5;2';
    const le = new Uint8Array(Buffer.from(text, 'utf16le'));
    for (let cut = 0; cut <= le.length; cut++) {
      const t = new Utf16ToUtf8(true);
      const a = t.push(le.subarray(0, cut));
      const b = t.push(le.subarray(cut));
      expect(Buffer.concat([a, b, t.finish()]).toString('utf8')).toBe(text);
    }
  });
  it('replaces an unpaired surrogate and a dangling byte with U+FFFD', () => {
    const t = new Utf16ToUtf8(true);
    const out = Buffer.concat([t.push(new Uint8Array([0x3d, 0xd8, 0x41, 0x00, 0x42])), t.finish()]).toString('utf8');
    expect(out).toBe('\ufffdA\ufffd');
  });
});
