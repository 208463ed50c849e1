import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { kinks, polygon } from '@turf/turf';
import { findCrossing } from '../../src/validate/crossings.js';
import { fieldInputs } from '../helpers/inputs.js';
import { rejectedUserError } from '../helpers/errors.js';
import { isUserError } from '../../src/errors.js';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT } from '../helpers/cli.js';

const file = (name: string, t: string) => ({ name, bytes: new TextEncoder().encode(t) });
const Q = (f: string) => file(f, readFileSync(join(ROOT, 'sample-fields/quarter', f), 'utf8'));
const userError = async (f: () => Promise<unknown>, re: RegExp) =>
  expect(await rejectedUserError(f())).toMatch(re);

describe('ring crossings', () => {
  it('bow-tie, clean square, a hole crossing its outer ring', async () => {
    expect(findCrossing([new Float64Array([0, 0, 2, 2, 2, 0, 0, 2, 0, 0])])).not.toBeNull();
    expect(findCrossing([new Float64Array([0, 0, 2, 0, 2, 2, 0, 2, 0, 0])])).toBeNull();
    const outer = new Float64Array([0, 0, 10, 0, 10, 10, 0, 10, 0, 0]);
    expect(findCrossing([outer, new Float64Array([2, 2, 2, 4, 4, 4, 4, 2, 2, 2])])).toBeNull();
    expect(findCrossing([outer, new Float64Array([8, 2, 8, 4, 12, 4, 12, 2, 8, 2])])).toMatchObject({
      ringA: 0,
      ringB: 1,
    });
  });

  it('agrees with @turf/kinks on random rings (property)', async () => {
    // source: @turf/kinks 7.x (independent implementation) finds self-intersections of a polygon ring
    // distinct points on a 1e-4 lattice over 100 x 100 (validation drops repeated points before this check)
    const pt = fc.tuple(fc.integer({ min: 0, max: 1_000_000 }), fc.integer({ min: 0, max: 1_000_000 }));
    await fc.assert(
      fc.asyncProperty(
        fc.uniqueArray(pt, { minLength: 3, maxLength: 9, selector: (p) => `${p[0]},${p[1]}` }),
        (ipts) => {
          const pts = ipts.map(([x, y]) => [x * 1e-4, y * 1e-4]);
          const ring = [...pts, pts[0]];
          const flat = new Float64Array(ring.flat());
          const ours = findCrossing([flat]) !== null;
          const theirs = kinks(polygon([ring])).features.length > 0;
          return ours === theirs;
        },
      ),
      { seed: 3, numRuns: 500 },
    );
  });
});

