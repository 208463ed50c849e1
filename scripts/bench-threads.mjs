// Threads benchmark: the same `tilth surface` (and optionally `tilth build`) run with --threads 1 and with
// --threads N, alternating in pairs so that the machine's load hits both alike; medians of wall and CPU
// seconds (user + system of every thread, /usr/bin/time) and the median of the paired wall ratios. Input: the
// synthetic section of scripts/bench-section.mjs (1609 x 1609 cells at 1 m, 5000 samples).
//
// Usage: node scripts/bench-threads.mjs [--pairs 5] [--threads N] [--build]
//   --threads: the many-thread count (default: the machine's cores); --build: also pair whole builds
import { mkdtempSync, rmSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { makeSection } from './bench-section.mjs';
import { buildBundle, load, machine, med, numberArg, root, timeRun } from './bench-lib.mjs';

const PAIRS = numberArg('--pairs', 5);
const MANY = numberArg('--threads', availableParallelism());
buildBundle();
const TILTH = join(root, 'bin', 'tilth.js');

/** Wall and CPU seconds of one tilth run (exit 1, infeasible zones, is accepted for builds). */
const timed = (argv) => timeRun(process.execPath, [TILTH, ...argv], { ok: [0, 1] });

function pairs(label, argv) {
  const one = [],
    many = [];
  for (let i = 0; i < PAIRS; i++) {
    one.push(timed([...argv, '--threads', '1']));
    many.push(timed([...argv, '--threads', String(MANY)]));
  }
  const ratio = med(one.map((o, i) => o.wall / many[i].wall));
  const f = (x) => x.toFixed(2);
  console.log(
    `| ${label} | ${f(med(one.map((x) => x.wall)))} | ${f(med(one.map((x) => x.cpu)))} | ${f(med(many.map((x) => x.wall)))} | ${f(med(many.map((x) => x.cpu)))} | ${f(ratio)} |`,
  );
}

const dir = mkdtempSync(join(tmpdir(), 'tilth-bench-threads-'));
try {
  makeSection(dir, TILTH);
  console.log(`machine: ${machine()}; ${PAIRS} pairs; load average at start ${load()}`);
  console.log(
    `\n| case | 1 thread wall s | CPU s | ${MANY} threads wall s | CPU s | paired wall ratio 1 / ${MANY} |`,
  );
  console.log('|---|---:|---:|---:|---:|---:|');
  const inputs = ['--samples', join(dir, 'samples.geojson'), '--boundary', join(dir, 'boundary.geojson')];
  pairs('tilth surface, P, power 2, 12 neighbours, 1 m (2.59 M cells, 5000 samples)', [
    'surface',
    ...inputs,
    ...['--nutrient', 'p', '--cell', '1', '--power', '2', '--neighbours', '12'],
    ...['--out', join(dir, 'p.asc'), '--force'],
  ]);
  pairs('tilth surface, P, power and neighbours by cross-validation, 1 m', [
    'surface',
    ...inputs,
    ...['--nutrient', 'p', '--cell', '1', '--out', join(dir, 'p.asc'), '--force'],
  ]);
  if (process.argv.includes('--build'))
    pairs('tilth build (five surfaces, zones, report), 1 m', [
      'build',
      ...inputs,
      ...['--plan', join(dir, 'plan.yaml'), '--cell', '1', '--out', join(dir, 'rx'), '--force', '--quiet'],
    ]);
  console.log(`\nload average at end ${load()}`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
