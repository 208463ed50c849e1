// What the benchmark scripts share (scripts/bench-*.mjs, kill-trials.mjs): the repository root, the seeded
// generator (src/stats/random.ts, loaded through tsx), the machine line and load average the figures are
// recorded with, medians, timing a whole process with /usr/bin/time -v (wall, CPU = user + system, peak RSS),
// the demo quarter's build inputs, and the square test fields with their points for gdal_grid.
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { existsSync, writeFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { tsImport } from 'tsx/esm/api';

export const root = join(dirname(fileURLToPath(import.meta.url)), '..');

/** mulberry32 (src/stats/random.ts): the seeded generator of the benchmarks' invented fields. */
export const { mulberry32: rng } = await tsImport('../src/stats/random.ts', import.meta.url);

/** `--name N` from the command line as a number, else `dflt`. */
export function numberArg(name, dflt) {
  const args = process.argv.slice(2);
  return args.includes(name) ? Number(args[args.indexOf(name) + 1]) : dflt;
}

/** Builds the bundle (`npx tilth` runs it), so that what is timed is current. */
export function buildBundle() {
  execFileSync(process.execPath, [join(root, 'scripts', 'build.mjs')], { cwd: root, stdio: 'inherit' });
}

/** The CLI timed: bin/tilth.js, or TILTH_BENCH_CLI=path (e.g. an older or experimental bundle). */
export const TILTH = process.env.TILTH_BENCH_CLI
  ? join(root, process.env.TILTH_BENCH_CLI)
  : join(root, 'bin', 'tilth.js');

/** "N x cpu model; node vX" for the first line of a benchmark's output. */
export const machine = () => `${cpus().length} x ${cpus()[0]?.model ?? 'cpu'}; node ${process.version}`;
/** The load average (1, 5, 15 min) as "a, b, c". */
export const load = () =>
  loadavg()
    .map((x) => x.toFixed(2))
    .join(', ');

/** Median (the upper one of an even count); NaN for none. */
export const med = (a) => (a.length ? [...a].sort((x, y) => x - y)[Math.floor(a.length / 2)] : NaN);

const TIME = existsSync('/usr/bin/time') ? '/usr/bin/time' : null;

/**
 * One run of a command: wall seconds, CPU seconds (user + system, children included) and peak RSS (MB) from
 * /usr/bin/time -v (NaN without it). Throws when the exit status is not in `ok`.
 */
export function timeRun(cmd, argv, { cwd = root, ok = [0] } = {}) {
  const t0 = process.hrtime.bigint();
  const opts = { cwd, encoding: 'utf8', maxBuffer: 1 << 28 };
  const r = TIME ? spawnSync(TIME, ['-v', cmd, ...argv], opts) : spawnSync(cmd, argv, opts);
  const wall = Number(process.hrtime.bigint() - t0) / 1e9;
  if (!ok.includes(r.status)) throw new Error(`${cmd} ${argv.join(' ')} failed (${r.status}):\n${r.stderr}`);
  const num = (re) => Number(re.exec(r.stderr ?? '')?.[1] ?? NaN);
  return {
    wall,
    cpu: num(/User time \(seconds\): ([\d.]+)/) + num(/System time \(seconds\): ([\d.]+)/),
    rss: num(/Maximum resident set size \(kbytes\): (\d+)/) / 1024,
  };
}

/** `runs` runs of a command: median wall and CPU seconds, largest peak RSS (MB). */
export function measure(cmd, argv, runs, cwd, ok = [0]) {
  const all = Array.from({ length: runs }, () => timeRun(cmd, argv, { cwd, ok }));
  const rss = all.map((t) => t.rss).filter(Number.isFinite);
  return {
    wall: med(all.map((t) => t.wall)),
    cpu: med(all.map((t) => t.cpu).filter(Number.isFinite)),
    rss: rss.length ? Math.max(...rss) : NaN,
    runs,
  };
}

/** The demo quarter (sample-fields/quarter) and its inputs for `tilth build`, as absolute paths. */
export const QUARTER = join(root, 'sample-fields', 'quarter');
export const QUARTER_INPUTS = [
  '--samples',
  join(QUARTER, 'samples.csv'),
  '--boundary',
  join(QUARTER, 'boundary.geojson'),
  '--plan',
  join(QUARTER, 'plan.yaml'),
];

/**
 * Seconds from spawning `node ARGV` (in the repository root) to its first line on stderr (a build's first
 * progress line), or null when it writes none; with `stop` the process is then killed.
 */
export function firstLine(argv, stop = false) {
  return new Promise((resolve, reject) => {
    const t0 = process.hrtime.bigint();
    const c = spawn(process.execPath, argv, { cwd: root, stdio: ['ignore', 'ignore', 'pipe'] });
    let seen = null;
    c.stderr.on('data', () => {
      if (seen !== null) return;
      seen = Number(process.hrtime.bigint() - t0) / 1e9;
      if (stop) c.kill();
    });
    c.on('error', reject);
    c.on('close', () => resolve(seen));
  });
}

/**
 * Writes DIR/boundary.geojson: the square of `side` metres from (x0, y0) in UTM, its corners 1 cm inside whole
 * cells, as WGS 84 lon/lat (`toLonLat`: a proj4 converter from UTM).
 */
export function writeSquareBoundary(dir, toLonLat, x0, y0, side, name) {
  const e = 0.01;
  const ring = [
    [x0 + e, y0 + e],
    [x0 + side - e, y0 + e],
    [x0 + side - e, y0 + side - e],
    [x0 + e, y0 + side - e],
    [x0 + e, y0 + e],
  ].map(([x, y]) => toLonLat.forward([x, y]));
  const feature = {
    type: 'Feature',
    properties: { name },
    geometry: { type: 'Polygon', coordinates: [ring] },
  };
  writeFileSync(
    join(dir, 'boundary.geojson'),
    JSON.stringify({ type: 'FeatureCollection', features: [feature] }),
  );
}

/** Writes DIR/points.csv (lines "x,y,z" after the header) and DIR/points.vrt, the layer gdal_grid reads. */
export function writePoints(dir, csv, srs = '') {
  writeFileSync(join(dir, 'points.csv'), csv.join('\n') + '\n');
  writeFileSync(
    join(dir, 'points.vrt'),
    `<OGRVRTDataSource><OGRVRTLayer name="points"><SrcDataSource>${join(dir, 'points.csv')}</SrcDataSource><SrcLayer>points</SrcLayer><GeometryType>wkbPoint</GeometryType>${srs ? `<LayerSRS>${srs}</LayerSRS>` : ''}<GeometryField encoding="PointFromColumns" x="x" y="y" z="z"/></OGRVRTLayer></OGRVRTDataSource>`,
  );
}

/** gdal_grid's grid and input: extent x0..x1 and yTop..yBottom, cols x rows cells, z of the `points` layer. */
export const gdalGridFrame = (x0, x1, yTop, yBottom, cols, rows) => [
  '-txe',
  String(x0),
  String(x1),
  '-tye',
  String(yTop),
  String(yBottom),
  '-outsize',
  String(cols),
  String(rows),
  '-zfield',
  'z',
  '-l',
  'points',
];
