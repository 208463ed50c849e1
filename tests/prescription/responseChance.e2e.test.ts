/**
 * Zoning on the expected chance of a yield response, end to end: the demo quarter built on both bases (plan key
 * zoning.basis): the P and K zones move, the N and S zones do not, and zones with a higher chance of a P
 * response get at least as much P2O5.
 */
import { describe, expect, it } from 'vitest';
import { buildPrescription } from '../../src/prescription/index.js';
import { defaultTables } from '../../src/agronomy/index.js';
import { responseChanceBasis } from '../../src/variability/index.js';
import { fieldInputs, quarterFile, quarterPlanWith } from '../helpers/inputs.js';

const tables = defaultTables();
const canola = tables.crops.canola!;
const planWith = (edit: (p: Record<string, any>) => void) => quarterPlanWith(edit, tables);
const src = quarterFile;

describe('plan key zoning.basis on the demo quarter', () => {
  it('demo quarter: P and K zones follow the response chance, N and S zones stay; more chance, no less P2O5', async () => {
    const inputs = await fieldInputs(src('samples.csv'), src('boundary.geojson'));
    const build = (basis?: string) =>
      buildPrescription(
        inputs,
        planWith((p) => {
          p.zoning.zone_sets = 'per_product';
          if (basis) p.zoning.basis = basis;
        }),
        tables,
        { cell: 10 },
      );
    const [byDefault, targets, chance] = [build(), build('targets'), build('response_chance')];
    const set = (rx: typeof chance, name: string) => rx.zoneSets.find((s) => s.name === name)!;
    // the default is today's behaviour
    for (const s of targets.zoneSets)
      expect(Array.from(set(byDefault, s.name).zoneOfCell!)).toEqual(Array.from(s.zoneOfCell!));
    // N and S sets are untouched; P2O5 and K2O sets are drawn from the chance and their cells move
    for (const n of ['n', 's'])
      expect(Array.from(set(chance, n).zoneOfCell!)).toEqual(Array.from(set(targets, n).zoneOfCell!));
    for (const n of ['p2o5', 'k2o']) {
      expect(set(chance, n).drivenBy).toMatch(
        /^expected chance of a yield response to [PK] \(from ordinary kriging/,
      );
      expect(set(chance, n).breaks).toBeNull();
      const a = set(chance, n).zoneOfCell!,
        b = set(targets, n).zoneOfCell!;
      expect(a.some((z, i) => z !== b[i])).toBe(true);
    }
    // sensible: ranked by their mean chance of a P response, zones get no less P2O5 as the chance rises
    const layer = responseChanceBasis(
      {
        samples: inputs.samples,
        grid: chance.grid,
        surfaces: chance.surfaces,
        crop: canola,
        tables,
        kelownaFactor: chance.plan.soil_test.kelowna_factor,
      },
      ['p2o5'],
    ).layers.p2o5!.values;
    const p = set(chance, 'p2o5');
    const mean = p.zones.map((_, zi) => {
      let w = 0,
        s = 0;
      p.zoneOfCell!.forEach((z, i) => {
        if (z === zi && Number.isFinite(layer[i])) {
          w += chance.grid.fraction[i];
          s += chance.grid.fraction[i] * layer[i];
        }
      });
      return s / w;
    });
    const order = p.zones.map((_, i) => i).sort((x, y) => mean[x] - mean[y]);
    expect(order.length).toBeGreaterThanOrEqual(2);
    for (let k = 1; k < order.length; k++) {
      const [lo, hi] = [p.zones[order[k - 1]], p.zones[order[k]]];
      expect(hi.decision.nutrients.p2o5.target.value).toBeGreaterThanOrEqual(
        lo.decision.nutrients.p2o5.target.value,
      );
      expect(hi.soil.p).toBeLessThan(lo.soil.p);
    }
  }, 240_000);
});
