/**
 * Spreads the per-cycle demodulation of a large capture over two threads: this thread
 * demodulates the first half of the carrier cycles, a worker (demodWorker.ts) the second half
 * at the same time, reading the samples from shared memory (the importer's allocateSamples, see
 * sharedSamples). Each cycle depends only on its own samples, so the joined result is the one
 * demodulateCycles gives, bit for bit. Then the worker fits the carrier residual (the hum and
 * DC check's pass over the samples) while this thread analyses the units. The analysis pipeline
 * is synchronous: this thread waits for the worker on a shared flag (Atomics.wait) and takes a
 * posted answer with receiveMessageOnPort, never through the event loop.
 *
 * Used only when the worker has said it listens, every channel lies in shared memory and the
 * record holds enough cycles; otherwise, or when the worker fails, all of it is done here.
 */
import { join } from 'node:path';
import { MessageChannel, receiveMessageOnPort, Worker } from 'node:worker_threads';
import { fitCarrierResidual, type CarrierResidualFit, type ResidualChannel } from '../../core/diagnostics/measureMainsHum.js';
import { cycleBoundaries, demodulateCycleRange, joinCyclePhasors, type CycleDemodulator, type CyclePhasors } from '../../core/demod/demodulateCycles.js';
import type { CarrierTrack } from '../../core/carrier/carrierTrack.js';
import { DEMOD_DONE, DEMOD_PENDING, phasorDoubles, readPhasors, sharedDoubles, sharedFlag, writePhasors, type DemodJob, type ListenJob, type ResidualAnswer, type ResidualJob } from './demodJob.js';

/** Longest wait for the residual fit from its start (it takes ~50 ms cold here). */
const RESIDUAL_WAIT_MS = 3000;

/** Below this many cycles the hand-over costs more than half the work. Measured, no source. */
const MIN_SHARED_CYCLES = 256;

/** Zero-filled sample columns in shared memory (ImportOptions.allocateSamples). */
export function sharedSamples(length: number): Float32Array {
  return new Float32Array(new SharedArrayBuffer(length * Float32Array.BYTES_PER_ELEMENT));
}

export class ParallelDemodulator {
  private readonly worker: Worker;
  /** [state] set by the worker once it listens (DEMOD_DONE), read without the event loop. */
  private readonly alive = sharedFlag();
  private broken = false;

  /**
   * True once the worker listens and has not been seen to fail. Read from shared memory, so it
   * turns true while this thread is busy (the analysis does not yield to the event loop).
   */
  get usable(): boolean {
    return Atomics.load(this.alive, 0) === DEMOD_DONE && !this.broken;
  }

  /** Jobs the worker did for this thread so far: demodulations split, residual fits (for tests). */
  shared = 0;

  /**
   * `worker`: the script of a new worker (default: the bundled demodWorker.js), or a worker that
   * runs already and takes helper jobs (the parse worker, once its range is parsed): it is asked
   * to say that it listens, and is closed with this demodulator.
   */
  constructor(worker: string | Worker = join(__dirname, 'demodWorker.js')) {
    if (typeof worker === 'string') {
      this.worker = new Worker(worker, { workerData: { alive: this.alive } });
      // An idle helper must not keep the process alive.
      this.worker.unref();
    } else {
      // Left referenced: its owner may still be waiting for its messages (a read in progress);
      // close() ends it.
      this.worker = worker;
      worker.postMessage({ kind: 'listen', alive: this.alive } satisfies ListenJob);
    }
    this.worker.once('error', () => (this.broken = true));
    this.worker.once('exit', () => (this.broken = true));
  }

  readonly demodulate: CycleDemodulator = (channels, track, sampleCount) => {
    const bounds = cycleBoundaries(track, sampleCount);
    const cycles = bounds.length - 1;
    const shareable = channels.every((c) => c instanceof Float32Array && c.buffer instanceof SharedArrayBuffer);
    if (!this.usable || !shareable || cycles < MIN_SHARED_CYCLES) return demodulateCycleRange(channels, track, bounds);
    const split = cycles >> 1;
    const theirBounds = bounds.slice(split);
    const theirCycles = cycles - split;
    const out = sharedDoubles(phasorDoubles(channels.length, theirCycles));
    const flag = sharedFlag();
    const job: DemodJob = { kind: 'demodulate', channels: channels as readonly Float32Array[], track: plainTrack(track), bounds: theirBounds, out, flag };
    this.worker.postMessage(job);
    const started = performance.now();
    const mine = demodulateCycleRange(channels, track, bounds.subarray(0, split + 1));
    // A worker that died mid-job never sets the flag: wait a generous multiple of this half's time.
    const waitMs = Math.max(2000, 20 * (performance.now() - started));
    Atomics.wait(flag, 0, DEMOD_PENDING, waitMs);
    let theirs: CyclePhasors;
    if (Atomics.load(flag, 0) === DEMOD_DONE) {
      theirs = readPhasors(out, theirCycles, channels.length);
      this.shared++;
    } else {
      this.broken = true;
      theirs = demodulateCycleRange(channels, track, theirBounds);
    }
    return joinCyclePhasors([mine, theirs]);
  };

  /**
   * Starts fitCarrierResidual on the worker (AnalysisEngine.startCarrierResidual), which is idle
   * while this thread analyses the units; the function returned waits for it and fits here
   * instead if the worker does not answer. Undefined (fit here) when the worker is not usable or
   * a channel is not in shared memory.
   */
  readonly startCarrierResidual = (
    channels: readonly ResidualChannel[],
    phasors: CyclePhasors,
    track: CarrierTrack,
    carrierHz: number,
  ): (() => CarrierResidualFit | undefined) | undefined => {
    const samples = channels.map((c) => c.samples);
    if (!this.usable || !samples.every((c): c is Float32Array => c instanceof Float32Array && c.buffer instanceof SharedArrayBuffer)) return undefined;
    const count = phasors.inPhase.length;
    const shared = sharedDoubles(phasorDoubles(count, phasors.cycleCount));
    writePhasors(phasors, shared);
    const flag = sharedFlag();
    const { port1, port2 } = new MessageChannel();
    const job: ResidualJob = {
      kind: 'carrier-residual',
      channels: samples,
      phasorChannels: channels.map((c) => c.phasorChannel),
      phasors: shared,
      cycles: phasors.cycleCount,
      phasorChannelCount: count,
      track: plainTrack(track),
      carrierHz,
      port: port2,
      flag,
    };
    this.worker.postMessage(job, [port2]);
    const started = performance.now();
    return () => {
      Atomics.wait(flag, 0, DEMOD_PENDING, Math.max(0, RESIDUAL_WAIT_MS - (performance.now() - started)));
      const answer = Atomics.load(flag, 0) === DEMOD_DONE ? (receiveMessageOnPort(port1)?.message as ResidualAnswer | undefined) : undefined;
      port1.close();
      if (answer === undefined) {
        this.broken = true;
        return fitCarrierResidual(channels, phasors, track, carrierHz);
      }
      this.shared++;
      return answer.fit;
    };
  };

  async close(): Promise<void> {
    await this.worker.terminate();
  }
}

function plainTrack(track: CarrierTrack): CarrierTrack {
  return { sampleRateHz: track.sampleRateHz, centreSample: track.centreSample, halfSpanSamples: track.halfSpanSamples, coefficients: [...track.coefficients] };
}
