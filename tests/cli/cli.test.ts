import { execFile } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { beforeAll, describe, expect, it } from 'vitest';
import { angleDiffDeg } from '../../core/angle/unwrapDeg.js';

const run = promisify(execFile);
const CLI = 'dist/cli/statorscope.js';
const SAMPLES = 'sample-captures/synthetic';

async function cli(...args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(process.execPath, [CLI, ...args], { maxBuffer: 64 << 20 });
    return { code: 0, stdout, stderr };
  } catch (error) {
    const e = error as { code: number; stdout: string; stderr: string };
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
}

beforeAll(async () => {
  // The bundle users run (npm's prepare step builds the same file).
  await run(process.execPath, ['app/build.mjs']);
}, 120_000);

interface Expected {
  carrierHz: number;
  transformationRatio: number;
  phaseLeadDeg: number;
  referenceRmsV: number | null;
  ambiguous180: boolean;
  angle: { tS: number; deg: number }[];
  expectedFindings: string[];
  roles: string[];
}

const samples = readdirSync(SAMPLES).filter((f) => f.endsWith('.csv'));

describe('statorscope analyze on every demo capture', () => {
  it('finds the demo captures', () => expect(samples.length).toBeGreaterThanOrEqual(4));
  for (const file of samples) {
    it(`${file}: JSON matches the truth the capture was generated from`, async () => {
      const expected = JSON.parse(readFileSync(join(SAMPLES, file.replace(/\.csv$/, '.expected.json')), 'utf8')) as Expected;
      const { code, stdout, stderr } = await cli('analyze', join(SAMPLES, file), '--json', '-');
      expect(stderr).toBe('');
      expect(code).toBe(0);
      const json = JSON.parse(stdout);
      expect(json.schema).toBe('statorscope.analysis/1');
      expect(json.input.channels.map((c: { role: string }) => c.role)).toEqual(expected.roles);
      expect(Math.abs(json.carrier.frequencyHz - expected.carrierHz)).toBeLessThan(0.002);
      const unit = json.units[0];
      if (expected.referenceRmsV !== null) {
        expect(json.carrier.referenceRmsV).toBeCloseTo(expected.referenceRmsV, 1);
        expect(Math.abs(unit.transformationRatio / expected.transformationRatio - 1)).toBeLessThan(0.005);
        expect(Math.abs(unit.phaseLeadDeg - expected.phaseLeadDeg)).toBeLessThan(0.3);
      } else {
        expect(unit.transformationRatio).toBeNull();
      }
      // Angle at the truth's instants, by linear interpolation of the per-cycle trace.
      const t: number[] = json.angle.t;
      const unwrapped: number[] = json.angle.unwrappedDeg;
      for (const point of expected.angle) {
        const k = t.findIndex((x) => x >= point.tS);
        const f = (point.tS - t[k - 1]!) / (t[k]! - t[k - 1]!);
        const got = unwrapped[k - 1]! + f * (unwrapped[k]! - unwrapped[k - 1]!);
        const diff = Math.abs(angleDiffDeg(got, point.deg));
        expect(expected.ambiguous180 ? Math.min(diff, 180 - diff) : diff).toBeLessThan(0.05);
      }
      const raised = json.findings.filter((f: { severity: string }) => f.severity !== 'info').map((f: { code: string }) => f.code);
      expect(raised.sort()).toEqual([...expected.expectedFindings].sort());
    });
  }

  it('prints a readable summary and writes the angle CSV atomically', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'statorscope-'));
    const angles = join(dir, 'angles.csv');
    const { code, stdout } = await cli('analyze', join(SAMPLES, 'wind-vane-slow-turn.csv'), '--angles', angles);
    expect(code).toBe(0);
    expect(stdout).toMatch(/carrier\s+400\.2\d* Hz/);
    expect(stdout).toMatch(/transformation ratio 0\.45\d\d/);
    expect(stdout).toMatch(/findings\s+none/);
    const rows = readFileSync(angles, 'utf8').trim().split('\n');
    expect(rows[0]).toBe('t_s,angle_deg,unwrapped_deg,velocity_deg_per_s');
    // the wind vane turns at about 20°/s (the demo's own truth)
    expect(Number(rows[200]!.split(',')[3])).toBeGreaterThan(15);
    expect(rows.length).toBeGreaterThan(390);
    expect(readdirSync(dir)).toEqual(['angles.csv']); // no temporary file left behind
  });

  it('--help and --version exit 0', async () => {
    expect((await cli('--help')).stdout).toMatch(/statorscope analyze <capture\.csv>/);
    expect((await cli('--version')).stdout).toMatch(/^statorscope \d+\.\d+\.\d+/);
  });
});

