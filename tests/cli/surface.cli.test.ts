/**
 * `tilth surface` end to end on the demo quarter (invented data: plumbing only). The grid's extent and
 * projection are checked with GDAL's gdalinfo and proj4js (outside tools); values against the library call.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import proj4 from 'proj4';
import { afterAll, describe, expect, it } from 'vitest';
import { tilth, ROOT } from '../helpers/cli.js';
import { requireTool } from '../helpers/tools.js';
import { readAsc } from '../../src/surface/asc.js';

const Q = join(ROOT, 'sample-fields', 'quarter');
const tmp = mkdtempSync(join(tmpdir(), 'tilth-surface-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

/** The boundary's UTM 13N bounding box by proj4js directly from the GeoJSON. */
function bbox(): [number, number, number, number] {
  const gj = JSON.parse(readFileSync(join(Q, 'boundary.geojson'), 'utf8'));
  const geom = gj.type === 'FeatureCollection' ? gj.features[0].geometry : (gj.geometry ?? gj);
  const rings: number[][][] = geom.type === 'Polygon' ? geom.coordinates : geom.coordinates.flat();
  const t = proj4('EPSG:4326', '+proj=utm +zone=13 +datum=WGS84 +units=m +no_defs');
  let x0 = Infinity,
    y0 = Infinity,
    x1 = -Infinity,
    y1 = -Infinity;
  for (const [lon, lat] of rings[0]) {
    const [x, y] = t.forward([lon, lat]);
    x0 = Math.min(x0, x);
    x1 = Math.max(x1, x);
    y0 = Math.min(y0, y);
    y1 = Math.max(y1, y);
  }
  return [x0, y0, x1, y1];
}

describe('tilth surface', () => {
  const out = join(tmp, 'p.asc');
  const r = tilth([
    'surface',
    '--samples',
    join(Q, 'samples.geojson'),
    '--boundary',
    join(Q, 'boundary.geojson'),
    '--nutrient',
    'P',
    '--cell',
    '5',
    '--power',
    'auto',
    '--neighbours',
    '12',
    '--out',
    out,
    '--json',
  ]);

  it('writes the .asc and .prj, prints the choice and the cross-validation table as JSON', () => {
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.nutrient).toBe('p');
    expect(j.neighbours).toBe(12);
    expect(j.crossValidation.map((row: { power: number }) => row.power)).toEqual([1, 1.5, 2, 3]);
    const best = Math.min(...j.crossValidation.map((row: { rmse: number }) => row.rmse));
    expect(j.crossValidation.find((row: { power: number }) => row.power === j.power).rmse).toBe(best);
    expect(j.choice).toMatch(/power chosen by leave-one-out cross-validation/);
    expect(readFileSync(out.replace(/\.asc$/, '.prj'), 'utf8')).toMatch(/^PROJCS\["WGS_1984_UTM_Zone_13N"/);
  });

  it('grid covers the boundary (proj4js) with whole 5 m cells; values within the samples range over about the field area', () => {
    const { grid, values } = readAsc(readFileSync(out, 'utf8'));
    const [x0, y0, x1, y1] = bbox();
    expect(grid.xmin).toBeLessThanOrEqual(x0);
    expect(grid.xmin).toBeGreaterThan(x0 - 5);
    expect(grid.ymax).toBeGreaterThanOrEqual(y1);
    expect(grid.ymax).toBeLessThan(y1 + 5);
    expect(grid.xmin + grid.cols * 5).toBeGreaterThanOrEqual(x1);
    expect(grid.ymax - grid.rows * 5).toBeLessThanOrEqual(y0);
    const j = JSON.parse(r.stdout);
    let n = 0;
    for (const v of values)
      if (!Number.isNaN(v)) {
        n++;
        expect(v).toBeGreaterThanOrEqual(j.min - 5e-4);
        expect(v).toBeLessThanOrEqual(j.max + 5e-4);
      }
    // about 155 ac = 62.7 ha of cropland (sample-fields/README.md) = 25 000 cells of 25 m2, plus partial edge cells
    expect(n * 25).toBeGreaterThan(62e4);
    expect(n * 25).toBeLessThan(68e4);
  });

  it.skipIf(!requireTool('gdalinfo', 'gdal-bin'))(
    'gdalinfo reads the extent and WGS 84 / UTM zone 13N',
    () => {
      const g = spawnSync('gdalinfo', ['-json', out], { encoding: 'utf8' });
      expect(g.status, g.stderr).toBe(0);
      const info = JSON.parse(g.stdout);
      const { grid } = readAsc(readFileSync(out, 'utf8'));
      expect(info.size).toEqual([grid.cols, grid.rows]);
      expect(info.geoTransform).toEqual([grid.xmin, 5, 0, grid.ymax, 0, -5]);
      expect(info.coordinateSystem.wkt).toMatch(/^PROJCRS\["WGS 84 \/ UTM zone 13N"/);
      expect(info.bands[0].noDataValue).toBe(-9999);
    },
  );

  it('user errors exit 2 with the fix: unknown nutrient, too many cells, output not .asc', () => {
    const base = [
      'surface',
      '--samples',
      join(Q, 'samples.geojson'),
      '--boundary',
      join(Q, 'boundary.geojson'),
    ];
    const a = tilth([...base, '--nutrient', 'zinc', '--out', join(tmp, 'x.asc')]);
    expect(a.code).toBe(2);
    expect(a.stderr).toMatch(/nutrient "zinc" is not known\. Fix:/);
    const b = tilth([...base, '--nutrient', 'k', '--cell', '0.1', '--out', join(tmp, 'x.asc')]);
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/more than the 50,000,000 allowed\. Fix: use a cell size of at least/);
    const c = tilth([...base, '--nutrient', 'k', '--out', join(tmp, 'x.tif')]);
    expect(c.code).toBe(2);
    expect(c.stderr).toMatch(/ending in \.asc/);
  });

  it('zone-composite samples: every field cell takes one of the zone values (sample-fields/zoned)', () => {
    const Z = join(ROOT, 'sample-fields', 'zoned');
    const o = join(tmp, 's.asc');
    const z = tilth([
      'surface',
      '--samples',
      join(Z, 'samples.geojson'),
      '--boundary',
      join(Z, 'boundary.geojson'),
      '--zones',
      join(Z, 'zones.geojson'),
      '--nutrient',
      'sulphate',
      '--cell',
      '10',
      '--out',
      o,
      '--json',
    ]);
    expect(z.code, z.stderr).toBe(0);
    const j = JSON.parse(z.stdout);
    expect(j.method).toBe('zones');
    const distinct = new Set([...readAsc(readFileSync(o, 'utf8')).values].filter((v) => !Number.isNaN(v)));
    expect(distinct.size).toBeGreaterThan(1);
    expect(distinct.size).toBeLessThanOrEqual(4); // four zones (sample-fields/README.md)
  });

  it('--help shows an example', () => {
    const h = tilth(['surface', '--help']);
    expect(h.code).toBe(0);
    expect(h.stdout).toMatch(/Example:\n  tilth surface --samples/);
  });
});
