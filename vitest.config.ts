import { availableParallelism } from 'node:os';
import { defineConfig } from 'vitest/config';

/**
 * Two tiers (docs/architecture.md, "Tests"):
 * - `npm test` runs `vitest run --mode fast`: unit and property tests only, under a minute. Files named
 *   `*.cli.test.ts` (the CLI end to end), `*.e2e.test.ts` (whole builds of a demo field in process) and
 *   `*.tool.test.ts` (outside programs: GDAL, R, Chromium) are left out, and `requireTool` skips the
 *   outside-program checks inside other files (TILTH_TIER=fast). The fast tier runs one worker per core and
 *   shares loaded modules between the files of a worker (`isolate: false`: no test changes global state), which
 *   halves its time; tests must not mock modules or change process.env.
 * - `npm run test:all` (and plain `npx vitest run FILE`) runs everything, each file in its own process.
 */
export default defineConfig(({ mode }) => {
  const fast = mode === 'fast';
  return {
    test: {
      include: ['tests/**/*.test.ts', 'src/**/*.test.ts'],
      // every temporary file of the run under one folder, removed at the end (tests/globalSetup.ts)
      globalSetup: ['tests/globalSetup.ts'],
      exclude: fast
        ? ['**/node_modules/**', '**/*.cli.test.ts', '**/*.e2e.test.ts', '**/*.tool.test.ts']
        : ['**/node_modules/**'],
      env: fast ? { TILTH_TIER: 'fast' } : {},
      // the CLI end to end on a shared 2-core machine can take minutes under load; speed is measured in benchmarks
      testTimeout: 180_000,
      hookTimeout: 180_000,
      pool: 'forks',
      ...(fast ? { isolate: false, maxWorkers: availableParallelism() } : {}),
    },
  };
});
