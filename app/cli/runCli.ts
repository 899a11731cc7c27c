import { resolve } from 'node:path';
import { basename } from 'node:path';
import {
  analysisToJson,
  analyzeCapture,
  anglesToCsv,
  CaptureError,
  formatSummary,
  renderHtmlReport,
  type Analysis,
  type Finding,
} from '../../core/index.js';
import { parseCliArgs, USAGE, UsageError, type AnalyzeCommand } from './parseCliArgs.js';
import { readCaptureFile } from './readCaptureFile.js';
import { writeFileAtomic } from './writeFileAtomic.js';

/** A CaptureError already phrased with its file and location. */
class FileCaptureError extends Error {}

export interface CliIo {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  readonly version: string;
}

/** Runs one CLI invocation; returns the exit code (0 ok, 1 input unusable or unreadable, 2 usage). */
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
    await analyze(command, io);
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

async function analyze(command: AnalyzeCommand, io: CliIo): Promise<void> {
  const file = command.files[0]!;
  const input = resolve(file);
  for (const out of [command.json, command.angles, command.report]) {
    if (out !== undefined && out !== '-' && resolve(out) === input) {
      throw new UsageError(`refusing to write over the capture file ${file}; choose another output name`);
    }
  }
  let imported;
  let analysis: Analysis;
  try {
    imported = await readCaptureFile(input);
    analysis = analyzeCapture(imported.capture, {
      ...(command.roles ? { overrides: command.roles } : {}),
      ...(command.kind ? { kind: command.kind } : {}),
    });
  } catch (error) {
    if (error instanceof CaptureError) throw new FileCaptureError(error.describeIn(file));
    throw error;
  }
  const withImport: Analysis = { ...analysis, findings: [...imported.findings, ...analysis.findings] as Finding[] };
  const meta = { file: basename(file), version: io.version };

  if (command.angles !== undefined) await writeFileAtomic(command.angles, anglesToCsv(withImport));
  if (command.report !== undefined) await writeFileAtomic(command.report, renderHtmlReport(withImport, meta));
  if (command.json !== undefined) {
    const text = `${JSON.stringify(analysisToJson(withImport, meta), null, 1)}\n`;
    if (command.json === '-') io.stdout(text);
    else await writeFileAtomic(command.json, text);
  } else {
    io.stdout(formatSummary(withImport, meta));
  }
}

function describeIoError(error: NodeJS.ErrnoException): string {
  const where = error.path ?? 'file';
  switch (error.code) {
    case 'ENOENT':
      return `cannot open ${where}: no such file`;
    case 'EACCES':
    case 'EPERM':
      return `cannot access ${where}: permission denied`;
    case 'EISDIR':
      return `${where} is a folder, not a capture file`;
    case 'ENOSPC':
      return `cannot write ${where}: the disk is full`;
    default:
      return `${where}: ${error.message}`;
  }
}
