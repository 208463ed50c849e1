// Start-up benchmark: `tilth --version`, `--help` of single commands and a build of the demo quarter up to its
// first progress line, as whole processes (wall from spawn, CPU = user + system from /usr/bin/time), plus bare
// `node -e 0` for scale. Medians of several runs. Record the figures and the load average in docs/performance.md.
//
// Usage: node scripts/bench-startup.mjs [--runs 7]
//   TILTH_BENCH_CLI=path: time that entry point instead of bin/tilth.js (e.g. an older bundle)
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);
const RUNS = Number(args[args.indexOf('--runs') + 1]) || 7;
const TIME = existsSync('/usr/bin/time') ? '/usr/bin/time' : null;
const TILTH = process.env.TILTH_BENCH_CLI
  ? join(root, process.env.TILTH_BENCH_CLI)
  : join(root, 'bin', 'tilth.js');
if (!process.env.TILTH_BENCH_CLI)
  execFileSync(process.execPath, [join(root, 'scripts', 'build.mjs')], { cwd: root, stdio: 'inherit' });
const Q = join(root, 'sample-fields', 'quarter');
const med = (a) => [...a].sort((x, y) => x - y)[a.length >> 1];
const load = () =>
  loadavg()
    .map((x) => x.toFixed(2))
    .join(', ');

/** Wall and CPU seconds of one process. */
function timed(argv) {
  const t0 = process.hrtime.bigint();
  const r = TIME
    ? spawnSync(TIME, ['-v', process.execPath, ...argv], { cwd: root, encoding: 'utf8' })
    : spawnSync(process.execPath, argv, { cwd: root, encoding: 'utf8' });
  const wall = Number(process.hrtime.bigint() - t0) / 1e9;
  if (r.status !== 0) throw new Error(`${argv.join(' ')} failed (${r.status}):\n${r.stderr}`);
  const num = (re) => Number(re.exec(r.stderr ?? '')?.[1] ?? NaN);
  return {
    wall,
    cpu: num(/User time \(seconds\): ([\d.]+)/) + num(/System time \(seconds\): ([\d.]+)/),
  };
}

/** Seconds from spawn to the first line on stderr; the process is then stopped. */
function firstLine(argv) {
  return new Promise((resolve, reject) => {
    const t0 = process.hrtime.bigint();
    const c = spawn(process.execPath, argv, { cwd: root, stdio: ['ignore', 'ignore', 'pipe'] });
    let seen = null;
    c.stderr.on('data', () => {
      if (seen !== null) return;
      seen = Number(process.hrtime.bigint() - t0) / 1e9;
      c.kill();
    });
    c.on('error', reject);
    c.on('close', () => resolve(seen));
  });
}

const dir = mkdtempSync(join(tmpdir(), 'tilth-bench-startup-'));
try {
  console.log(
    `machine: ${cpus().length} x ${cpus()[0]?.model ?? 'cpu'}; node ${process.version}; ${TILTH}; load average at start ${load()}`,
  );
  const rows = [];
  const series = (label, f) => {
    const t = Array.from({ length: RUNS }, f);
    rows.push([label, med(t.map((x) => x.wall)), med(t.map((x) => x.cpu))]);
  };
  series('node -e 0', () => timed(['-e', '0']));
  series('tilth --version', () => timed([TILTH, '--version']));
  for (const c of ['inspect', 'surface', 'build'])
    series(`tilth ${c} --help (loads that command)`, () => timed([TILTH, c, '--help']));
  const build = ['build', '--samples', `${Q}/samples.csv`, '--boundary', `${Q}/boundary.geojson`];
  build.push('--plan', `${Q}/plan.yaml`, '--cell', '2', '--force', '--out', join(dir, 'out'));
  const first = [];
  for (let i = 0; i < RUNS; i++) first.push(await firstLine([TILTH, ...build]));
  rows.push(['tilth build (quarter): spawn to first progress line', med(first), NaN]);
  console.log('\n| case | median wall s | median CPU s |\n|---|---:|---:|');
  for (const [l, w, c] of rows)
    console.log(`| ${l} | ${w.toFixed(3)} | ${Number.isFinite(c) ? c.toFixed(2) : '-'} |`);
  console.log(`\n${RUNS} runs each; load average at end ${load()}`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
