import { describe, expect, it } from 'vitest';
import { readInChunks, type ChunkRead } from '../../app/cli/readInChunks.js';

describe('readInChunks', () => {
  it('hands over every chunk in order, with the next read already issued into the other buffer (common practice, no source)', async () => {
    const source = Uint8Array.from({ length: 2500 }, (_, i) => i % 251);
    const buffers: [Uint8Array, Uint8Array] = [new Uint8Array(1000), new Uint8Array(1000)];
    let offset = 0;
    const issuedInto: Uint8Array[] = [];
    const read: ChunkRead = async (b) => {
      issuedInto.push(b);
      const n = Math.min(b.length, source.length - offset);
      b.set(source.subarray(offset, offset + n));
      offset += n;
      return { bytesRead: n, buffer: b };
    };
    const got: number[] = [];
    await readInChunks(read, buffers, (bytes) => {
      // The read after this chunk is in flight, into the buffer this chunk is not in.
      expect(issuedInto[issuedInto.length - 1]).not.toBe(bytes.buffer === buffers[0].buffer ? buffers[0] : buffers[1]);
      got.push(...bytes);
    });
    expect(got).toEqual([...source]);
    expect(issuedInto).toHaveLength(4); // three chunks, then the read that gives 0 bytes
  });
});
