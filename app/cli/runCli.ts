import { stat } from 'node:fs/promises';
import { basename, join, resolve } from 'node:path';
import { anglesToCsv, CaptureError, formatSummary, renderHtmlReport } from '../../core/index.js';
import { analysisJsonText, analyzeFile, analyzeOptionsOf, FileCaptureError } from './analyzeFile.js';
import { describeIoError } from './describeIoError.js';
import { parseCliArgs, USAGE, UsageError, type AnalyzeCommand } from './parseCliArgs.js';
import { runBatch, SUMMARY_FILE } from './runBatch.js';
import { writeFileAtomic } from './writeFileAtomic.js';

export interface CliIo {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  readonly version: string;
  /** Whether stderr is a terminal (batch progress is shown only then). */
  readonly stderrIsTty?: boolean;
}

/** Runs one CLI invocation; returns the exit code (0 ok, 1 input unusable or unreadable, 2 usage, 3 internal). */
export async function runCli(argv: readonly string[], io: CliIo): Promise<number> {
  try {
    const command = parseCliArgs(argv);
    if (command.command === 'help') {
      io.stdout(`${USAGE}\n`);
      return 0;
    }
    if (command.command === 'version') {
      io.stdout(`statorscope ${io.version}\n`);
      return 0;
    }
    if (command.out !== undefined) return await batch(command, command.out, io);
    await analyzeOne(command, io);
    return 0;
  } catch (error) {
    if (error instanceof UsageError) {
      io.stderr(`statorscope: ${error.message}\n`);
      return 2;
    }
    if (error instanceof FileCaptureError || error instanceof CaptureError) {
      io.stderr(`statorscope: ${error.message}\n`);
      return 1;
    }
    const code = (error as NodeJS.ErrnoException).code;
    if (typeof code === 'string') {
      io.stderr(`statorscope: ${describeIoError(error as NodeJS.ErrnoException)}\n`);
      return 1;
    }
    io.stderr(`statorscope: internal error (${(error as Error).message}); please report it with the capture\n`);
    return 3;
  }
}

async function analyzeOne(command: AnalyzeCommand, io: CliIo): Promise<void> {
  const file = command.files[0]!;
  const input = resolve(file);
  if ((await stat(input).catch(() => undefined))?.isDirectory()) {
    throw new UsageError(`${file} is a folder: add --out <folder> to analyse every capture in it`);
  }
  for (const out of [command.json, command.angles, command.report]) {
    if (out !== undefined && out !== '-' && resolve(out) === input) {
      throw new UsageError(`refusing to write over the capture file ${file}; choose another output name`);
    }
  }
  const analysis = await analyzeFile(input, file, analyzeOptionsOf(command));
  const meta = { file: basename(file), version: io.version };
  if (command.angles !== undefined) await writeFileAtomic(command.angles, anglesToCsv(analysis));
  if (command.report !== undefined) await writeFileAtomic(command.report, renderHtmlReport(analysis, meta));
  if (command.json !== undefined) {
    const text = analysisJsonText(analysis, file, io.version);
    if (command.json === '-') io.stdout(text);
    else await writeFileAtomic(command.json, text);
  } else {
    io.stdout(formatSummary(analysis, meta));
  }
}

async function batch(command: AnalyzeCommand, out: string, io: CliIo): Promise<number> {
  const outcome = await runBatch(command.files, out, analyzeOptionsOf(command), command.jobs, {
    stdout: io.stdout,
    stderr: io.stderr,
    stderrIsTty: io.stderrIsTty ?? false,
    version: io.version,
  });
  const total = outcome.rows.length;
  const ok = total - outcome.failed;
  io.stdout(
    `${ok} of ${total} capture${total === 1 ? '' : 's'} analysed on ${outcome.workers} worker${outcome.workers === 1 ? '' : 's'}` +
      `${outcome.failed ? `, ${outcome.failed} failed` : ''}; summary in ${join(out, SUMMARY_FILE)}\n`,
  );
  for (const row of outcome.rows) if (row.status === 'failed') io.stderr(`statorscope: ${row.error}\n`);
  if (outcome.internal) return 3;
  return outcome.failed > 0 ? 1 : 0;
}
