/** Farm files and farm totals (src/prescription/farm.ts): the rules of the format and a sum checked by hand. */
import { describe, expect, it } from 'vitest';
import { farmTotals, parseFarm } from '../../src/prescription/farm.js';
import { userErrorMessage as err } from '../helpers/errors.js';
import type { ProductTotal } from '../../src/prescription/index.js';

describe('parseFarm', () => {
  it('applies defaults, names fields by their out folder, keeps per-field keys', () => {
    const f = parseFarm(
      'defaults: { plan: p.yaml, cell: 2 }\nfields:\n  - { samples: a.csv, boundary: a.geojson, out: rx/a/ }\n  - { name: B, samples: b.csv, boundary: b.geojson, out: rx/b, plan: q.yaml, cell: 5 }\n',
      'farm.yaml',
    );
    expect(f).toEqual([
      {
        name: 'a',
        samples: 'a.csv',
        boundary: 'a.geojson',
        plan: 'p.yaml',
        out: 'rx/a/',
        zones: undefined,
        tables: undefined,
        cell: 2,
      },
      {
        name: 'B',
        samples: 'b.csv',
        boundary: 'b.geojson',
        plan: 'q.yaml',
        out: 'rx/b',
        zones: undefined,
        tables: undefined,
        cell: 5,
      },
    ]);
  });
  it('names the field and the key to fix', () => {
    expect(
      err(() =>
        parseFarm('fields:\n  - { name: X, samples: a.csv, boundary: a.geojson, out: rx }\n', 'farm.yaml'),
      ),
    ).toMatch(/field 1 \(X\) has no "plan"/);
    expect(
      err(() =>
        parseFarm(
          'fields:\n  - { samples: a, boundary: b, plan: p, out: rx }\n  - { samples: a, boundary: b, plan: p, out: rx }\n',
          'farm.yaml',
        ),
      ),
    ).toMatch(/field 2 writes to "rx", as field 1 does/);
    expect(
      err(() =>
        parseFarm('fields:\n  - { samples: a, boundary: b, plan: p, out: rx, colour: red }\n', 'farm.yaml'),
      ),
    ).toMatch(/farm\.yaml: key "fields\.0"/);
    expect(err(() => parseFarm('fields: [', 'farm.yaml'))).toMatch(/not valid YAML/);
  });
});

describe('farmTotals', () => {
  const t = (
    product: string,
    placement: ProductTotal['placement'],
    totalLb: number,
    appliedAc: number,
  ): ProductTotal => ({
    zoneSet: 'shared',
    product,
    label: product,
    placement,
    totalLb,
    totalKg: totalLb * 0.45359237,
    meanRate: 0,
    minRate: 0,
    maxRate: 0,
    unit: 'lb/ac',
    appliedAc,
  });
  it('sums per product and placement over fields (worked by hand)', () => {
    const r = farmTotals([
      { totals: [t('urea', 'side_band', 1000, 100), t('map', 'seed_row', 300, 100)] },
      { totals: [] },
      { totals: [t('urea', 'side_band', 500, 60), t('urea', 'broadcast', 40, 10)] },
    ]);
    expect(r.map((x) => [x.product, x.placement, x.totalLb, x.appliedAc, x.fields])).toEqual([
      ['map', 'seed_row', 300, 100, 1],
      ['urea', 'broadcast', 40, 10, 1],
      ['urea', 'side_band', 1500, 160, 2],
    ]);
    // lb to kg: 0.45359237 kg per lb (international avoirdupois pound, exact by definition)
    expect(r[2].totalKg).toBeCloseTo(1500 * 0.45359237, 9);
  });
});
