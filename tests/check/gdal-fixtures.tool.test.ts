/**
 * The outside source behind the check fixtures (tests/check/fixtures/README.md), checked with GDAL 3.6
 * (Debian gdal-bin): ogrinfo's ST_IsValid finds as many invalid zones in each geometry case as the geometry check
 * fails, and ogrinfo reads each shapefile set that tilth refuses differently from the set it passes.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { ogrValid, requireTool } from '../helpers/tools.js';

const FIX = join(import.meta.dirname, 'fixtures');

/** What ogrinfo prints for a shapefile set's features (attributes and geometries), warnings included. */
const ogrFeatures = (shp: string) => {
  const r = spawnSync('ogrinfo', ['-ro', '-al', '-q', shp], { encoding: 'utf8' });
  return `${r.stdout}${r.stderr}`.replace(/^.*DBF_DATE_LAST_UPDATE.*$/m, '');
};

describe.skipIf(!requireTool('ogrinfo', 'Debian gdal-bin'))('check fixtures against GDAL', () => {
  const dir = join(FIX, 'geometry');
  for (const file of readdirSync(join(dir, 'in'))) {
    const name = file.replace(/\.geojson$/, '');
    it(`geometry/${name}: ST_IsValid finds the zones the check fails`, () => {
      const out = JSON.parse(readFileSync(join(dir, 'out', `${name}.json`), 'utf8'));
      const failed = out.lines[0].status === 'fail' ? out.lines[0].zones.length : 0;
      const [n, valid] = ogrValid(join(dir, 'in', file), name);
      expect(n).toBe(out.zones);
      expect(n - valid).toBe(failed);
    });
  }

  it('setfiles: GDAL reads every refused set differently from the one that passes', () => {
    const sets = join(FIX, 'setfiles', 'in');
    const pass = ogrFeatures(join(sets, 'pass', 'rx.shp'));
    expect(pass).toMatch(/urea_lbac \(Real\) = 170\.0/);
    for (const name of readdirSync(sets).filter((n) => n.startsWith('refused')))
      expect(ogrFeatures(join(sets, name, 'rx.shp')), name).not.toBe(pass);
  });
});
