/**
 * The prescription's shapefile sets for the controller (per placement, per product, 8.3 names): re-read by the
 * `shapefile` package (0.6.6) and by GDAL 3.6.2 `ogrinfo` (Debian gdal-bin).
 */
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { read as readShp } from 'shapefile';
import { unzipSync } from 'fflate';
import { prescriptionFiles } from '../../src/prescription/shapefiles.js';
import { ogrValid, requireTool, sh } from '../helpers/tools.js';
import { fieldRx } from '../helpers/checkFixtures.js';
import { tempDir } from '../helpers/tempDir.js';

const DATE = new Date(Date.UTC(2026, 3, 1));

const { save: writeSet } = tempDir('tilth-shp-');

describe('prescriptionFiles (machine layouts)', () => {
  const rx = fieldRx([{ product: 'Urea 46-0-0', placement: 'seed_row', rate: 10, unit: 'lb/ac' }]);

  it('per_placement: one set per placement, one rate column per product, unit in the name, note and zip', async () => {
    const { files, columns } = prescriptionFiles(rx, {
      layout: 'per_placement',
      date: DATE,
      title: 'Coulee Bend West (invented)',
    });
    expect(
      Object.keys(files)
        .filter((k) => k.endsWith('.shp'))
        .sort(),
    ).toEqual(['rx_seed_row.shp', 'rx_side_band.shp']);
    expect(columns.map((c) => `${c.set}:${c.column}`)).toEqual([
      'rx_side_band:urea_lbac',
      'rx_seed_row:map_lbac',
      'rx_seed_row:urea_lbac',
    ]);
    const note = new TextDecoder().decode(files['rx_seed_row.note.txt']);
    expect(note).toMatch(/map_lbac: MAP 11-52-0, placed seed row, lb\/ac/);
    expect(note).toMatch(/Caution/);
    const z = unzipSync(files['rx_seed_row.zip']);
    expect(Object.keys(z).sort()).toEqual([
      'rx_seed_row.columns.csv',
      'rx_seed_row.cpg',
      'rx_seed_row.dbf',
      'rx_seed_row.note.txt',
      'rx_seed_row.prj',
      'rx_seed_row.shp',
      'rx_seed_row.shx',
    ]);
    const r = await readShp(files['rx_seed_row.shp'].slice().buffer, files['rx_seed_row.dbf'].slice().buffer);
    expect(r.features.map((f) => [f.properties!.map_lbac, f.properties!.urea_lbac])).toEqual([
      [60, 10],
      [45, 10],
      [50, 10],
      [70, 10],
    ]);
    // totals: rate x ground area; zone areas add up to the field (800 m x 800 m in UTM = 158.24 ac on the ground)
    const side = columns[0];
    const acres = r.features.map((f) => f.properties!.area_ac as number);
    expect(acres.reduce((s, a) => s + a, 0)).toBeCloseTo(640000 / 4046.8564224 / 0.99944, 0);
    expect(side.total).toBeCloseTo(
      [110, 145.5, 90, 170].reduce((s, v, i) => s + v * acres[i], 0),
      -1,
    );
  });

  it('per_product: one set per product (and placement when it has two), single rate column', () => {
    const { files, columns } = prescriptionFiles(rx, { layout: 'per_product', date: DATE });
    expect(columns.map((c) => `${c.set}:${c.column}`)).toEqual([
      'rx_urea_46_0_0_side_band:rate_lbac',
      'rx_map_11_52_0:rate_lbac',
      'rx_urea_46_0_0_seed_row:rate_lbac',
    ]);
    expect(files['rx_map_11_52_0.zip']).toBeDefined();
  });

  it.skipIf(!requireTool('ogrinfo', 'gdal-bin'))(
    'every set of both layouts re-read by the shapefile package and GDAL 3.6.2 ogrinfo (count, ST_IsValid)',
    async () => {
      for (const [layout, crs] of [
        ['per_placement', 'lonlat'],
        ['per_product', 'utm'],
      ] as const) {
        const { files } = prescriptionFiles(rx, { layout, crs, date: DATE });
        const d = writeSet(files, `all-${layout}`);
        const sets = Object.keys(files).filter((k) => k.endsWith('.shp'));
        expect(sets.length).toBeGreaterThanOrEqual(2);
        for (const shp of sets) {
          const base = shp.slice(0, -4);
          const r = await readShp(files[shp].slice().buffer, files[`${base}.dbf`].slice().buffer);
          expect(r.features).toHaveLength(4);
          expect(ogrValid(join(d, shp), base)).toEqual([4, 4]);
        }
      }
    },
  );

  it.skipIf(!requireTool('ogrinfo', 'gdal-bin'))(
    '8.3 names, UTM: GDAL 3.6.2 reads the zipped set through /vsizip/',
    () => {
      const { files } = prescriptionFiles(rx, {
        layout: 'per_placement',
        crs: 'utm',
        shortFileNames: true,
        date: DATE,
      });
      for (const k of Object.keys(files)) expect(k).toMatch(/^[A-Z][A-Z0-9_]{0,7}\.[A-Z]{3}$/);
      const d = writeSet({ 'RX_SEED.ZIP': files['RX_SEED.ZIP'] }, 'short');
      const info = sh('ogrinfo', ['-ro', '-al', '-so', `/vsizip/${join(d, 'RX_SEED.ZIP')}/RX_SEED.SHP`]);
      expect(info).toMatch(/Feature Count: 4/);
      expect(info).toMatch(/ID\["EPSG",32613\]\]\s*$/m);
      expect(info).toMatch(/map_lbac: Real \(\d+\.1\)/);
    },
  );
});
