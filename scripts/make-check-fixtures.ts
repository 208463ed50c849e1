/**
 * Writes the invented fixtures of `tilth check` (run: npx tsx scripts/make-check-fixtures.ts):
 * - tests/fixtures/check/good.geojson and boundary.geojson, the field many tests share (./check-fixtures/field.ts);
 * - tests/check/fixtures/<check>/in/: per check a passing case and the defects the check exists for, each
 *   changing one thing. A GeoJSON case carries the check's options as a foreign member `options` (the boundary
 *   as a FeatureCollection, speed and swath as written on the command line); shapefile and task data cases are
 *   folders of files (./check-fixtures/files.ts).
 * The expected findings (tests/check/fixtures/<check>/out/) are written by `REGEN=1 npx vitest run
 * tests/check/fixtures.test.ts`.
 */
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { boundary, cw, fc, ll, rect, utm, zones } from './check-fixtures/field.js';
import { shapefileCases, taskDataCases } from './check-fixtures/files.js';

const ROOT = join(import.meta.dirname, '..', 'tests');
const json = (obj: unknown) => JSON.stringify(obj) + '\n';
const write = (path: string, text: string | Uint8Array) => {
  mkdirSync(join(path, '..'), { recursive: true });
  writeFileSync(path, text);
};

const SHARED = join(ROOT, 'fixtures', 'check');
write(join(SHARED, 'boundary.geojson'), json(boundary()));
write(join(SHARED, 'good.geojson'), json(fc(zones())));

type Options = Record<string, unknown>;
const good = fc(zones());
const withOpts = (layer: object, options: Options = {}) =>
  Object.keys(options).length ? { ...layer, options } : layer;
const B = { boundary: boundary() };
/** Web Mercator (EPSG:3857) from the field's lon/lat: x = R lon, y = R ln tan(pi/4 + lat/2), R = 6 378 137 m. */
const mercator = (p: number[]) => {
  const [lon, lat] = ll(p),
    r = 6378137,
    rad = Math.PI / 180;
  return [r * lon * rad, r * Math.log(Math.tan(Math.PI / 4 + (lat * rad) / 2))].map(
    (v) => Math.round(v * 1000) / 1000,
  );
};
const named = (layer: object, name: string) => ({
  ...layer,
  crs: { type: 'name', properties: { name } },
});

/** check -> case -> the layer with its options */
const GEOJSON: Record<string, Record<string, object>> = {
  crs: {
    'pass-wgs84': good,
    'pass-utm-named': named(fc(zones(), utm), 'urn:ogc:def:crs:EPSG::32613'),
    'fail-unknown-crs': named(fc(zones(), mercator), 'urn:ogc:def:crs:EPSG::3857'),
    // UTM metres in a file that names no system: RFC 7946 reads it as lon/lat, which they cannot be
    'fail-utm-as-lonlat': fc(zones(), utm),
  },
  coords: {
    pass: good,
    'fail-null-coordinate': zone4Corner((lon) => [lon, null]),
    'fail-out-of-range': zone4Corner(() => [1e9, 52.16]),
  },
  geometry: {
    pass: good,
    // zone 4 is a bow tie
    'fail-bow-tie': fc(
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
    // zone 4's ring closes after two points
    'fail-short-ring': fc(
      zones({
        4: [
          [
            [
              [100, 300],
              [200, 300],
              [100, 300],
            ],
          ],
        ],
      }),
    ),
    // zone 1's hole lies outside its ring (in zone 2's north part); zone 4, the island, is then inside zone 1
    'fail-hole-outside': fc(
      zones({
        1: [
          [
            rect(0, 0, 400, 800, [
              [400, 300],
              [400, 600],
            ]),
            cw(rect(500, 650, 550, 700)),
          ],
        ],
      }),
    ),
  },
  overlap: {
    pass: good,
    // zone 3 reaches 50 m into zone 2
    'fail-overlap': fc(zones({ 3: [[rect(400, 250, 800, 600)]] })),
  },
  boundary: {
    pass: withOpts(good, B),
    'skip-no-boundary': good,
    // a 400 m x 50 m strip in no zone, beside zones 2 and 3
    'fail-gap': withOpts(fc(zones({ 3: [[rect(400, 300, 800, 550)]] })), B),
    // zone 2 sticks 50 m out east
    'fail-outside': withOpts(
      fc(zones({ 2: [[rect(400, 0, 850, 300, [[800, 0]])], [rect(400, 600, 800, 800)]] })),
      B,
    ),
  },
  rates: {
    pass: withOpts(good, { min: 40, max: 200 }),
    // 90 in zone 3 below, 170 in zone 4 above
    'fail-out-of-range': withOpts(good, { rateField: 'urea_lbac', min: 100, max: 150 }),
    'fail-missing-rate': fc(zones({}, { 2: null })),
    'fail-no-such-column': withOpts(good, { rateField: 'n_rate' }),
    // rate written as text in zone 3
    'refused-rate-text': fc(zones({}, { 3: '95 lb' })),
  },
  zoneSize: {
    // 12 km/h x 4 s = 13.3 m: every zone is longer and wider
    pass: withOpts(good, { speed: '12km/h', swath: '30m' }),
    // 100 km/h x 4 s = 111.1 m: longer than the 100 m island (zone 4) is wide, shorter than its diagonal
    'warn-narrow': withOpts(good, { speed: '100km/h' }),
    // 60 km/h x 10 s = 166.7 m: longer than zone 4's diagonal (141 m)
    'fail-too-short': withOpts(good, { speed: '60km/h', transitionS: 10 }),
    // 100 km/h x 4 s x 400 ft = 13 546 m2, more than zone 4's 10 000 m2
    'fail-smaller-than-swath': withOpts(good, { speed: '100km/h', swath: '400ft' }),
  },
};

/** The field with zone 4's third corner replaced. */
function zone4Corner(to: (lon: number, lat: number) => (number | null)[]) {
  const layer = fc(zones());
  const ring = layer.features[3].geometry.coordinates[0] as number[][];
  (ring as (number | null)[][])[2] = to(ring[2][0], ring[2][1]);
  return layer;
}

const CHECKS = join(ROOT, 'check', 'fixtures');
for (const [check, cases] of Object.entries(GEOJSON)) {
  rmSync(join(CHECKS, check, 'in'), { recursive: true, force: true });
  for (const [name, layer] of Object.entries(cases))
    write(join(CHECKS, check, 'in', `${name}.geojson`), json(layer));
}
rmSync(join(CHECKS, 'setfiles', 'in'), { recursive: true, force: true });
for (const [name, files] of Object.entries(shapefileCases()))
  for (const [file, bytes] of Object.entries(files)) write(join(CHECKS, 'setfiles', 'in', name, file), bytes);
rmSync(join(CHECKS, 'taskdata', 'in'), { recursive: true, force: true });
for (const [name, xml] of Object.entries(taskDataCases()))
  write(join(CHECKS, 'taskdata', 'in', name, 'TASKDATA.XML'), xml);
console.log(`wrote ${SHARED} and ${CHECKS}/*/in`);
