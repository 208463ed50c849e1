// Surface benchmark: the whole `tilth surface` process (start, read, project, index, interpolate,
// write) on seeded data, against gdal_grid on the same points and grid when it is installed.
// Medians of several runs; peak memory from /usr/bin/time -v (max resident set size).
// Usage: node scripts/bench-surface.mjs [--runs 5] [--nn] [--only-kriging] [--no-kriging]   (--nn also times gdal_grid
// invdistnn on the largest cases, which takes minutes)
//   TILTH_BENCH_CLI=path: time that entry point instead of bin/tilth.js (e.g. an older bundle kept for comparison)
//   TILTH_BENCH_ARGS="--threads 1": extra arguments for every tilth run
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import proj4 from 'proj4';
import {
  buildBundle,
  gdalGridFrame,
  load,
  machine,
  measure,
  med,
  root,
  TILTH,
  writePoints,
  writeSquareBoundary,
} from './bench-lib.mjs';

const args = process.argv.slice(2);
const RUNS = Number(args[args.indexOf('--runs') + 1]) || 5;
const NN_ALL = args.includes('--nn');
const ONLY_KRIGING = args.includes('--only-kriging'); // skip the IDW / gdal_grid table
const NO_KRIGING = args.includes('--no-kriging'); // skip the kriging / IDW table
const EXTRA = (process.env.TILTH_BENCH_ARGS ?? '').split(/\s+/).filter(Boolean);
const HAS_GDAL = spawnSync('gdal_grid', ['--version'], { stdio: 'ignore' }).status === 0;

// the bundle is what `npx tilth` runs; make sure it is current
buildBundle();

const UTM = '+proj=utm +zone=13 +datum=WGS84 +units=m +no_defs';
const toLonLat = proj4(UTM, 'EPSG:4326');
const X0 = 450000,
  Y0 = 5770000; // whole multiples of every cell size used

function rng(seed) {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296;
}

/** Writes boundary, samples (GeoJSON, lon/lat) and the same points in UTM for gdal_grid. */
function makeCase(dir, n, side, seed, structured = false) {
  const rnd = rng(seed);
  writeSquareBoundary(dir, toLonLat, X0, Y0, side, 'Bench field');
  const feats = [],
    csv = ['x,y,z'];
  // stratified random: one point in each of n strata of a m x m lattice (the input stage refuses two
  // samples at one place), jittered within the middle 80 % of its stratum
  const m = Math.ceil(Math.sqrt(n)),
    w = (side - 2) / m;
  const strata = [...Array(m * m).keys()];
  for (let i = strata.length - 1; i > 0; i--) {
    const j = Math.floor(rnd() * (i + 1));
    [strata[i], strata[j]] = [strata[j], strata[i]];
  }
  for (let i = 0; i < n; i++) {
    const sx = strata[i] % m,
      sy = Math.floor(strata[i] / m);
    const x = X0 + 1 + (sx + 0.1 + 0.8 * rnd()) * w,
      y = Y0 + 1 + (sy + 0.1 + 0.8 * rnd()) * w;
    const [lon, lat] = toLonLat.forward([x, y]).map((v) => Math.round(v * 1e8) / 1e8);
    // structured: a smooth pattern a few hundred metres across plus noise (a semivariogram with a sill, so kriging
    // is not refused); otherwise mostly noise with a trend
    const p = structured
      ? Math.round((20 + 8 * Math.sin((x - X0) / 300) * Math.cos((y - Y0) / 250) + 3 * rnd()) * 10) / 10
      : Math.round((8 + 30 * rnd() + (10 * (x - X0)) / side) * 10) / 10;
    feats.push({
      type: 'Feature',
      properties: { sample_id: `B${i + 1}`, p_olsen_ppm: p },
      geometry: { type: 'Point', coordinates: [lon, lat] },
    });
    const [px, py] = toLonLat.inverse([lon, lat]);
    csv.push(`${px},${py},${p}`);
  }
  writeFileSync(join(dir, 'samples.geojson'), JSON.stringify({ type: 'FeatureCollection', features: feats }));
  writePoints(dir, csv);
}

/** `tilth surface` of P on the case in DIR at `cell` metres (the command's start, before its options). */
const surfaceArgs = (dir, cell) => [
  TILTH,
  'surface',
  ...EXTRA,
  '--samples',
  join(dir, 'samples.geojson'),
  '--boundary',
  join(dir, 'boundary.geojson'),
  '--nutrient',
  'p',
  '--cell',
  String(cell),
];

const CASES = [
  { n: 50, cells: 160, cell: 5 },
  { n: 500, cells: 160, cell: 5 },
  { n: 5000, cells: 160, cell: 5 },
  { n: 50, cells: 800, cell: 5 },
  { n: 500, cells: 800, cell: 5 },
  { n: 5000, cells: 800, cell: 5 },
  // the build benchmark's size: 1 m cells on a 640 ac section (1 mile square), one sample per acre
  { n: 640, cells: 1610, cell: 1, label: '640 ac @ 1 m' },
];

console.log(
  `machine: ${machine()}; ${RUNS} runs per figure (median wall, max peak RSS); load average at start ${load()}`,
);
console.log(`tilth: ${TILTH} ${EXTRA.join(' ')} surface --power 2 --neighbours 12 (whole process)`);
if (HAS_GDAL)
  console.log(
    'gdal_grid 3.6: invdist:power=2:smoothing=0 (all points) and invdistnn:power=2:max_points=12 on the same points and grid',
  );
