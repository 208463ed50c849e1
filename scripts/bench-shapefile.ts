/**
 * Seeded benchmark of the shapefile writer and `checkPrescription` (run: npx tsx scripts/bench-shapefile.ts [zones] [vertices]).
 * Zones: an n x n grid of squares, each edge split into v points (like traced raster zones), in UTM 13N.
 */
import { performance } from 'node:perf_hooks';
import type { Feature } from 'geojson';
import { writeShapefile } from '../src/io/shapefile/index.js';
import { checkPrescription, layerFromGeoJSON } from '../src/check/index.js';
import { projector, utmZoneFor } from '../src/geo/utm.js';

const zones = Number(process.argv[2] ?? 100),
  verts = Number(process.argv[3] ?? 50);
const n = Math.round(Math.sqrt(zones)),
  size = 800 / n;
const p = projector(utmZoneFor(-105, 52));
let seed = 42;
const rnd = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
const feats: Feature[] = [];
for (let i = 0; i < n; i++)
  for (let j = 0; j < n; j++) {
    const x0 = 400000 + i * size,
      y0 = 5780000 + j * size,
      ring: number[][] = [];
    const c = [
      [x0, y0],
      [x0 + size, y0],
      [x0 + size, y0 + size],
      [x0, y0 + size],
    ];
    for (let k = 0; k < 4; k++)
      for (let t = 0; t < verts; t++) {
        const a = c[k],
          b = c[(k + 1) % 4];
        ring.push(p.toLonLat(a[0] + ((b[0] - a[0]) * t) / verts, a[1] + ((b[1] - a[1]) * t) / verts));
      }
    ring.push(ring[0]);
    feats.push({
      type: 'Feature',
      properties: { zone_id: feats.length + 1, urea_lbac: Math.round(60 + 100 * rnd()) },
      geometry: { type: 'Polygon', coordinates: [ring] },
    });
  }
const boundary = layerFromGeoJSON(
  JSON.stringify({
    type: 'Feature',
    properties: {},
    geometry: {
      type: 'Polygon',
      coordinates: [
        [
          [400000, 5780000],
          [400800, 5780000],
          [400800, 5780800],
          [400000, 5780800],
          [400000, 5780000],
        ].map(([x, y]) => p.toLonLat(x, y)),
      ],
    },
  }),
  'b',
);
const time = (label: string, f: () => unknown, reps = 5) => {
  f();
  const t0 = performance.now();
  for (let r = 0; r < reps; r++) f();
  console.log(`${label}: ${((performance.now() - t0) / reps).toFixed(1)} ms`);
};
console.log(`${feats.length} zones x ${4 * verts} vertices`);
time('writeShapefile lonlat', () =>
  writeShapefile(
    feats,
    [
      { key: 'zone_id', type: 'N', width: 6 },
      { key: 'urea_lbac', type: 'N', width: 8, decimals: 1 },
    ],
    { name: 'b' },
  ),
);
time('writeShapefile utm', () =>
  writeShapefile(
    feats,
    [
      { key: 'zone_id', type: 'N', width: 6 },
      { key: 'urea_lbac', type: 'N', width: 8, decimals: 1 },
    ],
    { name: 'b', crs: 'utm' },
  ),
);
const layer = layerFromGeoJSON(JSON.stringify({ type: 'FeatureCollection', features: feats }), 'bench');
time(
  'checkPrescription with boundary and speed',
  () => checkPrescription(layer, { boundary, speedKmh: 12, min: 40, max: 200 }),
  1,
);
