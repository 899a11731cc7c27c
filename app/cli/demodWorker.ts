/**
 * Worker thread that demodulates a range of carrier cycles, or measures the channels' extremes,
 * for the main thread (bundled to dist/cli/demodWorker.js; see ParallelDemodulator). The samples
 * arrive as views of shared memory, the results go into a shared buffer, and a shared flag tells
 * the main thread, which waits on it, that they are there.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { demodulateCycleRange } from '../../core/demod/demodulateCycles.js';
import { measureSampleExtremes } from '../../core/diagnostics/sampleExtremes.js';
import { DEMOD_DONE, DEMOD_FAILED, writeExtremes, writePhasors, type HelperJob } from './demodJob.js';

if (parentPort) {
  parentPort.on('message', (job: HelperJob) => {
    let state = DEMOD_DONE;
    try {
      if (job.kind === 'demodulate') writePhasors(demodulateCycleRange(job.channels, job.track, job.bounds), job.out);
      else writeExtremes(job.channels.map((c) => measureSampleExtremes(c, 0, c.length)), job.out);
    } catch {
      state = DEMOD_FAILED;
    }
    Atomics.store(job.flag, 0, state);
    Atomics.notify(job.flag, 0);
  });
  // Tells the main thread, through shared memory, that jobs are now taken.
  const alive = (workerData as { alive?: Int32Array } | null)?.alive;
  if (alive instanceof Int32Array) Atomics.store(alive, 0, DEMOD_DONE);
}
