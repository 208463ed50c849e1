import { describe, expect, it } from 'vitest';
import geodesic from 'geographiclib-geodesic';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { tilth, ROOT } from '../helpers/cli.js';

const Q = 'sample-fields/quarter',
  Z = 'sample-fields/zoned',
  BAD = 'tests/fixtures/bad';
const noStack = (s: string) => expect(s).not.toMatch(/\n\s+at .+:\d+:\d+|internal error/);

describe('tilth inspect', () => {
  it('prints the summary of the demo quarter', () => {
    const r = tilth(['inspect', '--samples', `${Q}/samples.csv`, '--boundary', `${Q}/boundary.geojson`]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/UTM zone 13N \(EPSG:32613\)/);
    expect(r.stdout).toMatch(/62 grid, 2\.\d\d ac per sample/);
    expect(r.stdout).toMatch(/sulphate-S 0-24 in/);
  });

  it('--json parses; its area matches GeographicLib and its stats match the sample file', () => {
    const r = tilth([
      'inspect',
      '--samples',
      `${Q}/samples.geojson`,
      '--boundary',
      `${Q}/boundary.geojson`,
      '--json',
    ]);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    // source: GeographicLib (Karney) ellipsoidal area of the same rings, acres by the 1959 definition
    const gj = JSON.parse(readFileSync(join(ROOT, Q, 'boundary.geojson'), 'utf8'));
    let m2 = 0;
    gj.features[0].geometry.coordinates.forEach((ring: number[][], i: number) => {
      const p = geodesic.Geodesic.WGS84.Polygon(false);
      for (const [lon, lat] of ring.slice(0, -1)) p.AddPoint(lat, lon);
      m2 += (i ? -1 : 1) * Math.abs(p.Compute(false, true).area!);
    });
    expect(j.field.areaAc).toBeCloseTo(m2 / 4046.8564224, 2);
    expect(j.field.areaHa).toBeCloseTo(m2 / 1e4, 3);
    expect(j.samples.count).toBe(62);
    // K is not censored in the file: the max is the largest number in the k_ppm property
    const k = JSON.parse(readFileSync(join(ROOT, Q, 'samples.geojson'), 'utf8')).features.map(
      (f: { properties: { k_ppm: number } }) => f.properties.k_ppm,
    );
    expect(j.analytes.k.max).toBe(Math.max(...k));
    expect(j.analytes.k.n).toBe(62);
    expect(j.analytes.so4_s.censoredAbove).toBeGreaterThan(0);
  });

  it('zone composites with their zones', () => {
    const r = tilth([
      'inspect',
      '--samples',
      `${Z}/samples.geojson`,
      '--boundary',
      `${Z}/boundary.geojson`,
      '--zones',
      `${Z}/zones.geojson`,
      '--json',
    ]);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.samples.kind).toBe('zone composites');
    expect(j.field.parts).toBe(2);
  });

  it('reads a shapefile with a UTM .prj, and a zipped shapefile', () => {
    const r = tilth([
      'inspect',
      '--samples',
      'tests/fixtures/shp/samples.zip',
      '--boundary',
      'tests/fixtures/shp/boundary_utm.shp',
      '--json',
    ]);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).samples.count).toBe(62);
  });

  it('--help has an example', () => {
    const r = tilth(['inspect', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Examples:\n\s+tilth inspect --samples/);
  });
});

describe('bad inputs: exit 2, a message naming the problem and the fix, no stack, nothing on stdout', () => {
  const B = `${Q}/boundary.geojson`,
    S = `${Q}/samples.csv`;
  const cases: [string, string[], RegExp][] = [
    [
      'truncated JSON',
      ['--samples', `${BAD}/truncated.geojson`, '--boundary', B],
      /truncated\.geojson is not valid JSON \(it ends too early/,
    ],
    [
      'boundary in UTM metres as GeoJSON',
      ['--samples', S, '--boundary', `${BAD}/boundary-utm-metres.geojson`],
      /not a longitude\/latitude; it looks like projected metres.*Fix: reproject/,
    ],
    [
      'boundary with a projected crs member',
      ['--samples', S, '--boundary', `${BAD}/boundary-utm-crs.geojson`],
      /EPSG::32613.*must be WGS 84/,
    ],
    [
      'self-intersecting boundary',
      ['--samples', S, '--boundary', `${BAD}/self-intersecting.geojson`],
      /crosses itself.*Fix: redraw/,
    ],
    [
      'zero-area boundary',
      ['--samples', S, '--boundary', `${BAD}/zero-area.geojson`],
      /has no area.*Fix: draw the boundary again/,
    ],
    [
      'unclosed ring',
      ['--samples', S, '--boundary', `${BAD}/unclosed.geojson`],
      /not closed.*Fix: repeat the first point/,
    ],
    [
      'text in a numeric CSV column',
      ['--samples', `${BAD}/text-in-number.csv`, '--boundary', B],
      /row 9 \(sample "HQ-03"\), column "SO4-S \(lb\/ac\)": "high" is not a number\. Fix:/,
    ],
    [
      'duplicate ids',
      ['--samples', `${BAD}/duplicate-ids.csv`, '--boundary', B],
      /sample id "HQ-01" is used twice.*Fix:/,
    ],
    [
      'mixed P methods',
      ['--samples', `${BAD}/mixed-p-methods.csv`, '--boundary', B],
      /two methods.*Fix: split the file/,
    ],
    ['empty GeoJSON file', ['--samples', `${BAD}/empty.geojson`, '--boundary', B], /empty\.geojson is empty/],
    ['empty CSV file', ['--samples', `${BAD}/empty.csv`, '--boundary', B], /empty\.csv is empty/],
    [
      'empty boundary file',
      ['--samples', S, '--boundary', `${BAD}/empty.geojson`],
      /empty\.geojson is empty/,
    ],
    [
      'zero-byte .dbf',
      ['--samples', `${BAD}/zero-dbf.shp`, '--boundary', B],
      /\.dbf file beside it is empty \(0 bytes\)/,
    ],
    [
      'shapefile without .prj',
      ['--samples', S, '--boundary', `${BAD}/no-prj.shp`],
      /no \.prj file.*--assume-wgs84/,
    ],
    [
      'a single sample',
      ['--samples', `${BAD}/single-sample.geojson`, '--boundary', B],
      /1 sample\(s\) in the field; a map needs at least 3/,
    ],
    [
      '0-6 in only without a depth factor',
      ['--samples', `${BAD}/topsoil-only.csv`, '--boundary', B],
      /0-6 in only.*--depth-factor/,
    ],
    ['missing file', ['--samples', `${BAD}/nope.csv`, '--boundary', B], /does not exist/],
    [
      'bad option value',
      ['--samples', S, '--boundary', B, '--p-method', 'bray'],
      /--p-method.*olsen or kelowna/,
    ],
  ];
  it.each(cases)('%s', (_name, args, re) => {
    const r = tilth(['inspect', ...args]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(re);
    noStack(r.stderr);
    expect(r.stdout).toBe('');
  });

  it('a shapefile without .prj loads when the user says WGS 84', () => {
    const r = tilth(['inspect', '--samples', S, '--boundary', `${BAD}/no-prj.shp`, '--assume-wgs84']);
    expect(r.code).toBe(0);
  });
});
