/**
 * Shapefile writer: every written set is re-read by the `shapefile` package (0.6.6) and by GDAL 3.6.2
 * `ogrinfo` (Debian gdal-bin), and ring winding is checked from the .shp bytes (GDAL repairs rings when
 * reading and would hide a wrong order).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { read as readShp } from 'shapefile';
import { unzipSync } from 'fflate';
import geodesic from 'geographiclib-geodesic';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import {
  writeShapefile,
  encodeDbf,
  shortFieldNames,
  shortFileNames,
  type ColumnSpec,
} from '../../src/io/shapefile/index.js';
import { prjText, readPrj } from '../../src/geo/crs.js';
import { zipFiles, readZip, isSafeEntryName } from '../../src/io/zip.js';
import { utmZoneFor } from '../../src/geo/utm.js';
import { ogrValid, requireTool, sh } from '../helpers/tools.js';
import { good } from '../helpers/checkFixtures.js';
import { tempDir } from '../helpers/tempDir.js';

const DATE = new Date(Date.UTC(2026, 3, 1));
const COLS: ColumnSpec[] = [
  { key: 'zone_id', type: 'N', width: 4 },
  { key: 'urea_lbac', type: 'N', width: 8, decimals: 1 },
  { key: 'map_lbac', type: 'N', width: 8, decimals: 1 },
  { key: 'a_very_long_property_name', type: 'C', width: 24 },
  { key: 'a_very_long_property_other', type: 'N', width: 6, decimals: 2 },
];
const feats: Feature[] = good.features.map((f, i) => ({
  ...f,
  properties: {
    ...f.properties,
    a_very_long_property_name: `zöne ${i + 1}`,
    a_very_long_property_other: i / 3,
  },
}));

/** independent oracle: signed shoelace area of a flat ring, positive counter-clockwise */
function shoelace(r: Float64Array): number {
  let s = 0;
  for (let i = 0; i + 3 < r.length; i += 2) s += r[i] * r[i + 3] - r[i + 2] * r[i + 1];
  return s / 2;
}

/** reads the rings of every record of a .shp straight from its bytes (ESRI technical description, 1998) */
function shpRings(b: Uint8Array): Float64Array[][] {
  const v = new DataView(b.buffer, b.byteOffset, b.byteLength);
  const out: Float64Array[][] = [];
  for (let off = 100; off < b.length;) {
    const len = v.getInt32(off + 4, false) * 2,
      c = off + 8;
    expect(v.getInt32(c, true)).toBe(5);
    const np = v.getInt32(c + 36, true),
      nq = v.getInt32(c + 40, true);
    const starts = Array.from({ length: np }, (_, k) => v.getInt32(c + 44 + 4 * k, true));
    const p0 = c + 44 + 4 * np;
    out.push(
      starts.map((a, k) => {
        const e = k + 1 < np ? starts[k + 1] : nq;
        return Float64Array.from({ length: 2 * (e - a) }, (_, q) => v.getFloat64(p0 + 8 * (2 * a + q), true));
      }),
    );
    off += 8 + len;
  }
  return out;
}

/** geodesic area on WGS 84 of a GeoJSON polygon's rings (GeographicLib, Karney 2013) */
function geodesicArea(g: Polygon | MultiPolygon): number {
  const polys = g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
  let a = 0;
  for (const poly of polys)
    poly.forEach((ring, k) => {
      const p = geodesic.Geodesic.WGS84.Polygon(false);
      for (const [lon, lat] of ring.slice(0, -1)) p.AddPoint(lat, lon);
      const r = Math.abs(p.Compute(false, true).area!);
      a += k === 0 ? r : -r;
    });
  return a;
}

const { path, save: writeSet } = tempDir('tilth-shp-');
describe('names', () => {
  it('dBASE column names: at most 10 characters, ASCII, unique ignoring case (dBASE III field descriptor: 11-byte name, NUL-ended)', () => {
    fc.assert(
      fc.property(fc.array(fc.string({ maxLength: 30 }), { maxLength: 40 }), (names) => {
        const s = shortFieldNames(names);
        expect(s).toHaveLength(names.length);
        for (const n of s) expect(n).toMatch(/^[A-Za-z][A-Za-z0-9_]{0,9}$/);
        expect(new Set(s.map((n) => n.toUpperCase())).size).toBe(s.length);
      }),
    );
    expect(shortFieldNames(['zone_id', 'urea_lbac'])).toEqual(['zone_id', 'urea_lbac']);
  });
  it('8.3 file names: at most 8 characters, upper case, unique (MS-DOS 8.3 rule)', () => {
    fc.assert(
      fc.property(fc.array(fc.string({ maxLength: 20 }), { maxLength: 30 }), (names) => {
        const s = shortFileNames(names);
        for (const n of s) expect(n).toMatch(/^[A-Z][A-Z0-9_]{0,7}$/);
        expect(new Set(s).size).toBe(s.length);
      }),
    );
  });
});

