/** Bytes handed to the numeric hot loop at a time (see LineRegionFeeder.feed). */
const REGION_BYTES = 64 * 1024;
const LF = new Uint8Array([10]);

/**
 * Cuts a stream of byte chunks into runs of whole lines for a region parser: each chunk's
 * complete lines go straight to `parseRegion` in slices of at most ~64 KiB ending at a line
 * break (the hot loop is then entered often enough for the JIT to optimise the whole function,
 * not just the loop by on-stack replacement), and a trailing partial line is carried over to the
 * next chunk. A chunk may split anywhere, including between CR and LF.
 */
export class LineRegionFeeder {
  private carry = new Uint8Array(256);
  private carryLength = 0;

  private readonly parseRegion: (bytes: Uint8Array, from: number, to: number) => void;

  constructor(parseRegion: (bytes: Uint8Array, from: number, to: number) => void) {
    this.parseRegion = parseRegion;
  }

  /** Bytes of a partial line waiting for its end. */
  get pendingBytes(): number {
    return this.carryLength;
  }

  feed(chunk: Uint8Array): void {
    const n = chunk.length;
    if (n === 0) return;
    let last = n - 1;
    while (last >= 0 && chunk[last] !== 10 && chunk[last] !== 13) last--;
    if (last < 0) {
      this.appendCarry(chunk);
      return;
    }
    let from = 0;
    if (this.carryLength > 0) {
      let first = 0;
      while (chunk[first] !== 10 && chunk[first] !== 13) first++;
      this.appendCarry(chunk.subarray(0, first + 1));
      this.parseRegion(this.carry, 0, this.carryLength);
      this.carryLength = 0;
      from = first + 1;
    }
    const end = last + 1;
    while (from < end) {
      let cut = from + REGION_BYTES;
      if (cut >= end) cut = end;
      else {
        while (cut > from && chunk[cut - 1] !== 10 && chunk[cut - 1] !== 13) cut--;
        if (cut === from) cut = end;
      }
      this.parseRegion(chunk, from, cut);
      from = cut;
    }
    if (end < n) this.appendCarry(chunk.subarray(end));
  }

  /** Ends a last line that has no line break. */
  flush(): void {
    if (this.carryLength === 0) return;
    this.appendCarry(LF);
    this.parseRegion(this.carry, 0, this.carryLength);
    this.carryLength = 0;
  }

  private appendCarry(bytes: Uint8Array): void {
    const need = this.carryLength + bytes.length;
    if (need > this.carry.length) {
      const grown = new Uint8Array(Math.max(need, this.carry.length * 2));
      grown.set(this.carry.subarray(0, this.carryLength));
      this.carry = grown;
    }
    this.carry.set(bytes, this.carryLength);
    this.carryLength = need;
  }
}
