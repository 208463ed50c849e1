// Threads benchmark: the same `tilth surface` (and optionally `tilth build`) run with --threads 1 and with
// --threads N, alternating in pairs so that the machine's load hits both alike; medians of wall and CPU
// seconds (user + system of every thread, /usr/bin/time) and the median of the paired wall ratios. Input: the
// synthetic section of scripts/bench-section.mjs (1609 x 1609 cells at 1 m, 5000 samples).
//
// Usage: node scripts/bench-threads.mjs [--pairs 5] [--threads N] [--build]
//   --threads: the many-thread count (default: the machine's cores); --build: also pair whole builds
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { availableParallelism, cpus, loadavg, tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { makeSection } from './bench-section.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);
const arg = (name, dflt) => (args.includes(name) ? Number(args[args.indexOf(name) + 1]) : dflt);
const PAIRS = arg('--pairs', 5);
const MANY = arg('--threads', availableParallelism());
const TIME = existsSync('/usr/bin/time') ? '/usr/bin/time' : null;
execFileSync(process.execPath, [join(root, 'scripts', 'build.mjs')], { cwd: root, stdio: 'inherit' });
const TILTH = join(root, 'bin', 'tilth.js');
const med = (a) => [...a].sort((x, y) => x - y)[a.length >> 1];
const load = () =>
  loadavg()
    .map((x) => x.toFixed(2))
    .join(', ');

/** Wall and CPU seconds of one tilth run (exit 1, infeasible zones, is accepted for builds). */
function timed(argv) {
  const t0 = process.hrtime.bigint();
  const r = TIME
    ? spawnSync(TIME, ['-v', process.execPath, TILTH, ...argv], { cwd: root, encoding: 'utf8' })
    : spawnSync(process.execPath, [TILTH, ...argv], { cwd: root, encoding: 'utf8' });
  const wall = Number(process.hrtime.bigint() - t0) / 1e9;
  if (r.status !== 0 && r.status !== 1) throw new Error(`tilth ${argv.join(' ')} failed:\n${r.stderr}`);
  const num = (re) => Number(re.exec(r.stderr ?? '')?.[1] ?? NaN);
  return { wall, cpu: num(/User time \(seconds\): ([\d.]+)/) + num(/System time \(seconds\): ([\d.]+)/) };
}

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
  console.log(
    `machine: ${cpus().length} x ${cpus()[0]?.model ?? 'cpu'}; node ${process.version}; ${PAIRS} pairs; load average at start ${load()}`,
  );
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
  if (args.includes('--build'))
    pairs('tilth build (five surfaces, zones, report), 1 m', [
      'build',
      ...inputs,
      ...['--plan', join(dir, 'plan.yaml'), '--cell', '1', '--out', join(dir, 'rx'), '--force', '--quiet'],
    ]);
  console.log(`\nload average at end ${load()}`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
