import { open } from 'node:fs/promises';
import { createCaptureParser, type ImportOptions, type ImportResult } from '../../core/index.js';

const CHUNK_BYTES = 1 << 20;

/**
 * Streams a capture file through the core parser in 1 MiB chunks (never one giant string). Two
 * buffers alternate: the next read is in flight while the parser works on the current chunk
 * (the parser copies what it keeps, so a buffer can be reused once push() returns). The file's
 * size is passed on as ImportOptions.sizeHintBytes so the parser sizes its columns once.
 */
export async function readCaptureFile(path: string, options: ImportOptions = {}): Promise<ImportResult> {
  const handle = await open(path, 'r');
  try {
    const { size } = await handle.stat();
    const parser = createCaptureParser({ sizeHintBytes: size, ...options });
    const buffers = [new Uint8Array(CHUNK_BYTES), new Uint8Array(CHUNK_BYTES)];
    let which = 0;
    let pending = handle.read(buffers[0]!, 0, CHUNK_BYTES, null);
    for (;;) {
      const { bytesRead, buffer } = await pending;
      if (bytesRead === 0) break;
      which ^= 1;
      pending = handle.read(buffers[which]!, 0, CHUNK_BYTES, null);
      parser.push(buffer.subarray(0, bytesRead));
    }
    return parser.finish();
  } finally {
    await handle.close();
  }
}
