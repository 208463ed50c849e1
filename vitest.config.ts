import { defineConfig } from 'vitest/config';

/**
 * Two tiers (docs/architecture.md, "Tests"):
 * - `npm test` runs `vitest run --mode fast`: unit and property tests only, under a minute. Files named
 *   `*.cli.test.ts` (the CLI end to end) and `*.tool.test.ts` (outside programs: GDAL, R, Chromium) are left
 *   out, and `requireTool` skips the outside-program checks inside other files (TILTH_TIER=fast).
 * - `npm run test:all` (and plain `npx vitest run FILE`) runs everything.
 */
export default defineConfig(({ mode }) => {
  const fast = mode === 'fast';
  return {
    test: {
      include: ['tests/**/*.test.ts', 'src/**/*.test.ts'],
      exclude: fast
        ? ['**/node_modules/**', '**/*.cli.test.ts', '**/*.tool.test.ts']
        : ['**/node_modules/**'],
      env: fast ? { TILTH_TIER: 'fast' } : {},
      // the CLI end to end on a shared 2-core machine can take minutes under load; speed is measured in benchmarks
      testTimeout: 180_000,
      hookTimeout: 180_000,
      pool: 'forks',
    },
  };
});
