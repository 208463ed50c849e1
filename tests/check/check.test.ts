/**
 * `tilth check`: passes tilth's own outputs and the hand-made good prescription, fails each broken
 * fixture naming the zone, and refuses unreadable input with exit 2. Fixtures: tests/fixtures/check/ and
 * tests/check/fixtures/ (invented field, written by scripts/make-check-fixtures.ts); binary broken sets are made
 * here. Each check's pass and fail cases, compared with expected findings, are in fixtures.test.ts.
 */
import { holeOutside } from '../../src/check/geometry.js';
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import fc from 'fast-check';
import { zipSync } from 'fflate';
import geodesic from 'geographiclib-geodesic';
import { writeShapefile } from '../../src/io/shapefile/index.js';
import { BOUNDARY, checkCase, COLS, fieldRx, fx, good, K2, line } from '../helpers/checkFixtures.js';
import { tempDir } from '../helpers/tempDir.js';
import { prescriptionFiles } from '../../src/prescription/shapefiles.js';
import { hullExtent } from '../../src/check/shape.js';
import { checkPrescription, type CheckReport } from '../../src/check/index.js';
import { loadLayer } from '../../src/cli/check.js';
import { lengthOption, speedOption } from '../../src/cli/util.js';
import { isUserError } from '../../src/errors.js';

const { save } = tempDir('tilth-check-');
/** Options that turn every check on: the field's boundary, a machine range of 40 to 200 and 12 km/h. */
const EVERY_CHECK = ['--boundary', BOUNDARY, '--min', '40', '--max', '200', '--speed', '12'];
/**
 * `tilth check ARGS --json`, but in this process (spawning the CLI costs seconds on a shared machine): reads the
 * files the way the command does (src/cli/check.ts loadLayer) and runs the library. Exit 0/1/2 as the CLI.
 */
async function lib(args: string[]): Promise<{ code: number; report: CheckReport; stderr: string }> {
  const [file, ...rest] = args;
  const o: Record<string, string | boolean> = {};
  for (let i = 0; i < rest.length; i++) {
    const k = rest[i].replace(/^--/, '').replace(/-(.)/g, (_, c: string) => c.toUpperCase());
    if (rest[i + 1] === undefined || rest[i + 1].startsWith('--')) o[k] = true;
    else o[k] = rest[++i];
  }
  const num = (k: string) => (o[k] === undefined ? undefined : Number(o[k]));
  try {
    const layer = await loadLayer(file, 'prescription');
    const boundary = o.boundary ? await loadLayer(o.boundary as string, 'boundary') : undefined;
    const report = checkPrescription(layer, {
      boundary,
      rateField: o.rateField as string | undefined,
      min: num('min'),
      max: num('max'),
      speed: speedOption('--speed', o.speed as string | undefined, [0.1, 100]),
      swath: lengthOption('--swath', o.swath as string | undefined, [0.1, 200]),
      transitionS: num('transition'),
      strict: !!o.strict,
    });
    return { code: report.ok ? 0 : 1, report, stderr: '' };
  } catch (e) {
    if (!isUserError(e)) throw e;
    return { code: 2, report: undefined as unknown as CheckReport, stderr: `tilth: ${(e as Error).message}` };
  }
}

describe('hullExtent against brute force', () => {
  it('diameter = largest distance between any two points; width = smallest spread over every pair direction', async () => {
    const pt = fc.tuple(fc.integer({ min: -1000, max: 1000 }), fc.integer({ min: -1000, max: 1000 }));
    fc.assert(
      fc.property(fc.array(pt, { minLength: 3, maxLength: 25 }), (pts) => {
        const P = pts as [number, number][];
        let diam = 0,
          width = Infinity;
        for (const a of P) for (const b of P) diam = Math.max(diam, Math.hypot(a[0] - b[0], a[1] - b[1]));
        // the minimum-width strip has one side through two of the points (a hull edge)
        for (const a of P)
          for (const b of P) {
            const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
            if (!len) continue;
            const d = P.map(([x, y]) => ((b[0] - a[0]) * (y - a[1]) - (b[1] - a[1]) * (x - a[0])) / len);
            width = Math.min(width, Math.max(...d) - Math.min(...d));
          }
        const h = hullExtent(P);
        expect(h.diameter).toBeCloseTo(diam, 6);
        if (Number.isFinite(width) && width > 1e-9) expect(h.width).toBeCloseTo(width, 6);
      }),
    );
  });
});

