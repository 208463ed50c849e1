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

/** `tilth surface` of P on the quarter at 1.25 m (about 410 000 cells, above the threads' minimum). */
function surface(entry: string[], threads: string, env: Record<string, string> = {}) {
  const out = join(tmp, `p-${entry.length}-${threads}-${env.TILTH_FROM_SOURCE ?? ''}.asc`);
  const args = ['surface', '--samples', join(Q, 'samples.csv'), '--boundary', join(Q, 'boundary.geojson')];
  args.push('--nutrient', 'p', '--cell', '1.25', '--decimals', '12', '--threads', threads, '--out', out);
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

  /** A build of the quarter at 2 m: its prescription and report files, and what the threads did (stderr). */
  function build(entry: string[], threads: string, env: Record<string, string> = {}) {
    const out = join(tmp, `rx-${entry.length}-${threads}-${env.TILTH_FROM_SOURCE ?? ''}`);
    const args = ['build', '--samples', join(Q, 'samples.csv'), '--boundary', join(Q, 'boundary.geojson')];
    args.push(
      '--plan',
      join(Q, 'plan.yaml'),
      '--cell',
      '2',
      '--threads',
      threads,
      '--out',
      out,
      '--quiet',
      '--force',
    );
    const r = run(entry, args, env);
    expect(r.code, r.stderr).toBe(0);
    const files = ['prescription.geojson', 'zones.csv', 'report.html', 'report-data.json'];
    return {
      files: files.map((f) => readFileSync(join(out, f), 'utf8')),
      pages: r.stderr.match(/sulphate-S pages: (.*)/)?.[1],
    };
  }

  it('a build with 2 threads writes the same prescription and report as with 1; the S pages come from the report worker', () => {
    const one = build(bundle, '1');
    expect(one.pages).toBeUndefined(); // one thread: no report worker
    const two = build(bundle, '2');
    expect(two.pages).toBe('made on a second thread beside the zones');
    expect(two.files).toEqual(one.files);
    // the report has the S pages at all (so the comparison above covers them)
    expect(one.files[2]).toMatch(/chance below 20 lb S\/ac/);
    expect(one.files[2]).toMatch(/Semivariogram of/);
  });

  it('the sources through tsx: the report worker runs src/cli/reportWorker.ts; the same report', () => {
    const one = build(bundle, '1');
    const src = build(source, '2', { TILTH_FROM_SOURCE: '1' });
    expect(src.pages).toBe('made on a second thread beside the zones');
    expect(src.files).toEqual(one.files);
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
