/** A read of up to one chunk into the buffer given, as FileHandle.read answers it (0 bytes: the end). */
export type ChunkRead = (buffer: Uint8Array) => Promise<{ bytesRead: number; buffer: Uint8Array }>;

/**
 * Reads chunk after chunk through `read` into two buffers that alternate, the next read in
 * flight while `take` works on the current chunk (which must not keep the bytes past its
 * return), until a read gives 0 bytes.
 */
export async function readInChunks(read: ChunkRead, buffers: readonly [Uint8Array, Uint8Array], take: (bytes: Uint8Array) => void): Promise<void> {
  let which = 0;
  let pending = read(buffers[0]);
  for (;;) {
    const { bytesRead, buffer } = await pending;
    if (bytesRead === 0) return;
    which ^= 1;
    pending = read(buffers[which]!);
    take(buffer.subarray(0, bytesRead));
  }
}
