import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readShapefile, encodingFromCpg, type ShapefileBytes } from '../../src/io/shapefile/read.js';
import {
  shapefileLonLat,
  shapefilePoints,
  shapefilePolygons,
  type LonLatOptions,
} from '../../src/io/shapefile/lonlat.js';
import { shapefileInZip } from '../../src/io/inputs.js';
import { readPrj } from '../../src/geo/crs.js';
import { readGeoJsonPoints, readGeoJsonPolygons } from '../../src/io/geojson.js';
import { buildSamples } from '../../src/validate/samples.js';
import { rejectedUserError } from '../helpers/errors.js';
import { ROOT } from '../helpers/cli.js';

// Fixtures made by tests/fixtures/make-fixtures.sh with GDAL 3.6.2 ogr2ogr (the outside writer).
const F = (f: string) => join(ROOT, 'tests/fixtures', f);
const bytes = (f: string) => new Uint8Array(readFileSync(F(f)));
const text = (f: string) => readFileSync(F(f), 'utf8');
const parts = (base: string, withPrj = true, withCpg = false) => ({
  label: base + '.shp',
  set: {
    shp: bytes(base + '.shp'),
    dbf: bytes(base + '.dbf'),
    prj: withPrj ? bytes(base + '.prj') : undefined,
    cpg: withCpg ? bytes(base + '.cpg') : undefined,
  } as ShapefileBytes,
});
/** The input path: the one shapefile reader, then lon/lat by the .prj. */
const lonlat = async (p: { label: string; set: ShapefileBytes }, opts: LonLatOptions = {}) =>
  shapefileLonLat(await readShapefile(p.set, p.label), opts);
const quarterBoundary = readGeoJsonPolygons(
  readFileSync(join(ROOT, 'sample-fields/quarter/boundary.geojson'), 'utf8'),
  'b',
).features[0].coordinates;

const rejectsUser = async (p: Promise<unknown>, re: RegExp) => expect(await rejectedUserError(p)).toMatch(re);

