import { parseArgs } from 'node:util';
import type { AnalyzeOptions, RoleOptions } from '../../core/index.js';

/** The analysis options the command line can set: core's AnalyzeOptions less the channel roles. */
export type CliAnalysisOptions = Omit<AnalyzeOptions, keyof RoleOptions>;

export interface AnalyzeCommand {
  readonly command: 'analyze';
  /** Capture files and folders as given (folders are expanded to their *.csv files). */
  readonly files: string[];
  readonly json?: string;
  readonly angles?: string;
  readonly report?: string;
  /** Batch mode: the folder for one JSON per capture and summary.csv. */
  readonly out?: string;
  /** Batch mode: worker threads (default: the available cores). */
  readonly jobs?: number;
  readonly roles?: Record<string, string>;
  readonly kind?: 'synchro' | 'resolver' | 'ct';
  readonly analysis: CliAnalysisOptions;
}

export type CliCommand = AnalyzeCommand | { readonly command: 'help' } | { readonly command: 'version' };

/** A mistake in the command line: printed as one line, exit code 2. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}

export const USAGE = `Usage:
  statorscope analyze <capture.csv> [options]
  statorscope analyze <capture.csv|folder>... --out <folder> [--jobs N] [options]
  statorscope --help | --version

Reads an oscilloscope CSV export of a synchro or resolver (excitation R1-R2 and the stator
lines), recovers the carrier, demodulates every channel once per carrier cycle and solves the
shaft angle. Prints a summary unless --json is given.

Output (one capture):
  --json <file|->        write the analysis as JSON (schema statorscope.analysis/1); - for stdout
  --angles <file.csv>    write the angle per carrier cycle as CSV
  --report <file.html>   write a printable HTML test report

Batch (several captures, or a folder of *.csv files):
  --out <folder>         write <capture>.json per capture and summary.csv (one row per capture,
                         failures included) into this folder; created if missing
  --jobs <N>             captures analysed at once on worker threads, 1-256 (default: the
                         available cores); the exit status is 1 if any capture failed

Channels:
  --roles <list>         set channel roles, e.g. ref=ch1,s1s3=ch2,s3s2=ch3,s2s1=ch4
                         roles: ref s1s3 s3s2 s2s1 s3s1 s2s3 s1s2 sin cos ct ignore
                         (optional unit prefix: coarse.sin=ch2); a channel is its label,
                         chN (N-th data column) or N
  --kind <kind>          synchro, resolver or ct, when labels and signals leave it open

What you know about the unit and the test (all optional):
  --speed-ratio <N>      two-speed set: fine turns per coarse turn, an integer 2-1000
  --stick-off <DEG>      two-speed set: stick-off rotation of the coarse unit, -360 to 360 degrees
  --shaft-at-zero        the shaft started the capture at electrical zero
  --shaft-turned <dir>   the shaft was then turned ccw or cw (seen from the shaft end);
                         with these, swapped stator leads and a reversed rotor are named
  --accuracy-class <ARCMIN>  accuracy class, +/- arc-minutes, over 0 and at most 600
  --step <DEG>           stepped accuracy run: degrees between stops, over 0 and at most 180
  --stops <LIST>         stepped accuracy run: the nominal stops in degrees, e.g. 0,30,60,90
                         (each -360 to 360; give --step or --stops, not both)
  --null-limit <MV>      null-voltage limit in mV RMS, over 0 and at most 10000
  --ratio-tolerance <PCT>  tolerance for a standard transformation ratio, over 0 and at most 50 %
  --ct-gradient <V_PER_DEG>  control-transformer gradient in V per degree, over 0 and at most 100

  -h, --help             show this help
  -v, --version          show the version

Exit status: 0 when an analysis was produced (findings do not change it), 1 when the capture
cannot be analysed or read (in batch mode: when any capture failed), 2 for a wrong command line.

Memory: a capture is refused before it is read when its samples would not fit in memory (half
of this computer's memory, shared by the batch workers; STATORSCOPE_MEMORY_LIMIT_MB sets
another limit).

Caution: synchro excitation is typically 115 V or 26 V; stator lines reach 90 V RMS. Capture
with differential or isolated probes rated for the voltage; never clip a scope ground lead to a
point that is not at earth.`;

export function parseCliArgs(argv: readonly string[]): CliCommand {
  let parsed;
  try {
    parsed = parseArgs({
      args: joinNegativeNumbers(argv),
      allowPositionals: true,
      strict: true,
      options: {
        json: { type: 'string' },
        angles: { type: 'string' },
        report: { type: 'string' },
        out: { type: 'string' },
        jobs: { type: 'string' },
        roles: { type: 'string' },
        kind: { type: 'string' },
        'speed-ratio': { type: 'string' },
        'stick-off': { type: 'string' },
        'shaft-at-zero': { type: 'boolean' },
        'shaft-turned': { type: 'string' },
        'accuracy-class': { type: 'string' },
        step: { type: 'string' },
        stops: { type: 'string' },
        'null-limit': { type: 'string' },
        'ratio-tolerance': { type: 'string' },
        'ct-gradient': { type: 'string' },
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
  const kind = values.kind;
  if (kind !== undefined && kind !== 'synchro' && kind !== 'resolver' && kind !== 'ct') {
    throw new UsageError(`--kind must be synchro, resolver or ct, not "${kind}"`);
  }
  for (const [name, value] of [['json', values.json], ['angles', values.angles], ['report', values.report], ['out', values.out]] as const) {
    if (value !== undefined && value.trim() === '') throw new UsageError(`--${name} needs a ${name === 'out' ? 'folder' : 'file'} name`);
  }
  if (values.out !== undefined) {
    for (const [name, value] of [['json', values.json], ['angles', values.angles], ['report', values.report]] as const) {
      if (value !== undefined) throw new UsageError(`--${name} names one output file; with --out each capture gets <name>.json in the folder`);
    }
  } else if (files.length > 1) {
    throw new UsageError(`${files.length} captures given: add --out <folder> for one JSON per capture and a summary.csv`);
  }
  if (values.jobs !== undefined && values.out === undefined) throw new UsageError('--jobs applies to batch runs: add --out <folder>');
  const jobs = values.jobs === undefined ? undefined : integerOption('jobs', values.jobs, 1, 256);
  return {
    command: 'analyze',
    files,
    ...(values.json !== undefined ? { json: values.json } : {}),
    ...(values.angles !== undefined ? { angles: values.angles } : {}),
    ...(values.report !== undefined ? { report: values.report } : {}),
    ...(values.out !== undefined ? { out: values.out } : {}),
    ...(jobs !== undefined ? { jobs } : {}),
    ...(values.roles !== undefined ? { roles: parseRolesOption(values.roles) } : {}),
    ...(kind !== undefined ? { kind } : {}),
    analysis: parseAnalysisOptions(values),
  };
}

/** Options whose value may be a negative number ("--stick-off -12.5"). */
const SIGNED_OPTIONS = new Set(['--stick-off', '--null-limit', '--ratio-tolerance', '--ct-gradient', '--accuracy-class', '--step', '--stops', '--speed-ratio', '--jobs']);

