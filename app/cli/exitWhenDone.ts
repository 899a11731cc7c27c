/**
 * Sets the process's exit code from a run's promise, and guards against the run never settling:
 * if the event loop empties first (a promise left waiting on a handle that no longer keeps the
 * process alive), the process would end with status 0 and nothing written. Instead it reports an
 * internal error and ends with status 3.
 */
export function exitWhenDone(run: Promise<number>, stderr: (text: string) => void): void {
  let settled = false;
  void run.then(
    (code) => {
      settled = true;
      process.exitCode = code;
    },
    (error: unknown) => {
      settled = true;
      stderr(`statorscope: internal error: ${error instanceof Error ? error.message : String(error)}\n`);
      process.exitCode = 3;
    },
  );
  process.once('beforeExit', () => {
    if (settled) return;
    stderr('statorscope: internal error: the run stopped before it finished, so nothing was written; please report this with the command used\n');
    process.exitCode = 3;
  });
}
