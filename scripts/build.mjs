// Bundles the CLI into dist/tilth.mjs so that `npx tilth` starts fast.
// Runs on `npm install` (prepare). bin/tilth.js falls back to the TypeScript
// sources through tsx when dist/ is missing or older than src/.
import { build } from 'esbuild';

const common = { bundle: true, platform: 'node', format: 'esm', target: 'node20', packages: 'external', sourcemap: true, logLevel: 'warning' };
// the library (package "main"/"exports"): the pure stages, no CLI
await build({ ...common, entryPoints: ['src/index.ts'], outfile: 'dist/index.js' });
await build({
  entryPoints: ['src/cli/main.ts'],
  outfile: 'dist/tilth.mjs',
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  packages: 'external',
  sourcemap: true,
  logLevel: 'warning',
});
