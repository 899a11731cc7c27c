import { parseArgs } from 'node:util';

export interface AnalyzeCommand {
  readonly command: 'analyze';
  readonly files: string[];
  readonly json?: string;
  readonly angles?: string;
  readonly report?: string;
  readonly roles?: Record<string, string>;
  readonly kind?: 'synchro' | 'resolver' | 'ct';
}

export type CliCommand = AnalyzeCommand | { readonly command: 'help' } | { readonly command: 'version' };

/** A mistake in the command line: printed as one line, exit code 2. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}

export const USAGE = `Usage:
  statorscope analyze <capture.csv> [options]
  statorscope --help | --version

Reads an oscilloscope CSV export of a synchro or resolver (excitation R1-R2 and the stator
lines), recovers the carrier, demodulates every channel once per carrier cycle and solves the
shaft angle. Prints a summary unless --json is given.

Options:
  --json <file|->        write the analysis as JSON (schema statorscope.analysis/1); - for stdout
  --angles <file.csv>    write the angle per carrier cycle as CSV
  --report <file.html>   write a printable HTML test report
  --roles <list>         set channel roles, e.g. ref=ch1,s1s3=ch2,s3s2=ch3,s2s1=ch4
                         roles: ref s1s3 s3s2 s2s1 s3s1 s2s3 s1s2 sin cos ct ignore
                         (optional unit prefix: coarse.sin=ch2); a channel is its label,
                         chN (N-th data column) or N
  --kind <kind>          synchro, resolver or ct, when labels and signals leave it open
  -h, --help             show this help
  -v, --version          show the version

Exit status: 0 when an analysis was produced (findings do not change it), 1 when the capture
cannot be analysed or read, 2 for a wrong command line.

Caution: synchro excitation is typically 115 V or 26 V; stator lines reach 90 V RMS. Capture
with differential or isolated probes rated for the voltage; never clip a scope ground lead to a
point that is not at earth.`;

export function parseCliArgs(argv: readonly string[]): CliCommand {
  let parsed;
  try {
    parsed = parseArgs({
      args: [...argv],
      allowPositionals: true,
      strict: true,
      options: {
        json: { type: 'string' },
        angles: { type: 'string' },
        report: { type: 'string' },
        roles: { type: 'string' },
        kind: { type: 'string' },
        'speed-ratio': { type: 'string' },
        help: { type: 'boolean', short: 'h' },
        version: { type: 'boolean', short: 'v' },
      },
    });
  } catch (error) {
    throw new UsageError(`${(error as Error).message.replace(/\. To specify.*$/s, '')}; see statorscope --help`);
  }
  const { values, positionals } = parsed;
  if (values.help) return { command: 'help' };
  if (values.version) return { command: 'version' };
  const [command, ...files] = positionals;
  if (command === undefined) throw new UsageError('no command given; try statorscope analyze <capture.csv>, or statorscope --help');
  if (command !== 'analyze') throw new UsageError(`unknown command "${command}"; the command is analyze (see statorscope --help)`);
  if (files.length === 0) throw new UsageError('analyze needs a capture file: statorscope analyze <capture.csv>');
  if (files.length > 1) throw new UsageError('analyze takes one capture file at a time');
  if (values['speed-ratio'] !== undefined) {
    throw new UsageError('--speed-ratio (two-speed coarse/fine sets) is not available in this version');
  }
  const kind = values.kind;
  if (kind !== undefined && kind !== 'synchro' && kind !== 'resolver' && kind !== 'ct') {
    throw new UsageError(`--kind must be synchro, resolver or ct, not "${kind}"`);
  }
  for (const [name, value] of [['json', values.json], ['angles', values.angles], ['report', values.report]] as const) {
    if (value !== undefined && value.trim() === '') throw new UsageError(`--${name} needs a file name`);
  }
  return {
    command: 'analyze',
    files,
    ...(values.json !== undefined ? { json: values.json } : {}),
    ...(values.angles !== undefined ? { angles: values.angles } : {}),
    ...(values.report !== undefined ? { report: values.report } : {}),
    ...(values.roles !== undefined ? { roles: parseRolesOption(values.roles) } : {}),
    ...(kind !== undefined ? { kind } : {}),
  };
}

/** "ref=ch1,s1s3=ch2" → { ref: "ch1", s1s3: "ch2" }; the roles themselves are checked by core. */
export function parseRolesOption(text: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const part of text.split(',')) {
    if (part.trim() === '') continue;
    const eq = part.indexOf('=');
    if (eq <= 0 || eq === part.length - 1) {
      throw new UsageError(`--roles: "${part.trim()}" should look like role=channel, e.g. s1s3=ch2`);
    }
    const role = part.slice(0, eq).trim();
    if (role in out) throw new UsageError(`--roles: ${role} is given twice`);
    out[role] = part.slice(eq + 1).trim();
  }
  if (Object.keys(out).length === 0) throw new UsageError('--roles needs at least one role=channel pair');
  return out;
}
