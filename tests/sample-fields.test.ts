import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { booleanPointInPolygon } from '@turf/turf';
import { fieldInputs } from './helpers/inputs.js';
import { requireTool } from './helpers/tools.js';
import { ROOT } from './helpers/cli.js';

// The demo farm is invented (sample-fields/README.md); these checks hold its files to the claims made about them,
// using outside tools for geometry.
const file = (p: string) => ({ name: p, bytes: readFileSync(join(ROOT, p)) });
const json = (p: string) => JSON.parse(readFileSync(join(ROOT, p), 'utf8'));

function ogrSql(path: string, sql: string): Record<string, number> {
  const r = spawnSync('ogrinfo', ['-ro', '-q', '-dialect', 'sqlite', '-sql', sql, join(ROOT, path)], {
    encoding: 'utf8',
  });
  expect(r.status).toBe(0);
  const out: Record<string, number> = {};
  for (const m of r.stdout.matchAll(/^\s*(\w+) \((?:Integer|Real|Integer64)\) = (\S+)/gm))
    out[m[1]] = Number(m[2]);
  return out;
}

describe.skipIf(!requireTool('ogrinfo', 'gdal-bin'))(
  'demo geometry checked by GDAL 3.6.2 (ogrinfo, SQLite dialect)',
  () => {
    const cases: [string, string][] = [
      ['sample-fields/quarter/boundary.geojson', 'Home quarter boundary'],
      ['sample-fields/zoned/boundary.geojson', 'Creek field boundary'],
      ['sample-fields/zoned/zones.geojson', 'Creek field sampling zones'],
    ];
    it.each(cases)('%s: every polygon is valid (ST_IsValid)', async (path, layer) => {
      // source: GDAL 3.6.2 ogrinfo with SpatiaLite ST_IsValid (GEOS validity rules)
      const r = ogrSql(path, `SELECT COUNT(*) AS n, SUM(ST_IsValid(geometry)) AS valid FROM "${layer}"`);
      expect(r.n).toBeGreaterThan(0);
      expect(r.valid).toBe(r.n);
    });

    it.each(cases.slice(0, 2))(
      "%s: tilth's area within 0.001 %% of SpatiaLite ST_Area(geometry, 1) (ellipsoid)",
      async (path, layer) => {
        // source: GDAL 3.6.2 ogrinfo, SpatiaLite ST_Area with use_ellipsoid = 1 (WGS 84)
        const ref = ogrSql(path, `SELECT SUM(ST_Area(geometry, 1)) AS a FROM "${layer}"`).a;
        const dir = path.split('/')[1];
        const inp = await fieldInputs(file(`sample-fields/${dir}/samples.csv`), file(path));
        expect(Math.abs(inp.field.areaM2 - ref) / ref).toBeLessThan(1e-5);
      },
    );
  },
);

const q = await fieldInputs(
  file('sample-fields/quarter/samples.csv'),
  file('sample-fields/quarter/boundary.geojson'),
);

describe('demo farm claims (sample-fields/README.md)', () => {
  it('quarter: about 60 samples at about 1 per 2.5 ac, all inside the boundary (checked with @turf/boolean-point-in-polygon)', async () => {
    // source: @turf/boolean-point-in-polygon 7.x (independent of tilth's point-in-polygon)
    const n = q.samples.ids.length;
    expect(n).toBeGreaterThanOrEqual(55);
    expect(n).toBeLessThanOrEqual(70);
    const ac = q.field.areaM2 / 4046.8564224;
    expect(ac / n).toBeGreaterThan(2);
    expect(ac / n).toBeLessThan(3);
    const b = json('sample-fields/quarter/boundary.geojson').features[0];
    for (let i = 0; i < n; i++)
      expect(booleanPointInPolygon([q.samples.lonlat[2 * i], q.samples.lonlat[2 * i + 1]], b)).toBe(true);
  });

  it('quarter: sulphate-S varies many-fold with spots under 10 lb/ac; a low-K corner; low-P areas', async () => {
    // thresholds: agronomy.md (S response below 20-30 lb/ac 0-24 in; K critical about 125 ppm; Olsen P low <= 10 ppm)
    const s = [...q.samples.values.so4_s],
      k = [...q.samples.values.k],
      p = [...q.samples.values.p];
    expect(Math.max(...s) / Math.min(...s)).toBeGreaterThan(10);
    expect(s.filter((v) => v < 10).length).toBeGreaterThanOrEqual(3);
    expect(k.filter((v) => v < 125).length).toBeGreaterThanOrEqual(2);
    expect(k.filter((v) => v >= 250).length / k.length).toBeGreaterThan(0.8);
    expect(p.filter((v) => v <= 10).length).toBeGreaterThanOrEqual(3);
    expect(new Set(q.samples.texture)).toEqual(new Set(['light', 'medium', 'heavy']));
  });

  it('zoned: two-part boundary; the zones tile it (areas add up within 0.01 %)', async () => {
    const z = await fieldInputs(
      file('sample-fields/zoned/samples.geojson'),
      file('sample-fields/zoned/boundary.geojson'),
      file('sample-fields/zoned/zones.geojson'),
    );
    expect(z.field.parts.length).toBe(2);
    let sum = 0;
    for (const parts of z.zones!.parts) for (const p of parts) sum += Math.abs(ringArea(p.exterior));
    let field = 0;
    for (const p of z.field.parts) field += Math.abs(ringArea(p.exterior));
    expect(Math.abs(sum - field) / field).toBeLessThan(1e-4);
  });
});

function ringArea(r: Float64Array): number {
  let a = 0;
  for (let i = 0; i + 3 < r.length; i += 2) a += r[i] * r[i + 3] - r[i + 2] * r[i + 1];
  return a / 2;
}
