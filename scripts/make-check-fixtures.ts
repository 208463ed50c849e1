/**
 * Writes the invented prescriptions in tests/fixtures/check/ (run: npx tsx scripts/make-check-fixtures.ts).
 * A fictional 800 m x 800 m field ("Coulee Bend West", not a real farm) in UTM zone 13N, zones laid out
 * in metres and converted to WGS 84 lon/lat with 8 decimals (about 1 mm):
 *
 *   y 800 +-----------+-----------+
 *         |           |  zone 2   |   zone 1: west half, with a hole (zone 4, 100 m x 100 m)
 *     600 |  zone 1   +-----------+   zone 2: MultiPolygon, two strips on the east side
 *         |   +--+    |  zone 3   |   zone 3: east middle
 *     300 |   |4 |    +-----------+
 *         |   +--+    |  zone 2   |
 *       0 +-----------+-----------+ x 800
 *
 * The broken copies each change one thing (see BROKEN below).
 */
import { writeFileSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { projector, utmZoneFor } from '../src/geo/utm.js';

const OUT = join(import.meta.dirname, '..', 'tests', 'fixtures', 'check');
const E0 = 400000,
  N0 = 5780000; // UTM 13N, about 106.45 W, 52.16 N
const p = projector(utmZoneFor(-105, 52));
const ll = ([x, y]: number[]) => p.toLonLat(E0 + x, N0 + y).map((v) => Math.round(v * 1e8) / 1e8);
/** rectangle ring in metres, counter-clockwise, with extra points on its edges */
const rect = (x0: number, y0: number, x1: number, y1: number, extra: number[][] = []) => {
  const pts = [
    [x0, y0],
    [x1, y0],
    [x1, y1],
    [x0, y1],
  ];
  // insert extra points on edges in CCW order
  const onEdge = (q: number[], a: number[], b: number[]) =>
    a[0] === b[0]
      ? q[0] === a[0] && (q[1] - a[1]) * (q[1] - b[1]) < 0
      : q[1] === a[1] && (q[0] - a[0]) * (q[0] - b[0]) < 0;
  const ring: number[][] = [];
  for (let i = 0; i < 4; i++) {
    const a = pts[i],
      b = pts[(i + 1) % 4];
    ring.push(a);
    const mids = extra
      .filter((q) => onEdge(q, a, b))
      .sort((u, v) => Math.hypot(u[0] - a[0], u[1] - a[1]) - Math.hypot(v[0] - a[0], v[1] - a[1]));
    ring.push(...mids);
  }
  ring.push(pts[0]);
  return ring;
};
const toLL = (ring: number[][]) => ring.map(ll);
const cw = (ring: number[][]) => [...ring].reverse();

interface Z {
  id: number;
  polys: number[][][][];
  urea: number | string;
  map: number;
}
function zones(
  mod: Partial<Record<number, number[][][][]>> = {},
  rates: Partial<Record<number, number | string>> = {},
): Z[] {
  const base: Z[] = [
    {
      id: 1,
      polys: [
        [
          rect(0, 0, 400, 800, [
            [400, 300],
            [400, 600],
          ]),
          cw(rect(100, 300, 200, 400)),
        ],
      ],
      urea: 110,
      map: 60,
    },
    { id: 2, polys: [[rect(400, 0, 800, 300)], [rect(400, 600, 800, 800)]], urea: 145.5, map: 45 },
    { id: 3, polys: [[rect(400, 300, 800, 600)]], urea: 90, map: 50 },
    { id: 4, polys: [[rect(100, 300, 200, 400)]], urea: 170, map: 70 },
  ];
  return base.map((z) => ({ ...z, polys: mod[z.id] ?? z.polys, urea: rates[z.id] ?? z.urea }));
}
function fc(zs: Z[]) {
  return {
    type: 'FeatureCollection',
    features: zs.map((z) => ({
      type: 'Feature',
      properties: { zone_id: z.id, urea_lbac: z.urea, map_lbac: z.map },
      geometry:
        z.polys.length === 1
          ? { type: 'Polygon', coordinates: z.polys[0].map(toLL) }
          : { type: 'MultiPolygon', coordinates: z.polys.map((poly) => poly.map(toLL)) },
    })),
  };
}

mkdirSync(OUT, { recursive: true });
const w = (name: string, obj: unknown) => writeFileSync(join(OUT, name), JSON.stringify(obj) + '\n');
const edgePts = [
  [400, 0],
  [800, 300],
  [800, 600],
  [400, 800],
];
w('boundary.geojson', {
  type: 'FeatureCollection',
  features: [
    {
      type: 'Feature',
      properties: { name: 'Coulee Bend West (invented)' },
      geometry: { type: 'Polygon', coordinates: [toLL(rect(0, 0, 800, 800, edgePts))] },
    },
  ],
});
w('good.geojson', fc(zones()));
/** BROKEN: each file breaks one check, naming the zone */
w('overlap.geojson', fc(zones({ 3: [[rect(400, 250, 800, 600)]] }))); // zone 3 reaches 50 m into zone 2
w('gap.geojson', fc(zones({ 3: [[rect(400, 300, 800, 550)]] }))); // 400 m x 50 m strip in no zone, beside zones 2 and 3
w('outside.geojson', fc(zones({ 2: [[rect(400, 0, 850, 300, [[800, 0]])], [rect(400, 600, 800, 800)]] }))); // zone 2 sticks 50 m out east
w('bad-rate-text.geojson', fc(zones({}, { 3: '95 lb' }))); // rate written as text in zone 3
w(
  'self-crossing.geojson',
  fc(
    zones({
      4: [
        [
          [
            [100, 300],
            [200, 400],
            [200, 300],
            [100, 400],
            [100, 300],
          ],
        ],
      ],
    }),
  ),
); // zone 4 is a bow tie
console.log(`wrote fixtures to ${OUT}`);
