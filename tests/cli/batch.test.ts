import { execFile } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { beforeAll, describe, expect, it } from 'vitest';
import { formatSummaryCsv, failedSummaryRow, quoteCsv, SUMMARY_HEADER } from '../../app/cli/summaryCsv.js';

const run = promisify(execFile);
const CLI = 'dist/cli/statorscope.js';
const SAMPLES = 'sample-captures/synthetic';

async function cli(args: string[], env: Record<string, string> = {}): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(process.execPath, [CLI, ...args], { maxBuffer: 64 << 20, env: { ...process.env, ...env } });
    return { code: 0, stdout, stderr };
  } catch (error) {
    const e = error as { code: number; stdout: string; stderr: string };
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
}

/** Minimal RFC 4180 reader for the summary (quoted fields, doubled quotes; no line breaks in fields). */
function readCsv(text: string): string[][] {
  return text
    .trimEnd()
    .split('\n')
    .map((line) => {
      const out: string[] = [];
      let field = '';
      let quoted = false;
      for (let i = 0; i < line.length; i++) {
        const c = line[i]!;
        if (quoted) {
          if (c === '"' && line[i + 1] === '"') {
            field += '"';
            i++;
          } else if (c === '"') quoted = false;
          else field += c;
        } else if (c === '"') quoted = true;
        else if (c === ',') {
          out.push(field);
          field = '';
        } else field += c;
      }
      out.push(field);
      return out;
    });
}

const samples = readdirSync(SAMPLES).filter((f) => f.endsWith('.csv')).sort();

beforeAll(async () => {
  await run(process.execPath, ['app/build.mjs']);
}, 120_000);

describe('statorscope analyze <folder|files...> --out <folder>', () => {
  it('writes one JSON per capture and a summary row per capture, continues past bad files and exits 1', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'statorscope-batch-'));
    const inputs = join(dir, 'in');
    mkdirSync(inputs);
    for (const f of samples) copyFileSync(join(SAMPLES, f), join(inputs, f));
    writeFileSync(join(inputs, 'zz-not-a-capture.csv'), 'hello world\nthis is not a capture\n');
    writeFileSync(join(inputs, 'notes.txt'), 'not a .csv file: skipped');
    const out = join(dir, 'out');
    const missing = join(dir, 'missing.csv');
    const result = await cli(['analyze', inputs, missing, '--out', out, '--jobs', '2']);
    expect(result.code).toBe(1);
    expect(result.stdout).toMatch(new RegExp(`${samples.length} of ${samples.length + 2} captures analysed on 2 workers, 2 failed`));
    expect(result.stderr).toMatch(/zz-not-a-capture\.csv/);
    expect(result.stderr).toMatch(/no such file/);
    expect(result.stderr).not.toMatch(/\r/); // no progress when stderr is not a terminal

    const written = readdirSync(out).sort();
    expect(written).toEqual([...samples.map((f) => f.replace(/\.csv$/, '.json')), 'summary.csv'].sort());
    const table = readCsv(readFileSync(join(out, 'summary.csv'), 'utf8'));
    expect(table[0]).toEqual([...SUMMARY_HEADER]);
    expect(table).toHaveLength(samples.length + 3);
    const byFile = new Map(table.slice(1).map((r) => [r[0]!, r]));
    const failedBad = byFile.get(join(inputs, 'zz-not-a-capture.csv'))!;
    expect(failedBad[1]).toBe('failed');
    expect(failedBad[11]).toMatch(/line|numeric|column/i);
    expect(byFile.get(missing)![1]).toBe('failed');

    // Each row agrees with its JSON, and each JSON with the single-file run on the same capture.
    for (const f of samples) {
      const row = byFile.get(join(inputs, f))!;
      expect(row[1]).toBe('ok');
      const json = JSON.parse(readFileSync(join(out, row[2]!), 'utf8'));
      expect(Number(row[4])).toBeCloseTo(json.carrier.frequencyHz, 3);
      expect(row[3]).toBe(json.units.map((u: { kind: string }) => u.kind).join(';'));
      const unwrapped = (json.angle.unwrappedDeg as (number | null)[]).filter((v): v is number => v !== null);
      expect(Number(row[7])).toBeCloseTo(Math.min(...unwrapped), 2);
      expect(Number(row[8])).toBeCloseTo(Math.max(...unwrapped), 2);
      const codes = json.findings.filter((x: { severity: string }) => x.severity !== 'info').map((x: { code: string }) => x.code);
      expect(row[10]).toBe(codes.join(' '));
      const single = await cli(['analyze', join(inputs, f), '--json', '-']);
      expect(single.code).toBe(0);
      expect(JSON.parse(single.stdout)).toEqual(json);
    }
  }, 120_000);

  it('exits 0 when every capture was analysed, and names same-named captures apart', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'statorscope-batch-ok-'));
    mkdirSync(join(dir, 'a'));
    mkdirSync(join(dir, 'b'));
    const one = samples[0]!;
    copyFileSync(join(SAMPLES, one), join(dir, 'a', one));
    copyFileSync(join(SAMPLES, one), join(dir, 'b', one));
    const out = join(dir, 'out');
    const result = await cli(['analyze', join(dir, 'a', one), join(dir, 'b', one), '--out', out]);
    expect(result.code).toBe(0);
    expect(result.stderr).toBe('');
    const stem = one.replace(/\.csv$/, '');
    expect(readdirSync(out).sort()).toEqual([`${stem}-2.json`, `${stem}.json`, 'summary.csv']);
  }, 60_000);

  it('refuses wrong batch command lines with exit 2', async () => {
    const a = join(SAMPLES, samples[0]!);
    const b = join(SAMPLES, samples[1]!);
    expect((await cli(['analyze', a, b])).stderr).toMatch(/--out <folder>/);
    expect((await cli(['analyze', a, b])).code).toBe(2);
    expect((await cli(['analyze', SAMPLES])).code).toBe(2);
    expect((await cli(['analyze', a, '--out', tmpdir(), '--json', 'x.json'])).code).toBe(2);
    expect((await cli(['analyze', a, '--out', tmpdir(), '--jobs', '0'])).stderr).toMatch(/--jobs must be from 1 to 256/);
    expect((await cli(['analyze', a, '--jobs', '2'])).code).toBe(2);
  });
});

