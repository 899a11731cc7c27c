// Bundles the command-line tool into CommonJS files that run under plain Node: the CLI itself,
// the worker thread it starts for batch runs, the one that parses half of a large capture and
// the one that demodulates half of its cycles (all loaded from the same folder).
import { build } from 'esbuild';
import { chmod } from 'node:fs/promises';

const common = { bundle: true, platform: 'node', target: 'node20', format: 'cjs', sourcemap: false, logLevel: 'warning' };
const outfile = 'dist/cli/statorscope.js';
await Promise.all([
  build({ ...common, entryPoints: ['app/cli/statorscope.ts'], outfile }),
  build({ ...common, entryPoints: ['app/cli/analysisWorker.ts'], outfile: 'dist/cli/analysisWorker.js' }),
  build({ ...common, entryPoints: ['app/cli/parseWorker.ts'], outfile: 'dist/cli/parseWorker.js' }),
  build({ ...common, entryPoints: ['app/cli/demodWorker.ts'], outfile: 'dist/cli/demodWorker.js' }),
]);
await chmod(outfile, 0o755);