describe('shapefile reader', () => {
  it('WGS 84 polygon written by ogr2ogr reads back to the GeoJSON it came from', async () => {
    // source: GDAL 3.6.2 ogr2ogr wrote shp/boundary.shp from sample-fields/quarter/boundary.geojson
    const r = shapefilePolygons(await lonlat(parts('shp/boundary')), 'boundary');
    const got = r.features[0].coordinates;
    expect(got.length).toBe(1);
    expect(got[0].length).toBe(2); // outer ring + slough
    // ring order and winding may differ (shapefiles wind the other way); compare as point sets
    const key = (p: number[]) => `${p[0].toFixed(7)},${p[1].toFixed(7)}`;
    for (let i = 0; i < 2; i++)
      expect(new Set(got[0][i].map(key))).toEqual(new Set(quarterBoundary[0][i].map(key)));
  });

  it('UTM .prj: reprojected back to lon/lat within 1e-8 degrees (about 1 mm)', async () => {
    // source: GDAL 3.6.2 ogr2ogr -t_srs EPSG:32613 (PROJ 9.1.1) wrote shp/boundary_utm.shp
    const r = await lonlat(parts('shp/boundary_utm'));
    expect(r.crs).toMatch(/UTM zone 13N/);
    const got = shapefilePolygons(r, 'boundary').features[0].coordinates[0][0];
    const want = quarterBoundary[0][0];
    for (const p of got) {
      const d = Math.min(...want.map((q) => Math.hypot(p[0] - q[0], p[1] - q[1])));
      expect(d).toBeLessThan(1e-8);
    }
  });

  it('points with short dBASE names, also inside a .zip, give the same samples as the GeoJSON', async () => {
    const ref = buildSamples(
      readGeoJsonPoints(readFileSync(join(ROOT, 'sample-fields/quarter/samples.geojson'), 'utf8'), 's'),
    ).samples;
    for (const src of [parts('shp/samples'), shapefileInZip(bytes('shp/samples.zip'), 'samples.zip')]) {
      const s = buildSamples(shapefilePoints(await lonlat(src))).samples;
      expect(s.ids).toEqual(ref.ids);
      expect(s.values).toEqual(ref.values);
      expect(s.censored).toEqual(ref.censored);
    }
  });

  it('honours the .cpg: UTF-8 text reads right only with it', async () => {
    // source: GDAL 3.6.2 ogr2ogr -lco ENCODING=UTF-8 wrote utf8_zone.cpg = "UTF-8"
    const withCpg = await lonlat(parts('shp/utf8_zone', true, true));
    expect(withCpg.features[0].props.zone).toBe('Rivière-côté');
    const without = await lonlat(parts('shp/utf8_zone', true, false));
    expect(without.features[0].props.zone).not.toBe('Rivière-côté'); // windows-1252, the dBASE default
    expect(encodingFromCpg('1252')).toBe('windows-1252');
    expect(encodingFromCpg('UTF-8')).toBe('utf-8');
  });

  it('no .prj: refused unless the user says WGS 84', async () => {
    await rejectsUser(lonlat(parts('shp/boundary', false)), /no \.prj.*--assume-wgs84/);
    const r = await lonlat(parts('shp/boundary', false), { assumeWgs84: true });
    expect(r.crs).toMatch(/assumed/);
  });

  it('zero-byte .dbf is a user error', async () => {
    await rejectsUser(
      readShapefile(
        { shp: bytes('bad/zero-dbf.shp'), dbf: bytes('bad/zero-dbf.dbf'), prj: bytes('bad/zero-dbf.prj') },
        'z.shp',
      ),
      /\.dbf.*empty/,
    );
  });

  it('.prj recognition: GDAL WKT for WGS 84 and UTM; a Lambert projection is refused', async () => {
    // source: formats.md (the WKT GDAL 3.6.2 writes for WGS 84); EPSG:32613 and EPSG:3347 as ogr2ogr writes them
    expect(readPrj(text('shp/boundary.prj'))).toMatchObject({ kind: 'lonlat', datum: 'WGS84', epsg: 4326 });
    expect(readPrj(text('shp/boundary_utm.prj'))).toMatchObject({ kind: 'utm', zone: 13, south: false });
    const nad83utm =
      'PROJCS["NAD_1983_UTM_Zone_14N",GEOGCS["GCS_North_American_1983",DATUM["D_North_American_1983",SPHEROID["GRS_1980",6378137.0,298.257222101]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],PARAMETER["False_Easting",500000.0],PARAMETER["False_Northing",0.0],PARAMETER["Central_Meridian",-99.0],PARAMETER["Scale_Factor",0.9996],PARAMETER["Latitude_Of_Origin",0.0],UNIT["Meter",1.0]]';
    expect(readPrj(nad83utm)).toMatchObject({ kind: 'utm', zone: 14, datum: 'NAD83' });
    const lambert =
      'PROJCS["NAD83_Statistics_Canada_Lambert",GEOGCS["GCS_North_American_1983",DATUM["D_North_American_1983",SPHEROID["GRS_1980",6378137.0,298.257222101]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]],PROJECTION["Lambert_Conformal_Conic"],PARAMETER["False_Easting",6200000.0],PARAMETER["False_Northing",3000000.0],PARAMETER["Central_Meridian",-91.8666666666667],PARAMETER["Standard_Parallel_1",49.0],PARAMETER["Standard_Parallel_2",77.0],PARAMETER["Latitude_Of_Origin",63.390675],UNIT["Meter",1.0]]';
    expect(readPrj(lambert)).toMatchObject({ kind: null, problem: expect.stringMatching(/Lambert/) });
    const l = {
      label: 'l.shp',
      set: { ...parts('shp/boundary').set, prj: new TextEncoder().encode(lambert) },
    };
    await rejectsUser(lonlat(l), /Lambert.*reproject/);
  });
});
