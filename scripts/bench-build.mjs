// Build benchmark: the whole `tilth build` CLI process (start, read, surfaces with
// cross-validation, targets, classes, cleaning, polygons, rates, every output written) on
//   - the demo quarter (sample-fields/quarter) at 2 m cells, and
//   - a synthetic, seeded 640 ac section (1609 m square near 52 N 106.5 W, invented) at 1 m cells with
//     5000 samples,
// against GDAL's three-step chain on the same section data in the same run when GDAL is installed:
// gdal_grid -a invdist:power=2:smoothing=0 (all points) -> gdal_calc.py (5 equal-interval classes) ->
// gdal_polygonize.py, on the same 1 m grid (1609 x 1609 cells).
// Medians of several runs (wall); peak memory from /usr/bin/time -v (maximum resident set size).
// One extra run per case times the build's stages from its progress lines on stderr.
//
// Usage: node scripts/bench-build.mjs [--runs 5] [--quick] [--pairs N] [--nn] [--keep]
//   --quick (or TILTH_BENCH_QUICK=1): 1 run per figure (the section takes tens of seconds a run)
//   --pairs N: then N alternating pairs (one section build, one GDAL chain) and the median of the N ratios:
//     on a shared machine whose speed drifts from minute to minute, a ratio within a pair is steadier than a
//     ratio of medians taken minutes apart
//   --nn: also time gdal_grid invdistnn:power=2:max_points=12 on the section (takes many minutes)
//   --keep: keep the temporary folder with the synthetic inputs and outputs, and print its path
//   TILTH_BENCH_CLI=dist/x.mjs: time that entry point instead of bin/tilth.js (experiments)
//   TILTH_BENCH_ARGS="--threads 1": extra arguments for every tilth build
import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { makeSection, N_SAMPLES, SIDE, X0, Y0 } from './bench-section.mjs';
import {
  buildBundle,
  gdalGridFrame,
  load,
  machine,
  measure,
  med,
  QUARTER_INPUTS,
  root,
  TILTH,
  timeRun,
} from './bench-lib.mjs';

const args = process.argv.slice(2);
const QUICK = args.includes('--quick') || process.env.TILTH_BENCH_QUICK === '1';
const RUNS = QUICK ? 1 : Number(args[args.indexOf('--runs') + 1]) || 5;
const SECTION_RUNS = QUICK ? 1 : Math.min(RUNS, 3);
const NN = args.includes('--nn');
const PAIRS = args.includes('--pairs') ? Number(args[args.indexOf('--pairs') + 1]) || 3 : 0;
const KEEP = args.includes('--keep');
const HAS_GDAL = ['gdal_grid', 'gdal_calc.py', 'gdal_polygonize.py'].every(
  (c) => !spawnSync(c, ['--help'], { stdio: 'ignore' }).error,
);

// the bundle is what `npx tilth` runs; make sure it is current (TILTH_BENCH_CLI=path times another entry point)
buildBundle();
// TILTH_BENCH_ARGS="--threads 1": extra arguments for every tilth build
const EXTRA = (process.env.TILTH_BENCH_ARGS ?? '').split(/\s+/).filter(Boolean);

