import { availableParallelism } from 'node:os';
import { basename } from 'node:path';
import { isMainThread, type Worker } from 'node:worker_threads';
import { analysisToJson, analyzeCapture, CaptureError, type Analysis, type AnalyzeOptions, type Finding } from '../../core/index.js';
import { captureMemoryLimitBytes, checkCaptureFits, estimateCaptureSize } from './captureMemory.js';
import type { AnalyzeCommand } from './parseCliArgs.js';
import { ParallelDemodulator, sharedSamples } from './parallelDemodulator.js';
import { readCaptureFile, SPLIT_MIN_BYTES } from './readCaptureFile.js';

/** A capture that cannot be analysed, already phrased with its file and location: exit code 1. */
export class FileCaptureError extends Error {}

/** What analyzeCapture receives from the command line. */
export function analyzeOptionsOf(command: Pick<AnalyzeCommand, 'roles' | 'kind' | 'analysis'>): AnalyzeOptions {
  return {
    ...(command.roles ? { overrides: command.roles } : {}),
    ...(command.kind ? { kind: command.kind } : {}),
    ...command.analysis,
  };
}

/**
 * Imports and analyses one capture file, refusing it before reading when its estimated size
 * exceeds the memory share `workers` leave it; the import findings come first.
 */
export async function analyzeFile(path: string, displayName: string, options: AnalyzeOptions, workers = 1): Promise<Analysis> {
  const estimate = await estimateCaptureSize(path);
  const fits = checkCaptureFits(displayName, estimate, captureMemoryLimitBytes(workers));
  if (!fits.ok) throw new FileCaptureError(fits.message);
  // A large capture read on the main thread with a second core: its samples go to shared memory
  // and the demodulation is split over two threads. After a two-thread parse the parse worker
  // stays on as the helper (no second start-up); after a one-thread read a worker starts then,
  // while the analysis finds the carrier.
  const shared = estimate.fileBytes >= SPLIT_MIN_BYTES && isMainThread && availableParallelism() >= 2;
  let helper: ParallelDemodulator | undefined;
  const keepParseWorker = (parseWorker: Worker): boolean => {
    helper ??= new ParallelDemodulator(parseWorker);
    return true;
  };
  try {
    const imported = await readCaptureFile(
      path,
      { maxSamples: fits.maxSamples, sizeHintBytes: estimate.fileBytes, ...(shared ? { allocateSamples: sharedSamples } : {}) },
      shared ? { onHeadParsed: keepParseWorker } : {},
    );
    if (shared) helper ??= new ParallelDemodulator();
    const analysis = analyzeCapture(imported.capture, options, helper ? { demodulate: helper.demodulate, startCarrierResidual: helper.startCarrierResidual } : {});
    return { ...analysis, findings: [...imported.findings, ...analysis.findings] as Finding[] };
  } catch (error) {
    if (error instanceof CaptureError) throw new FileCaptureError(error.describeIn(displayName));
    throw error;
  } finally {
    if (helper) void helper.close();
  }
}

/** The JSON document written for one capture (schema statorscope.analysis/1). */
export function analysisJsonText(analysis: Analysis, file: string, version: string): string {
  return `${JSON.stringify(analysisToJson(analysis, { file: basename(file), version }), null, 1)}\n`;
}
