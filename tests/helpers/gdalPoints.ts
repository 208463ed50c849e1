/** The sample points of the GDAL fixtures (tests/fixtures/gdal/points.csv, made by make-fixtures.sh). */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

/**
 * The points as flat x y pairs (UTM metres) and their values.
 * @example const { xy, z } = gdalPoints(); z.length // the sample count
 */
export function gdalPoints(): { xy: Float64Array; z: Float64Array } {
  const file = join(import.meta.dirname, '..', 'fixtures', 'gdal', 'points.csv');
  const lines = readFileSync(file, 'utf8').trim().split('\n').slice(1);
  const xy = new Float64Array(lines.length * 2),
    z = new Float64Array(lines.length);
  lines.forEach((l, i) => {
    const [x, y, v] = l.split(',').map(Number);
    xy[2 * i] = x;
    xy[2 * i + 1] = y;
    z[i] = v;
  });
  return { xy, z };
}
