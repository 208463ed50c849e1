/**
 * Leave-one-out cross-validation against R gstat 2.1.0 krige.cv (IDW: no variogram model), fixture and live.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { crossValidate, type CvRow } from '../../src/surface/crossValidate.js';
import { requireTool } from '../helpers/tools.js';
import { ROOT } from '../helpers/cli.js';
import { gdalPoints } from '../helpers/gdalPoints.js';

const points = gdalPoints;

function parse(csv: string): CvRow[] {
  return csv
    .trim()
    .split('\n')
    .slice(1)
    .map((l) => {
      const [p, k, rmse, mae, bias, n] = l.split(',');
      return {
        power: Number(p),
        neighbours: k === 'all' ? Infinity : Number(k),
        rmse: Number(rmse),
        mae: Number(mae),
        bias: Number(bias),
        n: Number(n),
      };
    });
}

function expectSame(ours: CvRow[], ref: CvRow[]) {
  expect(ours.length).toBe(ref.length);
  for (const r of ref) {
    const o = ours.find((x) => x.power === r.power && x.neighbours === r.neighbours)!;
    expect(o, `row power ${r.power} k ${r.neighbours}`).toBeDefined();
    expect(o.n).toBe(r.n);
    for (const key of ['rmse', 'mae', 'bias'] as const) {
      expect(
        Math.abs(o[key] - r[key]),
        `${key} power ${r.power} k ${r.neighbours}: ${o[key]} vs gstat ${r[key]}`,
      ).toBeLessThan(1e-9 * Math.max(1, Math.abs(r[key])));
    }
  }
}

describe('crossValidate matches R gstat krige.cv (IDW)', () => {
  const { xy, z } = points();
  it('fixture tests/fixtures/gstat/idw-cv.csv (gstat 2.1.0), powers 1-3 x neighbours 8, 12, 16, all', () => {
    const res = crossValidate(xy, z)!;
    expectSame(res.table, parse(readFileSync(join(ROOT, 'tests/fixtures/gstat/idw-cv.csv'), 'utf8')));
    // the choice is the lowest RMSE of the table
    expect(res.best.rmse).toBe(Math.min(...res.table.map((r) => r.rmse)));
  });

  it('needs 3 samples', () => {
    expect(crossValidate(new Float64Array([0, 0, 1, 1]), [1, 2])).toBeNull();
  });

  it.skipIf(!requireTool('Rscript', 'r-cran-gstat r-cran-sp', ['-e', 'library(gstat)']))(
    'live Rscript run of idw-cv.R',
    () => {
      const r = spawnSync('Rscript', ['tests/fixtures/gstat/idw-cv.R'], { cwd: ROOT, encoding: 'utf8' });
      expect(r.status, r.stderr).toBe(0);
      expectSame(crossValidate(xy, z)!.table, parse(r.stdout));
    },
    300_000,
  ); // R starts slowly on a busy machine
});
