/**
 * The invented field of the `tilth check` tests (scripts/make-check-fixtures.ts): its files, the shapefile
 * columns its zones are written with, the field as a prescription, and the UTM scale its areas are compared with.
 */
import { readFileSync } from 'node:fs';
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

/** A rate of the field as a prescription: product, placement, rate, unit. */
type Rate = { product: string; placement: string; rate: unknown; unit: string };

/**
 * The field as tilth's prescription: per zone its id and rates, urea in the side band and MAP in the seed row
 * (the field's urea_lbac and map_lbac), then `more` rates.
 */
export function fieldRx(more: Rate[] = []): FeatureCollection {
  return {
    type: 'FeatureCollection',
    features: good.features.map((f) => ({
      ...f,
      properties: {
        zone_id: f.properties!.zone_id,
        rates: [
          { product: 'Urea 46-0-0', placement: 'side_band', rate: f.properties!.urea_lbac, unit: 'lb/ac' },
          { product: 'MAP 11-52-0', placement: 'seed_row', rate: f.properties!.map_lbac, unit: 'lb/ac' },
          ...more,
        ],
      },
    })),
  };
}
