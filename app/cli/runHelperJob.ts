/**
 * Runs one job for the main thread on a helper thread (the demodulation worker, or the parse
 * worker once its range is parsed): results into the job's shared buffer (or, for a residual fit,
 * posted on the job's port), then its shared flag set and notified, since the main thread waits
 * on the flag, not on the event loop.
 */
import { demodulateCycleRange } from '../../core/demod/demodulateCycles.js';
import { fitCarrierResidual } from '../../core/diagnostics/measureMainsHum.js';
import { DEMOD_DONE, DEMOD_FAILED, readPhasors, writePhasors, type HelperJob, type ResidualAnswer } from './demodJob.js';

export function runHelperJob(job: HelperJob): void {
  if (job.kind === 'listen') {
    Atomics.store(job.alive, 0, DEMOD_DONE);
    return;
  }
  let state = DEMOD_DONE;
  try {
    if (job.kind === 'demodulate') writePhasors(demodulateCycleRange(job.channels, job.track, job.bounds), job.out);
    else {
      const channels = job.channels.map((samples, k) => ({ samples, phasorChannel: job.phasorChannels[k]! }));
      const fit = fitCarrierResidual(channels, readPhasors(job.phasors, job.cycles, job.phasorChannelCount), job.track, job.carrierHz);
      job.port.postMessage({ fit } satisfies ResidualAnswer);
      job.port.close();
    }
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
