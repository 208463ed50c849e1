/**
 * `tilth check` reads shapefile sets as GDAL does (ogrinfo, GDAL 3.6): over a seeded corpus of damaged copies of
 * one prescription (made from tests/fixtures/check/good.geojson by ogr2ogr), wherever GDAL cannot read a set,
 * check fails it; wherever check passes a set, GDAL reads the same number of features with the same rates.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkPrescription, readLayer } from '../../src/check/index.js';
import { many, mutateBytes } from '../../scripts/fuzz/mutate.js';
import { rng } from '../../scripts/fuzz/rng.js';
import { requireTool } from '../helpers/tools.js';
import { ROOT } from '../helpers/cli.js';

const RATE = 'urea_lbac';

/** GDAL's reading: null when it cannot read the set, else the rate of every feature in order. */
function gdalRates(shp: string): number[] | null {
  const g = spawnSync('ogrinfo', ['-ro', '-al', '-fields=YES', '-geom=NO', shp], {
    encoding: 'utf8',
    maxBuffer: 64 << 20,
  });
  if (g.status !== 0 || /ERROR/.test(g.stderr) || !/Feature Count: \d+/.test(g.stdout)) return null;
  return [...g.stdout.matchAll(new RegExp(`^\\s+${RATE} \\(Real\\) = (\\S+)`, 'gm'))].map((m) =>
    Number(m[1]),
  );
}

/** tilth's reading: null when check fails or refuses the set, else the rates it checked. */
async function tilthRates(files: Record<string, Uint8Array>): Promise<number[] | null> {
  try {
    const layer = await readLayer(files, 'g.shp');
    if (!checkPrescription(layer).ok) return null;
    return layer.features.map((f) => Number(f.properties?.[RATE]));
  } catch {
    return null;
  }
}

describe.skipIf(!requireTool('ogr2ogr', 'Debian gdal-bin'))(
  'check agrees with GDAL ogrinfo on damaged shapefile sets',
  () => {
    it('150 seeded damaged sets: no set GDAL cannot read passes; every passed set matches GDAL', async () => {
      const base = mkdtempSync(join(tmpdir(), 'tilth-gdal-'));
      spawnSync('ogr2ogr', [
        '-f',
        'ESRI Shapefile',
        join(base, 'g.shp'),
        join(ROOT, 'tests', 'fixtures', 'check', 'good.geojson'),
      ]);
      const good: Record<string, Uint8Array> = {};
      for (const e of ['shp', 'shx', 'dbf', 'prj'])
        good[`g.${e}`] = new Uint8Array(readFileSync(join(base, `g.${e}`)));
      expect(await tilthRates(good)).toEqual(gdalRates(join(base, 'g.shp'))); // the undamaged set: both read it alike
      const disagree: string[] = [];
      let gdalFails = 0,
        passed = 0;
      for (let seed = 1; seed <= 150; seed++) {
        const r = rng(seed);
        const files = { ...good };
        const k = `g.${r.pick(['shp', 'shx', 'dbf', 'dbf'])}`;
        files[k] = many(r, files[k]!, mutateBytes);
        const d = mkdtempSync(join(tmpdir(), 'tilth-gdal-'));
        for (const [n, b] of Object.entries(files)) writeFileSync(join(d, n), b);
        const g = gdalRates(join(d, 'g.shp'));
        const t = await tilthRates(files);
        if (g === null) gdalFails++;
        if (t !== null) passed++;
        if (t !== null && (g === null || JSON.stringify(g) !== JSON.stringify(t)))
          disagree.push(
            `seed ${seed} (${k}): GDAL ${g ? `${g.length} features` : 'cannot read it'}, tilth passed ${t.length}`,
          );
      }
      expect(disagree).toEqual([]);
      expect(gdalFails).toBeGreaterThan(5); // the corpus does break sets
      expect(passed).toBeGreaterThan(5); // and check still passes the ones that are fine
    });
  },
);
