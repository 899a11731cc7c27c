import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { Worker } from 'node:worker_threads';
import { beforeAll, describe, expect, it } from 'vitest';
import { ParallelDemodulator, sharedSamples } from '../../app/cli/parallelDemodulator.js';
import { constantCarrierTrack } from '../../core/carrier/carrierTrack.js';
import { demodulateCycles } from '../../core/demod/demodulateCycles.js';
import { fitCarrierResidual } from '../../core/diagnostics/measureMainsHum.js';
import { createRandom } from '../../core/synth/random.js';

const WORKER = resolve('dist/cli/demodWorker.js');
const PARSE_WORKER = resolve('dist/cli/parseWorker.js');

beforeAll(async () => {
  await promisify(execFile)(process.execPath, ['app/build.mjs']);
}, 120_000);

/** Seeded carrier-modulated lines, `shared` ones in shared memory (as the CLI imports them). */
function lines(n: number, shared: boolean): { channels: Float32Array[]; track: ReturnType<typeof constantCarrierTrack> } {
  const fs = 100_000;
  const random = createRandom(4242);
  const channels = [0, 1, 2, 3].map((k) => {
    const c = shared ? sharedSamples(n) : new Float32Array(n);
    for (let i = 0; i < n; i++) c[i] = (1 + k) * Math.sin(2 * Math.PI * 400.7 * (i / fs) + 0.4 + k) * Math.cos(i / 20000) + 0.01 * random.normal();
    return c;
  });
  return { channels, track: constantCarrierTrack(fs, 400.7, 0.4, n) };
}

/** Resolves once the worker has started (its 'online' event is handled on this thread's loop). */
async function started(helper: ParallelDemodulator, tries = 200): Promise<void> {
  for (let k = 0; k < tries && !helper.usable; k++) await new Promise((r) => setTimeout(r, 10));
}