/**
 * util.parseArgs reads "-12.5" after an option as another option; join such a value to its option
 * ("--stick-off=-12.5") so that it reaches the range checks (which then explain the range).
 */
function joinNegativeNumbers(argv: readonly string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    const next = argv[i + 1];
    if (SIGNED_OPTIONS.has(a) && next !== undefined && /^-(\d|\.\d)/.test(next)) {
      out.push(`${a}=${next}`);
      i++;
    } else out.push(a);
  }
  return out;
}

type OptionValues = Record<string, string | boolean | undefined>;

/** The unit and test facts (--speed-ratio ... --ct-gradient), each range-checked. */
export function parseAnalysisOptions(values: OptionValues): CliAnalysisOptions {
  const text = (name: string): string | undefined => values[name] as string | undefined;
  const speedRatio = text('speed-ratio') === undefined ? undefined : integerOption('speed-ratio', text('speed-ratio')!, 2, 1000);
  const stickOffDeg = numberOption('stick-off', text('stick-off'), -360, 360, true);
  const turned = text('shaft-turned');
  if (turned !== undefined && turned !== 'ccw' && turned !== 'cw') throw new UsageError(`--shaft-turned must be ccw or cw, not "${turned}"`);
  const atZero = values['shaft-at-zero'] === true;
  const classArcmin = numberOption('accuracy-class', text('accuracy-class'), 0, 600, false);
  const stepDeg = numberOption('step', text('step'), 0, 180, false);
  const stopsText = text('stops');
  if (stepDeg !== undefined && stopsText !== undefined) throw new UsageError('give --step or --stops, not both');
  let nominalDeg: number[] | undefined;
  if (stopsText !== undefined) {
    const parts = stopsText.split(',').map((p) => p.trim());
    if (parts.length === 0 || parts.some((p) => p === '')) {
      throw new UsageError(`--stops needs a comma-separated list of degrees, e.g. 0,30,60; got "${stopsText}"`);
    }
    nominalDeg = parts.map((p) => numberOption('stops', p, -360, 360, true)!);
  }
  const nullLimitMv = numberOption('null-limit', text('null-limit'), 0, 10_000, false);
  const ratioTolerancePct = numberOption('ratio-tolerance', text('ratio-tolerance'), 0, 50, false);
  const ctGradientVPerDeg = numberOption('ct-gradient', text('ct-gradient'), 0, 100, false);
  const accuracy =
    classArcmin !== undefined || stepDeg !== undefined || nominalDeg !== undefined
      ? {
          ...(classArcmin !== undefined ? { classArcmin } : {}),
          ...(stepDeg !== undefined ? { stepDeg } : {}),
          ...(nominalDeg !== undefined ? { nominalDeg } : {}),
        }
      : undefined;
  return {
    ...(speedRatio !== undefined ? { speedRatio } : {}),
    ...(stickOffDeg !== undefined ? { stickOffDeg } : {}),
    ...(atZero || turned !== undefined
      ? { shaftFacts: { ...(atZero ? { atElectricalZero: true } : {}), ...(turned !== undefined ? { turned: turned as 'ccw' | 'cw' } : {}) } }
      : {}),
    ...(accuracy !== undefined ? { accuracy } : {}),
    ...(nullLimitMv !== undefined ? { nullLimitMv } : {}),
    ...(ratioTolerancePct !== undefined ? { ratioTolerancePct } : {}),
    ...(ctGradientVPerDeg !== undefined ? { ctGradientVPerDeg } : {}),
  };
}

/** A decimal number in [min, max] (min itself excluded unless minIncluded). */
function numberOption(name: string, text: string | undefined, min: number, max: number, minIncluded: boolean): number | undefined {
  if (text === undefined) return undefined;
  const t = text.trim();
  const value = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t) ? Number(t) : NaN;
  const range = `${minIncluded ? 'from' : 'over'} ${min} ${minIncluded ? 'to' : 'and at most'} ${max}`;
  if (!Number.isFinite(value)) throw new UsageError(`--${name} needs a number ${range}, not "${text}"`);
  if (value > max || value < min || (!minIncluded && value === min)) throw new UsageError(`--${name} must be ${range}, not ${t}`);
  return value;
}

function integerOption(name: string, text: string, min: number, max: number): number {
  const t = text.trim();
  if (!/^\d+$/.test(t)) throw new UsageError(`--${name} needs a whole number from ${min} to ${max}, not "${text}"`);
  const value = Number(t);
  if (value < min || value > max) throw new UsageError(`--${name} must be from ${min} to ${max}, not ${value}`);
  return value;
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
