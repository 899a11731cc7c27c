/**
 * Worker thread for batch runs (bundled to dist/cli/analysisWorker.js): analyses one capture per
 * message, writes its JSON into the output folder and answers with the summary row. The analysis
 * itself never crosses threads; only the small row does.
 */
import { parentPort } from 'node:worker_threads';
import type { AnalyzeOptions } from '../../core/index.js';
import { analysisJsonText, analyzeFile, FileCaptureError } from './analyzeFile.js';
import { describeIoError } from './describeIoError.js';
import { failedSummaryRow, summaryRowFromJson, type SummaryRow } from './summaryCsv.js';
import { writeFileAtomic } from './writeFileAtomic.js';

export interface BatchJob {
  readonly id: number;
  readonly path: string;
  readonly file: string;
  readonly jsonPath: string;
  readonly jsonName: string;
  readonly options: AnalyzeOptions;
  readonly version: string;
  readonly workers: number;
}

export interface BatchResult {
  readonly id: number;
  readonly row: SummaryRow;
  /** True for an unexpected error (a bug), as opposed to a capture that cannot be analysed. */
  readonly internal: boolean;
}

/** Runs one job; never throws. */
export async function runBatchJob(job: BatchJob): Promise<BatchResult> {
  try {
    const analysis = await analyzeFile(job.path, job.file, job.options, job.workers);
    const text = analysisJsonText(analysis, job.file, job.version);
    await writeFileAtomic(job.jsonPath, text);
    return { id: job.id, row: summaryRowFromJson(job.file, job.jsonName, JSON.parse(text) as Record<string, unknown>), internal: false };
  } catch (error) {
    if (error instanceof FileCaptureError) return { id: job.id, row: failedSummaryRow(job.file, error.message), internal: false };
    const code = (error as NodeJS.ErrnoException).code;
    if (typeof code === 'string') return { id: job.id, row: failedSummaryRow(job.file, describeIoError(error as NodeJS.ErrnoException)), internal: false };
    return { id: job.id, row: failedSummaryRow(job.file, `internal error (${(error as Error).message}); please report it with the capture`), internal: true };
  }
}

if (parentPort) {
  const port = parentPort;
  port.on('message', (job: BatchJob) => {
    void runBatchJob(job).then((result) => port.postMessage(result));
  });
}
