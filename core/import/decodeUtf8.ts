/**
 * A small UTF-8 decoder for the few text lines of a capture file (preamble, header, units row).
 *
 * `core` has no TextDecoder, so this follows the decoding algorithm of the Unicode Standard
 * (version 15, §3.9, Table 3-7 "Well-Formed UTF-8 Byte Sequences"): overlong forms, surrogate
 * code points and values above U+10FFFF are ill-formed and each maximal ill-formed subpart
 * becomes one U+FFFD.
 */
export interface DecodedText {
  readonly text: string;
  /** Number of ill-formed sequences replaced by U+FFFD. */
  readonly invalidCount: number;
}

const REPLACEMENT = 0xfffd;

export function decodeUtf8(bytes: Uint8Array, start = 0, end = bytes.length): DecodedText {
  const units: number[] = [];
  let text = '';
  let invalidCount = 0;
  let p = start;
  while (p < end) {
    const b0 = bytes[p];
    if (b0 < 0x80) {
      units.push(b0);
      p++;
    } else {
      // Table 3-7: lead byte ranges and the allowed range of the second byte.
      let need = 0;
      let lo = 0x80;
      let hi = 0xbf;
      let cp = 0;
      if (b0 >= 0xc2 && b0 <= 0xdf) { need = 1; cp = b0 & 0x1f; }
      else if (b0 >= 0xe0 && b0 <= 0xef) {
        need = 2; cp = b0 & 0x0f;
        if (b0 === 0xe0) lo = 0xa0;
        else if (b0 === 0xed) hi = 0x9f;
      } else if (b0 >= 0xf0 && b0 <= 0xf4) {
        need = 3; cp = b0 & 0x07;
        if (b0 === 0xf0) lo = 0x90;
        else if (b0 === 0xf4) hi = 0x8f;
      }
      if (need === 0) {
        units.push(REPLACEMENT);
        invalidCount++;
        p++;
      } else {
        let q = p + 1;
        let ok = true;
        for (let k = 0; k < need; k++, q++) {
          const b = q < end ? bytes[q] : -1;
          const l = k === 0 ? lo : 0x80;
          const h = k === 0 ? hi : 0xbf;
          if (b < l || b > h) { ok = false; break; }
          cp = (cp << 6) | (b & 0x3f);
        }
        if (!ok) {
          units.push(REPLACEMENT);
          invalidCount++;
          p = q; // the maximal subpart ends before the offending byte
        } else {
          if (cp >= 0x10000) {
            const v = cp - 0x10000;
            units.push(0xd800 + (v >> 10), 0xdc00 + (v & 0x3ff));
          } else {
            units.push(cp);
          }
          p = q;
        }
      }
    }
    if (units.length >= 8192) {
      text += String.fromCharCode.apply(null, units);
      units.length = 0;
    }
  }
  if (units.length > 0) text += String.fromCharCode.apply(null, units);
  return { text, invalidCount };
}