describe('tilth check on the hand-made prescriptions (GeoJSON)', () => {
  it('passes the good one: hole, MultiPolygon zone, with boundary, machine range and speed', async () => {
    const { code, report } = await lib([fx('good.geojson'), ...EVERY_CHECK]);
    expect(code).toBe(0);
    expect(report.ok).toBe(true);
    expect(report.lines.filter((l) => l.status !== 'pass')).toEqual([]);
    // totals = rate x ground area per zone; areas from GeographicLib (Karney 2013) geodesic polygons
    const acres = good.features.map((f) => {
      const polys = f.geometry.type === 'Polygon' ? [f.geometry.coordinates] : f.geometry.coordinates;
      let a = 0;
      for (const poly of polys)
        poly.forEach((ring, k) => {
          const p = geodesic.Geodesic.WGS84.Polygon(false);
          for (const [lon, lat] of ring.slice(0, -1)) p.AddPoint(lat, lon);
          a += (k ? -1 : 1) * Math.abs(p.Compute(false, true).area!);
        });
      return a / 4046.8564224; // 1 ac = 4046.8564224 m2 (international yard and pound, 1959)
    });
    const urea = report.totals.find((t) => t.field === 'urea_lbac')!;
    expect(urea.unit).toBe('lb/ac');
    const want = good.features.reduce((s, f, i) => s + (f.properties!.urea_lbac as number) * acres[i], 0);
    expect(Math.abs(urea.total - want) / want).toBeLessThan(1e-4);
    expect(urea.areaAc).toBeCloseTo(
      acres.reduce((s, a) => s + a, 0),
      2,
    );
  });

  it('fails a gap inside the boundary, naming the zones beside it (400 m x 50 m by construction)', async () => {
    const { code, report } = await lib([checkCase('boundary', 'fail-gap'), '--boundary', BOUNDARY]);
    expect(code).toBe(1);
    const [l] = line(report, 'gaps');
    expect(l.status).toBe('fail');
    expect(l.zones).toContain('zone 3');
    const a = Number(/\(([\d.]+) m2,/.exec(l.message)![1]);
    expect(Math.abs(a - 20000 / K2) / (20000 / K2)).toBeLessThan(1e-3);
  });

  it('fails a zone reaching outside the boundary, naming it (50 m x 300 m by construction)', async () => {
    const { code, report } = await lib([checkCase('boundary', 'fail-outside'), '--boundary', BOUNDARY]);
    expect(code).toBe(1);
    const [l] = line(report, 'outside');
    expect(l.zones).toEqual(['zone 2']);
    const a = Number(/\(([\d.]+) m2\)/.exec(l.message)![1]);
    expect(Math.abs(a - 15000 / K2) / (15000 / K2)).toBeLessThan(1e-3);
  });

  it('takes speed and swath with their unit and names them as given', async () => {
    // 8 mph = 12.874752 km/h (international mile, 1959); x 4 s = 14.3 m
    let { report } = await lib([fx('good.geojson'), '--speed', '8mph', '--swath', '60ft']);
    expect(line(report, 'zone_size')[0].message).toMatch(
      /^at 8 mph \(12\.9 km\/h\) a rate change takes 4 s = 14\.3 m/,
    );
    // a plain number is km/h, as before
    ({ report } = await lib([fx('good.geojson'), '--speed', '12']));
    expect(line(report, 'zone_size')[0].message).toMatch(/^at 12 km\/h a rate change takes 4 s = 13\.3 m/);
    // 100 km/h x 4 s = 111.1 m; x 400 ft (121.92 m) = 13 546 m2 > the 10 000 m2 island: too small for the swath
    ({ report } = await lib([fx('good.geojson'), '--speed', '100km/h', '--swath', '400ft']));
    expect(line(report, 'zone_size')[0].message).toMatch(/x 400 ft \(121\.9 m\) swath: zone 4/);
    const bad = await lib([fx('good.geojson'), '--speed', '8 knots']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(
      /option --speed: "8 knots" is not a speed .* e\.g\. --speed 13km\/h or --speed 8mph/,
    );
  });
});

describe("tilth check on tilth's own shapefile outputs", () => {
  const rx = fieldRx();
  for (const [layout, crs, short] of [
    ['per_placement', 'lonlat', false],
    ['per_product', 'utm', true],
  ] as const) {
    it(`${layout}, ${crs}${short ? ', 8.3 names' : ''}: every zip and .shp passes`, async () => {
      const { files } = prescriptionFiles(rx, { layout, crs, shortFileNames: short });
      const d = save(files, `own-${layout}`);
      const targets = Object.keys(files).filter((k) => /\.(zip|shp)$/i.test(k));
      expect(targets.length).toBe(4);
      for (const t of targets) {
        const { code, report } = await lib([join(d, t), ...EVERY_CHECK, '--strict']);
        expect(report.lines.filter((l) => l.status !== 'pass')).toEqual([]);
        expect(code).toBe(0);
        expect(line(report, 'crs')[0].message).toMatch(crs === 'utm' ? /EPSG:32613/ : /EPSG:4326/);
      }
    });
  }
});

describe('tilth check refuses unreadable shapefiles and zips (exit 2, nothing written)', () => {
  const set = () => writeShapefile(good.features, COLS, { name: 'rx' });

  it('truncated .shp', async () => {
    const f = set();
    f['rx.shp'] = f['rx.shp'].subarray(0, f['rx.shp'].length - 40);
    const r = await lib([join(save(f, 'trunc'), 'rx.shp')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/rx\.shp: not a readable shapefile: .*truncated/);
  });

  it('rate column of text in the .dbf, naming the zone', async () => {
    const feats = good.features.map((f) => ({
      ...f,
      properties: { ...f.properties, urea_lbac: `${f.properties!.urea_lbac} lb` },
    }));
    const f = writeShapefile(feats, [COLS[0], { key: 'urea_lbac', type: 'C', width: 12 }], { name: 'rx' });
    const r = await lib([join(save(f, 'textrate'), 'rx.shp')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/zone 1, column "urea_lbac": "110 lb" is text/);
  });

  it('zip without a .shp', async () => {
    const f = set();
    const d = save({ 'rx.zip': zipSync({ 'rx.dbf': f['rx.dbf'], 'rx.prj': f['rx.prj'] }) }, 'noshp');
    const r = await lib([join(d, 'rx.zip')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/rx\.zip: holds no \.shp .*entries: rx\.dbf, rx\.prj/);
  });

  it('a UTM shapefile against a lon/lat boundary, and a .shp without .shx and .cpg', async () => {
    const f = writeShapefile(good.features, COLS, { name: 'rx', crs: 'utm' });
    delete f['rx.shx'];
    delete f['rx.cpg'];
    const { code, report } = await lib([join(save(f, 'utm'), 'rx.shp'), '--boundary', BOUNDARY]);
    expect(report.lines.filter((l) => l.status === 'fail' || l.status === 'warn')).toEqual([]);
    expect(line(report, 'gaps')[0].status).toBe('pass');
    expect(code).toBe(0);
  });
});

describe('checkPrescription (library)', () => {
  it('overlay survives edges split into many nearly collinear points after a projection round trip', async () => {
    // regression: polyclip-ts (exact arithmetic) failed on the nanometre noise of UTM -> lon/lat -> UTM
    const { checkPrescription, layerFromGeoJSON } = await import('../../src/check/index.js');
    const { projector, utmZoneFor } = await import('../../src/geo/utm.js');
    const p = projector(utmZoneFor(-105, 52));
    const feats = [];
    for (let i = 0; i < 3; i++)
      for (let j = 0; j < 3; j++) {
        const x0 = 400000 + i * 200,
          y0 = 5780000 + j * 200,
          c = [
            [x0, y0],
            [x0 + 200, y0],
            [x0 + 200, y0 + 200],
            [x0, y0 + 200],
          ];
        const ring: number[][] = [];
        for (let k = 0; k < 4; k++)
          for (let t = 0; t < 25; t++)
            ring.push(
              p.toLonLat(
                c[k][0] + ((c[(k + 1) % 4][0] - c[k][0]) * t) / 25,
                c[k][1] + ((c[(k + 1) % 4][1] - c[k][1]) * t) / 25,
              ),
            );
        ring.push(ring[0]);
        feats.push({
          type: 'Feature',
          properties: { zone_id: feats.length + 1, urea_lbac: 100 },
          geometry: { type: 'Polygon', coordinates: [ring] },
        });
      }
    const sq = [
      [400000, 5780000],
      [400600, 5780000],
      [400600, 5780600],
      [400000, 5780600],
      [400000, 5780000],
    ].map(([x, y]) => p.toLonLat(x, y));
    const layer = layerFromGeoJSON(
      JSON.stringify({ type: 'FeatureCollection', features: feats }),
      'grid.geojson',
    );
    const boundary = layerFromGeoJSON(
      JSON.stringify({ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [sq] } }),
      'b.geojson',
    );
    const r = checkPrescription(layer, { boundary });
    expect(r.lines.filter((l) => l.status === 'fail' || l.status === 'warn')).toEqual([]);
    expect(r.ok).toBe(true);
  });
});

describe('holeOutside (the hole test turf booleanValid leaves out)', () => {
  const ext = [
    [0, 0],
    [4, 0],
    [4, 4],
    [0, 4],
    [0, 0],
  ];
  it('finds a hole outside its ring, passes one inside and one touching the ring at a vertex (OGC allows it)', () => {
    const inside = [
      [1, 1],
      [1, 2],
      [2, 2],
      [1, 1],
    ];
    const touching = [
      [4, 2],
      [3, 1],
      [3, 3],
      [4, 2],
    ];
    const outside = [
      [5, 1],
      [5, 2],
      [6, 2],
      [5, 1],
    ];
    expect(holeOutside([[ext, inside]])).toBeNull();
    expect(holeOutside([[ext, touching]])).toBeNull();
    expect(holeOutside([[ext], [ext, inside, outside]])).toEqual({ part: 2, hole: 2 });
  });
});
