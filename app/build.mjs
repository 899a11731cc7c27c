// Bundles the command-line tool into one CommonJS file that runs under plain Node.
import { build } from 'esbuild';
import { chmod } from 'node:fs/promises';

const outfile = 'dist/cli/statorscope.js';
await build({
  entryPoints: ['app/cli/statorscope.ts'],
  outfile,
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  sourcemap: false,
  logLevel: 'warning',
});
await chmod(outfile, 0o755);
