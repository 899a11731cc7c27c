/**
 * npm run bench [-- --max-rows N] [-- --repeat N] [-- --no-anchor] [-- --no-batch] [-- --no-high-carrier]: bundled with esbuild (so the
 * timings are the code users run, not a transpile-on-load loader), times each pipeline stage and
 * the CLI end to end on seeded captures of 10^4 to 10^7 rows x 4 channels (the largest again at
 * a 10 kHz carrier: long records at a high carrier have 25 times the cycles), runs the pandas +
 * numpy yardstick (tests/bench/pandasAnchor.py under /usr/bin/python3) on the same files in the
 * same run (each tool --repeat times, default 3, alternating; medians reported), the reader on one
 * thread in a fresh process each time (oneCoreImport.ts) and a bare byte-level parser
 * (bareParser.ts, the machine's speed today) for MB/s, and a
 * 100-file batch on one worker and on all cores. Prints tables and writes
 * bench-results/bench.json. Not part of npm test: these are measurements, not checks.
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { availableParallelism, cpus, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { readCaptureFile } from '../../app/cli/readCaptureFile.js';
import { sinCosFromLines } from '../../core/angle/sinCosFromLines.js';
import { solveAngle } from '../../core/angle/solveAngle.js';
import { trackCarrier } from '../../core/carrier/trackCarrier.js';
import { demodulateCycles } from '../../core/demod/demodulateCycles.js';
import { clippedFraction } from '../../core/diagnostics/clippedFraction.js';
import { analyzeCapture } from '../../core/pipeline.js';
import { bareColumnCount, bareParse } from './bareParser.js';
import { benchCapturePath, benchFolder } from './benchCapture.js';

const PYTHON = '/usr/bin/python3';
const ANCHOR = 'tests/bench/pandasAnchor.py';
const CLI = 'dist/cli/statorscope.js';
const ONE_CORE = 'dist/bench/oneCoreImport.js';

interface Run {
  wallS: number;
  peakRssMB: number;
  stdout: string;
}

interface Row {
  rows: number;
  /** Carrier of the capture, hertz (400, or 10 000 for the long-record, high-carrier case). */
  carrierHz: number;
  fileMB: number;
  importS: number;
  importMBps: number;
  /** The same reader held to one thread (no parse worker), in a fresh process: median of the repeats. */
  oneCoreImportMBps: number;
  /** Each of those reads, MB/s, in order. */
  oneCoreRunsMBps: number[];
  /** bareParser.ts on the file's bytes already in memory: what this machine does at best today. */
  bareParserMBps: number;
  carrierS: number;
  demodS: number;
  demodSamplesPerS: number;
  angleS: number;
  diagnosticsS: number;
  analyzeS: number;
  cliWallS: number;
  cliPeakRssMB: number;
  anchorWallS: number | null;
  anchorPeakRssMB: number | null;
  anchorImportS: number | null;
  /** Runs of each tool (alternating CLI, pandas, CLI, ...); the wall and RSS figures are medians. */
  repeats: number;
  cliWallsS: number[];
  anchorWallsS: number[] | null;
  wallRatio: number | null;
  memoryRatio: number | null;
}

/** Runs a command under GNU time, which reports the child's peak resident set (kB). */
function timed(command: string, args: string[]): Run {
  const started = performance.now();
  const result = spawnSync('/usr/bin/time', ['-f', 'peak-rss-kb %M', command, ...args], { encoding: 'utf8', maxBuffer: 64 << 20 });
  const wallS = (performance.now() - started) / 1000;
  if (result.status !== 0) throw new Error(`${command} ${args.join(' ')} failed (${result.status}): ${result.stderr}`);
  const kb = Number(/peak-rss-kb (\d+)/.exec(result.stderr)?.[1]);
  return { wallS, peakRssMB: kb / 1024, stdout: result.stdout };
}

function anchorAvailable(): boolean {
  return spawnSync(PYTHON, ['-c', 'import pandas, numpy'], { encoding: 'utf8' }).status === 0;
}

function median(values: number[]): number {
  const v = [...values].sort((a, b) => a - b);
  const m = v.length >> 1;
  return v.length % 2 ? v[m]! : (v[m - 1]! + v[m]!) / 2;
}

/** Median MB/s of `repeats` runs of the bare parser on the file's bytes. */
function measureBareParser(path: string, rows: number, fileMB: number, repeats: number): number {
  const bare: number[] = [];
  const bytes = readFileSync(path);
  const columns = Array.from({ length: bareColumnCount(bytes) }, () => new Float32Array(rows));
  for (let i = 0; i < repeats; i++) {
    const t = performance.now();
    const bareRows = bareParse(bytes, columns);
    bare.push(fileMB / ((performance.now() - t) / 1000));
    if (bareRows !== rows) throw new Error(`bare parser read ${bareRows} rows, expected ${rows}`);
  }
  return median(bare);
}

