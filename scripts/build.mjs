// Bundles tilth with esbuild on `npm install` (prepare):
// - dist/index.js: the library (package "main"/"exports"), its dependencies left as imports;
// - dist/tilth.mjs: the CLI with its dependencies bundled in (one module graph instead of hundreds of package
//   lookups), split into chunks (dist/chunk-*.mjs) so that each command loads only what it uses: main.ts
//   imports the command modules with import() (docs/performance.md, "Start-up");
// - dist/surface-worker.mjs: the entry of the surface worker threads (src/surface/worker.ts, started by
//   src/cli/threads.ts), sharing its chunks with the CLI;
// - dist/report-worker.mjs: the entry of the report worker thread (src/cli/reportWorker.ts, started by
//   src/cli/sulphurAhead.ts), the same way.
// bin/tilth.js falls back to the TypeScript sources through tsx when dist/ is missing or older than src/.
// `node scripts/build.mjs --outdir DIR` writes only the CLI and worker into DIR (tests build a private copy).
import { build } from 'esbuild';
import { existsSync, readdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';

const args = process.argv.slice(2);
const outdir = args.includes('--outdir') ? args[args.indexOf('--outdir') + 1] : 'dist';

const common = {
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  sourcemap: true,
  logLevel: 'warning',
};
if (outdir === 'dist')
  await build({ ...common, entryPoints: ['src/index.ts'], outfile: 'dist/index.js', packages: 'external' });
// chunks are named by content hash: drop the previous build's
if (existsSync(outdir))
  for (const f of readdirSync(outdir)) if (/^chunk-.*\.mjs(\.map)?$/.test(f)) rmSync(join(outdir, f));
await build({
  ...common,
  entryPoints: {
    tilth: 'src/cli/main.ts',
    'surface-worker': 'src/surface/worker.ts',
    'report-worker': 'src/cli/reportWorker.ts',
  },
  outdir,
  splitting: true,
  outExtension: { '.js': '.mjs' },
  chunkNames: 'chunk-[hash]',
  // CommonJS packages inside an ES module bundle need a require() (each output file is its own module)
  banner: {
    js: "import { createRequire as __tilthRequire } from 'node:module'; const require = __tilthRequire(import.meta.url);",
  },
});
