/**
 * Runs one job for the main thread on a helper thread (the demodulation worker, or the parse
 * worker once its range is parsed): results into the job's shared buffer, then its shared flag
 * set and notified, since the main thread waits on the flag, not on a message.
 */
import { demodulateCycleRange } from '../../core/demod/demodulateCycles.js';
import { DEMOD_DONE, DEMOD_FAILED, writePhasors, type HelperJob } from './demodJob.js';

export function runHelperJob(job: HelperJob): void {
  if (job.kind === 'listen') {
    Atomics.store(job.alive, 0, DEMOD_DONE);
    return;
  }
  let state = DEMOD_DONE;
  try {
    writePhasors(demodulateCycleRange(job.channels, job.track, job.bounds), job.out);
  } catch {
    state = DEMOD_FAILED;
  }
  Atomics.store(job.flag, 0, state);
  Atomics.notify(job.flag, 0);
}

/** True for a helper job (the parse worker's first message, its ParseJob, has no kind). */
export function isHelperJob(message: unknown): message is HelperJob {
  return typeof message === 'object' && message !== null && typeof (message as { kind?: unknown }).kind === 'string';
}
