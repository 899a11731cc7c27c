/**
 * Streaming UTF-16 (LE or BE) to UTF-8 transcoder, so a capture saved as "Unicode" text by a
 * spreadsheet can go through the same byte-level parser as UTF-8.
 *
 * Encoding forms per the Unicode Standard (version 15, §3.9, D91 UTF-16 and Table 3-6 UTF-8 bit
 * distribution). Chunks may split a code unit or a surrogate pair; the remainder is carried.
 * An unpaired surrogate becomes U+FFFD.
 */
export class Utf16ToUtf8 {
  private carryByte = -1;
  private highSurrogate = -1;

  private readonly littleEndian: boolean;

  constructor(littleEndian: boolean) {
    this.littleEndian = littleEndian;
  }

  push(chunk: Uint8Array): Uint8Array {
    const out = new Uint8Array(chunk.length * 2 + 8);
    let o = 0;
    let p = 0;
    const n = chunk.length;
    const emit = (cp: number): void => {
      if (cp < 0x80) out[o++] = cp;
      else if (cp < 0x800) {
        out[o++] = 0xc0 | (cp >> 6);
        out[o++] = 0x80 | (cp & 0x3f);
      } else if (cp < 0x10000) {
        out[o++] = 0xe0 | (cp >> 12);
        out[o++] = 0x80 | ((cp >> 6) & 0x3f);
        out[o++] = 0x80 | (cp & 0x3f);
      } else {
        out[o++] = 0xf0 | (cp >> 18);
        out[o++] = 0x80 | ((cp >> 12) & 0x3f);
        out[o++] = 0x80 | ((cp >> 6) & 0x3f);
        out[o++] = 0x80 | (cp & 0x3f);
      }
    };
    const unit = (u: number): void => {
      if (this.highSurrogate >= 0) {
        if (u >= 0xdc00 && u <= 0xdfff) {
          emit(0x10000 + ((this.highSurrogate - 0xd800) << 10) + (u - 0xdc00));
          this.highSurrogate = -1;
          return;
        }
        emit(0xfffd);
        this.highSurrogate = -1;
      }
      if (u >= 0xd800 && u <= 0xdbff) this.highSurrogate = u;
      else if (u >= 0xdc00 && u <= 0xdfff) emit(0xfffd);
      else emit(u);
    };
    if (this.carryByte >= 0 && n > 0) {
      const a = this.carryByte;
      const b = chunk[0];
      unit(this.littleEndian ? a | (b << 8) : (a << 8) | b);
      this.carryByte = -1;
      p = 1;
    }
    for (; p + 1 < n; p += 2) {
      unit(this.littleEndian ? chunk[p] | (chunk[p + 1] << 8) : (chunk[p] << 8) | chunk[p + 1]);
    }
    if (p < n) this.carryByte = chunk[p];
    return out.subarray(0, o);
  }

  /** Bytes left over at the end of input (an odd byte or an unpaired high surrogate). */
  finish(): Uint8Array {
    const pending = this.carryByte >= 0 || this.highSurrogate >= 0;
    this.carryByte = -1;
    this.highSurrogate = -1;
    return pending ? new Uint8Array([0xef, 0xbf, 0xbd]) : new Uint8Array(0);
  }
}
