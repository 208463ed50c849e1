/**
 * `--threads` end to end, from both places the CLI runs from: the esbuild bundle (built here into a private
 * folder by scripts/build.mjs, so dist/surface-worker.mjs and the chunks are what `npm install` makes) and
 * the TypeScript sources through tsx (bin/tilth.js with TILTH_FROM_SOURCE=1, as when dist/ is stale).
 * Grids must be the same byte for byte whatever the thread count; TILTH_THREADS_REPORT shows the workers
 * took part. Exact Float64 equality is checked in tests/surface/parallel.test.ts.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROOT } from '../helpers/cli.js';

const Q = join(ROOT, 'sample-fields', 'quarter');
// inside the repository (.tmp/ is ignored), so the bundle's require() finds node_modules
mkdirSync(join(ROOT, '.tmp'), { recursive: true });
const tmp = mkdtempSync(join(ROOT, '.tmp', 'threads-'));
const dist = join(tmp, 'dist');
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

beforeAll(() => {
  const b = spawnSync(process.execPath, ['scripts/build.mjs', '--outdir', dist], {
    cwd: ROOT,
    encoding: 'utf8',
  });
  expect(b.status, b.stderr).toBe(0);
});

function run(entry: string[], args: string[], env: Record<string, string> = {}) {
  const r = spawnSync(process.execPath, [...entry, ...args], {
    cwd: ROOT,
    encoding: 'utf8',
    env: { ...process.env, NO_COLOR: '1', TILTH_THREADS_REPORT: '1', ...env },
    timeout: 170_000,
  });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

/** `tilth surface` of P on the quarter at 1.5 m (about 290 000 cells, above the threads' minimum). */
function surface(entry: string[], threads: string, env: Record<string, string> = {}) {
  const out = join(tmp, `p-${entry.length}-${threads}-${env.TILTH_FROM_SOURCE ?? ''}.asc`);
  const args = ['surface', '--samples', join(Q, 'samples.csv'), '--boundary', join(Q, 'boundary.geojson')];
  args.push('--nutrient', 'p', '--cell', '1.5', '--decimals', '12', '--threads', threads, '--out', out);
  const r = run(entry, args, env);
  expect(r.code, r.stderr).toBe(0);
  return { asc: readFileSync(out, 'utf8'), report: r.stderr.match(/bands per thread ([\d/]+)/)?.[1] };
}

describe('--threads', () => {
  const bundle = [join(dist, 'tilth.mjs')];
  const source = [join(ROOT, 'bin', 'tilth.js')];

  it('the bundle: 1, 2 and 3 threads write the same grid; the workers load dist/surface-worker.mjs', () => {
    const one = surface(bundle, '1');
    expect(one.report).toBeUndefined(); // one thread: no workers
    for (const t of ['2', '3']) {
      const many = surface(bundle, t);
      expect(many.report?.split('/')).toHaveLength(Number(t));
      expect(many.asc === one.asc).toBe(true);
    }
  });

  it('the sources through tsx: 2 threads write the same grid as the bundle with 1', () => {
    const one = surface(bundle, '1');
    const src = surface(source, '2', { TILTH_FROM_SOURCE: '1' });
    expect(src.report?.split('/')).toHaveLength(2);
    expect(src.asc === one.asc).toBe(true);
  });

  it('a build with 2 threads writes the same prescription as with 1', () => {
    const files = (threads: string) => {
      const out = join(tmp, `rx-${threads}`);
      const args = ['build', '--samples', join(Q, 'samples.csv'), '--boundary', join(Q, 'boundary.geojson')];
      args.push('--plan', join(Q, 'plan.yaml'), '--cell', '2', '--threads', threads, '--out', out, '--quiet');
      const r = run(bundle, args);
      expect(r.code, r.stderr).toBe(0);
      return ['prescription.geojson', 'zones.csv'].map((f) => readFileSync(join(out, f), 'utf8'));
    };
    expect(files('2')).toEqual(files('1'));
  });

  it('--threads 0 is a user error (exit 2) naming the option', () => {
    const r = run(
      bundle,
      ['surface', '--samples', 'x.csv', '--boundary', 'y.geojson', '--nutrient', 'p'].concat([
        '--out',
        join(tmp, 'z.asc'),
        '--threads',
        '0',
      ]),
    );
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--threads: "0" is not a whole number >= 1/);
  });
});
