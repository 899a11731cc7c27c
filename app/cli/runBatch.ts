import { mkdir, readdir, stat } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { basename, extname, join, resolve } from 'node:path';
import { Worker } from 'node:worker_threads';
import type { AnalyzeOptions } from '../../core/index.js';
import type { BatchJob, BatchResult } from './analysisWorker.js';
import { FileCaptureError } from './analyzeFile.js';
import { UsageError } from './parseCliArgs.js';
import { failedSummaryRow, formatSummaryCsv, type SummaryRow } from './summaryCsv.js';
import { writeFileAtomic } from './writeFileAtomic.js';

export const SUMMARY_FILE = 'summary.csv';

export interface BatchIo {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  /** Progress lines go to stderr only when it is a terminal. */
  readonly stderrIsTty: boolean;
  readonly version: string;
}

export interface BatchOutcome {
  readonly rows: SummaryRow[];
  readonly failed: number;
  readonly internal: boolean;
  readonly workers: number;
}

/** Expands folders to their *.csv files (sorted, not recursive); other names are kept as given. */
export async function listCaptures(inputs: readonly string[]): Promise<string[]> {
  const files: string[] = [];
  for (const input of inputs) {
    const info = await stat(input).catch(() => undefined);
    if (info?.isDirectory()) {
      const names = (await readdir(input)).filter((n) => extname(n).toLowerCase() === '.csv').sort();
      files.push(...names.map((n) => join(input, n)));
    } else files.push(input);
  }
  return files;
}

/** Output JSON names: <capture>.json, with -2, -3 ... where two captures share a name. */
export function jsonNames(files: readonly string[]): string[] {
  const used = new Set<string>([SUMMARY_FILE.toLowerCase()]);
  return files.map((f) => {
    const stem = basename(f, extname(f)) || 'capture';
    let name = `${stem}.json`;
    for (let k = 2; used.has(name.toLowerCase()); k++) name = `${stem}-${k}.json`;
    used.add(name.toLowerCase());
    return name;
  });
}

/**
 * Batch mode: analyses every capture on a pool of worker threads (one capture per worker at a
 * time), writes <capture>.json per capture and summary.csv into `out`, and keeps going past
 * captures that fail (they get a row with the reason). A worker that dies is replaced.
 */
export async function runBatch(
  inputs: readonly string[],
  out: string,
  options: AnalyzeOptions,
  requestedJobs: number | undefined,
  io: BatchIo,
  workerScript = join(__dirname, 'analysisWorker.js'),
): Promise<BatchOutcome> {
  const files = await listCaptures(inputs);
  if (files.length === 0) throw new FileCaptureError(`no .csv captures found in ${inputs.join(', ')}`);
  const outDir = resolve(out);
  const summaryPath = join(outDir, SUMMARY_FILE);
  if (files.some((f) => resolve(f) === summaryPath)) {
    throw new UsageError(`refusing to write ${SUMMARY_FILE} over a capture in ${out}; choose another --out folder`);
  }
  await mkdir(outDir, { recursive: true });
  const names = jsonNames(files);
  const workers = Math.max(1, Math.min(requestedJobs ?? availableParallelism(), files.length));
  const jobs: BatchJob[] = files.map((file, id) => ({
    id,
    path: resolve(file),
    file,
    jsonPath: join(outDir, names[id]!),
    jsonName: names[id]!,
    options,
    version: io.version,
    workers,
  }));

  const rows = new Array<SummaryRow>(files.length);
  let done = 0;
  let failed = 0;
  let internal = false;
  const progress = (current: string): void => {
    if (!io.stderrIsTty) return;
    io.stderr(`\r\x1b[K[${done}/${files.length}]${failed ? ` ${failed} failed,` : ''} ${current}`);
  };
  const record = (result: BatchResult): void => {
    rows[result.id] = result.row;
    done++;
    if (result.row.status === 'failed') failed++;
    if (result.internal) internal = true;
    progress(`${basename(result.row.file)} ${result.row.status}`);
  };

  let next = 0;
  const runLane = (): Promise<void> =>
    new Promise<void>((resolveLane) => {
      let worker: Worker | undefined;
      let current: BatchJob | undefined;
      const start = (): void => {
        worker = new Worker(workerScript);
        worker.on('message', (result: BatchResult) => {
          current = undefined;
          record(result);
          feed();
        });
        worker.on('error', (error: Error) => {
          if (current) record({ id: current.id, row: failedSummaryRow(current.file, `the analysis stopped: ${error.message}`), internal: true });
          current = undefined;
        });
        worker.on('exit', () => {
          worker = undefined;
          if (current) {
            record({ id: current.id, row: failedSummaryRow(current.file, 'the analysis worker stopped unexpectedly'), internal: true });
            current = undefined;
          }
          if (next < jobs.length) {
            start();
            feed();
          } else resolveLane();
        });
      };
      const feed = (): void => {
        if (!worker) return;
        if (next >= jobs.length) {
          void worker.terminate();
          return;
        }
        current = jobs[next++]!;
        progress(basename(current.file));
        worker.postMessage(current);
      };
      start();
      feed();
    });
  await Promise.all(Array.from({ length: workers }, runLane));
  if (io.stderrIsTty) io.stderr('\r\x1b[K');
  await writeFileAtomic(summaryPath, formatSummaryCsv(rows));
  return { rows, failed, internal, workers };
}
