import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

/** Runs a script that hands `run` to exitWhenDone, in a process of its own: its status and stderr. */
async function runWith(run: string): Promise<{ status: number; stderr: string }> {
  const file = join(mkdtempSync(join(tmpdir(), 'statorscope-exit-')), 'main.ts');
  writeFileSync(file, [`import { exitWhenDone } from ${JSON.stringify(resolve('app/cli/exitWhenDone.ts'))};`, `exitWhenDone(${run}, (t) => process.stderr.write(t));`].join('\n'));
  return new Promise((done) => {
    execFile(resolve('node_modules/.bin/tsx'), [file], (error, _stdout, stderr) => done({ status: error ? (error as { code: number }).code : 0, stderr }));
  });
}

describe('exitWhenDone', () => {
  it('ends with the run\'s exit code', async () => {
    expect(await runWith('Promise.resolve(2)')).toEqual({ status: 2, stderr: '' });
  }, 30_000);

  it('a run that never settles (the event loop empties first) ends with status 3 and says so, not with status 0 and nothing written (common practice, no source)', async () => {
    const got = await runWith('new Promise<number>(() => undefined)');
    expect(got.status).toBe(3);
    expect(got.stderr).toMatch(/internal error: the run stopped before it finished/);
  }, 30_000);

  it('a run that throws ends with status 3 and one line, no stack', async () => {
    const got = await runWith("Promise.reject(new Error('boom'))");
    expect(got.status).toBe(3);
    expect(got.stderr).toBe('statorscope: internal error: boom\n');
  }, 30_000);
});
