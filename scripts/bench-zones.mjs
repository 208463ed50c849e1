// Benchmark of the zoning stage (src/zones): a synthetic 640 ac section at 1 m cells (1609 x 1609 =
// 2.6 M cells), seeded, medians of several runs. Usage: node scripts/bench-zones.mjs [runs=5] [cell=1]
// Bundles src/zones with esbuild first (no build step to remember); prints a table for docs/performance.md.
import { build } from 'esbuild';
import { mkdirSync } from 'node:fs';
import os from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { med, rng, root } from './bench-lib.mjs';

const outDir = join(root, 'node_modules', '.cache', 'tilth-bench');
mkdirSync(outDir, { recursive: true });
const outfile = join(outDir, 'zones.mjs');
await build({
  entryPoints: [join(root, 'src/zones/index.ts')],
  outfile,
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  packages: 'external',
  logLevel: 'warning',
});
const Z = await import(pathToFileURL(outfile).href);
const { pointInParts, partsArea, partsBbox } = await import(
  pathToFileURL(join(outDir, 'area.mjs')).href
).catch(async () => {
  await build({
    entryPoints: [join(root, 'src/geo/area.ts')],
    outfile: join(outDir, 'area.mjs'),
    bundle: true,
    platform: 'node',
    format: 'esm',
    packages: 'external',
    logLevel: 'warning',
  });
  return import(pathToFileURL(join(outDir, 'area.mjs')).href);
});

const runs = Number(process.argv[2] ?? 5);
const cell = Number(process.argv[3] ?? 1);

const rnd = rng(640);

// an invented section: 1609 m square, a wobbly east edge (72 vertices), a cut-off north-west corner, and a slough
const X0 = 500000,
  Y0 = 5770000,
  S = 1609.344;
const ext = [
  [X0, Y0],
  [X0 + S, Y0],
];
for (let k = 1; k < 72; k++) ext.push([X0 + S - 15 + 15 * Math.sin(k / 5), Y0 + (S * k) / 72]);
ext.push([X0 + S, Y0 + S], [X0 + 300, Y0 + S], [X0, Y0 + S - 250], [X0, Y0]);
const hole = [];
for (let k = 0; k < 40; k++) {
  const t = (-2 * Math.PI * k) / 40;
  hole.push([X0 + 900 + 120 * Math.cos(t) * (1 + 0.2 * Math.sin(3 * t)), Y0 + 700 + 80 * Math.sin(t)]);
}
hole.push(hole[0]);
const parts = [{ exterior: Float64Array.from(ext.flat()), holes: [Float64Array.from(hole.flat())] }];
const field = {
  name: 'bench section',
  lonlat: [],
  parts,
  utm: { zone: 13, south: false, epsg: 32613, proj4: '+proj=utm +zone=13 +datum=WGS84 +units=m +no_defs' },
  areaM2: partsArea(parts),
  bbox: partsBbox(parts),
};

// grid: mask from cell centres, fraction 1/0 away from the boundary and 8 x 8 supersampled in boundary cells
const xmin = Math.floor(field.bbox[0] / cell) * cell,
  ymax = Math.ceil(field.bbox[3] / cell) * cell;
const cols = Math.ceil((field.bbox[2] - xmin) / cell),
  rows = Math.ceil((ymax - field.bbox[1]) / cell);
const n = cols * rows;
const mask = new Uint8Array(n),
  fraction = new Float32Array(n);
const band = Z.boundaryCells(parts, { xmin, ymax, cell, cols, rows });
const rowsInside = (y) => {
  // scanline crossings for speed
  const xs = [];
  for (const r of [parts[0].exterior, ...parts[0].holes])
    for (let i = 0; i + 3 < r.length; i += 2) {
      const y0 = r[i + 1],
        y1 = r[i + 3];
      if (y0 > y !== y1 > y) xs.push(r[i] + ((y - y0) * (r[i + 2] - r[i])) / (y1 - y0));
    }
  return xs.sort((a, b) => a - b);
};
for (let r = 0; r < rows; r++) {
  const xs = rowsInside(ymax - (r + 0.5) * cell);
  for (let k = 0; k + 1 < xs.length; k += 2) {
    const c0 = Math.max(0, Math.ceil((xs[k] - xmin) / cell - 0.5)),
      c1 = Math.min(cols - 1, Math.floor((xs[k + 1] - xmin) / cell - 0.5));
    for (let c = c0; c <= c1; c++) {
      mask[r * cols + c] = 1;
      fraction[r * cols + c] = 1;
    }
  }
}
for (let i = 0; i < n; i++)
  if (band[i]) {
    const r = Math.floor(i / cols),
      c = i - r * cols;
    let k = 0;
    for (let a = 0; a < 8; a++)
      for (let b = 0; b < 8; b++)
        if (pointInParts(parts, xmin + (c + (a + 0.5) / 8) * cell, ymax - (r + (b + 0.5) / 8) * cell)) k++;
    fraction[i] = k / 64;
  }
const grid = { xmin, ymax, cell, cols, rows, mask, fraction };

// a smooth "rate" surface (sum of seeded waves, like an interpolated soil map) plus 2 % cell noise
const waves = Array.from({ length: 6 }, () => ({
  fx: (rnd() * 6) / S,
  fy: (rnd() * 6) / S,
  p: rnd() * 6.28,
  a: 5 + rnd() * 15,
}));
const value = new Float64Array(n).fill(NaN);
for (let r = 0; r < rows; r++)
  for (let c = 0; c < cols; c++) {
    const i = r * cols + c;
    if (!(fraction[i] > 0)) continue;
    let v = 80;
    for (const w of waves) v += w.a * Math.sin(2 * Math.PI * (w.fx * c * cell + w.fy * r * cell) + w.p);
    value[i] = v + 2 * (rnd() - 0.5);
  }

