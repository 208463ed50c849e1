/**
 * Makes the invented demo farm under sample-fields/ (see sample-fields/README.md).
 * Seeded, so running it again gives byte-identical files:
 *
 *   npx tsx scripts/make-sample-fields.ts
 *
 * Everything here is invented: the farm, the fields, the lab and every value. The values follow a
 * smooth "landscape" (knolls, slopes, depressions) plus noise so that a map of them means something;
 * the ranges are plausible for the Canadian prairies (agronomy.md) but describe no real field.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import * as polyclip from 'polyclip-ts';
import { pointOnFeature } from '@turf/turf';
import { projector, utmZoneFor } from '../src/geo/utm.js';
import { mulberry32 } from '../src/stats/random.js';

const ROOT = join(import.meta.dirname, '..', 'sample-fields');

const rng = mulberry32;
function gauss(r: () => number): number {
  const u = Math.max(r(), 1e-12),
    v = r();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}
const bump = (u: number, v: number, cu: number, cv: number, s2: number) =>
  Math.exp(-((u - cu) ** 2 + (v - cv) ** 2) / s2);
const r7 = (x: number) => Math.round(x * 1e7) / 1e7;
const fx = (x: number, d: number) => Number(x.toFixed(d));

type Soil = {
  texture: 'light' | 'medium' | 'heavy';
  no3: [number, number]; // lb/ac 0-6, 6-24
  so4: [number, number]; // lb/ac 0-6, 6-24
  p: number;
  k: number;
  om: number;
  ph: number;
};

/** Soil at unit-square position (u east, v north) of a landscape; topo > 0 knoll, < 0 depression. */
function soilAt(topo: number, sandy: number, trendU: number, r: () => number): Soil {
  const n = () => gauss(r);
  const texture = sandy > 0.5 ? 'light' : topo < -0.45 ? 'heavy' : 'medium';
  // sulphate-S 0-24 in: many-fold lower on knolls (leached, eroded), high in depressions (accumulates)
  const sTot = Math.exp(Math.log(20) - 1.7 * topo + 0.25 * n());
  const s0 = sTot * (0.28 + 0.05 * n());
  // nitrate-N 0-24 in: more in lower, moister positions
  const nTot = Math.max(6, 32 - 14 * topo + 6 * n());
  const n0 = nTot * (0.45 + 0.05 * n());
  const p = 18 + 6 * (trendU - 0.5) - 14 * Math.max(topo, 0) + 2 * n() - 3 * sandy;
  const k = 400 - 330 * sandy + 60 * Math.min(-topo, 0.6) + 30 * n();
  const om = Math.max(1.1, 3.6 - 1.3 * topo - 1.2 * sandy + 0.3 * n());
  const ph = 6.7 + 0.9 * Math.max(topo, 0) + 0.25 * Math.max(-topo, 0) + 0.12 * n();
  return {
    texture,
    no3: [n0, nTot - n0],
    so4: [s0, sTot - s0],
    p,
    k,
    om,
    ph,
  };
}

/** Lab printing: below detection "<2", above the upper reporting limit ">60" (per layer, lb/ac). */
function labNum(v: number, decimals: number, low?: number, high?: number): number | string {
  if (low !== undefined && v < low) return `<${low}`;
  if (high !== undefined && v > high) return `>${high}`;
  return fx(v, decimals);
}

interface SampleOut {
  id: string;
  lon: number;
  lat: number;
  zone?: string;
  soil: Soil;
}

function sampleProps(s: SampleOut): Record<string, unknown> {
  const props: Record<string, unknown> = { sample_id: s.id };
  if (s.zone) props.zone = s.zone;
  Object.assign(props, {
    texture: s.soil.texture,
    no3_n_lbac_0_6: labNum(s.soil.no3[0], 0, 2),
    no3_n_lbac_6_24: labNum(s.soil.no3[1], 0, 2),
    p_olsen_ppm: labNum(s.soil.p, 0, 2),
    k_ppm: labNum(s.soil.k, 0, 20, 800),
    so4_s_lbac_0_6: labNum(s.soil.so4[0], 0, 2, 60),
    so4_s_lbac_6_24: labNum(s.soil.so4[1], 0, 2, 60),
    om_pct: labNum(s.soil.om, 1),
    ph: labNum(s.soil.ph, 1),
  });
  return props;
}

function samplesGeoJson(samples: SampleOut[], name: string): string {
  return fc(
    name,
    samples.map((s) => ({
      type: 'Feature',
      properties: sampleProps(s),
      geometry: { type: 'Point', coordinates: [s.lon, s.lat] },
    })),
  );
}

