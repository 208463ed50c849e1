// Start-up benchmark: `tilth --version`, `--help` of single commands and a build of the demo quarter up to its
// first progress line, as whole processes (wall from spawn, CPU = user + system from /usr/bin/time), plus bare
// `node -e 0` for scale. Medians of several runs. Record the figures and the load average in docs/performance.md.
//
// Usage: node scripts/bench-startup.mjs [--runs 7]
//   TILTH_BENCH_CLI=path: time that entry point instead of bin/tilth.js (e.g. an older bundle)
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  buildBundle,
  firstLine,
  load,
  machine,
  med,
  numberArg,
  QUARTER_INPUTS,
  TILTH,
  timeRun,
} from './bench-lib.mjs';

const RUNS = numberArg('--runs', 7) || 7;
if (!process.env.TILTH_BENCH_CLI) buildBundle();

/** Wall and CPU seconds of one process. */
const timed = (argv) => timeRun(process.execPath, argv);

const dir = mkdtempSync(join(tmpdir(), 'tilth-bench-startup-'));
try {
  console.log(`machine: ${machine()}; ${TILTH}; load average at start ${load()}`);
  const rows = [];
  const series = (label, f) => {
    const t = Array.from({ length: RUNS }, f);
    rows.push([label, med(t.map((x) => x.wall)), med(t.map((x) => x.cpu))]);
  };
  series('node -e 0', () => timed(['-e', '0']));
  series('tilth --version', () => timed([TILTH, '--version']));
  for (const c of ['inspect', 'surface', 'build'])
    series(`tilth ${c} --help (loads that command)`, () => timed([TILTH, c, '--help']));
  const build = ['build', ...QUARTER_INPUTS, '--cell', '2', '--force', '--out', join(dir, 'out')];
  const first = [];
  for (let i = 0; i < RUNS; i++) first.push(await firstLine([TILTH, ...build], true));
  rows.push(['tilth build (quarter): spawn to first progress line', med(first), NaN]);
  console.log('\n| case | median wall s | median CPU s |\n|---|---:|---:|');
  for (const [l, w, c] of rows)
    console.log(`| ${l} | ${w.toFixed(3)} | ${Number.isFinite(c) ? c.toFixed(2) : '-'} |`);
  console.log(`\n${RUNS} runs each; load average at end ${load()}`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