describe('dbf bytes (dBASE III layout as given in the ESRI Shapefile Technical Description, 1998)', () => {
  it('header, descriptors, records and end marker', () => {
    const b = encodeDbf(
      [
        { name: 'zone', type: 'N', width: 4, decimals: 0 },
        { name: 'rate', type: 'N', width: 7, decimals: 1 },
        { name: 'name', type: 'C', width: 5, decimals: 0 },
      ],
      [
        [1, 80.25, 'é'],
        [12, null, 'abcdefg'],
      ],
      DATE,
    );
    const v = new DataView(b.buffer);
    expect(b[0]).toBe(0x03);
    expect([b[1], b[2], b[3]]).toEqual([126, 4, 1]); // 2026-04-01: year - 1900
    expect(v.getUint32(4, true)).toBe(2);
    expect(v.getUint16(8, true)).toBe(32 + 32 * 3 + 1);
    expect(v.getUint16(10, true)).toBe(1 + 4 + 7 + 5);
    expect(b[32 + 11]).toBe('N'.charCodeAt(0));
    expect([b[64 + 16], b[64 + 17]]).toEqual([7, 1]);
    expect(b[32 + 96]).toBe(0x0d);
    const rec = (r: number) => Buffer.from(b.subarray(129 + 17 * r, 129 + 17 * (r + 1))).toString('utf8');
    expect(rec(0)).toBe('    1   80.3é   '); // 80.25 -> toFixed(1) "80.3"; é is 2 bytes of the 5
    expect(rec(1)).toBe('   12       abcde');
    expect(b[b.length - 1]).toBe(0x1a);
    expect(b.length).toBe(129 + 2 * 17 + 1);
  });
  it('cuts UTF-8 text at a character boundary, never inside one', () => {
    const b = encodeDbf([{ name: 't', type: 'C', width: 5, decimals: 0 }], [['abcdé']], DATE);
    // 'abcdé' is 6 bytes in UTF-8 (é = C3 A9); 5 bytes would split é, so 4 are kept and a space pads
    expect([...b.subarray(32 + 32 + 1 + 1, 32 + 32 + 1 + 6)]).toEqual([0x61, 0x62, 0x63, 0x64, 0x20]);
  });
  it('refuses a value wider than its column', () => {
    expect(() => encodeDbf([{ name: 'r', type: 'N', width: 4, decimals: 1 }], [[1234.5]])).toThrow(
      RangeError,
    );
  });
});

describe('prj', () => {
  it.skipIf(!requireTool('ogr2ogr', 'gdal-bin'))(
    'matches the .prj GDAL 3.6.2 ogr2ogr writes for EPSG:4326, 32613, 32713 and 32631',
    () => {
      const gj = path('one.geojson');
      writeFileSync(gj, JSON.stringify({ type: 'FeatureCollection', features: [good.features[0]] }));
      for (const [epsg, zone] of [
        [4326, null],
        [32613, utmZoneFor(-105, 52)],
        [32713, utmZoneFor(-105, -30)],
        [32631, utmZoneFor(3, 45)],
      ] as const) {
        const out = path(`prj${epsg}.shp`);
        sh('ogr2ogr', ['-t_srs', `EPSG:${epsg}`, out, gj]);
        expect(prjText(zone)).toBe(readFileSync(out.replace(/shp$/, 'prj'), 'utf8'));
        expect(readPrj(prjText(zone)).epsg).toBe(epsg);
      }
    },
  );
  it.skipIf(!requireTool('ogr2ogr', 'gdal-bin'))(
    'recognises the .prj GDAL 3.6.2 writes for NAD83 (EPSG:4269, 26913) and NAD83(CSRS) UTM 13N (EPSG:2957)',
    () => {
      const gj = path('one-nad.geojson');
      writeFileSync(gj, JSON.stringify({ type: 'FeatureCollection', features: [good.features[0]] }));
      const want: Record<number, object> = {
        4269: { kind: 'lonlat', datum: 'NAD83', epsg: 4269 },
        26913: { kind: 'utm', zone: 13, south: false, datum: 'NAD83', epsg: 26913 },
        2957: { kind: 'utm', zone: 13, south: false, datum: 'NAD83(CSRS)' },
      };
      for (const epsg of [4269, 26913, 2957]) {
        const out = path(`nad${epsg}.shp`);
        sh('ogr2ogr', ['-t_srs', `EPSG:${epsg}`, out, gj]);
        expect(readPrj(readFileSync(out.replace(/shp$/, 'prj'), 'utf8'))).toMatchObject(want[epsg]);
      }
      expect(
        readPrj(
          'PROJCS["Some_Local_Grid",GEOGCS["GCS_Other",DATUM["D_Other",SPHEROID["x",6378000,300]]],PROJECTION["Lambert"]]',
        ).kind,
      ).toBeNull();
    },
  );
});

