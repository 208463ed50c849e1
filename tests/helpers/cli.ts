/** Runs the tilth CLI as a user would (node bin/tilth.js ...), from the TypeScript sources. */
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';

export const ROOT = join(import.meta.dirname, '..', '..');

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs `tilth args...` in `cwd` (default the repository root). */
export function tilth(
  args: string[],
  opts: { cwd?: string; env?: Record<string, string>; input?: string } = {},
): CliResult {
  const r = spawnSync(process.execPath, [join(ROOT, 'bin', 'tilth.js'), ...args], {
    cwd: opts.cwd ?? ROOT,
    // bin/tilth.js runs the esbuild bundle when it is newer than src/, else the sources through tsx
    env: { ...process.env, NO_COLOR: '1', ...opts.env },
    encoding: 'utf8',
    input: opts.input,
    timeout: 120_000,
  });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

/**
 * `tilth build` of the demo quarter (sample-fields/quarter, paths from the repository root) into `out`, with
 * its own samples and plan unless given; options after it are added by the caller.
 * @example tilth([...quarterBuild(out), '--quiet']); quarterBuild(out, { plan: 'p.yaml' })
 */
export const quarterBuild = (out: string, over: { samples?: string; plan?: string } = {}): string[] => [
  'build',
  '--samples',
  over.samples ?? 'sample-fields/quarter/samples.csv',
  '--boundary',
  'sample-fields/quarter/boundary.geojson',
  '--plan',
  over.plan ?? 'sample-fields/quarter/plan.yaml',
  '--out',
  out,
];