/** One run of `tilth build`, timing each stage from the progress lines it prints on stderr. */
function stages(argv) {
  return new Promise((resolve, reject) => {
    const t0 = process.hrtime.bigint();
    const at = () => Number(process.hrtime.bigint() - t0) / 1e9;
    const marks = [];
    const child = spawn(process.execPath, [TILTH, ...argv, ...EXTRA], {
      cwd: root,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let buf = '';
    child.stdout.resume();
    child.stderr.on('data', (d) => {
      buf += d;
      let i;
      while ((i = buf.indexOf('\n')) >= 0) {
        const line = buf.slice(0, i);
        buf = buf.slice(i + 1);
        // "step ..." starts a step; "step: done in 276 ms" (the terminal helper off a TTY) ends one
        const m = /^(.*) \.\.\.$/.exec(line.trim());
        const d = /^(.*): done in ([\d.]+) (ms|s)\b/.exec(line.trim());
        if (m) marks.push({ step: m[1], t: at() });
        else if (d) marks.push({ step: d[1], t: at() - Number(d[2]) / (d[3] === 'ms' ? 1000 : 1) });
      }
    });
    child.on('error', reject);
    child.on('close', (code) => {
      if (code !== 0 && code !== 1) return reject(new Error(`tilth build exited ${code}`));
      const end = at();
      marks.sort((a, b) => a.t - b.t);
      const rows = [
        { step: 'start, read plan (before the first progress line)', s: marks.length ? marks[0].t : end },
      ];
      marks.forEach((m, i) =>
        rows.push({ step: m.step, s: (i + 1 < marks.length ? marks[i + 1].t : end) - m.t }),
      );
      resolve({ rows, total: end });
    });
  });
}

/** GDAL's chain on the section: gdal_grid invdist (all points), gdal_calc.py (classes), gdal_polygonize.py. */
function chainSteps(grid, calc) {
  return [
    [
      'gdal_grid',
      [...grid, '-a', 'invdist:power=2:smoothing=0', join(dir, 'points.vrt'), join(dir, 'p.tif')],
    ],
    [
      'gdal_calc.py',
      [
        '--quiet',
        '--overwrite',
        '-A',
        join(dir, 'p.tif'),
        '--outfile',
        join(dir, 'class.tif'),
        '--type',
        'Byte',
        '--NoDataValue',
        '0',
        '--calc',
        calc,
      ],
    ],
    [
      'sh',
      [
        '-c',
        `rm -f ${join(dir, 'zones.gpkg')} && gdal_polygonize.py -q ${join(dir, 'class.tif')} -of GPKG ${join(dir, 'zones.gpkg')} zones class`,
      ],
    ],
  ];
}

const f3 = (x) => (Number.isFinite(x) ? x.toFixed(3) : 'n/a');
const f0 = (x) => (Number.isFinite(x) ? x.toFixed(0) : 'n/a');

console.log(`machine: ${machine()}; load average at start ${load()}`);
console.log(
  `quarter: ${RUNS} runs, section: ${SECTION_RUNS} runs per figure (median wall, median CPU = user + system, max peak RSS)`,
);

const dir = mkdtempSync(join(tmpdir(), 'tilth-bench-build-'));
const results = [];
try {
  // 1. the demo quarter at 2 m cells
  const qArgs = ['build', ...QUARTER_INPUTS, '--out', join(dir, 'rx-quarter'), '--force', '--cell', '2'];
  const tq = measure(process.execPath, [TILTH, ...qArgs, ...EXTRA], RUNS, root, [0, 1]);
  results.push({ name: 'quarter (demo, 2 m cells)', ...tq });
  const sq = await stages(qArgs);

  // 2. the synthetic section at 1 m cells, 5000 samples
  const { pmin, pmax } = makeSection(dir, TILTH);
  const sArgs = [
    'build',
    '--samples',
    join(dir, 'samples.geojson'),
    '--boundary',
    join(dir, 'boundary.geojson'),
    '--plan',
    join(dir, 'plan.yaml'),
    '--out',
    join(dir, 'rx-section'),
    '--force',
    '--cell',
    '1',
  ];
  const ts = measure(process.execPath, [TILTH, ...sArgs, ...EXTRA], SECTION_RUNS, root, [0, 1]);
  results.push({ name: `section (synthetic, 1 m cells, ${N_SAMPLES} samples)`, ...ts });
  const ss = await stages(sArgs);

  // 3. GDAL's chain on the section's points and grid
  let chain = null;
  if (HAS_GDAL) {
    const grid = [
      ...['-q', '-ot', 'Float32', '-of', 'GTiff', '-a_srs', 'EPSG:32613'],
      ...gdalGridFrame(X0, X0 + SIDE, Y0 + SIDE, Y0, SIDE, SIDE),
    ];
    // five equal-interval classes of P Olsen between the samples' min and max
    const br = [1, 2, 3, 4].map((k) => pmin + ((pmax - pmin) * k) / 5);
    const calc = `1+${br.map((b) => `(A>${b.toFixed(4)})`).join('+')}`;
    const steps = chainSteps(grid, calc);
    const [g1, g2, g3] = steps.map(([cmd, argv]) => measure(cmd, argv, SECTION_RUNS, dir));
    const nz = spawnSync('ogrinfo', ['-so', join(dir, 'zones.gpkg'), 'zones'], {
      encoding: 'utf8',
    }).stdout.match(/Feature Count: (\d+)/)?.[1];
    chain = {
      g1,
      g2,
      g3,
      wall: g1.wall + g2.wall + g3.wall,
      cpu: g1.cpu + g2.cpu + g3.cpu,
      rss: Math.max(g1.rss, g2.rss, g3.rss),
      polygons: nz,
      calc,
    };
    let gnn = null;
    if (NN)
      gnn = measure(
        'gdal_grid',
        [
          ...grid,
          '-a',
          `invdistnn:power=2:max_points=12:radius=${2 * SIDE}`,
          join(dir, 'points.vrt'),
          join(dir, 'pnn.tif'),
        ],
        1,
        dir,
      );
    chain.nn = gnn;
    // alternating pairs: the section build, then the chain, N times; the ratio within each pair
    if (PAIRS > 0) {
      const ratios = [];
      for (let p = 0; p < PAIRS; p++) {
        const t = timeRun(process.execPath, [TILTH, ...sArgs, ...EXTRA], { cwd: root, ok: [0, 1] }).wall;
        const g = steps.reduce((a, [cmd, argv]) => a + timeRun(cmd, argv, { cwd: dir }).wall, 0);
        ratios.push({ t, g, r: t / g });
      }
      chain.pairs = ratios;
    }
  }
  const loadEnd = load();

  console.log('');
  console.log('| case | wall s (median) | CPU s | peak MB |');
  console.log('|---|---:|---:|---:|');
  for (const r of results)
    console.log(`| tilth build: ${r.name} | ${f3(r.wall)} | ${f3(r.cpu)} | ${f0(r.rss)} |`);
  if (chain) {
    console.log(
      `| gdal_grid -a invdist:power=2:smoothing=0 (all ${N_SAMPLES} points, ${SIDE} x ${SIDE}) | ${f3(chain.g1.wall)} | ${f3(chain.g1.cpu)} | ${f0(chain.g1.rss)} |`,
    );
    console.log(
      `| gdal_calc.py (5 equal-interval classes, Byte) | ${f3(chain.g2.wall)} | ${f3(chain.g2.cpu)} | ${f0(chain.g2.rss)} |`,
    );
    console.log(
      `| gdal_polygonize.py (GPKG, ${chain.polygons ?? '?'} polygons) | ${f3(chain.g3.wall)} | ${f3(chain.g3.cpu)} | ${f0(chain.g3.rss)} |`,
    );
    console.log(
      `| GDAL chain total | ${f3(chain.wall)} | ${f3(chain.cpu)} | ${f0(chain.rss)} (largest step) |`,
    );
    if (chain.nn)
      console.log(
        `| gdal_grid -a invdistnn:power=2:max_points=12 (1 run) | ${f3(chain.nn.wall)} | ${f3(chain.nn.cpu)} | ${f0(chain.nn.rss)} |`,
      );
  } else {
    console.log(
      '(GDAL not installed: gdal_grid, gdal_calc.py and gdal_polygonize.py are needed for the comparison)',
    );
  }
  console.log('');
  const sec = results[1],
    qu = results[0];
  if (chain)
    console.log(
      `section: tilth build / GDAL chain (wall) = ${(sec.wall / chain.wall).toFixed(2)}; target <= 1: ${sec.wall <= chain.wall ? 'met' : 'NOT met'}`,
    );
  console.log(
    `section: peak memory ${f0(sec.rss)} MB; target < 500 MB: ${sec.rss < 500 ? 'met' : Number.isFinite(sec.rss) ? 'NOT met' : 'not measured (/usr/bin/time missing)'}`,
  );
  if (chain?.pairs) {
    const r = chain.pairs.map((x) => x.r);
    console.log(
      `section: ${r.length} alternating pairs, build / chain (wall) = ${chain.pairs.map((x) => `${f3(x.t)}/${f3(x.g)}`).join(', ')}; median ratio ${med(r).toFixed(2)} (range ${Math.min(...r).toFixed(2)}-${Math.max(...r).toFixed(2)})`,
    );
  }
  console.log(`quarter at 2 m: ${f3(qu.wall)} s; target < 1 s: ${qu.wall < 1 ? 'met' : 'NOT met'}`);
  for (const [name, st] of [
    ['quarter', sq],
    ['section', ss],
  ]) {
    console.log(`\nstages of one ${name} run (from the progress lines; wall ${f3(st.total)} s):`);
    console.log('| stage | wall s |');
    console.log('|---|---:|');
    for (const r of st.rows) console.log(`| ${r.step} | ${f3(r.s)} |`);
  }
  console.log(`\nload average at end ${loadEnd}`);
  if (chain) console.log(`gdal_calc expression: ${chain.calc}`);
} finally {
  if (KEEP) console.log(`inputs and outputs kept in ${dir}`);
  else rmSync(dir, { recursive: true, force: true });
}
