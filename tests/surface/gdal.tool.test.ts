/**
 * tilth's IDW against GDAL's gdal_grid (Debian gdal-bin 3.6.2), cell by cell, to 1e-9 relative.
 * Fixtures: tests/fixtures/gdal/ (commands and version in its README.md). The live tests run gdal_grid
 * on the same points and grid when it is installed (requireTool).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { idwSurface, type IdwOptions } from '../../src/surface/idw.js';
import { readAsc } from '../../src/surface/asc.js';
import { requireTool } from '../helpers/tools.js';
import { gdalPoints } from '../helpers/gdalPoints.js';

const DIR = join(import.meta.dirname, '..', 'fixtures', 'gdal');

const points = gdalPoints;

// the fixture grid: -txe 500000 501000 -tye 5700800 5700000 -outsize 50 40 (20 m cells, north-up)
const GRID = { xmin: 500000, ymax: 5700800, cell: 20, cols: 50, rows: 40 };

function compare(ref: Float64Array, ours: Float64Array, nodata?: number): number {
  expect(ours.length).toBe(ref.length);
  let worst = 0,
    checked = 0;
  for (let i = 0; i < ref.length; i++) {
    if (Number.isNaN(ref[i])) {
      expect(nodata, 'GDAL wrote NODATA where none was expected').toBeDefined();
      expect(ours[i], `cell ${i}: GDAL has no value`).toBeNaN();
      continue;
    }
    const rel = Math.abs(ours[i] - ref[i]) / Math.max(Math.abs(ref[i]), 1e-300);
    if (!(rel <= 1e-9))
      throw new Error(
        `cell ${i} (row ${Math.floor(i / GRID.cols)}, col ${i % GRID.cols}): GDAL ${ref[i]}, tilth ${ours[i]}`,
      );
    worst = Math.max(worst, rel);
    checked++;
  }
  return checked;
}

const CASES: { file: string; algo: string; opts: IdwOptions; nodata?: number; env?: string[] }[] = [
  {
    file: 'invdist.asc',
    algo: 'invdist:power=2:smoothing=0',
    opts: { power: 2, neighbours: Infinity },
    env: ['--config', 'GDAL_USE_AVX', 'NO', '--config', 'GDAL_USE_SSE', 'NO'],
  },
  {
    file: 'nn12.asc',
    algo: 'invdistnn:power=2:max_points=12:radius=300:nodata=-9999',
    opts: { power: 2, neighbours: 12, radius: 300 },
    nodata: -9999,
  },
  {
    file: 'nn8.asc',
    algo: 'invdistnn:power=1.5:max_points=8:radius=120:min_points=2:nodata=-9999',
    opts: { power: 1.5, neighbours: 8, radius: 120, minNeighbours: 2 },
    nodata: -9999,
  },
];

describe('IDW matches gdal_grid 3.6.2 fixtures (1e-9 relative, every cell)', () => {
  const { xy, z } = points();
  for (const c of CASES) {
    it(c.algo, () => {
      const ref = readAsc(readFileSync(join(DIR, c.file), 'utf8'));
      expect([ref.grid.cols, ref.grid.rows, ref.grid.xmin, ref.grid.ymax, ref.grid.cell]).toEqual([
        50, 40, 500000, 5700800, 20,
      ]);
      const ours = idwSurface(xy, z, GRID, c.opts);
      expect(compare(ref.values, ours, c.nodata)).toBeGreaterThan(1900);
    });
  }
  it('cells on a sample take its value exactly (points.csv rows 122-124 sit on cell centres)', () => {
    const ref = readAsc(readFileSync(join(DIR, 'invdist.asc'), 'utf8'));
    // column 3 row 4 holds 77.5; column 25 row 20 holds 1.25 (make-points.mjs)
    expect(ref.values[4 * 50 + 3]).toBe(77.5);
    expect(idwSurface(xy, z, GRID, { neighbours: 12 })[4 * 50 + 3]).toBe(77.5);
    expect(idwSurface(xy, z, GRID, { neighbours: Infinity })[20 * 50 + 25]).toBe(1.25);
  });
});

describe.skipIf(!requireTool('gdal_grid', 'gdal-bin'))('IDW matches a live gdal_grid run', () => {
  const { xy, z } = points();
  for (const c of CASES) {
    it(`live ${c.algo}`, () => {
      const tmp = mkdtempSync(join(tmpdir(), 'tilth-gdal-'));
      try {
        const tif = join(tmp, 'out.tif'),
          asc = join(tmp, 'out.asc');
        const g = spawnSync(
          'gdal_grid',
          [
            ...(c.env ?? []),
            '-q',
            '-ot',
            'Float64',
            '-of',
            'GTiff',
            '-txe',
            '500000',
            '501000',
            '-tye',
            '5700800',
            '5700000',
            '-outsize',
            '50',
            '40',
            '-zfield',
            'z',
            '-l',
            'points',
            '-a',
            c.algo,
            'points.vrt',
            tif,
          ],
          { cwd: DIR, encoding: 'utf8' },
        );
        expect(g.status, g.stderr).toBe(0);
        const t = spawnSync(
          'gdal_translate',
          ['-q', '-of', 'AAIGrid', '-co', 'SIGNIFICANT_DIGITS=17', tif, asc],
          { encoding: 'utf8' },
        );
        expect(t.status, t.stderr).toBe(0);
        const ref = readAsc(readFileSync(asc, 'utf8'));
        expect(compare(ref.values, idwSurface(xy, z, GRID, c.opts), c.nodata)).toBeGreaterThan(1900);
      } finally {
        rmSync(tmp, { recursive: true, force: true });
      }
    });
  }
});