for (const crs of ['lonlat', 'utm'] as const) {
  describe(`writeShapefile, ${crs}`, () => {
    const files = writeShapefile(feats, COLS, { name: `good_${crs}`, crs, date: DATE });
    const base = `good_${crs}`;

    it('writes the six files, .cpg = UTF-8, a column list beside', () => {
      expect(Object.keys(files).sort()).toEqual([
        `${base}.columns.csv`,
        `${base}.cpg`,
        `${base}.dbf`,
        `${base}.prj`,
        `${base}.shp`,
        `${base}.shx`,
      ]);
      expect(new TextDecoder().decode(files[`${base}.cpg`])).toBe('UTF-8');
      const list = new TextDecoder().decode(files[`${base}.columns.csv`]).trim().split('\n');
      expect(list[0]).toBe('column,property,type,width,decimals,description');
      expect(list.slice(1).map((l) => l.split(',').slice(0, 2).join(','))).toEqual([
        'zone_id,zone_id',
        'urea_lbac,urea_lbac',
        'map_lbac,map_lbac',
        'a_very_lon,a_very_long_property_name',
        'a_very_l_2,a_very_long_property_other',
      ]);
    });

    it('rings: exteriors clockwise, holes counter-clockwise, read from the .shp bytes (ESRI technical description)', () => {
      const rings = shpRings(files[`${base}.shp`]);
      expect(rings).toHaveLength(feats.length);
      feats.forEach((f, i) => {
        const g = f.geometry as Polygon | MultiPolygon;
        const polys = g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
        const kinds = polys.flatMap((p) => p.map((_, k) => (k === 0 ? 'exterior' : 'hole')));
        expect(rings[i]).toHaveLength(kinds.length);
        rings[i].forEach((r, k) => {
          expect(r[0]).toBe(r[r.length - 2]);
          expect(r[1]).toBe(r[r.length - 1]);
          expect(Math.sign(shoelace(r))).toBe(kinds[k] === 'exterior' ? -1 : 1);
        });
      });
      // the fixture has a hole (zone 1) and a MultiPolygon (zone 2): both kinds were exercised
      expect(rings[0]).toHaveLength(2);
      expect(rings[1]).toHaveLength(2);
    });

    it('re-read by the shapefile package (0.6.6): types, coordinates, attributes', async () => {
      const r = await readShp(files[`${base}.shp`].slice().buffer, files[`${base}.dbf`].slice().buffer, {
        encoding: 'utf-8',
      });
      expect(r.features.map((f) => f.geometry.type)).toEqual(feats.map((f) => f.geometry!.type));
      expect(r.features.map((f) => f.properties!.zone_id)).toEqual([1, 2, 3, 4]);
      expect(r.features.map((f) => f.properties!.urea_lbac)).toEqual([110, 145.5, 90, 170]);
      expect(r.features[2].properties!.a_very_lon).toBe('zöne 3');
      expect(r.features[1].properties!.a_very_l_2).toBeCloseTo(1 / 3, 2);
      if (crs === 'lonlat') {
        // the package returns shapefile (clockwise) winding; compare point sets
        const a = (r.features[0].geometry as Polygon).coordinates[1].map((p) => p.join()).sort();
        const b = (feats[0].geometry as Polygon).coordinates[1].map((p) => p.join()).sort();
        expect(a).toEqual(b);
      }
    });

    it.skipIf(!requireTool('ogrinfo', 'gdal-bin'))(
      're-read by GDAL 3.6.2 ogrinfo: type, count, extent, SRS, fields, ST_IsValid, areas',
      () => {
        const d = writeSet(files, crs);
        const shp = join(d, `${base}.shp`);
        const info = sh('ogrinfo', ['-ro', '-al', '-so', shp]);
        expect(info).toMatch(/Geometry: Polygon/);
        expect(info).toMatch(/Feature Count: 4/);
        expect(info).toMatch(crs === 'lonlat' ? /ID\["EPSG",4326\]\]\s*$/m : /ID\["EPSG",32613\]\]\s*$/m);
        expect(info).toMatch(/zone_id: Integer \(4\.0\)/);
        expect(info).toMatch(/urea_lbac: Real \(8\.1\)/);
        expect(info).toMatch(/a_very_lon: String \(24\.0\)/);
        expect(info).toMatch(/a_very_l_2: Real \(6\.2\)/);
        const ext = /Extent: \(([-\d.]+), ([-\d.]+)\) - \(([-\d.]+), ([-\d.]+)\)/
          .exec(info)!
          .slice(1)
          .map(Number);
        if (crs === 'lonlat') {
          const xs = feats.flatMap((f) =>
            (f.geometry as Polygon).coordinates
              ? JSON.stringify(f.geometry)
                  .match(/-?\d+\.\d+/g)!
                  .map(Number)
              : [],
          );
          const lons = xs.filter((v) => v < 0),
            lats = xs.filter((v) => v > 0);
          expect(ext[0]).toBeCloseTo(Math.min(...lons), 6);
          expect(ext[2]).toBeCloseTo(Math.max(...lons), 6);
          expect(ext[1]).toBeCloseTo(Math.min(...lats), 6);
          expect(ext[3]).toBeCloseTo(Math.max(...lats), 6);
        } else {
          // the fixture field spans 0..800 m from E 400000, N 5780000 (scripts/make-check-fixtures.ts), to 1 mm
          expect(ext[0]).toBeCloseTo(400000, 2);
          expect(ext[1]).toBeCloseTo(5780000, 2);
          expect(ext[2]).toBeCloseTo(400800, 2);
          expect(ext[3]).toBeCloseTo(5780800, 2);
        }
        expect(ogrValid(shp, base)).toEqual([4, 4]);
        // areas: GDAL's planar UTM area (ST_Transform to EPSG:32613 for lon/lat) over k^2 at the centroid,
        // k = k0 (1 + x^2 / 2R^2) with x = E - 500000 (Snyder 1987, Map Projections: A Working Manual, eq. 8-11
        // to first order), against GeographicLib's geodesic area of the GeoJSON; within 0.01 %
        const geomExpr = crs === 'lonlat' ? 'ST_Transform(geometry, 32613)' : 'geometry';
        const out = sh('ogrinfo', [
          '-ro',
          '-q',
          '-dialect',
          'sqlite',
          '-sql',
          `SELECT ST_Area(${geomExpr}) AS a, ST_X(ST_Centroid(${geomExpr})) AS x FROM ${base}`,
          shp,
        ]);
        const areas = [...out.matchAll(/ a \(Real\) = ([\d.e+]+)/g)].map((m) => Number(m[1]));
        const xs = [...out.matchAll(/ x \(Real\) = ([\d.e+]+)/g)].map((m) => Number(m[1]));
        expect(areas).toHaveLength(4);
        areas.forEach((a, i) => {
          const k = 0.9996 * (1 + (xs[i] - 500000) ** 2 / (2 * 6371000 ** 2));
          const want = geodesicArea(feats[i].geometry as Polygon | MultiPolygon);
          expect(Math.abs(a / (k * k) - want) / want).toBeLessThan(1e-4);
        });
      },
    );
  });
}

describe('zip', () => {
  it('round-trips through fflate, in memory', () => {
    const z = zipFiles({ 'a.shp': new Uint8Array([1, 2, 3]), 'a.dbf': new Uint8Array([4]) });
    const back = unzipSync(z);
    expect([...back['a.shp']]).toEqual([1, 2, 3]);
    expect(readZip(z, 'a.zip')['a.dbf'][0]).toBe(4);
  });
  it('calls names escaping the folder unsafe', () => {
    for (const n of ['../x.shp', '/etc/x', 'a/../../x', 'C:\\x', 'a\\..\\..\\x', ''])
      expect(isSafeEntryName(n)).toBe(false);
    for (const n of ['x.shp', 'a/b.shp', 'a..b.shp']) expect(isSafeEntryName(n)).toBe(true);
  });
});
