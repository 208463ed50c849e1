/**
 * Esri ASCII grid writer: numbers against JavaScript's own toFixed, and the file as GDAL 3.6.2 reads it
 * (gdalinfo: size, extent, projection; gdal_translate back to numbers).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatAsc, readAsc } from '../../src/surface/asc.js';
import { prjText } from '../../src/geo/crs.js';
import { requireTool } from '../helpers/tools.js';

const dec = new TextDecoder();

describe('formatAsc', () => {
  it('writes each value as Number(v.toFixed(d)) would print it, NaN as NODATA', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.oneof(
            fc.double({ min: -1e6, max: 1e6, noNaN: true }),
            fc.constant(NaN),
            fc.integer({ min: -99, max: 99 }).map((v) => v / 8),
          ),
          { minLength: 1, maxLength: 60 },
        ),
        fc.integer({ min: 0, max: 6 }),
        (vals, d) => {
          const g = { xmin: 500000, ymax: 5700000, cell: 5, cols: vals.length, rows: 1 };
          const text = dec.decode(formatAsc(g, vals, { decimals: d }));
          const row = text.trim().split('\n').pop()!.split(' ');
          vals.forEach((v, i) => {
            // toFixed rounds the binary value half-up; ours rounds |v| * 10^d half away from zero: allow one last-digit step
            const want = Number.isNaN(v) ? -9999 : Number(v.toFixed(d));
            expect(Math.abs(Number(row[i]) - want)).toBeLessThanOrEqual(10 ** -d * 1.000001);
            if (!Number.isNaN(v)) expect(row[i]).toMatch(/^-?\d+(\.\d*[1-9])?$/);
          });
        },
      ),
      { numRuns: 200, seed: 21 },
    );
  });

  it('header: lower-left corner, rows north to south', () => {
    const g = { xmin: 500010, ymax: 5700100, cell: 10, cols: 2, rows: 3 };
    const text = dec.decode(formatAsc(g, [1, 2, 3, 4, 5, NaN]));
    expect(text).toBe(
      'ncols 2\nnrows 3\nxllcorner 500010.0\nyllcorner 5700070.0\ncellsize 10.0\nNODATA_value -9999.0\n1 2\n3 4\n5 -9999\n',
    );
    const back = readAsc(text);
    expect(back.grid).toEqual(g);
    expect([...back.values.slice(0, 5)]).toEqual([1, 2, 3, 4, 5]);
    expect(back.values[5]).toBeNaN();
  });
});

describe.skipIf(!requireTool('gdalinfo', 'gdal-bin'))('GDAL reads the .asc and .prj', () => {
  it('gdalinfo: size, extent and WGS 84 / UTM zone 13N; gdal_translate reads the values back', () => {
    const tmp = mkdtempSync(join(tmpdir(), 'tilth-asc-'));
    try {
      const g = { xmin: 412340, ymax: 5761230, cell: 5, cols: 4, rows: 3 };
      const vals = [1.5, 2.25, NaN, 4, 5, 6.125, 7, 8, 9, 10.5, 11, 12];
      writeFileSync(join(tmp, 'p.asc'), formatAsc(g, vals));
      writeFileSync(join(tmp, 'p.prj'), prjText({ zone: 13, south: false }));
      const r = spawnSync('gdalinfo', ['-json', join(tmp, 'p.asc')], { encoding: 'utf8' });
      expect(r.status, r.stderr).toBe(0);
      const info = JSON.parse(r.stdout);
      expect(info.size).toEqual([4, 3]);
      expect(info.geoTransform).toEqual([412340, 5, 0, 5761230, 0, -5]);
      expect(info.coordinateSystem.wkt).toMatch(/^PROJCRS\["WGS 84 \/ UTM zone 13N"/);
      expect(info.bands[0].noDataValue).toBe(-9999);
      const t = spawnSync('gdal_translate', ['-q', '-of', 'XYZ', join(tmp, 'p.asc'), join(tmp, 'p.xyz')], {
        encoding: 'utf8',
      });
      expect(t.status, t.stderr).toBe(0);
      const xyz = readFileSync(join(tmp, 'p.xyz'), 'utf8')
        .trim()
        .split('\n')
        .map((l) => l.split(' ').map(Number));
      // first cell centre: (xmin + 2.5, ymax - 2.5)
      expect(xyz[0]).toEqual([412342.5, 5761227.5, 1.5]);
      expect(xyz.map((p) => p[2])).toEqual(vals.map((v) => (Number.isNaN(v) ? -9999 : v)));
      // south zone: false northing 10 000 000
      writeFileSync(join(tmp, 'p.prj'), prjText({ zone: 55, south: true }));
      const s = JSON.parse(spawnSync('gdalinfo', ['-json', join(tmp, 'p.asc')], { encoding: 'utf8' }).stdout);
      expect(s.coordinateSystem.wkt).toMatch(/^PROJCRS\["WGS 84 \/ UTM zone 55S"/);
    } finally {
      rmSync(tmp, { recursive: true, force: true });
    }
  });
});