console.log('');
console.log(
  'wall = median elapsed seconds; cpu = median user + system seconds (all threads); MB = peak resident memory',
);
console.log(
  '| samples | grid | tilth wall | tilth cpu | tilth MB | invdist wall | invdist cpu | invdist / tilth (wall) | invdistnn wall | invdistnn / tilth (wall) |',
);
console.log('|---:|---|---:|---:|---:|---:|---:|---:|---:|---:|');
for (const c of ONLY_KRIGING ? [] : CASES) {
  const dir = mkdtempSync(join(tmpdir(), 'tilth-bench-'));
  try {
    const side = c.cells * c.cell;
    makeCase(dir, c.n, side, 1000 + c.n);
    const out = join(dir, 'p.asc');
    const tilthArgs = [...surfaceArgs(dir, c.cell), '--power', '2', '--neighbours', '12', '--out', out];
    const t = measure(process.execPath, tilthArgs, RUNS, root);
    const head = readFileSync(out, 'utf8').slice(0, 300).split('\n');
    const h = Object.fromEntries(
      head
        .slice(0, 6)
        .map((l) => l.split(/\s+/))
        .map(([k, v]) => [k.toLowerCase(), Number(v)]),
    );
    let gi = '',
      gc = '',
      gr = '',
      nn = '',
      nr = '';
    if (HAS_GDAL) {
      const base = [
        ...['-q', '-ot', 'Float64', '-of', 'GTiff'],
        ...gdalGridFrame(
          h.xllcorner,
          h.xllcorner + h.ncols * h.cellsize,
          h.yllcorner + h.nrows * h.cellsize,
          h.yllcorner,
          h.ncols,
          h.nrows,
        ),
      ];
      const g = measure(
        'gdal_grid',
        [...base, '-a', 'invdist:power=2:smoothing=0', join(dir, 'points.vrt'), join(dir, 'g.tif')],
        Math.min(RUNS, 3),
        dir,
      );
      gi = g.wall.toFixed(3);
      gc = g.cpu.toFixed(3);
      gr = (g.wall / t.wall).toFixed(2);
      const nnCost = c.n * c.cells * c.cells;
      if (NN_ALL || nnCost <= 5000 * 160 * 160) {
        const g2 = measure(
          'gdal_grid',
          [
            ...base,
            '-a',
            `invdistnn:power=2:max_points=12:radius=${2 * side}`,
            join(dir, 'points.vrt'),
            join(dir, 'g2.tif'),
          ],
          1,
          dir,
        );
        nn = g2.wall.toFixed(2);
        nr = (g2.wall / t.wall).toFixed(0);
      } else {
        nn = 'skipped (--nn)';
      }
    }
    console.log(
      `| ${c.n} | ${c.label ?? `${c.cells} x ${c.cells}`} (${h.ncols} x ${h.nrows}) | ${t.wall.toFixed(3)} | ${t.cpu.toFixed(3)} | ${Number.isNaN(t.rss) ? 'n/a' : t.rss.toFixed(0)} | ${gi} | ${gc} | ${gr} | ${nn} | ${nr} |`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

// Ordinary kriging against IDW on the same structured points and grid, 16 neighbours each (target: kriging within
// 3 x the IDW time on 640 000 cells, peak memory under 300 MB). Both are the whole process; kriging includes its
// semivariogram fit and leave-one-out, IDW its one-row leave-one-out. Runs alternate so machine load hits both.
console.log('');
console.log(
  'ordinary kriging vs IDW, 16 neighbours each, same points and grid (whole `tilth surface` process; structured data)',
);
console.log(
  '| samples | grid | IDW wall | IDW MB | kriging wall | kriging MB | kriging / IDW (wall) | load average (1 min) before, after |',
);
console.log('|---:|---|---:|---:|---:|---:|---:|---|');
for (const c of NO_KRIGING
  ? []
  : [
      { n: 640, cells: 800, cell: 5 },
      { n: 5000, cells: 800, cell: 5 },
    ]) {
  const dir = mkdtempSync(join(tmpdir(), 'tilth-bench-'));
  try {
    const side = c.cells * c.cell;
    makeCase(dir, c.n, side, 2000 + c.n, true);
    const common = surfaceArgs(dir, c.cell);
    const idwArgs = [
      ...common,
      '--method',
      'idw',
      '--power',
      '2',
      '--neighbours',
      '16',
      '--out',
      join(dir, 'i.asc'),
    ];
    const kArgs = [
      ...common,
      '--method',
      'kriging',
      '--kriging-neighbours',
      '16',
      '--out',
      join(dir, 'k.asc'),
    ];
    const load0 = loadavg()[0];
    const iw = [],
      kw = [];
    let irss = 0,
      krss = 0;
    for (let r = 0; r < RUNS; r++) {
      const a = measure(process.execPath, idwArgs, 1, root),
        b = measure(process.execPath, kArgs, 1, root);
      iw.push(a.wall);
      kw.push(b.wall);
      irss = Math.max(irss, a.rss || 0);
      krss = Math.max(krss, b.rss || 0);
    }
    const ratios = iw.map((w, i) => kw[i] / w);
    console.log(
      `| ${c.n} | ${c.cells} x ${c.cells} | ${med(iw).toFixed(3)} | ${irss.toFixed(0)} | ${med(kw).toFixed(3)} | ${krss.toFixed(0)} | ${med(ratios).toFixed(2)} (median of ${RUNS} paired runs) | ${load0.toFixed(2)}, ${loadavg()[0].toFixed(2)} |`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
console.log(`\nload average at end ${load()}`);
