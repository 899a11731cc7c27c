/**
 * A byte range read in fixed-size chunks from the front by one thread, whose tail another thread
 * may take over once it has nothing else to do (work stealing between the two halves of a split
 * parse). One shared 32-bit word holds both ends, the index of the next chunk to read (low 16
 * bits) and of the chunk the range now ends at (high 16 bits); both sides change it only by
 * compare-and-swap, so every chunk is read by exactly one of them. A second word holds where
 * the first line of the taken tail starts, in bytes past the tail's first chunk boundary: the
 * reader finishes its last line up to there, the taker parses from there on.
 */

/** Most chunks a claim can count (16 bits). */
export const MAX_CLAIM_CHUNKS = 0xffff;

const STATE = 0;
const LINE_OFFSET = 1;

/** A claim on `chunks` chunks (at most MAX_CLAIM_CHUNKS), none read yet, in shared memory. */
export function createRangeClaim(chunks: number): Int32Array {
  if (!(Number.isInteger(chunks) && chunks >= 0 && chunks <= MAX_CLAIM_CHUNKS)) throw new RangeError(`a range claim holds 0 to ${MAX_CLAIM_CHUNKS} chunks, not ${chunks}`);
  const claim = new Int32Array(new SharedArrayBuffer(2 * Int32Array.BYTES_PER_ELEMENT));
  claim[STATE] = chunks << 16;
  return claim;
}

/** The reader's side: the index of the next chunk to read, or -1 once the range is used up. */
export function claimChunk(claim: Int32Array): number {
  for (;;) {
    const state = Atomics.load(claim, STATE);
    const front = state & 0xffff;
    if (front >= state >>> 16) return -1;
    if (Atomics.compareExchange(claim, STATE, state, state + 1) === state) return front;
  }
}

/**
 * Where the range ends once claimChunk() gave -1: the chunk index it was cut at and the byte
 * offset, past that chunk's start, of the first line start there (0 when not cut).
 */
export function claimEnd(claim: Int32Array): { chunk: number; lineOffset: number } {
  return { chunk: Atomics.load(claim, STATE) >>> 16, lineOffset: Atomics.load(claim, LINE_OFFSET) };
}

/** Chunks not yet claimed by the reader. */
export function unclaimedChunks(claim: Int32Array): number {
  const state = Atomics.load(claim, STATE);
  return Math.max(0, (state >>> 16) - (state & 0xffff));
}

/**
 * The taker's side: takes the range from chunk `from` to its end, with `lineOffset` the bytes
 * from that chunk's start to its first line start; false (nothing changed) when the reader has
 * already claimed chunk `from` or the range was cut before it.
 */
export function takeTail(claim: Int32Array, from: number, lineOffset: number): boolean {
  for (;;) {
    const state = Atomics.load(claim, STATE);
    const front = state & 0xffff;
    const end = state >>> 16;
    if (from < front || from >= end) return false;
    // Stored before the swap that makes it visible (the reader reads it after seeing the cut).
    Atomics.store(claim, LINE_OFFSET, lineOffset);
    if (Atomics.compareExchange(claim, STATE, state, (from << 16) | front) === state) return true;
  }
}
