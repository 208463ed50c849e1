/**
 * The invented field of the `tilth check` tests (scripts/make-check-fixtures.ts): its files, the shapefile
 * columns its zones are written with, a temporary folder to write sets into, and the UTM scale its areas
 * are compared with.
 */
import { afterAll, beforeAll } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { FeatureCollection, MultiPolygon, Polygon } from 'geojson';
import type { ColumnSpec } from '../../src/io/shapefile/index.js';
import type { CheckReport } from '../../src/check/index.js';

const TESTS = join(import.meta.dirname, '..');
/** A file of the shared field: tests/fixtures/check/<name>. */
export const fx = (name: string) => join(TESTS, 'fixtures', 'check', name);
/** One check's input case: tests/check/fixtures/<check>/in/<name>.geojson. */
export const checkCase = (check: string, name: string) =>
  join(TESTS, 'check', 'fixtures', check, 'in', `${name}.geojson`);
export const BOUNDARY = fx('boundary.geojson');
export const good = JSON.parse(readFileSync(fx('good.geojson'), 'utf8')) as FeatureCollection<
  Polygon | MultiPolygon
>;
export const COLS: ColumnSpec[] = [
  { key: 'zone_id', type: 'N', width: 4 },
  { key: 'urea_lbac', type: 'N', width: 8, decimals: 1 },
  { key: 'map_lbac', type: 'N', width: 8, decimals: 1 },
];
/** UTM areal scale k^2 at the fixture field (E about 400 400 m): k = k0 (1 + x^2 / 2R^2), Snyder 1987 eq. 8-11 to first order */
export const K2 = (0.9996 * (1 + (400400 - 500000) ** 2 / (2 * 6371000 ** 2))) ** 2;

/** The lines of one check in a report. */
export const line = (r: CheckReport, check: string) => r.lines.filter((l) => l.check === check);

/**
 * A temporary folder for the file's tests, removed after them; `save` writes a set of files into a sub-folder.
 * Call at the top of a test file.
 */
export function tempSets(prefix: string): {
  save: (files: Record<string, Uint8Array>, sub: string) => string;
} {
  let dir = '';
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), prefix));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  return {
    save(files, sub) {
      const d = join(dir, sub);
      mkdirSync(d, { recursive: true });
      for (const [k, v] of Object.entries(files)) writeFileSync(join(d, k), v);
      return d;
    },
  };
}
