import { createReadStream } from 'node:fs';
import { createCaptureParser, type ImportOptions, type ImportResult } from '../../core/index.js';

/** Streams a capture file through the core parser in 1 MiB chunks (never one giant string). */
export async function readCaptureFile(path: string, options: ImportOptions = {}): Promise<ImportResult> {
  const parser = createCaptureParser(options);
  const stream = createReadStream(path, { highWaterMark: 1 << 20 });
  for await (const chunk of stream) parser.push(chunk as Buffer);
  return parser.finish();
}
