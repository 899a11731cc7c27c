/**
 * One timed one-thread read of a capture, in a process of its own (bundled to
 * dist/bench/oneCoreImport.js; run by runBench.ts): `node dist/bench/oneCoreImport.js <file>`
 * prints {"importS": …, "rows": …}. The time is the CLI's reader held to one thread (no parse
 * worker), from opening the file to the imported columns, without Node's start-up: the figure
 * the pandas yardstick prints as its own import time. Not part of the product.
 */
import { performance } from 'node:perf_hooks';
import { readCaptureFile } from '../../app/cli/readCaptureFile.js';

async function main(): Promise<void> {
  const path = process.argv[2];
  if (path === undefined) throw new Error('usage: oneCoreImport.js <capture.csv>');
  const started = performance.now();
  const { capture } = await readCaptureFile(path, {}, { minBytes: Infinity });
  const importS = (performance.now() - started) / 1000;
  process.stdout.write(`${JSON.stringify({ importS, rows: capture.sampleCount })}\n`);
}

main().catch((error: unknown) => {
  process.stderr.write(`oneCoreImport: ${error instanceof Error ? error.message : String(error)}\n`);
  process.exitCode = 1;
});
