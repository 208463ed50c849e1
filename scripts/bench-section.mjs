// The synthetic, seeded 640 ac section used by the build and batch benchmarks (invented data): a 1609 m square
// near 52 N 106.5 W (UTM 13N) with 5000 samples whose analytes follow seeded smooth waves plus noise.
// `node scripts/bench-section.mjs DIR` writes boundary.geojson, samples.geojson, points.csv/.vrt and plan.yaml.
import { execFileSync } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import proj4 from 'proj4';
import { root, rng, writePoints, writeSquareBoundary } from './bench-lib.mjs';

const UTM = '+proj=utm +zone=13 +datum=WGS84 +units=m +no_defs';
const toLonLat = proj4(UTM, 'EPSG:4326');
const [cx, cy] = toLonLat.inverse([-106.5, 52.0]);
export const X0 = Math.round(cx),
  Y0 = Math.round(cy); // whole metres, so the 1 m grid starts on X0, Y0
export const SIDE = 1609; // 1609 m square = 639.7 ac (a section is 1609.344 m); 1609 x 1609 cells at 1 m
export const N_SAMPLES = 5000;

/**
 * Writes the synthetic section: boundary.geojson, samples.geojson (lon/lat, the quarter's property names),
 * points.csv/.vrt (the same points in UTM, P Olsen as z) for gdal_grid, and plan.yaml from `tilth plan init`.
 */
export function makeSection(dir, TILTH = join(root, 'bin', 'tilth.js')) {
  const rnd = rng(5000);
  writeSquareBoundary(dir, toLonLat, X0, Y0, SIDE, 'Bench section (invented)');
  // smooth seeded "soil" waves plus sample noise, one set per analyte
  const waves = (k) =>
    Array.from({ length: 4 }, () => ({
      fx: (0.5 + 3 * rnd()) / SIDE,
      fy: (0.5 + 3 * rnd()) / SIDE,
      ph: 6.283 * rnd(),
      a: 0.5 + rnd(),
    }));
  const W = { n: waves(), p: waves(), k: waves(), s: waves(), om: waves() };
  const wv = (w, x, y) => w.reduce((s, t) => s + t.a * Math.sin(6.283 * (t.fx * x + t.fy * y) + t.ph), 0) / 4; // about -1..1
  const feats = [],
    csv = ['x,y,z'];
  const taken = new Set(); // 1 m buckets: no two samples closer than 1 m (tilth refuses two samples at one place)
  for (let i = 0; i < N_SAMPLES; i++) {
    let x, y;
    do {
      x = 1 + rnd() * (SIDE - 2);
      y = 1 + rnd() * (SIDE - 2);
    } while (
      [-1, 0, 1].some((dx) =>
        [-1, 0, 1].some((dy) => taken.has((Math.floor(x) + dx) * 4096 + Math.floor(y) + dy)),
      )
    );
    taken.add(Math.floor(x) * 4096 + Math.floor(y));
    const [lon, lat] = toLonLat.forward([X0 + x, Y0 + y]).map((v) => Math.round(v * 1e7) / 1e7);
    const r1 = (v, d = 0) => Math.round(v * 10 ** d) / 10 ** d;
    const p = Math.max(2, r1(14 + 9 * wv(W.p, x, y) + 3 * (rnd() - 0.5)));
    const props = {
      sample_id: `BS-${i + 1}`,
      texture: wv(W.om, x, y) < -0.5 ? 'light' : 'medium',
      no3_n_lbac_0_6: Math.max(1, r1(14 + 8 * wv(W.n, x, y) + 4 * (rnd() - 0.5))),
      no3_n_lbac_6_24: Math.max(1, r1(16 + 10 * wv(W.n, x, y) + 4 * (rnd() - 0.5))),
      p_olsen_ppm: p,
      k_ppm: Math.max(40, r1(260 + 160 * wv(W.k, x, y) + 30 * (rnd() - 0.5))),
      so4_s_lbac_0_6: Math.max(1, r1(8 + 6 * wv(W.s, x, y) + 2 * (rnd() - 0.5))),
      so4_s_lbac_6_24: Math.max(1, r1(14 + 12 * wv(W.s, x, y) + 3 * (rnd() - 0.5))),
      om_pct: Math.max(0.5, r1(3.5 + 1.5 * wv(W.om, x, y) + 0.3 * (rnd() - 0.5), 1)),
      ph: r1(7 + 0.6 * (rnd() - 0.5), 1),
    };
    feats.push({ type: 'Feature', properties: props, geometry: { type: 'Point', coordinates: [lon, lat] } });
    const [px, py] = toLonLat.inverse([lon, lat]); // the same (rounded) points that tilth reads
    csv.push(`${px},${py},${p}`);
  }
  writeFileSync(
    join(dir, 'samples.geojson'),
    JSON.stringify({ type: 'FeatureCollection', name: 'Bench section samples (invented)', features: feats }),
  );
  writePoints(dir, csv, 'EPSG:32613');
  // the plan: tilth's own starter plan for canola; one shared zone set for the pass (as the demo quarter)
  const plan = execFileSync(process.execPath, [TILTH, 'plan', 'init', '--crop', 'canola'], {
    cwd: root,
    encoding: 'utf8',
  }).replace(/^(\s*zone_sets:\s*)per_product/m, '$1shared');
  if (!/zone_sets:\s*shared/.test(plan))
    throw new Error('could not set zoning.zone_sets in the starter plan');
  writeFileSync(join(dir, 'plan.yaml'), plan);
  const ps = feats.map((f) => f.properties.p_olsen_ppm);
  return { pmin: Math.min(...ps), pmax: Math.max(...ps) };
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const dir = process.argv[2];
  if (!dir) {
    console.error('usage: node scripts/bench-section.mjs DIR');
    process.exit(2);
  }
  mkdirSync(dir, { recursive: true });
  console.log(JSON.stringify(makeSection(dir)));
}