describe('bounded memory', () => {
  it('refuses a capture larger than the memory limit before reading it, saying how large and what limit', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'statorscope-big-'));
    const out = join(dir, 'x.json');
    const result = await cli(['analyze', join(SAMPLES, samples[0]!), '--json', out], { STATORSCOPE_MEMORY_LIMIT_MB: '1' });
    expect(result.code).toBe(1);
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
    expect(result.stderr).toMatch(/too large to analyse here: \d+ [KM]iB, about \d+ rows x \d+ columns, which needs about .*limit is 1 MiB \(STATORSCOPE_MEMORY_LIMIT_MB=1\)/);
    expect(existsSync(out)).toBe(false);
  });
});

describe('analysis options on the command line', () => {
  const capture = join(SAMPLES, samples[0]!);
  const bad: [string[], RegExp][] = [
    [['--speed-ratio', '1'], /--speed-ratio must be from 2 to 1000/],
    [['--speed-ratio', '3.5'], /--speed-ratio needs a whole number/],
    [['--stick-off', '400'], /--stick-off must be from -360 to 360/],
    [['--shaft-turned', 'up'], /--shaft-turned must be ccw or cw/],
    [['--accuracy-class', '0'], /--accuracy-class must be over 0/],
    [['--step', 'ten'], /--step needs a number/],
    [['--step', '10', '--stops', '0,10'], /--step or --stops, not both/],
    [['--stops', '0,,20'], /--stops needs a comma-separated list/],
    [['--stops', '0,999'], /--stops must be from -360 to 360/],
    [['--null-limit', '-5'], /--null-limit must be over 0/],
    [['--ratio-tolerance', '80'], /--ratio-tolerance must be over 0 and at most 50/],
    [['--ct-gradient', 'Infinity'], /--ct-gradient needs a number/],
  ];
  for (const [args, message] of bad) {
    it(`refuses ${args.join(' ')}`, async () => {
      const result = await cli(['analyze', capture, ...args]);
      expect(result.code).toBe(2);
      expect(result.stderr).toMatch(message);
    });
  }

  it('accepts every option in range and still produces the analysis', async () => {
    const result = await cli([
      'analyze', capture, '--json', '-', '--speed-ratio', '36', '--stick-off', '-12.5', '--shaft-turned', 'ccw',
      '--accuracy-class', '7', '--stops', '0,30,60', '--null-limit', '30', '--ratio-tolerance', '1.5', '--ct-gradient', '1e0',
    ]);
    expect(result.stderr).toBe('');
    expect(result.code).toBe(0);
    expect(JSON.parse(result.stdout).schema).toBe('statorscope.analysis/1');
    const help = (await cli(['--help'])).stdout;
    for (const flag of ['--out <folder>', '--jobs <N>', '--speed-ratio <N>', '--stick-off <DEG>', '--shaft-at-zero', '--shaft-turned <dir>', '--accuracy-class <ARCMIN>', '--step <DEG>', '--stops <LIST>', '--null-limit <MV>', '--ratio-tolerance <PCT>', '--ct-gradient <V_PER_DEG>']) {
      expect(help).toContain(flag);
    }
  });
});

describe('output files', () => {
  it('writes into /dev/null without replacing the device', async () => {
    if (!existsSync('/dev/null')) return;
    const result = await cli(['analyze', join(SAMPLES, samples[0]!), '--json', '/dev/null']);
    expect(result.code).toBe(0);
    expect(statSync('/dev/null').isCharacterDevice()).toBe(true);
  });

  it('quotes summary fields per RFC 4180 §2 rules 6-7', () => {
    expect(quoteCsv('plain')).toBe('plain');
    expect(quoteCsv('a,b')).toBe('"a,b"');
    expect(quoteCsv('say "hi"')).toBe('"say ""hi"""');
    const text = formatSummaryCsv([failedSummaryRow('odd, "name".csv', 'line 3, column 2: bad')]);
    expect(readCsv(text)[1]!.slice(0, 2)).toEqual(['odd, "name".csv', 'failed']);
    expect(readCsv(text)[1]![11]).toBe('line 3, column 2: bad');
  });
});
