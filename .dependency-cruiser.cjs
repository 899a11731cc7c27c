// dependency-cruiser 17: folder boundaries checked on resolved paths (run by `npm run lint`).
// ESLint's no-restricted-imports sees the import string as written; this sees the file it
// resolves to, so `../main/x.js` from the renderer is caught here even though no lint pattern
// names it. With tsConfig set, `.js` specifiers (NodeNext style) resolve to the `.ts` sources.
/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    {
      name: 'core-no-node-builtins',
      comment: 'core/ is pure TypeScript: no Node built-ins (fs, node:fs, path, ...). Do I/O at the edge.',
      severity: 'error',
      from: { path: '^core/' },
      to: { dependencyTypes: ['core'] },
    },
    {
      name: 'core-not-to-app',
      comment: 'core/ must not depend on anything in app/; app/ depends on core/, never the reverse.',
      severity: 'error',
      from: { path: '^core/' },
      to: { path: '^app/' },
    },
    {
      name: 'core-only-allowed-packages',
      comment: 'The only runtime package core/ may use is fft.js.',
      severity: 'error',
      from: { path: '^core/' },
      to: {
        dependencyTypes: ['npm', 'npm-dev', 'npm-optional', 'npm-peer', 'npm-bundled', 'npm-no-pkg', 'npm-unknown'],
        pathNot: '(^|/)node_modules/fft\\.js/',
      },
    },
    {
      name: 'core-no-unresolvable',
      comment: 'Every import in core/ must resolve (a typo or a missing .js suffix shows up here).',
      severity: 'error',
      from: { path: '^core/' },
      to: { couldNotResolve: true },
    },
    {
      name: 'core-no-circular',
      comment: 'No import cycles inside core/.',
      severity: 'error',
      from: { path: '^core/' },
      to: { path: '^core/', circular: true },
    },
    {
      name: 'renderer-not-to-main-cli-preload',
      comment: 'The renderer reaches main only through the preload API; share types via app/shared/.',
      severity: 'error',
      from: { path: '^app/renderer/' },
      to: { path: '^app/(main|cli|preload)/' },
    },
    {
      name: 'cli-not-to-desktop',
      comment: 'The CLI runs under plain Node and uses core/ only, never the desktop app folders.',
      severity: 'error',
      from: { path: '^app/cli/' },
      to: { path: '^app/(main|renderer|preload)/' },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    // Do not exclude node_modules: excluding drops the edges into it, and
    // core-only-allowed-packages needs to see them. doNotFollow keeps the cruise out of it.
    exclude: { path: '(^|/)(dist|\\.tsbuild)/' },
    // Also treat process.getBuiltinModule('fs') as a dependency on a built-in.
    detectProcessBuiltinModuleCalls: true,
    // See type-only imports too: a type import from app/ into core/ is still a wrong-way edge.
    tsPreCompilationDeps: true,
    tsConfig: { fileName: 'tsconfig.base.json' },
    enhancedResolveOptions: {
      extensions: ['.ts', '.js', '.mjs', '.cjs', '.json'],
      exportsFields: ['exports'],
      conditionNames: ['import', 'require', 'node', 'default', 'types'],
      mainFields: ['module', 'main', 'types'],
    },
  },
};