/** Lab-style CSV: two preamble lines, then one row per sample and depth. */
function samplesCsv(samples: SampleOut[], farm: string, field: string): string {
  const q = (v: unknown) => (v === undefined || v === null ? '' : String(v));
  const zoned = samples.some((s) => s.zone);
  const lines = [
    `Report,Cutbank Soil Lab (fictional) - soil analysis - ${farm} - ${field}`,
    'Received,2026-10-06',
    [
      'Lab No',
      'Sample',
      ...(zoned ? ['Zone'] : []),
      'Latitude',
      'Longitude',
      'Depth (in)',
      'NO3-N (lb/ac)',
      'P Olsen (ppm)',
      'K (ppm)',
      'SO4-S (lb/ac)',
      'OM (%)',
      'pH',
      'Texture',
    ].join(','),
  ];
  let lab = 26_1400;
  for (const s of samples) {
    const p = sampleProps(s);
    const z = zoned ? [q(s.zone)] : [];
    const row = (depth: string, cells: (string | number)[]) =>
      [lab++, s.id, ...z, s.lat.toFixed(7), s.lon.toFixed(7), depth, ...cells].join(',');
    lines.push(
      row('0-6', [
        q(p.no3_n_lbac_0_6),
        q(p.p_olsen_ppm),
        q(p.k_ppm),
        q(p.so4_s_lbac_0_6),
        q(p.om_pct),
        q(p.ph),
        s.soil.texture,
      ]),
    );
    lines.push(row('6-24', [q(p.no3_n_lbac_6_24), '', '', q(p.so4_s_lbac_6_24), '', '', '']));
  }
  return lines.join('\n') + '\n';
}

function fc(name: string, features: unknown[]): string {
  // one feature per line: small diffs, still valid JSON
  const body = features.map((f) => '  ' + JSON.stringify(f)).join(',\n');
  return `{"type":"FeatureCollection","name":${JSON.stringify(name)},"features":[\n${body}\n]}\n`;
}

function ringLonLat(p: ReturnType<typeof projector>, xy: [number, number][], ccw: boolean): number[][] {
  let a = 0;
  for (let i = 0; i < xy.length; i++) {
    const [x0, y0] = xy[i],
      [x1, y1] = xy[(i + 1) % xy.length];
    a += x0 * y1 - x1 * y0;
  }
  const pts = a > 0 === ccw ? xy : [...xy].reverse();
  const ll = pts.map(([x, y]) => p.toLonLat(x, y).map(r7));
  ll.push([...ll[0]]);
  return ll;
}

function write(dir: string, file: string, text: string): void {
  mkdirSync(join(ROOT, dir), { recursive: true });
  writeFileSync(join(ROOT, dir, file), text);
}

// ---------------------------------------------------------------------------------------------
// 1. "Home quarter": a quarter section (half a mile square) with a slough, grid-sampled.
function quarter(): void {
  const r = rng(20261006);
  const clon = -106.412,
    clat = 52.318; // invented location, central Saskatchewan (UTM zone 13N)
  const p = projector(utmZoneFor(clon, clat));
  const [cx, cy] = p.toMetres(clon, clat);
  const side = 804.672; // half a mile
  const x0 = Math.round(cx - side / 2),
    y0 = Math.round(cy - side / 2);
  const sq: [number, number][] = [
    [x0, y0],
    [x0 + side, y0],
    [x0 + side, y0 + side],
    [x0, y0 + side],
  ];
  // the slough: an irregular blob around (0.62, 0.55) of the square, about 6 ac
  const su = 0.62,
    sv = 0.55;
  const slough: [number, number][] = [];
  for (let i = 0; i < 18; i++) {
    const t = (2 * Math.PI * i) / 18;
    const rad = 78 * (1 + 0.18 * Math.sin(3 * t + 0.7) + 0.08 * Math.cos(5 * t));
    slough.push([x0 + su * side + 1.35 * rad * Math.cos(t), y0 + sv * side + 0.8 * rad * Math.sin(t)]);
  }
  const boundary = {
    type: 'Feature',
    properties: { name: 'Home quarter', farm: 'Willowbrae Farms (fictional)' },
    geometry: { type: 'Polygon', coordinates: [ringLonLat(p, sq, true), ringLonLat(p, slough, false)] },
  };
  write('quarter', 'boundary.geojson', fc('Home quarter boundary', [boundary]));

  const topo = (u: number, v: number) =>
    1.1 * bump(u, v, 0.22, 0.78, 0.025) +
    0.85 * bump(u, v, 0.85, 0.18, 0.02) +
    0.5 * bump(u, v, 0.45, 0.15, 0.015) -
    1.1 * bump(u, v, su, sv, 0.03) -
    0.7 * bump(u, v, 0.3, 0.4, 0.012);
  const sandy = (u: number, v: number) => bump(u, v, 0.0, 0.0, 0.12) * 1.2;
  const inSlough = (x: number, y: number) => {
    let inside = false;
    for (let i = 0, j = slough.length - 1; i < slough.length; j = i++) {
      const [xi, yi] = slough[i],
        [xj, yj] = slough[j];
      if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
    }
    return inside;
  };
  const samples: SampleOut[] = [];
  const nGrid = 8,
    step = side / nGrid;
  let n = 1;
  for (let row = nGrid - 1; row >= 0; row--) {
    for (let col = 0; col < nGrid; col++) {
      const x = x0 + (col + 0.5) * step + 6 * gauss(r),
        y = y0 + (row + 0.5) * step + 6 * gauss(r);
      // skip points in the slough or within 15 m of its edge
      if (
        [
          [0, 0],
          [15, 0],
          [-15, 0],
          [0, 15],
          [0, -15],
        ].some(([dx, dy]) => inSlough(x + dx, y + dy))
      )
        continue;
      const u = (x - x0) / side,
        v = (y - y0) / side;
      const [lon, lat] = p.toLonLat(x, y);
      samples.push({
        id: `HQ-${String(n++).padStart(2, '0')}`,
        lon: r7(lon),
        lat: r7(lat),
        soil: soilAt(topo(u, v), sandy(u, v), u, r),
      });
    }
  }
  write('quarter', 'samples.geojson', samplesGeoJson(samples, 'Home quarter soil samples'));
  write('quarter', 'samples.csv', samplesCsv(samples, 'Willowbrae Farms', 'Home quarter'));
  console.log(`quarter: ${samples.length} samples`);
}

