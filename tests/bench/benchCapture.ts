/**
 * Seeded benchmark captures: a 26 V / 11.8 V synchro turning at 30°/s, R1-R2 plus three lines,
 * 1 MS/s at 400 Hz (or another carrier: 10 kHz gives 25 times the cycles of the same rows),
 * 12-bit, written once per size and carrier to a temporary folder and reused.
 */
import { createWriteStream, existsSync, mkdirSync, renameSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { once } from 'node:events';
import { CSV_LAYOUTS, formatCaptureCsv } from '../../core/synth/formatCaptureCsv.js';
import { synthesizeCapture } from '../../core/synth/synthesizeCapture.js';

export const BENCH_SAMPLE_RATE_HZ = 1_000_000;

export function benchFolder(): string {
  const folder = join(tmpdir(), 'statorscope-bench');
  mkdirSync(folder, { recursive: true });
  return folder;
}

/** Path of the benchmark CSV with `rows` rows at `carrierHz`, generating it on first use. */
export async function benchCapturePath(rows: number, carrierHz = 400): Promise<string> {
  const path = join(benchFolder(), carrierHz === 400 ? `synchro-${rows}.csv` : `synchro-${rows}-${carrierHz}hz.csv`);
  if (existsSync(path) && statSync(path).size > 0) return path;
  const syn = synthesizeCapture({
    seed: 1057,
    sampleRateHz: BENCH_SAMPLE_RATE_HZ,
    durationS: rows / BENCH_SAMPLE_RATE_HZ,
    carrier: { frequencyHz: carrierHz, rmsV: 26, phaseDeg: 10 },
    units: [{ kind: 'synchro', transformationRatio: 0.4538, phaseLeadDeg: 8, motion: { type: 'ramp', startDeg: 0, degPerS: 30 }, lines: [{ role: 's1s3' }, { role: 's3s2' }, { role: 's2s1' }] }],
    noiseV: 0.01,
    quantization: { bits: 12 },
  });
  const temp = `${path}.tmp`;
  const out = createWriteStream(temp);
  const layout = { ...CSV_LAYOUTS.plain!, valueDigits: 5, timeDigits: 8 };
  const channels = syn.capture.channels.map((c) => ({ label: c.label, samples: c.samples }));
  for (const chunk of formatCaptureCsv({ sampleRateHz: BENCH_SAMPLE_RATE_HZ, startS: 0, channels }, layout, 20_000)) {
    if (!out.write(chunk)) await once(out, 'drain');
  }
  out.end();
  await once(out, 'finish');
  renameSync(temp, path);
  return path;
}