const minArea = Z.minZoneAreaM2({ swathM: 18.3, speedKmh: 9 });
/** The zoning every makeZones step uses: Jenks, 5 classes, one majority pass, metres. */
const ZONING = {
  method: 'jenks',
  classes: 5,
  step: 5,
  minAreaM2: minArea,
  majorityIterations: 1,
  lonlat: false,
};
const names = [
  'classify',
  'majority',
  'merge',
  'trace',
  'arcs',
  'simplify',
  'clip',
  'staircase',
  'makeZones',
  'design',
];
const t = Object.fromEntries(names.map((k) => [k, []]));
const cpu = Object.fromEntries(names.map((k) => [k, []]));
const cpuMs = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};
// the zone design's judge, like the rate judge on a single rate: a zone's rate is its mean rounded to the machine
// step (5); neighbours stay apart when rates differ by at least the larger of the step and 10 % of the field mean
const judge = () => {
  let min = 5;
  return {
    layers: [value],
    profile: (m) => Math.round(m[0] / 5) * 5,
    prepare: (ps, areas) => {
      let s = 0,
        w = 0;
      ps.forEach((p, i) => {
        s += p * areas[i];
        w += areas[i];
      });
      min = Math.max(5, (0.1 * s) / w);
    },
    compare: (a, b) => ({ apart: Math.abs(a - b) >= min, score: Math.abs(a - b) / min, why: null }),
  };
};
let last, design;
const step = (name, fn) => {
  const c0 = cpuMs(),
    t0 = performance.now();
  const r = fn();
  t[name].push(performance.now() - t0);
  cpu[name].push(cpuMs() - c0);
  return r;
};
for (let k = 0; k < runs; k++) {
  const cls = step('classify', () =>
    Z.classify(value, { method: 'jenks', classes: 5, step: 5, weights: fraction }),
  );
  const sm = step('majority', () => Z.majorityFilter(cls.classOf, cols, rows, 1));
  const m = step('merge', () =>
    Z.mergeSmallZones(Z.fillUnclassed(sm, cols, rows), cols, rows, fraction, cell, minArea),
  );
  step('trace', () => Z.traceZones(m.zone, m.count, grid));
  const arcs = step('arcs', () => Z.zoneArcs(m.zone, m.count, grid));
  const smooth = step('simplify', () => Z.arcsToParts(arcs, Z.simplifyArcs(arcs, 1), grid));
  step('clip', () => smooth.map((p) => Z.clipParts(p, parts, xmin, ymax)));
  step('staircase', () => Z.makeZones(grid, value, field, { ...ZONING, simplifyCells: 0 }));
  last = step('makeZones', () => Z.makeZones(grid, value, field, { ...ZONING }));
  design = step('design', () => Z.makeZones(grid, value, field, { ...ZONING, judge: judge() }));
}
const verts = last.vertices.clipped;
const area = last.zones.reduce((s, z) => s + z.areaM2, 0);
console.log(
  `zones bench: ${cols} x ${rows} cells of ${cell} m (${(n / 1e6).toFixed(2)} M), field ${(field.areaM2 / 4046.8564224).toFixed(1)} ac, ${runs} runs, node ${process.version}`,
);
console.log(
  `result: ${last.zones.length} zones, ${last.classCount} classes, ${verts} vertices, area sum / field = ${(area / field.areaM2).toFixed(9)}, min zone ${minArea.toFixed(0)} m2`,
);
console.log(
  `load average ${os
    .loadavg()
    .map((x) => x.toFixed(1))
    .join(
      ' ',
    )} on ${os.cpus().length} CPUs (wall time suffers when the machine is shared; CPU time much less)`,
);
/** One row of the table: a step's median wall and CPU milliseconds. */
const row = (label, k) => console.log(`| ${label} | ${med(t[k]).toFixed(0)} | ${med(cpu[k]).toFixed(0)} |`);
console.log('| step | median wall ms | median CPU ms |\n|---|---|---|');
row('classify (jenks, 5, 4096-bin summary)', 'classify');
row('majority filter 3x3, 1 pass', 'majority');
row('fill + label + merge small zones', 'merge');
row('trace (all zones, unclipped, corners only)', 'trace');
row('shared arcs (every node)', 'arcs');
row('simplify arcs (1 cell) and rebuild rings', 'simplify');
row('clip every smoothed zone to the boundary (JTS overlay)', 'clip');
row('makeZones, staircase edges (simplifyCells 0), no judge', 'staircase');
row('makeZones, default (edges smoothed to 1 cell), no judge', 'makeZones');
row(
  'zone design: makeZones with a rate judge (classes and zones merged, rate classes) and smoothed edges',
  'design',
);
console.log(
  `design result: ${design.zones.length} zones, ${design.counts.rateClasses} rate classes (${design.counts.classes} classes drawn, ${design.counts.classesMerged} kept; ${design.counts.zonesCleaned} zones after cleaning); vertices ${design.vertices.traced} staircase -> ${design.vertices.simplified} smoothed, ${design.vertices.clipped} clipped`,
);
console.log(`peak RSS ${(process.memoryUsage().rss / 2 ** 20).toFixed(0)} MB`);
