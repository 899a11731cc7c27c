/**
 * What the main thread and the demodulation worker (demodWorker.ts) exchange: the job, the
 * layout of its results in shared memory and the states of its shared flag. No side effects, so
 * that both sides can import it (the worker module itself listens on its parent port).
 */
import type { CarrierTrack } from '../../core/carrier/carrierTrack.js';
import type { CyclePhasors } from '../../core/demod/demodulateCycles.js';
import type { CarrierResidualFit } from '../../core/diagnostics/measureMainsHum.js';
import type { SampleExtremes } from '../../core/diagnostics/sampleExtremes.js';
import type { MessagePort } from 'node:worker_threads';

export interface DemodJob {
  readonly kind: 'demodulate';
  readonly channels: readonly Float32Array[];
  readonly track: CarrierTrack;
  /** Cycle boundaries of the range (cycleBoundaries entries, first to last). */
  readonly bounds: Float64Array;
  /** phasorDoubles(channels, cycles) doubles: see writePhasors. */
  readonly out: Float64Array;
  /** [state]: 0 pending, 1 done, 2 failed. */
  readonly flag: Int32Array;
}

/**
 * fitCarrierResidual of `channels` (one per phasor slot in phasorChannels) against the phasors
 * laid out by writePhasors in `phasors`; the result is posted on `port` before `flag` is set.
 */
export interface ResidualJob {
  readonly kind: 'carrier-residual';
  readonly channels: readonly Float32Array[];
  readonly phasorChannels: readonly number[];
  readonly phasors: Float64Array;
  readonly cycles: number;
  readonly phasorChannelCount: number;
  readonly track: CarrierTrack;
  readonly carrierHz: number;
  readonly port: MessagePort;
  readonly flag: Int32Array;
}

/** What a ResidualJob posts on its port. */
export interface ResidualAnswer {
  readonly fit: CarrierResidualFit | undefined;
}

/** Asks a worker that is already running (the parse worker) to say, through `alive`, that it takes jobs. */
export interface ListenJob {
  readonly kind: 'listen';
  readonly alive: Int32Array;
}

export type HelperJob = DemodJob | ResidualJob | ListenJob;

/** Doubles per channel of the extremes in writePhasors' layout: sampleCount, lo, hi, countLo, countHi. */
const EXTREMES_FIELDS = 5;

/** Doubles writePhasors lays out for `cycles` cycles of `channels` channels. */
export function phasorDoubles(channels: number, cycles: number): number {
  return (5 + 3 * channels) * cycles + EXTREMES_FIELDS * channels;
}

/** A zero-filled Float64Array in shared memory, for a job's results. */
export function sharedDoubles(length: number): Float64Array {
  return new Float64Array(new SharedArrayBuffer(length * Float64Array.BYTES_PER_ELEMENT));
}

/** A job's flag in shared memory, DEMOD_PENDING to start with. */
export function sharedFlag(): Int32Array {
  return new Int32Array(new SharedArrayBuffer(Int32Array.BYTES_PER_ELEMENT));
}

export const DEMOD_PENDING = 0;
export const DEMOD_DONE = 1;
export const DEMOD_FAILED = 2;

/**
 * Lays the phasors of `cycles` cycles out in `out`: the five per-cycle rows, then I, Q, DC per
 * channel, then EXTREMES_FIELDS per channel.
 */
export function writePhasors(p: CyclePhasors, out: Float64Array): void {
  const m = p.cycleCount;
  const rows = [p.centreS, p.firstSample, p.lengthSamples, p.radPerSample, p.centrePhaseRad, ...p.inPhase.flatMap((_, ch) => [p.inPhase[ch]!, p.quadrature[ch]!, p.dc[ch]!])];
  rows.forEach((row, r) => out.set(row.subarray(0, m), r * m));
  const at = rows.length * m;
  p.extremes.forEach((e, ch) => out.set([e.sampleCount, e.lo, e.hi, e.countLo, e.countHi], at + ch * EXTREMES_FIELDS));
}

/** The phasors laid out by writePhasors (views of `out`). */
export function readPhasors(out: Float64Array, cycles: number, channels: number): CyclePhasors {
  const row = (r: number): Float64Array => out.subarray(r * cycles, (r + 1) * cycles);
  return {
    cycleCount: cycles,
    centreS: row(0),
    firstSample: row(1),
    lengthSamples: row(2),
    radPerSample: row(3),
    centrePhaseRad: row(4),
    inPhase: Array.from({ length: channels }, (_, ch) => row(5 + 3 * ch)),
    quadrature: Array.from({ length: channels }, (_, ch) => row(6 + 3 * ch)),
    dc: Array.from({ length: channels }, (_, ch) => row(7 + 3 * ch)),
    extremes: Array.from({ length: channels }, (_, ch): SampleExtremes => {
      const o = (5 + 3 * channels) * cycles + ch * EXTREMES_FIELDS;
      return { sampleCount: out[o]!, lo: out[o + 1]!, hi: out[o + 2]!, countLo: out[o + 3]!, countHi: out[o + 4]! };
    }),
  };
}
