import { describe, expect, it } from 'vitest';
import { claimChunk, claimEnd, createRangeClaim, MAX_CLAIM_CHUNKS, takeTail, unclaimedChunks } from '../../app/cli/rangeClaim.js';
import { createRandom } from '../../core/synth/random.js';

describe('rangeClaim: a range read from the front whose tail another side may take', () => {
  it('gives the reader every chunk in order when nothing is taken', () => {
    const claim = createRangeClaim(5);
    const got: number[] = [];
    for (let c = claimChunk(claim); c >= 0; c = claimChunk(claim)) got.push(c);
    expect(got).toEqual([0, 1, 2, 3, 4]);
    expect(claimEnd(claim)).toEqual({ chunk: 5, lineOffset: 0 });
    expect(unclaimedChunks(claim)).toBe(0);
  });

  it('over seeded interleavings, each chunk goes to exactly one side and the taker learns the line offset (common practice, no source)', () => {
    const rnd = createRandom(77);
    for (let trial = 0; trial < 500; trial++) {
      const chunks = 1 + Math.floor(rnd.uniform() * 40);
      const claim = createRangeClaim(chunks);
      const read: number[] = [];
      let taken: number | undefined;
      let offset = 0;
      for (;;) {
        if (taken === undefined && rnd.uniform() < 0.15) {
          const from = Math.floor(rnd.uniform() * (chunks + 2)) - 1;
          offset = Math.floor(rnd.uniform() * 100);
          const front = read.length;
          const ok = takeTail(claim, from, offset);
          // Only a chunk the reader has not claimed, inside the range.
          expect(ok).toBe(from >= front && from < chunks);
          if (ok) taken = from;
        }
        const c = claimChunk(claim);
        if (c < 0) break;
        read.push(c);
      }
      const end = taken ?? chunks;
      expect(read).toEqual(Array.from({ length: end }, (_, i) => i));
      expect(claimEnd(claim)).toEqual({ chunk: end, lineOffset: taken === undefined ? 0 : offset });
      // Once the reader is done nothing more can be taken.
      expect(takeTail(claim, end - 1, 0)).toBe(false);
    }
  });

  it('refuses sizes beyond its 16-bit ends', () => {
    expect(() => createRangeClaim(MAX_CLAIM_CHUNKS + 1)).toThrow(RangeError);
    expect(unclaimedChunks(createRangeClaim(MAX_CLAIM_CHUNKS))).toBe(MAX_CLAIM_CHUNKS);
  });
});
