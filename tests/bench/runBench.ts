/**
 * npm run bench [-- --max-rows N]: times each pipeline stage and the CLI end to end on seeded
 * captures of 10^4 to 10^7 rows x 4 channels, prints a table and writes bench-results/bench.json.
 * Not part of npm test: these are measurements, not checks.
 */
import { spawnSync } from 'node:child_process';
import { createReadStream, mkdirSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { sinCosFromLines } from '../../core/angle/sinCosFromLines.js';
import { solveAngle } from '../../core/angle/solveAngle.js';
import { trackCarrier } from '../../core/carrier/trackCarrier.js';
import { demodulateCycles } from '../../core/demod/demodulateCycles.js';
import { createCaptureParser } from '../../core/import/captureParser.js';
import { analyzeCapture } from '../../core/pipeline.js';
import { benchCapturePath } from './benchCapture.js';

interface Row {
  rows: number;
  fileMB: number;
  importS: number;
  importMBps: number;
  carrierS: number;
  demodS: number;
  demodSamplesPerS: number;
  angleS: number;
  analyzeS: number;
  cliWallS: number;
  cliPeakRssMB: number;
}

async function importFile(path: string) {
  const parser = createCaptureParser();
  for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) parser.push(chunk as Buffer);
  return parser.finish();
}

function cliRun(path: string): { wallS: number; peakRssMB: number } {
  // GNU time reports the child's peak resident set (kB) on its own line.
  const started = performance.now();
  const result = spawnSync('/usr/bin/time', ['-f', 'peak-rss-kb %M', process.execPath, 'dist/cli/statorscope.js', 'analyze', path, '--json', '/dev/null'], { encoding: 'utf8' });
  const wallS = (performance.now() - started) / 1000;
  if (result.status !== 0) throw new Error(`CLI failed: ${result.stderr}`);
  const kb = Number(/peak-rss-kb (\d+)/.exec(result.stderr)?.[1]);
  return { wallS, peakRssMB: kb / 1024 };
}

async function main(): Promise<void> {
  const maxIndex = process.argv.indexOf('--max-rows');
  const maxRows = maxIndex > 0 ? Number(process.argv[maxIndex + 1]) : 10_000_000;
  spawnSync(process.execPath, ['app/build.mjs'], { stdio: 'inherit' });
  const results: Row[] = [];
  for (const rows of [10_000, 100_000, 1_000_000, 10_000_000].filter((r) => r <= maxRows)) {
    const path = await benchCapturePath(rows);
    const fileMB = statSync(path).size / 1e6;
    let t = performance.now();
    const { capture } = await importFile(path);
    const importS = (performance.now() - t) / 1000;
    if (capture.sampleCount !== rows) throw new Error(`imported ${capture.sampleCount} rows, expected ${rows}`);

    t = performance.now();
    const carrier = trackCarrier([capture.channels[0]!.samples], 'reference', capture.sampleRateHz, capture.sampleCount, ['ref']);
    const carrierS = (performance.now() - t) / 1000;

    t = performance.now();
    const phasors = demodulateCycles(capture.channels.map((c) => c.samples), carrier.track, capture.sampleCount);
    const demodS = (performance.now() - t) / 1000;

    t = performance.now();
    const sc = sinCosFromLines({ kind: 'synchro', lines: [{ base: 's1s3', channel: 1 }, { base: 's3s2', channel: 2 }, { base: 's2s1', channel: 3 }] }, phasors)!;
    const angle = solveAngle(sc, phasors, capture.sampleRateHz);
    const angleS = (performance.now() - t) / 1000;
    if (!Number.isFinite(angle.deg[angle.deg.length >> 1]!)) throw new Error('angle is not finite'); // sanity check

    t = performance.now();
    analyzeCapture(capture);
    const analyzeS = (performance.now() - t) / 1000;

    const cli = cliRun(path);
    results.push({
      rows,
      fileMB,
      importS,
      importMBps: fileMB / importS,
      carrierS,
      demodS,
      demodSamplesPerS: (rows * capture.channels.length) / demodS,
      angleS,
      analyzeS,
      cliWallS: cli.wallS,
      cliPeakRssMB: cli.peakRssMB,
    });
    printTable(results);
  }
  mkdirSync('bench-results', { recursive: true });
  writeFileSync(join('bench-results', 'bench.json'), `${JSON.stringify({ node: process.version, results }, null, 1)}\n`);
}

function printTable(results: Row[]): void {
  const header = 'rows        file MB  import s  import MB/s  carrier s  demod s  demod Msamples/s  angle s  analyze s  CLI wall s  CLI peak RSS MB';
  const lines = results.map((r) =>
    [
      String(r.rows).padEnd(10),
      r.fileMB.toFixed(1).padStart(8),
      r.importS.toFixed(3).padStart(9),
      r.importMBps.toFixed(0).padStart(12),
      r.carrierS.toFixed(3).padStart(10),
      r.demodS.toFixed(3).padStart(8),
      (r.demodSamplesPerS / 1e6).toFixed(0).padStart(17),
      r.angleS.toFixed(3).padStart(8),
      r.analyzeS.toFixed(3).padStart(10),
      r.cliWallS.toFixed(3).padStart(11),
      r.cliPeakRssMB.toFixed(0).padStart(16),
    ].join(' '),
  );
  process.stdout.write(`\n${header}\n${lines.join('\n')}\n`);
}

void main();
