/**
 * Worker thread that demodulates a range of carrier cycles for the main thread (bundled to dist/cli/demodWorker.js; see ParallelDemodulator). The samples
 * arrive as views of shared memory, the results go into a shared buffer, and a shared flag tells
 * the main thread, which waits on it, that they are there.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { DEMOD_DONE } from './demodJob.js';
import { runHelperJob } from './runHelperJob.js';

if (parentPort) {
  parentPort.on('message', runHelperJob);
  // Tells the main thread, through shared memory, that jobs are now taken.
  const alive = (workerData as { alive?: Int32Array } | null)?.alive;
  if (alive instanceof Int32Array) Atomics.store(alive, 0, DEMOD_DONE);
}