describe('prepareInputs', () => {
  it('the demo quarter loads with no warnings, in UTM zone 13N', async () => {
    const r = await fieldInputs(Q('samples.geojson'), Q('boundary.geojson'));
    expect(r.warnings).toEqual([]);
    expect(r.field.utm.epsg).toBe(32613);
    expect(r.samples.xy.length).toBe(2 * r.samples.ids.length);
    expect(r.field.parts[0].holes.length).toBe(1);
  });

  it('samples outside the boundary: a warning naming them, or dropped on request', async () => {
    const gj = JSON.parse(readFileSync(join(ROOT, 'sample-fields/quarter/samples.geojson'), 'utf8'));
    gj.features[0].geometry.coordinates[0] -= 0.01; // about 700 m west
    const s = file('s.geojson', JSON.stringify(gj));
    const kept = await fieldInputs(s, Q('boundary.geojson'));
    expect(kept.warnings.find((w) => w.code === 'outside-boundary')?.message).toMatch(/HQ-01/);
    expect(kept.samples.ids.length).toBe(62);
    const dropped = await fieldInputs(s, Q('boundary.geojson'), undefined, { dropOutside: true });
    expect(dropped.samples.ids).not.toContain('HQ-01');
    expect(dropped.samples.values.p.length).toBe(61);
  });

  it('duplicate locations warn (the maps average them); swapped lat/lon is a user error', async () => {
    const gj = JSON.parse(readFileSync(join(ROOT, 'sample-fields/quarter/samples.geojson'), 'utf8'));
    gj.features[1].geometry.coordinates = gj.features[0].geometry.coordinates;
    expect(
      (await fieldInputs(file('s.geojson', JSON.stringify(gj)), Q('boundary.geojson'))).warnings
        .map((w) => w.message)
        .join('\n'),
    ).toMatch(/within 0.5 m of each other/);
    const sw = JSON.parse(readFileSync(join(ROOT, 'sample-fields/quarter/samples.geojson'), 'utf8'));
    for (const f of sw.features) f.geometry.coordinates.reverse();
    await userError(
      () => fieldInputs(file('s.geojson', JSON.stringify(sw)), Q('boundary.geojson')),
      /look swapped/,
    );
  });

  it('zone composites drawn as their zone polygons give the same samples and zones as points + --zones', async () => {
    const Z = (f: string) => readFileSync(join(ROOT, 'sample-fields/zoned', f), 'utf8');
    const zones = JSON.parse(Z('zones.geojson'));
    const pts = JSON.parse(Z('samples.geojson'));
    const polys = {
      type: 'FeatureCollection',
      features: pts.features.map((f: { properties: { zone: string } }) => ({
        type: 'Feature',
        properties: f.properties,
        geometry: zones.features.find(
          (z: { properties: { zone: string } }) => z.properties.zone === f.properties.zone,
        ).geometry,
      })),
    };
    const a = await fieldInputs(
      file('s.geojson', Z('samples.geojson')),
      file('b.geojson', Z('boundary.geojson')),
      file('z.geojson', Z('zones.geojson')),
    );
    const b = await fieldInputs(
      file('p.geojson', JSON.stringify(polys)),
      file('b.geojson', Z('boundary.geojson')),
    );
    expect(b.zones!.keys).toEqual(a.zones!.keys);
    expect(b.samples.values).toEqual(a.samples.values);
    expect(b.samples.zone).toEqual(a.samples.zone);
    expect(b.zones!.lonlat).toEqual(a.zones!.lonlat);
    await userError(
      () =>
        fieldInputs(
          file('p.geojson', JSON.stringify(polys)),
          file('b.geojson', Z('boundary.geojson')),
          file('z.geojson', Z('zones.geojson')),
        ),
      /zones once/,
    );
  });

  it('a boundary with [latitude, longitude] order is named as swapped', async () => {
    const gj = JSON.parse(readFileSync(join(ROOT, 'sample-fields/quarter/boundary.geojson'), 'utf8'));
    for (const ring of gj.features[0].geometry.coordinates) for (const p of ring) p.reverse();
    await userError(
      () => fieldInputs(Q('samples.geojson'), file('b.geojson', JSON.stringify(gj))),
      /latitude and longitude swapped/,
    );
  });

  it('zone composites: keys checked against the zone polygons', async () => {
    const Z = (f: string) => file(f, readFileSync(join(ROOT, 'sample-fields/zoned', f), 'utf8'));
    const r = await fieldInputs(Z('samples.csv'), Z('boundary.geojson'), Z('zones.geojson'));
    expect(r.zones?.keys).toEqual(['knoll', 'midslope', 'lowland', 'east-bench']);
    expect(r.samples.zone).toEqual(['knoll', 'midslope', 'lowland', 'east-bench']);
    const bad = readFileSync(join(ROOT, 'sample-fields/zoned/samples.csv'), 'utf8').replace(
      /,knoll,/g,
      ',hilltop,',
    );
    await userError(
      () => fieldInputs(file('s.csv', bad), Z('boundary.geojson'), Z('zones.geojson')),
      /zone "hilltop" is not among/,
    );
  });
});

describe('robustness: a damaged input is a user error, never a crash (property)', () => {
  const csv = readFileSync(join(ROOT, 'sample-fields/quarter/samples.csv'), 'utf8').split('\n');
  const boundary = readFileSync(join(ROOT, 'sample-fields/quarter/boundary.geojson'), 'utf8');
  const junk = fc.oneof(
    fc.constantFrom(
      '',
      '-',
      '<',
      '>x',
      '1e999',
      'NaN',
      '-0',
      '0-6',
      '6-24',
      '24-6',
      '"',
      ',',
      'HQ-01',
      '999',
      '-106.4',
      '52.3',
      '<2',
      'ppm',
      '12 ppm',
      '5 lb/ac',
    ),
    fc.string({ maxLength: 5 }),
  );
  it('one CSV cell replaced by junk', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 2, max: csv.length - 2 }),
        fc.integer({ min: 0, max: 12 }),
        junk,
        async (row, col, v) => {
          const lines = [...csv];
          const cells = lines[row].split(',');
          cells[Math.min(col, cells.length - 1)] = v;
          lines[row] = cells.join(',');
          try {
            await fieldInputs(file('s.csv', lines.join('\n')), file('b.geojson', boundary));
          } catch (e) {
            if (!isUserError(e)) throw e;
          }
        },
      ),
      { seed: 21, numRuns: 300 },
    );
  });

  it('the boundary GeoJSON cut or with one number replaced', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.integer({ min: 0, max: boundary.length }),
        fc.oneof(fc.constant(null), fc.constantFrom('0', '1e9', '-999', '"x"', 'null', '[]', '{}')),
        async (at, repl) => {
          let text: string;
          if (repl === null) text = boundary.slice(0, at);
          else {
            const nums = [...boundary.matchAll(/-?\d+\.\d+/g)];
            const m = nums[at % nums.length];
            text = boundary.slice(0, m.index) + repl + boundary.slice(m.index! + m[0].length);
          }
          try {
            await fieldInputs(file('s.csv', csv.join('\n')), file('b.geojson', text));
          } catch (e) {
            if (!isUserError(e)) throw e;
          }
        },
      ),
      { seed: 22, numRuns: 300 },
    );
  });
});