/**
 * MB/s of one one-thread read of the file in a fresh process (oneCoreImport.ts), as a user's
 * process reads it. Measured in this process at first, it swung between 306 and 443 MB/s from
 * run to run and even within one run (306, 307, 372, 399, 416 in order), while fresh processes
 * read the same file at 405-420 MB/s: this process grows past 1 GB, and on this machine (a VM)
 * the first touch of memory the guest has not used lately is several times slower (1 GiB: 1.9 s
 * in a fresh process, then 0.36 s in the next ones; all measured).
 */
function oneCoreImportMBps(path: string, rows: number, fileMB: number): number {
  const run = timed(process.execPath, [ONE_CORE, path]);
  const out = JSON.parse(run.stdout) as { importS: number; rows: number };
  if (out.rows !== rows) throw new Error(`one-thread read gave ${out.rows} rows, expected ${rows}`);
  return fileMB / out.importS;
}

async function measure(rows: number, withAnchor: boolean, repeats: number, carrierHz = 400): Promise<Row> {
  const path = await benchCapturePath(rows, carrierHz);
  const fileMB = statSync(path).size / 1e6;
  const jsonOut = join(benchFolder(), `out-${rows}-${carrierHz}.json`);

  let t = performance.now();
  // The CLI's own reader, with the CLI's bundled parse worker (the bench bundle lives elsewhere).
  const { capture } = await readCaptureFile(path, {}, { workerScript: join(process.cwd(), 'dist', 'cli', 'parseWorker.js') });
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

  // The per-sample diagnostics the pipeline runs today (clipping scan of every channel).
  t = performance.now();
  const spc = capture.sampleRateHz / carrier.frequencyHz;
  let clipped = 0;
  for (const c of capture.channels) clipped += clippedFraction(c.samples, capture.sampleCount, spc);
  const diagnosticsS = (performance.now() - t) / 1000;
  if (!(clipped >= 0)) throw new Error('clipped fraction is not a number');

  t = performance.now();
  analyzeCapture(capture);
  const analyzeS = (performance.now() - t) / 1000;

  const bareMBps = measureBareParser(path, rows, fileMB, repeats);

  // The tools alternate, so a change in the machine's load hits them alike.
  const cliRuns: Run[] = [];
  const anchorRuns: Run[] = [];
  const oneCoreRuns: number[] = [];
  for (let i = 0; i < repeats; i++) {
    cliRuns.push(timed(process.execPath, [CLI, 'analyze', path, '--json', jsonOut]));
    rmSync(jsonOut, { force: true });
    if (withAnchor) anchorRuns.push(timed(PYTHON, [ANCHOR, path]));
    oneCoreRuns.push(oneCoreImportMBps(path, rows, fileMB));
  }
  const cli = { wallS: median(cliRuns.map((r) => r.wallS)), peakRssMB: median(cliRuns.map((r) => r.peakRssMB)) };
  const anchor = withAnchor ? { wallS: median(anchorRuns.map((r) => r.wallS)), peakRssMB: median(anchorRuns.map((r) => r.peakRssMB)) } : undefined;
  const anchorImportS = withAnchor ? median(anchorRuns.map((r) => (JSON.parse(r.stdout) as { importS: number }).importS)) : null;
  return {
    rows,
    carrierHz,
    fileMB,
    importS,
    importMBps: fileMB / importS,
    oneCoreImportMBps: median(oneCoreRuns),
    oneCoreRunsMBps: oneCoreRuns,
    bareParserMBps: bareMBps,
    carrierS,
    demodS,
    demodSamplesPerS: (rows * capture.channels.length) / demodS,
    angleS,
    diagnosticsS,
    analyzeS,
    cliWallS: cli.wallS,
    cliPeakRssMB: cli.peakRssMB,
    anchorWallS: anchor?.wallS ?? null,
    anchorPeakRssMB: anchor?.peakRssMB ?? null,
    anchorImportS,
    repeats,
    cliWallsS: cliRuns.map((r) => r.wallS),
    anchorWallsS: withAnchor ? anchorRuns.map((r) => r.wallS) : null,
    wallRatio: anchor ? cli.wallS / anchor.wallS : null,
    memoryRatio: anchor ? cli.peakRssMB / anchor.peakRssMB : null,
  };
}

interface BatchRow {
  files: number;
  rowsEach: number;
  jobs: number;
  wallS: number;
  peakRssMB: number;
  capturesPerS: number;
}

