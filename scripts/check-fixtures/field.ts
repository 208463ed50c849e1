/**
 * The invented field of the `tilth check` fixtures: "Coulee Bend West" (not a real farm), 800 m x 800 m in UTM
 * zone 13N, zones laid out in metres and converted to WGS 84 lon/lat with 8 decimals (about 1 mm):
 *
 *   y 800 +-----------+-----------+
 *         |           |  zone 2   |   zone 1: west half, with a hole (zone 4, 100 m x 100 m)
 *     600 |  zone 1   +-----------+   zone 2: MultiPolygon, two strips on the east side
 *         |   +--+    |  zone 3   |   zone 3: east middle
 *     300 |   |4 |    +-----------+
 *         |   +--+    |  zone 2   |
 *       0 +-----------+-----------+ x 800
 *
 * Each broken copy changes one thing (scripts/make-check-fixtures.ts).
 */
import { projector, utmZoneFor } from '../../src/geo/utm.js';

/** UTM 13N easting and northing of the field's south-west corner, about 106.45 W, 52.16 N. */
export const E0 = 400000,
  N0 = 5780000;
const p = projector(utmZoneFor(-105, 52));
/** A point in field metres as WGS 84 [lon, lat], 8 decimals. */
export const ll = ([x, y]: number[]) => p.toLonLat(E0 + x, N0 + y).map((v) => Math.round(v * 1e8) / 1e8);
/** A point in field metres as UTM 13N metres, to the millimetre. */
export const utm = ([x, y]: number[]) => [E0 + x, N0 + y];

/** Rectangle ring in metres, counter-clockwise, with extra points on its edges. */
export function rect(x0: number, y0: number, x1: number, y1: number, extra: number[][] = []): number[][] {
  const pts = [
    [x0, y0],
    [x1, y0],
    [x1, y1],
    [x0, y1],
  ];
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
}
/** The ring reversed (clockwise: a hole). */
export const cw = (ring: number[][]) => [...ring].reverse();

/** One zone: polygons in field metres and its two rates (lb/ac). */
export interface Z {
  id: number;
  polys: number[][][][];
  urea: number | string | null;
  map: number;
}

/** The four zones, with some zones' polygons or urea rates replaced. */
export function zones(
  mod: Partial<Record<number, number[][][][]>> = {},
  rates: Partial<Record<number, number | string | null>> = {},
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
  return base.map((z) => ({
    ...z,
    polys: mod[z.id] ?? z.polys,
    urea: z.id in rates ? rates[z.id]! : z.urea,
  }));
}

/** The zones as a GeoJSON FeatureCollection, coordinates made by `to` (default WGS 84 lon/lat). */
export function fc(zs: Z[], to: (p: number[]) => number[] = ll) {
  const rings = (ring: number[][]) => ring.map(to);
  return {
    type: 'FeatureCollection',
    features: zs.map((z) => ({
      type: 'Feature',
      properties: { zone_id: z.id, urea_lbac: z.urea, map_lbac: z.map },
      geometry:
        z.polys.length === 1
          ? { type: 'Polygon', coordinates: z.polys[0].map(rings) }
          : { type: 'MultiPolygon', coordinates: z.polys.map((poly) => poly.map(rings)) },
    })),
  };
}

/** The field boundary, its edges holding the zones' corners. */
export function boundary() {
  const edgePts = [
    [400, 0],
    [800, 300],
    [800, 600],
    [400, 800],
  ];
  return {
    type: 'FeatureCollection',
    features: [
      {
        type: 'Feature',
        properties: { name: 'Coulee Bend West (invented)' },
        geometry: { type: 'Polygon', coordinates: [rect(0, 0, 800, 800, edgePts).map(ll)] },
      },
    ],
  };
}
