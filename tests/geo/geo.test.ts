import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import geodesic from 'geographiclib-geodesic';
import { area as turfArea } from '@turf/turf';
import { projectField } from '../../src/geo/field.js';
import { projector, utmZoneFor } from '../../src/geo/utm.js';
import { ROOT } from '../helpers/cli.js';

const geod = geodesic.Geodesic.WGS84;

/** Ellipsoidal area of a MultiPolygon (lon/lat) by Karney's algorithm (GeographicLib), m2. */
function karneyArea(mp: number[][][][]): number {
  let total = 0;
  for (const poly of mp) {
    poly.forEach((ring, i) => {
      const p = geod.Polygon(false);
      for (const [lon, lat] of ring.slice(0, -1)) p.AddPoint(lat, lon);
      const a = Math.abs(p.Compute(false, true).area!);
      total += i === 0 ? a : -a;
    });
  }
  return total;
}

const load = (f: string) => JSON.parse(readFileSync(join(ROOT, f), 'utf8'));
const multi = (g: { type: string; coordinates: unknown }) =>
  (g.type === 'Polygon' ? [g.coordinates] : g.coordinates) as number[][][][];

describe('field area (ellipsoidal) against outside references', () => {
  for (const f of ['sample-fields/quarter/boundary.geojson', 'sample-fields/zoned/boundary.geojson']) {
    const gj = load(f);
    const mp = multi(gj.features[0].geometry);
    const field = projectField(mp);

    it(`${f}: within 0.001 % of GeographicLib (Karney 2013, WGS 84 ellipsoid)`, () => {
      // source: geographiclib-geodesic 2.2.0, PolygonArea (C. F. F. Karney, "Algorithms for geodesics", 2013)
      const ref = karneyArea(mp);
      expect(Math.abs(field.areaM2 - ref) / ref).toBeLessThan(1e-5);
    });

    it(`${f}: within 0.5 % of @turf/area, which uses a sphere`, () => {
      // source: @turf/area 7.x computes on a sphere of radius 6371008.8 m; at 52 N that reads about 0.4 % low
      // against the ellipsoid (measured here), so the 0.05 % cannot hold for a correct ellipsoidal area.
      const t = turfArea(gj);
      const rel = (field.areaM2 - t) / t;
      expect(Math.abs(rel)).toBeLessThan(5e-3);
      expect(rel).toBeGreaterThan(0); // the sphere's area is the smaller one at this latitude
    });
  }

  it('a quarter section is about 160 ac', () => {
    // source: Dominion Land Survey: a quarter section is half a mile square, 160 ac (the demo quarter loses its slough)
    const mp = multi(load('sample-fields/quarter/boundary.geojson').features[0].geometry);
    const withoutHole = projectField([[mp[0][0]]]).areaM2 / 4046.8564224;
    expect(withoutHole).toBeCloseTo(160, 0);
  });
});

describe('UTM projection', () => {
  const rows = readFileSync(join(ROOT, 'tests/fixtures/reference/gdaltransform-utm.txt'), 'utf8')
    .split('\n')
    .filter((l) => l && !l.startsWith('#'))
    .map((l) => l.trim().split(/\s+/).map(Number));
  it.each(rows)(
    'lon %f lat %f in EPSG:%i matches gdaltransform (GDAL 3.6.2, PROJ 9.1.1) within 1 mm',
    (lon, lat, epsg, e, n) => {
      // source: tests/fixtures/reference/gdaltransform-utm.txt, made with GDAL 3.6.2 gdaltransform
      const z = utmZoneFor(lon, lat);
      expect(z.epsg).toBe(epsg);
      const [x, y] = projector(z).toMetres(lon, lat);
      expect(Math.abs(x - e)).toBeLessThan(1e-3);
      expect(Math.abs(y - n)).toBeLessThan(1e-3);
    },
  );

  it('zone from longitude: zone = floor((lon + 180) / 6) + 1, south below the equator', () => {
    // source: UTM definition (formats.md): central meridian 6 * zone - 183
    expect(utmZoneFor(-106.6, 52.1)).toMatchObject({ zone: 13, south: false, epsg: 32613 });
    expect(utmZoneFor(-102.0001, 50)).toMatchObject({ zone: 13 });
    expect(utmZoneFor(-101.9999, 50)).toMatchObject({ zone: 14 });
    expect(utmZoneFor(147.3, -42.9)).toMatchObject({ zone: 55, south: true, epsg: 32755 });
  });

  it('metres and back round-trip within 1 mm anywhere within the zone (property)', () => {
    // source: proj4js forward/inverse are exact inverses to well under a millimetre inside a UTM zone
    fc.assert(
      fc.property(
        fc.double({ min: -179.9, max: 179.9, noNaN: true }),
        fc.double({ min: -79, max: 83, noNaN: true }),
        (lon, lat) => {
          const z = utmZoneFor(lon, lat);
          const p = projector(z);
          const [x, y] = p.toMetres(lon, lat);
          const [lon2, lat2] = p.toLonLat(x, y);
          const [x2, y2] = p.toMetres(lon2, lat2);
          return Math.hypot(x2 - x, y2 - y) < 1e-3;
        },
      ),
      { seed: 7, numRuns: 300 },
    );
  });
});