/** 100 copies of the 10^5-row capture through `analyze <folder> --out`, on 1 worker and on all cores. */
async function measureBatch(): Promise<BatchRow[]> {
  const source = await benchCapturePath(100_000);
  const folder = join(tmpdir(), 'statorscope-bench-batch');
  const inputs = join(folder, 'in');
  mkdirSync(inputs, { recursive: true });
  for (let i = 0; i < 100; i++) {
    const target = join(inputs, `capture-${String(i).padStart(3, '0')}.csv`);
    if (!existsSync(target)) copyFileSync(source, target);
  }
  const out: BatchRow[] = [];
  for (const jobs of [...new Set([1, availableParallelism()])]) {
    const outDir = join(folder, `out-${jobs}`);
    rmSync(outDir, { recursive: true, force: true });
    const run = timed(process.execPath, [CLI, 'analyze', inputs, '--out', outDir, '--jobs', String(jobs)]);
    out.push({ files: 100, rowsEach: 100_000, jobs, wallS: run.wallS, peakRssMB: run.peakRssMB, capturesPerS: 100 / run.wallS });
  }
  return out;
}

function arg(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i > 0 ? process.argv[i + 1] : undefined;
}

async function main(): Promise<void> {
  const maxRows = Number(arg('--max-rows') ?? 10_000_000);
  const repeats = Number(arg('--repeat') ?? 3);
  if (!(Number.isInteger(repeats) && repeats >= 1)) throw new Error(`--repeat must be a whole number of runs (1 or more), not ${arg('--repeat')}`);
  const withAnchor = !process.argv.includes('--no-anchor') && anchorAvailable();
  if (!process.argv.includes('--no-anchor') && !withAnchor) {
    process.stderr.write(`bench: ${PYTHON} cannot import pandas and numpy (apt-get install -y python3-pandas python3-numpy); running without the yardstick\n`);
  }
  const build = spawnSync(process.execPath, ['app/build.mjs'], { stdio: 'inherit' });
  if (build.status !== 0) throw new Error('build failed');
  const results: Row[] = [];
  for (const rows of [10_000, 100_000, 1_000_000, 10_000_000].filter((r) => r <= maxRows)) {
    results.push(await measure(rows, withAnchor, repeats));
    printTable(results);
  }
  // Long records at a high carrier: the same rows with 25 times the carrier cycles (per-cycle work).
  if (maxRows >= 10_000_000 && !process.argv.includes('--no-high-carrier')) {
    results.push(await measure(10_000_000, withAnchor, repeats, 10_000));
    printTable(results);
  }
  const batch = process.argv.includes('--no-batch') ? [] : await measureBatch();
  if (batch.length) printBatch(batch);
  mkdirSync('bench-results', { recursive: true });
  const machine = { node: process.version, cpus: cpus().length, cpuModel: cpus()[0]?.model ?? '' };
  writeFileSync(join('bench-results', 'bench.json'), `${JSON.stringify({ ...machine, date: new Date().toISOString(), results, batch }, null, 1)}\n`);
}

function printTable(results: Row[]): void {
  const f = (v: number | null, d: number, w: number): string => (v === null ? '-' : v.toFixed(d)).padStart(w);
  const header =
    'rows            file MB  import s  MB/s  1-core MB/s  bare MB/s  carrier s  demod s  Msamp/s  angle s  diag s  analyze s | CLI wall s  RSS MB | pandas wall s  RSS MB  (import s) | wall ratio  RSS ratio';
  const lines = results.map((r) =>
    [
      `${r.rows}${r.carrierHz === 400 ? '' : ` @${r.carrierHz / 1000}k`}`.padEnd(14),
      f(r.fileMB, 1, 8),
      f(r.importS, 3, 9),
      f(r.importMBps, 0, 5),
      f(r.oneCoreImportMBps, 0, 12),
      f(r.bareParserMBps, 0, 10),
      f(r.carrierS, 3, 10),
      f(r.demodS, 3, 8),
      f(r.demodSamplesPerS / 1e6, 0, 8),
      f(r.angleS, 3, 8),
      f(r.diagnosticsS, 3, 7),
      f(r.analyzeS, 3, 10),
      '|',
      f(r.cliWallS, 3, 10),
      f(r.cliPeakRssMB, 0, 7),
      '|',
      f(r.anchorWallS, 3, 13),
      f(r.anchorPeakRssMB, 0, 7),
      `(${f(r.anchorImportS, 3, 7)})`.padStart(11),
      '|',
      f(r.wallRatio, 3, 10),
      f(r.memoryRatio, 3, 10),
    ].join(' '),
  );
  process.stdout.write(`\n${header}\n${lines.join('\n')}\n`);
}

function printBatch(rows: BatchRow[]): void {
  process.stdout.write('\nbatch: files x rows     jobs  wall s  peak RSS MB  captures/s\n');
  for (const r of rows) {
    process.stdout.write(`       ${r.files} x ${r.rowsEach}  ${String(r.jobs).padStart(5)}  ${r.wallS.toFixed(2).padStart(6)}  ${r.peakRssMB.toFixed(0).padStart(11)}  ${r.capturesPerS.toFixed(1).padStart(10)}\n`);
  }
}

void main().catch((error: unknown) => {
  process.stderr.write(`bench: ${(error as Error).message}\n`);
  process.exitCode = 1;
});