describe('statorscope on bad input: one plain line, non-zero exit, no output file', () => {
  const dir = mkdtempSync(join(tmpdir(), 'statorscope-bad-'));
  const cases: [string, string, RegExp][] = [
    ['empty.csv', '', /empty|no data/i],
    ['text.csv', 'hello world\nthis is not a capture\n', /line|numeric|column/i],
    ['one-row.csv', 'Time,R1-R2,S1-S3\n0,1,2\n', /row|sample|short/i],
    ['binary.csv', '\u0000\u0001\u0002\u0003\u00ff\u00fe'.repeat(100), /binary|text|CSV/i],
  ];
  for (const [name, content, pattern] of cases) {
    it(`${name}`, async () => {
      const path = join(dir, name);
      writeFileSync(path, content, 'latin1');
      const out = join(dir, `${name}.json`);
      const { code, stdout, stderr } = await cli('analyze', path, '--json', out);
      expect(code).toBe(1);
      expect(stdout).toBe('');
      expect(stderr.trim().split('\n')).toHaveLength(1);
      expect(stderr).toMatch(pattern);
      expect(stderr).not.toMatch(/\bat .*\.js:\d+/); // no stack trace
      expect(existsSync(out)).toBe(false);
    });
  }

  it('a missing file, a wrong command, a bad option', async () => {
    const missing = await cli('analyze', join(dir, 'nope.csv'));
    expect(missing.code).toBe(1);
    expect(missing.stderr).toMatch(/no such file/);
    expect((await cli('analyse', 'x.csv')).code).toBe(2);
    expect((await cli('analyze', 'x.csv', '--kind', 'gyro')).stderr).toMatch(/--kind must be/);
    expect((await cli('analyze', 'x.csv', '--colour')).code).toBe(2);
    expect((await cli('analyze', 'x.csv', '--roles', 'ref')).stderr).toMatch(/role=channel/);
  });

  it('an output path that is a folder, or in a folder that does not exist, is named as given, with no temporary file left (common practice, no source)', async () => {
    const capture = join(SAMPLES, 'bench-resolver-dividing-head.csv');
    const folder = mkdtempSync(join(tmpdir(), 'statorscope-out-'));
    const intoFolder = await cli('analyze', capture, '--json', folder);
    expect(intoFolder.code).toBe(1);
    expect(intoFolder.stderr.trim()).toBe(`statorscope: cannot write ${folder}: it is a folder; give a file name`);
    expect(readdirSync(folder)).toEqual([]);
    const nowhere = join(folder, 'missing', 'out.json');
    const noFolder = await cli('analyze', capture, '--json', nowhere);
    expect(noFolder.code).toBe(1);
    expect(noFolder.stderr.trim()).toBe(`statorscope: cannot write ${nowhere}: its folder does not exist`);
  });

  it('refuses to write over the capture file', async () => {
    const path = join(dir, 'keep.csv');
    const original = readFileSync(join(SAMPLES, 'bench-resolver-dividing-head.csv'));
    writeFileSync(path, original);
    const result = await cli('analyze', path, '--angles', path);
    expect(result.code).toBe(2);
    expect(readFileSync(path).equals(original)).toBe(true);
  });

  it('--roles naming a channel that does not exist says which channels there are', async () => {
    const result = await cli('analyze', join(SAMPLES, 'bench-resolver-dividing-head.csv'), '--roles', 'ref=ch7');
    expect(result.code).toBe(1);
    expect(result.stderr).toMatch(/no channel "ch7".*ch1 "REF"/);
  });
});