// ---------------------------------------------------------------------------------------------
// 2. "Creek field": an irregular field in two parts (a creek between them), zone-composite samples.
function zoned(): void {
  const r = rng(771203);
  const clon = -106.371,
    clat = 52.341;
  const p = projector(utmZoneFor(clon, clat));
  const [cx, cy] = p.toMetres(clon, clat);
  const west: [number, number][] = [
    [-640, -380],
    [-40, -420],
    [-10, -150],
    [-60, 120],
    [-30, 390],
    [-420, 430],
    [-600, 260],
    [-690, -60],
  ];
  const east: [number, number][] = [
    [60, -300],
    [420, -340],
    [470, 40],
    [380, 300],
    [90, 250],
    [110, 20],
  ];
  const toAbs = (ring: [number, number][]) =>
    ring.map(([x, y]) => [Math.round(cx + x), Math.round(cy + y)] as [number, number]);
  const partsXY = [toAbs(west), toAbs(east)];
  const boundaryLL = partsXY.map((ring) => [ringLonLat(p, ring, true)]);
  write(
    'zoned',
    'boundary.geojson',
    fc('Creek field boundary', [
      {
        type: 'Feature',
        properties: { name: 'Creek field', farm: 'Willowbrae Farms (fictional)' },
        geometry: { type: 'MultiPolygon', coordinates: boundaryLL },
      },
    ]),
  );

  // zones: bands across the west part by landscape position, the east part is one zone
  const Y = (dy: number) => cy + dy;
  const band = (ya: number, yb: number, xa = cx - 2000, xb = cx + 15): polyclip.Geom => [
    [
      [xa, Y(ya)],
      [xb, Y(ya)],
      [xb, Y(yb)],
      [xa, Y(yb)],
      [xa, Y(ya)],
    ],
  ];
  const fieldGeom: polyclip.Geom = partsXY.map((ring) => [[...ring, ring[0]]]);
  const zoneDefs: { key: string; topo: number; sandy: number; geom: polyclip.Geom }[] = [
    { key: 'knoll', topo: 0.9, sandy: 0, geom: band(150, 2000) },
    { key: 'midslope', topo: 0.1, sandy: 0, geom: band(-120, 150) },
    { key: 'lowland', topo: -0.8, sandy: 0, geom: band(-2000, -120) },
    {
      key: 'east-bench',
      topo: 0.3,
      sandy: 0.7,
      geom: [
        [
          [cx + 15, cy - 2000],
          [cx + 2000, cy - 2000],
          [cx + 2000, cy + 2000],
          [cx + 15, cy + 2000],
          [cx + 15, cy - 2000],
        ],
      ],
    },
  ];
  const zoneFeatures: unknown[] = [];
  const samples: SampleOut[] = [];
  let n = 1;
  for (const z of zoneDefs) {
    const mp = polyclip.intersection(fieldGeom, z.geom);
    const ll = mp.map((poly) =>
      poly.map((ring) =>
        ringLonLat(
          p,
          ring
            .slice(0, -1)
            .map(([x, y]) => [Math.round(x * 100) / 100, Math.round(y * 100) / 100] as [number, number]),
          poly.indexOf(ring) === 0,
        ),
      ),
    );
    const feature = {
      type: 'Feature',
      properties: { zone: z.key },
      geometry: { type: 'MultiPolygon', coordinates: ll },
    };
    zoneFeatures.push(feature);
    const pt = pointOnFeature(feature as never).geometry.coordinates;
    samples.push({
      id: `CF-${n++}`,
      zone: z.key,
      lon: r7(pt[0]),
      lat: r7(pt[1]),
      soil: soilAt(z.topo, z.sandy, 0.5, r),
    });
  }
  write('zoned', 'zones.geojson', fc('Creek field sampling zones', zoneFeatures));
  write('zoned', 'samples.geojson', samplesGeoJson(samples, 'Creek field zone-composite samples'));
  write('zoned', 'samples.csv', samplesCsv(samples, 'Willowbrae Farms', 'Creek field'));
  console.log(`zoned: ${samples.length} composite samples in ${zoneDefs.length} zones`);
}

quarter();
zoned();
