/**
 * Easting / northing columns with --crs, checked against GDAL's gdaltransform (PROJ), an outside implementation.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readCsvRecords } from '../../src/io/csv.js';
import { parseCrs } from '../../src/io/crs.js';
import { ROOT } from '../helpers/cli.js';
import { requireTool } from '../helpers/tools.js';

describe.skipIf(!requireTool('gdaltransform', 'gdal-bin'))('UTM columns against gdaltransform', () => {
  it('10-utm-easting-northing.csv read with --crs EPSG:32613 lands where GDAL puts it (within 1e-8 degrees)', () => {
    // source: GDAL gdaltransform (3.6, PROJ 9) -s_srs EPSG:32613 -t_srs +proj=longlat +datum=WGS84
    const text = readFileSync(join(ROOT, 'tests/fixtures/labs/10-utm-easting-northing.csv'), 'utf8');
    const t = readCsvRecords(text, '10.csv', [], { crs: 'EPSG:32613' });
    const input = t.records.map((r) => `${r.props.Easting} ${r.props.Northing}`).join('\n') + '\n';
    const g = spawnSync(
      'gdaltransform',
      ['-s_srs', 'EPSG:32613', '-t_srs', '+proj=longlat +datum=WGS84 +no_defs'],
      { input, encoding: 'utf8' },
    );
    expect(g.status).toBe(0);
    const gdal = g.stdout
      .trim()
      .split('\n')
      .map((l) => l.trim().split(/\s+/).map(Number));
    expect(gdal.length).toBe(t.records.length);
    t.records.forEach((r, i) => {
      expect(r.lon).toBeCloseTo(gdal[i][0], 8);
      expect(r.lat).toBeCloseTo(gdal[i][1], 8);
    });
  });

  it('every NAD83 and NAD83(CSRS) UTM code tilth accepts is the zone GDAL says', () => {
    // source: the EPSG registry as shipped with GDAL 3.6 / PROJ 9 (gdalsrsinfo -o proj4 EPSG:code)
    const codes = [
      26911, 26912, 26913, 26914, 3154, 3155, 3156, 3157, 2955, 2956, 2957, 3158, 3159, 3160, 2958, 2959,
      2960, 2961, 2962, 3761,
    ];
    for (const code of codes) {
      const g = spawnSync('gdalsrsinfo', ['-o', 'proj4', `EPSG:${code}`], { encoding: 'utf8' });
      const zone = /\+proj=utm \+zone=(\d+) /.exec(g.stdout)?.[1];
      expect(zone, `EPSG:${code}`).toBeDefined();
      expect(parseCrs(`EPSG:${code}`).proj4, `EPSG:${code}`).toMatch(new RegExp(`\\+zone=${zone} `));
    }
  });
});
