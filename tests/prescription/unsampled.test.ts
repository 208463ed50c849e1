/**
 * Boundary parts no sample speaks for (more than 1 000 m from every sample, src/validate/coverage.ts): refused for
 * rates unless the plan's `unsampled_parts` names what goes there (src/prescription/unsampled.ts). The field is the
 * invented demo quarter with a detached 200 m x 220 m part about 1.4 km east of it.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { area, polygon } from '@turf/turf';
import { beforeAll, describe, expect, it } from 'vitest';
import { defaultTables, parsePlan, type Plan } from '../../src/agronomy/index.js';
import { readinessProblems } from '../../src/cli/safety/readiness.js';
import { buildPrescription, productRate, type Prescription } from '../../src/prescription/index.js';
import { unsampledDecision } from '../../src/prescription/unsampled.js';
import type { FieldInputs } from '../../src/types.js';
import { ROOT } from '../helpers/cli.js';
import { fieldInputs } from '../helpers/inputs.js';

const Q = join(ROOT, 'sample-fields', 'quarter');
const tables = defaultTables();
const SQUARE = [
  [-106.385, 52.315],
  [-106.382, 52.315],
  [-106.382, 52.317],
  [-106.385, 52.317],
  [-106.385, 52.315],
];
const file = (name: string, text: string) => ({ name, bytes: new TextEncoder().encode(text) });
const planText = readFileSync(join(Q, 'plan.yaml'), 'utf8');
const plan = (value: string): Plan =>
  parsePlan(planText.replace(/^unsampled_parts: null /m, `unsampled_parts: ${value} `), 'plan.yaml', tables);

function boundary(withPart: boolean, onlyPart = false): string {
  const d = JSON.parse(readFileSync(join(Q, 'boundary.geojson'), 'utf8'));
  const g = d.features[0].geometry;
  if (onlyPart) d.features[0].geometry = { type: 'Polygon', coordinates: [SQUARE] };
  else if (withPart)
    d.features[0].geometry = { type: 'MultiPolygon', coordinates: [g.coordinates, [SQUARE]] };
  return JSON.stringify(d);
}
const load = (b: string): Promise<FieldInputs> =>
  fieldInputs(file('samples.csv', readFileSync(join(Q, 'samples.csv'), 'utf8')), file('boundary.geojson', b));

// source: @turf/area 7.x (spherical Earth, R = 6 371 008.8 m); tilth's ellipsoidal area agrees within 0.5 %
const squareM2 = area(polygon([SQUARE]));
const ac = (m2: number) => m2 / 4046.8564224;

describe('unsampled boundary parts', () => {
  let alone: Prescription, withRates: Prescription, none: Prescription, twoParts: FieldInputs;
  beforeAll(async () => {
    twoParts = await load(boundary(true));
    alone = buildPrescription(await load(boundary(false)), plan('null'), tables);
    withRates = buildPrescription(twoParts, plan('{ urea: 80, map: 40 }'), tables);
    none = buildPrescription(twoParts, plan('none'), tables);
  }, 120_000);

  it('without the plan key a build is refused, naming the part and the key; with it, not', () => {
    expect(readinessProblems(twoParts, plan('null'), 's.csv').join('\n')).toMatch(
      /boundary part 2 of 2 lies more than 1000 m from every sample.*set the plan key unsampled_parts/,
    );
    expect(readinessProblems(twoParts, plan('none'), 's.csv')).toEqual([]);
    // a map of one nutrient has no plan: still refused
    expect(readinessProblems(twoParts, 'p', 's.csv').join('\n')).toMatch(/boundary part 2 of 2/);
  });

  it('the sampled part is built as if alone; the unsampled part is one more zone with the plan rates', () => {
    expect(withRates.zoneSets.map((s) => s.zones.length)).toEqual(
      alone.zoneSets.map((s) => s.zones.length + 1),
    );
    withRates.zoneSets.forEach((set, k) => {
      set.zones.slice(0, -1).forEach((z, i) => {
        // areas agree to 1e-5: the areal scale is taken at the centre of the whole boundary
        expect(z.areaM2 / alone.zoneSets[k]!.zones[i]!.areaM2).toBeCloseTo(1, 5);
        expect(z.decision.placements).toEqual(alone.zoneSets[k]!.zones[i]!.decision.placements);
      });
      const u = set.zones.at(-1)!;
      expect(u.rateClass).toBe(0);
      expect(u.samples).toEqual([]);
      expect(u.areaM2 / squareM2).toBeGreaterThan(0.995);
      expect(u.areaM2 / squareM2).toBeLessThan(1.005);
      // default placement: the first the product may take outside the seed row (map: seed_row or side_band)
      expect(productRate(u.decision, 'urea', 'side_band').value).toBe(80);
      expect(productRate(u.decision, 'map', 'side_band').value).toBe(40);
      expect(productRate(u.decision, 'map', 'seed_row').value).toBe(0);
      expect(Number.isNaN(u.decision.nutrients.n.target.value)).toBe(true);
    });
    // the whole field is the sampled part and the unsampled zone (to the areal scale's 1e-5)
    const u = withRates.zoneSets[0]!.zones.at(-1)!.areaM2;
    expect((withRates.field.areaM2 - u) / alone.field.areaM2).toBeCloseTo(1, 5);
    expect(withRates.grid).toEqual(alone.grid); // the grid covers the sampled part
  });

  it('totals count the unsampled part; "none" adds nothing; a warning names the part and what it got', () => {
    const total = (rx: Prescription, p: string, pl: string) =>
      rx.totals.find((t) => t.product === p && t.placement === pl)?.totalLb ?? 0;
    const close = (a: number, b: number) => expect(a / b).toBeCloseTo(1, 5); // areal scale as above
    const uAc = ac(withRates.zoneSets[0]!.zones.at(-1)!.areaM2);
    close(total(withRates, 'urea', 'side_band'), total(alone, 'urea', 'side_band') + 80 * uAc);
    close(total(withRates, 'map', 'side_band'), total(alone, 'map', 'side_band') + 40 * uAc);
    close(total(withRates, 'map', 'seed_row'), total(alone, 'map', 'seed_row'));
    for (const t of alone.totals) if (t.totalLb > 0) close(total(none, t.product, t.placement), t.totalLb);
    const w = withRates.warnings.find((x) => x.code === 'unsampled-parts')!;
    expect(w.message).toMatch(
      /boundary part 2 of 2 \(11\.\d ac\) lies more than 1000 m from every sample.*urea 80 lb\/ac side band, map 40 lb\/ac side band \(zone \d+\)/,
    );
    expect(none.warnings.find((x) => x.code === 'unsampled-parts')!.message).toMatch(/rates: no product/);
  });

  it('rates the machine or the seed row cannot take are refused before any work', () => {
    const refused = (v: string, re: RegExp) => expect(() => unsampledDecision(plan(v), tables)).toThrow(re);
    refused('80', /one rate \(80\) but the plan has 4 products.*unsampled_parts: \{ map: 80, urea: 80/);
    refused('{ nitro: 80 }', /"nitro" is not a product of the plan/);
    refused('{ urea: 10 }', /10 lb\/ac is outside urea's machine limits 20-400/);
    refused('{ urea: 83 }', /83 lb\/ac is not a multiple of urea's step 5/);
    refused('{ urea: { rate: 80, placement: seed_row } }', /urea may go in side_band/);
    refused(
      '{ map: { rate: 100, placement: seed_row } }',
      /too much with the seed: P2O5 52 lb\/ac above the limit/,
    );
    expect(
      unsampledDecision(plan('{ map: { rate: 40, placement: seed_row } }'), tables).placements[0]!.placement,
    ).toBe('seed_row');
  });

  it('a boundary whose every part is unsampled is refused', async () => {
    const only = await load(boundary(false, true));
    expect(() => buildPrescription(only, plan('none'), tables)).toThrow(
      /every boundary part lies more than 1000 m/,
    );
  });
});
