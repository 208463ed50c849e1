// Batch benchmark: `tilth batch` on N copies of the demo quarter (sample-fields/quarter, its plan, 2 m cells)
// against N sequential `tilth build` processes on the same fields, in the same run (ratio of wall times;
// CPU = user + system of the process tree from /usr/bin/time). Also times `tilth --version` (start-up) and
// a build up to its first progress line. Record the ratios and the load average in docs/performance.md.
//
// Usage: node scripts/bench-batch.mjs [--fields 20] [--workers N]
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  buildBundle,
  firstLine,
  load,
  machine,
  numberArg,
  QUARTER as Q,
  QUARTER_INPUTS,
  root,
  timeRun,
} from './bench-lib.mjs';

const N = numberArg('--fields', 20);
const WORKERS = numberArg('--workers', availableParallelism());
buildBundle();
const TILTH = join(root, 'bin', 'tilth.js');

/** Wall seconds, CPU seconds (user + system, children included) and peak RSS MB of `node ARGV` (exit 0 or 1). */
const timed = (argv, cwd) => timeRun(process.execPath, argv, { cwd, ok: [0, 1] });

const dir = mkdtempSync(join(tmpdir(), 'tilth-bench-batch-'));
try {
  console.log(`machine: ${machine()}; load average at start ${load()}`);
  const version = [0, 1, 2].map(() => timed([TILTH, '--version'], root)).sort((a, b) => a.wall - b.wall)[1];
  const build = ['build', ...QUARTER_INPUTS, '--cell', '2', '--force'];
  const first = (
    await Promise.all([0].map(() => firstLine([TILTH, ...build, '--out', join(dir, 'first')])))
  )[0];
  const fields = Array.from(
    { length: N },
    (_, i) =>
      `  - name: quarter ${i + 1}\n    samples: ${Q}/samples.csv\n    boundary: ${Q}/boundary.geojson\n    out: batch/q${i + 1}\n`,
  ).join('');
  writeFileSync(join(dir, 'farm.yaml'), `defaults:\n  plan: ${Q}/plan.yaml\n  cell: 2\nfields:\n${fields}`);
  const seq = { wall: 0, cpu: 0, rss: 0 };
  for (let i = 0; i < N; i++) {
    const t = timed([TILTH, ...build, '--out', join(dir, 'seq', `q${i + 1}`), '--quiet'], dir);
    seq.wall += t.wall;
    seq.cpu += t.cpu;
    seq.rss = Math.max(seq.rss, t.rss);
  }
  const bat = timed([TILTH, 'batch', 'farm.yaml', '--workers', String(WORKERS), '--quiet', '--force'], dir);
  console.log('');
  console.log('| case | wall s | CPU s | peak MB |');
  console.log('|---|---:|---:|---:|');
  console.log(
    `| tilth --version (median of 3) | ${version.wall.toFixed(3)} | ${version.cpu.toFixed(2)} | ${version.rss.toFixed(0)} |`,
  );
  console.log(
    `| tilth build quarter: spawn to first progress line | ${first?.toFixed(3) ?? 'n/a'} | - | - |`,
  );
  console.log(
    `| ${N} x tilth build (demo quarter, 2 m), one after another | ${seq.wall.toFixed(2)} | ${seq.cpu.toFixed(2)} | ${seq.rss.toFixed(0)} (largest) |`,
  );
  console.log(
    `| tilth batch, ${N} fields, ${WORKERS} worker threads | ${bat.wall.toFixed(2)} | ${bat.cpu.toFixed(2)} | ${bat.rss.toFixed(0)} |`,
  );
  console.log(
    `\nbatch speed-up (sequential wall / batch wall) = ${(seq.wall / bat.wall).toFixed(2)}; CPU ratio = ${(seq.cpu / bat.cpu).toFixed(2)}; target >= 1.7: ${seq.wall / bat.wall >= 1.7 ? 'met' : 'NOT met'}`,
  );
  console.log(`load average at end ${load()}`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