describe('ParallelDemodulator', () => {
  it('splits the cycles over two threads and gives demodulateCycles bit for bit (the oracle: one thread)', async () => {
    const helper = new ParallelDemodulator(WORKER);
    try {
      await started(helper);
      expect(helper.usable).toBe(true);
      const { channels, track } = lines(400_000, true);
      const got = helper.demodulate(channels, track, 400_000);
      expect(helper.shared).toBe(1);
      // Phasors and each channel's extremes (merged from the two halves).
      expect(got).toEqual(demodulateCycles(channels, track, 400_000));
      const three = channels.slice(0, 3);
      expect(helper.demodulate(three, track, 400_000)).toEqual(demodulateCycles(three, track, 400_000));
    } finally {
      await helper.close();
    }
  }, 60_000);

  it('fits the carrier residual on the worker as fitCarrierResidual does here (the oracle), bit for bit, and leaves it here when it cannot', async () => {
    const helper = new ParallelDemodulator(WORKER);
    try {
      await started(helper);
      const { channels, track } = lines(400_000, true);
      const phasors = demodulateCycles(channels, track, 400_000);
      // Channel 2 left out: the phasor slots need not be 0..n-1.
      const chosen = [0, 1, 3].map((k) => ({ samples: channels[k]!, phasorChannel: k }));
      const want = fitCarrierResidual(chosen, phasors, track, 400.7);
      expect(want).toBeDefined();
      const pending = helper.startCarrierResidual(chosen, phasors, track, 400.7);
      expect(pending).toBeDefined();
      expect(pending!()).toEqual(want);
      expect(helper.shared).toBe(1);
      const plain = lines(400_000, false).channels;
      expect(helper.startCarrierResidual([{ samples: plain[0]!, phasorChannel: 0 }], phasors, track, 400.7)).toBeUndefined();
    } finally {
      await helper.close();
    }
  }, 60_000);

  it('fits the carrier residual here, as fitCarrierResidual does (the oracle), when the worker reports a failed job', async () => {
    // A helper that listens but fails every job (as runHelperJob reports a job that throws).
    const dir = mkdtempSync(join(tmpdir(), 'statorscope-residual-'));
    const failing = join(dir, 'failingWorker.js');
    writeFileSync(
      failing,
      [
        "const { parentPort, workerData } = require('node:worker_threads');",
        'Atomics.store(workerData.alive, 0, 1);',
        "parentPort.on('message', (job) => { Atomics.store(job.flag, 0, 2); Atomics.notify(job.flag, 0); });",
      ].join('\n'),
    );
    const helper = new ParallelDemodulator(failing);
    try {
      await started(helper);
      const { channels, track } = lines(400_000, true);
      const phasors = demodulateCycles(channels, track, 400_000);
      const chosen = channels.map((samples, k) => ({ samples, phasorChannel: k }));
      expect(helper.startCarrierResidual(chosen, phasors, track, 400.7)!()).toEqual(fitCarrierResidual(chosen, phasors, track, 400.7));
      expect(helper.shared).toBe(0);
      expect(helper.usable).toBe(false);
    } finally {
      await helper.close();
    }
  }, 60_000);

  it('takes a running parse worker as its helper (asked to listen), and gives demodulateCycles bit for bit (the oracle)', async () => {
    const helper = new ParallelDemodulator(new Worker(PARSE_WORKER));
    try {
      await started(helper);
      expect(helper.usable).toBe(true);
      const { channels, track } = lines(400_000, true);
      expect(helper.demodulate(channels, track, 400_000)).toEqual(demodulateCycles(channels, track, 400_000));
      expect(helper.shared).toBe(1);
    } finally {
      await helper.close();
    }
  }, 60_000);

  it('leaves a worker it was given referenced: its owner may still be waiting for that worker\'s messages (a process left with only an unreferenced worker exits, per Node\'s worker_threads documentation)', async () => {
    // In a process of its own: the owner listens first (as readCaptureFile does), the worker
    // answers late, after the demodulator has taken it.
    const script = [
      "import { Worker } from 'node:worker_threads';",
      "import { ParallelDemodulator } from './app/cli/parallelDemodulator.ts';",
      "const worker = new Worker(\"setTimeout(() => require('node:worker_threads').parentPort.postMessage('late'), 300)\", { eval: true });",
      'let helper;',
      "worker.once('message', (m) => { console.log(m); void helper.close(); });",
      'helper = new ParallelDemodulator(worker);',
    ].join('\n');
    const dir = mkdtempSync(join(tmpdir(), 'statorscope-ref-'));
    const file = join(dir, 'lateWorker.ts');
    writeFileSync(file, script.replace('./app/cli/parallelDemodulator.ts', resolve('app/cli/parallelDemodulator.ts')));
    const { stdout } = await promisify(execFile)(resolve('node_modules/.bin/tsx'), [file]);
    expect(stdout.trim()).toBe('late');
  }, 60_000);

  it('stays on this thread for samples outside shared memory, a short record or a worker that fails', async () => {
    const helper = new ParallelDemodulator(WORKER);
    const dir = mkdtempSync(join(tmpdir(), 'statorscope-demod-'));
    const bad = join(dir, 'badWorker.js');
    writeFileSync(bad, "throw new Error('no worker today');\n");
    const broken = new ParallelDemodulator(bad);
    try {
      await started(helper);
      const plain = lines(200_000, false);
      expect(helper.demodulate(plain.channels, plain.track, 200_000)).toEqual(demodulateCycles(plain.channels, plain.track, 200_000));
      const short = lines(20_000, true);
      expect(helper.demodulate(short.channels, short.track, 20_000)).toEqual(demodulateCycles(short.channels, short.track, 20_000));
      expect(helper.shared).toBe(0);
      await new Promise((r) => setTimeout(r, 300));
      const shared = lines(200_000, true);
      expect(broken.demodulate(shared.channels, shared.track, 200_000)).toEqual(demodulateCycles(shared.channels, shared.track, 200_000));
      expect(broken.startCarrierResidual([{ samples: shared.channels[0]!, phasorChannel: 0 }], demodulateCycles(shared.channels, shared.track, 200_000), shared.track, 400.7)).toBeUndefined();
      expect(broken.shared).toBe(0);
    } finally {
      await helper.close();
      await broken.close();
    }
  }, 60_000);
});
