// Bundles tilth with esbuild on `npm install` (prepare):
// - dist/index.js: the library (package "main"/"exports"), its dependencies left as imports;
// - dist/tilth.mjs: the CLI with its dependencies bundled in, so `npx tilth` starts fast (about 0.3 s
//   instead of 0.45 s here: one file instead of hundreds of module lookups; see docs/performance.md).
// bin/tilth.js falls back to the TypeScript sources through tsx when dist/ is missing or older than src/.
import { build } from 'esbuild';

const common = {
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  sourcemap: true,
  logLevel: 'warning',
};
await build({ ...common, entryPoints: ['src/index.ts'], outfile: 'dist/index.js', packages: 'external' });
await build({
  ...common,
  entryPoints: ['src/cli/main.ts'],
  outfile: 'dist/tilth.mjs',
  // CommonJS packages inside an ES module bundle need a require()
  banner: {
    js: "import { createRequire as __tilthRequire } from 'node:module'; const require = __tilthRequire(import.meta.url);",
  },
});
