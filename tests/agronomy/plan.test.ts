import { describe, expect, it } from 'vitest';
import { defaultTables, parsePlan, planTemplate } from '../../src/agronomy/index.js';
import { isUserError } from '../../src/errors.js';

const tables = defaultTables();
const MIN = 'crop: canola\ntarget_yield_bu: 50\nproducts:\n  - product: map\n';

function msg(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    expect(isUserError(e)).toBe(true);
    return (e as Error).message;
  }
  throw new Error('expected a UserError');
}

describe('plan', () => {
  it('every crop starter plan parses as written, in both units', () => {
    for (const crop of Object.keys(tables.crops)) {
      for (const units of ['lb/ac', 'kg/ha'] as const) {
        const p = parsePlan(planTemplate(crop, tables, units), 'plan.yaml', tables);
        expect(p.crop).toBe(crop);
        expect(p.units).toBe(units);
        expect(p.zoning).toEqual({
          method: 'jenks',
          classes: 5,
          smoothing_passes: 2,
          min_zone_ac: 'auto',
          zone_sets: 'per_product',
          basis: 'targets',
          min_class_difference_pct: 5,
          min_rate_difference: 'auto',
          min_rate_difference_pct: 10,
          simplify_cells: 1,
        });
        expect(p.machine.rate_change_s).toBe(4);
        expect(p.output).toEqual({
          shapefile_layout: 'per_placement',
          short_names: false,
          crs: 'wgs84',
          formats: ['shapefile', 'isoxml'],
          isoxml_grid: false,
          isoxml_grid_cell_m: null,
          max_vertices: null,
        });
      }
    }
  });

  it('the starter plan shows the cautions and every section', () => {
    const text = planTemplate('canola', tables);
    for (const k of [
      '# Caution: tilth computes suggestions',
      'injures or kills seedlings',
      'agronomist',
      'soil_test:',
      'credits:',
      'strategy:',
      'implement:',
      'seed_row:',
      'when_table_missing',
      'products:',
      'machine:',
      'zoning:',
      'output:',
    ])
      expect(text).toContain(k);
  });

  it('fills visible defaults for omitted sections', () => {
    const p = parsePlan(MIN, 'plan.yaml', tables);
    expect(p.units).toBe('lb/ac');
    expect(p.strategy.tolerance_pct).toBe(5);
    expect(p.implement).toEqual({
      opener_spread_in: 1,
      row_spacing_in: 10,
      default_texture: 'medium',
      seedbed_moisture: 'good',
      placements: ['seed_row', 'side_band'],
    });
    expect(p.seed_row.when_table_missing).toBe('ask');
    expect(p.products[0]).toMatchObject({ product: 'map', min_rate: 0, max_rate: 300, step: 1 });
  });

  it('errors name the file, the key, the value and the allowed values', () => {
    let m = msg(() => parsePlan(MIN + 'implement:\n  seedbed_moisture: wet\n', 'north.yaml', tables));
    expect(m).toContain('north.yaml');
    expect(m).toContain('implement.seedbed_moisture');
    expect(m).toContain('"wet"');
    expect(m).toContain('allowed: good, dry');
    m = msg(() => parsePlan(MIN.replace('canola', 'sorghum'), 'p.yaml', tables));
    expect(m).toMatch(/key "crop" is "sorghum"; allowed: canola, wheat/);
    m = msg(() => parsePlan(MIN + 'zoning:\n  method: kriging\n', 'p.yaml'));
    expect(m).toContain('allowed: jenks, quantile, equal, kmeans');
    m = msg(() => parsePlan(MIN + 'zonning: {}\n', 'p.yaml'));
    expect(m).toContain('"zonning"');
    m = msg(() => parsePlan('crop: canola\nproducts: [{ product: map }]\n', 'p.yaml'));
    expect(m).toContain('key "target_yield_bu" is missing');
    m = msg(() => parsePlan(MIN.replace('map', 'mapp'), 'p.yaml', tables));
    expect(m).toContain('products[0].product');
    m = msg(() =>
      parsePlan(
        'crop: canola\ntarget_yield_bu: 50\nproducts:\n  - product: dap\n    placements: [seed_row]\n',
        'p.yaml',
        tables,
      ),
    );
    expect(m).toMatch(/does not allow for dap; allowed: side_band/);
    m = msg(() =>
      parsePlan(
        'crop: canola\ntarget_yield_bu: 50\nproducts:\n  - product: map\n    min_rate: 50\n    max_rate: 40\n',
        'p.yaml',
        tables,
      ),
    );
    expect(m).toContain('min_rate');
    m = msg(() => parsePlan('crop: [oops', 'p.yaml'));
    expect(m).toContain('not valid YAML');
  });

  it('machine: swath and speed with their units; the older keys still read; both forms refused', () => {
    const mach = (m: string) => parsePlan(MIN + 'machine:\n' + m, 'p.yaml', tables).machine;
    // the defaults: 60 ft and 5 mph (the starter plan's values)
    expect(parsePlan(MIN, 'p.yaml', tables).machine).toMatchObject({
      swath: { value: 60, unit: 'ft' },
      speed: { value: 5, unit: 'mph' },
      rate_change_s: 4,
      swathFrom: 'default',
    });
    expect(mach('  swath_width: 18 m\n  speed: 13 km/h\n')).toMatchObject({
      swath: { value: 18, unit: 'm' },
      speed: { value: 13, unit: 'km/h' },
      swathFrom: 'swath_width',
      speedFrom: 'speed',
    });
    expect(mach('  swath_width_ft: 90\n  speed_mph: 6\n')).toMatchObject({
      swath: { value: 90, unit: 'ft' },
      speed: { value: 6, unit: 'mph' },
      swathFrom: 'swath_width_ft',
    });
    let m = msg(() => mach('  speed: 8\n'));
    expect(m).toMatch(/key "machine.speed" is 8: give the travel speed with its unit, e.g. 5 mph or 8 km\/h/);
    m = msg(() => mach('  swath_width: 20 yd\n'));
    expect(m).toMatch(/key "machine.swath_width" is "20 yd": give the swath width with its unit/);
    m = msg(() => mach('  speed: 8 mph\n  speed_mph: 8\n'));
    expect(m).toMatch(/machine.speed.*speed_mph gives the speed too; keep one/);
  });
});
